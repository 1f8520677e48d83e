package dev.espalier.mask;

/** Static helpers for token masks: bitsets over token ids stored in {@code long[]} words. */
public final class TokenBits {

    private TokenBits() {
    }

    /** Number of words needed for {@code tokens} bits. */
    public static int words(int tokens) {
        return (tokens + 63) >>> 6;
    }

    /** Sets bit {@code id}. */
    public static void set(long[] mask, int id) {
        mask[id >>> 6] |= 1L << id;
    }

    /** Clears bit {@code id}. */
    public static void clear(long[] mask, int id) {
        mask[id >>> 6] &= ~(1L << id);
    }

    /** Whether bit {@code id} is set. */
    public static boolean get(long[] mask, int id) {
        return (mask[id >>> 6] & (1L << id)) != 0;
    }

    /** Number of set bits. */
    public static int count(long[] mask) {
        int n = 0;
        for (long w : mask) {
            n += Long.bitCount(w);
        }
        return n;
    }

    /** The set bits, ascending. */
    public static int[] ids(long[] mask) {
        int[] out = new int[count(mask)];
        int k = 0;
        for (int w = 0; w < mask.length; w++) {
            long word = mask[w];
            while (word != 0) {
                out[k++] = (w << 6) + Long.numberOfTrailingZeros(word);
                word &= word - 1;
            }
        }
        return out;
    }

    /** The lowest set bit at or above {@code from}, or -1. */
    public static int next(long[] mask, int from) {
        int w = from >>> 6;
        if (w >= mask.length) {
            return -1;
        }
        long word = mask[w] & (-1L << from);
        while (true) {
            if (word != 0) {
                return (w << 6) + Long.numberOfTrailingZeros(word);
            }
            if (++w == mask.length) {
                return -1;
            }
            word = mask[w];
        }
    }

    /** The {@code k}-th set bit (0-based), in ascending order. */
    public static int nth(long[] mask, int k) {
        for (int w = 0; w < mask.length; w++) {
            int c = Long.bitCount(mask[w]);
            if (k < c) {
                long word = mask[w];
                for (int i = 0; i < k; i++) {
                    word &= word - 1;
                }
                return (w << 6) + Long.numberOfTrailingZeros(word);
            }
            k -= c;
        }
        throw new IllegalArgumentException("the mask has fewer than " + (k + 1) + " set bits");
    }
}
