package dev.espalier.mask;

/**
 * Input that cannot be continued to a string of the language was offered to a {@link Cursor}. The
 * cursor is unchanged.
 */
public class RejectedInputException extends RuntimeException {

    private final int offset;
    private final String expected;

    /**
     * @param message  what was refused
     * @param offset   index of the first refused byte within the offered input
     * @param expected a readable description of what could have followed instead
     */
    public RejectedInputException(String message, int offset, String expected) {
        super(message);
        this.offset = offset;
        this.expected = expected;
    }

    /** Index of the first refused byte within the offered input (0 for a refused token id). */
    public int offset() {
        return offset;
    }

    /** What could have followed instead, e.g. {@code one of '0'-'9', '-'}, or {@code end of text}. */
    public String expected() {
        return expected;
    }
}
