package dev.espalier.lsp;

import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.InitializeResult;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.TextDocumentSyncKind;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.junit.jupiter.api.Test;

import java.util.List;
import java.util.concurrent.ExecutionException;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Life cycle, routing and the custom request of the server, through a real lsp4j client. */
class ServerSkeletonTest {

    @Test
    void initializeAnnouncesIncrementalSyncAndTheFeatures() throws Exception {
        try (TestClient c = new TestClient(ServerOptions.defaults())) {
            InitializeResult r = c.initialize(null);
            assertEquals(TextDocumentSyncKind.Incremental, r.getCapabilities().getTextDocumentSync().getRight().getChange());
            assertTrue(r.getCapabilities().getCompletionProvider().getResolveProvider());
            assertEquals("espalier", r.getServerInfo().getName());
        }
    }

    @Test
    void aClientThatRegistersDynamicallyIsAskedToWatchGrammarFiles() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            long deadline = System.nanoTime() + 10_000_000_000L;
            while (c.registrations.isEmpty() && System.nanoTime() < deadline) {
                Thread.sleep(5);
            }
            assertEquals("workspace/didChangeWatchedFiles", c.registrations.get(0).getMethod());
            assertTrue(c.registrations.get(0).getRegisterOptions().toString().contains("**/*.abnf"),
                    c.registrations.get(0).getRegisterOptions().toString());
        }
    }

    @Test
    void aGrammarFileGetsDiagnosticsWithCodes() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            String uri = "file:///tmp/orchard-order.abnf";
            c.open(uri, "order = tree\n");
            PublishDiagnosticsParams p = c.diagnostics(uri);
            Diagnostic d = p.getDiagnostics().stream().filter(x -> x.getCode().getLeft().equals("undefined-rule"))
                    .findFirst().orElseThrow(() -> new AssertionError(p.getDiagnostics().toString()));
            assertEquals(DiagnosticSeverity.Error, d.getSeverity());
            // "tree" spans columns 8-12 of line 0
            assertEquals(TestClient.range(0, 8, 0, 12), d.getRange());
        }
    }

    @Test
    void diagnosticsAreCappedWithANoteOfHowManyMore() throws Exception {
        ServerOptions capped = ServerOptions.defaults().withDebounce(java.time.Duration.ZERO).withMaxDiagnostics(10);
        try (TestClient c = TestClient.start(capped, null)) {
            StringBuilder sb = new StringBuilder("order = %s\"x\"");
            for (int i = 0; i < 30; i++) {
                sb.append(" / missing-").append(i);
            }
            String uri = "file:///tmp/capped.abnf";
            c.open(uri, sb.append('\n').toString());
            List<Diagnostic> ds = c.diagnostics(uri).getDiagnostics();
            assertEquals(10, ds.size());
            // 30 undefined rules: 9 shown, 21 more
            assertEquals("21 more findings are not shown (at most 10 per document)", ds.get(ds.size() - 1).getMessage());
            assertEquals(9, ds.stream().filter(d -> d.getSeverity() == DiagnosticSeverity.Error).count());
        }
    }

    @Test
    void otherDocumentsGetNothingByDefaultAndNoTokenPreview() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            String uri = "file:///tmp/work-order.txt";
            c.open(uri, "prune tree T-0042");
            assertEquals(List.of(), c.diagnostics(uri).getDiagnostics());
            ExecutionException e = assertThrows(ExecutionException.class, () -> TestClient.get(
                    c.remote.allowedTokens(new AllowedTokensParams(uri, TestClient.pos(0, 3), 10))));
            assertInstanceOf(ResponseErrorException.class, e.getCause());
        }
    }

    @Test
    void sampleFeaturesAnswerTheCustomRequest() throws Exception {
        ServerOptions options = ServerOptions.defaults().withSamples(ctx -> new DocumentFeatures() {
            @Override
            public AllowedTokensResult allowedTokens(DocumentSnapshot doc, org.eclipse.lsp4j.Position p, int limit) {
                int at = doc.offset(p);
                return new AllowedTokensResult(2, 10, at == doc.text().length(), "",
                        List.of(new AllowedTokensResult.AllowedToken(at, doc.text().substring(0, at))));
            }
        });
        try (TestClient c = TestClient.start(options, null)) {
            String uri = "file:///tmp/tag.txt";
            c.open(uri, "RS-7");
            AllowedTokensResult r = TestClient.get(c.remote.allowedTokens(new AllowedTokensParams(uri, TestClient.pos(0, 3), null)));
            assertEquals(2, r.count());
            assertEquals(List.of(new AllowedTokensResult.AllowedToken(3, "RS-")), r.tokens());
            // the field names editor plugins see, as documented on EspalierRequests (lsp4j writes JSON with Gson)
            Object raw = TestClient.get(c.clientEndpoint().request("espalier/allowedTokens", java.util.Map.of(
                    "uri", uri, "position", java.util.Map.of("line", 0, "character", 4), "limit", 5)));
            assertEquals("{\"count\":2,\"vocabularySize\":10,\"endAllowed\":true,\"forced\":\"\","
                    + "\"tokens\":[{\"id\":4,\"text\":\"RS-7\"}]}", new com.google.gson.Gson().toJson(raw));
        }
    }
}
