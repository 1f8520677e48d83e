package dev.espalier.mask;

import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.util.HexFormat;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Exactness of context-free masks at the places where a trie walk can go wrong: tokens crossing rule
 * boundaries, tokens ending inside a UTF-8 character, nullable and recursive rules, an ambiguous
 * grammar; refusals, undo, fork and forced continuations. Expected verdicts come from the standards
 * named beside them, and each is also confirmed by the fresh-chart reference ({@link ReferenceMasks}).
 */
class GrammarMaskEdgeCaseTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    private static int token(String text) {
        return tokenOf(text.getBytes(StandardCharsets.UTF_8));
    }

    private static int tokenOf(byte[] bytes) {
        int[] ids = CL100K.idsOf(bytes);
        assertEquals(1, ids.length, () -> "cl100k has one token for " + GrammarMaskDifferentialTest.show(bytes));
        return ids[0];
    }

    /** Feeds {@code text}, then returns the forced continuation. */
    private static byte[] forcedAfter(Cursor c, String text) {
        c.feedText(text);
        return c.forcedBytes();
    }

    private static long[] mask(Cursor c) {
        long[] m = new long[CL100K.maskWords()];
        c.fillMask(m);
        return m;
    }

    /** Asserts the verdict on {@code id} after {@code prefix}: from allows, from fillMask and from the reference. */
    private static void verdict(String grammar, String prefix, int id, boolean expected) {
        verdict(grammar, prefix.getBytes(StandardCharsets.UTF_8), id, expected);
    }

    private static void verdict(String grammar, byte[] prefix, int id, boolean expected) {
        Grammar g = TestGrammars.load(grammar);
        for (Grammar form : new Grammar[] {g, TestGrammars.throughParser(g)}) {
            Cursor c = Constraint.grammar(form, CL100K).start();
            c.feedBytes(prefix);
            String what = grammar + " after " + GrammarMaskDifferentialTest.show(prefix) + ", token "
                    + CL100K.display(id);
            assertEquals(expected, c.allows(id), what + " (allows)");
            assertEquals(expected, TokenBits.get(mask(c), id), what + " (mask)");
        }
        assertEquals(expected, new ReferenceMasks(g, CL100K).allows(prefix, id), grammar + " reference");
    }

    // RFC 8259 section 4 (member = string name-separator value; value-separator = ",")
    @Test
    void tokensCrossingRuleBoundariesInJson() {
        verdict("json", "{\"variety\":\"Amberglow", token("\","), true);   // ends a string, separates members
        verdict("json", "{\"variety\":\"Amberglow", token("\"}"), true);   // ends a string and the object
        verdict("json", "[[1,2", token("],["), true);                     // ends an array, separates, opens one
        verdict("json", "{\"row", token("\":\""), true);                  // ends a name, separator, opens a string
        verdict("json", "{\"row\":12", token("\","), false);              // a number is not followed by a quote
        verdict("json", "[1,2", token("],["), false);                     // the outer array cannot close twice
        verdict("json", "{\"row\":12", token("}"), true);
        verdict("json", "{\"row\":12}", token("}"), false);
    }

    // arithmetic.abnf: factor = "(" ws expr ws ")" (one token closing two nesting levels, or many symbols)
    @Test
    void tokensSpanningManyGrammarSymbols() {
        verdict("arithmetic", "((1", token("))"), true);
        verdict("arithmetic", "(1", token("))"), false);
        verdict("arithmetic", "1", token(" +"), true);
        verdict("arithmetic", "1", token(")"), false);
        verdict("arithmetic", "(1", token(")"), true);
        verdict("orchard-query", "", token("row"), true);
        verdict("orchard-query", "row > 12", token(" and"), true);
        verdict("orchard-query", "row > 12", token(" an"), true);     // the start of " and"
        verdict("orchard-query", "row > 12", token(" any"), false);
        verdict("orchard-query", "row > 12 or", token(" not"), true);
    }

    // UTF-8 encodings from RFC 3629: U+20AC = E2 82 AC, U+2000..203F = E2 80 xx, U+1F34E = F0 9F 8D 8E,
    // U+1F380..1F3BF = F0 9F 8E xx; cl100k has tokens for single bytes and for some byte pairs
    @Test
    void tokensEndingInsideAUtf8Character() {
        HexFormat hex = HexFormat.of();
        int e2 = tokenOf(hex.parseHex("e2"));
        verdict("high-values", "", e2, true);                              // begins U+20AC
        verdict("high-values", "a", tokenOf(hex.parseHex("f0")), true);    // begins U+1F34E
        verdict("high-values", new byte[] {(byte) 0xE2}, tokenOf(hex.parseHex("82")), true);
        verdict("high-values", new byte[] {(byte) 0xE2}, tokenOf(hex.parseHex("80")), false);  // U+2000..203F
        verdict("high-values", hex.parseHex("f09f"), tokenOf(hex.parseHex("8d")), true);
        verdict("high-values", hex.parseHex("f09f"), tokenOf(hex.parseHex("8e")), false);
        verdict("high-values", hex.parseHex("f09f8d"), tokenOf(hex.parseHex("8e")), true);
        // a glyph range crossing from two-byte to three-byte encodings: U+07FF = DF BF, U+0800 = E0 A0 80
        verdict("high-values", "", tokenOf(hex.parseHex("df")), true);
        verdict("high-values", new byte[] {(byte) 0xDF}, tokenOf(hex.parseHex("bf")), true);
        verdict("high-values", new byte[] {(byte) 0xDF}, tokenOf(hex.parseHex("be")), false);
        // inside a JSON string every code point from U+0020 is allowed (RFC 8259 section 7)
        verdict("json", "\"", tokenOf(hex.parseHex("e2")), true);
        verdict("json", "\"\u20ac", tokenOf(hex.parseHex("e2")), true);
        verdict("json", "\"", tokenOf(hex.parseHex("80")), false);         // a lone continuation byte
        verdict("json", "\"", tokenOf(hex.parseHex("ff")), false);         // never in UTF-8
        verdict("json", "", tokenOf(hex.parseHex("e2")), false);           // not inside a string
    }

    @Test
    void nullableAndRightRecursiveRules() {
        // nullable.abnf: top, list and tail all derive the empty string
        Cursor c = Constraint.grammar(TestGrammars.load("nullable"), CL100K).start();
        assertTrue(c.isComplete(), "the empty string is in the language");
        assertTrue(c.canContinue());
        verdict("nullable", "", CL100K.endOfSequence(), true);
        verdict("nullable", "b(", token(")"), true);
        verdict("nullable", "b(", token("--"), true);
        verdict("nullable", "b(--", token("c"), true);
        verdict("nullable", "b(", CL100K.endOfSequence(), false);
        verdict("nullable", "b(b(b(a", token(")))"), true);
        verdict("nullable", "b(b(a", token(")))"), false);
        verdict("nullable", "aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa", token("!"), true);
        verdict("nullable", "a!", token("a"), false);
    }

    @Test
    void ambiguousGrammar() {
        // E = E "+" E / "1": strings 1, 1+1, 1+1+1, ... (Catalan-many parses, one language)
        verdict("ambiguous", "", token("1"), true);
        verdict("ambiguous", "1+1+1", CL100K.endOfSequence(), true);
        verdict("ambiguous", "1+1+1", token("+"), true);
        verdict("ambiguous", "1+1+", CL100K.endOfSequence(), false);
        verdict("ambiguous", "1+1", token("1"), false);
        verdict("ambiguous", "1+", token("++"), false);
        verdict("ambiguous", "", token("11"), false);
    }

    @Test
    void refusedTokenLeavesTheCursorUnchanged() {
        Cursor c = Constraint.grammar(TestGrammars.load("json"), CL100K).start();
        c.feedText("{\"variety\":");
        long[] before = mask(c);
        int bad = token("}");
        assertFalse(c.allows(bad));
        assertThrows(RejectedInputException.class, () -> c.feed(bad));
        assertFalse(c.tryFeed(bad));
        assertEquals(1, c.steps());
        assertArrayEquals(before, mask(c));
        RejectedInputException e = assertThrows(RejectedInputException.class, () -> c.feedText(" \"a\"x"));
        assertEquals(4, e.offset());
        assertEquals(1, c.steps());
        assertArrayEquals(before, mask(c));
        assertFalse(c.isComplete());
        c.feed(token(" \""));
        assertEquals(2, c.steps());
    }

    @Test
    void forcedContinuationOfTheOrchardRecord() {
        Grammar g = TestGrammars.load("orchard-record");
        for (Grammar form : new Grammar[] {g, TestGrammars.throughParser(g)}) {
            Cursor c = Constraint.grammar(form, CL100K).start();
            assertEquals("{\"variety\":\"", new String(c.forcedBytes(), StandardCharsets.UTF_8));
            c.feedText("{\"variety");
            assertEquals("\":\"", new String(c.forcedBytes(), StandardCharsets.UTF_8));
            c.feedText("\":\"Russet");
            assertEquals(" Vale\",\"rootstock\":\"RS-", new String(c.forcedBytes(), StandardCharsets.UTF_8));
            c.feedText(" Vale\",\"rootstock\":\"RS-1");
            assertEquals(0, c.forcedBytes().length, "a second digit or the closing quote");
            Cursor f = c.fork();
            f.feedText("2");
            assertEquals("\",\"grafted\":\"", new String(f.forcedBytes(), StandardCharsets.UTF_8));
            assertEquals(0, c.forcedBytes().length, "the fork does not move the original");
            f.feedText("\",\"grafted\":\"2019-04-01\",\"row\":7");
            assertEquals(0, f.forcedBytes().length, "a digit or the closing brace");
            f.feedText("12");
            assertFalse(f.isComplete());
            assertEquals("}", new String(f.forcedBytes(), StandardCharsets.UTF_8));
            f.feedText("}");
            assertTrue(f.isComplete());
            assertFalse(f.canContinue());
            assertEquals(0, f.forcedBytes().length);
            f.feed(CL100K.endOfSequence());
            assertTrue(f.isFinished());
            assertEquals(0, TokenBits.count(mask(f)), "nothing after end of sequence");
            f.undo(1);
            assertTrue(f.isComplete());
            assertFalse(f.isFinished());
        }
    }

    @Test
    void undoAndForkOnARecursiveGrammar() {
        Constraint json = Constraint.grammar(TestGrammars.load("json"), CL100K);
        Cursor c = json.start();
        long[] m0 = mask(c);
        c.feed(token("[{"));
        long[] m1 = mask(c);
        c.feedText("\"row\":[1,[2");
        Cursor f = c.fork();
        c.feed(token("]]"));
        long[] m3 = mask(c);
        // inside the outer array: white space, ',' or ']' (RFC 8259 sections 2 and 5)
        assertEquals(0, forcedAfter(f, "]]}").length);
        assertTrue(f.allows(token("]")) && f.allows(token(",")) && f.allows(token(" ")));
        assertFalse(f.isComplete());
        assertArrayEquals(m3, mask(c), "the fork does not move the original");
        c.undo(2);
        assertArrayEquals(m1, mask(c));
        c.undo(1);
        assertArrayEquals(m0, mask(c));
        assertEquals("e", new String(forcedAfter(json.start(), "tru"), StandardCharsets.UTF_8));
        assertEquals("ull", new String(forcedAfter(json.start(), " n"), StandardCharsets.UTF_8));
    }
}
