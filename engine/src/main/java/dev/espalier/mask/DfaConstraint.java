package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
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

    DfaConstraint(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("the language is empty: no output can satisfy it");
        }
        this.dfa = dfa;
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
        this.words = vocabulary.maskWords();
        this.maskClass = dfa.viableClasses(trie.maxDepth());
        this.cache = new MaskCache(cacheSlots(), settings.cacheBudgetBytes());
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
