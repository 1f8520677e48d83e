package dev.espalier.mask;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.regex.RegexSyntax;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link LiveRuns} against enumeration of every run it vouches for, alive or dead (small character
 * sets, short lengths, ASCII and multibyte characters; also runs that must never reach an accepting
 * state), and the runs it must find in string bodies and bounded counts.
 */
class LiveRunsTest {

    /**
     * Multibyte characters at the edges of the UTF-8 byte ranges (Unicode Standard, chapter 3, table
     * 3-7: U+0080, U+07FF, U+0800, U+0FFF, U+1000, U+D7FF, U+E000, U+FFFF, U+10000, U+3FFFF, U+40000,
     * U+10FFFF) and a few ordinary ones (é, €, the apple emoji).
     */
    private static final int[] MULTIBYTE = {0x80, 0x7FF, 0x800, 0xFFF, 0x1000, 0xD7FF, 0xE000, 0xFFFF, 0x10000,
        0x3FFFF, 0x40000, 0x10FFFF, 0xE9, 0x20AC, 0x1F34E};

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

    private static byte[] utf8(int codePoint) {
        return new String(Character.toChars(codePoint)).getBytes(StandardCharsets.UTF_8);
    }

    /** The state after {@code bytes}, {@link ByteDfa#DEAD} once dead (or, with {@code avoid}, once accepting). */
    private static int run(ByteDfa d, int state, byte[] bytes, int from, int to, boolean avoid) {
        for (int i = from; i < to && state != ByteDfa.DEAD; i++) {
            state = d.step(state, bytes[i] & 0xFF);
            if (avoid && state != ByteDfa.DEAD && d.accepts(state)) {
                return ByteDfa.DEAD;
            }
        }
        return state;
    }

    private static int run(ByteDfa d, int state, byte[] bytes, int from, int to) {
        return run(d, state, bytes, from, to, false);
    }

    /**
     * Whether every run of 1..length characters from {@code alphabet}, the last one possibly cut
     * short, leads from {@code state} to a state that is not dead (and, with {@code avoid}, passes
     * through no accepting state).
     */
    private static boolean allAlive(ByteDfa d, int state, List<byte[]> alphabet, int length, boolean avoid) {
        if (length == 0) {
            return true;
        }
        for (byte[] ch : alphabet) {
            for (int cut = 1; cut < ch.length; cut++) {
                if (run(d, state, ch, 0, cut, avoid) == ByteDfa.DEAD) {
                    return false;
                }
            }
            int next = run(d, state, ch, 0, ch.length, avoid);
            if (next == ByteDfa.DEAD || !allAlive(d, next, alphabet, length - 1, avoid)) {
                return false;
            }
        }
        return true;
    }

    /**
     * Whether every run of {@code length} characters from {@code alphabet} followed by the first byte
     * of one more leads from {@code state} to the dead state.
     */
    private static boolean allDie(ByteDfa d, int state, List<byte[]> alphabet, int length) {
        if (state == ByteDfa.DEAD) {
            return true;
        }
        for (byte[] ch : alphabet) {
            int next = length == 0 ? run(d, state, ch, 0, 1) : run(d, state, ch, 0, ch.length);
            if (!(length == 0 ? next == ByteDfa.DEAD : allDie(d, next, alphabet, length - 1))) {
                return false;
            }
        }
        return true;
    }

