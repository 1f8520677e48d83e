package dev.espalier.mask;

/**
 * Limits and budgets for compiling a {@link Constraint}.
 *
 * @param stateLimit       the most states a byte automaton may have (compile fails past it)
 * @param cacheBudgetBytes the most memory the mask caches may hold; past it, entries are evicted
 *                         and recomputed on demand
 * @param parserItemLimit  the most Earley items one sequence's parser chart may hold; past it, the
 *                         step fails with {@link dev.espalier.earley.EarleyLimitException}
 */
public record MaskSettings(int stateLimit, long cacheBudgetBytes, long parserItemLimit) {

    /** Default state limit: 10,000. */
    public static final int DEFAULT_STATE_LIMIT = 10_000;

    /** Default cache budget: 64 MiB. */
    public static final long DEFAULT_CACHE_BUDGET = 64L << 20;

    /** Default parser item limit: 10 million items (about 120 MB of chart). */
    public static final long DEFAULT_PARSER_ITEM_LIMIT = 10_000_000L;

    public MaskSettings {
        if (stateLimit < 1) {
            throw new IllegalArgumentException("state limit must be positive");
        }
        if (cacheBudgetBytes < 0) {
            throw new IllegalArgumentException("cache budget must not be negative");
        }
        if (parserItemLimit < 1) {
            throw new IllegalArgumentException("parser item limit must be positive");
        }
    }

    /** The defaults. */
    public static MaskSettings defaults() {
        return new MaskSettings(DEFAULT_STATE_LIMIT, DEFAULT_CACHE_BUDGET, DEFAULT_PARSER_ITEM_LIMIT);
    }

    /** These settings with another state limit. */
    public MaskSettings withStateLimit(int limit) {
        return new MaskSettings(limit, cacheBudgetBytes, parserItemLimit);
    }

    /** These settings with another cache budget. */
    public MaskSettings withCacheBudget(long bytes) {
        return new MaskSettings(stateLimit, bytes, parserItemLimit);
    }

    /** These settings with another parser item limit. */
    public MaskSettings withParserItemLimit(long items) {
        return new MaskSettings(stateLimit, cacheBudgetBytes, items);
    }
}
