package dev.espalier.automaton;

/** An automaton grew past its configured state limit while being built. */
public class AutomatonTooLargeException extends RuntimeException {

    private final int limit;

    /**
     * @param limit   the limit that was crossed
     * @param message what was being built
     */
    public AutomatonTooLargeException(int limit, String message) {
        super(message);
        this.limit = limit;
    }

    /** The state limit that was crossed. */
    public int limit() {
        return limit;
    }
}
