package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.earley.ByteChart;
import dev.espalier.earley.SplitChart;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;

import java.util.Arrays;

/**
 * A context-free constraint over a {@link SplitGrammar}: masks split into a lexical part decided
 * once per lexical state and cached, and a syntactic part checked against the parser.
 *
 * <p>At any point the chart holds runs — terminals' DFAs in progress. A token is allowed when
 * <ul>
 *   <li>some run's DFA survives all of its bytes (the token stays inside one lexeme): the run's
 *       <em>inside mask</em>, which depends on the terminal and DFA state alone and is cached per
 *       class of states with the same viable strings up to the longest token; or</li>
 *   <li>some run's DFA accepts after a proper prefix of it (the lexeme may end inside the token) and
 *       the parser, with that lexeme ended, takes the rest: these <em>boundary</em> trie nodes depend
 *       on the terminal and DFA state alone and are cached; only their subtrees are walked with the
 *       parser.</li>
 * </ul>
 * Every token falls under one case or neither, so the mask is exact.
 */
final class SplitConstraint extends ChartConstraint {

    final SplitGrammar grammar;
    private final long maxItems;
    private final int words;
    /** Per terminal: inside-mask class of each DFA state, and the cache-key offsets. */
    private final int[][] insideClass;
    private final int[] insideOffset;
    private final int[] boundaryOffset;
    private final MaskCache cache;
    /** The mask of the initial chart, once computed (a benign race: any thread computes the same). */
    private volatile long[] startMask;

    SplitConstraint(SplitGrammar grammar, Vocabulary vocabulary, MaskSettings settings) {
        super(vocabulary);
        if (grammar.isEmptyLanguage()) {
            throw new IllegalArgumentException("the grammar's language is empty: no output can satisfy it");
        }
        this.grammar = grammar;
        this.maxItems = settings.parserItemLimit();
        this.words = vocabulary.maskWords();
        int terms = grammar.terminalCount();
        insideClass = new int[terms][];
        insideOffset = new int[terms];
        boundaryOffset = new int[terms];
        int keys = 0;
        for (int t = 0; t < terms; t++) {
            insideClass[t] = grammar.terminal(t).viableClasses(trie.maxDepth());
            insideOffset[t] = keys;
            keys += Arrays.stream(insideClass[t]).max().orElse(-1) + 1;
        }
        for (int t = 0; t < terms; t++) {
            boundaryOffset[t] = keys;
            keys += grammar.terminal(t).stateCount();
        }
        this.cache = new MaskCache(keys, settings.cacheBudgetBytes());
    }

    @Override
    ByteChart newChart() {
        return grammar.newChart(maxItems);
    }

    @Override
    void fill(ByteChart chart, long[] mask) {
        SplitChart c = (SplitChart) chart;
        if (c.depth() == 0) {
            // every chart at depth 0 is the initial chart: its mask is computed once
            long[] m = startMask;
            if (m == null) {
                m = new long[words];
                fillFrom(c, m);
                startMask = m;
            }
            System.arraycopy(m, 0, mask, 0, words);
            return;
        }
        fillFrom(c, mask);
    }

    private void fillFrom(SplitChart c, long[] mask) {
        int n = c.runCount();
        for (int k = 0; k < n; k++) {
            int t = c.runTerminal(k);
            int cls = insideClass[t][c.runState(k)];
            boolean seen = false;
            for (int j = 0; j < k && !seen; j++) {
                seen = c.runTerminal(j) == t && insideClass[t][c.runState(j)] == cls;
            }
            if (!seen) {
                long[] inside = inside(t, c.runState(k));
                for (int w = 0; w < words; w++) {
                    mask[w] |= inside[w];
                }
            }
        }
        long[] first = expectedScratch();
        int[] origins = originScratch(n);
        for (int k = 0; k < n; k++) {
            // read before pushEnds: the run accessors describe the top set, restored by undo(1)
            int t = c.runTerminal(k);
            int q = c.runState(k);
            boolean seen = false;
            for (int j = 0; j < k && !seen; j++) {
                seen = c.runTerminal(j) == t && c.runState(j) == q;
            }
            if (seen) {
                continue;
            }
            int[] nodes = boundary(t, q);
            if (nodes.length == 0) {
                continue;
            }
            // runs of one terminal in one DFA state share their boundary nodes: one walk serves them all
            int m = 0;
            for (int j = k; j < n; j++) {
                if (c.runTerminal(j) == t && c.runState(j) == q) {
                    origins[m++] = c.runOrigin(j);
                }
            }
            c.pushEnds(t, origins, m);
            try {
                c.expectedBytes(first);
                int f0 = (int) first[0];
                int f1 = (int) (first[0] >>> 32);
                int f2 = (int) first[1];
                int f3 = (int) (first[1] >>> 32);
                int f4 = (int) first[2];
                int f5 = (int) (first[2] >>> 32);
                int f6 = (int) first[3];
                int f7 = (int) (first[3] >>> 32);
                for (int e = 0; e < nodes.length; e += NODE_STRIDE) {
                    // a node none of whose children begins with an expected byte is skipped outright
                    if ((nodes[e + 1] & f0 | nodes[e + 2] & f1 | nodes[e + 3] & f2 | nodes[e + 4] & f3
                            | nodes[e + 5] & f4 | nodes[e + 6] & f5 | nodes[e + 7] & f6 | nodes[e + 8] & f7) != 0) {
                        walk(c, nodes[e], trie.skip(nodes[e]), first, mask);
                    }
                }
            } finally {
                c.undo(1);
            }
        }
    }

