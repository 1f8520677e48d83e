package dev.espalier.lsp;

import java.util.List;

/**
 * Result of the custom request {@code espalier/allowedTokens}: the vocabulary tokens allowed after
 * the text before a position.
 *
 * @param count          how many tokens are allowed (all of them, not only those listed)
 * @param vocabularySize the size of the vocabulary
 * @param endAllowed     whether the end of sequence is allowed (the prefix is in the language)
 * @param forced         the continuation every completion shares (visible escapes), empty when
 *                       there is a choice
 * @param tokens         the first {@code limit} allowed tokens by id
 */
public record AllowedTokensResult(int count, int vocabularySize, boolean endAllowed, String forced,
                                  List<AllowedToken> tokens) {

    /**
     * One allowed token.
     *
     * @param id   its id in the vocabulary
     * @param text its text with visible escapes ({@code ␣} for a space, {@code \xNN} for a byte that
     *             is not a whole UTF-8 character)
     */
    public record AllowedToken(int id, String text) {
    }

    /** Copies the list. */
    public AllowedTokensResult {
        forced = forced == null ? "" : forced;
        tokens = tokens == null ? List.of() : List.copyOf(tokens);
    }
}
