package dev.espalier.automaton;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;

/**
 * UTF-8 helpers: encoding code points, and splitting a code-point range into byte-range sequences
 * that match exactly the UTF-8 encodings of the range (the method described by Russ Cox for RE2).
 */
public final class Utf8 {

    private Utf8() {
    }

    /** Number of bytes in the UTF-8 encoding of {@code cp}. */
    public static int length(int cp) {
        if (cp < 0x80) {
            return 1;
        } else if (cp < 0x800) {
            return 2;
        } else if (cp < 0x10000) {
            return 3;
        }
        return 4;
    }

    /** Writes the UTF-8 encoding of {@code cp} into {@code out} from index 0; returns its length. */
    public static int encode(int cp, int[] out) {
        if (cp < 0x80) {
            out[0] = cp;
            return 1;
        } else if (cp < 0x800) {
            out[0] = 0xC0 | (cp >> 6);
            out[1] = 0x80 | (cp & 0x3F);
            return 2;
        } else if (cp < 0x10000) {
            out[0] = 0xE0 | (cp >> 12);
            out[1] = 0x80 | ((cp >> 6) & 0x3F);
            out[2] = 0x80 | (cp & 0x3F);
            return 3;
        }
        out[0] = 0xF0 | (cp >> 18);
        out[1] = 0x80 | ((cp >> 12) & 0x3F);
        out[2] = 0x80 | ((cp >> 6) & 0x3F);
        out[3] = 0x80 | (cp & 0x3F);
        return 4;
    }

    /**
     * A sequence of byte ranges: byte {@code i} of a match lies in {@code lo[i]..hi[i]}.
     *
     * @param lo lower bounds, one per byte
     * @param hi upper bounds (inclusive), one per byte
     */
    public record ByteRanges(int[] lo, int[] hi) {
        /** Number of bytes. */
        public int length() {
            return lo.length;
        }
    }

    /**
     * Splits code points {@code lo..hi} into byte-range sequences whose union is exactly the set of
     * UTF-8 encodings of the range's scalar values (surrogates D800-DFFF are skipped: UTF-8 cannot
     * encode them).
     */
    public static List<ByteRanges> ranges(int lo, int hi) {
        List<ByteRanges> out = new ArrayList<>();
        Deque<int[]> work = new ArrayDeque<>();
        work.push(new int[] {lo, hi});
        while (!work.isEmpty()) {
            int[] r = work.pop();
            int a = r[0];
            int b = r[1];
            if (a > b) {
                continue;
            }
            // skip surrogates
            if (a <= 0xDFFF && b >= 0xD800) {
                work.push(new int[] {0xE000, b});
                work.push(new int[] {a, 0xD7FF});
                continue;
            }
            // split at encoded-length boundaries
            int[] limits = {0x7F, 0x7FF, 0xFFFF};
            boolean split = false;
            for (int m : limits) {
                if (a <= m && b > m) {
                    work.push(new int[] {m + 1, b});
                    work.push(new int[] {a, m});
                    split = true;
                    break;
                }
            }
            if (split) {
                continue;
            }
            int n = length(a);
            if (n == 1) {
                out.add(new ByteRanges(new int[] {a}, new int[] {b}));
                continue;
            }
            // split so that all but the differing leading bytes span full continuation ranges
            for (int i = 1; i < n; i++) {
                int m = (1 << (6 * i)) - 1;
                if ((a & ~m) != (b & ~m)) {
                    if ((a & m) != 0) {
                        work.push(new int[] {(a | m) + 1, b});
                        work.push(new int[] {a, a | m});
                        split = true;
                        break;
                    }
                    if ((b & m) != m) {
                        work.push(new int[] {b & ~m, b});
                        work.push(new int[] {a, (b & ~m) - 1});
                        split = true;
                        break;
                    }
                }
            }
            if (split) {
                continue;
            }
            int[] ea = new int[4];
            int[] eb = new int[4];
            encode(a, ea);
            encode(b, eb);
            int[] l = new int[n];
            int[] h = new int[n];
            for (int i = 0; i < n; i++) {
                l[i] = ea[i];
                h[i] = eb[i];
            }
            out.add(new ByteRanges(l, h));
        }
        return out;
    }
}
