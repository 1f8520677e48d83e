package dev.espalier.grammar;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;

/** Large and deep grammars are analysed in bounded time, on a small thread stack. */
class GrammarAnalysisScaleTest {

    /** Runs {@code body} on a thread with a 512 KiB stack, so that recursion proportional to input fails. */
    private static void onSmallStack(Runnable body) throws InterruptedException {
        AtomicReference<Throwable> failure = new AtomicReference<>();
        Thread t = new Thread(null, () -> {
            try {
                body.run();
            } catch (Throwable e) {
                failure.set(e);
            }
        }, "small-stack", 512 * 1024);
        t.start();
        t.join();
        if (failure.get() != null) {
            throw new AssertionError(failure.get());
        }
    }

    @Test
    void tenThousandRuleChain() {
        // r0 = "x" r1 / r1 "y" / ... / r9999 = "z": each rule reaches the end of the chain
        int n = 10_000;
        List<Rule> rules = new ArrayList<>();
        for (int i = 0; i < n - 1; i++) {
            Expr next = Expr.ref("r" + (i + 1));
            rules.add(Rule.of("r" + i, Expr.choice(Expr.seq(Expr.text("x"), next), Expr.seq(next, Expr.text("y")))));
        }
        rules.add(Rule.of("r" + (n - 1), Expr.text("z")));
        Grammar g = Grammar.of(rules, "r0");
        assertTimeoutPreemptively(Duration.ofSeconds(20), () -> onSmallStack(() -> {
            GrammarAnalysis a = GrammarAnalysis.of(g);
            assertEquals(List.of(), a.diagnostics());
            RuleFacts f = a.facts("r0");
            assertTrue(f.productive());
            assertEquals(n, f.shortestLength(), "one x or y per rule and the final z");
            assertEquals(n, f.shortest().orElseThrow().length());
            assertTrue(f.canStartWith('x') && f.canStartWith('z'));
            assertTrue(f.regular(), "no recursion at all");
            List<String> xs = a.examples(3, 1, 50);
            assertFalse(xs.isEmpty());
            for (String x : xs) {
                assertTrue(x.matches("x*zy*"), "chain shape");
            }
        }));
    }

    @Test
    void tenThousandMutuallyRecursiveRules() {
        // one big cycle r0 -> r1 -> ... -> r0, left-recursive, with a single exit at the end
        int n = 10_000;
        List<Rule> rules = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            Expr next = Expr.ref("r" + ((i + 1) % n));
            Expr body = i == n - 1 ? Expr.choice(Expr.seq(next, Expr.text("a")), Expr.text("b")) : next;
            rules.add(Rule.of("r" + i, body));
        }
        Grammar g = Grammar.of(rules, "r0");
        assertTimeoutPreemptively(Duration.ofSeconds(20), () -> onSmallStack(() -> {
            GrammarAnalysis a = GrammarAnalysis.of(g);
            assertTrue(a.facts("r0").leftRecursive());
            assertTrue(a.facts("r5000").regular(), "left-linear cycle");
            assertEquals("b", a.facts("r123").shortest().orElseThrow());
            assertEquals(n, a.diagnostics().stream().filter(d -> d.code().equals("left-recursion")).count());
        }));
    }

    @Test
    void tenThousandRulesFromAbnfText() {
        StringBuilder sb = new StringBuilder("start = r0\n");
        for (int i = 0; i < 10_000; i++) {
            sb.append("r").append(i).append(" = %s\"t").append(i).append("\" [r").append(i + 1).append("]\n");
        }
        sb.append("r10000 = DIGIT\nspare = %s\"q\"\n");
        assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
            AbnfResult r = AbnfCheck.check(sb.toString(), "big.abnf");
            assertEquals(List.of("unused-rule"), r.diagnostics().stream().map(Diagnostic::code).toList());
        });
    }

    @Test
    void deeplyNestedExpressions() {
        // 100,000 nested groups and repetitions, built in code
        Expr e = Expr.text("leaf");
        for (int i = 0; i < 100_000; i++) {
            e = i % 3 == 0 ? Expr.seq(Expr.text("("), e, Expr.text(")"))
                    : i % 3 == 1 ? Expr.choice(e, Expr.chars(CodePointSet.EMPTY)) : Expr.repeat(e, 0, 1);
        }
        Grammar g = Grammar.single("deep", e);
        assertTimeoutPreemptively(Duration.ofSeconds(30), () -> onSmallStack(() -> {
            GrammarAnalysis a = GrammarAnalysis.of(g);
            RuleFacts f = a.facts("deep");
            // the outermost layer (i = 99,999) is a bracketed sequence
            assertFalse(f.nullable());
            assertTrue(f.canStartWith('(') && !f.canStartWith('l'), "the innermost leaf is bracketed");
            assertEquals("()", f.shortest().orElseThrow(), "the optional layer inside is left out");
            assertTrue(f.regular());
            for (String x : a.examples(3, 9, 5)) {
                assertTrue(x.startsWith("(") && x.endsWith(")"), x);
            }
        }));
    }
}
