package dev.espalier.lsp;

import org.eclipse.lsp4j.ClientCapabilities;
import org.eclipse.lsp4j.DidChangeTextDocumentParams;
import org.eclipse.lsp4j.DidCloseTextDocumentParams;
import org.eclipse.lsp4j.DidOpenTextDocumentParams;
import org.eclipse.lsp4j.InitializeParams;
import org.eclipse.lsp4j.InitializeResult;
import org.eclipse.lsp4j.InitializedParams;
import org.eclipse.lsp4j.MessageActionItem;
import org.eclipse.lsp4j.MessageParams;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.ShowMessageRequestParams;
import org.eclipse.lsp4j.TextDocumentContentChangeEvent;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.TextDocumentItem;
import org.eclipse.lsp4j.VersionedTextDocumentIdentifier;
import org.eclipse.lsp4j.WorkspaceFolder;
import org.eclipse.lsp4j.jsonrpc.Launcher;
import org.eclipse.lsp4j.launch.LSPLauncher;
import org.eclipse.lsp4j.services.LanguageClient;
import org.eclipse.lsp4j.services.LanguageServer;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.PipedInputStream;
import java.io.PipedOutputStream;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;

/**
 * An lsp4j client connected to an in-process {@link EspalierServer} over piped streams: the same
 * JSON-RPC framing and serialisation a real editor goes through.
 */
final class TestClient implements LanguageClient, AutoCloseable {

    /** The server's interface as the client sees it. */
    interface Remote extends LanguageServer, EspalierRequests {
    }

    static final long TIMEOUT_SECONDS = 20;

    final EspalierServer server;
    final Remote remote;
    final OutputStream toServer;
    private final Future<Void> clientListening;
    private final Launcher<Remote> clientLauncher;
    private final Future<Void> serverListening;
    final List<PublishDiagnosticsParams> published = new CopyOnWriteArrayList<>();
    final List<MessageParams> logs = new CopyOnWriteArrayList<>();
    private final Map<String, Integer> versions = new ConcurrentHashMap<>();

    TestClient(ServerOptions options) throws IOException {
        server = new EspalierServer(options);
        PipedInputStream serverIn = new PipedInputStream(1 << 20);
        toServer = new PipedOutputStream(serverIn);
        PipedInputStream clientIn = new PipedInputStream(1 << 20);
        OutputStream serverOut = new PipedOutputStream(clientIn);
        Launcher<?> serverLauncher = EspalierServer.launch(server, serverIn, serverOut);
        serverListening = serverLauncher.startListening();
        clientLauncher = new LSPLauncher.Builder<Remote>()
                .setLocalService(this)
                .setRemoteInterface(Remote.class)
                .setInput(clientIn)
                .setOutput(toServer)
                .create();
        remote = clientLauncher.getRemoteProxy();
        clientListening = clientLauncher.startListening();
    }

    /** A client with no debounce, initialised with the given workspace folder (or none). */
    static TestClient start(Path workspace) throws Exception {
        return start(ServerOptions.defaults().withDebounce(Duration.ZERO), workspace);
    }

    static TestClient start(ServerOptions options, Path workspace) throws Exception {
        TestClient c = new TestClient(options);
        c.initialize(workspace);
        return c;
    }

    InitializeResult initialize(Path workspace) throws Exception {
        InitializeParams p = new InitializeParams();
        ClientCapabilities caps = new ClientCapabilities();
        org.eclipse.lsp4j.WorkspaceClientCapabilities wcaps = new org.eclipse.lsp4j.WorkspaceClientCapabilities();
        wcaps.setDidChangeWatchedFiles(new org.eclipse.lsp4j.DidChangeWatchedFilesCapabilities(true));
        caps.setWorkspace(wcaps);
        p.setCapabilities(caps);
        if (workspace != null) {
            p.setWorkspaceFolders(List.of(new WorkspaceFolder(workspace.toUri().toString(), "ws")));
        }
        InitializeResult r = get(remote.initialize(p));
        remote.initialized(new InitializedParams());
        return r;
    }

    static <T> T get(CompletableFuture<T> f) throws Exception {
        return f.get(TIMEOUT_SECONDS, TimeUnit.SECONDS);
    }

    void open(String uri, String text) {
        open(uri, DocumentSnapshot.hasExtension(uri, ".abnf") ? "abnf" : "plaintext", text);
    }

