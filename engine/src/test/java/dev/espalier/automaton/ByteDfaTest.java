package dev.espalier.automaton;

import dev.espalier.regex.RegexSyntax;
import dk.brics.automaton.Automaton;
import java.util.List;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The byte DFA accepts exactly the UTF-8 encodings of the strings its character automaton accepts.
 * Reference: dk.brics automaton's own {@code run(String)} over Java strings, and the JDK's UTF-8
 * encoder.
 */
class ByteDfaTest {

    private static final Random RND = new Random(11);

    private static Automaton range(int lo, int hi) {
        return Automaton.makeCharRange((char) lo, (char) hi);
    }

    /** Any supplementary code point, as surrogate pairs. */
    private static Automaton supplementary() {
        return range(0xD800, 0xDBFF).concatenate(range(0xDC00, 0xDFFF));
    }

    @Test
    void agreesWithTheCharacterAutomatonOnRandomStrings() {
        Automaton[] cases = {
            Automaton.makeString("apple").union(Automaton.makeString("apricot")),
            range('a', 'z').repeat(1, 5).concatenate(Automaton.makeChar('-')).concatenate(range('0', '9').repeat(2)),
            range(0x80, 0x7FF).union(range(0x800, 0xFFFF)).repeat(),
            supplementary().union(range('x', 'x')).repeat(0, 3),
            // one high surrogate with part of the low range: U+1F600..U+1F64F (emoticons)
            Automaton.makeChar((char) 0xD83D).concatenate(range(0xDE00, 0xDE4F)).repeat(1),
            range(0, 0xFFFF).repeat(0, 2),
        };
        String alphabet = "apricotlez-09é€\uD83D\uDE00\uD83C\uDF4Ex\u07FF\u0800\uFFFD";
        for (Automaton a : cases) {
            ByteDfa dfa = ByteDfa.fromCharAutomaton(a, 10_000);
            for (int t = 0; t < 3000; t++) {
                String s = randomString(alphabet, a);
                boolean expected = a.run(s) && !hasLoneSurrogate(s);
                assertEquals(expected, dfa.matches(s.getBytes(StandardCharsets.UTF_8)), () -> "string " + s);
            }
        }
    }

    private static String randomString(String alphabet, Automaton a) {
        if (RND.nextInt(3) == 0) {
            String ex = a.getShortestExample(true);
            if (ex != null) {
                return ex;
            }
        }
        int[] cps = alphabet.codePoints().toArray();
        StringBuilder sb = new StringBuilder();
        int n = RND.nextInt(8);
        for (int i = 0; i < n; i++) {
            sb.appendCodePoint(cps[RND.nextInt(cps.length)]);
        }
        return sb.toString();
    }

