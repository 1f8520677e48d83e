package dev.espalier.bench;

import dev.espalier.lsp.AllowedTokensParams;
import dev.espalier.lsp.AllowedTokensResult;
import dev.espalier.lsp.EspalierRequests;
import dev.espalier.lsp.EspalierServer;
import dev.espalier.lsp.ServerOptions;
import dev.espalier.lsp.samples.SamplePreviews;
import org.eclipse.lsp4j.ClientCapabilities;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.CompletionParams;
import org.eclipse.lsp4j.DidChangeTextDocumentParams;
import org.eclipse.lsp4j.DidOpenTextDocumentParams;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.HoverParams;
import org.eclipse.lsp4j.InitializeParams;
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
import org.eclipse.lsp4j.jsonrpc.Launcher;
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
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;

/**
 * The allowed-token preview as an editor sees it: an lsp4j client talks to an in-process server
 * over piped streams (JSON-RPC included), on a sample inspection report mapped by an
 * {@code espalier-samples.json} to a library grammar and the largest vocabulary at hand: Llama 3
 * (128k, {@code ../shared/vocab/llama3-tokenizer.json.gz}) when present, else o200k. The cursor
 * stands inside the free-text note, where most of the vocabulary is allowed (the largest lists).
 * <ul>
 *   <li>{@code completionWarm}: completion at the same position of an unchanged document (up to
 *       500 items with their escapes and the count);</li>
 *   <li>{@code completionAfterEdit}: one character early in the document changes (a digit of the
 *       tree id toggles), then completion at the same position: the prefix is fed again from the
 *       start (diagnostics are debounced out of the way);</li>
 *   <li>{@code hoverWarm}, {@code allowedTokensWarm}: hover and {@code espalier/allowedTokens}
 *       (200 tokens) at that position.</li>
 * </ul>
 * Target: 100 ms. Run: {@code java -jar benchmarks/target/benchmarks.jar SamplePreview}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SampleTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class SamplePreviewBenchmark {

    /** The library grammar: a fixed-shape report (a byte automaton) or JSON (the Earley layer). */
    @Param({"inspection-report", "json"})
    public String grammar;

    static final String REPORT = "{\"tree\":\"T-0042\",\"variety\":\"Amberglow\",\"rootstock\":\"RS-9\","
            + "\"inspected\":\"2025-04-12\",\"findings\":[{\"issue\":\"scab\",\"severity\":3,"
            + "\"note\":\"lesions on two leaves of the lower scaffold\"}],\"action\":\"monitor\"}\n";

    interface Remote extends LanguageServer, EspalierRequests {
    }

    private Remote remote;
    private String uri;
    private int version;
    private Position at;

    static Path library() {
        for (Path dir = Path.of(System.getProperty("user.dir")).toAbsolutePath(); dir != null; dir = dir.getParent()) {
            if (Files.isDirectory(dir.resolve("grammars").resolve("samples"))) {
                return dir.resolve("grammars");
            }
        }
        throw new IllegalStateException("run from the checkout: no grammars/ folder above " + System.getProperty("user.dir"));
    }

    static String vocabulary() {
        Path llama = Path.of(System.getProperty("espalier.shared", "../shared"), "vocab", "llama3-tokenizer.json.gz")
                .toAbsolutePath().normalize();
        // shared/ sits beside the main checkout; worktrees are one or two levels further down
        for (Path dir = library().getParent(); dir != null && !Files.isRegularFile(llama); dir = dir.getParent()) {
            llama = dir.resolve("shared/vocab/llama3-tokenizer.json.gz");
        }
        return Files.isRegularFile(llama) ? llama.toString() : "o200k";
    }

    @Setup(Level.Trial)
    public void setUp() throws Exception {
        Path ws = Files.createTempDirectory("espalier-preview-bench");
        Files.copy(library().resolve(grammar + ".abnf"), ws.resolve("format.abnf"));
        String vocab = vocabulary();
        Files.writeString(ws.resolve("espalier-samples.json"), "{\"samples\": [{\"files\": \"*.json\", \"grammar\": "
                + "\"format.abnf\", \"vocabulary\": " + com.fasterxml.jackson.databind.node.TextNode.valueOf(vocab) + "}]}");
        Path sample = ws.resolve("report.json");
        Files.writeString(sample, REPORT);
        uri = sample.toUri().toString();

        EspalierServer server = new EspalierServer(ServerOptions.defaults().withDebounce(Duration.ofSeconds(30))
                .withSamples(SamplePreviews.features()));
        PipedInputStream serverIn = new PipedInputStream(1 << 20);
        PipedOutputStream toServer = new PipedOutputStream(serverIn);
        PipedInputStream clientIn = new PipedInputStream(1 << 20);
        PipedOutputStream toClient = new PipedOutputStream(clientIn);
        EspalierServer.launch(server, serverIn, toClient).startListening();
        Launcher<Remote> client = new LSPLauncher.Builder<Remote>().setLocalService(new Client())
                .setRemoteInterface(Remote.class).setInput(clientIn).setOutput(toServer).create();
        client.startListening();
        remote = client.getRemoteProxy();
        InitializeParams init = new InitializeParams();
        init.setCapabilities(new ClientCapabilities());
        remote.initialize(init).get(60, TimeUnit.SECONDS);
        remote.initialized(new InitializedParams());
        version = 1;
        remote.getTextDocumentService().didOpen(new DidOpenTextDocumentParams(new TextDocumentItem(uri, "json", version, REPORT)));
        at = new Position(0, REPORT.indexOf("two leaves"));
        long t0 = System.nanoTime();
        AllowedTokensResult first = null;
        while (first == null) { // the vocabulary loads and the grammar compiles in the background
            try {
                first = remote.allowedTokens(new AllowedTokensParams(uri, at, 5)).get(60, TimeUnit.SECONDS);
            } catch (java.util.concurrent.ExecutionException e) {
                if (System.nanoTime() - t0 > TimeUnit.MINUTES.toNanos(3)) {
                    throw e;
                }
                Thread.sleep(100);
            }
        }
        System.err.printf("%s on %s: ready after %.1f s; %,d of %,d tokens allowed in the note%n", grammar, vocab,
                (System.nanoTime() - t0) / 1e9, first.count(), first.vocabularySize());
        int warm = completionWarm().getItems().size();
        int edited = completionAfterEdit().getItems().size();
        if (warm < 100 || edited != warm) {
            throw new IllegalStateException("completion items: " + warm + " warm, " + edited + " after an edit");
        }
    }

    @TearDown(Level.Trial)
    public void tearDown() throws Exception {
        remote.shutdown().get(60, TimeUnit.SECONDS);
        remote.exit();
    }

    @Benchmark
    public CompletionList completionWarm() throws Exception {
        return remote.getTextDocumentService().completion(new CompletionParams(new TextDocumentIdentifier(uri), at))
                .get(60, TimeUnit.SECONDS).getRight();
    }

    @Benchmark
    public CompletionList completionAfterEdit() throws Exception {
        version++;
        int col = REPORT.indexOf("0042") + 3;
        remote.getTextDocumentService().didChange(new DidChangeTextDocumentParams(
                new VersionedTextDocumentIdentifier(uri, version), List.of(new TextDocumentContentChangeEvent(
                new Range(new Position(0, col), new Position(0, col + 1)), version % 2 == 0 ? "3" : "2"))));
        return completionWarm();
    }

    @Benchmark
    public Hover hoverWarm() throws Exception {
        return remote.getTextDocumentService().hover(new HoverParams(new TextDocumentIdentifier(uri), at))
                .get(60, TimeUnit.SECONDS);
    }

    @Benchmark
    public AllowedTokensResult allowedTokensWarm() throws Exception {
        return remote.allowedTokens(new AllowedTokensParams(uri, at, 200)).get(60, TimeUnit.SECONDS);
    }

    private static final class Client implements LanguageClient {
        @Override
        public void telemetryEvent(Object object) {
        }

        @Override
        public void publishDiagnostics(PublishDiagnosticsParams d) {
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
