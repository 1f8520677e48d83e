package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.util.HashSet;
import java.util.Iterator;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;

/**
 * The tokenizer.json files in the shared folder (see its vocab/README.md), read through
 * {@link Vocabularies#load}. References: the README's counts, the files themselves read
 * independently with Jackson's tree API, and the published GPT-2 byte alphabet.
 */
class RealTokenizerJsonTest {

    private static byte[] utf8(String s) {
        return s.getBytes(StandardCharsets.UTF_8);
    }

    /** Id of the config's eos_token in the tokenizer.json's added tokens, via Jackson. */
    private static int eosFromConfig(String prefix) throws IOException {
        JsonNode config = SharedVocab.json(prefix + "-tokenizer_config.json");
        JsonNode eos = config.get("eos_token");
        String text = eos.isObject() ? eos.get("content").asText() : eos.asText();
        for (JsonNode a : SharedVocab.json(prefix + "-tokenizer.json.gz").get("added_tokens")) {
            if (a.get("content").asText().equals(text)) {
                return a.get("id").asInt();
            }
        }
        throw new AssertionError("eos " + text + " not among added tokens");
    }

    // ------------------------------------------------------------------ Qwen3 (byte-level)

    @Test
    void qwen3SizeAndAddedTokensPerReadme() {
        Vocabulary v = SharedVocab.load("qwen3-tokenizer.json.gz");
        // README: 151,643 tokens + 26 added, contiguous ids.
        assertEquals(151_643 + 26, v.size());
        assertEquals(151_643 + 26, v.tokenCount());
        assertEquals("qwen3-tokenizer.json.gz", v.name());
    }

    @Test
    void qwen3SpecialFlagsFollowAddedTokens() throws IOException {
        Vocabulary v = SharedVocab.load("qwen3-tokenizer.json.gz");
        JsonNode added = SharedVocab.json("qwen3-tokenizer.json.gz").get("added_tokens");
        assertEquals(26, added.size());
        Set<Integer> special = new HashSet<>();
        for (JsonNode a : added) {
            int id = a.get("id").asInt();
            assertArrayEquals(utf8(a.get("content").asText()), v.bytes(id));
            assertEquals(a.get("special").asBoolean(), v.isSpecial(id), a.toString());
            if (a.get("special").asBoolean()) {
                special.add(id);
            }
        }
        Set<Integer> ours = new HashSet<>();
        for (int id : v.specialIds()) {
            ours.add(id);
        }
        assertEquals(special, ours);
    }

    @Test
    void qwen3EndOfSequenceFromConfig() throws IOException {
        Vocabulary v = SharedVocab.load("qwen3-tokenizer.json.gz");
        assertEquals(eosFromConfig("qwen3"), v.endOfSequence());
    }

    @Test
    void qwen3ByteAlphabetPerGpt2Table() throws IOException {
        Vocabulary v = SharedVocab.load("qwen3-tokenizer.json.gz");
        JsonNode vocab = SharedVocab.json("qwen3-tokenizer.json.gz").get("model").get("vocab");
        // Pairs of the published GPT-2 byte alphabet (bytes_to_unicode), written from memory:
        // the 68 non-printable bytes map in order to U+0100...: 0x00→Ā, 0x09→ĉ, 0x0A→Ċ, 0x20→Ġ,
        // 0x7F→ġ, 0xA0→ł, 0xAD→Ń; printable bytes stand for themselves.
        Map<String, Integer> pairs = Map.of("Ā", 0x00, "ĉ", 0x09, "Ċ", 0x0A, "Ġ", 0x20,
                "ġ", 0x7F, "ł", 0xA0, "Ń", 0xAD, "a", 0x61, "é", 0xE9, "ÿ", 0xFF);
        for (Map.Entry<String, Integer> e : pairs.entrySet()) {
            int id = vocab.get(e.getKey()).asInt();
            assertArrayEquals(new byte[] {(byte) (int) e.getValue()}, v.bytes(id), e.getKey());
        }
        // Every one of the 256 single bytes is a token.
        for (int b = 0; b < 256; b++) {
            assertEquals(1, v.idsOf(new byte[] {(byte) b}).length, "byte " + b);
        }
        // Multi-character tokens: "Ġthe" is space + "the"; tokens of printable ASCII stand for themselves.
        assertArrayEquals(utf8(" the"), v.bytes(vocab.get("Ġthe").asInt()));
        int checked = 0;
        for (Iterator<Map.Entry<String, JsonNode>> it = vocab.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            if (e.getKey().chars().allMatch(c -> c > 0x20 && c < 0x7F)) {
                assertArrayEquals(utf8(e.getKey()), v.bytes(e.getValue().asInt()), e.getKey());
                checked++;
            }
        }
        assertTrue(checked > 10_000, "ASCII tokens checked: " + checked);
    }

