package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.testing.TestVocabularies;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * {@link RunTokens} against every token of cl100k and o200k checked one by one: a token is a run
 * over a set when each of its bytes is an ASCII byte of the set or (with multibyte characters)
 * a byte from 0x80 up, and the JDK's UTF-8 decoder with malformed input reported reads it, or it
 * with one to three more continuation bytes, as well-formed (its last character may be cut short);
 * its length in characters is the number of its bytes that are not continuation bytes.
 */
class RunTokensTest {

    private static final CharsetDecoder DECODER = StandardCharsets.UTF_8.newDecoder()
            .onMalformedInput(CodingErrorAction.REPORT).onUnmappableCharacter(CodingErrorAction.REPORT);

    /** Continuation bytes that, in some order, complete every well-formed prefix (E0 needs A0.., F0 90.., ED and F4 80..). */
    private static final int[] COMPLETIONS = {0x80, 0x90, 0xA0};

    private static boolean decodes(byte[] bytes) {
        try {
            DECODER.decode(ByteBuffer.wrap(bytes));
            return true;
        } catch (CharacterCodingException e) {
            return false;
        }
    }

    private static boolean wellFormedPrefix(byte[] bytes) {
        if (decodes(bytes)) {
            return true;
        }
        for (int extra = 1; extra <= 3; extra++) {
            int tries = (int) Math.pow(COMPLETIONS.length, extra);
            for (int t = 0; t < tries; t++) {
                byte[] longer = Arrays.copyOf(bytes, bytes.length + extra);
                for (int k = 0, rest = t; k < extra; k++, rest /= COMPLETIONS.length) {
                    longer[bytes.length + k] = (byte) COMPLETIONS[rest % COMPLETIONS.length];
                }
                if (decodes(longer)) {
                    return true;
                }
            }
        }
        return false;
    }

    /** A set of characters in the form RunTokens takes. */
    private record CharSet(String name, long low, long high, boolean multibyte) {
        static CharSet of(String name, String ascii, boolean multibyte) {
            long low = 0;
            long high = 0;
            for (char c : ascii.toCharArray()) {
                if (c < 64) {
                    low |= 1L << c;
                } else {
                    high |= 1L << (c - 64);
                }
            }
            return new CharSet(name, low, high, multibyte);
        }

        boolean holds(int b) {
            return b < 64 ? (low >>> b & 1) != 0 : b < 128 ? (high >>> (b - 64) & 1) != 0 : multibyte;
        }
    }

    private static String printableAscii(String except) {
        StringBuilder s = new StringBuilder();
        for (char c = 0x20; c < 0x7F; c++) {
            if (except.indexOf(c) < 0) {
                s.append(c);
            }
        }
        return s.toString();
    }

    private static final List<CharSet> SETS = List.of(
            CharSet.of("JSON string text", printableAscii("\"\\"), true),
            CharSet.of("letters and digits", "abcdefghijklmnopqrstuvwxyz0123456789", false),
            CharSet.of("non-ASCII only", "", true));

    @Test
    void tokensByLengthAgreeWithCheckingEachToken() {
        int families = 0;
        long tokensChecked = 0;
        for (String name : List.of("cl100k", "o200k")) {
            Vocabulary v = TestVocabularies.builtin(name);
            VocabularyTrie trie = freshTrie(v);
            // per token: its length in characters when it is a well-formed prefix, else -1
            int[] chars = new int[v.size()];
            for (int id = 0; id < v.size(); id++) {
                chars[id] = -1;
                if (!v.has(id)) {
                    continue;
                }
                byte[] b = v.bytes(id);
                if (b.length > 0 && !v.isSpecial(id) && wellFormedPrefix(b)) {
                    int c = 0;
                    for (byte x : b) {
                        c += (x & 0xC0) != 0x80 ? 1 : 0;
                    }
                    chars[id] = c;
                }
            }
            for (CharSet set : SETS) {
                boolean[] run = new boolean[v.size()];
                for (int id = 0; id < v.size(); id++) {
                    if (chars[id] >= 0) {
                        boolean all = true;
                        for (byte x : v.bytes(id)) {
                            all &= set.holds(x & 0xFF);
                        }
                        run[id] = all;
                    }
                }
                for (int depth : new int[] {12, trie.maxDepth()}) {
                    RunTokens runs = trie.runTokens(set.low(), set.high(), set.multibyte(), depth);
                    assertNotNull(runs);
                    assertSame(runs, trie.runTokens(set.low(), set.high(), set.multibyte(), depth), "kept");
                    families++;
                    for (int upTo : new int[] {0, 1, 2, 3, 5, 8, 15, 16, 17, 19, 25, 40, Integer.MAX_VALUE}) {
                        long[] expected = new long[v.maskWords()];
                        for (int id = 0; id < v.size(); id++) {
                            if (run[id] && chars[id] <= upTo && v.length(id) <= depth) {
                                expected[id >>> 6] |= 1L << id;
                            }
                        }
                        long[] got = new long[v.maskWords()];
                        runs.addUpTo(upTo, got);
                        String where = name + ", " + set.name() + ", " + depth + " bytes, up to " + upTo + " characters";
                        assertArrayEquals(expected, got, where);
                        assertEquals(Arrays.stream(expected).map(Long::bitCount).sum(), runs.countUpTo(upTo), where);
                        tokensChecked += v.size();
                    }
                }
            }
            // the sets are not idle: inside a JSON string most tokens of the vocabulary are runs
            RunTokens text = trie.runTokens(SETS.get(0).low(), SETS.get(0).high(), true, trie.maxDepth());
            int all = text.countUpTo(Integer.MAX_VALUE);
            assertTrue(all > v.size() / 2, name + ": " + all + " text tokens of " + v.size());
            assertTrue(text.countUpTo(3) < all && text.countUpTo(3) > 0, name);
            System.out.println(name + ": " + all + " of " + v.size() + " tokens are runs of JSON string text, "
                    + text.countUpTo(3) + " of them up to 3 characters");
        }
        System.out.println("run tokens: " + families + " sets and depths, " + tokensChecked + " token checks, 0 differences");
    }

