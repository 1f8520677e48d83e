package dev.espalier.grammar;

import java.util.Arrays;

/**
 * An immutable set of Unicode code points ({@code 0..0x10FFFF}), kept as sorted, disjoint,
 * non-adjacent closed ranges. Surrogate code points may be members; they are dropped when a set is
 * compiled to UTF-8, since UTF-8 cannot encode them.
 */
public final class CodePointSet {

    /** The largest Unicode code point. */
    public static final int MAX = 0x10FFFF;

    /** The empty set. */
    public static final CodePointSet EMPTY = new CodePointSet(new int[0]);

    /** Every code point. */
    public static final CodePointSet ALL = new CodePointSet(new int[] {0, MAX});

    /** lo0, hi0, lo1, hi1, ...: sorted, disjoint, non-adjacent. */
    private final int[] bounds;

    private CodePointSet(int[] bounds) {
        this.bounds = bounds;
    }

    /** The set holding one code point. */
    public static CodePointSet of(int codePoint) {
        return range(codePoint, codePoint);
    }

    /** The set of code points {@code lo..hi} inclusive; empty when {@code lo > hi}. */
    public static CodePointSet range(int lo, int hi) {
        if (lo < 0 || hi > MAX) {
            throw new IllegalArgumentException("code point range out of bounds: " + lo + ".." + hi);
        }
        return lo > hi ? EMPTY : new CodePointSet(new int[] {lo, hi});
    }

    /** Builds a set from any number of (lo, hi) pairs, in any order, overlapping or not. */
    public static CodePointSet ofRanges(int... pairs) {
        if (pairs.length % 2 != 0) {
            throw new IllegalArgumentException("ranges come in (lo, hi) pairs");
        }
        int n = pairs.length / 2;
        long[] packed = new long[n];
        int k = 0;
        for (int i = 0; i < n; i++) {
            int lo = pairs[2 * i];
            int hi = pairs[2 * i + 1];
            if (lo < 0 || hi > MAX) {
                throw new IllegalArgumentException("code point range out of bounds: " + lo + ".." + hi);
            }
            if (lo <= hi) {
                packed[k++] = ((long) lo << 32) | hi;
            }
        }
        Arrays.sort(packed, 0, k);
        int[] out = new int[2 * k];
        int m = 0;
        for (int i = 0; i < k; i++) {
            int lo = (int) (packed[i] >>> 32);
            int hi = (int) packed[i];
            if (m > 0 && lo <= out[m - 1] + 1) {
                out[m - 1] = Math.max(out[m - 1], hi);
            } else {
                out[m++] = lo;
                out[m++] = hi;
            }
        }
        return new CodePointSet(Arrays.copyOf(out, m));
    }

    /** Number of ranges. */
    public int rangeCount() {
        return bounds.length / 2;
    }

    /** Lower bound of range {@code i}. */
    public int lo(int i) {
        return bounds[2 * i];
    }

    /** Upper bound (inclusive) of range {@code i}. */
    public int hi(int i) {
        return bounds[2 * i + 1];
    }

    /** Whether the set has no member. */
    public boolean isEmpty() {
        return bounds.length == 0;
    }

    /** Number of member code points. */
    public long size() {
        long s = 0;
        for (int i = 0; i < bounds.length; i += 2) {
            s += bounds[i + 1] - bounds[i] + 1L;
        }
        return s;
    }

    /** Whether {@code cp} is a member. */
    public boolean contains(int cp) {
        int lo = 0;
        int hi = rangeCount() - 1;
        while (lo <= hi) {
            int mid = (lo + hi) >>> 1;
            if (cp < bounds[2 * mid]) {
                hi = mid - 1;
            } else if (cp > bounds[2 * mid + 1]) {
                lo = mid + 1;
            } else {
                return true;
            }
        }
        return false;
    }

    /** Set union. */
    public CodePointSet union(CodePointSet other) {
        int[] all = Arrays.copyOf(bounds, bounds.length + other.bounds.length);
        System.arraycopy(other.bounds, 0, all, bounds.length, other.bounds.length);
        return ofRanges(all);
    }

    /** Every code point not in this set. */
    public CodePointSet complement() {
        int[] out = new int[bounds.length + 2];
        int m = 0;
        int next = 0;
        for (int i = 0; i < bounds.length; i += 2) {
            if (bounds[i] > next) {
                out[m++] = next;
                out[m++] = bounds[i] - 1;
            }
            next = bounds[i + 1] + 1;
        }
        if (next <= MAX) {
            out[m++] = next;
            out[m++] = MAX;
        }
        return new CodePointSet(Arrays.copyOf(out, m));
    }

    /** Set intersection. */
    public CodePointSet intersect(CodePointSet other) {
        // one merge of the two sorted range lists; pieces from canonical sets are never adjacent
        int[] a = bounds;
        int[] b = other.bounds;
        int[] out = new int[a.length + b.length];
        int m = 0;
        int i = 0;
        int j = 0;
        while (i < a.length && j < b.length) {
            int lo = Math.max(a[i], b[j]);
            int hi = Math.min(a[i + 1], b[j + 1]);
            if (lo <= hi) {
                out[m++] = lo;
                out[m++] = hi;
            }
            if (a[i + 1] < b[j + 1]) {
                i += 2;
            } else {
                j += 2;
            }
        }
        return new CodePointSet(Arrays.copyOf(out, m));
    }

    /** Members of this set that are not in {@code other}. */
    public CodePointSet minus(CodePointSet other) {
        return intersect(other.complement());
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof CodePointSet c && Arrays.equals(bounds, c.bounds);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(bounds);
    }

    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder("[");
        for (int i = 0; i < bounds.length; i += 2) {
            if (i > 0) {
                sb.append(' ');
            }
            sb.append(String.format("%X", bounds[i]));
            if (bounds[i + 1] != bounds[i]) {
                sb.append('-').append(String.format("%X", bounds[i + 1]));
            }
        }
        return sb.append(']').toString();
    }
}
