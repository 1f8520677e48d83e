package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The trie's UTF-8 well-formedness automaton ({@link VocabularyTrie#utf8Step}) against the JDK's
 * UTF-8 decoder with malformed input reported (java.nio.charset, a general-purpose reference that
 * follows the Unicode Standard's table 3-7 of well-formed byte sequences): a byte sequence takes the
 * automaton from a boundary back to one, passing no boundary on the way, iff the decoder reads it as
 * exactly one character. Every sequence of one to three bytes, and four-byte sequences with every
 * first and second byte and the edges of the continuation range after them.
 */
class Utf8StepTest {

    private static final CharsetDecoder DECODER = StandardCharsets.UTF_8.newDecoder()
            .onMalformedInput(CodingErrorAction.REPORT).onUnmappableCharacter(CodingErrorAction.REPORT);

    /** Whether the automaton reads {@code bytes} as one whole character. */
    private static boolean oneCharacter(byte[] bytes) {
        int u = 0;
        for (int i = 0; i < bytes.length; i++) {
            u = VocabularyTrie.utf8Step(u, bytes[i] & 0xFF);
            if (u < 0 || (u == 0) != (i == bytes.length - 1)) {
                return false;
            }
        }
        return true;
    }

    private static boolean decodesAsOneCharacter(byte[] bytes) {
        try {
            String s = DECODER.decode(ByteBuffer.wrap(bytes)).toString();
            return s.codePointCount(0, s.length()) == 1;
        } catch (CharacterCodingException e) {
            return false;
        }
    }

    private static int check(byte[] bytes) {
        assertEquals(decodesAsOneCharacter(bytes), oneCharacter(bytes), () -> java.util.HexFormat.ofDelimiter(" ").formatHex(bytes));
        return oneCharacter(bytes) ? 1 : 0;
    }

    @Test
    void agreesWithTheJdkDecoder() {
        int characters = 0;
        for (int a = 0; a < 256; a++) {
            characters += check(new byte[] {(byte) a});
            for (int b = 0; b < 256; b++) {
                characters += check(new byte[] {(byte) a, (byte) b});
                if (a >= 0xE0 && a <= 0xEF) {
                    for (int c = 0; c < 256; c++) {
                        characters += check(new byte[] {(byte) a, (byte) b, (byte) c});
                    }
                }
            }
        }
        int[] edges = {0x00, 0x7F, 0x80, 0x8F, 0x90, 0x9F, 0xA0, 0xBF, 0xC0, 0xFF};
        Random rnd = new Random(11);
        for (int a = 0xF0; a <= 0xFF; a++) {
            for (int b = 0; b < 256; b++) {
                for (int c : edges) {
                    for (int d : edges) {
                        characters += check(new byte[] {(byte) a, (byte) b, (byte) c, (byte) d});
                    }
                }
                characters += check(new byte[] {(byte) a, (byte) b, (byte) (0x80 + rnd.nextInt(64)), (byte) (0x80 + rnd.nextInt(64))});
            }
        }
        // 128 one-byte, 1,920 two-byte and 61,440 three-byte characters (every one), and some four-byte ones
        assertTrue(characters > 128 + 1_920 + 61_440, "characters: " + characters);
    }
}
