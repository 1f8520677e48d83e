package dev.espalier.lsp;

import com.google.gson.Gson;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import org.eclipse.lsp4j.CodeActionKind;
import org.eclipse.lsp4j.CodeActionOptions;
import org.eclipse.lsp4j.CompletionOptions;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.DidChangeWatchedFilesRegistrationOptions;
import org.eclipse.lsp4j.FileSystemWatcher;
import org.eclipse.lsp4j.InitializeParams;
import org.eclipse.lsp4j.InitializeResult;
import org.eclipse.lsp4j.InitializedParams;
import org.eclipse.lsp4j.MessageParams;
import org.eclipse.lsp4j.MessageType;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.Registration;
import org.eclipse.lsp4j.RegistrationParams;
import org.eclipse.lsp4j.RenameOptions;
import org.eclipse.lsp4j.SemanticTokensWithRegistrationOptions;
import org.eclipse.lsp4j.ServerCapabilities;
import org.eclipse.lsp4j.ServerInfo;
import org.eclipse.lsp4j.TextDocumentSyncKind;
import org.eclipse.lsp4j.TextDocumentSyncOptions;
import org.eclipse.lsp4j.WorkspaceFolder;
import org.eclipse.lsp4j.jsonrpc.CancelChecker;
import org.eclipse.lsp4j.jsonrpc.CompletableFutures;
import org.eclipse.lsp4j.jsonrpc.Launcher;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.eclipse.lsp4j.jsonrpc.messages.Either;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseError;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseErrorCode;
import org.eclipse.lsp4j.launch.LSPLauncher;
import org.eclipse.lsp4j.services.LanguageClient;
import org.eclipse.lsp4j.services.LanguageClientAware;
import org.eclipse.lsp4j.services.LanguageServer;
import org.eclipse.lsp4j.services.TextDocumentService;
import org.eclipse.lsp4j.services.WorkspaceService;

import java.io.InputStream;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CancellationException;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.ScheduledFuture;
import java.util.concurrent.TimeUnit;
import java.util.function.BiFunction;
import java.util.function.Supplier;

/**
 * The Espalier language server: checks grammar files while they are typed and previews the tokens
 * a model may emit in sample files. Speaks the LSP over any pair of streams ({@link #launch}); the
 * command {@code espalier serve} runs it over standard input and output.
 *
 * <h2>Routing</h2>
 * Every document request goes to the {@link DocumentFeatures} of its document
 * ({@link #featuresFor}): {@code .abnf} files to {@link GrammarFeatures}, everything else to the
 * sample features made by {@link ServerOptions#samples()} (none by default). Workspace symbols are
 * the concatenation of every kind's answer. The custom request {@code espalier/allowedTokens}
 * ({@link EspalierRequests}) goes to {@link DocumentFeatures#allowedTokens}.
 *
 * <h2>Threads</h2>
 * The JSON-RPC reader thread applies text changes (incremental sync, {@link DocumentSnapshot})
 * and returns at once. All analysis — diagnostics and every request — runs on one analysis thread,
 * in arrival order, always on the latest snapshot. Diagnostics are debounced
 * ({@link ServerOptions#debounce()}): a change cancels the pending run of the same document, and a
 * run whose document changed while it worked publishes nothing (the newer version's run follows).
 *
 * <h2>Never dies</h2>
 * Every handler catches everything: a failure becomes an error response (requests), an internal
 * diagnostic (diagnostics) and a {@code window/logMessage}; malformed messages and unknown methods
 * are answered by the JSON-RPC layer. The analysis thread is replaced if it ever dies.
 */
public final class EspalierServer implements LanguageServer, LanguageClientAware, EspalierRequests {

    private static final Gson GSON = new Gson();
    /** Held strongly: java.util.logging keeps loggers only weakly, and with them their handlers. */
    private static final java.util.logging.Logger JSON_RPC_LOG = java.util.logging.Logger.getLogger("org.eclipse.lsp4j.jsonrpc");

    /** Stack size of the analysis thread. */
    static final long ANALYSIS_STACK_BYTES = 16L << 20;

    /** How long {@code exit} waits for queued work to finish. */
    static final long EXIT_GRACE_SECONDS = 3;

