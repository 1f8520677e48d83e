package dev.espalier.mask;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.ExprFold;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;

import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@link GrammarShape#reachesRecursion} against a plain twin: per reachable rule, a search of what it reaches. */
class GrammarShapeTest {

    /** The names (case-folded) a body refers to. */
    private static List<String> refs(Expr body) {
        List<String> out = new ArrayList<>();
        Deque<Expr> work = new ArrayDeque<>();
        work.push(body);
        while (!work.isEmpty()) {
            Expr e = work.pop();
            ExprFold.children(e).forEach(work::push);
            if (e instanceof Expr.Ref r) {
                out.add(Grammar.key(r.name()));
            }
        }
        return out;
    }

    /** The defined rules reachable in one or more steps from {@code from}. */
    private static Set<String> reachable(Grammar g, String from) {
        Set<String> seen = new HashSet<>();
        Deque<String> work = new ArrayDeque<>();
        g.rule(from).ifPresent(r -> work.push(r.key()));
        while (!work.isEmpty()) {
            String k = work.pop();
            Rule r = g.rule(k).orElse(null);
            if (r == null) {
                continue;
            }
            for (String x : refs(r.body())) {
                if (g.rule(x).isPresent() && seen.add(x)) {
                    work.push(x);
                }
            }
        }
        return seen;
    }

    private static boolean slowReachesRecursion(Grammar g) {
        Set<String> live = new HashSet<>(reachable(g, g.start()));
        g.rule(g.start()).ifPresent(r -> live.add(r.key()));
        for (String k : live) {
            if (reachable(g, k).contains(k)) {
                return true;
            }
        }
        return false;
    }

    @Test
    void agreesOnTheTestGrammarsAndTheSchemaCorpus() throws IOException {
        int recursive = 0;
        int checked = 0;
        for (String name : TestGrammars.ALL) {
            Grammar g = TestGrammars.load(name);
            boolean slow = slowReachesRecursion(g);
            assertEquals(slow, GrammarShape.reachesRecursion(g), name);
            recursive += slow ? 1 : 0;
            checked++;
        }
        try (Stream<Path> files = Files.list(Path.of("..", "grammars", "schemas"))) {
            for (Path p : files.filter(f -> f.toString().endsWith(".schema.json")).sorted().toList()) {
                String name = p.getFileName().toString().replace(".schema.json", "");
                Grammar g = TestGrammars.schema(name);
                boolean slow = slowReachesRecursion(g);
                assertEquals(slow, GrammarShape.reachesRecursion(g), name);
                recursive += slow ? 1 : 0;
                checked++;
            }
        }
        // both answers occur, so neither a constant true nor a constant false passes
        assertTrue(recursive > 0 && recursive < checked, recursive + " of " + checked);
    }

    @Test
    void agreesOnRandomRuleGraphs() {
        Random rnd = new Random(20261204);
        int recursive = 0;
        for (int trial = 0; trial < 2_000; trial++) {
            int n = 1 + rnd.nextInt(8);
            List<Rule> rules = new ArrayList<>();
            for (int i = 0; i < n; i++) {
                List<Expr> items = new ArrayList<>();
                items.add(Expr.chars(CodePointSet.of('a')));
                for (int k = rnd.nextInt(3); k > 0; k--) {
                    // names in either case, and now and then an undefined one
                    int to = rnd.nextInt(n + 1);
                    String name = (rnd.nextBoolean() ? "R" : "r") + to;
                    Expr ref = Expr.ref(name);
                    items.add(rnd.nextBoolean() ? ref : Expr.repeat(ref, 0, 1));
                }
                rules.add(Rule.of("r" + i, rnd.nextBoolean() ? Expr.seq(items.toArray(new Expr[0])) : Expr.choice(items.toArray(new Expr[0]))));
            }
            Grammar g = Grammar.of(rules, "r" + rnd.nextInt(n));
            boolean slow = slowReachesRecursion(g);
            assertEquals(slow, GrammarShape.reachesRecursion(g), () -> g.rules().toString());
            recursive += slow ? 1 : 0;
        }
        assertTrue(recursive > 200 && recursive < 1_800, recursive + " of 2000 recursive");
    }
}
