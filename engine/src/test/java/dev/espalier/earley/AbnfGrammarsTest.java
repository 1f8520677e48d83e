package dev.espalier.earley;

import static dev.espalier.earley.Grammars.abnf;
import static dev.espalier.earley.Grammars.accepts;
import static dev.espalier.earley.Grammars.fed;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Grammars read from ABNF text, and compile-time errors. */
class AbnfGrammarsTest {

    /** RFC 5234 section 4 (ABNF of ABNF), as typed into the ABNF front end's test resources. */
    private static String rfc5234Section4() throws IOException {
        try (InputStream in = AbnfGrammarsTest.class.getResourceAsStream("/dev/espalier/abnf/rfc5234-section4.abnf")) {
            return new String(in.readAllBytes(), StandardCharsets.US_ASCII);
        }
    }

    /** RFC 5234 text form: rules start in column 0 and lines end in CRLF (RFC 5234 §2.2, §4). */
    private static String strictForm(String text, int indent) {
        StringBuilder sb = new StringBuilder();
        for (String line : text.split("\n", -1)) {
            String l = line.startsWith(" ".repeat(indent)) ? line.substring(indent) : line;
            sb.append(l.stripTrailing()).append("\r\n");
        }
        return sb.toString();
    }

    @Test
    void abnfOfAbnfRecognisesRealAbnfFiles() throws IOException {
        String rfc = rfc5234Section4();
        EarleyGrammar g = abnf(rfc);
        // the RFC's own rules, re-indented to column 0, are ABNF by the RFC's definition
        String self = strictForm(rfc, 9);
        assertTrue(accepts(g, self), "RFC 5234 section 4 in its strict form");
        // a grammar of our orchard work orders in strict form
        String orders = String.join("\r\n",
                "; work orders of the orchard service",
                "order      = order-id SP task SP tree-ref [SP due]",
                "order-id   = \"WO-\" 4DIGIT",
                "task       = \"prune\" / \"graft\" / \"inspect\" / \"spray\"",
                "tree-ref   = row \"/\" 1*3DIGIT   ; row letter, tree number",
                "row        = %x41-5A",
                "due        = 4DIGIT \"-\" 2DIGIT \"-\" 2DIGIT",
                "");
        assertTrue(accepts(g, orders));
        // not ABNF: a rule without "=", and bare LF line ends (RFC 5234 requires CRLF)
        assertFalse(accepts(g, "order order-id task\r\n"));
        assertFalse(accepts(g, orders.replace("\r\n", "\n")));
        // a prefix of a valid file is viable but not yet accepted
        EarleyChart c = fed(g, "task = \"prune\" /");
        assertTrue(c != null && !c.accepts() && c.canContinue());
    }

    @Test
    void caseInsensitiveStringsMatchBothCases() {
        // RFC 5234 §2.3: "graft" matches any case; RFC 7405: %s"WO" matches only upper case
        EarleyGrammar g = abnf("cmd = \"graft\" SP %s\"WO\"\n");
        assertTrue(accepts(g, "graft WO"));
        assertTrue(accepts(g, "GrAfT WO"));
        assertFalse(accepts(g, "graft wo"));
        long[] next = fed(g, "").expectedByteSet();
        assertTrue(has(next, 'g') && has(next, 'G'));
        assertFalse(has(next, 'r'));
    }

    private static boolean has(long[] set, int b) {
        return (set[b >>> 6] >>> (b & 63) & 1) != 0;
    }

