package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.strip;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

/** RFC 5234's ABNF definition of ABNF (section 4) read by the front end. */
class AbnfRfcTest {

    private static String rfcSection4() throws IOException {
        try (InputStream in = AbnfRfcTest.class.getResourceAsStream("rfc5234-section4.abnf")) {
            return new String(in.readAllBytes(), StandardCharsets.US_ASCII);
        }
    }

    @Test
    void rfc5234SectionFourReadsWithoutDiagnostics() throws IOException {
        AbnfResult r = Abnf.parse(rfcSection4(), "rfc5234-section4.abnf");
        assertEquals(List.of(), r.diagnostics());
        // RFC 5234 §4 defines 21 rules, rulelist first
        List<String> own = List.of("rulelist", "rule", "rulename", "defined-as", "elements", "c-wsp", "c-nl",
                "comment", "alternation", "concatenation", "repetition", "repeat", "element", "group", "option",
                "char-val", "num-val", "bin-val", "dec-val", "hex-val", "prose-val");
        List<String> names = r.grammar().rules().stream().map(Rule::name).toList();
        assertEquals(own, names.subList(0, own.size()));
        assertEquals("rulelist", r.grammar().start());
        // it uses the core rules ALPHA DIGIT WSP CRLF VCHAR DQUOTE BIT HEXDIG, and through WSP and CRLF
        // (RFC 5234 Appendix B.1) also SP HTAB CR LF: 12 more, 33 in all
        assertEquals(List.of("ALPHA", "BIT", "CR", "CRLF", "DIGIT", "DQUOTE", "HEXDIG", "HTAB", "LF", "SP", "VCHAR", "WSP"),
                names.subList(own.size(), names.size()));
    }

    @Test
    void rfc5234RepeatRuleHasTheShapeOfItsText() throws IOException {
        // repeat = 1*DIGIT / (*DIGIT "*" *DIGIT)     (RFC 5234 §4)
        Rule repeat = Abnf.parse(rfcSection4(), "x").grammar().rule("repeat").orElseThrow();
        Expr digit = new Expr.Ref("DIGIT", dev.espalier.grammar.Span.NONE);
        Expr expected = Expr.choice(
                Expr.repeat(digit, 1, Expr.UNBOUNDED),
                Expr.seq(Expr.repeat(digit, 0, Expr.UNBOUNDED), new Expr.Text("*", true, dev.espalier.grammar.Span.NONE),
                        Expr.repeat(digit, 0, Expr.UNBOUNDED)));
        assertEquals(expected, strip(repeat.body()));
    }

    @Test
    void rfc5234ContinuationLinesBelongToTheirRule() throws IOException {
        // element = rulename / group / option /
        //           char-val / num-val / prose-val       (RFC 5234 §4, continued on the next line)
        Expr element = Abnf.parse(rfcSection4(), "x").grammar().rule("element").orElseThrow().body();
        assertTrue(element instanceof Expr.Choice c && c.options().size() == 6, element::toString);
    }

    @Test
    void coreRulesFollowAppendixB() {
        // RFC 5234 Appendix B.1: ALPHA = %x41-5A / %x61-7A, DIGIT = %x30-39, VCHAR = %x21-7E, OCTET = %x00-FF;
        // java.lang.Character as an independent reference for the ASCII letter and digit classes
        AbnfResult r = Abnf.parse("x = ALPHA DIGIT VCHAR OCTET CTL HEXDIG\n", "t");
        CodePointSet alpha = charsUnion(r.grammar().rule("ALPHA").orElseThrow().body());
        CodePointSet digit = charsUnion(r.grammar().rule("DIGIT").orElseThrow().body());
        for (int c = 0; c < 0x250; c++) {
            boolean asciiLetter = c < 0x80 && Character.isLetter(c);
            boolean asciiDigit = c < 0x80 && Character.isDigit(c);
            assertEquals(asciiLetter, alpha.contains(c), "ALPHA at " + c);
            assertEquals(asciiDigit, digit.contains(c), "DIGIT at " + c);
        }
        assertEquals(CodePointSet.range(0x21, 0x7E), charsUnion(r.grammar().rule("VCHAR").orElseThrow().body()));
        // OCTET in our Unicode reading: the code points U+0000..U+00FF
        assertEquals(CodePointSet.range(0, 0xFF), charsUnion(r.grammar().rule("OCTET").orElseThrow().body()));
        // CTL = %x00-1F / %x7F: java.lang.Character.isISOControl also covers 80-9F, so compare below 0x80 only
        CodePointSet ctl = charsUnion(r.grammar().rule("CTL").orElseThrow().body());
        for (int c = 0; c < 0x80; c++) {
            assertEquals(Character.isISOControl(c), ctl.contains(c), "CTL at " + c);
        }
        assertFalse(r.grammar().rule("WSP").isPresent(), "WSP is not referenced, so not added");
        assertTrue(r.grammar().rules().stream().allMatch(rule -> rule.name().equals("x") || !rule.nameSpan().isKnown()));
    }

    @Test
    void aFileMayRedefineACoreRule() {
        AbnfResult r = Abnf.parse("hex = 2HEXDIG\nDIGIT = %x30-37\n", "t");
        assertEquals(List.of(), r.diagnostics());
        Rule digit = r.grammar().rule("digit").orElseThrow();
        assertTrue(digit.nameSpan().isKnown(), "the file's own DIGIT is used");
        assertEquals(CodePointSet.range(0x30, 0x37), charsUnion(digit.body()));
        assertEquals(List.of("hex", "DIGIT", "HEXDIG"), r.grammar().rules().stream().map(Rule::name).toList());
    }

    /** The union of the Chars (and one-letter Texts) an expression offers, for set-valued core rules. */
    private static CodePointSet charsUnion(Expr e) {
        if (e instanceof Expr.Chars c) {
            return c.set();
        }
        if (e instanceof Expr.Choice c) {
            CodePointSet s = CodePointSet.EMPTY;
            for (Expr o : c.options()) {
                s = s.union(charsUnion(o));
            }
            return s;
        }
        throw new AssertionError("not a character class: " + e);
    }
}
