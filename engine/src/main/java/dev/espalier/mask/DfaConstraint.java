package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.RunTokens;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;


/** A constraint whose language is given by a byte DFA: one cached mask per automaton state. */
final class DfaConstraint implements Constraint {

    final ByteDfa dfa;
    final Vocabulary vocabulary;
    final VocabularyTrie trie;
    private final MaskCache cache;
    private final int words;
    /** States with the same viable byte strings up to the longest token share one mask. */
    private final int[] maskClass;
    /**
     * With many more mask classes than classes up to {@link #SHORT} bytes (a string with a length
     * bound: each count is its own class, though all counts far from the bound agree on short
     * tokens), a mask is computed in two parts: the tokens of at most {@link #SHORT} bytes from a
     * mask cached per short class, the longer tokens by a walk of their own trie. Null otherwise.
     */
    private final int[] shortClass;
    private final MaskCache shortCache;
    /** The tokens longer than {@link #SHORT} bytes, for the second part. */
    private final VocabularyTrie longTrie;
    /** Vouches for whole subtrees of plain-text tokens during walks. */
    private final LiveRuns runs;

    /** Token length (bytes) up to which the two-part computation caches masks per short class. */
    static final int SHORT = 12;

    /** Fewest mask classes for which the two-part computation is considered. */
    static final int TWO_PART_CLASSES = 256;

    DfaConstraint(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("the language is empty: no output can satisfy it");
        }
        this.dfa = dfa;
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
        this.words = vocabulary.maskWords();
        this.runs = new LiveRuns(dfa, trie.maxDepth());
        // both partitions come from one run of refinement rounds
        int[][] classes = trie.maxDepth() > SHORT
                ? dfa.viableClasses(new int[] {SHORT, trie.maxDepth()})
                : new int[][] {null, dfa.viableClasses(trie.maxDepth())};
        this.maskClass = classes[1];
        // few mask classes: one walk each is cheap, and the short classes are not worth computing
        int[] shortClasses = max(maskClass) + 1 > TWO_PART_CLASSES ? classes[0] : null;
        if (shortClasses != null && 2 * (max(shortClasses) + 1) < max(maskClass) + 1) {
            this.shortClass = shortClasses;
            this.shortCache = new MaskCache(max(shortClasses) + 1, settings.cacheBudgetBytes() / 2);
            this.cache = new MaskCache(cacheSlots(), settings.cacheBudgetBytes() / 2);
            this.longTrie = vocabulary.trieLongerThan(SHORT);
        } else {
            this.shortClass = null;
            this.shortCache = null;
            this.longTrie = null;
            this.cache = new MaskCache(cacheSlots(), settings.cacheBudgetBytes());
        }
    }

    private static int max(int[] a) {
        int m = -1;
        for (int x : a) {
            m = Math.max(m, x);
        }
        return m;
    }


    @Override
    public Vocabulary vocabulary() {
        return vocabulary;
    }

    @Override
    public Cursor start() {
        return new DfaCursor(this);
    }

    private int cacheSlots() {
        int classes = 0;
        for (int c : maskClass) {
            classes = Math.max(classes, c + 1);
        }
        return classes;
    }

    @Override
    public long cacheBytes() {
        return cache.bytes() + (shortCache == null ? 0 : shortCache.bytes());
    }

    @Override
    public int cachedMasks() {
        return cache.count();
    }

    @Override
    public String describe() {
        return "byte DFA, " + dfa.stateCount() + " states, " + dfa.classCount() + " byte classes, "
                + cacheSlots() + " distinct masks";
    }

    /** The mask of automaton state {@code state}, end of sequence not included; cached per mask class. */
    long[] mask(int state) {
        int key = maskClass[state];
        long[] m = cache.get(key);
        if (m == null) {
            m = cache.put(key, compute(state));
        }
        return m;
    }

    /** Writes the mask of {@code state} into {@code out}, end of sequence included. */
    void fill(int state, long[] out) {
        System.arraycopy(mask(state), 0, out, 0, words);
        int eos = vocabulary.endOfSequence();
        if (eos >= 0) {
            if (dfa.accepts(state)) {
                out[eos >>> 6] |= 1L << eos;
            } else {
                out[eos >>> 6] &= ~(1L << eos);
            }
        }
    }

    /**
     * Walks the vocabulary trie alongside the automaton, pruning a subtree at its first dead byte and
     * taking whole the subtrees {@link #runs} vouches for; in two parts when {@link #shortClass} is
     * set (short tokens from their cached mask, long tokens by a walk of their own trie).
     * {@link #computeByWalk} is the plain one-walk twin.
     */
    long[] compute(int state) {
        LiveRuns.Whole whole = runs.whole(state);
        if (shortClass == null) {
            long[] m = new long[words];
            walk(trie, state, m, trie.maxDepth(), whole);
            return m;
        }
        int key = shortClass[state];
        long[] shortMask = shortCache.get(key);
        if (shortMask == null) {
            shortMask = new long[words];
            walk(trie, state, shortMask, SHORT, whole);
            shortMask = shortCache.put(key, shortMask);
        }
        long[] m = shortMask.clone();
        walk(longTrie, state, m, longTrie.maxDepth(), whole);
        return m;
    }

    /**
     * One walk of {@code t} from {@code state}; when the state's first runs are over a large set (text
     * inside a string, {@code whole}), the tokens made of that set are added in whole words instead of visited.
     */
    private void walk(VocabularyTrie t, int state, long[] m, int maxDepth, LiveRuns.Whole whole) {
        RunTokens tokens = whole == null ? null : whole.tokens(t, maxDepth);
        t.collect(dfa::step, runs, state, m, maxDepth, tokens, tokens == null ? 0 : whole.upTo());
    }

    /** The mask of {@code state} by one plain walk of the whole trie, every node stepped. */
    long[] computeByWalk(int state) {
        long[] m = new long[words];
        trie.collect(dfa::step, state, m);
        return m;
    }

    /** Whether masks are computed in two parts (see {@link #shortClass}). */
    boolean twoPart() {
        return shortClass != null;
    }
}
