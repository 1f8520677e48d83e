package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Expr;
import dev.espalier.regex.RegexSyntax;
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

    /**
     * Compiles a regular expression (the syntax of JSON Schema's {@code pattern}, see
     * {@link RegexSyntax}) against a vocabulary with default settings. The whole output must match
     * the whole pattern.
     *
     * @throws dev.espalier.regex.RegexSyntaxException for an invalid or unsupported pattern
     * @throws dev.espalier.automaton.AutomatonTooLargeException when the automaton crosses its state limit
     * @throws IllegalArgumentException when no string matches the pattern
     */
    static Constraint regex(String pattern, Vocabulary vocabulary) {
        return regex(pattern, vocabulary, MaskSettings.defaults());
    }

    /** As {@link #regex(String, Vocabulary)}, with explicit settings. */
    static Constraint regex(String pattern, Vocabulary vocabulary, MaskSettings settings) {
        Expr expr = RegexSyntax.parse(pattern);
        ByteDfa dfa = ByteDfa.fromCharAutomaton(CharAutomata.compile(expr, null, settings.stateLimit()),
                settings.stateLimit());
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("no string matches the pattern: its language is empty");
        }
        return of(dfa, vocabulary, settings);
    }
}
