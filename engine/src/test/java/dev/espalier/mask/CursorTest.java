package dev.espalier.mask;

import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.regex.RegexSyntaxException;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.Arrays;
import java.util.Random;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The per-sequence cursor: feeding, refusing, undo, fork, forced continuation, end of sequence. */
class CursorTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");
    private static final String RECORD = "\\{\"variety\":\"(Amberglow|Copperbell)\",\"rootstock\":\"RS-[0-9]{1,2}\"\\}";

    private static long[] mask(Cursor c) {
        long[] m = new long[c.constraint().vocabulary().maskWords()];
        c.fillMask(m);
        return m;
    }

    private static int token(String text) {
        int[] ids = CL100K.idsOf(text.getBytes(StandardCharsets.UTF_8));
        assertEquals(1, ids.length, "cl100k has one token for " + text);
        return ids[0];
    }

    @Test
    void refusedTokenLeavesTheCursorUnchanged() {
        Cursor c = Constraint.regex(RECORD, CL100K).start();
        c.feedText("{\"variety\":\"");
        long[] before = mask(c);
        int bad = token("xyz");
        assertFalse(c.allows(bad));
        RejectedInputException e = assertThrows(RejectedInputException.class, () -> c.feed(bad));
        assertTrue(e.getMessage().contains("not allowed"), e.getMessage());
        assertArrayEquals(before, mask(c));
        assertEquals(1, c.steps());
        RejectedInputException b = assertThrows(RejectedInputException.class, () -> c.feedText("Ambx"));
        assertEquals(3, b.offset());
        assertEquals("'e'", b.expected());
        assertArrayEquals(before, mask(c));
    }

    @Test
    void undoRestoresEarlierMasks() {
        Cursor c = Constraint.regex(RECORD, CL100K).start();
        long[] m0 = mask(c);
        c.feedText("{\"");
        long[] m1 = mask(c);
        c.feed(token("var"));
        c.feedText("iety\":\"Amber");
        assertEquals(3, c.steps());
        c.undo(2);
        assertArrayEquals(m1, mask(c));
        c.undo(1);
        assertArrayEquals(m0, mask(c));
        assertThrows(IllegalArgumentException.class, () -> c.undo(1));
    }

    @Test
    void forksAreIndependent() {
        Cursor a = Constraint.regex(RECORD, CL100K).start();
        a.feedText("{\"variety\":\"");
        Cursor b = a.fork();
        a.feedText("Amberglow");
        b.feedText("Copperbell");
        assertEquals("\",\"rootstock\":\"RS-", new String(a.forcedBytes(), StandardCharsets.UTF_8));
        b.undo(1);
        assertEquals(1, b.steps());
        assertEquals(2, a.steps());
    }

    @Test
    void forcedContinuationAfterAPartialKey() {
        Cursor c = Constraint.regex(RECORD, CL100K).start();
        assertEquals("{\"variety\":\"", new String(c.forcedBytes(), StandardCharsets.UTF_8));
        c.feedText("{\"variety\":\"Co");
        assertEquals("pperbell\",\"rootstock\":\"RS-", new String(c.forcedBytes(), StandardCharsets.UTF_8));
        c.feedText("pperbell\",\"rootstock\":\"RS-4");
        // a second digit or the closing brace: a choice, so nothing is forced
        assertEquals(0, c.forcedBytes().length);
    }

    @Test
    void endOfSequenceExactlyWhenComplete() {
        Cursor c = Constraint.regex("RS-[0-9]{1,2}", CL100K).start();
        int eos = CL100K.endOfSequence();
        c.feedText("RS-");
        assertFalse(c.isComplete());
        assertFalse(c.allows(eos));
        c.feedText("4");
        assertTrue(c.isComplete());
        assertTrue(c.canContinue());
        assertTrue(c.allows(eos));
        c.feedText("2");
        assertFalse(c.canContinue());
        c.feed(eos);
        assertTrue(c.isFinished());
        assertEquals(0, TokenBits.count(mask(c)));
        c.undo(1);
        assertTrue(TokenBits.get(mask(c), eos));
        assertEquals(1, TokenBits.count(mask(c)), "only end of sequence may follow RS-42");
    }

    @Test
    void specialTokensNeverAllowed() {
        Cursor c = Constraint.regex("[^\\n]{0,20}", CL100K).start();
        long[] m = mask(c);
        for (int id : CL100K.specialIds()) {
            assertEquals(id == CL100K.endOfSequence(), TokenBits.get(m, id), "special token " + id);
        }
    }

    @Test
    void constrainedOutputsAllMatchJavaUtilRegex() {
        // reference: java.util.regex full match of every generated output
        Random rnd = new Random(5);
        for (String[] p : RegexMaskDifferentialTest.PATTERNS) {
            Constraint c = Constraint.regex(p[0], CL100K);
            Pattern java = Pattern.compile(p[1] == null ? p[0] : p[1]);
            int complete = 0;
            for (int i = 0; i < 1000; i++) {
                MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 400, 0.1);
                if (!s.complete()) {
                    continue;
                }
                complete++;
                String text = new String(s.bytes(), StandardCharsets.UTF_8);
                assertArrayEquals(s.bytes(), text.getBytes(StandardCharsets.UTF_8), "valid UTF-8");
                assertTrue(java.matcher(text).matches(), () -> p[0] + " produced " + text);
            }
            assertTrue(complete >= 300, p[0] + ": " + complete + " complete outputs");
        }
    }

    @Test
    void invalidPatternsAndLimits() {
        RegexSyntaxException e = assertThrows(RegexSyntaxException.class, () -> Constraint.regex("ab(?=c)", CL100K));
        assertEquals(2, e.index());
        assertThrows(IllegalArgumentException.class, () -> Constraint.regex("[^\\s\\S]", CL100K));
        // a DFA explosion stops at the state limit, in bounded time
        assertTimeoutPreemptively(Duration.ofSeconds(60), () ->
                assertThrows(AutomatonTooLargeException.class, () -> Constraint.regex("(a|b)*a(a|b){25}", CL100K)));
    }

    @Test
    void cacheStaysWithinItsBudget() {
        long budget = 3 * (16 + 8L * CL100K.maskWords());
        Constraint c = Constraint.regex("[a-z]{0,30}", CL100K, MaskSettings.defaults().withCacheBudget(budget));
        Cursor cur = c.start();
        long[] first = mask(cur);
        for (int i = 0; i < 30; i++) {
            cur.feedText("a");
            mask(cur);
            assertTrue(c.cacheBytes() <= budget, "cache " + c.cacheBytes());
        }
        cur.undo(30);
        assertTrue(Arrays.equals(first, mask(cur)), "evicted masks are recomputed identically");
    }
}
