package dev.espalier.lsp;

import com.fasterxml.jackson.databind.ObjectMapper;
import dev.espalier.lsp.samples.PreviewCache;
import dev.espalier.lsp.samples.SampleMap;
import dev.espalier.lsp.samples.SamplePreviews;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.DidChangeWatchedFilesParams;
import org.eclipse.lsp4j.FileChangeType;
import org.eclipse.lsp4j.FileEvent;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Base64;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The workspace file through the server: its diagnostics, constraint errors shown on it and on the
 * samples, and reloading when it (or a grammar) changes in the editor or on disk.
 */
class SampleMapFeaturesTest {

    private static final PreviewCache CACHE = new PreviewCache();

    @TempDir
    Path ws;

    private TestClient start() throws Exception {
        StringBuilder ranks = new StringBuilder();
        String chars = "abcdefghijklmnopqrstuvwxyz0123456789 -{}\":,";
        for (int i = 0; i < chars.length(); i++) {
            ranks.append(Base64.getEncoder().encodeToString(chars.substring(i, i + 1).getBytes())).append(' ').append(i).append('\n');
        }
        Files.writeString(ws.resolve("letters.ranks"), ranks);
        Files.createDirectories(ws.resolve("tags"));
        return TestClient.start(ServerOptions.defaults().withDebounce(Duration.ZERO)
                .withSamples(SamplePreviews.features(CACHE)), ws);
    }

    private String uri(String relative) {
        return ws.resolve(relative).toUri().toString();
    }

    private static String map(String entry) {
        return "{\n  \"samples\": [\n    " + entry + "\n  ]\n}\n";
    }

    private static Range rangeOf(String text, String needle) {
        int at = text.indexOf(needle);
        assertTrue(at >= 0, needle);
        return new DocumentSnapshot("file:///x", "", 0, text).range(at, at + needle.length());
    }

    private static String code(Diagnostic d) {
        return d.getCode() == null ? "" : d.getCode().getLeft();
    }

    @Test
    void theWorkspaceFileGetsItsProblemsAsDiagnostics() throws Exception {
        try (TestClient c = start()) {
            String text = map("{\"files\": \"tags/*\", \"regex\": \"row (\", \"vocabulary\": \"letters.ranks\", \"colour\": 1}");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME), text);
            String mapUri = uri(SampleMap.FILE_NAME);
            List<Diagnostic> ds = SamplePreviewFeaturesTest.openAndCheck(c, mapUri, text);
            Diagnostic unknown = ds.stream().filter(d -> code(d).equals("unknown-key")).findFirst().orElseThrow();
            assertEquals(rangeOf(text, "\"colour\""), unknown.getRange());
            assertEquals(DiagnosticSeverity.Warning, unknown.getSeverity());
            Diagnostic regex = ds.stream().filter(d -> code(d).equals("constraint-error")).findFirst().orElseThrow();
            assertEquals(rangeOf(text, "\"row (\""), regex.getRange());
            assertTrue(regex.getMessage().contains("regular expression"), regex.getMessage());

            // hover on the entry: what it maps, and that the pattern cannot be compiled
            org.eclipse.lsp4j.Hover h = TestClient.get(c.remote.getTextDocumentService().hover(new org.eclipse.lsp4j.HoverParams(
                    new org.eclipse.lsp4j.TextDocumentIdentifier(mapUri), rangeOf(text, "tags/*").getStart())));
            String md = h.getContents().getRight().getValue();
            assertTrue(md.contains("regex row ( on letters.ranks") && md.contains("`tags/*`")
                    && md.contains("regular expression is not valid"), md);

            // the sample names the same problem, on its first line
            List<Diagnostic> sample = SamplePreviewFeaturesTest.openAndCheck(c, uri("tags/a.tag"), "row 1\nrow 2");
            assertEquals(1, sample.size(), sample.toString());
            assertEquals("preview-unavailable", code(sample.get(0)));
            assertEquals(new Range(new Position(0, 0), new Position(0, 5)), sample.get(0).getRange());

