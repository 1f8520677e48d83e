package dev.espalier.mask;

import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.grammar.Grammar;
import dev.espalier.vocab.Vocabulary;

/**
 * THE ORACLE for context-free token masks: slow and obviously correct. Every question starts a
 * FRESH Earley chart ({@link EarleyGrammar#newChart()}) and feeds the whole byte string from the
 * beginning; nothing is shared between questions, nothing is undone, no trie is walked.
 *
 * <ul>
 *   <li>A token is allowed after a prefix iff every byte of prefix + token is accepted by the chart
 *       (the chart refuses a byte exactly when no string of the language starts with the bytes so
 *       far: a viable-prefix recognizer).</li>
 *   <li>End of sequence is allowed iff the chart accepts the prefix as a whole string.</li>
 *   <li>Special tokens (and empty tokens) are never allowed.</li>
 * </ul>
 * This checks the mask engine's trie walk, caches, undo and automaton route against plain Earley
 * recognition (Earley 1970); the recognizer itself is checked elsewhere (parse counts, and the
 * generation test's outputs against Jackson).
 */
final class ReferenceMasks {

    private final EarleyGrammar grammar;
    private final Vocabulary vocabulary;

    ReferenceMasks(Grammar g, Vocabulary vocabulary) {
        this.grammar = EarleyGrammar.compile(g);
        this.vocabulary = vocabulary;
    }

    /** Offset of the first byte of {@code bytes} that no string of the language allows, or -1. */
    int firstRefused(byte[] bytes) {
        EarleyChart chart = grammar.newChart();
        for (int i = 0; i < bytes.length; i++) {
            if (!chart.feed(bytes[i] & 0xFF)) {
                return i;
            }
        }
        return -1;
    }

    /** Whether some string of the language starts with {@code bytes}. */
    boolean viable(byte[] bytes) {
        return firstRefused(bytes) < 0;
    }

    /** Whether {@code bytes} is a string of the language. */
    boolean accepts(byte[] bytes) {
        EarleyChart chart = grammar.newChart();
        for (byte b : bytes) {
            if (!chart.feed(b & 0xFF)) {
                return false;
            }
        }
        return chart.accepts();
    }

    /** Whether token {@code id} may follow {@code prefix}. */
    boolean allows(byte[] prefix, int id) {
        if (!vocabulary.has(id)) {
            return false;
        }
        if (id == vocabulary.endOfSequence()) {
            return accepts(prefix);
        }
        if (vocabulary.isSpecial(id) || vocabulary.length(id) == 0) {
            return false;
        }
        byte[] token = vocabulary.bytes(id);
        EarleyChart chart = grammar.newChart();
        for (byte b : prefix) {
            if (!chart.feed(b & 0xFF)) {
                return false;
            }
        }
        for (byte b : token) {
            if (!chart.feed(b & 0xFF)) {
                return false;
            }
        }
        return true;
    }

    /** The whole mask after {@code prefix}, token by token. */
    long[] mask(byte[] prefix) {
        long[] m = new long[vocabulary.maskWords()];
        for (int id = 0; id < vocabulary.size(); id++) {
            if (allows(prefix, id)) {
                TokenBits.set(m, id);
            }
        }
        return m;
    }
}
