package dev.espalier.cli;

import org.eclipse.lsp4j.ClientCapabilities;
import org.eclipse.lsp4j.DidOpenTextDocumentParams;
import org.eclipse.lsp4j.InitializeParams;
import org.eclipse.lsp4j.InitializeResult;
import org.eclipse.lsp4j.InitializedParams;
import org.eclipse.lsp4j.MessageActionItem;
import org.eclipse.lsp4j.MessageParams;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.ShowMessageRequestParams;
import org.eclipse.lsp4j.TextDocumentItem;
import org.eclipse.lsp4j.jsonrpc.Launcher;
import org.eclipse.lsp4j.launch.LSPLauncher;
import org.eclipse.lsp4j.services.LanguageClient;
import org.eclipse.lsp4j.services.LanguageServer;
import org.junit.jupiter.api.Test;

import java.io.File;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@code espalier serve} as an editor starts it: a separate process speaking the LSP on stdin/stdout. */
class ServeCommandTest {

    static Process start(String... extra) throws Exception {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        List<String> cmd = new java.util.ArrayList<>(List.of(java, "-cp", System.getProperty("java.class.path"),
                Main.class.getName(), "serve"));
        cmd.addAll(List.of(extra));
        return new ProcessBuilder(cmd).redirectError(ProcessBuilder.Redirect.DISCARD).start();
    }

    @Test
    void servesOverStdioAndExitsZeroAfterShutdownAndExit() throws Exception {
        Process p = start("--debounce", "10");
        try {
            CompletableFuture<PublishDiagnosticsParams> diagnostics = new CompletableFuture<>();
            LanguageClient client = new LanguageClient() {
                @Override
                public void telemetryEvent(Object object) {
                }

                @Override
                public void publishDiagnostics(PublishDiagnosticsParams d) {
                    diagnostics.complete(d);
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
            };
            Launcher<LanguageServer> launcher = LSPLauncher.createClientLauncher(client, p.getInputStream(), p.getOutputStream());
            launcher.startListening();
            LanguageServer server = launcher.getRemoteProxy();
            InitializeParams init = new InitializeParams();
            init.setCapabilities(new ClientCapabilities());
            InitializeResult r = server.initialize(init).get(30, TimeUnit.SECONDS);
            assertEquals("espalier", r.getServerInfo().getName());
            server.initialized(new InitializedParams());
            String uri = new File("/tmp/serve-check.abnf").toURI().toString();
            server.getTextDocumentService().didOpen(new DidOpenTextDocumentParams(
                    new TextDocumentItem(uri, "abnf", 1, "order = tre\n")));
            PublishDiagnosticsParams d = diagnostics.get(30, TimeUnit.SECONDS);
            assertTrue(d.getDiagnostics().stream().anyMatch(x -> x.getCode().getLeft().equals("undefined-rule")));
            server.shutdown().get(30, TimeUnit.SECONDS);
            server.exit();
            assertTrue(p.waitFor(30, TimeUnit.SECONDS), "the server did not exit");
            assertEquals(0, p.exitValue());
        } finally {
            p.destroyForcibly();
        }
    }

    @Test
    void endOfInputWithoutShutdownExitsOne() throws Exception {
        Process p = start();
        try {
            p.getOutputStream().close();
            assertTrue(p.waitFor(30, TimeUnit.SECONDS), "the server did not exit");
            assertEquals(1, p.exitValue());
        } finally {
            p.destroyForcibly();
        }
    }

    @Test
    void aNegativeDebounceIsBadUsage() {
        CommandLineTest.Run r = CommandLineTest.run("serve", "--debounce", "-5");
        assertEquals(2, r.code());
        assertTrue(r.err().contains("--debounce"), r.err());
        assertEquals("", r.out(), "nothing may reach standard output but the protocol");
    }
}
