package dev.espalier.automaton;

import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** UTF-8 encoding and range splitting, checked against the JDK's UTF-8 encoder (java.lang.String). */
class Utf8Test {

    @Test
    void encodingAgreesWithTheJdkForEveryScalarValue() {
        int[] buf = new int[4];
        for (int cp = 0; cp <= 0x10FFFF; cp++) {
            if (cp >= 0xD800 && cp <= 0xDFFF) {
                continue;
            }
            byte[] ref = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
            int n = Utf8.encode(cp, buf);
            assertEquals(ref.length, n, "length of U+" + Integer.toHexString(cp));
            for (int i = 0; i < n; i++) {
                if ((ref[i] & 0xFF) != buf[i]) {
                    throw new AssertionError("byte " + i + " of U+" + Integer.toHexString(cp));
                }
            }
        }
    }

    @Test
    void rangesMatchExactlyTheEncodingsOfTheirCodePoints() {
        Random rnd = new Random(7);
        int[][] fixed = {{0, 0x10FFFF}, {0x7F, 0x80}, {0x7FF, 0x800}, {0xD7FF, 0xE000}, {0xFFFF, 0x10000},
                {0x41, 0x5A}, {0x100, 0x10FF}, {0x10000, 0x10FFFF}, {0xD800, 0xDFFF}, {0x3FFFF, 0x40000}};
        for (int[] r : fixed) {
            check(r[0], r[1], rnd);
        }
        for (int t = 0; t < 300; t++) {
            int a = rnd.nextInt(0x110000);
            int b = rnd.nextInt(0x110000);
            check(Math.min(a, b), Math.max(a, b), rnd);
        }
    }

    private static void check(int lo, int hi, Random rnd) {
        List<Utf8.ByteRanges> ranges = Utf8.ranges(lo, hi);
        // members: random code points inside the range are covered by exactly one sequence
        for (int k = 0; k < 200; k++) {
            int cp = lo + rnd.nextInt(hi - lo + 1);
            if (cp >= 0xD800 && cp <= 0xDFFF) {
                continue;
            }
            byte[] enc = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
            assertEquals(1, ranges.stream().filter(r -> covers(r, enc)).count(), "U+" + Integer.toHexString(cp));
        }
        // non-members just outside, and the total count of encodings, equal the range's scalar count
        for (int cp : new int[] {lo - 1, hi + 1}) {
            if (cp >= 0 && cp <= 0x10FFFF && (cp < 0xD800 || cp > 0xDFFF)) {
                byte[] enc = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
                assertFalse(ranges.stream().anyMatch(r -> covers(r, enc)), "U+" + Integer.toHexString(cp));
            }
        }
        long total = 0;
        for (Utf8.ByteRanges r : ranges) {
            long n = 1;
            for (int i = 0; i < r.length(); i++) {
                assertTrue(r.lo()[i] <= r.hi()[i]);
                n *= r.hi()[i] - r.lo()[i] + 1;
            }
            total += n;
        }
        long surrogates = Math.max(0, Math.min(hi, 0xDFFF) - Math.max(lo, 0xD800) + 1);
        assertEquals(hi - lo + 1 - surrogates, total, "encodings of " + lo + ".." + hi);
    }

    private static boolean covers(Utf8.ByteRanges r, byte[] enc) {
        if (r.length() != enc.length) {
            return false;
        }
        for (int i = 0; i < enc.length; i++) {
            int b = enc[i] & 0xFF;
            if (b < r.lo()[i] || b > r.hi()[i]) {
                return false;
            }
        }
        return true;
    }
}
