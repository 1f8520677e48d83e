package dev.espalier.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The command line's contract: outputs and exit codes. */
class CommandLineTest {

    public record Run(int code, String out, String err) {
    }

    static Run run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(code, out.toString(), err.toString());
    }

    @Test
    void maskListsAllowedTokensAfterAPrefix() {
        Run r = run("mask", "--regex", "RS-(7|9|12|26)", "--text", "RS-");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("allowed: 6 of"), r.out()); // 1, 2, 7, 9, 12, 26 are single cl100k tokens
        assertTrue(r.out().contains("end of sequence not allowed"), r.out());
    }

    @Test
    void idsAreAscendingAndIncludeEndOfSequenceWhenComplete() {
        Run r = run("mask", "--regex", "RS-(7|9|12|26)", "--text", "RS-1", "--ids");
        assertEquals(0, r.code(), r.err());
        List<Integer> ids = Arrays.stream(r.out().trim().split("\n")).map(Integer::parseInt).toList();
        // after "RS-1" only "2" may follow: cl100k's token "2" (id 17, from jtokkit's encoding of "2")
        assertEquals(List.of(17), ids);
        Run done = run("mask", "--regex", "RS-(7|9|12|26)", "--text", "RS-12", "--ids");
        // cl100k's <|endoftext|> is 100257 (jtokkit's decoding; checked in the engine's vocabulary tests)
        assertEquals("100257", done.out().trim());
    }

    @Test
    void aPrefixThatCannotBeCompletedExitsOne() {
        Run r = run("mask", "--regex", "RS-[0-9]{1,2}", "--text", "RS-x");
        assertEquals(1, r.code());
        assertTrue(r.err().contains("byte 3"), r.err());
        assertTrue(r.err().contains("'0'-'9'"), r.err());
    }

    @Test
    void textFilePrefixIsReadAsExactBytes(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("prefix.txt");
        Files.write(f, new byte[] {'R', 'S', '-', (byte) 0xE2});
        Run r = run("mask", "--regex", "RS-[0-9€]", "--text-file", f.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("forced continuation: \\x82\\xAC"), r.out()); // € is E2 82 AC (RFC 3629)
    }

    @Test
    void badUsageAndBadInputExitTwo() {
        Run bad = run("mask", "--regex", "ab(?<=c)");
        assertEquals(2, bad.code());
        assertTrue(bad.err().contains("offset 2"), bad.err());
        assertFalse(bad.err().contains("Exception"), bad.err());
        assertEquals(2, run("mask").code());
        assertEquals(2, run("mask", "--regex", "a", "--vocab", "/no/such/vocab.json").code());
        Run g = run("mask", "--schema", "orchard.schema.json");
        assertEquals(2, g.code());
        assertTrue(g.err().contains("no such schema file"), g.err());
        Run empty = run("mask", "--regex", "[^\\s\\S]");
        assertEquals(2, empty.code());
        assertTrue(empty.err().contains("empty"), empty.err());
        Run explode = run("mask", "--regex", "(a|b)*a(a|b){25}");
        assertEquals(2, explode.code());
        assertTrue(explode.err().contains("limit"), explode.err());
    }

    @Test
    void samplesAreJsonLiteralsThatMatch() {
        String pattern = "(Amberglow|Copperbell) on RS-(7|9|12)";
        Run r = run("sample", "--regex", pattern, "-n", "20", "--seed", "3");
        assertEquals(0, r.code(), r.err());
        String[] lines = r.out().trim().split("\n");
        assertEquals(20, lines.length);
        Pattern p = Pattern.compile(pattern); // reference: java.util.regex
        for (String line : lines) {
            assertTrue(line.startsWith("\"") && line.endsWith("\""), line);
            assertTrue(p.matcher(line.substring(1, line.length() - 1)).matches(), line);
        }
        assertEquals(r.out(), run("sample", "--regex", pattern, "-n", "20", "--seed", "3").out(), "seeded runs repeat");
    }

    @Test
    void vocabShowsSizeAndLooksTokensUp() {
        Run r = run("vocab", "cl100k", "--id", "17", "--find", "2");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("end of sequence: 100257"), r.out());
        assertTrue(r.out().contains("id 17: 2"), r.out());
        assertTrue(r.out().contains("text \"2\": [17]"), r.out());
        assertEquals(2, run("vocab", "cl100k", "--id", "999999").code());
    }

    @Test
    void demoRunsOnTheBuiltInDefault() {
        Run r = run("demo");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("forced continuation: Row␣"), r.out());
        long samples = r.out().lines().filter(l -> l.startsWith("  \"Row ")).count();
        assertEquals(5, samples, r.out());
    }

    @Test
    void outputIsUtf8() {
        Run r = run("sample", "--regex", "(Äpfel|Birne) ☘", "-n", "3", "--seed", "1");
        assertTrue(r.out().contains("☘"), r.out());
        assertTrue(r.out().getBytes(StandardCharsets.UTF_8).length > r.out().length());
    }
}
