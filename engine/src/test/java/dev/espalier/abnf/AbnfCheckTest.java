package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.assertCovers;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Severity;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Optional;
import org.junit.jupiter.api.Test;

/** The checker's findings, each on a small grammar of the nursery scenario, with exact ranges. */
class AbnfCheckTest {

    private static List<Diagnostic> of(AbnfResult r, String code) {
        return r.diagnostics().stream().filter(d -> d.code().equals(code)).toList();
    }

    private static Diagnostic only(AbnfResult r, String code) {
        List<Diagnostic> ds = of(r, code);
        assertEquals(1, ds.size(), () -> "expected one " + code + " in " + r.diagnostics());
        return ds.get(0);
    }

    @Test
    void undefinedRuleAtEachReference() {
        String text = "tree = variety \"/\" rootstok \"/\" rootstok\nvariety = %s\"Gala\"\nrootstock = %s\"M9\"\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        List<Diagnostic> ds = of(r, "undefined-rule");
        assertEquals(2, ds.size(), r.diagnostics()::toString);
        assertCovers(text, "rootstok", 0, ds.get(0).span());
        assertCovers(text, "rootstok", 1, ds.get(1).span());
        assertEquals(Severity.ERROR, ds.get(0).severity());
    }

    @Test
    void coreRulesAreNotUndefined() {
        // RFC 5234 Appendix B.1 core rules need no definition
        AbnfResult r = AbnfCheck.check("graft-year = 4DIGIT\n", "t.abnf");
        assertEquals(List.of(), of(r, "undefined-rule"));
    }

    @Test
    void unusedRuleAtItsName() {
        String text = "tree = variety\nvariety = %s\"Gala\"\nrootstock = %s\"M9\"\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        Diagnostic d = only(r, "unused-rule");
        assertEquals(Severity.WARNING, d.severity());
        assertCovers(text, "rootstock", 0, d.span());
    }

    @Test
    void unusedImportedRulesAreNotReported() {
        String main = ";@use \"stock.abnf\"\ntree = rootstock\n";
        String stock = "rootstock = %s\"M9\" / %s\"M26\"\nseedling = %s\"wild\"\n";
        AbnfResult r = AbnfCheck.checkWithImports(main, "main.abnf",
                (from, path) -> Optional.of(new ImportResolver.Source("stock.abnf", stock)));
        assertEquals(List.of(), of(r, "unused-rule"), r.diagnostics()::toString);
        assertTrue(r.grammar().rule("seedling").isPresent());
    }

    @Test
    void nonProductiveRuleAndEmptyLanguage() {
        // a = "x" a derives no finite string: every derivation step adds another a (common practice)
        String text = "row = %s\"x\" row\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        Diagnostic d = only(r, "non-productive");
        assertEquals(Severity.ERROR, d.severity());
        assertCovers(text, "row", 0, d.span());
        Diagnostic e = only(r, "empty-language");
        assertCovers(text, "row", 0, e.span());
    }

    @Test
    void nonProductiveOnlyWhereRecursionHasNoExit() {
        String text = "orchard = block\nblock = %s\"B\" / rows\nrows = %s\"r\" rows\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        assertCovers(text, "rows", 1, only(r, "non-productive").span());
        assertEquals(List.of(), of(r, "empty-language"));
    }

    @Test
    void undefinedReferenceDoesNotCascade() {
        String text = "tree = variety\nvariety = kultivar %s\"x\"\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        assertEquals(1, of(r, "undefined-rule").size());
        assertEquals(List.of(), of(r, "non-productive"), "only the undefined reference is the mistake");
        assertCovers(text, "tree", 0, only(r, "empty-language").span());
    }

    @Test
    void plainQuotedStringWithLettersGetsAHint() {
        // RFC 5234 §2.3: "ABNF strings are case insensitive"; RFC 7405 adds %s and %i
        String text = "variety = \"Gala\" / %s\"Fuji\" / %i\"Elstar\" / \"42\" / %d71.97\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        Diagnostic d = only(r, "case-insensitive-string");
        assertEquals(Severity.HINT, d.severity());
        assertCovers(text, "\"Gala\"", 0, d.span());
        assertTrue(d.message().contains("%s\"Gala\""), d.message());
    }

    @Test
    void directLeftRecursion() {
        String text = "rows = rows \",\" row / row\nrow = %x30-39\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        Diagnostic d = only(r, "left-recursion");
        assertEquals(Severity.INFORMATION, d.severity());
        assertCovers(text, "rows", 0, d.span());
        assertTrue(d.message().contains("Earley"), d.message());
    }

    @Test
    void leftRecursionThroughNullablePrefixes() {
        // a reaches b first (ws is optional) and b reaches a after *ws, which may be empty
        String text = "a = [ws] b %s\"x\" / %s\"y\"\nb = *ws a\nws = %x20\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        List<Diagnostic> ds = of(r, "left-recursion");
        assertEquals(2, ds.size(), r.diagnostics()::toString);
        assertCovers(text, "a", 0, ds.get(0).span());
        assertCovers(text, "b", 1, ds.get(1).span());
    }

    @Test
    void rightRecursionIsNotLeftRecursion() {
        AbnfResult r = AbnfCheck.check("list = item [\",\" list]\nitem = %x61-7A\n", "t.abnf");
        assertEquals(List.of(), of(r, "left-recursion"));
    }

    @Test
    void diagnosticsAreMergedInOrder() {
        String text = "tree = <a tree> kultivar\nkultivar = %s\"x\"\nspare = %s\"y\"\n";
        AbnfResult r = AbnfCheck.check(text, "t.abnf");
        List<String> codes = r.diagnostics().stream().map(Diagnostic::code).toList();
        // the front end's prose-value, then the analysis's unused-rule; the start rule matches nothing
        assertTrue(codes.contains("prose-value") && codes.contains("unused-rule"), codes::toString);
        for (int i = 1; i < r.diagnostics().size(); i++) {
            assertTrue(r.diagnostics().get(i - 1).span().start() <= r.diagnostics().get(i).span().start());
        }
    }

    @Test
    void rfc5234SectionFourHasOnlyHints() throws IOException {
        // RFC 5234 §4 is a complete, well-formed grammar: everything is reachable from rulelist and
        // every rule derives something; its plain strings such as "b" are case-insensitive (§2.3)
        String text;
        try (InputStream in = getClass().getResourceAsStream("rfc5234-section4.abnf")) {
            text = new String(in.readAllBytes(), StandardCharsets.US_ASCII);
        }
        AbnfResult r = AbnfCheck.check(text, "rfc5234-section4.abnf");
        List<Diagnostic> serious = r.diagnostics().stream().filter(d -> d.severity() != Severity.HINT).toList();
        assertEquals(List.of(), serious);
        // bin-val = "b" ..., dec-val = "d" ..., hex-val = "x" ... have letters
        List<Diagnostic> hints = of(r, "case-insensitive-string");
        assertEquals(3, hints.size(), hints::toString);
        assertCovers(text, "\"b\"", 0, hints.get(0).span());
    }
}
