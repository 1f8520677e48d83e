package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;

/** A constraint whose language is given by a byte DFA: one cached mask per automaton state. */
final class DfaConstraint implements Constraint {

    final ByteDfa dfa;
    final Vocabulary vocabulary;
    final VocabularyTrie trie;
    private final MaskCache cache;
    private final int words;
    /** States with the same viable byte strings up to the longest token share one mask. */
    private final int[] maskClass;

    DfaConstraint(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("the language is empty: no output can satisfy it");
        }
        this.dfa = dfa;
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
        this.words = vocabulary.maskWords();
        this.maskClass = maskClasses(dfa, trie.maxDepth());
        this.cache = new MaskCache(cacheSlots(), settings.cacheBudgetBytes());
    }

    /**
     * Partitions states by their viable byte strings of length up to {@code depth}: refinement
     * rounds of "same block, and every byte leads to the same block or dies in both", stopped at
     * {@code depth} rounds or when stable. States in one block allow exactly the same tokens (end
     * of sequence aside, which depends on acceptance and is set per state).
     */
    static int[] maskClasses(ByteDfa dfa, int depth) {
        int n = dfa.stateCount();
        int classes = dfa.classCount();
        int[] block = new int[n];
        int blocks = 1;
        for (int round = 0; round < depth; round++) {
            Map<Key, Integer> ids = new HashMap<>();
            int[] next = new int[n];
            for (int s = 0; s < n; s++) {
                int[] key = new int[classes + 1];
                key[0] = block[s];
                for (int c = 0; c < classes; c++) {
                    int t = dfa.stepClass(s, c);
                    key[c + 1] = t == ByteDfa.DEAD ? -1 : block[t];
                }
                int size = ids.size();
                next[s] = ids.computeIfAbsent(new Key(key), k -> size);
            }
            block = next;
            if (ids.size() == blocks) {
                break;
            }
            blocks = ids.size();
        }
        return block;
    }

    private record Key(int[] v) {
        @Override
        public boolean equals(Object o) {
            return o instanceof Key k && Arrays.equals(v, k.v);
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(v);
        }
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
        return cache.bytes();
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

    /** Walks the vocabulary trie alongside the automaton, pruning a subtree at its first dead byte. */
    long[] compute(int state) {
        long[] m = new long[words];
        trie.collect(dfa::step, state, m);
        return m;
    }
}