    void open(String uri, String languageId, String text) {
        versions.put(uri, 1);
        remote.getTextDocumentService().didOpen(new DidOpenTextDocumentParams(
                new TextDocumentItem(uri, languageId, 1, text)));
    }

    /** Replaces a range; returns the new version. */
    int edit(String uri, Range range, String text) {
        int v = versions.merge(uri, 1, Integer::sum);
        remote.getTextDocumentService().didChange(new DidChangeTextDocumentParams(
                new VersionedTextDocumentIdentifier(uri, v), List.of(new TextDocumentContentChangeEvent(range, text))));
        return v;
    }

    int replaceAll(String uri, String text) {
        int v = versions.merge(uri, 1, Integer::sum);
        remote.getTextDocumentService().didChange(new DidChangeTextDocumentParams(
                new VersionedTextDocumentIdentifier(uri, v), List.of(new TextDocumentContentChangeEvent(text))));
        return v;
    }

    void close(String uri) {
        remote.getTextDocumentService().didClose(new DidCloseTextDocumentParams(new TextDocumentIdentifier(uri)));
    }

    int version(String uri) {
        return versions.getOrDefault(uri, 0);
    }

    /** Waits for diagnostics of a document at its current version. */
    PublishDiagnosticsParams diagnostics(String uri) throws InterruptedException {
        int v = version(uri);
        return awaitPublished(p -> p.getUri().equals(uri) && p.getVersion() != null && p.getVersion() == v);
    }

    PublishDiagnosticsParams awaitPublished(Predicate<PublishDiagnosticsParams> which) throws InterruptedException {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(TIMEOUT_SECONDS);
        while (System.nanoTime() < deadline) {
            for (PublishDiagnosticsParams p : published) {
                if (which.test(p)) {
                    return p;
                }
            }
            Thread.sleep(5);
        }
        throw new AssertionError("no such diagnostics published; got " + published);
    }

    List<PublishDiagnosticsParams> publishedFor(String uri) {
        List<PublishDiagnosticsParams> out = new ArrayList<>();
        for (PublishDiagnosticsParams p : published) {
            if (p.getUri().equals(uri)) {
                out.add(p);
            }
        }
        return out;
    }

    /** The client's JSON-RPC endpoint, for requests and notifications outside the LSP. */
    org.eclipse.lsp4j.jsonrpc.RemoteEndpoint clientEndpoint() {
        return clientLauncher.getRemoteEndpoint();
    }

    /** Waits for a log message. */
    MessageParams awaitLog(Predicate<MessageParams> which) throws InterruptedException {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(TIMEOUT_SECONDS);
        while (System.nanoTime() < deadline) {
            for (MessageParams m : logs) {
                if (which.test(m)) {
                    return m;
                }
            }
            Thread.sleep(5);
        }
        throw new AssertionError("no such log message; got " + logs);
    }

    static Position pos(int line, int character) {
        return new Position(line, character);
    }

    static Range range(int l1, int c1, int l2, int c2) {
        return new Range(new Position(l1, c1), new Position(l2, c2));
    }

    final List<org.eclipse.lsp4j.Registration> registrations = new CopyOnWriteArrayList<>();

    @Override
    public CompletableFuture<Void> registerCapability(org.eclipse.lsp4j.RegistrationParams params) {
        registrations.addAll(params.getRegistrations());
        return CompletableFuture.completedFuture(null);
    }

    @Override
    public void telemetryEvent(Object object) {
    }

    @Override
    public void publishDiagnostics(PublishDiagnosticsParams diagnostics) {
        published.add(diagnostics);
    }

    @Override
    public void showMessage(MessageParams messageParams) {
        logs.add(messageParams);
    }

    @Override
    public CompletableFuture<MessageActionItem> showMessageRequest(ShowMessageRequestParams requestParams) {
        return CompletableFuture.completedFuture(null);
    }

    @Override
    public void logMessage(MessageParams message) {
        logs.add(message);
    }

    @Override
    public void close() throws Exception {
        try {
            get(remote.shutdown());
            // stop reading before the server's threads end (a piped stream fails once its writer thread is gone)
            clientListening.cancel(true);
            remote.exit();
            server.exitCode().get(TIMEOUT_SECONDS, TimeUnit.SECONDS);
        } finally {
            clientListening.cancel(true);
            toServer.close();
            serverListening.cancel(true);
        }
    }
}
