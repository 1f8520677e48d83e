package dev.espalier.vocab;

/**
 * The byte-to-character alphabet of byte-level BPE tokenizers (published with GPT-2): every byte is
 * written as one printable character so that token strings never hold spaces or control
 * characters. Bytes 0x21-0x7E, 0xA1-0xAC and 0xAE-0xFF stand for themselves; the remaining 68 bytes
 * map, in ascending byte order, to U+0100, U+0101, ... (so space 0x20 is {@code Ġ} U+0120 and
 * newline 0x0A is {@code Ċ} U+010A).
 */
final class ByteLevelAlphabet {

    /** Character of each byte. */
    private static final char[] CHAR_OF_BYTE = new char[256];
    /** Byte of each character up to {@link #LIMIT}, or -1. */
    private static final short[] BYTE_OF_CHAR;
    private static final int LIMIT = 0x100 + 68;

    static {
        BYTE_OF_CHAR = new short[LIMIT];
        java.util.Arrays.fill(BYTE_OF_CHAR, (short) -1);
        int next = 0x100;
        for (int b = 0; b < 256; b++) {
            boolean printable = (b >= 0x21 && b <= 0x7E) || (b >= 0xA1 && b <= 0xAC) || (b >= 0xAE && b <= 0xFF);
            char c = printable ? (char) b : (char) next++;
            CHAR_OF_BYTE[b] = c;
            BYTE_OF_CHAR[c] = (short) b;
        }
    }

    private ByteLevelAlphabet() {
    }

    /** The character that stands for byte {@code b} (0-255). */
    static char charOf(int b) {
        return CHAR_OF_BYTE[b];
    }

    /** The byte that character {@code c} stands for, or -1 when {@code c} is not in the alphabet. */
    static int byteOf(char c) {
        return c < LIMIT ? BYTE_OF_CHAR[c] : -1;
    }

    /**
     * Decodes a token string to bytes; returns {@code null} when a character is outside the
     * alphabet, with its index in {@code badIndex[0]}.
     */
    static byte[] decode(String token, int[] badIndex) {
        byte[] out = new byte[token.length()];
        for (int i = 0; i < out.length; i++) {
            int b = byteOf(token.charAt(i));
            if (b < 0) {
                badIndex[0] = i;
                return null;
            }
            out[i] = (byte) b;
        }
        return out;
    }
}
