package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;

import org.junit.jupiter.api.Test;

/** Readable token text, checked against RFC 3629 (UTF-8) and Java's own UTF-8 decoder. */
class TokenTextTest {

    private static byte[] bytes(int... b) {
        byte[] out = new byte[b.length];
        for (int i = 0; i < b.length; i++) {
            out[i] = (byte) b[i];
        }
        return out;
    }

    @Test
    void completeCharactersStay() {
        // U+4E2D is E4 B8 AD in UTF-8 (RFC 3629 encoding rules).
        assertEquals("中", TokenText.escape(bytes(0xE4, 0xB8, 0xAD)));
        assertEquals("é", TokenText.escape(bytes(0xC3, 0xA9)));
    }

    @Test
    void partialCharactersAreEscaped() {
        assertEquals("\\xE4\\xB8", TokenText.escape(bytes(0xE4, 0xB8)));
        assertEquals("中\\xE4", TokenText.escape(bytes(0xE4, 0xB8, 0xAD, 0xE4)));
        assertEquals("\\xAD", TokenText.escape(bytes(0xAD)));
        // RFC 3629 section 3: encoded surrogates (ED A0 80) and overlong forms (C0 AF) are invalid.
        assertEquals("\\xED\\xA0\\x80", TokenText.escape(bytes(0xED, 0xA0, 0x80)));
        assertEquals("\\xC0\\xAF", TokenText.escape(bytes(0xC0, 0xAF)));
        assertFalse(TokenText.isValidUtf8(bytes(0xE4, 0xB8)));
        assertTrue(TokenText.isValidUtf8(bytes(0xE4, 0xB8, 0xAD)));
    }

    @Test
    void asciiEscapes() {
        assertEquals("␣apple\\n\\t\\\\\\x00\\x7F", TokenText.escape(" apple\n\t\\\u0000\u007F".getBytes(StandardCharsets.UTF_8)));
    }

    @Test
    void displayOfRealTokensAgreesWithJavasDecoder() {
        // For cl100k, a token of valid UTF-8 without spaces, controls or backslashes displays as
        // java.nio's decoding of it; any other token's display carries an escape.
        Vocabulary v = BuiltinVocabularyTest.builtin("cl100k");
        int partial = 0;
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id)) {
                assertEquals("<unused " + id + ">", v.display(id));
                continue;
            }
            byte[] b = v.bytes(id);
            String decoded = new String(b, StandardCharsets.UTF_8);
            boolean plain = TokenText.isValidUtf8(b)
                    && decoded.chars().allMatch(c -> c > 0x20 && c != 0x7F && c != '\\');
            if (plain) {
                assertEquals(decoded, v.display(id));
            } else {
                assertTrue(v.display(id).matches(".*(\\\\|␣).*"), v.display(id));
            }
            if (!TokenText.isValidUtf8(b)) {
                partial++;
                assertTrue(v.display(id).contains("\\x"), v.display(id));
            }
        }
        assertTrue(partial > 100, "cl100k has many tokens that split a UTF-8 character: " + partial);
    }

    @Test
    void jsonLiteral() {
        // RFC 8259 section 7: quotation mark, reverse solidus and control characters are escaped.
        assertEquals("\"a\\\"b\\\\c\\n\\u0001\"", TokenText.jsonLiteral("a\"b\\c\n\u0001".getBytes(StandardCharsets.UTF_8)));
    }
}
