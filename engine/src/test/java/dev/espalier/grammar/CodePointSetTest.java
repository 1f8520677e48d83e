package dev.espalier.grammar;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.BitSet;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The set operations against their slow twin, {@link BitSet} over all code points: random sets of
 * ranges, crowded near 0, the surrogates and {@link CodePointSet#MAX}, where the boundary cases are.
 */
class CodePointSetTest {

    private static final int[] HOT = {0, 1, 0x7F, 0x80, 0xD7FF, 0xD800, 0xDFFF, 0xE000, 0xFFFF, 0x10000,
        CodePointSet.MAX - 1, CodePointSet.MAX};

    private static int point(Random rnd) {
        return switch (rnd.nextInt(3)) {
            case 0 -> HOT[rnd.nextInt(HOT.length)];
            case 1 -> rnd.nextInt(300);
            default -> rnd.nextInt(CodePointSet.MAX + 1);
        };
    }

    private static CodePointSet random(Random rnd) {
        int n = rnd.nextInt(6);
        int[] pairs = new int[2 * n];
        for (int i = 0; i < n; i++) {
            int a = point(rnd);
            int b = rnd.nextInt(4) == 0 ? a : point(rnd);
            pairs[2 * i] = Math.min(a, b);
            pairs[2 * i + 1] = Math.max(a, b);
        }
        return CodePointSet.ofRanges(pairs);
    }

    private static BitSet bits(CodePointSet s) {
        BitSet b = new BitSet(CodePointSet.MAX + 1);
        for (int i = 0; i < s.rangeCount(); i++) {
            b.set(s.lo(i), s.hi(i) + 1);
        }
        return b;
    }

    /** The canonical form: sorted, disjoint, non-adjacent ranges; then the members. */
    private static void same(BitSet expected, CodePointSet actual, String what) {
        for (int i = 0; i < actual.rangeCount(); i++) {
            assertEquals(true, actual.lo(i) <= actual.hi(i), what + ": range " + i);
            if (i > 0) {
                assertEquals(true, actual.lo(i) > actual.hi(i - 1) + 1, what + ": ranges " + (i - 1) + ", " + i);
            }
        }
        assertEquals(expected, bits(actual), what);
        assertEquals(expected.cardinality(), actual.size(), what + ": size");
    }

    @Test
    void operationsAgreeWithBitSets() {
        Random rnd = new Random(23);
        for (int trial = 0; trial < 400; trial++) {
            CodePointSet a = random(rnd);
            CodePointSet b = random(rnd);
            BitSet ba = bits(a);
            BitSet bb = bits(b);
            BitSet union = (BitSet) ba.clone();
            union.or(bb);
            BitSet inter = (BitSet) ba.clone();
            inter.and(bb);
            BitSet minus = (BitSet) ba.clone();
            minus.andNot(bb);
            BitSet comp = (BitSet) ba.clone();
            comp.flip(0, CodePointSet.MAX + 1);
            String where = "trial " + trial + ": " + a + " and " + b;
            same(union, a.union(b), where + ", union");
            same(inter, a.intersect(b), where + ", intersection");
            same(minus, a.minus(b), where + ", difference");
            same(comp, a.complement(), where + ", complement");
        }
    }
}
