package dev.espalier.lsp;

import org.eclipse.lsp4j.Position;

/**
 * Parameters of the custom request {@code espalier/allowedTokens}.
 *
 * @param uri      the sample document
 * @param position where the next token would go; the text before it is the prefix
 * @param limit    the most tokens to list (null: {@link #DEFAULT_LIMIT})
 */
public record AllowedTokensParams(String uri, Position position, Integer limit) {

    /** Tokens listed when no limit is given. */
    public static final int DEFAULT_LIMIT = 200;

    /** The limit to apply: the given one, at least 0, or {@link #DEFAULT_LIMIT}. */
    public int effectiveLimit() {
        return limit == null ? DEFAULT_LIMIT : Math.max(0, limit);
    }
}
