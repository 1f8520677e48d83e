package dev.espalier.earley;

import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.automaton.ByteDfa;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.ExprFold;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;

/**
 * A grammar split into two layers for fast token masks: a <em>lexical</em> layer of byte DFAs and a
 * <em>syntactic</em> skeleton recognised by Earley's method over those DFAs ({@link SplitChart}).
 *
 * <h2>The split</h2>
 * <ul>
 *   <li>A rule is <em>lexical</em> when no recursion is reachable from it; every other rule reachable
 *       from the start rule belongs to the skeleton.</li>
 *   <li>In skeleton rule bodies, every maximal run of consecutive lexical items of a concatenation,
 *       and the lexical options of an alternation taken together, become one <em>terminal</em>: a
 *       minimal byte DFA of that fragment's language without the empty string. A fragment whose
 *       language holds the empty string becomes an optional terminal.</li>
 *   <li>The skeleton's productions are lowered as in {@link EarleyGrammar} (unbounded repetition as a
 *       left-recursive list, bounded repetition as nested options), unproductive productions removed.</li>
 * </ul>
 * The language is exactly the grammar's: a terminal may end wherever its DFA accepts and the
 * skeleton allows, and the chart keeps both ending and continuing.
 *
 * <p>Immutable and thread-safe.
 */
public final class SplitGrammar {

    /** Deepest expression nesting in skeleton rules that is lowered. */
    public static final int MAX_DEPTH = 1_000;

    static final int END = Integer.MIN_VALUE;

    /**
     * The most states subset construction may reach, before minimisation, for a fragment that has
     * parts: past it the fragment is lowered into the skeleton part by part. Failed attempts stay
     * cheap, and the many overlapping fragments of a grammar that lists members in any order do not
     * each become a large terminal; an automaton written as rules (a length-bounded e-mail address,
     * about 2,300 states) is nearly deterministic and still fits. The language is the same either way.
     */
    public static final int DIVISIBLE_RAW_STATES = 4_000;

    final ByteDfa[] terminals;
    final int ntCount;
    final String[] ntName;
    final int[] ntProdStart;
    final int[] prodLhs;
    final int[] prodFirstPos;
    final int[] rhs;
    final int[] posProd;
    final boolean[] nullable;
    final int startNt;
    final int acceptPos;
    private final boolean empty;
    private final java.util.concurrent.atomic.AtomicReferenceArray<long[]> live;

    private SplitGrammar(Lowering l) {
        this.terminals = l.dfas.toArray(new ByteDfa[0]);
        this.live = new java.util.concurrent.atomic.AtomicReferenceArray<>(terminals.length);
        this.ntCount = l.ntNames.size();
        this.ntName = l.ntNames.toArray(new String[0]);
        this.startNt = l.augmented;
        boolean[] productive = new boolean[ntCount];
        boolean changed = true;
        while (changed) {
            changed = false;
            for (int[] p : l.prods) {
                if (!productive[p[0]] && allProductive(p, productive)) {
                    productive[p[0]] = true;
                    changed = true;
                }
            }
        }
        List<int[]> kept = new ArrayList<>();
        for (int[] p : l.prods) {
            if (allProductive(p, productive)) {
                kept.add(p);
            }
        }
        kept.sort((a, b) -> Integer.compare(a[0], b[0]));
        int pc = kept.size();
        prodLhs = new int[pc];
        prodFirstPos = new int[pc];
        ntProdStart = new int[ntCount + 1];
        int positions = 0;
        for (int[] p : kept) {
            positions += p.length;
        }
        rhs = new int[positions];
        posProd = new int[positions];
        int pos = 0;
        int[] count = new int[ntCount];
        for (int i = 0; i < pc; i++) {
            int[] p = kept.get(i);
            prodLhs[i] = p[0];
            prodFirstPos[i] = pos;
            count[p[0]]++;
            for (int k = 1; k < p.length; k++) {
                posProd[pos] = i;
                rhs[pos++] = p[k];
            }
            posProd[pos] = i;
            rhs[pos++] = END;
        }
        for (int n = 0; n < ntCount; n++) {
            ntProdStart[n + 1] = ntProdStart[n] + count[n];
        }
        nullable = new boolean[ntCount];
        changed = true;
        while (changed) {
            changed = false;
            for (int i = 0; i < pc; i++) {
                if (nullable[prodLhs[i]]) {
                    continue;
                }
                boolean all = true;
                for (int q = prodFirstPos[i]; rhs[q] != END; q++) {
                    if (rhs[q] < 0 || !nullable[rhs[q]]) {
                        all = false;
                        break;
                    }
                }
                if (all) {
                    nullable[prodLhs[i]] = true;
                    changed = true;
                }
            }
        }
        this.empty = !productive[startNt];
        int accept = -1;
        for (int i = ntProdStart[startNt]; i < ntProdStart[startNt + 1]; i++) {
            accept = prodFirstPos[i];
            while (rhs[accept] != END) {
                accept++;
            }
        }
        this.acceptPos = accept;
    }

