package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.assertCovers;
import static dev.espalier.abnf.IrShapes.only;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Severity;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Every diagnostic code of the front end, with its exact range; grammar facts cite RFC 5234. */
class AbnfDiagnosticsTest {

    private static AbnfResult parse(String text) {
        return Abnf.parse(text, "t.abnf");
    }

    @Test
    void proseValueCannotBeEnforced() {
        // RFC 5234 §4 prose-val: "prose description, to be used as last resort"
        String text = "tree = variety <graft date in words>\nvariety = \"Gala\"\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "prose-value");
        assertEquals(Severity.ERROR, d.severity());
        assertCovers(text, "<graft date in words>", 0, d.span());
        assertEquals(1, r.diagnostics().size());
        assertTrue(r.grammar().rule("variety").isPresent(), "later rules survive");
    }

    @Test
    void valueAboveUnicodeIsAnError() {
        String text = "r = %x110000\n";
        Diagnostic d = only(parse(text), "value-range");
        assertCovers(text, "110000", 0, d.span());
        assertTrue(d.message().contains("10FFFF"), d.message());
        // the largest scalar value is fine (Unicode: code points end at 10FFFF)
        assertEquals(List.of(), parse("r = %x10FFFF\n").diagnostics());
        // huge values do not overflow
        String big = "r = %d99999999999999999999999\n";
        assertCovers(big, "99999999999999999999999", 0, only(parse(big), "value-range").span());
    }

    @Test
    void surrogateIsAnError() {
        // Unicode: D800-DFFF are surrogates, not scalar values; UTF-8 cannot encode them (RFC 3629 §3)
        String text = "r = %x41.D800.42\n";
        Diagnostic d = only(parse(text), "value-range");
        assertCovers(text, "D800", 0, d.span());
        String range = "r = %x20-DFFF\n";
        assertCovers(range, "DFFF", 0, only(parse(range), "value-range").span());
        // a range that merely spans the surrogates has valid end points
        assertEquals(List.of(), parse("r = %x20-10FFFF\n").diagnostics());
    }

    @Test
    void reversedRangeIsAnError() {
        String text = "letter = %x5A-41\n";
        AbnfResult r = parse(text);
        assertCovers(text, "%x5A-41", 0, only(r, "value-range").span());
        assertEquals(CodePointSet.EMPTY, ((Expr.Chars) r.grammar().rule("letter").orElseThrow().body()).set());
    }

    @Test
    void badDigitForTheBaseIsAnError() {
        // RFC 5234 §4: bin-val uses BIT, dec-val DIGIT, hex-val HEXDIG
        String bin = "r = %b0102\n";
        assertCovers(bin, "2", 0, only(parse(bin), "value-range").span());
        String dec = "r = %d1A\n";
        assertCovers(dec, "A", 0, only(parse(dec), "value-range").span());
        String hex = "r = %x4G\n";
        assertCovers(hex, "G", 0, only(parse(hex), "value-range").span());
        String empty = "r = %x41.\n";
        assertCovers(empty, ".", 0, only(parse(empty), "value-range").span());
        String mixed = "r = %x41.42-43\n";
        assertCovers(mixed, "%x41.42-43", 0, only(parse(mixed), "value-range").span());
    }

    @Test
    void reversedRepeatBoundsAreAnError() {
        // RFC 5234 §3.6: <a>*<b>element means at least a and at most b
        String text = "r = 5*3DIGIT\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "repeat-bounds");
        assertEquals(Severity.ERROR, d.severity());
        assertCovers(text, "5*3", 0, d.span());
        String huge = "r = 3*99999999999DIGIT\n";
        assertCovers(huge, "3*99999999999", 0, only(parse(huge), "repeat-bounds").span());
    }

    @Test
    void secondDefinitionIsAnErrorSuggestingIncremental() {
        // RFC 5234 §3.3: further alternatives are added with =/
        String text = "fruit = \"apple\"\nfruit = \"pear\"\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "duplicate-definition");
        assertEquals(Severity.ERROR, d.severity());
        assertCovers(text, "fruit", 1, d.span());
        assertTrue(d.message().contains("=/"), d.message());
        // the first definition is kept; both names are definition sites (for rename)
        assertEquals("apple", ((Expr.Text) r.grammar().rule("fruit").orElseThrow().body()).text());
        assertEquals(2, r.sites().stream().filter(RuleSite::isDefinition).count());
    }

