package dev.espalier.earley;

import dev.espalier.automaton.Utf8;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * A grammar IR lowered to a context-free grammar over byte terminals, in flat arrays, ready for
 * Earley recognition ({@link #newChart()}).
 *
 * <h2>Lowering</h2>
 * <ul>
 *   <li>Every rule reachable from the start rule becomes a nonterminal named after it; rule names
 *       are looked up case-insensitively.</li>
 *   <li>{@code Chars} matches the UTF-8 encoding of one member code point (byte-range sequences by
 *       {@link Utf8#ranges}); {@code Text} matches its UTF-8 bytes, with ASCII letters matching both
 *       cases when {@code ignoreCase} is set.</li>
 *   <li>{@code Repeat(x, m, n)} becomes {@code x^m} followed by a left-recursive list
 *       {@code L = "" / L x} when unbounded, or a chain of nested options
 *       {@code O_k = "" / x O_(k-1)} when bounded: both unambiguous, so they never multiply
 *       parse counts. Bounds above {@value #MAX_REPEAT} are refused.</li>
 *   <li>{@code Seq} and {@code Choice} become productions of helper nonterminals, which parse trees
 *       leave out.</li>
 *   <li>Productions that can derive no byte string (through empty character sets, empty choices or
 *       rules that never terminate) are removed, so every item of a chart can still be completed:
 *       a chart that accepted a byte holds a viable prefix.</li>
 * </ul>
 * The lowering uses explicit work lists, never recursion proportional to the grammar's size or
 * nesting depth.
 *
 * <p>Instances are immutable and thread-safe; each {@link EarleyChart} has its own state.
 */
public final class EarleyGrammar {

    /** The largest repetition bound that is compiled. */
    public static final int MAX_REPEAT = 10_000;

    /** Default limit on the items of one chart (about 80 MB of item storage). */
    public static final long DEFAULT_MAX_ITEMS = 10_000_000L;

    /** Marks the end of a production in {@link #rhs}. */
    static final int END = Integer.MIN_VALUE;

    /** Closures larger than this are not precomputed; prediction then walks the productions. */
    private static final int MAX_CLOSURE = 256;

    final int ntCount;
    /** Rule name as written, or null for helper nonterminals. */
    final String[] ntName;
    /** Productions of nonterminal n: {@code ntProdStart[n] .. ntProdStart[n+1]-1}. */
    final int[] ntProdStart;
    final int[] prodLhs;
    final int[] prodFirstPos;
    final int[] prodLength;
    /** Symbol at each dot position: nonterminal (>= 0), terminal {@code -(t+1)}, or {@link #END}. */
    final int[] rhs;
    final int[] posProd;
    /** Four words (a 256-bit byte set) per terminal. */
    final long[] termBits;
    final boolean[] nullable;
    /** The added start nonterminal {@code S' = S}. */
    final int startNt;
    /** Dot position of the completed {@code S' = S .}. */
    final int acceptPos;
    /** Precomputed prediction closures (dot positions and predicted nonterminals); start -1 if absent. */
    final int[] closurePosStart;
    final int[] closurePos;
    final int[] closureNtStart;
    final int[] closureNts;
    /** Byte classes: bytes in the same class belong to exactly the same terminals. */
    final int[] byteClass;
    final int[] classRepresentative;
    private final String startRule;

    private EarleyGrammar(Lowering l, String startRule) {
        this.startRule = startRule;
        this.ntCount = l.ntNames.size();
        this.ntName = l.ntNames.toArray(new String[0]);
        this.termBits = new long[l.terms.size() * 4];
        for (int t = 0; t < l.terms.size(); t++) {
            System.arraycopy(l.terms.get(t), 0, termBits, 4 * t, 4);
        }
        this.startNt = l.augmented;

        // keep productive productions only
        boolean[] productive = productive(l);
        List<int[]> kept = new ArrayList<>();
        for (int[] p : l.prods) {
            if (p.length > 0 && allProductive(p, productive)) {
                kept.add(p);
            }
        }
        kept.sort((a, b) -> Integer.compare(a[0], b[0])); // stable: keeps alternative order
        int pc = kept.size();
        prodLhs = new int[pc];
        prodFirstPos = new int[pc];
        prodLength = new int[pc];
        ntProdStart = new int[ntCount + 1];
        int positions = 0;
        for (int[] p : kept) {
            positions += p.length; // symbols + END (p[0] is the lhs)
        }
        rhs = new int[positions];
        posProd = new int[positions];
        int at = 0;
        for (int i = 0; i < pc; i++) {
            int[] p = kept.get(i);
            prodLhs[i] = p[0];
            prodFirstPos[i] = at;
            prodLength[i] = p.length - 1;
            ntProdStart[p[0] + 1]++;
            for (int k = 1; k < p.length; k++) {
                posProd[at] = i;
                rhs[at++] = p[k];
            }
            posProd[at] = i;
            rhs[at++] = END;
        }
        for (int n = 0; n < ntCount; n++) {
            ntProdStart[n + 1] += ntProdStart[n];
        }
        nullable = computeNullable();
        int startProd = ntProdStart[startNt] < ntProdStart[startNt + 1] ? ntProdStart[startNt] : -1;
        acceptPos = startProd < 0 ? -1 : prodFirstPos[startProd] + prodLength[startProd];

        // prediction closures
        closurePosStart = new int[ntCount + 1];
        closureNtStart = new int[ntCount + 1];
        int[][] cp = new int[ntCount][];
        int[][] cn = new int[ntCount][];
        int totalPos = 0;
        int totalNt = 0;
        int[] posSeen = new int[rhs.length];
        int[] ntSeen = new int[ntCount];
        int[] posBuf = new int[MAX_CLOSURE];
        int[] ntBuf = new int[ntCount];
        for (int n = 0; n < ntCount; n++) {
            int stamp = n + 1;
            int np = 0;
            int nn = 0;
            boolean tooBig = false;
            ntSeen[n] = stamp;
            ntBuf[nn++] = n;
            for (int q = 0; q < nn && !tooBig; q++) {
                int b = ntBuf[q];
                for (int p = ntProdStart[b]; p < ntProdStart[b + 1]; p++) {
                    int pos = prodFirstPos[p];
                    // the production's start and its nullable advances
                    while (true) {
                        if (posSeen[pos] == stamp) {
                            break;
                        }
                        if (np == MAX_CLOSURE) {
                            tooBig = true;
                            break;
                        }
                        posSeen[pos] = stamp;
                        posBuf[np++] = pos;
                        int s = rhs[pos];
                        if (s < 0) {
                            break;
                        }
                        if (ntSeen[s] != stamp) {
                            ntSeen[s] = stamp;
                            ntBuf[nn++] = s;
                        }
                        if (!nullable[s]) {
                            break;
                        }
                        pos++;
                    }
                    if (tooBig) {
                        break;
                    }
                }
            }
            if (!tooBig) {
                cp[n] = Arrays.copyOf(posBuf, np);
                cn[n] = Arrays.copyOf(ntBuf, nn);
                totalPos += np;
                totalNt += nn;
            }
        }
        closurePos = new int[totalPos];
        closureNts = new int[totalNt];
        int a = 0;
        int b = 0;
        for (int n = 0; n < ntCount; n++) {
            if (cp[n] == null) {
                closurePosStart[n] = -1;
                closureNtStart[n] = -1;
                continue;
            }
            closurePosStart[n] = a;
            closureNtStart[n] = b;
            System.arraycopy(cp[n], 0, closurePos, a, cp[n].length);
            System.arraycopy(cn[n], 0, closureNts, b, cn[n].length);
            a += cp[n].length;
            b += cn[n].length;
        }
        closurePosStart[ntCount] = a;
        closureNtStart[ntCount] = b;
        // closure ranges: next present start, or the end
        closureEndPos = new int[ntCount];
        closureEndNt = new int[ntCount];
        for (int n = 0; n < ntCount; n++) {
            if (cp[n] != null) {
                closureEndPos[n] = closurePosStart[n] + cp[n].length;
                closureEndNt[n] = closureNtStart[n] + cn[n].length;
            }
        }

        // byte classes by terminal membership
        byteClass = new int[256];
        Map<BitSet, Integer> classes = new HashMap<>();
        List<Integer> reps = new ArrayList<>();
        int terms = termBits.length / 4;
        for (int c = 0; c < 256; c++) {
            BitSet sig = new BitSet(terms);
            for (int t = 0; t < terms; t++) {
                if (hasByte(t, c)) {
                    sig.set(t);
                }
            }
            Integer k = classes.get(sig);
            if (k == null) {
                k = classes.size();
                classes.put(sig, k);
                reps.add(c);
            }
            byteClass[c] = k;
        }
        classRepresentative = reps.stream().mapToInt(Integer::intValue).toArray();
    }

    final int[] closureEndPos;
    final int[] closureEndNt;

    /**
     * Compiles {@code g} with {@code g.start()} as the start rule.
     *
     * @throws IllegalArgumentException when the grammar has no rules, the start rule or a referenced
     *         rule is not defined (the message names it), or a repetition bound exceeds
     *         {@value #MAX_REPEAT}
     */
    public static EarleyGrammar compile(Grammar g) {
        if (g.rules().isEmpty()) {
            throw new IllegalArgumentException("the grammar has no rules");
        }
        Rule start = g.rule(g.start()).orElseThrow(
                () -> new IllegalArgumentException("start rule '" + g.start() + "' is not defined"));
        Lowering l = new Lowering(g);
        l.augmented = l.newNt(null);
        int s = l.ruleNt(start);
        l.prods.add(new int[] {l.augmented, s});
        l.run();
        return new EarleyGrammar(l, start.name());
    }

    /** A new chart at the empty input, with Leo's optimisation and {@link #DEFAULT_MAX_ITEMS}. */
    public EarleyChart newChart() {
        return new EarleyChart(this, DEFAULT_MAX_ITEMS, true);
    }

    /**
     * A new chart at the empty input.
     *
     * @param maxItems limit on the items the chart holds at once (crossing it throws
     *                 {@link EarleyLimitException})
     * @param leo      whether to use Leo's right-recursion optimisation (turn off only to compare)
     */
    public EarleyChart newChart(long maxItems, boolean leo) {
        if (maxItems < 1) {
            throw new IllegalArgumentException("maxItems must be positive");
        }
        return new EarleyChart(this, maxItems, leo);
    }

    /** The start rule's name as written. */
    public String startRule() {
        return startRule;
    }

    /** Number of nonterminals (rules, helpers and the added start). */
    public int nonterminalCount() {
        return ntCount;
    }

    /** Number of productions left after removing unproductive ones. */
    public int productionCount() {
        return prodLhs.length;
    }

    /** Whether the grammar matches no string at all (its start rule is unproductive). */
    public boolean isEmptyLanguage() {
        return acceptPos < 0;
    }

    /** Number of byte classes: bytes in one class are interchangeable for this grammar. */
    public int byteClassCount() {
        return classRepresentative.length;
    }

    /** The byte class of {@code b} (0..255). */
    public int byteClass(int b) {
        return byteClass[b];
    }

    boolean hasByte(int term, int b) {
        return (termBits[4 * term + (b >>> 6)] >>> (b & 63) & 1L) != 0;
    }

    // ------------------------------------------------------------------------------------------

    private static boolean allProductive(int[] p, boolean[] productive) {
        for (int k = 1; k < p.length; k++) {
            if (p[k] >= 0 && !productive[p[k]]) {
                return false;
            }
        }
        return true;
    }

    /**
     * Productive nonterminals (those deriving some byte string; empty byte sets derive none), by the
     * usual work-list fixpoint over symbol occurrences.
     */
    private static boolean[] productive(Lowering l) {
        int n = l.ntNames.size();
        boolean[] done = new boolean[n];
        int pc = l.prods.size();
        int[] remaining = new int[pc];
        boolean[] dead = new boolean[pc];
        int[] occCount = new int[n + 1];
        for (int[] p : l.prods) {
            for (int k = 1; k < p.length; k++) {
                if (p[k] >= 0) {
                    occCount[p[k] + 1]++;
                }
            }
        }
        for (int i = 0; i < n; i++) {
            occCount[i + 1] += occCount[i];
        }
        int[] occ = new int[occCount[n]];
        int[] fill = Arrays.copyOf(occCount, n);
        int[] queue = new int[n];
        int qh = 0;
        int qt = 0;
        for (int i = 0; i < pc; i++) {
            int[] p = l.prods.get(i);
            for (int k = 1; k < p.length; k++) {
                int s = p[k];
                if (s >= 0) {
                    remaining[i]++;
                    occ[fill[s]++] = i;
                } else if (isEmptyTerm(l.terms.get(-s - 1))) {
                    dead[i] = true;
                }
            }
        }
        for (int i = 0; i < pc; i++) {
            int[] p = l.prods.get(i);
            if (!dead[i] && remaining[i] == 0 && !done[p[0]]) {
                done[p[0]] = true;
                queue[qt++] = p[0];
            }
        }
        while (qh < qt) {
            int s = queue[qh++];
            for (int o = occCount[s]; o < occCount[s + 1]; o++) {
                int i = occ[o];
                if (--remaining[i] == 0 && !dead[i]) {
                    int lhs = l.prods.get(i)[0];
                    if (!done[lhs]) {
                        done[lhs] = true;
                        queue[qt++] = lhs;
                    }
                }
            }
        }
        return done;
    }

    private boolean[] computeNullable() {
        boolean[] nul = new boolean[ntCount];
        int pc = prodLhs.length;
        int[] remaining = new int[pc];
        List<List<Integer>> occ = new ArrayList<>();
        int[] occCount = new int[ntCount + 1];
        for (int p = 0; p < pc; p++) {
            for (int pos = prodFirstPos[p]; rhs[pos] != END; pos++) {
                if (rhs[pos] >= 0) {
                    occCount[rhs[pos] + 1]++;
                }
            }
        }
        for (int i = 0; i < ntCount; i++) {
            occCount[i + 1] += occCount[i];
        }
        int[] occs = new int[occCount[ntCount]];
        int[] fill = Arrays.copyOf(occCount, ntCount);
        boolean[] hasTerm = new boolean[pc];
        for (int p = 0; p < pc; p++) {
            for (int pos = prodFirstPos[p]; rhs[pos] != END; pos++) {
                int s = rhs[pos];
                if (s >= 0) {
                    remaining[p]++;
                    occs[fill[s]++] = p;
                } else {
                    hasTerm[p] = true;
                }
            }
        }
        int[] queue = new int[ntCount];
        int qh = 0;
        int qt = 0;
        for (int p = 0; p < pc; p++) {
            if (!hasTerm[p] && remaining[p] == 0 && !nul[prodLhs[p]]) {
                nul[prodLhs[p]] = true;
                queue[qt++] = prodLhs[p];
            }
        }
        while (qh < qt) {
            int s = queue[qh++];
            for (int o = occCount[s]; o < occCount[s + 1]; o++) {
                int p = occs[o];
                if (--remaining[p] == 0 && !hasTerm[p] && !nul[prodLhs[p]]) {
                    nul[prodLhs[p]] = true;
                    queue[qt++] = prodLhs[p];
                }
            }
        }
        return nul;
    }

    private static boolean isEmptyTerm(long[] bits) {
        return (bits[0] | bits[1] | bits[2] | bits[3]) == 0;
    }

    /** The IR-to-productions lowering: a queue of (expression, nonterminal) definitions. */
    private static final class Lowering {
        final Grammar g;
        final List<String> ntNames = new ArrayList<>();
        final List<int[]> prods = new ArrayList<>();
        final List<long[]> terms = new ArrayList<>();
        final Map<String, Integer> termIds = new HashMap<>();
        final Map<String, Integer> ruleIds = new HashMap<>();
        final Map<CodePointSet, Integer> charsIds = new HashMap<>();
        final Deque<Object[]> jobs = new ArrayDeque<>();
        int augmented;

        Lowering(Grammar g) {
            this.g = g;
        }

        int newNt(String name) {
            ntNames.add(name);
            return ntNames.size() - 1;
        }

        int ruleNt(Rule r) {
            Integer id = ruleIds.get(r.key());
            if (id == null) {
                id = newNt(r.name());
                ruleIds.put(r.key(), id);
                jobs.add(new Object[] {r.body(), id});
            }
            return id;
        }

        void run() {
            while (!jobs.isEmpty()) {
                Object[] job = jobs.poll();
                define((Expr) job[0], (Integer) job[1]);
            }
        }

        void addProd(int lhs, IntList symbols) {
            int[] p = new int[symbols.size + 1];
            p[0] = lhs;
            System.arraycopy(symbols.a, 0, p, 1, symbols.size);
            prods.add(p);
        }

        void define(Expr e, int nt) {
            if (e instanceof Expr.Choice c) {
                for (Expr o : c.options()) {
                    addProd(nt, flatten(o));
                }
            } else if (e instanceof Expr.Repeat r) {
                defineRepeat(r, nt);
            } else {
                addProd(nt, flatten(e));
            }
        }

        void defineRepeat(Expr.Repeat r, int nt) {
            int min = r.min();
            int max = r.max();
            if (min > MAX_REPEAT || max > MAX_REPEAT) {
                throw new IllegalArgumentException("repetition bound " + Math.max(min, max) + " exceeds the limit of "
                        + MAX_REPEAT + " (at " + r.span().line() + ":" + r.span().column() + ")");
            }
            if (!r.unbounded() && max < min) {
                return; // matches nothing
            }
            IntList body = flatten(r.body());
            int x;
            if (body.size == 1) {
                x = body.a[0];
            } else {
                x = newNt(null);
                addProd(x, body);
            }
            IntList seq = new IntList();
            for (int i = 0; i < min; i++) {
                seq.add(x);
            }
            if (r.unbounded()) {
                int list = newNt(null);
                addProd(list, new IntList());
                IntList rec = new IntList();
                rec.add(list);
                rec.add(x);
                addProd(list, rec);
                seq.add(list);
            } else if (max > min) {
                int prev = -1;
                for (int k = 1; k <= max - min; k++) {
                    int o = newNt(null);
                    addProd(o, new IntList());
                    IntList alt = new IntList();
                    alt.add(x);
                    if (prev >= 0) {
                        alt.add(prev);
                    }
                    addProd(o, alt);
                    prev = o;
                }
                seq.add(prev);
            }
            addProd(nt, seq);
        }

        /** The symbols of one production matching {@code e}; nested choices and repeats become helpers. */
        IntList flatten(Expr e) {
            IntList out = new IntList();
            Deque<Expr> stack = new ArrayDeque<>();
            stack.push(e);
            while (!stack.isEmpty()) {
                Expr x = stack.pop();
                if (x instanceof Expr.Seq s) {
                    List<Expr> items = s.items();
                    for (int i = items.size() - 1; i >= 0; i--) {
                        stack.push(items.get(i));
                    }
                } else if (x instanceof Expr.Text t) {
                    text(t, out);
                } else if (x instanceof Expr.Chars c) {
                    chars(c.set(), out);
                } else if (x instanceof Expr.Ref ref) {
                    Rule r = g.rule(ref.name()).orElseThrow(() -> new IllegalArgumentException(
                            "rule '" + ref.name() + "' is not defined"));
                    out.add(ruleNt(r));
                } else if (x instanceof Expr.Choice c && c.options().size() == 1) {
                    stack.push(c.options().get(0));
                } else {
                    int h = newNt(null);
                    jobs.add(new Object[] {x, h});
                    out.add(h);
                }
            }
            return out;
        }

        void text(Expr.Text t, IntList out) {
            int[] buf = new int[4];
            String s = t.text();
            for (int i = 0; i < s.length(); ) {
                int cp = s.codePointAt(i);
                i += Character.charCount(cp);
                if (t.ignoreCase() && cp < 0x80 && Character.isLetter(cp)) {
                    long[] bits = new long[4];
                    set(bits, Character.toLowerCase(cp));
                    set(bits, Character.toUpperCase(cp));
                    out.add(term(bits));
                    continue;
                }
                if (cp >= 0xD800 && cp <= 0xDFFF) {
                    out.add(term(new long[4])); // an unpaired surrogate has no UTF-8 form: matches nothing
                    continue;
                }
                int n = Utf8.encode(cp, buf);
                for (int k = 0; k < n; k++) {
                    long[] bits = new long[4];
                    set(bits, buf[k]);
                    out.add(term(bits));
                }
            }
        }

        void chars(CodePointSet set, IntList out) {
            List<Utf8.ByteRanges> seqs = new ArrayList<>();
            for (int i = 0; i < set.rangeCount(); i++) {
                seqs.addAll(Utf8.ranges(set.lo(i), set.hi(i)));
            }
            if (seqs.size() == 1) {
                appendRanges(seqs.get(0), out);
                return;
            }
            if (seqs.isEmpty()) {
                out.add(term(new long[4]));
                return;
            }
            // one-byte alternatives merge into a single terminal; longer ones become productions
            Integer h = charsIds.get(set);
            if (h == null) {
                h = newNt(null);
                charsIds.put(set, h);
                long[] single = new long[4];
                boolean anySingle = false;
                for (Utf8.ByteRanges br : seqs) {
                    if (br.length() == 1) {
                        for (int b = br.lo()[0]; b <= br.hi()[0]; b++) {
                            set(single, b);
                        }
                        anySingle = true;
                    }
                }
                if (anySingle) {
                    IntList p = new IntList();
                    p.add(term(single));
                    addProd(h, p);
                }
                for (Utf8.ByteRanges br : seqs) {
                    if (br.length() > 1) {
                        IntList p = new IntList();
                        appendRanges(br, p);
                        addProd(h, p);
                    }
                }
            }
            out.add(h);
        }

        void appendRanges(Utf8.ByteRanges br, IntList out) {
            for (int k = 0; k < br.length(); k++) {
                long[] bits = new long[4];
                for (int b = br.lo()[k]; b <= br.hi()[k]; b++) {
                    set(bits, b);
                }
                out.add(term(bits));
            }
        }

        static void set(long[] bits, int b) {
            bits[b >>> 6] |= 1L << (b & 63);
        }

        int term(long[] bits) {
            String key = Arrays.toString(bits);
            Integer id = termIds.get(key);
            if (id == null) {
                id = terms.size();
                terms.add(bits);
                termIds.put(key, id);
            }
            return -(id + 1);
        }
    }

    /** A growable int list. */
    static final class IntList {
        int[] a = new int[8];
        int size;

        void add(int v) {
            if (size == a.length) {
                a = Arrays.copyOf(a, size * 2);
            }
            a[size++] = v;
        }
    }
}
