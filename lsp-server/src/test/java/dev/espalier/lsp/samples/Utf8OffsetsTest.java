package dev.espalier.lsp.samples;

import dev.espalier.vocab.TokenText;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** UTF-16 offsets against UTF-8 byte offsets, with the JDK's UTF-8 encoder and decoder as the reference. */
class Utf8OffsetsTest {

    private static final String[] PIECES = {"a", " ", "é", "中", "🍎", "\n", "\uD83C", "\uDF4E", "~"};

    @Test
    void byteAndCharOffsetsAgreeWithTheJdkEncoder() {
        Random r = new Random(7);
        for (int round = 0; round < 500; round++) {
            StringBuilder sb = new StringBuilder();
            for (int i = r.nextInt(12); i > 0; i--) {
                sb.append(PIECES[r.nextInt(PIECES.length)]);
            }
            String s = sb.toString();
            for (int end = 0; end <= s.length(); end++) {
                if (end > 0 && end < s.length() && Character.isHighSurrogate(s.charAt(end - 1))
                        && Character.isLowSurrogate(s.charAt(end))) {
                    continue; // inside a pair: not a character boundary
                }
                int bytes = s.substring(0, end).getBytes(StandardCharsets.UTF_8).length;
                assertEquals(bytes, Utf8Offsets.byteOffset(s, end), s + " @" + end);
                if (end < s.length()) {
                    assertEquals(end, Utf8Offsets.charOffset(s, bytes), s + " byte " + bytes);
                }
            }
            assertEquals(s.length(), Utf8Offsets.charOffset(s, s.getBytes(StandardCharsets.UTF_8).length));
        }
    }

    @Test
    void wholeCharactersIsTheLongestPrefixTheJdkDecodes() {
        Random r = new Random(11);
        int[] interesting = {0x00, 0x41, 0x7F, 0x80, 0x8F, 0x90, 0x9F, 0xA0, 0xBF, 0xC0, 0xC1, 0xC2, 0xDF, 0xE0,
                0xED, 0xEF, 0xF0, 0xF4, 0xF5, 0xFF};
        for (int round = 0; round < 20_000; round++) {
            byte[] b = new byte[r.nextInt(7)];
            for (int i = 0; i < b.length; i++) {
                b[i] = (byte) interesting[r.nextInt(interesting.length)];
            }
            int want = 0;
            for (int n = b.length; n > 0; n--) {
                if (TokenText.isValidUtf8(Arrays.copyOf(b, n))) {
                    want = n;
                    break;
                }
            }
            assertEquals(want, Utf8Offsets.wholeCharacters(b), TokenText.escape(b));
        }
    }
}