    @Test
    void incrementalWithoutDefinitionIsAWarningAndDefines() {
        String text = "orchard = row\nrow =/ \"tree\"\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "incremental-undefined");
        assertEquals(Severity.WARNING, d.severity());
        assertCovers(text, "row", 1, d.span());
        assertEquals(new Expr.Text("tree", true, dev.espalier.grammar.Span.NONE),
                IrShapes.strip(r.grammar().rule("row").orElseThrow().body()));
    }

    @Test
    void syntaxErrorDoesNotLoseTheFollowingRules() {
        String text = "orchard = row ) / (\nrow = \"tree\" / / \"bush\"\nvariety = \"Gala\"\n";
        AbnfResult r = parse(text);
        List<Diagnostic> syntax = r.diagnostics().stream().filter(d -> d.code().equals("syntax")).toList();
        assertTrue(syntax.size() >= 2, syntax::toString);
        assertCovers(text, ")", 0, syntax.get(0).span());
        assertTrue(syntax.get(0).message().startsWith("unexpected ')'"), syntax.get(0).message());
        assertEquals(List.of("orchard", "row", "variety"), r.grammar().rules().stream().map(Rule::name).toList());
        assertEquals(List.of(), r.diagnostics().stream().filter(d -> !d.code().equals("syntax")).toList());
    }

    @Test
    void missingElementAtEndOfFileIsReported() {
        String text = "orchard = row\nrow =";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "syntax");
        assertEquals(text.length(), d.span().start(), "reported at end of file");
        assertTrue(d.message().contains("end of file") && d.message().contains("element"), d.message());
        assertTrue(r.grammar().rule("row").isPresent(), "the broken rule still has a name: " + r.grammar().rules());
    }

    @Test
    void unindentedContinuationIsReported() {
        // RFC 5234 §4: rules continue only on lines that start with white space (c-wsp = WSP / (c-nl WSP))
        String text = "orchard = row\nrow\nvariety = \"Gala\"\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "syntax");
        assertCovers(text, "row", 1, d.span());
        assertTrue(r.grammar().rule("variety").isPresent());
    }

    @Test
    void strayCharactersAreOneDiagnosticPerRun() {
        String text = "orchard = row @@# row\nrow = \"t\"\n";
        AbnfResult r = parse(text);
        assertCovers(text, "@@#", 0, only(r, "syntax").span());
        assertEquals(2, ((Expr.Seq) r.grammar().rule("orchard").orElseThrow().body()).items().size());
    }

    @Test
    void spaceInsideARepetitionIsReported() {
        // RFC 5234 §4: repetition = [repeat] element, with no white space between them
        String text = "r = 3 DIGIT\n";
        AbnfResult r = parse(text);
        assertCovers(text, " ", 2, only(r, "syntax").span());
    }

    @Test
    void malformedUseDirectiveIsReported() {
        String text = ";@use rootstocks.abnf\nr = \"x\"\n";
        assertCovers(text, ";@use rootstocks.abnf", 0, only(parse(text), "import").span());
    }

    @Test
    void textBeforeTheFirstRuleIsReportedAndTheRulesStillRead() {
        String text = "= stray words\norchard = row\nrow = \"t\"\n";
        AbnfResult r = parse(text);
        assertCovers(text, "= stray words", 0, only(r, "syntax").span());
        assertEquals(List.of("orchard", "row"), r.grammar().rules().stream().map(Rule::name).toList());
    }

    @Test
    void missingClosingParenthesisIsReportedAndLaterRulesSurvive() {
        String text = "orchard = (row tree\nrow = \"r\"\ntree = \"t\"\n";
        AbnfResult r = parse(text);
        Diagnostic d = only(r, "syntax");
        assertTrue(d.message().contains("')'"), d.message());
        assertEquals(3, r.grammar().rules().size());
        assertEquals(2, ((Expr.Seq) r.grammar().rule("orchard").orElseThrow().body()).items().size());
    }
}
