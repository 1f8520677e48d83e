package dev.espalier.lsp.samples;

/**
 * Between character offsets of a Java string (UTF-16 code units, which is what LSP positions
 * count) and byte offsets of its UTF-8 encoding as {@link String#getBytes} produces it (a lone
 * surrogate encodes as the one byte {@code ?}).
 */
final class Utf8Offsets {

    private Utf8Offsets() {
    }

    /** The number of UTF-8 bytes of {@code text[0, end)}. */
    static int byteOffset(String text, int end) {
        int bytes = 0;
        int i = 0;
        while (i < end) {
            char c = text.charAt(i);
            int width = width(text, i);
            bytes += encodedLength(c, width);
            i += width;
        }
        return bytes;
    }

    /**
     * The character offset of the character holding byte {@code byteOffset} of the UTF-8
     * encoding, or the text's length when the offset is at or past the end.
     */
    static int charOffset(String text, int byteOffset) {
        int bytes = 0;
        int i = 0;
        while (i < text.length()) {
            int width = width(text, i);
            int len = encodedLength(text.charAt(i), width);
            if (byteOffset < bytes + len) {
                return i;
            }
            bytes += len;
            i += width;
        }
        return text.length();
    }

    /** The number of chars of the character starting at {@code i}: 2 for a surrogate pair, else 1. */
    static int width(String text, int i) {
        char c = text.charAt(i);
        return Character.isHighSurrogate(c) && i + 1 < text.length() && Character.isLowSurrogate(text.charAt(i + 1))
                ? 2 : 1;
    }

    private static int encodedLength(char c, int width) {
        if (width == 2) {
            return 4;
        }
        if (c < 0x80 || Character.isSurrogate(c)) {
            return 1;
        }
        return c < 0x800 ? 2 : 3;
    }

    /**
     * The length of the longest leading part of {@code bytes} that is whole, well-formed UTF-8
     * characters (RFC 3629: no overlong forms, no surrogates, nothing above U+10FFFF).
     */
    static int wholeCharacters(byte[] bytes) {
        int i = 0;
        while (i < bytes.length) {
            int b = bytes[i] & 0xFF;
            int len;
            int lo = 0x80;
            int hi = 0xBF;
            if (b < 0x80) {
                len = 1;
            } else if (b >= 0xC2 && b <= 0xDF) {
                len = 2;
            } else if (b >= 0xE0 && b <= 0xEF) {
                len = 3;
                lo = b == 0xE0 ? 0xA0 : 0x80;
                hi = b == 0xED ? 0x9F : 0xBF;
            } else if (b >= 0xF0 && b <= 0xF4) {
                len = 4;
                lo = b == 0xF0 ? 0x90 : 0x80;
                hi = b == 0xF4 ? 0x8F : 0xBF;
            } else {
                return i;
            }
            if (i + len > bytes.length) {
                return i;
            }
            for (int k = 1; k < len; k++) {
                int c = bytes[i + k] & 0xFF;
                if (c < (k == 1 ? lo : 0x80) || c > (k == 1 ? hi : 0xBF)) {
                    return i;
                }
            }
            i += len;
        }
        return i;
    }
}