    @Test
    void codePointsAboveAsciiMatchTheirUtf8Encoding() {
        // variety names with Latin-1 and Latin Extended-A letters, and one tree symbol U+1F333;
        // UTF-8 forms per RFC 3629: U+00D6 = C3 96, U+0153 = C5 93, U+1F333 = F0 9F 8C B3
        EarleyGrammar g = abnf("variety = 1*(%x41-5A / %x61-7A / %xC0-FF / %x100-17F / SP) [%x1F333]\n");
        assertTrue(accepts(g, "\u00d6lapfel"));
        assertTrue(accepts(g, "C\u0153ur de Boskoop \ud83c\udf33"));
        assertFalse(accepts(g, "Gala \u2603")); // U+2603 is not in the rule
        // a UTF-8 sequence cut in the middle is a viable prefix, not a string of the language
        EarleyChart c = g.newChart();
        assertFalse(c.feed(0xF0)); // a name has at least one letter before the symbol
        assertTrue(c.feed('A'));
        assertTrue(c.feed(0xF0));
        assertTrue(c.feed(0x9F));
        assertFalse(c.accepts());
        assertFalse(c.feed(0x41)); // a continuation byte must come next
        assertTrue(c.feed(0x8C));
        assertTrue(c.feed(0xB3));
        assertTrue(c.accepts());
        assertFalse(c.canContinue()); // the tree symbol may only end a name
        EarleyChart d = fed(g, "Gala \ud83c\udf33");
        assertTrue(d.accepts());
        assertFalse(d.canContinue());
        // a lone continuation byte or an overlong form is never viable
        assertNull(fed(g, "\u0080".substring(0, 0) + new String(new byte[] {(byte) 0x80}, StandardCharsets.ISO_8859_1)));
        EarleyChart e = g.newChart();
        assertFalse(e.feed(0xC0)); // C0 would start an overlong encoding (RFC 3629 §3)
        assertFalse(e.feed(0x80));
    }

    @Test
    void undefinedRuleIsNamed() {
        Grammar g = Grammar.of(List.of(Rule.of("tree", Expr.seq(Expr.text("T"), Expr.ref("rootstock")))), "tree");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> EarleyGrammar.compile(g));
        assertTrue(e.getMessage().contains("rootstock"), e.getMessage());
        IllegalArgumentException s = assertThrows(IllegalArgumentException.class,
                () -> EarleyGrammar.compile(g.withStart("orchard")));
        assertTrue(s.getMessage().contains("orchard"), s.getMessage());
    }

    @Test
    void emptyGrammarIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> EarleyGrammar.compile(Grammar.of(List.of(), "x")));
    }

    @Test
    void repetitionBoundsAreCapped() {
        assertThrows(IllegalArgumentException.class, () -> EarleyGrammar.compile(
                Abnf.parse("r = 10001\"a\"\n", "t").grammar()));
        EarleyGrammar g = EarleyGrammar.compile(Abnf.parse("r = 10000\"a\"\n", "t").grammar());
        assertTrue(accepts(g, "a".repeat(10000)));
        assertFalse(accepts(g, "a".repeat(9999)));
        assertNull(fed(g, "a".repeat(10001)));
    }

    @Test
    void ruleNamesAreCaseInsensitive() {
        // RFC 5234 §2.1: rule names are case-insensitive
        EarleyGrammar g = abnf("Orchard = 1*ROW\nrow = \"r\"\n");
        assertTrue(accepts(g, "rrr"));
        assertEquals("Orchard", g.startRule());
    }

    @Test
    void deeplyNestedGroupsCompileWithoutRecursion() {
        // 900 nested groups: the lowering uses work lists
        String text = "r = " + "(".repeat(900) + "\"a\"" + ")".repeat(900) + "\n";
        EarleyGrammar g = EarleyGrammar.compile(Abnf.parse(text, "t").grammar());
        assertTrue(accepts(g, "a"));
        Expr deep = Expr.text("b");
        for (int i = 0; i < 50_000; i++) {
            deep = Expr.choice(Expr.seq(deep, Expr.text("")), Expr.text("c"));
        }
        EarleyGrammar h = EarleyGrammar.compile(Grammar.single("deep", deep));
        assertTrue(accepts(h, "b"));
        assertTrue(accepts(h, "c"));
    }
}
