package dev.espalier.lsp;

import org.eclipse.lsp4j.CompletionParams;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.HoverParams;
import org.eclipse.lsp4j.MessageParams;
import org.eclipse.lsp4j.MessageType;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseErrorCode;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.Random;
import java.util.concurrent.ExecutionException;

import static dev.espalier.lsp.TestClient.get;
import static dev.espalier.lsp.TestClient.pos;
import static dev.espalier.lsp.TestClient.range;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The server never dies: bad messages, unknown methods, huge or binary documents, failures, rapid edits. */
class RobustnessTest {

    static final String GOOD = "order = %s\"prune tree \" tree-id\ntree-id = %s\"T-\" 4DIGIT\n";

    /** The server still answers: a grammar opened now gets its diagnostics. */
    static void stillServes(TestClient c) throws Exception {
        String uri = "file:///tmp/still-serving-" + System.nanoTime() + ".abnf";
        c.open(uri, "order = tre\n");
        List<Diagnostic> ds = c.diagnostics(uri).getDiagnostics();
        assertTrue(ds.stream().anyMatch(d -> d.getCode().getLeft().equals("undefined-rule")), ds.toString());
    }

    static void sendRaw(TestClient c, String raw) throws Exception {
        c.toServer.write(raw.getBytes(StandardCharsets.UTF_8));
        c.toServer.flush();
    }

    static String frame(String json) {
        return "Content-Length: " + json.getBytes(StandardCharsets.UTF_8).length + "\r\n\r\n" + json;
    }

