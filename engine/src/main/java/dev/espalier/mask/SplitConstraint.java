package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.earley.ByteChart;
import dev.espalier.earley.SplitChart;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.vocab.RunTokens;
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
    /** Per terminal: vouches for subtrees that stay inside a lexeme without its end. */
    private final LiveRuns[] runs;
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
        runs = new LiveRuns[terms];
        int keys = 0;
        for (int t = 0; t < terms; t++) {
            runs[t] = new LiveRuns(grammar.terminal(t), trie.maxDepth(), true);
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
                long[] second = SECOND.get();
                for (int w = 0; w < 4; w++) {
                    for (long bits = first[w]; bits != 0; bits &= bits - 1) {
                        int by = (w << 6) + Long.numberOfTrailingZeros(bits);
                        int from = nodes[by];
                        int to = nodes[by + 1];
                        // the children of boundary nodes that begin with this byte share its feed
                        if (from == to || !c.feed(by)) {
                            continue;
                        }
                        try {
                            c.expectedBytes(second);
                            for (int x = from; x < to; x++) {
                                int j = nodes[x];
                                for (int y = trie.tokensFrom(j), end = trie.tokensTo(j); y < end; y++) {
                                    int id = trie.tokenAt(y);
                                    mask[id >>> 6] |= 1L << id;
                                }
                                if (trie.skip(j) > j + 1) {
                                    walkSplit(c, j, trie.skip(j), second, mask);
                                }
                            }
                        } finally {
                            c.undo(1);
                        }
                    }
                }
            } finally {
                c.undo(1);
            }
        }
    }

    /**
     * Layout of boundary entries: {@code nodes[b]..nodes[b+1]} index the children, beginning with byte
     * b, of the trie nodes where the lexeme may end; the children follow the 257 offsets.
     */
    private static final int BUCKETS = 257;

    private static final ThreadLocal<long[]> SECOND = ThreadLocal.withInitial(() -> new long[4]);

    private static final ThreadLocal<int[][]> ORIGINS = ThreadLocal.withInitial(() -> new int[1][64]);

    private static int[] originScratch(int n) {
        int[][] holder = ORIGINS.get();
        if (holder[0].length < n) {
            holder[0] = new int[Math.max(n, holder[0].length * 2)];
        }
        return holder[0];
    }

    /**
     * {@link ChartConstraint#walk} with the chart's class known: the hot loop of every boundary walk
     * gets direct calls, whatever other charts the process has met (a shared, polymorphic walk had
     * the JIT recompile it, several times slower, once a byte-level chart went through it).
     */
    private void walkSplit(SplitChart chart, int from, int to, long[] first, long[] mask) {
        VocabularyTrie t = trie;
        int base = chart.depth();
        int baseDepth = t.depth(from);
        int i = from + 1;
        try {
            while (i < to) {
                int rel = t.depth(i) - baseDepth;
                int excess = chart.depth() - (base + rel - 1);
                if (excess > 0) {
                    chart.undo(excess);
                }
                int b = t.label(i) & 0xFF;
                if ((rel == 1 && (first[b >>> 6] & (1L << b)) == 0) || !chart.feed(b)) {
                    i = t.skip(i);
                    continue;
                }
                for (int k = t.tokensFrom(i), end = t.tokensTo(i); k < end; k++) {
                    int id = t.tokenAt(k);
                    mask[id >>> 6] |= 1L << id;
                }
                i++;
            }
        } finally {
            chart.undo(chart.depth() - base);
        }
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
     * lexeme may end there and the token go on; their children by byte, laid out as {@link #BUCKETS} says.
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
     * Walks the trie from DFA state {@code q} of terminal {@code t}, pruning at dead bytes and
     * deciding at once the subtrees {@link #runs} vouches for (inside the lexeme, never at its end):
     * marks in {@code inside} (when not null) every token reached, and returns the children of the
     * accepting nodes bucketed by their byte (laid out as {@link #BUCKETS} says), or an empty array
     * when there are none.
     */
    private int[] lexicalWalk(int t, int q, long[] inside) {
        return lexicalWalk(t, q, inside, runs[t], runs[t].whole(q));
    }

    /**
     * {@link #lexicalWalk(int, int, long[])} with the given coverage, and the runs whose tokens are
     * added in whole words ({@code whole}, from the same coverage, or null): the plain twin steps
     * every node. The runs never pass an accepting state, so no boundary is left unvisited.
     */
    int[] lexicalWalk(int t, int q, long[] inside, VocabularyTrie.Coverage coverage, LiveRuns.Whole whole) {
        ByteDfa dfa = grammar.terminal(t);
        VocabularyTrie tr = trie;
        Boundaries found = new Boundaries(dfa, tr);
        RunTokens tokens = whole == null ? null : whole.tokens(tr, tr.maxDepth());
        tr.collect(dfa::step, coverage, q, inside != null ? inside : new long[words], tr.maxDepth(), found, tokens,
                tokens == null ? 0 : whole.upTo());
        int[] out = found.children;
        int count = found.count;
        if (count == 0) {
            return new int[0];
        }
        // counting sort of the children by their byte, behind the 257 bucket offsets
        int[] nodes = new int[BUCKETS + count];
        for (int k = 0; k < count; k++) {
            nodes[(tr.label(out[k]) & 0xFF) + 1]++;
        }
        nodes[0] = BUCKETS;
        for (int by = 0; by < 256; by++) {
            nodes[by + 1] += nodes[by];
        }
        int[] fill = Arrays.copyOf(nodes, 256);
        for (int k = 0; k < count; k++) {
            nodes[fill[tr.label(out[k]) & 0xFF]++] = out[k];
        }
        return nodes;
    }

    /** Collects, during a walk, the children of the nodes where the lexeme may end. */
    private static final class Boundaries implements VocabularyTrie.Visitor {
        private final ByteDfa dfa;
        private final VocabularyTrie trie;
        int[] children = new int[64];
        int count;

        Boundaries(ByteDfa dfa, VocabularyTrie trie) {
            this.dfa = dfa;
            this.trie = trie;
        }

        @Override
        public void reached(int node, int state) {
            if (dfa.accepts(state) && trie.skip(node) > node + 1) {
                for (int j = node + 1, end = trie.skip(node); j < end; j = trie.skip(j)) {
                    if (count == children.length) {
                        children = Arrays.copyOf(children, count * 2);
                    }
                    children[count++] = j;
                }
            }
        }
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
