package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.assertCovers;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Exact source ranges: every rule name, reference, literal and operator node. Expected positions are
 * found with String.indexOf in the sample and recounted by the test helper, not taken from the reader.
 */
class AbnfSpanTest {

    private static final String SAMPLE = String.join("\r\n",
            "; inspection report of the orchard service",
            "report     = tree-id SP variety",
            "             *( SP \"graft\" ) [ %s\"Rootstock\" ]",
            "tree-id    = 2*4DIGIT / %x41-5A",
            "variety    = \"Cox\" / \"Gala\" ; apples",
            "variety    =/ %d80.101.97.114 ; \"Pear\"",
            "");

    private final AbnfResult result = Abnf.parse(SAMPLE, "orchard.abnf");

    @Test
    void sampleHasNoDiagnostics() {
        assertEquals(List.of(), result.diagnostics());
    }

    @Test
    void ruleNamesAndRuleSpans() {
        Rule report = result.grammar().rule("report").orElseThrow();
        assertCovers(SAMPLE, "report", 1, report.nameSpan()); // occurrence 0 is in the comment
        assertCovers(SAMPLE, "report     = tree-id SP variety\r\n             *( SP \"graft\" ) [ %s\"Rootstock\" ]",
                0, report.span());
        Rule variety = result.grammar().rule("variety").orElseThrow();
        assertCovers(SAMPLE, "variety    = \"Cox\"", 0, new Span(variety.nameSpan().start(),
                SAMPLE.indexOf("\"Cox\"") + 5, variety.nameSpan().line(), variety.nameSpan().column()));
        // the merged rule runs to the end of its =/ alternative (before the comment)
        assertEquals(SAMPLE.indexOf("%d80.101.97.114") + "%d80.101.97.114".length(), variety.span().end());
    }

    @Test
    void everyNodeOfAContinuedRuleHasItsOwnSpan() {
        Expr.Seq body = (Expr.Seq) result.grammar().rule("report").orElseThrow().body();
        assertCovers(SAMPLE, "tree-id SP variety\r\n             *( SP \"graft\" ) [ %s\"Rootstock\" ]", 0, body.span());
        assertCovers(SAMPLE, "tree-id", 0, body.items().get(0).span());
        assertCovers(SAMPLE, "SP", 0, body.items().get(1).span());
        assertCovers(SAMPLE, "variety", 0, body.items().get(2).span());
        // *( SP "graft" ): the Repeat covers star and parentheses, its body (the group's content) the inside
        Expr.Repeat star = (Expr.Repeat) body.items().get(3);
        assertCovers(SAMPLE, "*( SP \"graft\" )", 0, star.span());
        assertCovers(SAMPLE, "SP \"graft\"", 0, star.body().span());
        Expr.Seq inner = (Expr.Seq) star.body();
        assertCovers(SAMPLE, "SP", 1, inner.items().get(0).span());
        assertCovers(SAMPLE, "\"graft\"", 0, inner.items().get(1).span());
        // [ %s"Rootstock" ]: the option's Repeat covers the brackets, the literal its own text
        Expr.Repeat option = (Expr.Repeat) body.items().get(4);
        assertCovers(SAMPLE, "[ %s\"Rootstock\" ]", 0, option.span());
        assertCovers(SAMPLE, "%s\"Rootstock\"", 0, option.body().span());
        assertEquals(new Expr.Text("Rootstock", false, option.body().span()), option.body());
    }

    @Test
    void alternationRepeatAndValueSpans() {
        Expr.Choice tree = (Expr.Choice) result.grammar().rule("tree-id").orElseThrow().body();
        assertCovers(SAMPLE, "2*4DIGIT / %x41-5A", 0, tree.span());
        assertCovers(SAMPLE, "2*4DIGIT", 0, tree.options().get(0).span());
        assertCovers(SAMPLE, "DIGIT", 0, ((Expr.Repeat) tree.options().get(0)).body().span());
        assertCovers(SAMPLE, "%x41-5A", 0, tree.options().get(1).span());
        Expr.Choice variety = (Expr.Choice) result.grammar().rule("variety").orElseThrow().body();
        assertCovers(SAMPLE, "\"Cox\"", 0, variety.options().get(0).span());
        assertCovers(SAMPLE, "\"Gala\"", 0, variety.options().get(1).span());
        assertCovers(SAMPLE, "%d80.101.97.114", 0, variety.options().get(2).span());
        assertEquals("Pear", ((Expr.Text) variety.options().get(2)).text());
    }

    @Test
    void ruleSitesListEveryOccurrence() {
        List<RuleSite> sites = result.sites();
        List<String> shown = sites.stream().map(s -> s.name() + ":" + s.kind()).toList();
        assertEquals(List.of("report:DEFINITION", "tree-id:REFERENCE", "SP:REFERENCE", "variety:REFERENCE",
                "SP:REFERENCE", "tree-id:DEFINITION", "DIGIT:REFERENCE", "variety:DEFINITION",
                "variety:INCREMENTAL_DEFINITION"), shown);
        RuleSite extend = sites.get(8);
        assertCovers(SAMPLE, "variety", 2, extend.span());
        assertTrue(extend.isDefinition());
        assertEquals("orchard.abnf", extend.source());
        assertCovers(SAMPLE, "SP", 1, sites.get(4).span());
    }

    @Test
    void columnsCountUtf16UnitsAfterSupplementaryCharacters() {
        // LSP positions count UTF-16 code units (LSP specification, "Position"); the comment holds U+1F333
        String text = "; \uD83C\uDF33 orchard\nrow = \"\uD83C\uDF33\" tree\n";
        AbnfResult r = Abnf.parse(text, "t");
        assertEquals(List.of(), r.diagnostics());
        Expr.Seq row = (Expr.Seq) r.grammar().rule("row").orElseThrow().body();
        assertCovers(text, "\"\uD83C\uDF33\"", 0, row.items().get(0).span());
        assertCovers(text, "tree", 0, row.items().get(1).span());
    }
}