    @Test
    void malformedMessagesAreAnsweredOrSkippedAndServingGoesOn() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            // JSON that does not parse, with a request id: lsp4j answers with a parse error
            sendRaw(c, frame("{\"jsonrpc\":\"2.0\",\"id\":7001,\"method\":\"textDocument/hover\",\"params\":{"));
            // a header without a length, then a body the framing cannot place
            sendRaw(c, "Content-Type: application/vscode-jsonrpc\r\n\r\n");
            sendRaw(c, frame("not json at all"));
            // valid JSON that is not a JSON-RPC message
            sendRaw(c, frame("[1, 2, 3]"));
            // a request whose parameters have the wrong shape
            sendRaw(c, frame("{\"jsonrpc\":\"2.0\",\"id\":7002,\"method\":\"textDocument/hover\",\"params\":42}"));
            stillServes(c);
            // each problem reached the client as a log message too
            assertNotNull(c.awaitLog(m -> m.getMessage().contains("Missing header Content-Length")));
            assertNotNull(c.awaitLog(m -> m.getMessage().startsWith("JSON-RPC") && m.getMessage().contains("BEGIN_ARRAY")));
        }
    }

    @Test
    void unknownMethodsGetMethodNotFoundAndUnknownNotificationsAreIgnored() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            var endpoint = c.clientEndpoint();
            ExecutionException e = assertThrows(ExecutionException.class,
                    () -> get(endpoint.request("orchard/prune", List.of("T-0042"))));
            ResponseErrorException r = assertInstanceOf(ResponseErrorException.class, e.getCause());
            assertEquals(ResponseErrorCode.MethodNotFound.getValue(), r.getResponseError().getCode());
            endpoint.notify("orchard/graft", List.of("T-0042"));
            stillServes(c);
        }
    }

    @Test
    void aFiveMegabyteDocumentGetsOneNoteAndTheServerStaysQuick() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            StringBuilder sb = new StringBuilder();
            int i = 0;
            while (sb.length() < 5_000_000) {
                sb.append("row").append(i).append(" = %s\"tree ").append(i).append("\" / row").append(i + 1).append('\n');
                i++;
            }
            String uri = "file:///tmp/huge-orchard.abnf";
            c.open(uri, sb.toString());
            Diagnostic d = c.diagnostics(uri).getDiagnostics().get(0);
            assertEquals("not-checked", d.getCode().getLeft());
            assertTrue(d.getMessage().contains("too large"), d.getMessage());
            assertTrue(c.awaitLog(m -> m.getMessage().contains("too large")) != null);
            // an edit of the huge document is applied incrementally
            c.edit(uri, range(0, 0, 0, 4), "tier");
            assertEquals("not-checked", c.diagnostics(uri).getDiagnostics().get(0).getCode().getLeft());
            assertEquals(null, get(c.remote.getTextDocumentService().hover(
                    new HoverParams(new TextDocumentIdentifier(uri), pos(0, 1)))));
            assertTrue(c.server.document(uri).text().startsWith("tier = %s\"tree 0\""));
            stillServes(c);
        }
    }

    @Test
    void binaryContentIsReportedNotAnalysed() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            Random rnd = new Random(42);
            StringBuilder sb = new StringBuilder("order = \"a\"\n");
            for (int k = 0; k < 20_000; k++) {
                sb.append((char) rnd.nextInt(256));
            }
            String uri = "file:///tmp/binary.abnf";
            c.open(uri, sb.toString());
            List<Diagnostic> ds = c.diagnostics(uri).getDiagnostics();
            assertEquals(1, ds.size(), ds.toString());
            assertTrue(ds.get(0).getMessage().contains("binary content"), ds.get(0).getMessage());
            assertNotNull(c.awaitLog(m -> m.getMessage().contains("binary content")));
            // undecodable bytes (U+FFFD after UTF-8 decoding) and control characters without NUL count too
            StringBuilder fffd = new StringBuilder("order = \"a\"\n");
            for (int k = 0; k < 2_000; k++) {
                fffd.append(k % 3 == 0 ? '\uFFFD' : (char) ('a' + k % 26));
            }
            String uri3 = "file:///tmp/undecodable.abnf";
            c.open(uri3, fffd.toString());
            assertTrue(c.diagnostics(uri3).getDiagnostics().get(0).getMessage().contains("binary content"));
            // a few control characters are ABNF syntax errors, analysed as usual
            String ctl = "order = \"a\" \u0001\u0002 b\u0007\n";
            String uri2 = "file:///tmp/controls.abnf";
            c.open(uri2, ctl);
            assertTrue(c.diagnostics(uri2).getDiagnostics().stream()
                    .anyMatch(d -> d.getCode().getLeft().equals("syntax")));
            stillServes(c);
        }
    }

    @Test
    void rapidEditsLeaveOnlyTheFinalDiagnostics() throws Exception {
        ServerOptions slowDebounce = ServerOptions.defaults().withDebounce(Duration.ofMillis(400));
        try (TestClient c = TestClient.start(slowDebounce, null)) {
            String uri = "file:///tmp/rapid.abnf";
            c.open(uri, "order = r0\n");
            c.diagnostics(uri);
            int last = 0;
            for (int k = 1; k <= 60; k++) {
                // each edit renames the reference: r1, r2, ... all undefined
                last = c.replaceAll(uri, "order = r" + k + "\n");
            }
            PublishDiagnosticsParams p = c.diagnostics(uri);
            assertEquals(last, p.getVersion());
            assertTrue(p.getDiagnostics().stream().anyMatch(d -> d.getMessage().contains("r60")), p.toString());
            Thread.sleep(500); // nothing stale may arrive after the final version
            List<PublishDiagnosticsParams> all = c.publishedFor(uri);
            assertEquals(List.of(1, last), all.stream().map(PublishDiagnosticsParams::getVersion).toList());
        }
    }

    @Test
    void aRuleWhoseAutomatonExceedsTheLimitStillGetsAHoverAndALogMessage() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            // (a|b)* a (a|b){14}: a DFA must remember the last 15 letters, 2^15 states (a textbook
            // example of subset-construction blow-up; from memory), past the 10,000-state limit
            String text = "tail = *(\"a\" / \"b\") \"a\" 14(\"a\" / \"b\")\n";
            String uri = "file:///tmp/blowup.abnf";
            c.open(uri, text);
            c.diagnostics(uri);
            Hover h = get(c.remote.getTextDocumentService().hover(new HoverParams(new TextDocumentIdentifier(uri),
                    new Position(0, 1))));
            String md = h.getContents().getRight().getValue();
            assertTrue(md.contains("would exceed 10,000 states"), md);
            assertNotNull(c.awaitLog(m -> m.getType() == MessageType.Info && m.getMessage().contains("tail")));
            stillServes(c);
        }
    }

    @Test
    void groupsNestedPastTheLimitAreReportedAndDeepOnesBelowItAreRead() throws Exception {
        try (TestClient c = TestClient.start(null)) {
            String deep = "order = " + "(".repeat(900) + "%s\"x\"" + ")".repeat(900) + "\n";
            String uri = "file:///tmp/deep.abnf";
            c.open(uri, deep);
            assertEquals(List.of(), c.diagnostics(uri).getDiagnostics());
            // past the front end's documented limit of 1,000 levels (Abnf.MAX_NESTING)
            String deeper = "order = " + "(".repeat(1500) + "%s\"x\"" + ")".repeat(1500) + "\n";
            c.replaceAll(uri, deeper);
            List<Diagnostic> ds = c.diagnostics(uri).getDiagnostics();
            assertTrue(ds.stream().anyMatch(d -> d.getMessage().contains("1000") || d.getMessage().contains("1,000")),
                    ds.toString());
            stillServes(c);
        }
    }

    @Test
    void aFailingFeatureGivesAnErrorResponseAndALogMessage() throws Exception {
        ServerOptions failing = ServerOptions.defaults().withDebounce(Duration.ZERO).withSamples(ctx -> new DocumentFeatures() {
            @Override
            public Hover hover(DocumentSnapshot doc, Position p) {
                throw new IllegalStateException("orchard map unreadable");
            }

            @Override
            public List<Diagnostic> diagnostics(DocumentSnapshot doc) {
                throw new StackOverflowError();
            }

            @Override
            public org.eclipse.lsp4j.CompletionList completion(DocumentSnapshot doc, Position p) {
                throw new OutOfMemoryError("simulated");
            }
        });
        try (TestClient c = TestClient.start(failing, null)) {
            String uri = "file:///tmp/sample.txt";
            c.open(uri, "prune tree T-0042");
            Diagnostic internal = c.diagnostics(uri).getDiagnostics().get(0);
            assertEquals("internal", internal.getCode().getLeft());
            ExecutionException e = assertThrows(ExecutionException.class, () -> get(c.remote.getTextDocumentService()
                    .hover(new HoverParams(new TextDocumentIdentifier(uri), pos(0, 1)))));
            ResponseErrorException r = assertInstanceOf(ResponseErrorException.class, e.getCause());
            assertEquals(ResponseErrorCode.InternalError.getValue(), r.getResponseError().getCode());
            assertTrue(r.getMessage().contains("orchard map unreadable"), r.getMessage());
            assertThrows(ExecutionException.class, () -> get(c.remote.getTextDocumentService()
                    .completion(new CompletionParams(new TextDocumentIdentifier(uri), pos(0, 1)))));
            MessageParams log = c.awaitLog(m -> m.getType() == MessageType.Error && m.getMessage().contains("hover"));
            assertNotNull(log);
            stillServes(c);
        }
    }
}
