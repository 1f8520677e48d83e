package dev.espalier.lsp.samples;

import dev.espalier.lsp.DocumentSnapshot;
import dev.espalier.lsp.samples.SampleMap.Problem;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.Range;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The workspace file's reader: entries, and problems with ranges. Expected ranges come from
 * {@link String#indexOf} on the file text, independent of Jackson's locations.
 */
class SampleMapReaderTest {

    @TempDir
    Path ws;

    private SampleMap read(String text) throws Exception {
        Files.writeString(ws.resolve("work-order.abnf"), "order = %s\"prune\"\n");
        return SampleMapReader.read(ws.resolve(SampleMap.FILE_NAME), text);
    }

    /** The range of the first occurrence of {@code needle} in {@code text}. */
    private static Range rangeOf(String text, String needle) {
        DocumentSnapshot d = new DocumentSnapshot("file:///x", "", 0, text);
        int at = text.indexOf(needle);
        assertTrue(at >= 0, needle);
        return d.range(at, at + needle.length());
    }

    private static Problem only(SampleMap m, String code) {
        List<Problem> ps = m.problems().stream().filter(p -> p.code().equals(code)).toList();
        assertEquals(1, ps.size(), m.problems().toString());
        return ps.get(0);
    }

    @Test
    void aGoodFileGivesEntriesInOrderAndNoProblems() throws Exception {
        String text = """
                {
                  "samples": [
                    { "files": ["orders/*.txt", "more/**"], "grammar": "work-order.abnf", "start": "order", "vocabulary": "o200k_base" },
                    { "files": "tags/*.tag", "regex": "T-[0-9]{4}" }
                  ]
                }
                """;
        SampleMap m = read(text);
        assertEquals(List.of(), m.problems());
        assertEquals(2, m.entries().size());
        SampleMap.Entry e = m.entries().get(0);
        assertEquals(SampleMap.Kind.GRAMMAR, e.kind());
        assertEquals(ws.resolve("work-order.abnf"), e.sourceFile());
        assertEquals("o200k", e.vocabulary().builtin());
        assertEquals(rangeOf(text, "\"order\""), e.start().range());
        assertEquals("cl100k", m.entries().get(1).vocabulary().builtin());
        assertEquals(m.entries().get(0), m.entryFor(ws.resolve("orders/a.txt")).orElseThrow());
        assertEquals(m.entries().get(0), m.entryFor(ws.resolve("more/deep/b.json")).orElseThrow());
        assertEquals(m.entries().get(1), m.entryFor(ws.resolve("tags/x.tag")).orElseThrow());
        assertTrue(m.entryFor(ws.resolve("orders/deep/a.txt")).isEmpty(), "* does not cross folders");
        assertTrue(m.entryFor(ws.resolve("../elsewhere/orders/a.txt")).isEmpty());
        assertTrue(m.entryFor(ws.resolve(SampleMap.FILE_NAME)).isEmpty());
    }

    @Test
    void malformedJsonIsAnErrorWhereTheParserStopped() throws Exception {
        String text = "{\n  \"samples\": [\n    { \"files\": \"a\" ]\n}\n";
        Problem p = only(read(text), "json-syntax");
        assertEquals(DiagnosticSeverity.Error, p.severity());
        assertEquals(rangeOf(text, "]").getStart(), p.range().getStart());
        assertTrue(p.message().startsWith("not valid JSON: "), p.message());
    }

    @Test
    void anUnfinishedFileIsAnErrorAtItsEnd() throws Exception {
        String text = "{ \"samples\": [";
        Problem p = only(read(text), "json-syntax");
        assertEquals(0, p.range().getStart().getLine());
        assertEquals(text.length(), p.range().getStart().getCharacter());
    }

    @Test
    void unknownKeysAreWarningsOnTheKey() throws Exception {
        String text = "{\"samples\": [{\"files\": \"a/*\", \"regex\": \"x\", \"flies\": 3}], \"extra\": {}}";
        SampleMap m = read(text);
        List<Problem> unknown = m.problems().stream().filter(p -> p.code().equals("unknown-key")).toList();
        assertEquals(2, unknown.size());
        assertEquals(rangeOf(text, "\"flies\""), unknown.get(0).range());
        assertEquals(rangeOf(text, "\"extra\""), unknown.get(1).range());
        assertEquals(DiagnosticSeverity.Warning, unknown.get(0).severity());
        assertEquals(1, m.entries().size(), "an unknown key does not drop the entry");
    }

    @Test
    void missingFilesUnknownVocabulariesAndWrongTypesPointAtTheValue() throws Exception {
        String text = """
                {"samples": [
                  {"files": "a/*", "grammar": "nope.abnf"},
                  {"files": "b/*", "regex": "x", "vocabulary": "gpt-nine"},
                  {"files": 7, "regex": "x"},
                  {"files": "c/*", "regex": "x", "start": "order"},
                  {"files": "d/*", "regex": "x", "schema": "s.json"},
                  {"files": "e/*"}
                ]}
                """;
        SampleMap m = read(text);
        assertEquals(rangeOf(text, "\"nope.abnf\""), only(m, "missing-file").range());
        Problem vocab = only(m, "unknown-vocabulary");
        assertEquals(rangeOf(text, "\"gpt-nine\""), vocab.range());
        assertTrue(vocab.message().contains("cl100k"), vocab.message());
        assertEquals(rangeOf(text, "7"), only(m, "wrong-type").range());
        assertEquals(rangeOf(text, "\"order\""), only(m, "start-without-grammar").range());
        List<Problem> constraint = m.problems().stream().filter(p -> p.code().equals("constraint")).toList();
        assertEquals(2, constraint.size());
        assertTrue(constraint.get(0).message().contains("only one of"), constraint.get(0).message());
        assertTrue(constraint.get(1).message().contains("names no constraint"), constraint.get(1).message());
        assertEquals(List.of(), m.entries());
    }

    @Test
    void notAnObjectAndDuplicateKeys() throws Exception {
        assertEquals("not-an-object", read("[1, 2]").problems().get(0).code());
        assertEquals("empty-file", read("  ").problems().get(0).code());
        String text = "{\"samples\": [], \"samples\": []}";
        Problem dup = only(read(text), "duplicate-key");
        assertEquals(text.lastIndexOf("\"samples\""), dup.range().getStart().getCharacter());
        assertEquals(text.lastIndexOf("\"samples\"") + 9, dup.range().getEnd().getCharacter());
    }

    @Test
    void aVocabularyFileIsResolvedAgainstTheWorkspaceFile() throws Exception {
        Files.createDirectories(ws.resolve("vocab"));
        Files.writeString(ws.resolve("vocab/tiny.ranks"), "YQ== 0\n");
        SampleMap m = read("{\"samples\": [{\"files\": \"*.txt\", \"regex\": \"a\", \"vocabulary\": \"vocab/tiny.ranks\"}]}");
        assertEquals(List.of(), m.problems());
        assertEquals(ws.resolve("vocab/tiny.ranks"), m.entries().get(0).vocabulary().file());
    }
}
