package dev.espalier.vocab;

import java.util.Arrays;

/**
 * The tokens of a trie that are runs over one character set, by their length in characters: every
 * byte an ASCII byte of the set (bit {@code b} of {@code low} for {@code b < 64}, bit
 * {@code b - 64} of {@code high} otherwise) or, when {@code multibyte} is set, part of a character
 * from U+0080 up, the whole a well-formed UTF-8 string whose last character may be cut short (the
 * runs of {@link VocabularyTrie.Coverage}); only tokens of at most {@link #maxDepth()} bytes.
 *
 * <p>A walk that knows how many characters such runs stay alive from its start state can leave their
 * subtrees unvisited and add them here in whole words (see
 * {@link VocabularyTrie#collect(VocabularyTrie.Stepper, VocabularyTrie.Coverage, int, long[], int, RunTokens, int)}).
 * Immutable; made by {@link VocabularyTrie#runTokens}.
 */
public final class RunTokens {

    /** Lengths in characters up to which a mask is kept per length; longer tokens are listed. */
    static final int KEPT = 16;

    /** The trie whose tokens these are. */
    final VocabularyTrie trie;
    private final long low;
    private final long high;
    private final boolean multibyte;
    private final int maxDepth;
    /** {@code upTo[c]}: the tokens of at most {@code c} characters, for c = 0..KEPT. */
    private final long[][] upTo;
    /** The tokens of more than KEPT characters, by ascending length in characters. */
    private final int[] longerIds;
    private final int[] longerChars;

    RunTokens(VocabularyTrie trie, long low, long high, boolean multibyte, int maxDepth, long[][] upTo,
            int[] longerIds, int[] longerChars) {
        this.trie = trie;
        this.low = low;
        this.high = high;
        this.multibyte = multibyte;
        this.maxDepth = maxDepth;
        this.upTo = upTo;
        this.longerIds = longerIds;
        this.longerChars = longerChars;
    }

    /** ASCII bytes 0..63 of the set. */
    public long low() {
        return low;
    }

    /** ASCII bytes 64..127 of the set, bit {@code b - 64}. */
    public long high() {
        return high;
    }

    /** Whether the set holds every character from U+0080 up. */
    public boolean multibyte() {
        return multibyte;
    }

    /** The longest token counted, in bytes. */
    public int maxDepth() {
        return maxDepth;
    }

    /**
     * Whether byte {@code b} (0..255) may occur in a run over the set of ASCII bytes {@code low/high}
     * (with the multibyte characters when {@code multibyte}).
     */
    static boolean holds(long low, long high, boolean multibyte, int b) {
        return b < 64 ? (low >>> b & 1) != 0 : b < 128 ? (high >>> (b - 64) & 1) != 0 : multibyte;
    }

    /** Sets in {@code mask} the bits of the tokens of at most {@code chars} characters. */
    public void addUpTo(int chars, long[] mask) {
        long[] kept = upTo[Math.min(chars, KEPT)];
        for (int w = 0; w < kept.length; w++) {
            mask[w] |= kept[w];
        }
        for (int k = 0; k < longerIds.length && longerChars[k] <= chars; k++) {
            int id = longerIds[k];
            mask[id >>> 6] |= 1L << id;
        }
    }

    /** Number of tokens of at most {@code chars} characters. */
    public int countUpTo(int chars) {
        int n = 0;
        for (long w : upTo[Math.min(chars, KEPT)]) {
            n += Long.bitCount(w);
        }
        for (int k = 0; k < longerIds.length && longerChars[k] <= chars; k++) {
            n++;
        }
        return n;
    }

    /** Bytes held. */
    long memoryBytes() {
        return 8L * upTo.length * (upTo.length == 0 ? 0 : upTo[0].length) + 8L * longerIds.length;
    }

    /**
     * Builds the masks from {@code exact}, the tokens of each length up to {@link #KEPT} characters
     * (index 0 unused; taken over), and the ids and lengths of the longer tokens (any order).
     */
    static RunTokens of(VocabularyTrie trie, long low, long high, boolean multibyte, int maxDepth, long[][] exact,
            int[] ids, int[] chars) {
        for (int c = 1; c <= KEPT; c++) {
            long[] m = exact[c];
            long[] before = exact[c - 1];
            for (int w = 0; w < m.length; w++) {
                m[w] |= before[w];
            }
        }
        long[] packed = new long[ids.length];
        for (int k = 0; k < ids.length; k++) {
            packed[k] = (long) chars[k] << 32 | ids[k];
        }
        Arrays.sort(packed);
        int[] longerIds = new int[ids.length];
        int[] longerChars = new int[ids.length];
        for (int k = 0; k < ids.length; k++) {
            longerIds[k] = (int) packed[k];
            longerChars[k] = (int) (packed[k] >>> 32);
        }
        return new RunTokens(trie, low, high, multibyte, maxDepth, exact, longerIds, longerChars);
    }
}
