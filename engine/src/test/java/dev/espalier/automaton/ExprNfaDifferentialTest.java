package dev.espalier.automaton;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import dk.brics.automaton.Automaton;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.function.Function;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * The direct compiler ({@link ByteDfa#fromExpr}, through {@link ExprNfa}) against its slow twin,
 * {@link CharAutomata} followed by {@link ByteDfa#fromCharAutomaton}: both minimal DFAs must accept
 * the same byte strings, checked by a walk over pairs of states (a counterexample is printed).
 * Expressions come from a seeded random generator, every rule of the grammar library, and the
 * grammars the schema compiler makes for the orchard corpus.
 */
class ExprNfaDifferentialTest {

    private static final int LIMIT = 10_000;

    /** A byte string accepted by exactly one of the two, or null when their languages are equal. */
    static String difference(ByteDfa a, ByteDfa b) {
        if (a.isEmpty() || b.isEmpty()) {
            return a.isEmpty() == b.isEmpty() ? null : "(one language is empty)";
        }
        Map<Long, String> seen = new HashMap<>();
        ArrayDeque<long[]> work = new ArrayDeque<>();
        seen.put(pair(a.start(), b.start()), "");
        work.add(new long[] {a.start(), b.start()});
        while (!work.isEmpty()) {
            long[] p = work.poll();
            int x = (int) p[0];
            int y = (int) p[1];
            String path = seen.get(pair(x, y));
            if (a.accepts(x) != b.accepts(y)) {
                return path;
            }
            for (int by = 0; by < 256; by++) {
                int nx = a.step(x, by);
                int ny = b.step(y, by);
                if ((nx == ByteDfa.DEAD) != (ny == ByteDfa.DEAD)) {
                    return path + String.format("\\x%02X", by);
                }
                if (nx != ByteDfa.DEAD && seen.putIfAbsent(pair(nx, ny), path + String.format("\\x%02X", by)) == null) {
                    work.add(new long[] {nx, ny});
                }
            }
        }
        return null;
    }

    private static long pair(int x, int y) {
        return ((long) x << 32) | (y & 0xFFFFFFFFL);
    }

    /** Compares both compilers on one expression; false when the slow twin cannot build it. */
    static boolean agree(String where, Expr e, Function<String, Expr> rules) {
        ByteDfa slow;
        ByteDfa slowWithoutEmpty;
        try {
            Automaton a = CharAutomata.compileUnminimized(e, rules, LIMIT);
            slow = ByteDfa.fromCharAutomaton(a, LIMIT);
            slowWithoutEmpty = ByteDfa.fromCharAutomaton(a.minus(Automaton.makeEmptyString()), LIMIT);
        } catch (AutomatonTooLargeException | IllegalArgumentException | StackOverflowError x) {
            return false;
        }
        ByteDfa fast = ByteDfa.fromExpr(e, rules, LIMIT);
        assertNull(difference(slow, fast), () -> where + ": the languages differ on the bytes shown");
        assertEquals(slow.stateCount(), fast.stateCount(), () -> where + ": minimal automata differ in size");
        // without minimisation: the same language, no state that cannot be completed, and the same minimal automaton
        ByteDfa unminimized = ByteDfa.fromExprUnminimized(e, rules, LIMIT, LIMIT);
        assertNull(difference(slow, unminimized), () -> where + " (unminimized): the languages differ on the bytes shown");
        for (int s = 0; s < unminimized.stateCount(); s++) {
            int state = s;
            assertTrue(unminimized.accepts(s) || unminimized.canContinue(s),
                    () -> where + " (unminimized): state " + state + " cannot be completed");
        }
        assertTrue(unminimized.stateCount() >= slow.stateCount(), where);
        assertEquals(slow.stateCount(), unminimized.minimal().stateCount(),
                () -> where + ": the unminimized automaton minimises to another size");
        assertNull(difference(slow, unminimized.minimal()), () -> where + " (minimised again): the languages differ");
        ByteDfa fastWithoutEmpty = fast.withoutEmptyString();
        assertNull(difference(slowWithoutEmpty, fastWithoutEmpty),
                () -> where + " (without the empty string): the languages differ on the bytes shown");
        assertEquals(slowWithoutEmpty.stateCount(), fastWithoutEmpty.stateCount(),
                () -> where + " (without the empty string): minimal automata differ in size");
        return true;
    }

    @Test
    void randomExpressionsAgree() {
        Random rnd = new Random(20261203);
        Map<String, Expr> rules = new HashMap<>();
        // rules refer only to rules of lower number: no recursion
        for (int i = 0; i < 6; i++) {
            rules.put("r" + i, random(rnd, 3, i));
        }
        Function<String, Expr> lookup = n -> rules.get(n);
        int compared = 0;
        for (int i = 0; i < 1_500; i++) {
            Expr e = random(rnd, 4, 6);
            if (agree("random expression " + i + ": " + e, e, lookup)) {
                compared++;
            }
        }
        assertTrue(compared > 1_400, "compared " + compared);
    }

    private static final CodePointSet[] SETS = {
        CodePointSet.range('a', 'c'), CodePointSet.of('x'), CodePointSet.range(0x7F, 0x800),
        CodePointSet.range(0xD000, 0xE100), // crosses the surrogates, which have no UTF-8 form
        CodePointSet.range(0xFFF0, 0x10010), CodePointSet.range(0x10FFF0, CodePointSet.MAX),
        CodePointSet.ALL, CodePointSet.ofRanges('0', '9', 'A', 'F'),
    };

    private static final String[] TEXTS = {"", "ab", "Ab", "é", "\uD83C\uDF4E", "x\uD800", "-"};

    static Expr random(Random rnd, int depth, int ruleCount) {
        int k = rnd.nextInt(depth <= 0 ? 3 : 7);
        switch (k) {
            case 0:
                return Expr.chars(SETS[rnd.nextInt(SETS.length)]);
            case 1:
                return new Expr.Text(TEXTS[rnd.nextInt(TEXTS.length)], rnd.nextBoolean(), dev.espalier.grammar.Span.NONE);
            case 2:
                return ruleCount == 0 ? Expr.text("r") : Expr.ref("r" + rnd.nextInt(ruleCount));
            case 3: {
                List<Expr> items = new ArrayList<>();
                for (int i = rnd.nextInt(4); i > 0; i--) {
                    items.add(random(rnd, depth - 1, ruleCount));
                }
                return new Expr.Seq(items, dev.espalier.grammar.Span.NONE);
            }
            case 4: {
                List<Expr> options = new ArrayList<>();
                for (int i = 1 + rnd.nextInt(3); i > 0; i--) {
                    options.add(random(rnd, depth - 1, ruleCount));
                }
                return new Expr.Choice(options, dev.espalier.grammar.Span.NONE);
            }
            default: {
                int min = rnd.nextInt(3);
                int max = rnd.nextInt(4) == 0 ? Expr.UNBOUNDED : min + rnd.nextInt(4);
                return Expr.repeat(random(rnd, depth - 1, ruleCount), min, max);
            }
        }
    }

    @Test
    void everyRuleOfTheGrammarLibraryAgrees() throws IOException {
        List<Path> files;
        try (Stream<Path> s = Files.list(Path.of("..", "grammars"))) {
            files = s.filter(p -> p.toString().endsWith(".abnf")).sorted().toList();
        }
        assertTrue(files.size() >= 10, "library grammars: " + files.size());
        int compared = 0;
        for (Path f : files) {
            AbnfResult r = Abnf.parseWithImports(f);
            Grammar g = r.grammar();
            Function<String, Expr> rules = n -> g.rule(n).map(Rule::body).orElse(null);
            for (Rule rule : g.rules()) {
                if (!recursive(g, rule.name()) && agree(f.getFileName() + " rule " + rule.name(), Expr.ref(rule.name()), rules)) {
                    compared++;
                }
            }
        }
        assertTrue(compared > 200, "rules compared: " + compared);
    }

    @Test
    void schemaCorpusGrammarsAgree() throws IOException {
        List<Path> files;
        try (Stream<Path> s = Files.list(Path.of("..", "grammars", "schemas"))) {
            files = s.filter(p -> p.toString().endsWith(".schema.json")).sorted().toList();
        }
        int compared = 0;
        for (Path f : files) {
            Grammar g = JsonSchemas.compile(Files.readString(f, StandardCharsets.UTF_8), SchemaOptions.defaults()).grammar();
            if (g.rules().size() > 200 || recursive(g, g.start())) {
                continue; // the slow twin copies shared rules per reference: too slow for rule-per-state strings
            }
            if (agree(f.getFileName().toString(), Expr.ref(g.start()), n -> g.rule(n).map(Rule::body).orElse(null))) {
                compared++;
            }
        }
        assertTrue(compared >= 20, "schemas compared: " + compared);
    }

    @Test
    void byteClassesAfterAHashCollisionAreTheSame() throws IOException {
        // every column hashed alike: the classes come from comparing columns in full; large schemas
        // included (the unminimized route, as Constraint.grammar takes it) and a trimmed one
        List<Path> files;
        try (Stream<Path> s = Files.list(Path.of("..", "grammars", "schemas"))) {
            files = s.filter(p -> p.toString().endsWith(".schema.json")).sorted().toList();
        }
        int compared = 0;
        int merged = 0;
        for (Path f : files) {
            Grammar g = JsonSchemas.compile(Files.readString(f, StandardCharsets.UTF_8), SchemaOptions.defaults()).grammar();
            if (recursive(g, g.start())) {
                continue;
            }
            Function<String, Expr> rules = n -> g.rule(n).map(Rule::body).orElse(null);
            for (boolean minimal : new boolean[] {false, true}) {
                ByteDfa hashed;
                try {
                    hashed = ByteDfa.determinize(ExprNfa.of(Expr.ref(g.start()), rules, 4 * LIMIT, LIMIT),
                            2 * LIMIT, LIMIT, minimal, false);
                } catch (AutomatonTooLargeException e) {
                    continue; // a schema the constraint leaves to the parser
                }
                ByteDfa collided = ByteDfa.determinize(ExprNfa.of(Expr.ref(g.start()), rules, 4 * LIMIT, LIMIT),
                        2 * LIMIT, LIMIT, minimal, true);
                assertEquals(hashed.classCount(), collided.classCount(), f.toString());
                assertEquals(hashed.stateCount(), collided.stateCount(), f.toString());
                for (int b = 0; b < 256; b++) {
                    for (int c = 0; c < b; c++) {
                        assertEquals(hashed.classOf(b) == hashed.classOf(c), collided.classOf(b) == collided.classOf(c));
                    }
                }
                assertNull(difference(hashed, collided), f.toString());
                compared++;
            }
        }
        // a language whose NFA has a node that cannot reach acceptance: the trimmed path
        Expr withDeadEnd = Expr.choice(Expr.text("ab"), Expr.seq(Expr.text("ac"), Expr.chars(CodePointSet.range('x', 'w'))));
        ByteDfa.ByteNfa nfa = ExprNfa.of(withDeadEnd, null, LIMIT, LIMIT);
        assertTrue(!nfa.allCoReachable());
        for (boolean collide : new boolean[] {false, true}) {
            ByteDfa d = ByteDfa.determinize(ExprNfa.of(withDeadEnd, null, LIMIT, LIMIT), LIMIT, LIMIT, false, collide);
            assertTrue(d.matches("ab".getBytes(StandardCharsets.UTF_8)));
            assertEquals(ByteDfa.DEAD, d.step(d.step(d.start(), 'a'), 'c'));
            assertEquals(3, d.stateCount());
        }
        assertTrue(compared >= 40, "automata compared: " + compared);
    }

    @Test
    void rightLinearRulesBuildOneNodePerRule() {
        // a chain of 3,000 rules, each a letter then the next rule: far deeper than any Java stack
        // recursion would allow, and linear in size
        Map<String, Expr> rules = new HashMap<>();
        int n = 3_000;
        for (int i = 0; i < n; i++) {
            rules.put("s" + i, i == n - 1 ? Expr.text("z")
                    : Expr.choice(Expr.text("z"), Expr.seq(Expr.chars(CodePointSet.range('a', 'b')), Expr.ref("s" + (i + 1)))));
        }
        ByteDfa d = ByteDfa.fromExpr(Expr.ref("s0"), rules::get, LIMIT);
        assertTrue(d.matches("abz".getBytes(StandardCharsets.UTF_8)));
        assertTrue(d.matches(("a".repeat(n - 1) + "z").getBytes(StandardCharsets.UTF_8)));
        assertTrue(!d.matches(("a".repeat(n) + "z").getBytes(StandardCharsets.UTF_8)));
        assertEquals(n + 1, d.stateCount());
    }

    @Test
    void limitsAndUndefinedRulesGiveClearErrors() {
        Expr big = Expr.repeat(Expr.chars(CodePointSet.range('a', 'b')), 0, 5_000);
        AutomatonTooLargeException e = assertThrows(AutomatonTooLargeException.class, () -> ByteDfa.fromExpr(big, null, 100));
        assertTrue(e.getMessage().contains("100"), e.getMessage());
        IllegalArgumentException u = assertThrows(IllegalArgumentException.class,
                () -> ByteDfa.fromExpr(Expr.ref("missing"), n -> null, 100));
        assertTrue(u.getMessage().contains("missing"), u.getMessage());
        Map<String, Expr> loop = Map.of("a", Expr.seq(Expr.text("("), Expr.ref("a"), Expr.text(")")));
        assertThrows(AutomatonTooLargeException.class, () -> ByteDfa.fromExpr(Expr.ref("a"), loop::get, 100));
    }

    /** Whether rule {@code name} reaches itself. */
    static boolean recursive(Grammar g, String name) {
        Set<String> seen = new HashSet<>();
        ArrayDeque<String> work = new ArrayDeque<>();
        work.add(Grammar.key(name));
        while (!work.isEmpty()) {
            String r = work.poll();
            Expr body = g.rule(r).map(Rule::body).orElse(null);
            if (body == null) {
                continue;
            }
            ArrayDeque<Expr> exprs = new ArrayDeque<>();
            exprs.push(body);
            while (!exprs.isEmpty()) {
                Expr e = exprs.pop();
                if (e instanceof Expr.Ref ref) {
                    String k = Grammar.key(ref.name());
                    if (k.equals(Grammar.key(name)) && !r.isEmpty()) {
                        return true;
                    }
                    if (seen.add(k)) {
                        work.add(k);
                    }
                } else {
                    dev.espalier.grammar.ExprFold.children(e).forEach(exprs::push);
                }
            }
        }
        return false;
    }
}