    private static boolean allProductive(int[] p, boolean[] productive) {
        for (int k = 1; k < p.length; k++) {
            if (p[k] >= 0 && !productive[p[k]]) {
                return false;
            }
        }
        return true;
    }

    /**
     * Splits and compiles a grammar (start rule {@code g.start()}).
     *
     * @param stateLimit the most states one terminal's automaton may have
     * @throws IllegalArgumentException for an undefined rule or nesting deeper than {@link #MAX_DEPTH}
     * @throws dev.espalier.automaton.AutomatonTooLargeException when a terminal's automaton is too large
     */
    public static SplitGrammar compile(Grammar g, int stateLimit) {
        if (g.rule(g.start()).isEmpty()) {
            throw new IllegalArgumentException("the start rule " + g.start() + " is not defined");
        }
        return new SplitGrammar(new Lowering(g, stateLimit));
    }

    /** A chart at the start of the input, with at most {@code maxItems} items. */
    public SplitChart newChart(long maxItems) {
        return new SplitChart(this, maxItems);
    }

    /** Whether no string derives from the start rule. */
    public boolean isEmptyLanguage() {
        return empty;
    }

    /** Number of lexical terminals. */
    public int terminalCount() {
        return terminals.length;
    }

    /** The byte DFA of terminal {@code t}. */
    public ByteDfa terminal(int t) {
        return terminals[t];
    }

    /**
     * Per terminal, the bytes that leave each DFA state alive: four words per state (bit b of word
     * {@code 4*state + b/64}), built on first use.
     */
    long[] liveBytes(int t) {
        long[] l = live.get(t);
        if (l == null) {
            ByteDfa d = terminals[t];
            l = new long[4 * d.stateCount()];
            for (int q = 0; q < d.stateCount(); q++) {
                for (int b = 0; b < 256; b++) {
                    if (d.step(q, b) != ByteDfa.DEAD) {
                        l[4 * q + (b >>> 6)] |= 1L << b;
                    }
                }
            }
            live.compareAndSet(t, null, l);
        }
        return l;
    }

    /** Number of skeleton nonterminals (helpers and the added start included). */
    public int nonterminalCount() {
        return ntCount;
    }

    /** Number of skeleton productions. */
    public int productionCount() {
        return prodLhs.length;
    }

    // ---------------------------------------------------------------------------------------------

    /** The lowering of the IR into terminals and skeleton productions. */
    private static final class Lowering {
        final Grammar g;
        final int stateLimit;
        final Function<String, Expr> rules;
        final Set<String> skeleton;
        final List<String> ntNames = new ArrayList<>();
        final List<int[]> prods = new ArrayList<>();
        final List<ByteDfa> dfas = new ArrayList<>();
        final Map<String, Integer> ruleNt = new HashMap<>();
        final Map<String, Integer> lexSymbol = new HashMap<>();
        final IdentityHashMap<Expr, Boolean> lexical = new IdentityHashMap<>();
        final Deque<String> pendingRules = new ArrayDeque<>();
        final int augmented;

        /** Marks a fragment whose language is exactly the empty string. */
        static final int EPSILON = Integer.MAX_VALUE;