    private final ServerOptions options;
    private final Map<String, DocumentSnapshot> documents = new ConcurrentHashMap<>();
    private final Map<String, ScheduledFuture<?>> pendingDiagnostics = new ConcurrentHashMap<>();
    private final ScheduledExecutorService analysis;
    private final Context context = new Context();
    private final GrammarFeatures grammars;
    private final DocumentFeatures samples;
    private final Documents textDocuments = new Documents();
    private final Workspace workspace = new Workspace();
    private final CompletableFuture<Integer> exited = new CompletableFuture<>();
    private volatile LanguageClient client;
    private volatile List<Path> folders = List.of();
    private volatile boolean shutdownRequested;
    private volatile boolean dynamicWatchers;

    /** A server with the given options; connect a client with {@link #connect} or use {@link #launch}. */
    public EspalierServer(ServerOptions options) {
        this.options = options;
        this.analysis = Executors.newSingleThreadScheduledExecutor(r -> {
            // a large stack: the ABNF reader nests groups up to 1,000 deep on it
            Thread t = new Thread(null, r, "espalier-analysis", ANALYSIS_STACK_BYTES);
            t.setDaemon(true);
            return t;
        });
        this.grammars = new GrammarFeatures(context);
        DocumentFeatures s;
        try {
            s = options.samples().create(context);
        } catch (RuntimeException e) {
            System.err.println("espalier serve: sample features unavailable: " + e);
            s = DocumentFeatures.NONE;
        }
        this.samples = s == null ? DocumentFeatures.NONE : s;
    }

    /**
     * Creates a server, connects it to a client over the given streams and returns the launcher;
     * call {@link Launcher#startListening()} to serve.
     */
    public static Launcher<LanguageClient> launch(EspalierServer server, InputStream in, OutputStream out) {
        Launcher<LanguageClient> launcher = new LSPLauncher.Builder<LanguageClient>()
                .setLocalService(server)
                .setRemoteInterface(LanguageClient.class)
                .setInput(in)
                .setOutput(out)
                .create();
        server.connect(launcher.getRemoteProxy());
        server.forwardProtocolLog();
        return launcher;
    }

    private final java.util.logging.Handler protocolLog = new java.util.logging.Handler() {
        private final ThreadLocal<Boolean> busy = ThreadLocal.withInitial(() -> false);

        @Override
        public void publish(java.util.logging.LogRecord r) {
            if (r.getLevel().intValue() < java.util.logging.Level.WARNING.intValue() || busy.get()) {
                return;
            }
            busy.set(true);
            try {
                String m = r.getMessage();
                if (m == null && r.getThrown() != null) {
                    m = describe(r.getThrown());
                }
                log(r.getLevel() == java.util.logging.Level.SEVERE ? MessageType.Error : MessageType.Warning,
                        "JSON-RPC: " + m);
            } finally {
                busy.set(false);
            }
        }

        @Override
        public void flush() {
        }

        @Override
        public void close() {
        }
    };

    /**
     * Problems the JSON-RPC layer finds in incoming messages (bad framing, JSON that does not parse,
     * unsupported notifications) are logged by lsp4j through java.util.logging; they are forwarded
     * to the client as {@code window/logMessage} too, until {@code exit}.
     */
    private void forwardProtocolLog() {
        JSON_RPC_LOG.addHandler(protocolLog);
    }

    /** The options this server was made with. */
    public ServerOptions options() {
        return options;
    }

    /** What the server offers to document features. */
    public ServerContext context() {
        return context;
    }

    /**
     * The features of a document: {@link GrammarFeatures} for {@code .abnf} files, the sample
     * features for everything else.
     */
    public DocumentFeatures featuresFor(String uri) {
        return DocumentSnapshot.hasExtension(uri, ".abnf") ? grammars : samples;
    }

    /** Completes with the process exit code once the client sent {@code exit} or the connection closed. */
    public CompletableFuture<Integer> exitCode() {
        return exited;
    }

    /** Called when the input stream ended: the server stops as if the client had sent {@code exit}. */
    public void connectionClosed() {
        exit();
    }

    @Override
    public void connect(LanguageClient client) {
        this.client = client;
    }

    // ---------------------------------------------------------------- lifecycle

