package dev.espalier.bench;

import dev.espalier.lsp.DocumentSnapshot;
import dev.espalier.lsp.EspalierServer;
import dev.espalier.lsp.GrammarFeatures;
import dev.espalier.lsp.ServerContext;
import dev.espalier.lsp.ServerOptions;
import org.eclipse.lsp4j.ClientCapabilities;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.CompletionParams;
import org.eclipse.lsp4j.DidChangeTextDocumentParams;
import org.eclipse.lsp4j.DidOpenTextDocumentParams;
import org.eclipse.lsp4j.HoverParams;
import org.eclipse.lsp4j.InitializeParams;
import org.eclipse.lsp4j.InitializedParams;
import org.eclipse.lsp4j.MessageActionItem;
import org.eclipse.lsp4j.MessageParams;
import org.eclipse.lsp4j.MessageType;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.ShowMessageRequestParams;
import org.eclipse.lsp4j.TextDocumentContentChangeEvent;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.TextDocumentItem;
import org.eclipse.lsp4j.VersionedTextDocumentIdentifier;
import org.eclipse.lsp4j.jsonrpc.Launcher;
import org.eclipse.lsp4j.jsonrpc.messages.Either;
import org.eclipse.lsp4j.launch.LSPLauncher;
import org.eclipse.lsp4j.services.LanguageClient;
import org.eclipse.lsp4j.services.LanguageServer;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

import java.io.PipedInputStream;
import java.io.PipedOutputStream;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.TimeUnit;

