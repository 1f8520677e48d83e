package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.Vocabulary;

/**
 * A language compiled against a vocabulary: the immutable, thread-safe source of token masks. One
 * constraint serves any number of sequences, each through its own {@link Cursor}.
 */
public interface Constraint {

    /** The vocabulary masks are over. */
    Vocabulary vocabulary();

    /** A cursor at the start of a new output. */
    Cursor start();

    /** Bytes currently held by mask caches. */
    long cacheBytes();

    /** Number of masks currently cached. */
    int cachedMasks();

    /** A short description of the compiled form, e.g. {@code byte DFA, 23 states, 7 byte classes}. */
    String describe();

    /**
     * A constraint over a byte automaton.
     *
     * @throws IllegalArgumentException when the automaton's language is empty
     */
    static Constraint of(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        return new DfaConstraint(dfa, vocabulary, settings);
    }
}
