package dev.espalier.automaton;

/**
 * Thrown when building an automaton would cross its configured size limit. Raised before the
 * oversized structure is built in full, so memory stays bounded.
 */
public final class AutomatonTooLargeException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    private final int limit;

    /**
     * Creates the exception for a state limit.
     *
     * @param limit the state limit that was exceeded
     */
    public AutomatonTooLargeException(int limit) {
        this(limit, "the automaton exceeds its limit of " + limit + " states");
    }

    /**
     * Creates the exception with a specific message.
     *
     * @param limit   the state limit in force
     * @param message what was exceeded
     */
    public AutomatonTooLargeException(int limit, String message) {
        super(message);
        this.limit = limit;
    }

    /** The state limit in force when the automaton grew too large. */
    public int limit() {
        return limit;
    }
}
