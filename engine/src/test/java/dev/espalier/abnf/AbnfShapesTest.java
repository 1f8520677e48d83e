package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.body;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The worked examples of RFC 5234 §2-§3 and RFC 7405 §2, mapped to IR. Where the RFC states that two
 * spellings mean the same, both are read and compared without their spans.
 */
class AbnfShapesTest {

    private static Expr ref(String n) {
        return new Expr.Ref(n, Span.NONE);
    }

    private static Expr text(String s, boolean ignoreCase) {
        return new Expr.Text(s, ignoreCase, Span.NONE);
    }

    @Test
    void quotedStringIsCaseInsensitive() {
        // RFC 5234 §2.3: rulename = "abc" matches "abc", "Abc", "aBc", ... (case-insensitive)
        assertEquals(text("abc", true), body("rulename = \"abc\"\n", "rulename"));
    }

    @Test
    void caseSensitiveStringOfRfc7405EqualsDottedDecimals() {
        // RFC 7405 §2.1: rulename = %s"aBc" is the same as rulename = %d97.66.99
        assertEquals(text("aBc", false), body("rulename = %s\"aBc\"\n", "rulename"));
        assertEquals(body("rulename = %d97.66.99\n", "rulename"), body("rulename = %s\"aBc\"\n", "rulename"));
        // RFC 7405 §2.1: %i"abc" is the same as "abc"
        assertEquals(body("r = \"abc\"\n", "r"), body("r = %i\"abc\"\n", "r"));
        // the prefixes are literal ABNF strings, so upper case works too (RFC 5234 §2.3)
        assertEquals(text("aBc", false), body("r = %S\"aBc\"\n", "r"));
    }

    @Test
    void dottedValuesAreACaseSensitiveString() {
        // RFC 5234 §2.3: CRLF = %d13.10 ; and rulename = %d97.98.99 matches only lower-case "abc"
        assertEquals(text("\r\n", false), body("CRLF = %d13.10\n", "CRLF"));
        assertEquals(text("\r\n", false), body("CRLF = %x0D.0A\n", "CRLF"));
        assertEquals(text("abc", false), body("rulename = %d97.98.99\n", "rulename"));
        // binary: %b1100001 is 'a' (97)
        assertEquals(text("ab", false), body("r = %b1100001.1100010\n", "r"));
    }

    @Test
    void singleValuesAndRangesAreCodePointSets() {
        // RFC 5234 §3.4: DIGIT = %x30-39 is "0" / "1" / ... / "9"
        assertEquals(new Expr.Chars(CodePointSet.range('0', '9'), Span.NONE), body("DIGIT = %x30-39\n", "DIGIT"));
        // RFC 5234 §2.3: %d13 is carriage return; %x0D the same
        assertEquals(new Expr.Chars(CodePointSet.of(13), Span.NONE), body("CR = %d13\n", "CR"));
        assertEquals(body("CR = %d13\n", "CR"), body("CR = %x0D\n", "CR"));
        assertEquals(body("CR = %d13\n", "CR"), body("CR = %b1101\n", "CR"));
        // values above FF are code points, up to 10FFFF (Unicode scalar values, matched as UTF-8)
        assertEquals(new Expr.Chars(CodePointSet.range(0x1F600, 0x10FFFF), Span.NONE), body("e = %x1F600-10FFFF\n", "e"));
        // a dotted value beyond the BMP is one code point of the string, not two UTF-16 halves
        assertEquals(text(new String(Character.toChars(0x1F34E)) + "!", false), body("apple = %x1F34E.21\n", "apple"));
    }

    @Test
    void concatenationAndAlternatives() {
        // RFC 5234 §3.1: foo = %x61 ; a   bar = %x62 ; b   mumble = foo bar foo
        String g = "foo = %x61 ; a\nbar = %x62 ; b\nmumble = foo bar foo\n";
        assertEquals(Expr.seq(ref("foo"), ref("bar"), ref("foo")), body(g, "mumble"));
        // RFC 5234 §3.2: foo / bar
        assertEquals(Expr.choice(ref("foo"), ref("bar")), body("r = foo / bar\n", "r"));
    }

    @Test
    void incrementalAlternativesMergeIntoOneChoice() {
        // RFC 5234 §3.3: ruleset = alt1 / alt2 ; ruleset =/ alt3 ; ruleset =/ alt4 / alt5
        // is the same as ruleset = alt1 / alt2 / alt3 / alt4 / alt5
        String incremental = "ruleset = alt1 / alt2\nruleset =/ alt3\nruleset =/ alt4 / alt5\n";
        assertEquals(body("ruleset = alt1 / alt2 / alt3 / alt4 / alt5\n", "ruleset"), body(incremental, "ruleset"));
        // rule names are case-insensitive (RFC 5234 §2.1): RuleSet =/ extends ruleset
        assertEquals(Expr.choice(ref("a"), ref("b")), body("ruleset = a\nRuleSet =/ b\n", "RULESET"));
        AbnfResult r = Abnf.parse(incremental, "t");
        assertEquals(1, r.grammar().rules().size());
        Rule rule = r.grammar().rule("ruleset").orElseThrow();
        // the rule's span runs from its name to the end of its last alternative
        assertEquals(0, rule.span().start());
        assertEquals(incremental.indexOf("alt5") + 4, rule.span().end());
    }

