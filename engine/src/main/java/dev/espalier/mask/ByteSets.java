package dev.espalier.mask;

/** Readable descriptions of bytes and sets of bytes, for messages. */
public final class ByteSets {

    private ByteSets() {
    }

    /**
     * Describes the bytes that may follow and whether the text may end, e.g. {@code one of '0'-'9',
     * '-', or end of text}.
     *
     * @param bytes  byte values, ascending
     * @param canEnd whether the text may end here
     */
    public static String describe(int[] bytes, boolean canEnd) {
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

    /** A byte as a quoted printable character, {@code space}, or {@code 0xNN}. */
    public static String show(int b) {
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

    /** Describes a 256-bit byte set (bit {@code b & 63} of word {@code b >>> 6}), see {@link #describe(int[], boolean)}. */
    public static String describe(long[] set, boolean canEnd) {
        int[] bytes = new int[256];
        int n = 0;
        for (int b = 0; b < 256; b++) {
            if ((set[b >>> 6] & (1L << b)) != 0) {
                bytes[n++] = b;
            }
        }
        return describe(java.util.Arrays.copyOf(bytes, n), canEnd);
    }
}
