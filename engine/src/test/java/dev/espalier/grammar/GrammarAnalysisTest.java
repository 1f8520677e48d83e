package dev.espalier.grammar;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** Per-rule facts on RFC 5234 §4 and on small grammars. */
class GrammarAnalysisTest {

    static Grammar abnf(String text) {
        AbnfResult r = Abnf.parse(text, "t.abnf");
        assertTrue(r.diagnostics().isEmpty(), r.diagnostics()::toString);
        return r.grammar();
    }

    static GrammarAnalysis rfc() throws IOException {
        try (InputStream in = GrammarAnalysisTest.class.getResourceAsStream("/dev/espalier/abnf/rfc5234-section4.abnf")) {
            return GrammarAnalysis.of(abnf(new String(in.readAllBytes(), StandardCharsets.US_ASCII)));
        }
    }

    private static long[] bytes(int... bs) {
        long[] b = new long[4];
        for (int x : bs) {
            b[x >> 6] |= 1L << (x & 63);
        }
        return b;
    }

    @Test
    void rfcRulelistShortestIsAnEmptyLine() throws IOException {
        // RFC 5234 §4: rulelist = 1*( rule / (*c-wsp c-nl) ), c-nl = comment / CRLF: one bare CRLF is a rulelist
        RuleFacts f = rfc().facts("rulelist");
        assertTrue(f.productive());
        assertFalse(f.nullable(), "1*(...) needs one element");
        assertEquals(Optional.of("\r\n"), f.shortest());
        assertEquals(2, f.shortestLength());
    }

    @Test
    void rfcRulenameStartsWithALetter() throws IOException {
        // rulename = ALPHA *(ALPHA / DIGIT / "-"); java.lang.Character as the reference for ASCII letters
        RuleFacts f = rfc().facts("rulename");
        for (int b = 0; b < 256; b++) {
            assertEquals(b < 0x80 && Character.isLetter(b), f.canStartWith(b), "byte " + b);
        }
        assertEquals(1, f.shortestLength());
        assertTrue(Character.isLetter(f.shortest().orElseThrow().charAt(0)));
    }

    @Test
    void rfcRepeatStartsWithDigitOrStar() throws IOException {
        // repeat = 1*DIGIT / (*DIGIT "*" *DIGIT)
        RuleFacts f = rfc().facts("repeat");
        long[] expected = bytes('*', '0', '1', '2', '3', '4', '5', '6', '7', '8', '9');
        assertArrayEquals(expected, f.firstBytes());
        assertFalse(f.nullable());
        assertEquals(1, f.shortestLength());
    }

    @Test
    void rfcCommentWhitespaceStarts() throws IOException {
        // c-wsp = WSP / (c-nl WSP); WSP = SP / HTAB; c-nl = comment / CRLF; comment = ";" ...
        assertArrayEquals(bytes(' ', '\t', ';', '\r'), rfc().facts("c-wsp").firstBytes());
    }

    @Test
    void rfcRegularAndRecursiveRules() throws IOException {
        GrammarAnalysis a = rfc();
        // group = "(" *c-wsp alternation *c-wsp ")" nests alternations: brackets must balance
        for (String r : List.of("alternation", "concatenation", "repetition", "element", "group", "option",
                "elements", "rule", "rulelist")) {
            assertFalse(a.facts(r).regular(), r);
        }
        for (String r : List.of("rulename", "repeat", "num-val", "hex-val", "char-val", "prose-val", "comment",
                "c-wsp", "c-nl", "defined-as")) {
            assertTrue(a.facts(r).regular(), r);
        }
        for (RuleFacts f : a.allFacts().values()) {
            assertFalse(f.leftRecursive(), f.name());
            assertTrue(f.productive(), f.name());
        }
    }

    @Test
    void rfcReferences() throws IOException {
        // repetition = [repeat] element
        assertEquals(Set.of("repeat", "element"), rfc().facts("repetition").references());
        assertEquals(List.of("ALPHA", "DIGIT"), List.copyOf(rfc().facts("rulename").references()));
    }

    @Test
    void nullability() {
        GrammarAnalysis a = GrammarAnalysis.of(abnf("a = *%s\"x\" / b\nb = [c]\nc = %s\"y\"\nd = c 0c\n"));
        assertTrue(a.facts("a").nullable());
        assertTrue(a.facts("b").nullable());
        assertFalse(a.facts("c").nullable());
        assertFalse(a.facts("d").nullable());
        assertEquals(Optional.of(""), a.facts("a").shortest());
    }

