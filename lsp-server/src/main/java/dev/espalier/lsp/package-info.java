/**
 * The language server ({@code espalier serve}): live checking of grammar files and a preview of the
 * tokens a model may emit in sample files, over the LSP (lsp4j).
 *
 * <h2>Extension points</h2>
 * <ul>
 *   <li>{@link dev.espalier.lsp.DocumentFeatures} — what the server does for one kind of document;
 *       every method defaults to offering nothing. {@link dev.espalier.lsp.GrammarFeatures} serves
 *       {@code .abnf} files.</li>
 *   <li>{@link dev.espalier.lsp.ServerOptions#samples()} — a
 *       {@link dev.espalier.lsp.ServerOptions.SampleFeatures} factory that makes the features of all
 *       other documents (sample outputs and their workspace mapping); it receives a
 *       {@link dev.espalier.lsp.ServerContext} (workspace folders, open documents, the client's log,
 *       a diagnostics refresh).</li>
 *   <li>{@link dev.espalier.lsp.EspalierRequests} — the custom request
 *       {@code espalier/allowedTokens}, answered by
 *       {@link dev.espalier.lsp.DocumentFeatures#allowedTokens}.</li>
 *   <li>{@link dev.espalier.lsp.SemanticLegend} — the semantic token types every kind shares.</li>
 * </ul>
 *
 * <p>Routing, threads and failure handling are described on {@link dev.espalier.lsp.EspalierServer}.
 */
package dev.espalier.lsp;
