package dev.espalier.vocab;

import java.util.Arrays;

/**
 * A growing table from token id to bytes, used while reading a vocabulary file. Remembers where
 * each id was defined so that a contradiction can name both places.
 */
final class TokenTable {

    /**
     * The largest id space a vocabulary file may declare. Real vocabularies stay below a million
     * ids; the bound keeps a stray huge id from allocating gigabytes.
     */
    static final int MAX_IDS = 1 << 24;

    private byte[][] bytes = new byte[1024][];
    private String[] origin = new String[1024];
    private int size;

    /** Outcome of {@link #put}: the id was free, already held the same bytes, or held others. */
    enum Put { NEW, SAME, CONFLICT }

    /** Stores {@code b} under {@code id}, remembering {@code where} it came from. */
    Put put(int id, byte[] b, String where) {
        if (id >= bytes.length) {
            int cap = Math.max(id + 1, bytes.length * 2);
            bytes = Arrays.copyOf(bytes, cap);
            origin = Arrays.copyOf(origin, cap);
        }
        byte[] old = bytes[id];
        if (old != null) {
            return Arrays.equals(old, b) ? Put.SAME : Put.CONFLICT;
        }
        bytes[id] = b;
        origin[id] = where;
        size = Math.max(size, id + 1);
        return Put.NEW;
    }

    /** Replaces whatever {@code id} held. */
    void replace(int id, byte[] b, String where) {
        if (put(id, b, where) == Put.CONFLICT) {
            bytes[id] = b;
            origin[id] = where;
        }
    }

    /** Where {@code id} was defined, or {@code null}. */
    String origin(int id) {
        return id < origin.length ? origin[id] : null;
    }

    /** The bytes of {@code id}, or {@code null}. */
    byte[] get(int id) {
        return id < bytes.length ? bytes[id] : null;
    }

    /** Largest id + 1. */
    int size() {
        return size;
    }

    /** The table trimmed to its id space. */
    byte[][] toArray() {
        return Arrays.copyOf(bytes, size);
    }

    /** A short, escaped rendering of a piece of input for messages. */
    static String snippet(String s) {
        String t = s.length() > 40 ? s.substring(0, 40) + "..." : s;
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < t.length(); i++) {
            char c = t.charAt(i);
            if (c < 0x20 || c == 0x7F) {
                sb.append(String.format("\\x%02X", (int) c));
            } else {
                sb.append(c);
            }
        }
        return sb.toString();
    }
}