            // fixing the pattern in the editor reloads the mapping and the sample's findings
            String fixed = text.replace("row (", "(row [0-9]\\n)*row [0-9]");
            c.replaceAll(mapUri, fixed);
            List<Diagnostic> after = SamplePreviewFeaturesTest.settled(c, mapUri);
            assertEquals(List.of("unknown-key"), after.stream().map(SampleMapFeaturesTest::code).toList());
            String sampleUri = uri("tags/a.tag");
            Diagnostic refreshed = c.awaitPublished(p -> p.getUri().equals(sampleUri) && p.getDiagnostics().isEmpty())
                    .getDiagnostics().stream().findFirst().orElse(null);
            assertEquals(null, refreshed);
        }
    }

    @Test
    void aGrammarWithErrorsIsReportedOnTheWorkspaceFileAndTheSample() throws Exception {
        try (TestClient c = start()) {
            Files.writeString(ws.resolve("tag.abnf"), "tag = %s\"row \" number\n");
            String text = map("{\"files\": \"tags/*.tag\", \"grammar\": \"tag.abnf\", \"vocabulary\": \"letters.ranks\"}");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME), text);
            List<Diagnostic> sample = SamplePreviewFeaturesTest.openAndCheck(c, uri("tags/b.tag"), "row 7");
            assertEquals("preview-unavailable", code(sample.get(0)));
            assertTrue(sample.get(0).getMessage().contains("tag.abnf has 2 errors"), sample.get(0).getMessage());
            List<Diagnostic> onMap = SamplePreviewFeaturesTest.openAndCheck(c, uri(SampleMap.FILE_NAME), text);
            Diagnostic d = onMap.stream().filter(x -> code(x).equals("constraint-error")).findFirst().orElseThrow();
            assertEquals(rangeOf(text, "\"tag.abnf\""), d.getRange());
            assertTrue(d.getMessage().contains("[empty-language]"), d.getMessage());
            // the other one: the rule "number" is not defined (from the check of the same text)
            assertTrue(dev.espalier.abnf.AbnfCheck.check("tag = %s\"row \" number\n", "tag.abnf").diagnostics().stream()
                    .anyMatch(x -> x.code().equals("undefined-rule")));
        }
    }

    @Test
    void editsOnDiskAreReloadedWhenTheClientReportsThem() throws Exception {
        try (TestClient c = start()) {
            Files.writeString(ws.resolve("tag.abnf"), "tag = %s\"row \" 1*DIGIT\n");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME),
                    map("{\"files\": \"tags/*.tag\", \"grammar\": \"tag.abnf\", \"vocabulary\": \"letters.ranks\"}"));
            String sample = uri("tags/c.tag");
            List<Diagnostic> before = SamplePreviewFeaturesTest.openAndCheck(c, sample, "tree 7");
            assertEquals("leaves-language", code(before.get(0)));
            assertEquals(new Range(new Position(0, 0), new Position(0, 1)), before.get(0).getRange());

            // the mapping now names another grammar, changed on disk only
            Files.writeString(ws.resolve("tree.abnf"), "tag = %s\"tree \" 1*DIGIT\n");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME),
                    map("{\"files\": \"tags/*.tag\", \"grammar\": \"tree.abnf\", \"vocabulary\": \"letters.ranks\"}"));
            int published = c.publishedFor(sample).size();
            c.remote.getWorkspaceService().didChangeWatchedFiles(new DidChangeWatchedFilesParams(List.of(
                    new FileEvent(uri(SampleMap.FILE_NAME), FileChangeType.Changed))));
            c.awaitPublished(p -> p.getUri().equals(sample) && c.publishedFor(sample).size() > published
                    && p.getDiagnostics().isEmpty());

            // a grammar open in the editor counts with its unsaved text
            String grammarUri = uri("tree.abnf");
            c.open(grammarUri, "tag = %s\"tree \" 1*DIGIT \"!\"\n");
            AllowedTokensResult r = TestClient.get(c.remote.allowedTokens(new AllowedTokensParams(sample,
                    new Position(0, 6), 50)));
            assertEquals(false, r.endAllowed(), "the open grammar wants a final !");
            String mapText = Files.readString(ws.resolve(SampleMap.FILE_NAME));
            c.open(uri(SampleMap.FILE_NAME), mapText);
            org.eclipse.lsp4j.Hover h = TestClient.get(c.remote.getTextDocumentService().hover(new org.eclipse.lsp4j.HoverParams(
                    new org.eclipse.lsp4j.TextDocumentIdentifier(uri(SampleMap.FILE_NAME)), rangeOf(mapText, "tree.abnf").getStart())));
            String md = h.getContents().getRight().getValue();
            assertTrue(md.contains("compiled: byte DFA") && md.contains("tokens in letters.ranks"), md);
        }
    }

    @Test
    void jsonSchemaConstraintsWorkOrSayTheyAreNotAvailable() throws Exception {
        boolean available;
        try {
            JsonSchemas.compile("{\"type\": \"integer\"}", SchemaOptions.defaults());
            available = true;
        } catch (UnsupportedOperationException e) {
            available = false;
        }
        try (TestClient c = start()) {
            Files.writeString(ws.resolve("count.schema.json"), "{\"type\": \"integer\"}");
            String text = map("{\"files\": \"tags/*.json\", \"schema\": \"count.schema.json\", \"vocabulary\": \"letters.ranks\"}");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME), text);
            List<Diagnostic> sample = SamplePreviewFeaturesTest.openAndCheck(c, uri("tags/n.json"), "42x");
            if (!available) {
                assertEquals("preview-unavailable", code(sample.get(0)));
                assertTrue(sample.get(0).getMessage().contains("JSON Schema constraints are not available in this build"),
                        sample.get(0).getMessage());
                List<Diagnostic> onMap = SamplePreviewFeaturesTest.openAndCheck(c, uri(SampleMap.FILE_NAME), text);
                assertEquals(rangeOf(text, "\"count.schema.json\""), onMap.get(0).getRange());
            } else {
                // Jackson as the reference: "42" is an integer, "42x" is not JSON
                assertTrue(new ObjectMapper().readTree("42").isIntegralNumber());
                assertEquals("leaves-language", code(sample.get(0)));
                assertEquals(new Range(new Position(0, 2), new Position(0, 3)), sample.get(0).getRange());
            }
        }
    }

    @Test
    void schemaPreviewsReachTheFilesBesideTheSchema() throws Exception {
        try (TestClient c = start()) {
            Files.createDirectories(ws.resolve("common"));
            Files.writeString(ws.resolve("common/row.json"), "{\"$defs\": {\"row\": {\"type\": \"integer\", \"minimum\": 1}}}");
            Files.writeString(ws.resolve("rows.schema.json"), "{\"$ref\": \"common/row.json#/$defs/row\"}");
            Files.writeString(ws.resolve(SampleMap.FILE_NAME),
                    map("{\"files\": \"rows/*.json\", \"schema\": \"rows.schema.json\", \"vocabulary\": \"letters.ranks\"}"));
            assertEquals(List.of(), SamplePreviewFeaturesTest.openAndCheck(c, uri("rows/a.json"), "12"));
            List<Diagnostic> zero = SamplePreviewFeaturesTest.openAndCheck(c, uri("rows/b.json"), "0");
            assertEquals("leaves-language", code(zero.get(0)), zero.toString()); // minimum 1, from the other file
        }
    }

    @Test
    void whileThePreviewIsPreparedFeaturesSaySoAndDiagnosticsFollowWhenReady() throws Exception {
        java.util.concurrent.CountDownLatch hold = new java.util.concurrent.CountDownLatch(1);
        java.util.concurrent.ExecutorService threads = java.util.concurrent.Executors.newSingleThreadExecutor();
        java.util.concurrent.Executor held = task -> threads.execute(() -> {
            try {
                hold.await();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            task.run();
        });
        start().close(); // writes the vocabulary file
        try (TestClient c = TestClient.start(ServerOptions.defaults().withDebounce(Duration.ZERO)
                .withSamples(SamplePreviews.features(new PreviewCache(held))), ws)) {
            Files.writeString(ws.resolve(SampleMap.FILE_NAME),
                    map("{\"files\": \"tags/*.tag\", \"regex\": \"row [0-9]\", \"vocabulary\": \"letters.ranks\"}"));
            String sample = uri("tags/d.tag");
            c.open(sample, "row x");
            List<Diagnostic> first = c.diagnostics(sample).getDiagnostics();
            assertEquals(List.of("preview-preparing"), first.stream().map(SampleMapFeaturesTest::code).toList());
            assertEquals(DiagnosticSeverity.Information, first.get(0).getSeverity());
            java.util.concurrent.ExecutionException e = org.junit.jupiter.api.Assertions.assertThrows(
                    java.util.concurrent.ExecutionException.class, () -> TestClient.get(c.remote.allowedTokens(
                            new AllowedTokensParams(sample, new Position(0, 4), 10))));
            org.eclipse.lsp4j.jsonrpc.ResponseErrorException re = org.junit.jupiter.api.Assertions.assertInstanceOf(
                    org.eclipse.lsp4j.jsonrpc.ResponseErrorException.class, e.getCause());
            assertEquals(org.eclipse.lsp4j.jsonrpc.messages.ResponseErrorCode.RequestFailed.getValue(),
                    re.getResponseError().getCode());
            assertTrue(re.getMessage().contains("preparing"), re.getMessage());
            org.eclipse.lsp4j.CompletionList none = TestClient.get(c.remote.getTextDocumentService().completion(
                    new org.eclipse.lsp4j.CompletionParams(new org.eclipse.lsp4j.TextDocumentIdentifier(sample),
                            new Position(0, 4)))).getRight();
            assertTrue(none.isIncomplete() && none.getItems().isEmpty());

            hold.countDown();
            List<Diagnostic> ready = SamplePreviewFeaturesTest.settled(c, sample);
            assertEquals(List.of("leaves-language"), ready.stream().map(SampleMapFeaturesTest::code).toList());
            assertEquals(new Range(new Position(0, 4), new Position(0, 5)), ready.get(0).getRange());
        } finally {
            hold.countDown();
            threads.shutdownNow();
        }
    }

    @Test
    void theWorkspaceFileCompletesVocabularyNamesAndLayouts() throws Exception {
        try (TestClient c = start()) {
            String text = map("{\"files\": \"x/*\", \"regex\": \"a\", \"vocabulary\": \"cl\"}");
            String mapUri = uri(SampleMap.FILE_NAME);
            c.open(mapUri, text);
            Position inName = rangeOf(text, "cl\"").getEnd();
            inName = new Position(inName.getLine(), inName.getCharacter() - 1); // after "cl"
            org.eclipse.lsp4j.CompletionList list = TestClient.get(c.remote.getTextDocumentService().completion(
                    new org.eclipse.lsp4j.CompletionParams(new org.eclipse.lsp4j.TextDocumentIdentifier(mapUri), inName))).getRight();
            assertEquals(dev.espalier.vocab.Vocabularies.builtinNames(), list.getItems().stream()
                    .map(org.eclipse.lsp4j.CompletionItem::getLabel).toList());
            org.eclipse.lsp4j.CompletionItem cl = list.getItems().stream().filter(i -> i.getLabel().equals("cl100k"))
                    .findFirst().orElseThrow();
            assertEquals(text.replace("\"cl\"", "\"cl100k\""), Edits.apply(text, List.of(cl.getTextEdit().getLeft())));
            Position outside = new Position(0, 1);
            assertEquals(List.of(), TestClient.get(c.remote.getTextDocumentService().completion(
                    new org.eclipse.lsp4j.CompletionParams(new org.eclipse.lsp4j.TextDocumentIdentifier(mapUri), outside)))
                    .getRight().getItems());
        }
    }
}
