package dev.espalier.automaton;

import java.util.Arrays;

/**
 * A map from long keys to non-negative ints by open addressing, keys and values inline: the NFA
 * builder looks up packed pairs (rule and continuation node, next node and byte range) once per
 * piece it wires, and boxed keys cost a pointer chase per probe.
 */
final class LongIntTable {

    /** Returned by {@link #get} for a missing key. */
    static final int MISSING = -1;

    private long[] keys = new long[256];
    private int[] values = new int[256];
    private int size;

    LongIntTable() {
        Arrays.fill(values, MISSING);
    }

    private static int slot(long key, int mask) {
        long h = key * 0x9E3779B97F4A7C15L;
        return (int) (h ^ (h >>> 32)) & mask;
    }

    /** The value of {@code key}, or {@link #MISSING}. */
    int get(long key) {
        int mask = keys.length - 1;
        for (int i = slot(key, mask); ; i = (i + 1) & mask) {
            if (values[i] == MISSING) {
                return MISSING;
            }
            if (keys[i] == key) {
                return values[i];
            }
        }
    }

    /** Sets the value of {@code key} to {@code value}, which must not be negative. */
    void put(long key, int value) {
        if (value < 0) {
            throw new IllegalArgumentException("values are non-negative");
        }
        if (2 * (size + 1) > keys.length) {
            long[] oldKeys = keys;
            int[] oldValues = values;
            keys = new long[oldKeys.length * 2];
            values = new int[oldKeys.length * 2];
            Arrays.fill(values, MISSING);
            size = 0;
            for (int i = 0; i < oldKeys.length; i++) {
                if (oldValues[i] != MISSING) {
                    put(oldKeys[i], oldValues[i]);
                }
            }
        }
        int mask = keys.length - 1;
        for (int i = slot(key, mask); ; i = (i + 1) & mask) {
            if (values[i] == MISSING) {
                keys[i] = key;
                values[i] = value;
                size++;
                return;
            }
            if (keys[i] == key) {
                values[i] = value;
                return;
            }
        }
    }

    /** Number of keys. */
    int size() {
        return size;
    }
}