    /** A trie of its own, so the sets made here do not fill the shared trie's bound. */
    private static VocabularyTrie freshTrie(Vocabulary v) {
        byte[][] tokens = new byte[v.size()][];
        boolean[] special = new boolean[v.size()];
        for (int id = 0; id < v.size(); id++) {
            tokens[id] = v.has(id) ? v.bytes(id) : null;
            special[id] = v.isSpecial(id);
        }
        return VocabularyTrie.build(tokens, special);
    }

    @Test
    void aTrieKeepsTheSetsAskedForLast() {
        VocabularyTrie trie = freshTrie(TestVocabularies.builtin("cl100k"));
        RunTokens first = trie.runTokens(1L, 0, false, 2);
        RunTokens[] made = new RunTokens[64];
        for (int b = 0; b < 64; b++) {
            made[b] = trie.runTokens(1L << b, 0, false, 2);
            assertNotNull(made[b], "set " + b);
            assertTrue(trie.runSetsKept() <= VocabularyTrie.RUN_SETS, "sets kept: " + trie.runSetsKept());
        }
        assertEquals(VocabularyTrie.RUN_SETS, trie.runSetsKept());
        // the set asked for last is kept; the one asked for first was dropped and is made again, equal
        assertSame(made[63], trie.runTokens(1L << 63, 0, false, 2));
        RunTokens again = trie.runTokens(1L, 0, false, 2);
        assertNotSame(first, again);
        int words = TestVocabularies.builtin("cl100k").maskWords();
        for (int c = 0; c <= 2; c++) {
            long[] a = new long[words];
            long[] b = new long[words];
            first.addUpTo(c, a);
            again.addUpTo(c, b);
            assertArrayEquals(a, b, "tokens of up to " + c + " characters");
        }
        assertTrue(first.countUpTo(2) > 0, "the set has tokens");
    }

    @Test
    void aSetAskedForAgainOutlivesOlderOnes() {
        VocabularyTrie trie = freshTrie(TestVocabularies.builtin("cl100k"));
        RunTokens kept = trie.runTokens(1L, 0, false, 2);
        RunTokens second = trie.runTokens(2L, 0, false, 2);
        for (int b = 2; b < VocabularyTrie.RUN_SETS; b++) {
            trie.runTokens(1L << b, 0, false, 2);
        }
        assertSame(kept, trie.runTokens(1L, 0, false, 2), "asked for again");
        trie.runTokens(0, 1L, false, 2); // one set more than the trie keeps
        assertEquals(VocabularyTrie.RUN_SETS, trie.runSetsKept());
        assertSame(kept, trie.runTokens(1L, 0, false, 2), "kept: asked for recently");
        assertNotSame(second, trie.runTokens(2L, 0, false, 2), "dropped: asked for least recently");
    }

    @Test
    void aWalkTakesOnlyRunTokensOfItsOwnTrieAndDepth() {
        VocabularyTrie trie = freshTrie(TestVocabularies.builtin("cl100k"));
        VocabularyTrie other = VocabularyTrie.build(new byte[][] {{'a'}, {'b'}}, new boolean[2]);
        long letters = 0;
        long high = 0x7FFFFFEL << 32 | 0x7FFFFFEL; // A..Z and a..z
        RunTokens mine = trie.runTokens(letters, high, false, 12);
        RunTokens theirs = other.runTokens(letters, high, false, 1);
        long[] mask = new long[TestVocabularies.builtin("cl100k").maskWords()];
        assertThrows(IllegalArgumentException.class,
                () -> trie.collect((q, b) -> q, VocabularyTrie.Coverage.NONE, 0, mask, 12, theirs, 3));
        assertThrows(IllegalArgumentException.class,
                () -> trie.collect((q, b) -> q, VocabularyTrie.Coverage.NONE, 0, mask, 8, mine, 3));
    }
}
