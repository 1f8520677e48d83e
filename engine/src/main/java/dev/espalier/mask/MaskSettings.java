package dev.espalier.mask;

/**
 * Limits and budgets for compiling a {@link Constraint}.
 *
 * @param stateLimit       the most states a byte automaton may have (compile fails past it)
 * @param cacheBudgetBytes the most memory the per-state mask cache may hold; past it, entries are
 *                         evicted and recomputed on demand
 */
public record MaskSettings(int stateLimit, long cacheBudgetBytes) {

    /** Default state limit: 10,000. */
    public static final int DEFAULT_STATE_LIMIT = 10_000;

    /** Default cache budget: 64 MiB. */
    public static final long DEFAULT_CACHE_BUDGET = 64L << 20;

    public MaskSettings {
        if (stateLimit < 1) {
            throw new IllegalArgumentException("state limit must be positive");
        }
        if (cacheBudgetBytes < 0) {
            throw new IllegalArgumentException("cache budget must not be negative");
        }
    }

    /** The defaults. */
    public static MaskSettings defaults() {
        return new MaskSettings(DEFAULT_STATE_LIMIT, DEFAULT_CACHE_BUDGET);
    }

    /** These settings with another state limit. */
    public MaskSettings withStateLimit(int limit) {
        return new MaskSettings(limit, cacheBudgetBytes);
    }

    /** These settings with another cache budget. */
    public MaskSettings withCacheBudget(long bytes) {
        return new MaskSettings(stateLimit, bytes);
    }
}
