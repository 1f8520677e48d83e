package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.assertCovers;
import static dev.espalier.abnf.IrShapes.only;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.Random;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;

/** Hostile and large input: reading always completes, in bounded time, with diagnostics instead of exceptions. */
class AbnfRobustnessTest {

    private static final Duration GENEROUS = Duration.ofSeconds(30);

    @Test
    void tenThousandRules() {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < 10_000; i++) {
            sb.append("tree-").append(i).append(" = \"row ").append(i).append("\" / tree-").append(i + 1)
                    .append(" ; work order ").append(i).append('\n');
        }
        sb.append("tree-10000 = %x41-5A\n");
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(sb.toString(), "many.abnf"));
        assertEquals(List.of(), r.diagnostics());
        assertEquals(10_001, r.grammar().rules().size());
        assertEquals("tree-0", r.grammar().start());
        assertEquals(10_001 + 10_000, r.sites().size());
    }

    @Test
    void oneMegabyteGrammar() {
        // one rule with a very long alternation over continuation lines, then a long concatenation
        StringBuilder sb = new StringBuilder("variety = \"v0\"");
        for (int i = 1; sb.length() < 600_000; i++) {
            sb.append(i % 8 == 0 ? "\n          / \"v" : " / \"v").append(i).append('"');
        }
        sb.append("\nrow = tree");
        while (sb.length() < 1_050_000) {
            sb.append(sb.length() % 80 < 5 ? "\n  tree" : " tree");
        }
        sb.append("\ntree = variety\n");
        String text = sb.toString();
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "big.abnf"));
        assertEquals(List.of(), r.diagnostics());
        assertTrue(((Expr.Choice) r.grammar().rule("variety").orElseThrow().body()).options().size() > 40_000);
        assertTrue(((Expr.Seq) r.grammar().rule("row").orElseThrow().body()).items().size() > 40_000);
    }

    @Test
    void nestingTenThousandDeepIsReportedAtTheOffendingParenthesis() {
        int depth = 10_000;
        String text = "deep = " + "(".repeat(depth) + "\"x\"" + ")".repeat(depth) + "\nnext = \"y\"\n";
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "deep.abnf"));
        Diagnostic d = only(r, "syntax");
        int offending = "deep = ".length() + Abnf.MAX_NESTING; // the 1001st '('
        assertEquals(offending, d.span().start());
        assertEquals(1, d.span().length());
        assertTrue(d.message().contains("nested deeper than 1000 levels"), d.message());
        // the deep rule keeps its name (empty body), the following rule is read normally
        assertEquals(List.of("deep", "next"), r.grammar().rules().stream().map(Rule::name).toList());
        assertEquals(List.of(), ((Expr.Choice) r.grammar().rule("deep").orElseThrow().body()).options());
    }

    @Test
    void unbalancedDeepNestingAndDeepOptions() {
        String text = "a = " + "[(".repeat(3000) + "\nb = \"y\"\n";
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "t"));
        assertTrue(r.diagnostics().stream().anyMatch(d -> d.message().contains("nested deeper")));
        assertTrue(r.grammar().rule("b").isPresent());
    }

    @Test
    void nestingAtTheLimitReadsOnAThreadWithTheDefaultStack() throws InterruptedException {
        // 1 MB is the JVM's default thread stack size on 64-bit Linux (from memory of the HotSpot defaults)
        String text = "deep = " + "(".repeat(Abnf.MAX_NESTING) + "\"x\"" + ")".repeat(Abnf.MAX_NESTING) + "\n";
        AtomicReference<AbnfResult> out = new AtomicReference<>();
        Thread t = new Thread(null, () -> out.set(Abnf.parse(text, "t")), "reader", 1 << 20);
        t.start();
        t.join(GENEROUS.toMillis());
        assertEquals(List.of(), out.get().diagnostics());
        Expr e = out.get().grammar().rule("deep").orElseThrow().body();
        assertEquals(new Expr.Text("x", true, e.span()), e, "a group is its content, however deep");
    }

    @Test
    void aSmallStackFallsBackToAShallowerLimit() throws InterruptedException {
        String text = "deep = " + "(".repeat(Abnf.MAX_NESTING) + "\"x\"" + ")".repeat(Abnf.MAX_NESTING) + "\nnext = deep\n";
        AtomicReference<AbnfResult> out = new AtomicReference<>();
        Thread t = new Thread(null, () -> out.set(Abnf.parse(text, "t")), "reader", 128 * 1024);
        t.start();
        t.join(GENEROUS.toMillis());
        AbnfResult r = out.get();
        assertTrue(r.grammar().rule("next").isPresent());
        if (r.diagnostics().isEmpty()) {
            // once the JIT has compiled the reader (other tests in this JVM read a lot of ABNF), its
            // frames are small enough for the full depth even on this stack: then it must read it all
            Expr e = r.grammar().rule("deep").orElseThrow().body();
            assertEquals(new Expr.Text("x", true, e.span()), e);
            return;
        }
        Diagnostic d = only(r, "syntax");
        assertTrue(d.message().contains("stack"), d.message());
    }

    @Test
    void binaryGarbage() {
        byte[] bytes = new byte[200_000];
        new Random(20240501).nextBytes(bytes);
        for (String text : List.of(new String(bytes, StandardCharsets.ISO_8859_1), new String(bytes, StandardCharsets.UTF_8),
                new String(bytes, StandardCharsets.UTF_16BE))) {
            AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "garbage.bin"));
            assertFalse(r.diagnostics().isEmpty());
            assertTrue(r.diagnostics().size() <= 1_000, "reports are capped: " + r.diagnostics().size());
            for (Diagnostic d : r.diagnostics()) {
                assertTrue(d.span().start() >= 0 && d.span().end() <= text.length() && d.span().line() >= 1, d::toString);
            }
        }
    }

    @Test
    void unterminatedStringIsReportedAtItsStart() {
        String text = "greeting = \"hello orchard\nnext = %s\"pear\n";
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "t"));
        List<Diagnostic> ds = r.diagnostics();
        assertEquals(2, ds.size(), ds::toString);
        assertCovers(text, "\"", 0, ds.get(0).span());
        assertCovers(text, "%s\"", 0, ds.get(1).span());
        // both rules survive, read to the end of their line
        assertEquals("hello orchard", ((Expr.Text) r.grammar().rule("greeting").orElseThrow().body()).text());
        assertEquals("pear", ((Expr.Text) r.grammar().rule("next").orElseThrow().body()).text());
    }

    @Test
    void emptyBlankAndNullInputs() {
        for (String text : new String[] {"", "   \n\t\n", "; only a comment", null, "\r\n\r\n"}) {
            AbnfResult r = Abnf.parse(text, null);
            assertEquals(List.of(), r.diagnostics(), String.valueOf(text));
            assertTrue(r.grammar().rules().isEmpty());
        }
    }

    @Test
    void manySmallErrorsStayBounded() {
        String text = "r = " + ") ".repeat(100_000) + "\n";
        AbnfResult r = assertTimeoutPreemptively(GENEROUS, () -> Abnf.parse(text, "t"));
        assertTrue(r.diagnostics().size() <= AbnfReader.MAX_SYNTAX_DIAGNOSTICS, "" + r.diagnostics().size());
    }
}
