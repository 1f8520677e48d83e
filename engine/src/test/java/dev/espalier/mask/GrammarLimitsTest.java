package dev.espalier.mask;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.earley.EarleyLimitException;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.time.Duration;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Grammars beyond the fast path's limits: a lexical layer too large for one automaton is split into
 * smaller terminals, and an indivisible piece over the limit falls back to the byte-level parser, both
 * with the same masks; a chart over its item limit stops with a clear error and
 * leaves the cursor where it was; a highly ambiguous grammar keeps exact masks. Time-outs only guard
 * against hangs.
 */
class GrammarLimitsTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    private static Grammar grammar(String text) {
        AbnfResult r = Abnf.parse(text, "limits.abnf");
        assertFalse(r.hasErrors(), () -> r.diagnostics().toString());
        return r.grammar();
    }

    private static long[] mask(Cursor c) {
        long[] m = new long[CL100K.maskWords()];
        c.fillMask(m);
        return m;
    }

    @Test
    void explodingLexicalLayerIsSplitIntoSmallerTerminalsWithTheSameMasks() {
        // the 11th symbol from the end is "a": a minimal DFA needs 2^11 states (common practice: the
        // textbook example of subset-construction blow-up), over a state limit of 1,000
        Grammar g = grammar("list = \"[\" [ item *( \",\" item ) ] \"]\" / \"(\" list \")\"\n"
                + "item = *( \"a\" / \"b\" ) \"a\" 10( \"a\" / \"b\" )\n");
        Constraint lowered = assertTimeoutPreemptively(Duration.ofSeconds(60),
                () -> Constraint.grammar(g, CL100K, MaskSettings.defaults().withStateLimit(1_000)));
        assertTrue(lowered.describe().startsWith("Earley skeleton"), lowered.describe());
        Constraint split = Constraint.grammar(g, CL100K);
        assertTrue(split.describe().startsWith("Earley skeleton"), split.describe());
        agreeWithReference(g, lowered, split, "", "(", "([", "[ab", "[aaaaaaaaaaa", "[baaaaaaaaaab,", "(([");
    }

    @Test
    void anIndivisiblePieceOverTheLimitFallsBackToTheByteLevelParserWithTheSameMasks() {
        Grammar g = grammar("list = \"[\" [ tree *( \",\" tree ) ] \"]\" / \"(\" list \")\"\n"
                + "tree = %s\"Amberglow on RS-9\" / %s\"Copperbell on RS-12\"\n");
        Constraint fallback = assertTimeoutPreemptively(Duration.ofSeconds(60),
                () -> Constraint.grammar(g, CL100K, MaskSettings.defaults().withStateLimit(8)));
        assertTrue(fallback.describe().startsWith("Earley parser over bytes"), fallback.describe());
        Constraint split = Constraint.grammar(g, CL100K);
        assertTrue(split.describe().startsWith("Earley skeleton"), split.describe());
        agreeWithReference(g, fallback, split, "", "(", "([", "[Amber", "[Amberglow on RS-9,", "((");
    }

    private static void agreeWithReference(Grammar g, Constraint first, Constraint second, String... prefixes) {
        ReferenceMasks reference = new ReferenceMasks(g, CL100K);
        for (String prefix : prefixes) {
            Cursor a = first.start();
            Cursor b = second.start();
            a.feedText(prefix);
            b.feedText(prefix);
            long[] ma = mask(a);
            assertArrayEquals(ma, mask(b), "after " + prefix);
            assertArrayEquals(reference.mask(prefix.getBytes(StandardCharsets.UTF_8)), ma, "reference after " + prefix);
        }
    }

    @Test
    void chartOverItsItemLimitStopsWithAClearErrorAndKeepsTheCursor() {
        // E = E "+" E / "1": Catalan-many parses; with 3,000 items the chart fills after a few dozen bytes
        Grammar g = grammar("e = e \"+\" e / \"1\"\n");
        Constraint c = Constraint.grammar(g, CL100K, MaskSettings.defaults().withParserItemLimit(3_000));
        Cursor cur = c.start();
        int steps = 0;
        long[] before = null;
        EarleyLimitException stop = null;
        for (int i = 0; i < 400 && stop == null; i++) {
            try {
                before = mask(cur);
                cur.feedText("1+");
                steps++;
            } catch (EarleyLimitException e) {
                stop = e;
            }
        }
        assertTrue(stop != null, "the item limit was reached");
        assertEquals(3_000, stop.limit());
        assertTrue(stop.getMessage().contains("3000") || stop.getMessage().contains("3,000"), stop.getMessage());
        assertEquals(steps, cur.steps(), "the refused step was not taken");
        try {
            assertArrayEquals(before, mask(cur), "the cursor's mask is unchanged");
        } catch (EarleyLimitException e) {
            // the mask itself may need more items than the limit: an error again, never a wrong mask
        }
        // with the default limit the same text goes through, with exact masks
        Cursor big = Constraint.grammar(g, CL100K).start();
        String text = "1+".repeat(steps + 1);
        big.feedText(text);
        Cursor twin = new EarleyConstraint(EarleyGrammar.compile(g), CL100K, MaskSettings.defaults()).start();
        twin.feedText(text);
        assertArrayEquals(mask(twin), mask(big), "split masks against the byte-level twin");
    }
}
