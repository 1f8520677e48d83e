package dev.espalier.mask;

/**
 * The per-sequence state of a {@link Constraint}: where one output stands in the language. A cursor
 * is not thread-safe; give each sequence its own (see {@link #fork()}).
 *
 * <p>Every successful {@code feed} call is one step that {@link #undo(int)} can take back.
 * Refused input leaves the cursor unchanged.
 */
public interface Cursor {

    /** The constraint this cursor follows. */
    Constraint constraint();

    /**
     * Writes the allowed tokens into {@code mask} (every word of the vocabulary's range is
     * overwritten). Bit {@code id} is set if and only if the text so far plus the token's bytes can
     * still be completed to a string of the language; the end-of-sequence bit is set if and only if
     * the text so far is in the language. Does not allocate once the mask is cached.
     *
     * @param mask at least {@link dev.espalier.vocab.Vocabulary#maskWords()} words
     */
    void fillMask(long[] mask);

    /** Whether token {@code id} is allowed next. */
    boolean allows(int id);

    /**
     * Appends token {@code id}.
     *
     * @throws RejectedInputException when the token is not allowed (the cursor is unchanged)
     */
    void feed(int id);

    /** Appends token {@code id} if allowed; returns whether it was. */
    boolean tryFeed(int id);

    /**
     * Appends raw bytes as one step (they need not be a token, nor whole UTF-8 characters).
     *
     * @throws RejectedInputException naming the first refused byte (the cursor is unchanged)
     */
    void feedBytes(byte[] bytes);

    /** Appends raw bytes as one step if they keep the text completable; returns whether they did. */
    boolean tryFeedBytes(byte[] bytes);

    /** Appends the UTF-8 bytes of {@code text} as one step. */
    void feedText(String text);

    /**
     * Takes back the last {@code steps} steps.
     *
     * @throws IllegalArgumentException when fewer steps were taken
     */
    void undo(int steps);

    /** Number of steps that can be undone. */
    int steps();

    /** An independent copy of this cursor (its own history included). */
    Cursor fork();

    /** Whether the text so far is a string of the language (end of sequence is allowed). */
    boolean isComplete();

    /** Whether the end-of-sequence token has been fed; nothing is allowed after it. */
    boolean isFinished();

    /** Whether anything other than end of sequence can follow. */
    boolean canContinue();

    /**
     * The bytes that are the only way on: the longest byte string that every completion of the
     * text so far starts with. Empty when there is a choice (ending the text counts as a choice).
     * A caller can feed these without asking the model.
     */
    byte[] forcedBytes();

    /** A readable description of what may follow, e.g. {@code one of '0'-'9', '-'}. */
    String expected();
}