    @Override
    public CompletableFuture<InitializeResult> initialize(InitializeParams params) {
        try {
            folders = workspaceFolders(params);
            dynamicWatchers = params.getCapabilities() != null
                    && params.getCapabilities().getWorkspace() != null
                    && params.getCapabilities().getWorkspace().getDidChangeWatchedFiles() != null
                    && Boolean.TRUE.equals(params.getCapabilities().getWorkspace().getDidChangeWatchedFiles()
                    .getDynamicRegistration());
        } catch (RuntimeException e) {
            log(MessageType.Error, "initialize: cannot read the workspace folders: " + describe(e));
        }
        return CompletableFuture.completedFuture(new InitializeResult(capabilities(), serverInfo()));
    }

    private static ServerInfo serverInfo() {
        String v = EspalierServer.class.getPackage().getImplementationVersion();
        return new ServerInfo("espalier", v == null ? "development build" : v);
    }

    static ServerCapabilities capabilities() {
        ServerCapabilities c = new ServerCapabilities();
        TextDocumentSyncOptions sync = new TextDocumentSyncOptions();
        sync.setOpenClose(true);
        sync.setChange(TextDocumentSyncKind.Incremental);
        c.setTextDocumentSync(sync);
        c.setCompletionProvider(new CompletionOptions(true, List.of("%")));
        c.setHoverProvider(true);
        c.setDefinitionProvider(true);
        c.setReferencesProvider(true);
        c.setRenameProvider(new RenameOptions(true));
        c.setDocumentSymbolProvider(true);
        c.setWorkspaceSymbolProvider(true);
        c.setSemanticTokensProvider(new SemanticTokensWithRegistrationOptions(SemanticLegend.legend(), true, false));
        c.setFoldingRangeProvider(true);
        c.setDocumentFormattingProvider(true);
        c.setCodeActionProvider(new CodeActionOptions(List.of(CodeActionKind.QuickFix)));
        return c;
    }

    private static List<Path> workspaceFolders(InitializeParams params) {
        LinkedHashSet<Path> out = new LinkedHashSet<>();
        if (params.getWorkspaceFolders() != null) {
            for (WorkspaceFolder f : params.getWorkspaceFolders()) {
                DocumentSnapshot.pathOf(f.getUri()).ifPresent(out::add);
            }
        }
        @SuppressWarnings("deprecation")
        String root = params.getRootUri();
        if (out.isEmpty() && root != null) {
            DocumentSnapshot.pathOf(root).ifPresent(out::add);
        }
        return List.copyOf(out);
    }

    @Override
    public void initialized(InitializedParams params) {
        if (!dynamicWatchers || client == null) {
            return;
        }
        try {
            LinkedHashSet<String> globs = new LinkedHashSet<>(grammars.watchedGlobs());
            globs.addAll(samples.watchedGlobs());
            List<FileSystemWatcher> watchers = new ArrayList<>();
            for (String g : globs) {
                watchers.add(new FileSystemWatcher(Either.forLeft(g)));
            }
            client.registerCapability(new RegistrationParams(List.of(new Registration("espalier-watched-files",
                    "workspace/didChangeWatchedFiles", new DidChangeWatchedFilesRegistrationOptions(watchers)))));
        } catch (RuntimeException e) {
            log(MessageType.Warning, "cannot register file watchers: " + describe(e));
        }
    }

    @Override
    public CompletableFuture<Object> shutdown() {
        shutdownRequested = true;
        // answered after the work queued before it (the analysis thread runs in arrival order)
        return onAnalysisThread("shutdown", () -> null);
    }