/**
 * The language server as an editor sees it: an lsp4j client talks to an in-process server over
 * piped streams (JSON-RPC framing and serialisation included), on a generated grammar of
 * {@code rules} rules. Debounce is zero, so the figures are the server's own latency.
 * <ul>
 *   <li>{@code diagnosticsAfterChange}: from sending a one-character {@code didChange} to receiving
 *       the diagnostics of that version (target: 200 ms for 2,000 rules);</li>
 *   <li>{@code completionWarm}: a completion request in a rule body of a document already checked
 *       (all rule names, core rules and snippets; target: 50 ms);</li>
 *   <li>{@code hoverWarm}: hover on a regular rule of a checked document, asked before (the server
 *       keeps a rule's hover text per document version: facts, automaton size, examples); the first
 *       hover of a version also builds the rule's byte automaton.</li>
 *   <li>{@code checkOnly}: the grammar features' diagnostics of a new snapshot called directly, no
 *       JSON-RPC: the share of {@code diagnosticsAfterChange} that is analysis.</li>
 * </ul>
 * The warm-up is long on purpose: one check of 2,000 rules runs a lot of code once, so the JIT needs
 * many seconds before the figures settle (on a busy machine, more).
 * Run: {@code java -jar benchmarks/target/benchmarks.jar LanguageServer}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SampleTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 6, time = 4)
@Measurement(iterations = 5, time = 3)
@Fork(1)
public class LanguageServerBenchmark {

    @Param({"2000"})
    public int rules;

    private static final String URI = "file:///tmp/orchard-generated.abnf";

    private EspalierServer server;
    private LanguageServer remote;
    private final ConcurrentHashMap<Integer, CompletableFuture<PublishDiagnosticsParams>> waiting = new ConcurrentHashMap<>();
    private int version;
    private Position bodyPosition;
    private Position hoverPosition;
    private GrammarFeatures direct;
    private java.util.concurrent.Future<Void> clientListening;
    private PipedOutputStream toServer;
    private String text;

    /**
     * A grammar of orchard records: rule {@code i} chooses among a tagged literal, a digit run,
     * and references to later rules (every rule is used from the start rule); one rule in fifty
     * nests a bracketed list, so the grammar is context-free as real ones are.
     */
    static String grammar(int n) {
        StringBuilder sb = new StringBuilder("; generated orchard records\n");
        for (int i = 0; i < n; i++) {
            sb.append("record-").append(i).append(" = %s\"tree-").append(i).append(": \" 4DIGIT");
            if (i + 1 < n) {
                sb.append(" / %s\"row \" record-").append(i + 1);
            }
            if (2 * i + 2 < n) {
                sb.append(" / record-").append(2 * i + 2).append(" \",\" record-").append(2 * i + 1);
            }
            if (i % 50 == 0) {
                sb.append(" / \"[\" *( record-").append(i).append(" \";\" ) \"]\"");
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    @Setup(Level.Trial)
    public void setUp() throws Exception {
        server = new EspalierServer(ServerOptions.defaults().withDebounce(Duration.ZERO));
        PipedInputStream serverIn = new PipedInputStream(1 << 20);
        PipedOutputStream toServer = new PipedOutputStream(serverIn);
        PipedInputStream clientIn = new PipedInputStream(1 << 20);
        PipedOutputStream toClient = new PipedOutputStream(clientIn);
        EspalierServer.launch(server, serverIn, toClient).startListening();
        Launcher<LanguageServer> client = LSPLauncher.createClientLauncher(new Client(), clientIn, toServer);
        clientListening = client.startListening();
        this.toServer = toServer;
        remote = client.getRemoteProxy();
        InitializeParams init = new InitializeParams();
        init.setCapabilities(new ClientCapabilities());
        remote.initialize(init).get(60, TimeUnit.SECONDS);
        remote.initialized(new InitializedParams());
        text = grammar(rules);
        direct = new GrammarFeatures(new ServerContext() {
            @Override
            public List<Path> workspaceFolders() {
                return List.of();
            }

            @Override
            public Optional<DocumentSnapshot> openDocument(String uri) {
                return Optional.empty();
            }

            @Override
            public List<DocumentSnapshot> openDocuments() {
                return List.of();
            }

            @Override
            public void log(MessageType type, String message) {
            }

            @Override
            public void refreshDiagnostics() {
            }

            @Override
            public void refreshDiagnostics(String uri) {
            }
        });
        version = 1;
        CompletableFuture<PublishDiagnosticsParams> first = expect(version);
        remote.getTextDocumentService().didOpen(new DidOpenTextDocumentParams(new TextDocumentItem(URI, "abnf", version, text)));
        PublishDiagnosticsParams found = first.get(60, TimeUnit.SECONDS);
        if (found.getDiagnostics().stream().anyMatch(d -> d.getSeverity() == org.eclipse.lsp4j.DiagnosticSeverity.Error)) {
            throw new IllegalStateException("the generated grammar has errors: " + found.getDiagnostics().get(0));
        }
        System.err.println("generated grammar: " + rules + " rules, " + text.length() + " characters, "
                + found.getDiagnostics().size() + " findings");
        // completion after the "=" of the middle rule; hover on the last rule (regular: its automaton is built)
        int line = rules / 2 + 1;
        bodyPosition = new Position(line, ("record-" + (rules / 2) + " = ").length());
        hoverPosition = new Position(rules, 2);
        Object hover = hoverWarm();
        int items = completionWarm().getItems().size();
        if (hover == null || items < rules) {
            throw new IllegalStateException("hover " + hover + ", " + items + " completion items");
        }
        System.err.println("hover: " + hover.toString().replace('\n', ' ').substring(0, 200));
    }

    @TearDown(Level.Trial)
    public void tearDown() throws Exception {
        remote.shutdown().get(60, TimeUnit.SECONDS);
        // stop reading before the server's threads end (a piped stream fails once its writer thread is gone)
        clientListening.cancel(true);
        remote.exit();
        server.exitCode().get(60, TimeUnit.SECONDS);
        toServer.close();
    }

    private CompletableFuture<PublishDiagnosticsParams> expect(int v) {
        CompletableFuture<PublishDiagnosticsParams> f = new CompletableFuture<>();
        waiting.put(v, f);
        return f;
    }

    /** One character changes (a digit of the first rule's tag toggles), then its diagnostics arrive. */
    @Benchmark
    public PublishDiagnosticsParams diagnosticsAfterChange() throws Exception {
        version++;
        CompletableFuture<PublishDiagnosticsParams> f = expect(version);
        // line 1 is "record-0 = %s"tree-0: " ...": column 17 holds the tag's digit
        String digit = String.valueOf(version % 10);
        remote.getTextDocumentService().didChange(new DidChangeTextDocumentParams(
                new VersionedTextDocumentIdentifier(URI, version),
                List.of(new TextDocumentContentChangeEvent(new Range(new Position(1, 17), new Position(1, 18)), digit))));
        return f.get(60, TimeUnit.SECONDS);
    }

    /** Diagnostics of a new snapshot, computed in the calling thread. */
    @Benchmark
    public List<org.eclipse.lsp4j.Diagnostic> checkOnly() {
        return direct.diagnostics(new DocumentSnapshot(URI, "abnf", ++version, text));
    }

    /** Completion in a rule body of the checked document. */
    @Benchmark
    public CompletionList completionWarm() throws Exception {
        Either<List<CompletionItem>, CompletionList> r = remote.getTextDocumentService()
                .completion(new CompletionParams(new TextDocumentIdentifier(URI), bodyPosition)).get(60, TimeUnit.SECONDS);
        return r.getRight();
    }

    /** Hover on a rule name of the checked document. */
    @Benchmark
    public Object hoverWarm() throws Exception {
        return remote.getTextDocumentService().hover(new HoverParams(new TextDocumentIdentifier(URI), hoverPosition))
                .get(60, TimeUnit.SECONDS);
    }

    private final class Client implements LanguageClient {
        @Override
        public void telemetryEvent(Object object) {
        }

        @Override
        public void publishDiagnostics(PublishDiagnosticsParams d) {
            CompletableFuture<PublishDiagnosticsParams> f = d.getVersion() == null ? null : waiting.remove(d.getVersion());
            if (f != null) {
                f.complete(d);
            }
        }

        @Override
        public void showMessage(MessageParams m) {
        }

        @Override
        public CompletableFuture<MessageActionItem> showMessageRequest(ShowMessageRequestParams r) {
            return CompletableFuture.completedFuture(null);
        }

        @Override
        public void logMessage(MessageParams m) {
        }
    }
}
