package dev.espalier.earley;

import static dev.espalier.earley.Grammars.abnf;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Leo's (1991) right-recursion optimisation: with it, right-recursive rules take a bounded number
 * of items per byte; without it, Earley's method keeps one item per open level (quadratic in all).
 * Counted items, never time.
 */
class RightRecursionTest {

    private static long itemsAfter(EarleyGrammar g, int n, boolean leo) {
        EarleyChart c = g.newChart(EarleyGrammar.DEFAULT_MAX_ITEMS, leo);
        for (int i = 0; i < n; i++) {
            assertTrue(c.feed('a'));
        }
        assertTrue(c.accepts());
        return c.itemCount();
    }

    @Test
    void rightRecursionIsLinearWithLeo() {
        EarleyGrammar g = abnf("L = \"a\" L / \"a\"\n");
        long at1000 = itemsAfter(g, 1000, true);
        long at2000 = itemsAfter(g, 2000, true);
        assertTrue(at2000 < 10L * 2000, "items at n=2000: " + at2000);
        // linear: doubling the input adds about as many items again (up to a constant)
        assertTrue(Math.abs(at2000 - 2 * at1000) < 50, at1000 + " vs " + at2000);
    }

    @Test
    void rightRecursionIsQuadraticWithoutLeo() {
        EarleyGrammar g = abnf("L = \"a\" L / \"a\"\n");
        long at1000 = itemsAfter(g, 1000, false);
        long at2000 = itemsAfter(g, 2000, false);
        // every set n holds the completed L items of all n open levels: n^2/2 in all
        assertTrue(at2000 > 2000L * 2000 / 2, "items at n=2000: " + at2000);
        assertTrue(at2000 > 3 * at1000, at1000 + " vs " + at2000);
    }

    @Test
    void leoAndPlainChartsAgreeOnEveryVerdict() {
        // a right-recursive list with nested right recursion and a nullable tail
        EarleyGrammar g = abnf("s = item [\",\" s]\nitem = \"a\" item / \"b\" / \"(\" s \")\"\n");
        EarleyChart fast = g.newChart(1_000_000, true);
        EarleyChart plain = g.newChart(1_000_000, false);
        String input = "aab,(ab,b,(aaab)),aaaab,b";
        for (char ch : input.toCharArray()) {
            for (int b : new int[] {'a', 'b', ',', '(', ')'}) {
                assertEquals(plain.allows(b), fast.allows(b), "after " + fast.length() + " bytes, byte " + (char) b);
            }
            assertTrue(fast.feed(ch));
            assertTrue(plain.feed(ch));
            assertEquals(plain.accepts(), fast.accepts());
        }
        assertTrue(fast.accepts());
        assertTrue(fast.itemCount() < plain.itemCount());
    }

    @Test
    void repetitionsAreLinearToo() {
        // unbounded repetitions are left-recursive lists, bounded ones nested options
        EarleyGrammar g = abnf("s = *\"a\" 0*3000\"b\"\n");
        EarleyChart c = g.newChart();
        for (int i = 0; i < 2000; i++) {
            assertTrue(c.feed('a'));
        }
        for (int i = 0; i < 2000; i++) {
            assertTrue(c.feed('b'));
        }
        assertTrue(c.accepts());
        assertTrue(c.itemCount() < 20L * 4000, "items: " + c.itemCount());
    }
}
