package dev.espalier.regex;

/**
 * A regular expression that cannot be compiled: malformed, or using a construct outside the
 * supported subset (backreferences, lookaround, word boundaries, anchors in the middle).
 *
 * <p>{@link #getMessage()} ends with {@code ", at offset N"}; {@link #reason()} is the same text
 * without the position, for tools that show the position by other means.
 */
public final class RegexSyntaxException extends IllegalArgumentException {

    private static final long serialVersionUID = 1L;

    private final String reason;
    private final int index;
    private final int length;

    /**
     * Creates the exception.
     *
     * @param reason what is wrong, without the position
     * @param index  0-based offset (in UTF-16 units) of the offending text in the pattern
     * @param length length of the offending text, at least 0
     */
    public RegexSyntaxException(String reason, int index, int length) {
        super(reason + ", at offset " + index);
        this.reason = reason;
        this.index = index;
        this.length = Math.max(0, length);
    }

    /** What is wrong, without the position. */
    public String reason() {
        return reason;
    }

    /** 0-based offset (in UTF-16 units) of the offending text in the pattern. */
    public int index() {
        return index;
    }

    /** Length (in UTF-16 units) of the offending text; 0 when it is a position such as the end. */
    public int length() {
        return length;
    }
}
