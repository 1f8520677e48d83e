package dev.espalier.lsp;

import org.eclipse.lsp4j.MessageType;

import java.nio.file.Path;
import java.util.List;
import java.util.Optional;

/**
 * What the server offers to the features of a document kind: the workspace, the open documents,
 * the client's log, and a way to ask for fresh diagnostics. Handed to the sample features factory
 * ({@link ServerOptions.SampleFeatures}) once, when the server is created; its answers are live.
 */
public interface ServerContext {

    /** The workspace folders the client named at initialisation (local folders only; may be empty). */
    List<Path> workspaceFolders();

    /** The latest snapshot of an open document, or empty when it is not open. */
    Optional<DocumentSnapshot> openDocument(String uri);

    /** Every open document's latest snapshot. */
    List<DocumentSnapshot> openDocuments();

    /** Sends a {@code window/logMessage} to the client (and nothing when no client is connected). */
    void log(MessageType type, String message);

    /**
     * Schedules the diagnostics of every open document again (for instance after a configuration
     * file changed). Returns at once; the work runs on the analysis thread.
     */
    void refreshDiagnostics();

    /** Schedules the diagnostics of one open document again; nothing when it is not open. */
    void refreshDiagnostics(String uri);
}
