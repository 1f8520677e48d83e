package dev.espalier.earley;

/**
 * Thrown when a chart would hold more items than its limit (see
 * {@link EarleyGrammar#newChart(long, boolean)}). The chart is left as it was before the call.
 */
public final class EarleyLimitException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    private final long limit;
    private final int position;

    EarleyLimitException(long limit, int position) {
        super("Earley chart limit of " + limit + " items reached at input byte " + position
                + " (the grammar is too ambiguous for this input, or the input too long)");
        this.limit = limit;
        this.position = position;
    }

    /** The item limit that was reached. */
    public long limit() {
        return limit;
    }

    /** Offset of the input byte whose processing reached the limit. */
    public int position() {
        return position;
    }
}
