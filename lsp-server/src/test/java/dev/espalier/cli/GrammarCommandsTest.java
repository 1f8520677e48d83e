package dev.espalier.cli;

import dev.espalier.cli.CommandLineTest.Run;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import static dev.espalier.cli.CommandLineTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The grammar commands: check, test, parse, examples, fmt, and mask/sample with --grammar. */
class GrammarCommandsTest {

    static final Path GRAMMARS = Path.of("..", "grammars");

    /** `espalier test` passes on every grammar of the library with its samples. */
    @TestFactory
    Stream<DynamicTest> everyLibraryGrammarPassesItsSamples() throws IOException {
        List<Path> files;
        try (Stream<Path> s = Files.list(GRAMMARS)) {
            files = s.filter(p -> p.toString().endsWith(".abnf")).sorted().toList();
        }
        assertTrue(files.size() >= 13, files.toString());
        return files.stream().map(f -> DynamicTest.dynamicTest(f.getFileName().toString(), () -> {
            String name = f.getFileName().toString().replace(".abnf", "");
            Run r = run("test", f.toString(), GRAMMARS.resolve("samples").resolve(name).toString());
            assertEquals(0, r.code(), r.out() + r.err());
            assertTrue(r.out().contains(" passed, 0 failed"), r.out());
            Run c = run("check", f.toString());
            assertEquals(0, c.code(), c.out() + c.err());
        }));
    }

    @Test
    void testReportsTheFirstBadByteAndWhatWasExpected(@TempDir Path dir) throws IOException {
        Path sample = dir.resolve("swapped.accept.txt");
        Files.writeString(sample, "2025-13-01T10:00:00Z\n", StandardCharsets.UTF_8);
        Run r = run("test", GRAMMARS.resolve("date-time.abnf").toString(), sample.toString());
        assertEquals(1, r.code(), r.out());
        // month 13: the second digit after "1" must be 0-2 (RFC 3339 §5.6, date-month = 01-12)
        assertTrue(r.out().contains("line 1, column 7 (byte 6)"), r.out());
        assertTrue(r.out().contains("expected one of '0'-'2'"), r.out());
        assertTrue(r.out().contains("0 passed, 1 failed"), r.out());
    }

    @Test
    void checkReportsErrorsWithPositionsAndExitsOne(@TempDir Path dir) throws IOException {
        Path g = dir.resolve("broken.abnf");
        Files.writeString(g, "order = command *( \";\" command )\ncommand = prune / graft\nprune = \"prune \" tree-id\n");
        Run r = run("check", g.toString());
        assertEquals(1, r.code(), r.out());
        assertTrue(r.out().contains("broken.abnf:2:19: error:"), r.out());
        assertTrue(r.out().contains("[undefined-rule]"), r.out());
    }

    @Test
    void parsePrintsATreeAndJson(@TempDir Path dir) throws IOException {
        Path input = dir.resolve("doc.json");
        Files.writeString(input, "{\"variety\": \"Amberglow\", \"rows\": [1, 2]}\n");
        Run r = run("parse", GRAMMARS.resolve("json.abnf").toString(), input.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().startsWith("JSON-text"), r.out());
        assertTrue(r.out().contains("object"), r.out());
        Run j = run("parse", GRAMMARS.resolve("json.abnf").toString(), input.toString(), "--json");
        assertEquals(0, j.code(), j.err());
        assertTrue(j.out().trim().startsWith("{"), j.out());
        Files.writeString(input, "{\"variety\": }");
        assertEquals(1, run("parse", GRAMMARS.resolve("json.abnf").toString(), input.toString()).code());
    }

    @Test
    void examplesAreAcceptedByTheGrammar(@TempDir Path dir) throws IOException {
        Run r = run("examples", GRAMMARS.resolve("work-order.abnf").toString(), "-n", "8", "--seed", "4");
        assertEquals(0, r.code(), r.err());
        String[] lines = r.out().trim().split("\n");
        assertEquals(8, lines.length);
        for (int i = 0; i < lines.length; i++) {
            String text = new com.fasterxml.jackson.databind.ObjectMapper().readValue(lines[i], String.class);
            Path sample = dir.resolve("ex" + i + ".accept.txt");
            Files.writeString(sample, text + "\n", StandardCharsets.UTF_8);
        }
        Run t = run("test", GRAMMARS.resolve("work-order.abnf").toString(), dir.toString());
        assertEquals(0, t.code(), t.out());
    }

    @Test
    void fmtIsIdempotentAndCheckable(@TempDir Path dir) throws IOException {
        Path g = dir.resolve("messy.abnf");
        Files.writeString(g, "order=command *(\"; \" command)\ncommand   =   prune/graft\nprune = %s\"prune\"\ngraft = %s\"graft\"\n");
        assertEquals(1, run("fmt", g.toString(), "--check").code());
        Run f = run("fmt", g.toString());
        assertEquals(0, f.code(), f.err());
        assertEquals(0, run("fmt", g.toString(), "--write").code());
        assertEquals(f.out(), Files.readString(g));
        assertEquals(0, run("fmt", g.toString(), "--check").code());
    }

    @Test
    void maskAndSampleWithAGrammar() throws IOException {
        String json = GRAMMARS.resolve("json.abnf").toString();
        Run r = run("mask", "--grammar", json, "--text", "{\"variety\": \"Amber\"", "--ids");
        assertEquals(0, r.code(), r.err());
        assertFalse(r.out().isBlank());
        Run s = run("sample", "--grammar", json, "-n", "5", "--seed", "2", "--max-tokens", "40");
        assertEquals(0, s.code(), s.err());
        assertEquals(5, s.out().trim().split("\n").length);
        Run bad = run("mask", "--grammar", json, "--text", "{\"variety\" 1");
        assertEquals(1, bad.code());
        assertTrue(bad.err().contains("byte 11"), bad.err());
    }
}