    private static boolean hasLoneSurrogate(String s) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (Character.isHighSurrogate(c)) {
                if (i + 1 >= s.length() || !Character.isLowSurrogate(s.charAt(i + 1))) {
                    return true;
                }
                i++;
            } else if (Character.isLowSurrogate(c)) {
                return true;
            }
        }
        return false;
    }

    @Test
    void rejectsMalformedUtf8() {
        ByteDfa any = ByteDfa.fromCharAutomaton(range(0, 0xFFFF).union(supplementary()).repeat(), 10_000);
        assertTrue(any.matches("héllo \uD83C\uDF4F".getBytes(StandardCharsets.UTF_8)));
        // overlong encoding of '/', a lone continuation byte, an encoded surrogate, a truncated sequence
        // (well-formedness per RFC 3629 §4 / Unicode Table 3-7)
        assertFalse(any.matches(new byte[] {(byte) 0xC0, (byte) 0xAF}));
        assertFalse(any.matches(new byte[] {(byte) 0x80}));
        assertFalse(any.matches(new byte[] {(byte) 0xED, (byte) 0xA0, (byte) 0x80}));
        assertFalse(any.matches(new byte[] {(byte) 0xE2, (byte) 0x82}));
        assertFalse(any.matches(new byte[] {(byte) 0xF4, (byte) 0x90, (byte) 0x80, (byte) 0x80}));
    }

    @Test
    void isMinimalAndTrimmed() {
        // (a|b)*c has 2 states in a minimal DFA; every state must be able to reach acceptance
        Automaton a = range('a', 'b').repeat().concatenate(Automaton.makeChar('c'));
        ByteDfa dfa = ByteDfa.fromCharAutomaton(a, 100);
        assertEquals(2, dfa.stateCount());
        assertEquals(ByteDfa.DEAD, dfa.step(dfa.start(), 'd'));
        assertEquals(-1, dfa.forcedByte(dfa.start()), "a, b and c may follow");
    }

    @Test
    void forcedBytesFollowTheOnlyWayOn() {
        ByteDfa dfa = ByteDfa.fromCharAutomaton(Automaton.makeString("{\"variety\":"), 100);
        int s = dfa.start();
        StringBuilder sb = new StringBuilder();
        while (!dfa.accepts(s)) {
            int b = dfa.forcedByte(s);
            sb.append((char) b);
            s = dfa.step(s, b);
        }
        assertEquals("{\"variety\":", sb.toString());
    }

    @Test
    void forcedBytesAndContinuationsAgreeWithEveryByte() {
        int states = 0;
        int forced = 0;
        for (String pattern : List.of("\\{\"variety\":\"[A-Z][a-z]{0,8}\"\\}", "[é€]x|y[^a-z]{2}", "(ab|c){0,5}d?",
                "T-[0-9]{4}", "[\\u0080-\\u00FF]z", "x[\uD83C\uDF4E\uD83C\uDF50]")) {
            ByteDfa dfa = ByteDfa.fromExpr(RegexSyntax.parse(pattern), null, 10_000);
            for (int s = 0; s < dfa.stateCount(); s++) {
                int only = -1;
                int live = 0;
                for (int b = 0; b < 256; b++) {
                    if (dfa.step(s, b) != ByteDfa.DEAD) {
                        live++;
                        only = b;
                    }
                }
                String where = pattern + ", state " + s;
                assertEquals(live == 1 ? only : -1, dfa.forcedByte(s), where);
                assertEquals(live > 0, dfa.canContinue(s), where);
                forced += live == 1 ? 1 : 0;
                states++;
            }
        }
        assertTrue(forced > 10 && forced < states, "states with one byte forced: " + forced + " of " + states);
    }

    @Test
    void emptyLanguageHasNoStart() {
        ByteDfa dfa = ByteDfa.fromCharAutomaton(Automaton.makeEmpty(), 100);
        assertTrue(dfa.isEmpty());
        // lone surrogates only: no UTF-8 encoding, so empty too
        assertTrue(ByteDfa.fromCharAutomaton(range(0xDC00, 0xDFFF), 100).isEmpty());
    }

    @Test
    void stateLimitStopsSubsetConstruction() {
        // (a|b)*a(a|b){20}: the minimal DFA needs 2^21 states (a classic blow-up; common practice)
        Automaton ab = range('a', 'b');
        Automaton a = ab.repeat().concatenate(Automaton.makeChar('a')).concatenate(ab.repeat(20, 20));
        AutomatonTooLargeException e = assertThrows(AutomatonTooLargeException.class,
                () -> ByteDfa.fromCharAutomaton(a, 5_000));
        assertEquals(5_000, e.limit());
    }

    @Test
    void viableClassesGroupExactlyTheStatesThatAgreeUpToTheDepth() {
        // [ab]{0,12}c? : a counter; states far from the bound look alike for short strings
        Automaton a = range('a', 'b').repeat(0, 12).concatenate(Automaton.makeChar('c').optional());
        ByteDfa dfa = ByteDfa.fromCharAutomaton(a, 1000);
        int depth = 3;
        int[] block = dfa.viableClasses(depth);
        for (int s = 0; s < dfa.stateCount(); s++) {
            for (int t = 0; t < dfa.stateCount(); t++) {
                boolean same = viableSignature(dfa, s, depth).equals(viableSignature(dfa, t, depth));
                assertEquals(same, block[s] == block[t], "states " + s + " and " + t);
            }
        }
        assertTrue(java.util.Arrays.stream(block).distinct().count() < dfa.stateCount());
    }

    /** Brute force: which strings over a, b, c, d of length 1..depth keep the state alive. */
    private static String viableSignature(ByteDfa dfa, int state, int depth) {
        StringBuilder sb = new StringBuilder();
        java.util.List<String> words = new java.util.ArrayList<>(java.util.List.of(""));
        for (int len = 1; len <= depth; len++) {
            java.util.List<String> next = new java.util.ArrayList<>();
            for (String w : words) {
                for (char ch = 'a'; ch <= 'd'; ch++) {
                    next.add(w + ch);
                }
            }
            for (String w : next) {
                sb.append(dfa.run(state, w.getBytes(StandardCharsets.US_ASCII)) != ByteDfa.DEAD ? '1' : '0');
            }
            words = next;
        }
        return sb.toString();
    }

    @Test
    void hopcroftAndMooreFindTheSamePartition() {
        // the fast minimisation against its slow, obviously correct twin, on random automata
        Random rnd = new Random(17);
        for (int trial = 0; trial < 2000; trial++) {
            int m = 1 + rnd.nextInt(60);
            int classes = 1 + rnd.nextInt(5);
            int[] delta = new int[m * classes];
            boolean[] accepting = new boolean[m];
            for (int i = 0; i < delta.length; i++) {
                delta[i] = rnd.nextInt(4) == 0 ? ByteDfa.DEAD : rnd.nextInt(m);
            }
            for (int i = 0; i < m; i++) {
                accepting[i] = rnd.nextInt(3) == 0;
            }
            // trimmed, as minimisation receives them: a forward edge from every state to the last,
            // accepting one, so every state can reach acceptance
            accepting[m - 1] = true;
            for (int i = 0; i < m - 1; i++) {
                delta[i * classes] = i + 1 + rnd.nextInt(m - 1 - i);
            }
            assertEquals(java.util.Arrays.toString(ByteDfa.moore(m, classes, delta, accepting)),
                    java.util.Arrays.toString(ByteDfa.hopcroft(m, classes, delta, accepting)), "trial " + trial);
        }
    }
}
