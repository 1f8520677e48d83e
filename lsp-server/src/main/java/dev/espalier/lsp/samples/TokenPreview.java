package dev.espalier.lsp.samples;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.RejectedInputException;
import dev.espalier.mask.TokenBits;
import dev.espalier.vocab.Vocabulary;

/**
 * Where a prefix stands under a constraint: either the first byte that leaves the language, or
 * the tokens allowed next. Every figure is an engine call on a cursor fed the prefix's bytes.
 *
 * @param constraint  the constraint
 * @param prefixBytes the prefix's length in bytes
 * @param rejectedAt  the index of the first byte that leaves the language, or -1 when the whole
 *                    prefix can still be completed
 * @param expected    what may follow where the prefix stands (or, when rejected, where the refused
 *                    byte was), e.g. {@code one of '0'-'9', '-'}
 * @param mask        the allowed tokens (all clear when rejected)
 * @param count       the number of allowed tokens, end of sequence included
 * @param endAllowed  whether the prefix is a complete string of the language
 * @param forced      the bytes every completion continues with (empty when there is a choice)
 */
public record TokenPreview(Constraint constraint, int prefixBytes, int rejectedAt, String expected, long[] mask,
                           int count, boolean endAllowed, byte[] forced) {

    /** Whether the prefix left the language. */
    public boolean rejected() {
        return rejectedAt >= 0;
    }

    /** The vocabulary. */
    public Vocabulary vocabulary() {
        return constraint.vocabulary();
    }

    /**
     * Feeds a prefix to a cursor and reads the allowed tokens.
     *
     * @param cursor a cursor of {@code c} already fed {@code prefix[0, done)}; it is fed the rest
     *               (and left unchanged when the rest is refused)
     */
    static TokenPreview compute(Constraint c, byte[] prefix, Cursor cursor, int done) {
        long[] mask = new long[c.vocabulary().maskWords()];
        try {
            if (done < prefix.length) {
                cursor.feedBytes(java.util.Arrays.copyOfRange(prefix, done, prefix.length));
            }
        } catch (RejectedInputException e) {
            return new TokenPreview(c, prefix.length, done + e.offset(), e.expected(), mask, 0, false, new byte[0]);
        }
        cursor.fillMask(mask);
        return new TokenPreview(c, prefix.length, -1, cursor.expected(), mask, TokenBits.count(mask),
                cursor.isComplete(), cursor.forcedBytes());
    }

    /** Computes the preview of a prefix from a fresh cursor. */
    public static TokenPreview of(Constraint c, byte[] prefix) {
        return compute(c, prefix, c.start(), 0);
    }
}
