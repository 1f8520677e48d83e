package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.knuddels.jtokkit.Encodings;
import com.knuddels.jtokkit.api.Encoding;
import com.knuddels.jtokkit.api.EncodingRegistry;
import com.knuddels.jtokkit.api.EncodingType;
import com.knuddels.jtokkit.api.IntArrayList;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.ConcurrentHashMap;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

/** The built-in encodings against jtokkit (com.knuddels:jtokkit), the reference for their contents. */
class BuiltinVocabularyTest {

    private static final EncodingRegistry REGISTRY = Encodings.newDefaultEncodingRegistry();
    private static final ConcurrentHashMap<String, Vocabulary> CACHE = new ConcurrentHashMap<>();

    static Vocabulary builtin(String name) {
        return CACHE.computeIfAbsent(name, Vocabularies::builtin);
    }

    /** jtokkit's bytes for one id, or null when jtokkit knows no such token. */
    private static byte[] jtokkitBytes(Encoding enc, int id) {
        IntArrayList one = new IntArrayList(1);
        one.add(id);
        try {
            return enc.decodeBytes(one);
        } catch (RuntimeException unknown) {
            // jtokkit 1.1.0 reports an unknown id with a NullPointerException ("Unknown token for decoding")
            return null;
        }
    }

    @ParameterizedTest
    @CsvSource({"r50k, R50K_BASE", "p50k, P50K_BASE", "cl100k, CL100K_BASE", "o200k, O200K_BASE"})
    void everyIdDecodesToJtokkitsBytes(String name, EncodingType type) {
        Vocabulary v = builtin(name);
        Encoding enc = REGISTRY.getEncoding(type);
        // Beyond our id space jtokkit must know no token either (checked over a margin of 1000 ids).
        for (int id = 0; id < v.size() + 1000; id++) {
            byte[] expected = jtokkitBytes(enc, id);
            if (expected == null) {
                assertFalse(v.has(id), () -> name + ": id unknown to jtokkit but present here");
            } else {
                int fixed = id;
                assertTrue(v.has(id), () -> name + ": id " + fixed + " missing");
                assertArrayEquals(expected, v.bytes(id), () -> name + ": bytes of id " + fixed);
            }
        }
    }

    @ParameterizedTest
    @CsvSource({"r50k, R50K_BASE", "p50k, P50K_BASE", "cl100k, CL100K_BASE", "o200k, O200K_BASE"})
    void specialTokensAreThoseJtokkitRefusesAsOrdinaryText(String name, EncodingType type) {
        Vocabulary v = builtin(name);
        Encoding enc = REGISTRY.getEncoding(type);
        // jtokkit's encode(String) rejects text that holds a special token, so it cannot encode
        // "<|endoftext|>" as allowed special text; its refusal is what marks a special token there.
        for (int id : v.specialIds()) {
            String text = new String(v.bytes(id), StandardCharsets.UTF_8);
            assertThrows(UnsupportedOperationException.class, () -> enc.encode(text), text);
        }
        // Ordinary tokens that are valid UTF-8 are accepted by encode(String).
        for (int id = 0; id < v.size(); id += 97) {
            if (v.has(id) && !v.isSpecial(id) && TokenText.isValidUtf8(v.bytes(id))) {
                enc.encode(new String(v.bytes(id), StandardCharsets.UTF_8));
            }
        }
        // Conversely, among all tokens that look like control tokens ("<|...") the ones jtokkit
        // refuses are exactly our special tokens.
        int refused = 0;
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id)) {
                continue;
            }
            byte[] b = v.bytes(id);
            if (!TokenText.isValidUtf8(b)) {
                continue;
            }
            String s = new String(b, StandardCharsets.UTF_8);
            if (!s.startsWith("<|")) {
                continue;
            }
            try {
                enc.encode(s);
            } catch (UnsupportedOperationException e) {
                refused++;
                int fixed = id;
                assertTrue(v.isSpecial(id), () -> name + ": jtokkit treats id " + fixed + " as special");
            }
        }
        assertEquals(v.specialIds().length, refused);
    }

    @ParameterizedTest
    @CsvSource({"r50k, R50K_BASE", "p50k, P50K_BASE", "cl100k, CL100K_BASE", "o200k, O200K_BASE"})
    void endOfSequenceIsEndOfText(String name, EncodingType type) {
        Vocabulary v = builtin(name);
        int eos = v.endOfSequence();
        assertTrue(v.isSpecial(eos));
        // jtokkit decodes the id to the text <|endoftext|> (its API cannot encode that text as an
        // allowed special token, see above, so the check goes through decoding).
        assertArrayEquals("<|endoftext|>".getBytes(StandardCharsets.UTF_8),
                jtokkitBytes(REGISTRY.getEncoding(type), eos));
    }

    @Test
    void suffixedNamesAndListing() {
        assertEquals(List.of("r50k", "p50k", "cl100k", "o200k"), Vocabularies.builtinNames());
        Vocabulary a = Vocabularies.builtin("r50k_base");
        assertEquals("r50k", a.name());
        assertEquals(builtin("r50k").size(), a.size());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Vocabularies.builtin("orchard100k"));
        assertTrue(e.getMessage().contains("cl100k"), e.getMessage());
    }

    @Test
    void idSpaceIsLargestIdPlusOne() {
        // Gaps are unused ids: cl100k's id 100256 decodes to nothing in jtokkit. The size 100277
        // (largest special id 100276 + 1) is from memory; the jtokkit sweep above confirms it.
        Vocabulary v = builtin("cl100k");
        assertEquals(100277, v.size());
        assertFalse(v.has(100256));
        assertEquals(null, jtokkitBytes(REGISTRY.getEncoding(EncodingType.CL100K_BASE), 100256));
    }
}