        Lowering(Grammar g, int stateLimit) {
            this.g = g;
            this.stateLimit = stateLimit;
            this.rules = name -> g.rule(name).map(Rule::body).orElse(null);
            this.skeleton = skeletonRules(g);
            this.augmented = newNt("start'");
            int s = symbolOf(new Expr.Ref(g.start(), dev.espalier.grammar.Span.NONE), 0);
            prods.add(s == EPSILON ? new int[] {augmented} : new int[] {augmented, s});
            while (!pendingRules.isEmpty()) {
                String key = pendingRules.poll();
                Rule r = g.rule(key).orElseThrow();
                int nt = ruleNt.get(key);
                addAlternatives(nt, r.body(), 0);
            }
        }

        int newNt(String name) {
            ntNames.add(name);
            return ntNames.size() - 1;
        }

        int ruleNt(String name) {
            String key = Grammar.key(name);
            Integer nt = ruleNt.get(key);
            if (nt == null) {
                Rule r = g.rule(key).orElseThrow(() -> new IllegalArgumentException("undefined rule " + name));
                nt = newNt(r.name());
                ruleNt.put(key, nt);
                pendingRules.add(key);
            }
            return nt;
        }

        boolean isLexical(Expr e) {
            Boolean known = lexical.get(e);
            if (known != null) {
                return known;
            }
            new ExprFold<Boolean>() {
                @Override
                protected Boolean leaf(Expr x) {
                    return !(x instanceof Expr.Ref r) || !skeleton.contains(Grammar.key(r.name()));
                }

                @Override
                protected Boolean seq(Expr.Seq s, List<Boolean> items) {
                    return !items.contains(false);
                }

                @Override
                protected Boolean choice(Expr.Choice c, List<Boolean> options) {
                    return !options.contains(false);
                }

                @Override
                protected Boolean repeat(Expr.Repeat r, Boolean body) {
                    return body;
                }
            }.run(e, lexical);
            return lexical.get(e);
        }

        /** Adds the productions {@code nt = e} (an alternation's options become separate productions). */
        void addAlternatives(int nt, Expr e, int depth) {
            if (e instanceof Expr.Choice c && !isLexical(c)) {
                List<Expr> lex = new ArrayList<>();
                for (Expr o : c.options()) {
                    if (isLexical(o)) {
                        lex.add(o);
                    }
                }
                if (!lex.isEmpty()) {
                    addProduction(nt, List.of(lex.size() == 1 ? lex.get(0)
                            : new Expr.Choice(lex, dev.espalier.grammar.Span.NONE)), depth);
                }
                for (Expr o : c.options()) {
                    if (!isLexical(o)) {
                        addProduction(nt, o instanceof Expr.Seq s ? s.items() : List.of(o), depth);
                    }
                }
            } else {
                addProduction(nt, e instanceof Expr.Seq s && !isLexical(s) ? s.items() : List.of(e), depth);
            }
        }

        /** Adds {@code nt = items}, merging consecutive lexical items into one terminal. */
        void addProduction(int nt, List<Expr> items, int depth) {
            List<Integer> symbols = new ArrayList<>();
            List<Expr> run = new ArrayList<>();
            for (Expr item : items) {
                if (isLexical(item)) {
                    run.add(item);
                    continue;
                }
                flushLexical(run, symbols);
                symbols.add(symbolOf(item, depth + 1));
            }
            flushLexical(run, symbols);
            int[] p = new int[symbols.size() + 1];
            p[0] = nt;
            int k = 1;
            for (int s : symbols) {
                if (s != EPSILON) {
                    p[k++] = s;
                }
            }
            prods.add(Arrays.copyOf(p, k));
        }

        void flushLexical(List<Expr> run, List<Integer> symbols) {
            if (!run.isEmpty()) {
                symbols.add(lexicalSymbol(run.size() == 1 ? run.get(0)
                        : new Expr.Seq(List.copyOf(run), dev.espalier.grammar.Span.NONE)));
                run.clear();
            }
        }