    @Test
    void shortestPrefersTheExit() {
        GrammarAnalysis a = GrammarAnalysis.of(abnf("s = %s\"x\" s / %s\"yy\"\nt = t %s\"a\" / %s\"b\"\n"));
        assertEquals(Optional.of("yy"), a.facts("s").shortest());
        assertEquals(Optional.of("b"), a.facts("t").shortest());
    }

    @Test
    void shortestWithNullableRecursionTerminates() {
        // u = "" u / "x" has a tie between a loop and the exit; the spelled-out string must still end
        Grammar g = Grammar.of(List.of(Rule.of("u", Expr.choice(Expr.seq(Expr.text(""), Expr.ref("u")), Expr.text("x")))), "u");
        assertEquals(Optional.of("x"), GrammarAnalysis.of(g).facts("u").shortest());
    }

    @Test
    void nonProductiveFacts() {
        GrammarAnalysis a = GrammarAnalysis.of(abnf("s = %s\"x\" s\n"));
        assertFalse(a.facts("s").productive());
        assertEquals(Optional.empty(), a.facts("s").shortest());
        assertEquals(-1, a.facts("s").shortestLength());
        assertArrayEquals(new long[4], a.facts("s").firstBytes());
        assertEquals(List.of(), a.examples(5, 1, 10));
    }

    @Test
    void firstBytesOfNonAsciiAreUtf8LeadBytes() {
        // java.lang.String's UTF-8 encoder as the reference for lead bytes
        GrammarAnalysis a = GrammarAnalysis.of(abnf("r = %xE9 / %x4E2D / %x1F333 / %x80-7FF\n"));
        long[] expected = new long[4];
        for (int cp : new int[] {0xE9, 0x4E2D, 0x1F333}) {
            int lead = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8)[0] & 0xFF;
            expected[lead >> 6] |= 1L << (lead & 63);
        }
        for (int cp = 0x80; cp <= 0x7FF; cp++) {
            int lead = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8)[0] & 0xFF;
            expected[lead >> 6] |= 1L << (lead & 63);
        }
        assertArrayEquals(expected, a.facts("r").firstBytes());
        // shortest: the two-byte range wins over the three- and four-byte characters... but one-byte none; é is 2 bytes
        assertEquals(2, a.facts("r").shortestLength());
    }

    @Test
    void firstBytesOfCaseInsensitiveStringHaveBothCases() {
        // RFC 5234 §2.3: "Gala" matches any case
        GrammarAnalysis a = GrammarAnalysis.of(abnf("r = [\" \"] \"gala\"\n"));
        assertArrayEquals(bytes(' ', 'g', 'G'), a.facts("r").firstBytes());
    }

    @Test
    void firstBytesSkipNullablePrefixesOnly() {
        GrammarAnalysis a = GrammarAnalysis.of(abnf("r = *%s\"a\" [%s\"b\"] %s\"c\" %s\"d\"\n"));
        assertArrayEquals(bytes('a', 'b', 'c'), a.facts("r").firstBytes());
    }

    @Test
    void regularityOfLinearRecursion() {
        GrammarAnalysis a = GrammarAnalysis.of(abnf(String.join("\n",
                "right = item [%s\",\" right]",
                "left = [left %s\",\"] item",
                "item = %x61-7A",
                // x^n y z^n is not regular (pumping lemma, common practice): one tail and one head reference
                "mixed = %s\"x\" other / %s\"y\"",
                "other = mixed %s\"z\"",
                "uses = right mixed",
                "twice = %s\"(\" twice %s\")\" / %s\"\"",
                "loop = *(%s\"a\" loop) %s\"b\"", "")));
        assertTrue(a.facts("right").regular());
        assertTrue(a.facts("left").regular());
        assertTrue(a.facts("item").regular());
        assertFalse(a.facts("mixed").regular());
        assertFalse(a.facts("other").regular());
        assertFalse(a.facts("uses").regular(), "reaches a non-regular rule");
        assertFalse(a.facts("twice").regular());
        assertFalse(a.facts("loop").regular(), "a reference inside an unbounded repetition is not in tail position");
        assertTrue(a.facts("left").leftRecursive());
        assertFalse(a.facts("right").leftRecursive());
    }

    @Test
    void undefinedRuleFromCodeBuiltGrammar() {
        Grammar g = Grammar.of(List.of(Rule.of("s", Expr.seq(Expr.text("a"), Expr.ref("missing")))), "s");
        GrammarAnalysis a = GrammarAnalysis.of(g);
        assertEquals(List.of("undefined-rule", "empty-language"), a.diagnostics().stream().map(Diagnostic::code).toList());
        assertEquals(Set.of("missing"), a.facts("s").references());
    }
}
