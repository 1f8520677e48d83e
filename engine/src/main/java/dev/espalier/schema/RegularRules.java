package dev.espalier.schema;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.util.ArrayList;
import java.util.IdentityHashMap;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Regular languages given as automata, written back as grammar rules.
 *
 * <p>The automaton is first restricted to well-formed UTF-16 (lone surrogates have no UTF-8
 * encoding and are dropped) and minimised; a high-surrogate step followed by a low-surrogate step
 * becomes one step over a range of supplementary code points. The minimal automaton over code points
 * is then written as a right-linear system (one equation per state) and states are eliminated one by
 * one (Brzozowski–McCluskey state elimination; a self-loop becomes a repetition), cheapest first.
 * When every state can be eliminated with the expressions within {@value #SIZE_BUDGET} nodes, the
 * fragment is one expression with no helper rules (and no recursion, so the grammar's lexical layer
 * turns it into a byte automaton). Otherwise only the eliminations that do not grow the expressions
 * are made, and each remaining state becomes a rule {@code prefix-sN} whose body refers to other
 * state rules only in tail position (right-linear); a cycle among them is recursion, which the
 * grammar's Earley layer handles.
 */
public final class RegularRules {

    /** Largest total expression size (nodes) that state elimination may produce. */
    public static final int SIZE_BUDGET = 4_000;

    /** Automata with more states than this skip state elimination and become one rule per state. */
    public static final int ELIMINATION_STATES = 1_500;

    private static final Expr EMPTY_STRING = Expr.seq();

    private RegularRules() {
    }

    /**
     * Right-linear rules (one per state) for the language of an automaton over code points as built
     * by {@link dev.espalier.automaton.CharAutomata} (UTF-16 code units, surrogate pairs for
     * supplementary characters). Where the automaton is small enough, states are eliminated into one
     * expression (see the class documentation); the language is the same either way.
     *
     * @param prefix prefix of every helper rule name
     */
    public static RegularFragment of(String prefix, Automaton automaton) {
        return of(prefix, automaton, SIZE_BUDGET);
    }

    /**
     * As {@link #of(String, Automaton)} with another elimination budget: positive, eliminate all
     * states within it or else fall back to the non-growing eliminations; 0, only the non-growing
     * eliminations; negative, none (one rule per state).
     */
    static RegularFragment of(String prefix, Automaton automaton, int budget) {
        return of(prefix, automaton, budget, false, null);
    }

    /**
     * As {@link #of(String, Automaton)}, for an automaton known to be minimal and to accept only
     * well-formed UTF-16 (no lone surrogates), as {@link StringLengths#bounded} and
     * {@link dev.espalier.automaton.CharAutomata} make them: it is read without minimising again.
     */
    static RegularFragment ofMinimal(String prefix, Automaton minimal) {
        return of(prefix, minimal, SIZE_BUDGET, true, null);
    }

    /**
     * How the rules of a fragment are written out for their final use (the schema compiler escapes
     * characters for JSON strings and splits literals for reading): a function that acts on an
     * expression as on each of its leaves, with nested concatenations flattened one level and
     * choices and repetitions rebuilt around their new parts, so that a step's label (a
     * {@link Expr.Text} or a {@link Expr.Chars}) can be written on its own.
     */
    interface Writer extends java.util.function.UnaryOperator<Expr> {
    }

    /**
     * As {@link #ofMinimal(String, Automaton)} for an automaton given as arrays, with every helper
     * rule written by {@code writer} (the body is left as it is). Where each state becomes a rule, labels are written as the
     * equations are made, so thousands of state rules are not walked a second time; the rules are
     * those of {@code writer} over the rules of {@link #ofMinimal(String, Automaton)}.
     */
    static RegularFragment ofMinimal(String prefix, UnitDfa minimal, Writer writer) {
        return of(prefix, CodePointDfa.of(minimal), SIZE_BUDGET, writer);
    }

    private static RegularFragment of(String prefix, Automaton automaton, int budget, boolean minimal, Writer writer) {
        return of(prefix, CodePointDfa.of(automaton, minimal), budget, writer);
    }

    private static RegularFragment of(String prefix, CodePointDfa dfa, int budget, Writer writer) {
        if (dfa.size() == 0) {
            return new RegularFragment(Expr.choice(), List.of());
        }
        // all states eliminated within the budget: one expression; otherwise only the eliminations
        // that do not grow the expressions, and one rule per remaining state
        if (budget < 0) {
            return written(new Elimination(dfa, 0).fragment(prefix), writer);
        }
        if (budget > 0 && dfa.size() <= ELIMINATION_STATES) { // larger ones are not eliminated at all
            Elimination full = new Elimination(dfa, budget);
            if (full.eliminateAll()) {
                return written(full.fragment(prefix), writer);
            }
        }
        if (dfa.size() > ELIMINATION_STATES) {
            return stateRules(dfa, prefix, writer); // what the elimination would leave: every state
        }
        Elimination cheap = new Elimination(dfa, 0);
        cheap.eliminateAll();
        return written(cheap.fragment(prefix), writer);
    }

    private static RegularFragment written(RegularFragment raw, Writer writer) {
        if (writer == null) {
            return raw;
        }
        List<Rule> rules = new ArrayList<>(raw.rules().size());
        for (Rule r : raw.rules()) {
            rules.add(Rule.of(r.name(), writer.apply(r.body())));
        }
        return new RegularFragment(raw.body(), rules);
    }

    /**
     * One rule per state, {@code q = loop* (a1 Q1 / a2 Q2 / ... / "")}, written straight from the
     * automaton: the same rules as an {@link Elimination} that eliminates nothing, without building
     * its label tables (large automata, such as a format with a length bound, have thousands of
     * states).
     */
    private static RegularFragment stateRules(CodePointDfa dfa, String prefix, Writer writer) {
        int n = dfa.size();
        boolean startReferenced = false;
        for (int p = 1; p < n && !startReferenced; p++) {
            startReferenced = dfa.out().get(p).containsKey(0);
        }
        String[] names = new String[n];
        int named = 0;
        for (int q = startReferenced ? 0 : 1; q < n; q++) {
            names[q] = prefix + "-s" + named++;
        }
        List<Rule> rules = new ArrayList<>(n);
        Map<CodePointSet, Expr> labels = writer == null ? null : new IdentityHashMap<>();
        for (int q = 0; q < n; q++) {
            if (names[q] != null) {
                rules.add(Rule.of(names[q], writer == null ? stateEquation(dfa, q, names)
                        : writtenEquation(dfa, q, names, writer, labels)));
            }
        }
        Expr body = names[0] != null ? Expr.ref(names[0]) : stateEquation(dfa, 0, names);
        return new RegularFragment(body, rules);
    }

    /**
     * {@code writer.apply(stateEquation(dfa, q, names))}, built directly: each label written once per
     * set (the sets of a {@link CodePointDfa} are shared), concatenations flattened as they are made.
     */
    private static Expr writtenEquation(CodePointDfa dfa, int q, String[] names, Writer writer,
            Map<CodePointSet, Expr> labels) {
        Expr loop = null;
        Map<Integer, CodePointSet> steps = dfa.out().get(q);
        Expr[] options = new Expr[steps.size() + (dfa.accept()[q] ? 1 : 0)];
        int count = 0;
        List<Expr> items = new ArrayList<>(4);
        for (Map.Entry<Integer, CodePointSet> e : steps.entrySet()) {
            Expr label = labels.computeIfAbsent(e.getValue(), set -> writer.apply(leaf(set).expr()));
            if (e.getKey() == q) {
                loop = label;
            } else {
                items.clear();
                addFlat(items, label);
                items.add(Expr.ref(names[e.getKey()]));
                options[count++] = new Expr.Seq(items, Span.NONE);
            }
        }
        if (dfa.accept()[q]) {
            options[count++] = EMPTY_STRING;
        }
        Expr rest = count == 1 ? options[0] : new Expr.Choice(List.of(options), Span.NONE);
        if (loop == null) {
            return rest;
        }
        Expr star = Expr.repeat(loop, 0, Expr.UNBOUNDED);
        if (isEmptyString(rest)) {
            return star;
        }
        items.clear();
        items.add(star);
        addFlat(items, rest);
        return new Expr.Seq(items, Span.NONE);
    }

    private static void addFlat(List<Expr> items, Expr e) {
        if (e instanceof Expr.Seq s) {
            items.addAll(s.items());
        } else {
            items.add(e);
        }
    }

    private static Expr stateEquation(CodePointDfa dfa, int q, String[] names) {
        Sized loop = null;
        List<Expr> options = new ArrayList<>();
        for (Map.Entry<Integer, CodePointSet> e : dfa.out().get(q).entrySet()) {
            Sized label = leaf(e.getValue());
            if (e.getKey() == q) {
                loop = label;
            } else {
                options.add(seq(label, new Sized(Expr.ref(names[e.getKey()]), 1)).expr());
            }
        }
        if (dfa.accept()[q]) {
            options.add(EMPTY_STRING);
        }
        Expr rest = options.size() == 1 ? options.get(0) : Expr.choice(options.toArray(Expr[]::new));
        return loop == null ? rest : seq(star(loop), new Sized(rest, 1)).expr();
    }

    // ------------------------------------------------------------------ code-point automaton

    /**
     * A minimal trimmed deterministic automaton over code points: state 0 is the start; each state's
     * outgoing steps are grouped by target.
     */
    record CodePointDfa(List<Map<Integer, CodePointSet>> out, boolean[] accept) {
        int size() {
            return accept.length;
        }

        /**
         * @param minimal whether {@code input} is known to be minimal and deterministic, with only
         *                well-formed UTF-16 strings (every surrogate in a pair): then it is read as
         *                it is; otherwise it is restricted to well-formed strings and minimised first
         */
        static CodePointDfa of(Automaton input, boolean minimal) {
            Automaton a;
            if (minimal && input.isDeterministic()) {
                a = input; // only read
            } else {
                a = touchesSurrogates(input) ? input.intersection(wellFormedUtf16()) : input.clone();
                a.minimize();
            }
            return of(UnitDfa.of(a));
        }

        /**
         * The code-point automaton of a deterministic automaton over well-formed UTF-16 (as
         * {@link StringLengths} makes them), read as it is: trimmed and renumbered, not minimised.
         */
        static CodePointDfa of(UnitDfa units) {
            if (units.isEmpty()) {
                return new CodePointDfa(List.of(), new boolean[0]);
            }
            int[][] unitSteps = units.steps();
            // number the states reached by code points (intermediate after-high-surrogate states are skipped)
            int[] id = new int[units.size()];
            java.util.Arrays.fill(id, -1);
            int[] order = new int[units.size()];
            int count = 0;
            id[units.start()] = count;
            order[count++] = units.start();
            // per state: its steps as (target, lo, hi) triples, ordered by target
            List<int[]> steps = new ArrayList<>();
            Steps found = new Steps();
            for (int head = 0; head < count; head++) {
                found.clear();
                int[] st = unitSteps[order[head]];
                for (int k = 0; k < st.length; k += 3) {
                    int min = st[k];
                    int max = st[k + 1];
                    int dest = st[k + 2];
                    if (min <= 0xD7FF || max >= 0xE000) {
                        if (id[dest] < 0) {
                            id[dest] = count;
                            order[count++] = dest;
                        }
                        found.add(id[dest], min, Math.min(max, 0xD7FF));
                        found.add(id[dest], Math.max(min, 0xE000), max);
                    }
                    int h1 = Math.max(min, 0xD800);
                    int h2 = Math.min(max, 0xDBFF);
                    if (h1 > h2) {
                        continue;
                    }
                    int[] low = unitSteps[dest];
                    for (int j = 0; j < low.length; j += 3) {
                        int l1 = Math.max(low[j], 0xDC00);
                        int l2 = Math.min(low[j + 1], 0xDFFF);
                        if (l1 > l2) {
                            continue;
                        }
                        int to = low[j + 2];
                        if (id[to] < 0) {
                            id[to] = count;
                            order[count++] = to;
                        }
                        if (l1 == 0xDC00 && l2 == 0xDFFF) {
                            found.add(id[to], Character.toCodePoint((char) h1, (char) l1),
                                    Character.toCodePoint((char) h2, (char) l2));
                        } else {
                            for (int h = h1; h <= h2; h++) {
                                found.add(id[to], Character.toCodePoint((char) h, (char) l1),
                                        Character.toCodePoint((char) h, (char) l2));
                            }
                        }
                    }
                }
                steps.add(found.byTarget());
            }
            int n = count;
            boolean[] accept = new boolean[n];
            for (int i = 0; i < n; i++) {
                accept[i] = units.accept()[order[i]];
            }
            // trim: keep states from which acceptance is reachable
            boolean[] live = accept.clone();
            // targets mostly come after their sources (numbered breadth first): from the end, each pass goes far
            for (boolean changed = true; changed; ) {
                changed = false;
                for (int i = n - 1; i >= 0; i--) {
                    if (!live[i]) {
                        int[] st = steps.get(i);
                        for (int k = 0; k < st.length; k += 3) {
                            if (live[st[k]]) {
                                live[i] = true;
                                changed = true;
                                break;
                            }
                        }
                    }
                }
            }
            if (!live[0]) {
                return new CodePointDfa(List.of(), new boolean[0]);
            }
            // renumber live states reachable from the start, breadth first
            int[] renum = new int[n];
            java.util.Arrays.fill(renum, -1);
            int[] kept = new int[n];
            int keptCount = 1;
            renum[0] = 0;
            for (int k = 0; k < keptCount; k++) {
                int[] st = steps.get(kept[k]);
                for (int j = 0; j < st.length; j += 3) {
                    int t = st[j];
                    if (live[t] && renum[t] < 0) {
                        renum[t] = keptCount;
                        kept[keptCount++] = t;
                    }
                }
            }
            // the sets of a large automaton repeat: each is made once
            Map<Ranges, CodePointSet> sets = new HashMap<>();
            List<Map<Integer, CodePointSet>> out = new ArrayList<>(keptCount);
            boolean[] acc = new boolean[keptCount];
            for (int k = 0; k < keptCount; k++) {
                int old = kept[k];
                acc[k] = accept[old];
                Map<Integer, CodePointSet> m = new LinkedHashMap<>();
                int[] st = steps.get(old);
                for (int j = 0; j < st.length; ) {
                    int t = st[j];
                    int e = j;
                    while (e < st.length && st[e] == t) {
                        e += 3;
                    }
                    if (renum[t] >= 0) {
                        int[] pairs = new int[2 * ((e - j) / 3)];
                        for (int x = j, y = 0; x < e; x += 3) {
                            pairs[y++] = st[x + 1];
                            pairs[y++] = st[x + 2];
                        }
                        m.put(renum[t], sets.computeIfAbsent(new Ranges(pairs), r -> CodePointSet.ofRanges(r.pairs())));
                    }
                    j = e;
                }
                out.add(m);
            }
            return new CodePointDfa(out, acc);
        }

        /** Ranges as found, a key for the set they make. */
        private record Ranges(int[] pairs) {
            @Override
            public boolean equals(Object o) {
                return o instanceof Ranges r && java.util.Arrays.equals(r.pairs, pairs);
            }

            @Override
            public int hashCode() {
                return java.util.Arrays.hashCode(pairs);
            }
        }

        /** A state's steps while they are found: (target, lo, hi) triples. */
        private static final class Steps {
            private int[] triples = new int[24];
            private int size;

            void clear() {
                size = 0;
            }

            void add(int target, int lo, int hi) {
                if (lo > hi) {
                    return;
                }
                if (size + 3 > triples.length) {
                    triples = java.util.Arrays.copyOf(triples, triples.length * 2);
                }
                triples[size++] = target;
                triples[size++] = lo;
                triples[size++] = hi;
            }

            /** The triples ordered by target (stable: a target's ranges keep their order). */
            int[] byTarget() {
                int n = size / 3;
                long[] keys = new long[n]; // target, then position: equal targets keep their order
                for (int i = 0; i < n; i++) {
                    keys[i] = (long) triples[3 * i] << 32 | i;
                }
                java.util.Arrays.sort(keys);
                int[] out = new int[size];
                for (int i = 0; i < n; i++) {
                    System.arraycopy(triples, 3 * (int) keys[i], out, 3 * i, 3);
                }
                return out;
            }
        }

        private static boolean touchesSurrogates(Automaton a) {
            for (State s : a.getStates()) {
                for (Transition t : s.getTransitions()) {
                    if (t.getMax() >= 0xD800 && t.getMin() <= 0xDFFF) {
                        return true;
                    }
                }
            }
            return false;
        }

        /** Strings of Java chars that are well-formed UTF-16 (every surrogate in a proper pair). */
        static Automaton wellFormedUtf16() {
            State s = new State();
            State high = new State();
            s.setAccept(true);
            s.addTransition(new Transition('\u0000', '\uD7FF', s));
            s.addTransition(new Transition('\uE000', '\uFFFF', s));
            s.addTransition(new Transition('\uD800', '\uDBFF', high));
            high.addTransition(new Transition('\uDC00', '\uDFFF', s));
            Automaton a = new Automaton();
            a.setInitialState(s);
            a.setDeterministic(true);
            return a;
        }
    }

    // ------------------------------------------------------------------ state elimination

    /** An expression with its size (node count), so budgets need no tree walks. */
    private record Sized(Expr expr, int size) {
    }

    private static final class Elimination {
        private final int n;
        private final int end;
        /** out.get(p).get(q): the label of the step from p to q ({@code end} = acceptance). */
        private final List<Map<Integer, Sized>> out = new ArrayList<>();
        private final List<Map<Integer, Boolean>> in = new ArrayList<>();
        private final boolean[] gone;
        private long total;

        private final int budget;

        Elimination(CodePointDfa dfa, int budget) {
            this.budget = budget;
            n = dfa.size();
            end = n;
            gone = new boolean[n + 1];
            for (int i = 0; i <= n; i++) {
                out.add(new LinkedHashMap<>());
                in.add(new LinkedHashMap<>());
            }
            for (int p = 0; p < n; p++) {
                for (Map.Entry<Integer, CodePointSet> e : dfa.out().get(p).entrySet()) {
                    link(p, e.getKey(), leaf(e.getValue()));
                }
                if (dfa.accept()[p]) {
                    link(p, end, new Sized(EMPTY_STRING, 1));
                }
            }
        }

        private void link(int p, int q, Sized label) {
            Sized old = out.get(p).get(q);
            Sized merged = old == null ? label : alt(old, label);
            total += merged.size() - (old == null ? 0 : old.size());
            out.get(p).put(q, merged);
            in.get(q).put(p, Boolean.TRUE);
        }

        private void unlink(int p, int q) {
            Sized old = out.get(p).remove(q);
            if (old != null) {
                total -= old.size();
            }
            in.get(q).remove(p);
        }

        /**
         * Eliminates states, cheapest first, while the total size stays within the budget (a zero
         * budget: while it does not grow). Returns whether the result is one expression.
         */
        boolean eliminateAll() {
            if (n <= ELIMINATION_STATES) {
                long allowed = budget == 0 ? total : Math.max(budget, total);
                while (true) {
                    int best = -1;
                    long bestCost = Long.MAX_VALUE;
                    for (int q = 1; q < n; q++) {
                        if (!gone[q]) {
                            long c = cost(q);
                            if (c < bestCost) {
                                bestCost = c;
                                best = q;
                            }
                        }
                    }
                    if (best < 0 || total + bestCost > allowed) {
                        break;
                    }
                    eliminate(best);
                    if (budget == 0) {
                        allowed = total;
                    }
                }
            }
            for (int q = 1; q < n; q++) {
                if (!gone[q]) {
                    return false;
                }
            }
            return !hasOtherPredecessor(0);
        }

        RegularFragment fragment(String prefix) {
            // the remaining states become rules; state 0 is the body (inlined when nothing refers to it)
            Map<Integer, String> names = new LinkedHashMap<>();
            for (int q = 0; q < n; q++) {
                if (!gone[q] && (q != 0 || hasOtherPredecessor(0))) {
                    names.put(q, prefix + "-s" + names.size());
                }
            }
            List<Rule> rules = new ArrayList<>();
            for (Map.Entry<Integer, String> e : names.entrySet()) {
                rules.add(Rule.of(e.getValue(), equation(e.getKey(), names)));
            }
            Expr body = names.containsKey(0) ? Expr.ref(names.get(0)) : equation(0, names);
            return new RegularFragment(body, rules);
        }

        private boolean hasOtherPredecessor(int q) {
            for (int p : in.get(q).keySet()) {
                if (p != q) {
                    return true;
                }
            }
            return false;
        }

        /** q = loop* (a1 Q1 / a2 Q2 / ... / final): references only in tail position. */
        private Expr equation(int q, Map<Integer, String> names) {
            Sized loop = out.get(q).get(q);
            List<Expr> options = new ArrayList<>();
            for (Map.Entry<Integer, Sized> e : out.get(q).entrySet()) {
                int t = e.getKey();
                if (t == q) {
                    continue;
                }
                Expr label = e.getValue().expr();
                options.add(t == end ? label : seq(e.getValue(), new Sized(Expr.ref(names.get(t)), 1)).expr());
            }
            Expr rest = options.size() == 1 ? options.get(0) : Expr.choice(options.toArray(Expr[]::new));
            return loop == null ? rest : seq(star(loop), new Sized(rest, 1)).expr();
        }

        /** Size added by eliminating q (new labels minus removed ones). */
        private long cost(int q) {
            Sized loop = out.get(q).get(q);
            long loopSize = loop == null ? 0 : loop.size() + 1;
            long add = 0;
            long removed = 0;
            for (int p : in.get(q).keySet()) {
                if (p == q) {
                    continue;
                }
                Sized a = out.get(p).get(q);
                removed += a.size();
                long head = seqSize(a.size(), isEmptyString(a), loopSize, loop == null);
                for (Map.Entry<Integer, Sized> e : out.get(q).entrySet()) {
                    if (e.getKey() != q) {
                        add += seqSize(head, isEmptyString(a) && loop == null, e.getValue().size(),
                                isEmptyString(e.getValue()));
                    }
                }
            }
            for (Map.Entry<Integer, Sized> e : out.get(q).entrySet()) {
                removed += e.getValue().size();
            }
            return add - removed;
        }

        private void eliminate(int q) {
            Sized loop = out.get(q).get(q);
            Sized star = loop == null ? null : star(loop);
            List<Integer> preds = new ArrayList<>(in.get(q).keySet());
            preds.remove(Integer.valueOf(q));
            List<Map.Entry<Integer, Sized>> succs = new ArrayList<>();
            for (Map.Entry<Integer, Sized> e : out.get(q).entrySet()) {
                if (e.getKey() != q) {
                    succs.add(Map.entry(e.getKey(), e.getValue()));
                }
            }
            for (int p : preds) {
                Sized a = out.get(p).get(q);
                unlink(p, q);
                for (Map.Entry<Integer, Sized> s : succs) {
                    Sized via = star == null ? seq(a, s.getValue()) : seq(seq(a, star), s.getValue());
                    link(p, s.getKey(), via);
                }
            }
            for (Map.Entry<Integer, Sized> s : succs) {
                unlink(q, s.getKey());
            }
            if (loop != null) {
                unlink(q, q);
            }
            gone[q] = true;
        }
    }

    // ------------------------------------------------------------------ expression building

    private static Sized leaf(CodePointSet set) {
        if (set.rangeCount() == 1 && set.lo(0) == set.hi(0)) {
            return new Sized(text(new String(Character.toChars(set.lo(0)))), 1);
        }
        return new Sized(Expr.chars(set), 1);
    }

    /**
     * A literal. Text without ASCII letters is marked case-insensitive, which changes nothing for
     * it (RFC 5234 section 2.3 folds only letters) but lets it print as a plain quoted string.
     */
    static Expr text(String s) {
        boolean letters = false;
        for (int i = 0; i < s.length() && !letters; i++) {
            char c = s.charAt(i);
            letters = c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z';
        }
        return new Expr.Text(s, !letters, Span.NONE);
    }

    private static boolean isEmptyString(Sized a) {
        return isEmptyString(a.expr());
    }

    private static boolean isEmptyString(Expr e) {
        return e instanceof Expr.Seq s && s.items().isEmpty();
    }

    private static long seqSize(long a, boolean aEmpty, long b, boolean bEmpty) {
        return aEmpty ? b : bEmpty ? a : a + b + 1;
    }

    private static Sized seq(Sized a, Sized b) {
        if (isEmptyString(a)) {
            return b;
        }
        if (isEmptyString(b)) {
            return a;
        }
        List<Expr> items = new ArrayList<>();
        addSeq(items, a.expr());
        addSeq(items, b.expr());
        Expr e = items.size() == 1 ? items.get(0) : new Expr.Seq(items, Span.NONE);
        return new Sized(e, a.size() + b.size() + 1);
    }

    private static void addSeq(List<Expr> items, Expr e) {
        if (e instanceof Expr.Seq s) {
            for (Expr x : s.items()) {
                addSeq(items, x);
            }
        } else if (e instanceof Expr.Text t && !items.isEmpty() && items.get(items.size() - 1) instanceof Expr.Text p) {
            // adjacent literals join; both kinds here match exactly themselves
            items.set(items.size() - 1, text(p.text() + t.text()));
        } else {
            items.add(e);
        }
    }

    private static Sized alt(Sized a, Sized b) {
        if (a.expr() instanceof Expr.Chars ca && b.expr() instanceof Expr.Chars cb) {
            return new Sized(Expr.chars(ca.set().union(cb.set())), 1);
        }
        List<Expr> options = new ArrayList<>();
        addChoice(options, a.expr());
        addChoice(options, b.expr());
        // merge single-character options into one set
        CodePointSet set = CodePointSet.EMPTY;
        int singles = 0;
        List<Expr> rest = new ArrayList<>();
        for (Expr o : options) {
            CodePointSet s = single(o);
            if (s != null) {
                set = set.union(s);
                singles++;
            } else {
                rest.add(o);
            }
        }
        if (singles > 1) {
            rest.add(0, leaf(set).expr());
            options = rest;
        }
        // an empty option makes the rest optional
        boolean optional = options.removeIf(o -> o instanceof Expr.Seq s && s.items().isEmpty());
        Expr e = options.size() == 1 ? options.get(0) : new Expr.Choice(options, Span.NONE);
        if (optional) {
            e = options.isEmpty() ? EMPTY_STRING : Expr.repeat(e, 0, 1);
        }
        return new Sized(e, a.size() + b.size() + 1);
    }

    /** The set of a one-character expression, or null. */
    private static CodePointSet single(Expr e) {
        if (e instanceof Expr.Chars c) {
            return c.set();
        }
        if (e instanceof Expr.Text t && t.text().codePointCount(0, t.text().length()) == 1) {
            return CodePointSet.of(t.text().codePointAt(0));
        }
        return null;
    }

    private static void addChoice(List<Expr> options, Expr e) {
        if (e instanceof Expr.Choice c) {
            options.addAll(c.options());
        } else {
            options.add(e);
        }
    }

    private static Sized star(Sized body) {
        return new Sized(Expr.repeat(body.expr(), 0, Expr.UNBOUNDED), body.size() + 1);
    }
}
