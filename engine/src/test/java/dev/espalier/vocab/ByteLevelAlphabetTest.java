package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.HashSet;
import java.util.Set;

import org.junit.jupiter.api.Test;

/** The GPT-2 byte alphabet (published with GPT-2's encoder, bytes_to_unicode). */
class ByteLevelAlphabetTest {

    @Test
    void knownPairs() {
        // From memory of the published table: Ġ (U+0120) is space, Ċ (U+010A) newline, ĉ (U+0109)
        // tab, Ā (U+0100) byte 0, Ń (U+0143) soft hyphen 0xAD, the last of the 68 moved bytes.
        assertEquals(0x20, ByteLevelAlphabet.byteOf('Ġ'));
        assertEquals(0x0A, ByteLevelAlphabet.byteOf('Ċ'));
        assertEquals(0x09, ByteLevelAlphabet.byteOf('ĉ'));
        assertEquals(0x00, ByteLevelAlphabet.byteOf('Ā'));
        assertEquals(0xAD, ByteLevelAlphabet.byteOf('Ń'));
        assertEquals('!', ByteLevelAlphabet.charOf('!'));
        assertEquals(-1, ByteLevelAlphabet.byteOf('ń'));
        assertEquals(-1, ByteLevelAlphabet.byteOf(' '));
        assertEquals(-1, ByteLevelAlphabet.byteOf('€'));
    }

    @Test
    void bijection() {
        // 256 distinct characters, 188 printable ones standing for themselves (common practice:
        // 94 + 12 + 82 bytes per the table's three ranges).
        Set<Character> seen = new HashSet<>();
        int identity = 0;
        for (int b = 0; b < 256; b++) {
            char c = ByteLevelAlphabet.charOf(b);
            seen.add(c);
            assertEquals(b, ByteLevelAlphabet.byteOf(c));
            identity += c == b ? 1 : 0;
        }
        assertEquals(256, seen.size());
        assertEquals(188, identity);
    }
}