    /** Ints per boundary node: the trie node, then eight words of its children's byte set (bit b of word b/32). */
    private static final int NODE_STRIDE = 9;

    private static final ThreadLocal<int[][]> ORIGINS = ThreadLocal.withInitial(() -> new int[1][64]);

    private static int[] originScratch(int n) {
        int[][] holder = ORIGINS.get();
        if (holder[0].length < n) {
            holder[0] = new int[Math.max(n, holder[0].length * 2)];
        }
        return holder[0];
    }

    /** Tokens that keep terminal {@code t}'s DFA alive from {@code q}. */
    private long[] inside(int t, int q) {
        int key = insideOffset[t] + insideClass[t][q];
        long[] m = cache.get(key);
        if (m == null) {
            m = new long[words];
            int[] nodes = lexicalWalk(t, q, m);
            if (cache.getObject(boundaryOffset[t] + q) == null) {
                cache.putObject(boundaryOffset[t] + q, nodes);
            }
            m = cache.put(key, m);
        }
        return m;
    }

    /**
     * Trie nodes with children at which terminal {@code t}'s DFA, started in {@code q}, accepts: the
     * lexeme may end there and the token go on ({@link #NODE_STRIDE} ints per node).
     */
    private int[] boundary(int t, int q) {
        int key = boundaryOffset[t] + q;
        Object known = cache.getObject(key);
        if (known != null) {
            return (int[]) known;
        }
        // one walk yields the inside mask too, when it is not cached yet
        int insideKey = insideOffset[t] + insideClass[t][q];
        long[] m = cache.get(insideKey) == null ? new long[words] : null;
        int[] nodes = lexicalWalk(t, q, m);
        if (m != null) {
            cache.put(insideKey, m);
        }
        return (int[]) cache.putObject(key, nodes);
    }

    /**
     * Walks the trie from DFA state {@code q} of terminal {@code t}, pruning at dead bytes: marks in
     * {@code inside} (when not null) every token reached, and returns the accepting nodes with children,
     * {@link #NODE_STRIDE} ints each: the node, then the 256-bit set of its children's first bytes.
     */
    private int[] lexicalWalk(int t, int q, long[] inside) {
        ByteDfa dfa = grammar.terminal(t);
        VocabularyTrie tr = trie;
        int[] at = new int[tr.maxDepth() + 1];
        at[0] = q;
        int[] out = new int[16 * NODE_STRIDE];
        int count = 0;
        int n = tr.nodeCount();
        int i = 1;
        while (i < n) {
            int d = tr.depth(i);
            int next = dfa.step(at[d - 1], tr.label(i));
            if (next == ByteDfa.DEAD) {
                i = tr.skip(i);
                continue;
            }
            at[d] = next;
            if (inside != null) {
                for (int k = tr.tokensFrom(i), end = tr.tokensTo(i); k < end; k++) {
                    int id = tr.tokenAt(k);
                    inside[id >>> 6] |= 1L << id;
                }
            }
            if (dfa.accepts(next) && tr.skip(i) > i + 1) {
                if (count + NODE_STRIDE > out.length) {
                    out = Arrays.copyOf(out, out.length * 2);
                }
                out[count] = i;
                for (int j = i + 1, end = tr.skip(i); j < end; j = tr.skip(j)) {
                    int b = tr.label(j) & 0xFF;
                    out[count + 1 + (b >>> 5)] |= 1 << b;
                }
                count += NODE_STRIDE;
            }
            i++;
        }
        return Arrays.copyOf(out, count);
    }

    @Override
    public long cacheBytes() {
        long[] m = startMask;
        return cache.bytes() + (m == null ? 0 : 16L + 8L * m.length);
    }

    @Override
    public int cachedMasks() {
        return cache.count();
    }

    @Override
    public String describe() {
        return "Earley skeleton of " + grammar.nonterminalCount() + " nonterminals over " + grammar.terminalCount()
                + " lexical automata";
    }
}