    @Test
    void qwen3BytesEncodeBackToTheFileStrings() throws IOException {
        // Round trip: re-encoding our bytes with the alphabet gives back every key of model.vocab.
        Vocabulary v = SharedVocab.load("qwen3-tokenizer.json.gz");
        JsonNode vocab = SharedVocab.json("qwen3-tokenizer.json.gz").get("model").get("vocab");
        for (Iterator<Map.Entry<String, JsonNode>> it = vocab.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            StringBuilder sb = new StringBuilder();
            for (byte b : v.bytes(e.getValue().asInt())) {
                sb.append(ByteLevelAlphabet.charOf(b & 0xFF));
            }
            assertEquals(e.getKey(), sb.toString());
        }
    }

    // ------------------------------------------------------------------ Llama 2 (SentencePiece style)

    @Test
    void llama2PiecesAndByteFallback() throws IOException {
        Vocabulary v = SharedVocab.load("llama2-tokenizer.json.gz");
        JsonNode vocab = SharedVocab.json("llama2-tokenizer.json.gz").get("model").get("vocab");
        // README: 32,000 tokens.
        assertEquals(32_000, v.size());
        assertEquals(32_000, v.tokenCount());
        assertArrayEquals(new byte[] {0x0A}, v.bytes(vocab.get("<0x0A>").asInt()));
        assertArrayEquals(new byte[] {(byte) 0xFF}, v.bytes(vocab.get("<0xFF>").asInt()));
        assertArrayEquals(utf8(" "), v.bytes(vocab.get("\u2581").asInt()));
        assertArrayEquals(utf8(" the"), v.bytes(vocab.get("\u2581the").asInt()));
        // All 256 byte-fallback tokens are present, one per byte.
        for (int b = 0; b < 256; b++) {
            String key = String.format("<0x%02X>", b);
            assertArrayEquals(new byte[] {(byte) b}, v.bytes(vocab.get(key).asInt()), key);
        }
    }

    @Test
    void llama2EndOfSequenceFromConfig() throws IOException {
        Vocabulary v = SharedVocab.load("llama2-tokenizer.json.gz");
        int eos = eosFromConfig("llama2");
        assertEquals(eos, v.endOfSequence());
        assertArrayEquals(utf8("</s>"), v.bytes(eos));
        assertTrue(v.isSpecial(eos));
    }

    // ------------------------------------------------------------------ Llama 3 (byte-level)

    @Test
    void llama3SizeAddedAndEndOfSequence() throws IOException {
        Vocabulary v = SharedVocab.load("llama3-tokenizer.json.gz");
        // README: 128,000 tokens + 256 added.
        assertEquals(128_000 + 256, v.size());
        assertEquals(eosFromConfig("llama3"), v.endOfSequence());
        JsonNode added = SharedVocab.json("llama3-tokenizer.json.gz").get("added_tokens");
        assertEquals(256, added.size());
        long specialInFile = 0;
        for (JsonNode a : added) {
            specialInFile += a.get("special").asBoolean() ? 1 : 0;
        }
        assertEquals(specialInFile, v.specialIds().length);
        assertArrayEquals(utf8(" the"), v.bytes(
                SharedVocab.json("llama3-tokenizer.json.gz").get("model").get("vocab").get("Ġthe").asInt()));
    }

    // ------------------------------------------------------------------ entry points

    @Test
    void streamEntryPointMatchesPathLoading() throws IOException {
        Vocabulary byPath = SharedVocab.load("llama2-tokenizer.json.gz");
        Vocabulary byStream;
        try (InputStream json = Files.newInputStream(SharedVocab.file("llama2-tokenizer.json.gz"));
             InputStream config = Files.newInputStream(SharedVocab.file("llama2-tokenizer_config.json"))) {
            byStream = Vocabularies.fromTokenizerJson(json, "llama2", config);
        }
        assertEquals(byPath.size(), byStream.size());
        assertEquals(byPath.endOfSequence(), byStream.endOfSequence());
        for (int id = 0; id < byPath.size(); id++) {
            assertArrayEquals(byPath.bytes(id), byStream.bytes(id));
        }
        try (InputStream json = Files.newInputStream(SharedVocab.file("llama2-tokenizer.json.gz"))) {
            assertEquals(-1, Vocabularies.fromTokenizerJson(json, "llama2", null).endOfSequence());
        }
    }

    @Test
    void loadingIsFast() {
        // Budget from the design: a 200k vocabulary loads in about a second; the bound here is
        // loose so that a busy machine does not fail it, but it catches quadratic behaviour.
        long t0 = System.nanoTime();
        Vocabulary v = Vocabularies.load(SharedVocab.file("qwen3-tokenizer.json.gz"));
        long ms = (System.nanoTime() - t0) / 1_000_000;
        assertFalse(v.size() == 0);
        assertTrue(ms < 5_000, "loading took " + ms + " ms");
    }
}
