package dev.espalier.vocab;

import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;

/** Readable renderings of token bytes. */
public final class TokenText {

    private TokenText() {
    }

    /**
     * Renders bytes with visible escapes: printable ASCII as is (backslash doubled), space as
     * {@code ␣}, {@code \n \r \t}, other control bytes and bytes that are not part of a complete
     * UTF-8 character as {@code \xNN}; complete non-ASCII characters as themselves.
     */
    public static String escape(byte[] bytes) {
        StringBuilder sb = new StringBuilder();
        int i = 0;
        while (i < bytes.length) {
            int b = bytes[i] & 0xFF;
            int len = utf8Length(b);
            if (len > 1 && i + len <= bytes.length && validUtf8(bytes, i, len)) {
                sb.append(new String(bytes, i, len, StandardCharsets.UTF_8));
                i += len;
                continue;
            }
            switch (b) {
                case ' ' -> sb.append('␣');
                case '\n' -> sb.append("\\n");
                case '\r' -> sb.append("\\r");
                case '\t' -> sb.append("\\t");
                case '\\' -> sb.append("\\\\");
                default -> {
                    if (b >= 0x21 && b < 0x7F) {
                        sb.append((char) b);
                    } else {
                        sb.append(String.format("\\x%02X", b));
                    }
                }
            }
            i++;
        }
        return sb.toString();
    }

    /** Renders bytes as a JSON string literal (invalid UTF-8 bytes become U+FFFD). */
    public static String jsonLiteral(byte[] bytes) {
        String s = new String(bytes, StandardCharsets.UTF_8);
        StringBuilder sb = new StringBuilder("\"");
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> sb.append("\\\"");
                case '\\' -> sb.append("\\\\");
                case '\n' -> sb.append("\\n");
                case '\r' -> sb.append("\\r");
                case '\t' -> sb.append("\\t");
                case '\b' -> sb.append("\\b");
                case '\f' -> sb.append("\\f");
                default -> {
                    if (c < 0x20 || c == 0x7F || c == 0x2028 || c == 0x2029) {
                        sb.append(String.format("\\u%04x", (int) c));
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        return sb.append('"').toString();
    }

    /** Whether the bytes are well-formed UTF-8 (complete characters only). */
    public static boolean isValidUtf8(byte[] bytes) {
        CharsetDecoder d = StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try {
            d.decode(ByteBuffer.wrap(bytes));
            return true;
        } catch (CharacterCodingException e) {
            return false;
        }
    }

    private static int utf8Length(int lead) {
        if (lead < 0x80) {
            return 1;
        } else if (lead >= 0xC2 && lead <= 0xDF) {
            return 2;
        } else if (lead >= 0xE0 && lead <= 0xEF) {
            return 3;
        } else if (lead >= 0xF0 && lead <= 0xF4) {
            return 4;
        }
        return 1;
    }

    private static boolean validUtf8(byte[] b, int from, int len) {
        byte[] part = new byte[len];
        System.arraycopy(b, from, part, 0, len);
        return isValidUtf8(part);
    }
}