        /** The skeleton symbol matching {@code e}; {@link #EPSILON} for the empty string. */
        int symbolOf(Expr e, int depth) {
            if (depth > MAX_DEPTH) {
                throw new IllegalArgumentException("grammar expressions nest deeper than " + MAX_DEPTH + " levels");
            }
            if (isLexical(e)) {
                return lexicalSymbol(e);
            }
            if (e instanceof Expr.Ref r) {
                return ruleNt(r.name());
            }
            if (e instanceof Expr.Repeat r) {
                if (r.min() > EarleyGrammar.MAX_REPEAT || r.max() > EarleyGrammar.MAX_REPEAT) {
                    throw new IllegalArgumentException("repetition bound above " + EarleyGrammar.MAX_REPEAT);
                }
                return repeatSymbol(r, symbolOf(r.body(), depth + 1));
            }
            int nt = newNt(null);
            addAlternatives(nt, e, depth);
            return nt;
        }

        /** The skeleton symbol of {@code r} whose body is the symbol {@code body}. */
        int repeatSymbol(Expr.Repeat r, int body) {
            int nt = newNt(null);
            List<Integer> seq = new ArrayList<>();
            if (body != EPSILON) {
                for (int i = 0; i < r.min(); i++) {
                    seq.add(body);
                }
                if (r.unbounded()) {
                    int list = newNt(null);
                    prods.add(new int[] {list});
                    prods.add(new int[] {list, list, body});
                    seq.add(list);
                } else if (r.max() > r.min()) {
                    int prev = -1;
                    for (int k = 0; k < r.max() - r.min(); k++) {
                        int opt = newNt(null);
                        prods.add(new int[] {opt});
                        prods.add(prev < 0 ? new int[] {opt, body} : new int[] {opt, body, prev});
                        prev = opt;
                    }
                    seq.add(prev);
                }
            }
            int[] p = new int[seq.size() + 1];
            p[0] = nt;
            for (int i = 0; i < seq.size(); i++) {
                p[i + 1] = seq.get(i);
            }
            prods.add(p);
            return nt;
        }

        /** A terminal (or optional terminal) for a lexical fragment. */
        int lexicalSymbol(Expr fragment) {
            String key = ExprKey.of(fragment);
            Integer known = lexSymbol.get(key);
            if (known != null) {
                return known;
            }
            ByteDfa dfa;
            boolean nullable;
            boolean divisible = divisible(fragment) && !(fragment instanceof Expr.Repeat r
                    && (r.min() > EarleyGrammar.MAX_REPEAT || r.max() > EarleyGrammar.MAX_REPEAT));
            int raw = divisible ? DIVISIBLE_RAW_STATES : CharAutomata.NFA_FACTOR * stateLimit;
            try {
                ByteDfa all = ByteDfa.fromExpr(fragment, rules, Math.min(stateLimit, raw), raw);
                nullable = !all.isEmpty() && all.accepts(all.start());
                dfa = all.withoutEmptyString();
            } catch (AutomatonTooLargeException e) {
                if (!divisible) {
                    throw e;
                }
                int symbol = structuralSymbol(fragment);
                lexSymbol.put(key, symbol);
                return symbol;
            }
            int symbol;
            if (dfa.isEmpty()) {
                symbol = nullable ? EPSILON : newNt("(empty)"); // a nonterminal with no production: unproductive
            } else {
                dfas.add(dfa);
                int t = -(dfas.size() - 1) - 1;
                if (nullable) {
                    int opt = newNt(null);
                    prods.add(new int[] {opt});
                    prods.add(new int[] {opt, t});
                    symbol = opt;
                } else {
                    symbol = t;
                }
            }
            lexSymbol.put(key, symbol);
            return symbol;
        }

        /** Whether a fragment has parts that can become terminals of their own. */
        static boolean divisible(Expr fragment) {
            return fragment instanceof Expr.Seq || fragment instanceof Expr.Choice
                    || fragment instanceof Expr.Repeat || fragment instanceof Expr.Ref;
        }