    @Test
    void vouchesOnlyForRunsThatStayAliveOrDie() {
        Random rnd = new Random(7);
        int vouched = 0;
        int vouchedMultibyte = 0;
        int dying = 0;
        int avoiding = 0;
        for (String pattern : List.of("[a-z ]{0,6}x", "\"([^\"\\\\]|\\\\.){2,9}\"", "(ab|c){0,4}x", "[0-9]{1,5}(\\.[0-9]{0,3})?",
                "[a-z.]{1,5}@[a-z]{1,4}\\.(com|org)", "(x|yz)*", "\"[^\"\\\\]{0,5}\"", "[^!-~]{1,4}!", "[a-zé€]{0,4}!",
                "(a|[^a-z]){0,3}")) {
            ByteDfa d = dfa(pattern);
            LiveRuns runs = new LiveRuns(d, 8);
            LiveRuns inside = new LiveRuns(d, 8, true);
            for (int state = 0; state < d.stateCount(); state++) {
                for (int trial = 0; trial < 40; trial++) {
                    int size = 1 + rnd.nextInt(3);
                    List<byte[]> alphabet = new ArrayList<>();
                    long low = 0;
                    long high = 0;
                    for (int i = 0; i < size; i++) {
                        int b = "abcxyz019. @\"\\!".charAt(rnd.nextInt(15));
                        alphabet.add(new byte[] {(byte) b});
                        if (b < 64) {
                            low |= 1L << b;
                        } else {
                            high |= 1L << (b - 64);
                        }
                    }
                    boolean multibyte = rnd.nextBoolean();
                    if (multibyte) {
                        for (int i = 0; i < 2; i++) {
                            alphabet.add(utf8(MULTIBYTE[rnd.nextInt(MULTIBYTE.length)]));
                        }
                    }
                    int live = runs.liveLength(state, low, high, multibyte);
                    int st = state;
                    if (live > 0) {
                        vouched++;
                        vouchedMultibyte += multibyte ? 1 : 0;
                        assertTrue(allAlive(d, state, alphabet, Math.min(live, 5), false),
                                () -> pattern + ": state " + st + " vouched for a run that dies");
                    }
                    int within = inside.liveLength(state, low, high, multibyte);
                    if (within > 0) {
                        avoiding++;
                        assertTrue(allAlive(d, state, alphabet, Math.min(within, 5), true),
                                () -> pattern + ": state " + st + " vouched for a run that dies or accepts");
                    }
                    if (within < 5 && inside.diesAfter(state, low, high, multibyte, within)) {
                        assertTrue(allDie(d, state, alphabet, within),
                                () -> pattern + ": state " + st + " said runs of " + within + " characters and a byte die");
                    }
                    if (live < 5 && runs.diesAfter(state, low, high, multibyte, live)) {
                        dying++;
                        assertTrue(allDie(d, state, alphabet, live),
                                () -> pattern + ": state " + st + " said runs of " + live + " characters and a byte die");
                    }
                }
            }
        }
        assertTrue(vouched > 100, "runs vouched for: " + vouched);
        assertTrue(vouchedMultibyte > 50, "runs with multibyte characters vouched for: " + vouchedMultibyte);
        assertTrue(dying > 50, "runs said to die: " + dying);
        assertTrue(avoiding > 50, "runs vouched for that never accept: " + avoiding);
    }

    @Test
    void findsStringBodiesAndBoundedCounts() {
        ByteDfa body = dfa("\"[^\"\\\\]*\"");
        int inside = body.step(body.start(), '"');
        long[] letters = bits("abc xyz,.:");
        LiveRuns runs = new LiveRuns(body, 128);
        assertEquals(Integer.MAX_VALUE, runs.liveLength(inside, letters[0], letters[1], false));
        assertEquals(Integer.MAX_VALUE, runs.liveLength(inside, letters[0], letters[1], true));
        long[] quote = bits("ab\"");
        assertEquals(0, runs.liveLength(inside, quote[0], quote[1], false));

        ByteDfa bounded = dfa("[a-z]{0,5}!");
        LiveRuns counts = new LiveRuns(bounded, 16);
        long[] az = bits("abcdefghijklmnopqrstuvwxyz");
        assertEquals(5, counts.liveLength(bounded.start(), az[0], az[1], false));
        assertEquals(0, counts.liveLength(bounded.start(), az[0], az[1], true));
        assertTrue(counts.diesAfter(bounded.start(), az[0], az[1], false, 5));
        int two = bounded.step(bounded.step(bounded.start(), 'q'), 'r');
        assertEquals(3, counts.liveLength(two, az[0], az[1], false));
        assertTrue(counts.diesAfter(two, az[0], az[1], false, 3));
        long[] bang = bits("ab!");
        assertEquals(0, counts.liveLength(two, bang[0], bang[1], false));
        assertFalse(counts.diesAfter(two, bang[0], bang[1], false, 0));

        // a bounded free text counts characters, whatever their length in bytes
        ByteDfa text = dfa("\"[^\"\\\\]{0,4}\"");
        LiveRuns chars = new LiveRuns(text, 16);
        int open = text.step(text.start(), '"');
        assertEquals(4, chars.liveLength(open, az[0], az[1], true));
        assertTrue(chars.diesAfter(open, az[0], az[1], true, 4));
    }
}
