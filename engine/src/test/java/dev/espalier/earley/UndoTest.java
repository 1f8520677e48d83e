package dev.espalier.earley;

import static dev.espalier.earley.Grammars.abnf;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Undo and fork against a fresh chart fed the same bytes (the slow, obviously correct twin). */
class UndoTest {

    private static final String JSONISH = String.join("\n",
            "value = object / array / string / number / %s\"true\" / %s\"false\" / %s\"null\"",
            "object = \"{\" ws [member *(ws \",\" ws member)] ws \"}\"",
            "member = string ws \":\" ws value",
            "array = \"[\" ws [value *(ws \",\" ws value)] ws \"]\"",
            "string = DQUOTE *(%x20-21 / %x23-5B / %x5D-10FFFF / \"\\\" DQUOTE) DQUOTE",
            "number = [\"-\"] 1*DIGIT [\".\" 1*DIGIT]",
            "ws = *(SP / LF)",
            "");

    private static void assertSameState(EarleyChart expected, EarleyChart actual, String where) {
        assertEquals(expected.length(), actual.length(), where);
        assertEquals(expected.accepts(), actual.accepts(), where);
        assertEquals(expected.canContinue(), actual.canContinue(), where);
        assertArrayEquals(expected.expectedByteSet(), actual.expectedByteSet(), where);
        assertEquals(expected.itemCount(), actual.itemCount(), where);
    }

    private static EarleyChart fresh(EarleyGrammar g, List<Integer> bytes) {
        EarleyChart c = g.newChart();
        for (int b : bytes) {
            assertTrue(c.feed(b));
        }
        return c;
    }

    @Test
    void randomFeedAndUndoMatchAFreshChart() {
        EarleyGrammar g = abnf(JSONISH);
        Random rnd = new Random(7);
        byte[] pool = "{}[],: \"\\-.0123456789tfnrueals\u00e9\n".getBytes(java.nio.charset.StandardCharsets.UTF_8);
        EarleyChart c = g.newChart();
        List<Integer> fed = new ArrayList<>();
        for (int step = 0; step < 3000; step++) {
            if (!fed.isEmpty() && rnd.nextInt(3) == 0) {
                int n = 1 + rnd.nextInt(Math.min(4, fed.size()));
                c.undo(n);
                for (int i = 0; i < n; i++) {
                    fed.remove(fed.size() - 1);
                }
            } else {
                int b = pool[rnd.nextInt(pool.length)] & 0xFF;
                boolean before = c.allows(b);
                long items = c.itemCount();
                boolean ok = c.feed(b);
                assertEquals(before, ok);
                if (ok) {
                    fed.add(b);
                } else {
                    assertEquals(items, c.itemCount(), "a refused byte leaves the chart unchanged");
                }
            }
            assertSameState(fresh(g, fed), c, "step " + step + " after " + fed);
        }
    }

    @Test
    void forkIsIndependent() {
        EarleyGrammar g = abnf(JSONISH);
        EarleyChart c = g.newChart();
        for (byte b : "{\"rootstock\": [1, ".getBytes(java.nio.charset.StandardCharsets.UTF_8)) {
            assertTrue(c.feed(b & 0xFF));
        }
        EarleyChart f = c.fork();
        for (byte b : "2]}".getBytes(java.nio.charset.StandardCharsets.UTF_8)) {
            assertTrue(f.feed(b & 0xFF));
        }
        assertTrue(f.accepts());
        assertEquals(18, c.length());
        assertTrue(c.feed('"'));
        c.undo(c.length());
        assertEquals(0, c.length());
        assertTrue(f.accepts());
        assertEquals(21, f.length());
        assertSameState(fresh(g, List.of()), c, "undone to the start");
    }

    @Test
    void undoRejectsBadCounts() {
        EarleyChart c = abnf("s = \"ab\"\n").newChart();
        assertTrue(c.feed('a'));
        assertThrows(IllegalArgumentException.class, () -> c.undo(2));
        assertThrows(IllegalArgumentException.class, () -> c.undo(-1));
        assertThrows(IllegalArgumentException.class, () -> c.feed(256));
    }
}
