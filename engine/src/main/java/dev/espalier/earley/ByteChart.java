package dev.espalier.earley;

/**
 * What the mask engine needs of a parser chart: feed a byte, undo steps, and say where the input
 * stands. Implemented by {@link EarleyChart} (bytes as terminals) and {@link SplitChart} (lexical
 * DFAs under an Earley skeleton).
 */
public interface ByteChart {

    /** Appends one byte if the input stays a viable prefix; when not, returns false and changes nothing. */
    boolean feed(int b);

    /** Takes back the last {@code n} steps (see {@link #depth()}). */
    void undo(int n);

    /** Number of steps that can be undone (one per byte fed). */
    int depth();

    /** Whether the input so far is a string of the language. */
    boolean accepts();

    /** Whether some byte can follow. */
    boolean canContinue();

    /** Writes the bytes that may follow into {@code out}: four words, bit {@code b & 63} of word {@code b >>> 6}. */
    void expectedBytes(long[] out);

    /** An independent copy. */
    ByteChart fork();
}