        /**
         * A fragment too large for one automaton, lowered one level into the skeleton: its parts become
         * terminals of their own (and are split again if they too are too large). The language is
         * unchanged; the parser does more of the work.
         */
        int structuralSymbol(Expr fragment) {
            if (fragment instanceof Expr.Ref r) {
                int nt = newNt(r.name());
                Expr body = rules.apply(r.name());
                if (body == null) {
                    throw new IllegalArgumentException("undefined rule " + r.name());
                }
                prods.add(new int[] {nt, symbolOrNothing(body)});
                return nt;
            }
            if (fragment instanceof Expr.Repeat r) {
                return repeatSymbol(r, lexicalSymbol(r.body()));
            }
            int nt = newNt(null);
            if (fragment instanceof Expr.Choice c) {
                for (Expr o : c.options()) {
                    prods.add(production(nt, List.of(lexicalSymbol(o))));
                }
            } else {
                List<Integer> parts = new ArrayList<>();
                for (Expr item : ((Expr.Seq) fragment).items()) {
                    parts.add(lexicalSymbol(item));
                }
                prods.add(production(nt, parts));
            }
            return nt;
        }

        private int symbolOrNothing(Expr body) {
            int s = lexicalSymbol(body);
            if (s != EPSILON) {
                return s;
            }
            int nt = newNt(null);
            prods.add(new int[] {nt});
            return nt;
        }

        private static int[] production(int nt, List<Integer> symbols) {
            int[] p = new int[symbols.size() + 1];
            p[0] = nt;
            int k = 1;
            for (int s : symbols) {
                if (s != EPSILON) {
                    p[k++] = s;
                }
            }
            return Arrays.copyOf(p, k);
        }

        /** Rules from which recursion is reachable (the skeleton), by case-folded name. */
        static Set<String> skeletonRules(Grammar g) {
            Map<String, List<String>> refs = new HashMap<>();
            for (Rule r : g.rules()) {
                refs.put(r.key(), references(r.body()));
            }
            Set<String> cyclic = new HashSet<>();
            for (String r : refs.keySet()) {
                Deque<String> work = new ArrayDeque<>(refs.get(r));
                Set<String> seen = new HashSet<>();
                while (!work.isEmpty()) {
                    String x = work.pop();
                    if (x.equals(r)) {
                        cyclic.add(r);
                        break;
                    }
                    if (seen.add(x)) {
                        work.addAll(refs.getOrDefault(x, List.of()));
                    }
                }
            }
            Map<String, List<String>> reverse = new HashMap<>();
            refs.forEach((from, tos) -> tos.forEach(to -> reverse.computeIfAbsent(to, k -> new ArrayList<>()).add(from)));
            Set<String> out = new HashSet<>(cyclic);
            Deque<String> work = new ArrayDeque<>(cyclic);
            while (!work.isEmpty()) {
                for (String from : reverse.getOrDefault(work.pop(), List.of())) {
                    if (out.add(from)) {
                        work.add(from);
                    }
                }
            }
            return out;
        }

        static List<String> references(Expr body) {
            List<String> out = new ArrayList<>();
            Deque<Expr> work = new ArrayDeque<>();
            work.push(body);
            while (!work.isEmpty()) {
                Expr e = work.pop();
                if (e instanceof Expr.Ref r) {
                    out.add(Grammar.key(r.name()));
                } else {
                    ExprFold.children(e).forEach(work::push);
                }
            }
            return out;
        }
    }

    /** A canonical text of an expression without source spans: equal keys, equal languages. */
    static final class ExprKey {
        private ExprKey() {
        }

        static String of(Expr e) {
            return new ExprFold<String>() {
                @Override
                protected String leaf(Expr x) {
                    if (x instanceof Expr.Chars c) {
                        return "c" + c.set();
                    } else if (x instanceof Expr.Text t) {
                        return (t.ignoreCase() ? "i" : "s") + t.text().length() + ":" + t.text();
                    }
                    return "r" + Grammar.key(((Expr.Ref) x).name()) + ";";
                }

                @Override
                protected String seq(Expr.Seq s, List<String> items) {
                    return "(" + String.join(" ", items) + ")";
                }

                @Override
                protected String choice(Expr.Choice c, List<String> options) {
                    return "<" + String.join("|", options) + ">";
                }

                @Override
                protected String repeat(Expr.Repeat r, String body) {
                    return "{" + r.min() + "," + r.max() + "}" + body;
                }
            }.run(e, null);
        }
    }
}
