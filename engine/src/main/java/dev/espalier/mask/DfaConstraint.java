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

    DfaConstraint(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("the language is empty: no output can satisfy it");
        }
        this.dfa = dfa;
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
        this.words = vocabulary.maskWords();
        this.cache = new MaskCache(dfa.stateCount(), settings.cacheBudgetBytes());
    }

    @Override
    public Vocabulary vocabulary() {
        return vocabulary;
    }

    @Override
    public Cursor start() {
        return new DfaCursor(this);
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
        return "byte DFA, " + dfa.stateCount() + " states, " + dfa.classCount() + " byte classes";
    }

    /** The mask of automaton state {@code state}, end of sequence included; cached. */
    long[] mask(int state) {
        long[] m = cache.get(state);
        if (m == null) {
            m = cache.put(state, compute(state));
        }
        return m;
    }

    /** Walks the vocabulary trie alongside the automaton, pruning a subtree at its first dead byte. */
    long[] compute(int state) {
        long[] m = new long[words];
        int[] at = new int[trie.maxDepth() + 1];
        at[0] = state;
        int n = trie.nodeCount();
        int i = 1;
        while (i < n) {
            int next = dfa.step(at[trie.depth(i) - 1], trie.label(i));
            if (next == ByteDfa.DEAD) {
                i = trie.skip(i);
                continue;
            }
            at[trie.depth(i)] = next;
            for (int k = trie.tokensFrom(i), end = trie.tokensTo(i); k < end; k++) {
                int id = trie.tokenAt(k);
                m[id >>> 6] |= 1L << id;
            }
            i++;
        }
        int eos = vocabulary.endOfSequence();
        if (eos >= 0 && dfa.accepts(state)) {
            m[eos >>> 6] |= 1L << eos;
        }
        return m;
    }
}
