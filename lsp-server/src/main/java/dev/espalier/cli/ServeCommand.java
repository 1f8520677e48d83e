package dev.espalier.cli;

import dev.espalier.lsp.EspalierServer;
import dev.espalier.lsp.ServerOptions;
import dev.espalier.lsp.samples.SamplePreviews;
import org.eclipse.lsp4j.jsonrpc.Launcher;
import org.eclipse.lsp4j.services.LanguageClient;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.InputStream;
import java.io.PrintStream;
import java.time.Duration;
import java.util.concurrent.Callable;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.Future;

/** {@code espalier serve}: the language server over standard input and output. */
@Command(name = "serve", mixinStandardHelpOptions = true,
        description = "Run the language server (LSP over standard input and output): live checking of .abnf "
                + "files and the allowed-token preview in sample files. Exit code 0 after shutdown and exit.")
final class ServeCommand implements Callable<Integer> {

    @Option(names = "--debounce", paramLabel = "MS", defaultValue = "200",
            description = "Milliseconds after the last change before a document is checked (default: ${DEFAULT-VALUE}).")
    long debounceMillis;

    @Override
    public Integer call() throws Exception {
        if (debounceMillis < 0) {
            throw new UserInputException("--debounce must not be negative: " + debounceMillis);
        }
        InputStream in = System.in;
        PrintStream out = System.out;
        // the protocol owns standard output: anything else printed goes to standard error
        System.setOut(System.err);
        try {
            ServerOptions options = ServerOptions.defaults().withDebounce(Duration.ofMillis(debounceMillis))
                    .withSamples(SamplePreviews.features());
            EspalierServer server = new EspalierServer(options);
            Launcher<LanguageClient> launcher = EspalierServer.launch(server, in, out);
            Future<Void> listening = launcher.startListening();
            CompletableFuture.runAsync(() -> {
                try {
                    listening.get();
                } catch (Exception e) { // the stream ended or broke: stop either way
                }
                server.connectionClosed();
            });
            return server.exitCode().get();
        } finally {
            System.setOut(out);
        }
    }
}