    @Override
    public void exit() {
        JSON_RPC_LOG.removeHandler(protocolLog);
        // let the work already queued answer (a client may send exit without waiting), briefly
        analysis.shutdown();
        try {
            analysis.awaitTermination(EXIT_GRACE_SECONDS, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        analysis.shutdownNow();
        exited.complete(shutdownRequested ? 0 : 1);
    }

    @Override
    public TextDocumentService getTextDocumentService() {
        return textDocuments;
    }

    @Override
    public WorkspaceService getWorkspaceService() {
        return workspace;
    }

    // ---------------------------------------------------------------- custom requests

    @Override
    public CompletableFuture<AllowedTokensResult> allowedTokens(AllowedTokensParams params) {
        if (params == null || params.uri() == null) {
            return CompletableFuture.failedFuture(new ResponseErrorException(new ResponseError(
                    ResponseErrorCode.InvalidParams, "espalier/allowedTokens needs a uri and a position", null)));
        }
        return onDocument("espalier/allowedTokens", params.uri(), (f, doc) -> {
            AllowedTokensResult r = f.allowedTokens(doc, params.position() == null ? new Position(0, 0)
                    : params.position(), params.effectiveLimit());
            if (r == null) {
                throw new ResponseErrorException(new ResponseError(ResponseErrorCode.InvalidParams,
                        "no allowed-token preview for " + params.uri()
                                + ": it is not a sample file mapped to a constraint", null));
            }
            return r;
        });
    }

    // ---------------------------------------------------------------- plumbing

    DocumentSnapshot document(String uri) {
        return documents.get(uri);
    }

    /** The open document, or the file behind a {@code file:} URI read from disk, or null. */
    private DocumentSnapshot snapshotOrFile(String uri) {
        DocumentSnapshot d = documents.get(uri);
        if (d != null) {
            return d;
        }
        Optional<Path> p = DocumentSnapshot.pathOf(uri);
        if (p.isPresent() && Files.isRegularFile(p.get())) {
            try {
                return new DocumentSnapshot(uri, "", 0, Files.readString(p.get(), StandardCharsets.UTF_8));
            } catch (Exception e) {
                return null;
            }
        }
        return null;
    }

    /** Runs a request for a document on the analysis thread; failures become error responses. */
    <T> CompletableFuture<T> onDocument(String what, String uri, BiFunction<DocumentFeatures, DocumentSnapshot, T> work) {
        return onAnalysisThread(what, () -> {
            DocumentSnapshot doc = snapshotOrFile(uri);
            if (doc == null) {
                throw new ResponseErrorException(new ResponseError(ResponseErrorCode.InvalidParams,
                        what + ": unknown document " + uri, null));
            }
            return work.apply(featuresFor(uri), doc);
        });
    }

    /** Runs work on the analysis thread; failures become error responses and log messages. */
    <T> CompletableFuture<T> onAnalysisThread(String what, Supplier<T> work) {
        try {
            return CompletableFutures.computeAsync(analysis, (CancelChecker cancel) -> {
                cancel.checkCanceled();
                try {
                    return work.get();
                } catch (CancellationException | ResponseErrorException e) {
                    throw e;
                } catch (Throwable t) {
                    log(MessageType.Error, what + " failed: " + describe(t));
                    throw new ResponseErrorException(new ResponseError(ResponseErrorCode.InternalError,
                            what + " failed: " + describe(t), null));
                }
            });
        } catch (RuntimeException e) { // the executor refused: the server is shutting down
            return CompletableFuture.failedFuture(new ResponseErrorException(new ResponseError(
                    ResponseErrorCode.InternalError, what + ": the server is shutting down", null)));
        }
    }

    /** Runs a notification handler; a failure is logged, never thrown into the JSON-RPC layer. */
    void guarded(String what, Runnable work) {
        try {
            work.run();
        } catch (Throwable t) {
            log(MessageType.Error, what + " failed: " + describe(t));
        }
    }

    void log(MessageType type, String message) {
        LanguageClient c = client;
        if (c != null) {
            try {
                c.logMessage(new MessageParams(type, message));
            } catch (RuntimeException e) { // the connection is gone; nothing to tell
            }
        }
    }

    static String describe(Throwable t) {
        String m = t.getMessage();
        return t.getClass().getSimpleName() + (m == null ? "" : ": " + m);
    }

    private void scheduleDiagnostics(String uri, long delayMillis) {
        try {
            ScheduledFuture<?> f = analysis.schedule(() -> runDiagnostics(uri), delayMillis, TimeUnit.MILLISECONDS);
            ScheduledFuture<?> old = pendingDiagnostics.put(uri, f);
            if (old != null) {
                old.cancel(false);
            }
        } catch (RuntimeException e) { // shutting down
        }
    }

    private void runDiagnostics(String uri) {
        DocumentSnapshot doc = documents.get(uri);
        if (doc == null) {
            return;
        }
        List<Diagnostic> found;
        try {
            found = featuresFor(uri).diagnostics(doc);
        } catch (Throwable t) {
            log(MessageType.Error, "diagnostics of " + uri + " failed: " + describe(t));
            found = List.of(new Diagnostic(new Range(new Position(0, 0), new Position(0, 0)),
                    "internal error while checking this document: " + describe(t), DiagnosticSeverity.Error,
                    "espalier", "internal"));
        }
        if (documents.get(uri) != doc) {
            return; // superseded: the newer version's run is scheduled
        }
        publish(uri, doc.version(), cap(found, options.maxDiagnostics()));
    }

    /** At most {@code max} diagnostics, the most severe first chosen, then in document order. */
    static List<Diagnostic> cap(List<Diagnostic> found, int max) {
        if (found == null) {
            return List.of();
        }
        if (found.size() <= max) {
            return found;
        }
        Comparator<Diagnostic> bySeverity = Comparator.comparingInt(d -> d.getSeverity() == null ? 1
                : d.getSeverity().getValue());
        Comparator<Diagnostic> byPosition = Comparator.comparingInt((Diagnostic d) -> d.getRange().getStart().getLine())
                .thenComparingInt(d -> d.getRange().getStart().getCharacter());
        List<Diagnostic> kept = new ArrayList<>(found.stream().sorted(bySeverity.thenComparing(byPosition))
                .limit(max - 1L).sorted(byPosition).toList());
        int more = found.size() - kept.size();
        kept.add(new Diagnostic(new Range(new Position(0, 0), new Position(0, 0)),
                more + " more findings are not shown (at most " + max + " per document)",
                DiagnosticSeverity.Information, "espalier", "too-many-findings"));
        return kept;
    }

    private void publish(String uri, Integer version, List<Diagnostic> diagnostics) {
        LanguageClient c = client;
        if (c != null) {
            PublishDiagnosticsParams p = new PublishDiagnosticsParams(uri, diagnostics);
            p.setVersion(version);
            c.publishDiagnostics(p);
        }
    }

    private void refreshAll() {
        for (String uri : documents.keySet()) {
            scheduleDiagnostics(uri, 0);
        }
    }

    // ---------------------------------------------------------------- services

    private final class Context implements ServerContext {
        @Override
        public List<Path> workspaceFolders() {
            return folders;
        }

        @Override
        public Optional<DocumentSnapshot> openDocument(String uri) {
            return Optional.ofNullable(documents.get(uri));
        }

        @Override
        public List<DocumentSnapshot> openDocuments() {
            return List.copyOf(documents.values());
        }

        @Override
        public void log(MessageType type, String message) {
            EspalierServer.this.log(type, message);
        }

        @Override
        public void refreshDiagnostics() {
            refreshAll();
        }

        @Override
        public void refreshDiagnostics(String uri) {
            if (documents.containsKey(uri)) {
                scheduleDiagnostics(uri, 0);
            }
        }
    }

    private final class Documents implements TextDocumentService {

        @Override
        public void didOpen(org.eclipse.lsp4j.DidOpenTextDocumentParams params) {
            guarded("didOpen", () -> {
                var d = params.getTextDocument();
                documents.put(d.getUri(), new DocumentSnapshot(d.getUri(), d.getLanguageId(), d.getVersion(),
                        d.getText() == null ? "" : d.getText()));
                scheduleDiagnostics(d.getUri(), 0);
            });
        }

        @Override
        public void didChange(org.eclipse.lsp4j.DidChangeTextDocumentParams params) {
            guarded("didChange", () -> {
                String uri = params.getTextDocument().getUri();
                DocumentSnapshot old = documents.get(uri);
                if (old == null) {
                    log(MessageType.Warning, "didChange for a document that is not open: " + uri);
                    return;
                }
                Integer v = params.getTextDocument().getVersion();
                documents.put(uri, old.apply(params.getContentChanges(), v == null ? old.version() + 1 : v));
                scheduleDiagnostics(uri, options.debounce().toMillis());
            });
        }

        @Override
        public void didClose(org.eclipse.lsp4j.DidCloseTextDocumentParams params) {
            guarded("didClose", () -> {
                String uri = params.getTextDocument().getUri();
                documents.remove(uri);
                ScheduledFuture<?> pending = pendingDiagnostics.remove(uri);
                if (pending != null) {
                    pending.cancel(false);
                }
                analysis.execute(() -> guarded("didClose", () -> {
                    featuresFor(uri).closed(uri);
                    if (!documents.containsKey(uri)) {
                        publish(uri, null, List.of());
                    }
                }));
            });
        }

        @Override
        public void didSave(org.eclipse.lsp4j.DidSaveTextDocumentParams params) {
        }

        @Override
        public CompletableFuture<Either<List<org.eclipse.lsp4j.CompletionItem>, org.eclipse.lsp4j.CompletionList>> completion(
                org.eclipse.lsp4j.CompletionParams params) {
            String uri = params.getTextDocument().getUri();
            return onDocument("completion", uri, (f, doc) -> {
                org.eclipse.lsp4j.CompletionList list = f.completion(doc, params.getPosition());
                if (list == null) {
                    list = new org.eclipse.lsp4j.CompletionList(false, List.of());
                }
                for (org.eclipse.lsp4j.CompletionItem item : list.getItems()) {
                    JsonObject routed = new JsonObject();
                    routed.addProperty("uri", uri);
                    if (item.getData() != null) {
                        routed.add("data", item.getData() instanceof JsonElement e ? e : GSON.toJsonTree(item.getData()));
                    }
                    item.setData(routed);
                }
                return Either.forRight(list);
            });
        }

        @Override
        public CompletableFuture<org.eclipse.lsp4j.CompletionItem> resolveCompletionItem(
                org.eclipse.lsp4j.CompletionItem item) {
            return onAnalysisThread("completionItem/resolve", () -> {
                if (!(item.getData() instanceof JsonObject routed) || !routed.has("uri")) {
                    return item;
                }
                String uri = routed.get("uri").getAsString();
                item.setData(routed.get("data"));
                org.eclipse.lsp4j.CompletionItem resolved = featuresFor(uri).resolve(documents.get(uri), item);
                return resolved == null ? item : resolved;
            });
        }

        @Override
        public CompletableFuture<org.eclipse.lsp4j.Hover> hover(org.eclipse.lsp4j.HoverParams params) {
            return onDocument("hover", params.getTextDocument().getUri(), (f, doc) -> f.hover(doc, params.getPosition()));
        }

        @Override
        public CompletableFuture<Either<List<? extends org.eclipse.lsp4j.Location>, List<? extends org.eclipse.lsp4j.LocationLink>>> definition(
                org.eclipse.lsp4j.DefinitionParams params) {
            return onDocument("definition", params.getTextDocument().getUri(),
                    (f, doc) -> Either.forLeft(f.definition(doc, params.getPosition())));
        }

        @Override
        public CompletableFuture<List<? extends org.eclipse.lsp4j.Location>> references(
                org.eclipse.lsp4j.ReferenceParams params) {
            boolean decl = params.getContext() != null && params.getContext().isIncludeDeclaration();
            return onDocument("references", params.getTextDocument().getUri(),
                    (f, doc) -> f.references(doc, params.getPosition(), decl));
        }

        @Override
        public CompletableFuture<org.eclipse.lsp4j.jsonrpc.messages.Either3<org.eclipse.lsp4j.Range, org.eclipse.lsp4j.PrepareRenameResult, org.eclipse.lsp4j.PrepareRenameDefaultBehavior>> prepareRename(
                org.eclipse.lsp4j.PrepareRenameParams params) {
            return onDocument("prepareRename", params.getTextDocument().getUri(), (f, doc) -> {
                Range r;
                try {
                    r = f.prepareRename(doc, params.getPosition());
                } catch (IllegalArgumentException e) {
                    throw new ResponseErrorException(new ResponseError(ResponseErrorCode.InvalidParams,
                            e.getMessage(), null));
                }
                return r == null ? null
                        : org.eclipse.lsp4j.jsonrpc.messages.Either3.<Range, org.eclipse.lsp4j.PrepareRenameResult,
                                org.eclipse.lsp4j.PrepareRenameDefaultBehavior>forFirst(r);
            });
        }

        @Override
        public CompletableFuture<org.eclipse.lsp4j.WorkspaceEdit> rename(org.eclipse.lsp4j.RenameParams params) {
            return onDocument("rename", params.getTextDocument().getUri(), (f, doc) -> {
                try {
                    return f.rename(doc, params.getPosition(), params.getNewName());
                } catch (IllegalArgumentException e) {
                    throw new ResponseErrorException(new ResponseError(ResponseErrorCode.InvalidParams,
                            e.getMessage(), null));
                }
            });
        }

        @Override
        public CompletableFuture<List<Either<org.eclipse.lsp4j.SymbolInformation, org.eclipse.lsp4j.DocumentSymbol>>> documentSymbol(
                org.eclipse.lsp4j.DocumentSymbolParams params) {
            return onDocument("documentSymbol", params.getTextDocument().getUri(), (f, doc) -> {
                List<Either<org.eclipse.lsp4j.SymbolInformation, org.eclipse.lsp4j.DocumentSymbol>> out = new ArrayList<>();
                for (org.eclipse.lsp4j.DocumentSymbol s : f.documentSymbols(doc)) {
                    out.add(Either.forRight(s));
                }
                return out;
            });
        }

        @Override
        public CompletableFuture<org.eclipse.lsp4j.SemanticTokens> semanticTokensFull(
                org.eclipse.lsp4j.SemanticTokensParams params) {
            return onDocument("semanticTokens", params.getTextDocument().getUri(),
                    (f, doc) -> new org.eclipse.lsp4j.SemanticTokens(new ArrayList<>(f.semanticTokens(doc))));
        }

        @Override
        public CompletableFuture<List<org.eclipse.lsp4j.FoldingRange>> foldingRange(
                org.eclipse.lsp4j.FoldingRangeRequestParams params) {
            return onDocument("foldingRange", params.getTextDocument().getUri(), (f, doc) -> f.foldingRanges(doc));
        }

        @Override
        public CompletableFuture<List<? extends org.eclipse.lsp4j.TextEdit>> formatting(
                org.eclipse.lsp4j.DocumentFormattingParams params) {
            return onDocument("formatting", params.getTextDocument().getUri(),
                    (f, doc) -> f.formatting(doc, params.getOptions()));
        }

        @Override
        public CompletableFuture<List<Either<org.eclipse.lsp4j.Command, org.eclipse.lsp4j.CodeAction>>> codeAction(
                org.eclipse.lsp4j.CodeActionParams params) {
            return onDocument("codeAction", params.getTextDocument().getUri(), (f, doc) -> {
                List<Either<org.eclipse.lsp4j.Command, org.eclipse.lsp4j.CodeAction>> out = new ArrayList<>();
                for (org.eclipse.lsp4j.CodeAction a : f.codeActions(doc, params)) {
                    out.add(Either.forRight(a));
                }
                return out;
            });
        }
    }

    private final class Workspace implements WorkspaceService {

        @Override
        public CompletableFuture<Either<List<? extends org.eclipse.lsp4j.SymbolInformation>, List<? extends org.eclipse.lsp4j.WorkspaceSymbol>>> symbol(
                org.eclipse.lsp4j.WorkspaceSymbolParams params) {
            String query = params.getQuery() == null ? "" : params.getQuery();
            return onAnalysisThread("workspace/symbol", () -> {
                List<org.eclipse.lsp4j.WorkspaceSymbol> out = new ArrayList<>(grammars.workspaceSymbols(query));
                out.addAll(samples.workspaceSymbols(query));
                return Either.forRight(out);
            });
        }

        @Override
        public void didChangeConfiguration(org.eclipse.lsp4j.DidChangeConfigurationParams params) {
        }

        @Override
        public void didChangeWatchedFiles(org.eclipse.lsp4j.DidChangeWatchedFilesParams params) {
            guarded("didChangeWatchedFiles", () -> analysis.execute(() -> guarded("didChangeWatchedFiles", () -> {
                grammars.filesChanged(params.getChanges());
                samples.filesChanged(params.getChanges());
                refreshAll();
            })));
        }

        @Override
        public void didChangeWorkspaceFolders(org.eclipse.lsp4j.DidChangeWorkspaceFoldersParams params) {
            guarded("didChangeWorkspaceFolders", () -> {
                LinkedHashSet<Path> now = new LinkedHashSet<>(folders);
                var event = params.getEvent();
                if (event.getRemoved() != null) {
                    for (WorkspaceFolder f : event.getRemoved()) {
                        DocumentSnapshot.pathOf(f.getUri()).ifPresent(now::remove);
                    }
                }
                if (event.getAdded() != null) {
                    for (WorkspaceFolder f : event.getAdded()) {
                        DocumentSnapshot.pathOf(f.getUri()).ifPresent(now::add);
                    }
                }
                folders = List.copyOf(now);
            });
        }
    }
}
