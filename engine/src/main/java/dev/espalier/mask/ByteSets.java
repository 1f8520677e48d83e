package dev.espalier.mask;

/** Readable descriptions of sets of bytes, for messages. */
final class ByteSets {

    private ByteSets() {
    }

    /** E.g. {@code one of '0'-'9', '-', or end of text}. */
    static String describe(int[] bytes, boolean canEnd) {
        StringBuilder sb = new StringBuilder();
        int parts = 0;
        int i = 0;
        while (i < bytes.length) {
            int j = i;
            while (j + 1 < bytes.length && bytes[j + 1] == bytes[j] + 1) {
                j++;
            }
            if (parts++ > 0) {
                sb.append(", ");
            }
            sb.append(show(bytes[i]));
            if (j > i) {
                sb.append('-').append(show(bytes[j]));
            }
            i = j + 1;
        }
        if (parts == 0) {
            return canEnd ? "end of text" : "nothing";
        }
        String body = (parts == 1 && bytes.length == 1 ? "" : "one of ") + sb;
        return canEnd ? body + ", or end of text" : body;
    }

    /** A byte as a quoted printable character or {@code 0xNN}. */
    static String show(int b) {
        if (b >= 0x21 && b < 0x7F && b != '\'') {
            return "'" + (char) b + "'";
        }
        return switch (b) {
            case ' ' -> "space";
            case '\'' -> "\"'\"";
            case '\n' -> "'\\n'";
            case '\r' -> "'\\r'";
            case '\t' -> "'\\t'";
            default -> String.format("0x%02X", b);
        };
    }
}
