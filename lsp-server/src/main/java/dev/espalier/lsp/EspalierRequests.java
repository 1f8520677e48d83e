package dev.espalier.lsp;

import org.eclipse.lsp4j.jsonrpc.services.JsonRequest;

import java.util.concurrent.CompletableFuture;

/**
 * The server's requests beyond the LSP, for editor plugins that want their own view.
 *
 * <p>{@code espalier/allowedTokens} — params {@code {uri, position: {line, character}, limit?}};
 * result {@code {count, vocabularySize, endAllowed, forced, tokens: [{id, text}]}} (see
 * {@link AllowedTokensResult}). A document without a preview (not a mapped sample file) gets an
 * error response with code {@code -32602} (invalid params) and a message saying so.
 */
public interface EspalierRequests {

    /** The vocabulary tokens allowed next at a position of a sample document. */
    @JsonRequest("espalier/allowedTokens")
    CompletableFuture<AllowedTokensResult> allowedTokens(AllowedTokensParams params);
}
