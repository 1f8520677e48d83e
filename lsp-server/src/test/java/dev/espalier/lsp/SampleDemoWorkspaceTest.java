package dev.espalier.lsp;

import dev.espalier.lsp.samples.SamplePreviews;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The demo workspace {@code grammars/samples-workspace} shows what its documentation says. */
class SampleDemoWorkspaceTest {

    static Path demo() {
        for (Path dir = Path.of(System.getProperty("user.dir")).toAbsolutePath(); dir != null; dir = dir.getParent()) {
            Path d = dir.resolve("grammars").resolve("samples-workspace");
            if (Files.isDirectory(d)) {
                return d;
            }
        }
        throw new IllegalStateException("no grammars/samples-workspace above " + System.getProperty("user.dir"));
    }

    private static List<String> codes(List<Diagnostic> ds) {
        return ds.stream().map(d -> d.getCode().getLeft()).toList();
    }

    @Test
    void everyDemoSampleGetsTheFindingsItsNameSuggests() throws Exception {
        Path ws = demo();
        try (TestClient c = TestClient.start(ServerOptions.defaults().withDebounce(Duration.ZERO)
                .withSamples(SamplePreviews.features()), ws)) {
            assertEquals(List.of(), open(c, ws, "espalier-samples.json").stream()
                    .filter(d -> !d.getMessage().contains("JSON Schema")).toList());
            assertEquals(List.of(), open(c, ws, "work-orders/monday.txt"));
            assertEquals(List.of("incomplete"), codes(open(c, ws, "work-orders/draft.txt")));
            List<Diagnostic> typo = open(c, ws, "work-orders/typo.txt");
            assertEquals(List.of("leaves-language"), codes(typo));
            String text = Files.readString(ws.resolve("work-orders/typo.txt"));
            int at = text.indexOf("-13-") + 2; // month 13: its second digit leaves the language (RFC 3339 date-month)
            assertEquals(new Range(new Position(0, at), new Position(0, at + 1)), typo.get(0).getRange());
            assertEquals(List.of(), open(c, ws, "reports/tree-0042.json"));
            assertEquals(List.of(), open(c, ws, "labels/nb-0417.label"));
            assertEquals(List.of("incomplete"), codes(open(c, ws, "tags/row-04.tag")));
            List<Diagnostic> schema = open(c, ws, "inspections/t-0311.json");
            assertTrue(schema.isEmpty() || schema.get(0).getMessage().contains(
                    "JSON Schema constraints are not available in this build"), schema.toString());
        }
    }

    private static List<Diagnostic> open(TestClient c, Path ws, String relative) throws Exception {
        Path f = ws.resolve(relative);
        return SamplePreviewFeaturesTest.openAndCheck(c, f.toUri().toString(), Files.readString(f, StandardCharsets.UTF_8));
    }
}
