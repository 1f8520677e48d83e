package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Base64;
import java.util.Map;
import java.util.zip.GZIPOutputStream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Malformed vocabulary files give {@link VocabularyFormatException} naming the file and the line
 * or JSON path. The files are small samples written here (orchard-themed token strings).
 */
class MalformedVocabularyTest {

    @TempDir
    Path dir;

    private Path write(String name, String content) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, content, StandardCharsets.UTF_8);
        return p;
    }

    private static String b64(String s) {
        // java.util.Base64 (RFC 4648) as the reference encoder.
        return Base64.getEncoder().encodeToString(s.getBytes(StandardCharsets.UTF_8));
    }

    private static byte[] gzip(byte[] data) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(out)) {
            gz.write(data);
        }
        return out.toByteArray();
    }

    private VocabularyFormatException failsToLoad(String name, String content) throws IOException {
        Path p = write(name, content);
        return assertThrows(VocabularyFormatException.class, () -> Vocabularies.load(p));
    }

    private static void assertAt(VocabularyFormatException e, String source, String location, String words) {
        assertEquals(source, e.source(), e.getMessage());
        assertEquals(location, e.location(), e.getMessage());
        assertTrue(e.problem().contains(words), e.getMessage());
        assertTrue(e.getMessage().startsWith(source + (location == null ? "" : ":" + location) + ": "),
                e.getMessage());
    }

    // ------------------------------------------------------------------ rank files

    @Test
    void rankFileReadsLinesAndGaps() throws IOException {
        Path p = write("orchard.tiktoken", b64("apple") + " 0\n\n" + b64(" pear") + " 2\r\n");
        Vocabulary v = Vocabularies.load(p);
        assertEquals(3, v.size());
        assertArrayEquals("apple".getBytes(StandardCharsets.UTF_8), v.bytes(0));
        assertFalse(v.has(1));
        assertArrayEquals(" pear".getBytes(StandardCharsets.UTF_8), v.bytes(2));
        assertEquals(-1, v.endOfSequence());
    }

    @Test
    void rankNotANumber() throws IOException {
        var e = failsToLoad("cl100k.tiktoken", b64("graft") + " 0\n" + b64("scion") + " x1\n");
        assertAt(e, "cl100k.tiktoken", "2", "rank is not a number: 'x1'");
        assertEquals("cl100k.tiktoken:2: rank is not a number: 'x1'", e.getMessage());
    }

    @Test
    void rankNegative() throws IOException {
        assertAt(failsToLoad("r.tiktoken", b64("graft") + " -4\n"), "r.tiktoken", "1", "negative");
    }

    @Test
    void rankMissing() throws IOException {
        assertAt(failsToLoad("r.tiktoken", b64("graft") + " 0\n" + b64("bud") + "\n"), "r.tiktoken", "2",
                "expected '<base64 bytes> <rank>'");
    }

    @Test
    void rankLineWithExtraField() throws IOException {
        assertAt(failsToLoad("r.tiktoken", b64("graft") + " 0 7\n"), "r.tiktoken", "1", "more fields");
    }

    @Test
    void rankBadBase64() throws IOException {
        assertAt(failsToLoad("r.tiktoken", "b64("+ " 0\n"), "r.tiktoken", "1", "not valid base64");
    }

    @Test
    void rankTooLarge() throws IOException {
        assertAt(failsToLoad("r.tiktoken", b64("graft") + " 99999999999\n"), "r.tiktoken", "1", "exceeds the limit");
    }

    @Test
    void rankDuplicateWithDifferentBytes() throws IOException {
        var e = failsToLoad("r.tiktoken", b64("graft") + " 0\n" + b64("bud") + " 1\n" + b64("scion") + " 1\n");
        assertAt(e, "r.tiktoken", "3", "already given to different bytes on line 2");
    }

    @Test
    void rankDuplicateWithSameBytesIsAccepted() throws IOException {
        Vocabulary v = Vocabularies.load(write("r.tiktoken", b64("bud") + " 1\n" + b64("bud") + " 1\n"));
        assertEquals(2, v.size());
    }

    @Test
    void emptyFileHasNoTokens() throws IOException {
        assertAt(failsToLoad("empty.tiktoken", ""), "empty.tiktoken", null, "no tokens");
    }

    @Test
    void specialTokensInRankFile() {
        byte[] data = (b64("graft") + " 0\n" + b64("bud") + " 1\n").getBytes(StandardCharsets.US_ASCII);
        Vocabulary v = Vocabularies.fromRankFile(new ByteArrayInputStream(data), "s.tiktoken",
                Map.of("<|end|>", 3), "<|end|>");
        assertEquals(4, v.size());
        assertEquals(3, v.endOfSequence());
        assertTrue(v.isSpecial(3));
        assertFalse(v.has(2));
        var e = assertThrows(VocabularyFormatException.class, () -> Vocabularies.fromRankFile(
                new ByteArrayInputStream(data), "s.tiktoken", Map.of("<|end|>", 1), "<|end|>"));
        assertAt(e, "s.tiktoken", "2", "special token '<|end|>'");
        assertThrows(IllegalArgumentException.class, () -> Vocabularies.fromRankFile(
                new ByteArrayInputStream(data), "s.tiktoken", Map.of(), "<|end|>"));
    }

    // ------------------------------------------------------------------ tokenizer.json

    private static final String BYTE_LEVEL_DECODER = "\"decoder\":{\"type\":\"ByteLevel\"}";

    @Test
    void notJson() {
        var e = assertThrows(VocabularyFormatException.class, () -> Vocabularies.fromTokenizerJson(
                new ByteArrayInputStream("orchard rows".getBytes(StandardCharsets.UTF_8)), "rows.json", null));
        assertAt(e, "rows.json", "$", "not valid JSON (line 1");
    }

    @Test
    void jsonSyntaxErrorInsideVocab() throws IOException {
        var e = failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":0,\n\"pear\": }}}");
        assertAt(e, "t.json", "$.model.vocab[\"pear\"]", "not valid JSON (line 2");
    }

    @Test
    void truncatedJson() throws IOException {
        var e = failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":0,");
        // The path names the last entry read before the input ended.
        assertAt(e, "t.json", "$.model.vocab[\"apple\"]", "not valid JSON");
    }

    @Test
    void missingModel() throws IOException {
        assertAt(failsToLoad("t.json", "{\"version\":\"1.0\"}"), "t.json", "$.model", "missing");
    }

    @Test
    void missingVocab() throws IOException {
        assertAt(failsToLoad("t.json", "{\"model\":{\"type\":\"BPE\",\"merges\":[]}}"), "t.json",
                "$.model.vocab", "missing");
    }

    @Test
    void idNotAnInteger() throws IOException {
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":\"0\"}}}"), "t.json",
                "$.model.vocab[\"apple\"]", "must be an integer");
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":1.5}}}"), "t.json",
                "$.model.vocab[\"apple\"]", "must be an integer");
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":1e400}}}"), "t.json",
                "$.model.vocab[\"apple\"]", "must be an integer");
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":99999999999}}}"), "t.json",
                "$.model.vocab[\"apple\"]", "out of range");
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":2000000000}}}"), "t.json",
                "$.model.vocab[\"apple\"]", "exceeds the limit");
    }

    @Test
    void negativeId() throws IOException {
        assertAt(failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":0,\"pear\":-3}}}"), "t.json",
                "$.model.vocab[\"pear\"]", "negative");
    }

    @Test
    void duplicateIdWithDifferentBytes() throws IOException {
        var e = failsToLoad("t.json", "{\"model\":{\"vocab\":{\"apple\":0,\"pear\":0}}}");
        assertAt(e, "t.json", "$.model.vocab[\"pear\"]", "already used by \"apple\"");
    }

    @Test
    void characterOutsideByteAlphabet() throws IOException {
        var e = failsToLoad("t.json", "{" + BYTE_LEVEL_DECODER + ",\"model\":{\"vocab\":{\"ĠappleĠ€\":0}}}");
        assertAt(e, "t.json", "$.model.vocab[\"ĠappleĠ€\"]", "(U+20AC) at index 7");
    }

    @Test
    void addedTokenWithoutId() throws IOException {
        var e = failsToLoad("t.json", "{\"added_tokens\":[{\"content\":\"<|end|>\",\"special\":true}],"
                + "\"model\":{\"vocab\":{\"apple\":0}}}");
        assertAt(e, "t.json", "$.added_tokens[0].id", "not an integer");
    }

    @Test
    void addedTokensClashing() throws IOException {
        var e = failsToLoad("t.json", "{\"added_tokens\":[{\"id\":1,\"content\":\"<a>\"},{\"id\":1,\"content\":\"<b>\"}],"
                + "\"model\":{\"vocab\":{\"apple\":0}}}");
        assertAt(e, "t.json", "$.added_tokens[1].id", "already used by added token \"<a>\"");
    }

    @Test
    void deepNestingIsAnErrorNotAStackOverflow() throws IOException {
        String deep = "[".repeat(100_000) + "]".repeat(100_000);
        var e = failsToLoad("t.json", "{\"decoder\":" + deep + ",\"model\":{\"vocab\":{\"apple\":0}}}");
        assertEquals("t.json", e.source());
        assertTrue(e.location().startsWith("$.decoder"), e.getMessage());
    }

    @Test
    void truncatedGzip() throws IOException {
        byte[] whole = gzip(("{\"model\":{\"vocab\":{\"pear\":1}}, \"pad\":\""
                + "orchard ".repeat(2000) + "\"}").getBytes(StandardCharsets.UTF_8));
        Path p = dir.resolve("cut-tokenizer.json.gz");
        Files.write(p, Arrays.copyOf(whole, whole.length / 2));
        var e = assertThrows(VocabularyFormatException.class, () -> Vocabularies.load(p));
        assertAt(e, "cut-tokenizer.json.gz", null, "truncated or corrupt gzip");
    }

    @Test
    void gzipByMagicBytesNotByName() throws IOException {
        Path p = dir.resolve("plain-name.json");
        Files.write(p, gzip("{\"model\":{\"vocab\":{\"apple\":0}}}".getBytes(StandardCharsets.UTF_8)));
        assertEquals(1, Vocabularies.load(p).size());
    }

    // ------------------------------------------------------------------ configuration beside the file

    @Test
    void configBesideNamedFile() throws IOException {
        String json = "{\"added_tokens\":[{\"id\":2,\"content\":\"</row>\",\"special\":true}],"
                + "\"model\":{\"vocab\":{\"apple\":0,\"pear\":1}}}";
        Path p = dir.resolve("orchard-tokenizer.json.gz");
        Files.write(p, gzip(json.getBytes(StandardCharsets.UTF_8)));
        write("orchard-tokenizer_config.json", "{\"eos_token\":{\"content\":\"</row>\",\"special\":true}}");
        Vocabulary v = Vocabularies.load(p);
        assertEquals(2, v.endOfSequence());
        // An eos_token that is an ordinary vocabulary entry is found too (and becomes special).
        write("orchard-tokenizer_config.json", "{\"eos_token\":\"pear\"}");
        Vocabulary w = Vocabularies.load(p);
        assertEquals(1, w.endOfSequence());
        assertTrue(w.isSpecial(1));
    }

    @Test
    void plainConfigName() throws IOException {
        Path p = write("tokenizer.json", "{\"model\":{\"vocab\":{\"apple\":0,\"</row>\":1}}}");
        assertEquals(-1, Vocabularies.load(p).endOfSequence());
        write("tokenizer_config.json", "{\"eos_token\":\"</row>\"}");
        assertEquals(1, Vocabularies.load(p).endOfSequence());
    }

    @Test
    void configEndOfSequenceUnknown() throws IOException {
        Path p = write("tokenizer.json", "{\"model\":{\"vocab\":{\"apple\":0}}}");
        write("tokenizer_config.json", "{\"eos_token\":\"</row>\"}");
        var e = assertThrows(VocabularyFormatException.class, () -> Vocabularies.load(p));
        assertAt(e, "tokenizer_config.json", "$.eos_token", "\"</row>\" is not in tokenizer.json");
    }

    @Test
    void configNotJson() throws IOException {
        Path p = write("tokenizer.json", "{\"model\":{\"vocab\":{\"apple\":0}}}");
        write("tokenizer_config.json", "{\"eos_token\": </row>}");
        var e = assertThrows(VocabularyFormatException.class, () -> Vocabularies.load(p));
        assertEquals("tokenizer_config.json", e.source());
        assertTrue(e.problem().startsWith("not valid JSON"), e.getMessage());
    }

    @Test
    void configWithoutEndOfSequence() throws IOException {
        Path p = write("tokenizer.json", "{\"model\":{\"vocab\":{\"apple\":0}}}");
        write("tokenizer_config.json", "{\"eos_token\":null}");
        assertEquals(-1, Vocabularies.load(p).endOfSequence());
    }

    // ------------------------------------------------------------------ decoding styles on small samples

    @Test
    void sentencePieceStyleFromDecoder() throws IOException {
        String json = "{\"decoder\":{\"type\":\"Sequence\",\"decoders\":[{\"type\":\"Replace\","
                + "\"pattern\":{\"String\":\"\u2581\"},\"content\":\" \"},{\"type\":\"Strip\",\"content\":\" \","
                + "\"start\":1,\"stop\":0}]},\"model\":{\"vocab\":{\"\u2581apple\":0,\"<0x0A>\":1}}}";
        Vocabulary v = Vocabularies.load(write("sp.json", json));
        assertArrayEquals(" apple".getBytes(StandardCharsets.UTF_8), v.bytes(0));
        assertArrayEquals(new byte[] {0x0A}, v.bytes(1));
    }

    @Test
    void plainStyleKeepsTokenText() throws IOException {
        // No byte-level or SentencePiece marker: ▁ and <0x0A> stay literal text.
        Vocabulary v = Vocabularies.load(write("wl.json", "{\"model\":{\"vocab\":{\"\u2581apple\":0,\"<0x0A>\":1}}}"));
        assertArrayEquals("\u2581apple".getBytes(StandardCharsets.UTF_8), v.bytes(0));
        assertArrayEquals("<0x0A>".getBytes(StandardCharsets.UTF_8), v.bytes(1));
    }

    @Test
    void byteLevelNestedInSequencePreTokenizer() throws IOException {
        String json = "{\"pre_tokenizer\":{\"type\":\"Sequence\",\"pretokenizers\":[{\"type\":\"Split\"},"
                + "{\"type\":\"ByteLevel\"}]},\"model\":{\"vocab\":{\"Ġgraft\":0,\"Ċ\":1}}}";
        Vocabulary v = Vocabularies.load(write("bl.json", json));
        assertArrayEquals(" graft".getBytes(StandardCharsets.UTF_8), v.bytes(0));
        assertArrayEquals(new byte[] {0x0A}, v.bytes(1));
    }
}
