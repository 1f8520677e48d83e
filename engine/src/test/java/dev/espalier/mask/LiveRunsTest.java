package dev.espalier.mask;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.regex.RegexSyntax;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link LiveRuns} against enumeration of every string it vouches for, alive or dead (small byte
 * sets, short lengths), and the runs it must find in string bodies and bounded counts.
 */
class LiveRunsTest {

    private static ByteDfa dfa(String pattern) {
        return ByteDfa.fromExpr(RegexSyntax.parse(pattern), null, 10_000);
    }

    private static long[] bits(String bytes) {
        long[] s = new long[2];
        for (char ch : bytes.toCharArray()) {
            s[ch >> 6] |= 1L << (ch & 63);
        }
        return s;
    }

    /** Whether every string of 1..length bytes over {@code set} leads from {@code state} to live states. */
    private static boolean allAlive(ByteDfa d, int state, int[] set, int length) {
        if (length == 0) {
            return true;
        }
        for (int b : set) {
            int next = d.step(state, b);
            if (next == ByteDfa.DEAD || !allAlive(d, next, set, length - 1)) {
                return false;
            }
        }
        return true;
    }

    /** Whether every string of exactly {@code length} bytes over {@code set} leads from {@code state} to the dead state. */
    private static boolean allDead(ByteDfa d, int state, int[] set, int length) {
        if (state == ByteDfa.DEAD) {
            return true;
        }
        if (length == 0) {
            return false;
        }
        for (int b : set) {
            if (!allDead(d, d.step(state, b), set, length - 1)) {
                return false;
            }
        }
        return true;
    }

    @Test
    void vouchesOnlyForRunsThatStayAliveOrDie() {
        Random rnd = new Random(7);
        int vouched = 0;
        int dying = 0;
        for (String pattern : List.of("[a-z ]{0,6}x", "\"([^\"\\\\]|\\\\.){2,9}\"", "(ab|c){0,4}x", "[0-9]{1,5}(\\.[0-9]{0,3})?",
                "[a-z.]{1,5}@[a-z]{1,4}\\.(com|org)", "(x|yz)*")) {
            ByteDfa d = dfa(pattern);
            LiveRuns runs = new LiveRuns(d, 8);
            for (int state = 0; state < d.stateCount(); state++) {
                for (int trial = 0; trial < 40; trial++) {
                    int size = 1 + rnd.nextInt(3);
                    int[] set = new int[size];
                    long low = 0;
                    long high = 0;
                    for (int i = 0; i < size; i++) {
                        set[i] = "abcxyz019. @\"\\".charAt(rnd.nextInt(14));
                        if (set[i] < 64) {
                            low |= 1L << set[i];
                        } else {
                            high |= 1L << (set[i] - 64);
                        }
                    }
                    int live = runs.liveLength(state, low, high);
                    int st = state;
                    if (live > 0) {
                        vouched++;
                        assertTrue(allAlive(d, state, set, Math.min(live, 7)),
                                () -> pattern + ": state " + st + " vouched for a run that dies");
                    }
                    if (live < 7 && runs.diesAfter(state, low, high, live)) {
                        dying++;
                        assertTrue(allDead(d, state, set, live + 1),
                                () -> pattern + ": state " + st + " said runs of " + (live + 1) + " die");
                    }
                }
            }
        }
        assertTrue(vouched > 100, "runs vouched for: " + vouched);
        assertTrue(dying > 50, "runs said to die: " + dying);
    }

    @Test
    void findsStringBodiesAndBoundedCounts() {
        ByteDfa body = dfa("\"[^\"\\\\]*\"");
        int inside = body.step(body.start(), '"');
        long[] letters = bits("abc xyz,.:");
        LiveRuns runs = new LiveRuns(body, 128);
        assertEquals(Integer.MAX_VALUE, runs.liveLength(inside, letters[0], letters[1]));
        long[] quote = bits("ab\"");
        assertEquals(0, runs.liveLength(inside, quote[0], quote[1]));

        ByteDfa bounded = dfa("[a-z]{0,5}!");
        LiveRuns counts = new LiveRuns(bounded, 16);
        long[] az = bits("abcdefghijklmnopqrstuvwxyz");
        assertEquals(5, counts.liveLength(bounded.start(), az[0], az[1]));
        assertTrue(counts.diesAfter(bounded.start(), az[0], az[1], 5));
        int two = bounded.step(bounded.step(bounded.start(), 'q'), 'r');
        assertEquals(3, counts.liveLength(two, az[0], az[1]));
        assertTrue(counts.diesAfter(two, az[0], az[1], 3));
        long[] bang = bits("ab!");
        assertEquals(0, counts.liveLength(two, bang[0], bang[1]));
        assertFalse(counts.diesAfter(two, bang[0], bang[1], 0));
    }
}
