package dev.espalier.lsp;

import org.eclipse.lsp4j.CodeAction;
import org.eclipse.lsp4j.CodeActionParams;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DocumentSymbol;
import org.eclipse.lsp4j.FileEvent;
import org.eclipse.lsp4j.FoldingRange;
import org.eclipse.lsp4j.FormattingOptions;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.Location;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextEdit;
import org.eclipse.lsp4j.WorkspaceEdit;
import org.eclipse.lsp4j.WorkspaceSymbol;

import java.util.List;

/**
 * What the server can do for one kind of document. {@link EspalierServer} routes every request to
 * the features of the document it names ({@link EspalierServer#featuresFor}): {@code .abnf} files to
 * {@link GrammarFeatures}, everything else to the sample features of {@link ServerOptions#samples()}.
 *
 * <p>Every method has a default that offers nothing, so an implementation overrides only what it
 * supports. The server calls these methods on its one analysis thread, never concurrently, always
 * with the latest snapshot of the document; an implementation may therefore cache per document
 * without locking. Exceptions thrown here become error responses (and a {@code window/logMessage});
 * they never stop the server. Positions and ranges are LSP positions (UTF-16), converted with
 * {@link DocumentSnapshot#offset} and {@link DocumentSnapshot#range}.
 */
public interface DocumentFeatures {

    /** Features of documents the server knows nothing about: every method offers nothing. */
    DocumentFeatures NONE = new DocumentFeatures() {
    };

    /**
     * The findings for a document, published after each change (debounced). The server caps their
     * number ({@link ServerOptions#maxDiagnostics()}) and drops them when a newer version arrived
     * meanwhile.
     */
    default List<Diagnostic> diagnostics(DocumentSnapshot doc) {
        return List.of();
    }

    /** Completion items at a position. The server wraps each item's {@code data} to route resolve. */
    default CompletionList completion(DocumentSnapshot doc, Position position) {
        return new CompletionList(false, List.of());
    }

    /**
     * Fills in the details of a completion item chosen from {@link #completion}; its {@code data} is
     * the value the item had when returned (as a JSON element after the round trip).
     *
     * @param doc the document's latest snapshot, or null when it has been closed meanwhile
     */
    default CompletionItem resolve(DocumentSnapshot doc, CompletionItem item) {
        return item;
    }

    /** Hover information at a position, or null for none. */
    default Hover hover(DocumentSnapshot doc, Position position) {
        return null;
    }

    /** Where the symbol at a position is defined. */
    default List<Location> definition(DocumentSnapshot doc, Position position) {
        return List.of();
    }

    /** Every use of the symbol at a position, with its definitions when asked. */
    default List<Location> references(DocumentSnapshot doc, Position position, boolean includeDeclaration) {
        return List.of();
    }

    /** The range of the symbol to rename at a position, or null when nothing there can be renamed. */
    default Range prepareRename(DocumentSnapshot doc, Position position) {
        return null;
    }

    /**
     * The edits that rename the symbol at a position.
     *
     * @throws IllegalArgumentException with a message for people when the new name is not valid
     */
    default WorkspaceEdit rename(DocumentSnapshot doc, Position position, String newName) {
        return null;
    }

    /** The document's outline. */
    default List<DocumentSymbol> documentSymbols(DocumentSnapshot doc) {
        return List.of();
    }

    /**
     * Symbols matching a query across the workspace (open documents and files under the workspace
     * folders, see {@link ServerContext}). The server concatenates the answers of every kind.
     */
    default List<WorkspaceSymbol> workspaceSymbols(String query) {
        return List.of();
    }

    /**
     * Semantic tokens of the whole document in the LSP's relative encoding (five integers per
     * token), with types and modifiers indexed in {@link SemanticLegend}.
     */
    default List<Integer> semanticTokens(DocumentSnapshot doc) {
        return List.of();
    }

    /** Regions the editor may fold. */
    default List<FoldingRange> foldingRanges(DocumentSnapshot doc) {
        return List.of();
    }

    /** Edits that bring the whole document into its canonical layout (none when it is already). */
    default List<TextEdit> formatting(DocumentSnapshot doc, FormattingOptions options) {
        return List.of();
    }

    /** Quick fixes and other actions for a range and the diagnostics the client sent with it. */
    default List<CodeAction> codeActions(DocumentSnapshot doc, CodeActionParams params) {
        return List.of();
    }

    /**
     * The vocabulary tokens allowed next at a position (the custom request
     * {@code espalier/allowedTokens}), or null when this document has no such preview.
     *
     * @param limit the most tokens to list (the count covers all of them)
     */
    default AllowedTokensResult allowedTokens(DocumentSnapshot doc, Position position, int limit) {
        return null;
    }

    /**
     * Glob patterns of files whose changes on disk matter to these features (for instance
     * {@code **}{@code /*.abnf}); the server asks the client to watch them and passes the events to
     * {@link #filesChanged}.
     */
    default List<String> watchedGlobs() {
        return List.of();
    }

    /** Files under watch changed on disk ({@code workspace/didChangeWatchedFiles}). */
    default void filesChanged(List<FileEvent> events) {
    }

    /** A document was closed: drop what is cached for it. */
    default void closed(String uri) {
    }
}