    @Test
    void groupingChangesTheMeaning() {
        // RFC 5234 §3.5: elem (foo / bar) blat  differs from  elem foo / bar blat,
        // which is (elem foo) / (bar blat)
        assertEquals(Expr.seq(ref("elem"), Expr.choice(ref("foo"), ref("bar")), ref("blat")),
                body("r = elem (foo / bar) blat\n", "r"));
        assertEquals(Expr.choice(Expr.seq(ref("elem"), ref("foo")), Expr.seq(ref("bar"), ref("blat"))),
                body("r = elem foo / bar blat\n", "r"));
        assertEquals(body("r = (elem foo) / (bar blat)\n", "r"), body("r = elem foo / bar blat\n", "r"));
    }

    @Test
    void repetitionForms() {
        // RFC 5234 §3.6: <a>*<b>element, defaults 0 and infinity: *element, 1*element, 3*3element, 1*2element
        assertEquals(Expr.repeat(ref("element"), 0, Expr.UNBOUNDED), body("r = *element\n", "r"));
        assertEquals(Expr.repeat(ref("element"), 1, Expr.UNBOUNDED), body("r = 1*element\n", "r"));
        assertEquals(Expr.repeat(ref("element"), 3, 3), body("r = 3*3element\n", "r"));
        assertEquals(Expr.repeat(ref("element"), 1, 2), body("r = 1*2element\n", "r"));
        assertEquals(Expr.repeat(ref("element"), 0, 4), body("r = *4element\n", "r"));
        // RFC 5234 §3.7: <n>element is <n>*<n>element; 2DIGIT is two digits, 3ALPHA three letters
        assertEquals(body("r = 2*2DIGIT\n", "r"), body("r = 2DIGIT\n", "r"));
        assertEquals(Expr.repeat(ref("ALPHA"), 3, 3), body("r = 3ALPHA\n", "r"));
        // RFC 5234 §3.6 example *1( ... ): at most one of a group
        assertEquals(Expr.repeat(Expr.seq(ref("foo"), ref("bar")), 0, 1), body("r = *1( foo bar )\n", "r"));
    }

    @Test
    void optionIsAtMostOne() {
        // RFC 5234 §3.8: [foo bar] is equivalent to *1(foo bar)
        assertEquals(body("r = *1(foo bar)\n", "r"), body("r = [foo bar]\n", "r"));
        // a count applies to the option as a whole: 2[x] is two of "at most one x"
        assertEquals(Expr.repeat(Expr.repeat(ref("x"), 0, 1), 2, 2), body("r = 2[x]\n", "r"));
    }

    @Test
    void commentsAndLineEndsAreLiberal() {
        // RFC 5234 §3.9 comments; CRLF, LF, CR line ends, tabs, no final newline, uniform indent (common practice)
        String lf = "nursery = tree *( \",\" tree ) ; trees\ntree = \"apple\" / \"pear\"";
        String crlf = lf.replace("\n", "\r\n");
        String cr = lf.replace("\n", "\r");
        String indented = "    nursery = tree\n\t\t*( \",\" tree )\n    tree =\t\"apple\" / \"pear\"\n";
        Expr expected = body(lf, "nursery");
        assertEquals(expected, body(crlf, "nursery"));
        assertEquals(expected, body(cr, "nursery"));
        assertEquals(expected, body(indented, "nursery"));
        assertEquals(body(lf, "tree"), body(indented, "tree"));
    }

    @Test
    void firstRuleIsTheStartRule() {
        AbnfResult r = Abnf.parse("work-order = tree-id SP graft-date\ntree-id = 1*DIGIT\ngraft-date = 8DIGIT\n", "t");
        assertEquals("work-order", r.grammar().start());
        assertEquals(List.of("work-order", "tree-id", "graft-date", "DIGIT", "SP"),
                r.grammar().rules().stream().map(Rule::name).toList());
    }

    @Test
    void definitionNameMayStandOnItsOwnLine() {
        // RFC 5234 §4: defined-as = *c-wsp ("=" / "=/") *c-wsp, and c-wsp may be a newline followed by white space
        assertEquals(ref("b"), body("a\n  = b\n", "a"));
        assertTrue(Abnf.parse("a\n  = b\n", "t").grammar().rule("a").isPresent());
    }
}
