package dev.espalier.automaton;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * {@link ByteDfa#viableClasses} (one depth, and all depths in one run), which re-examines only the
 * states a change can reach, against its slow twin {@link ByteDfa#viableClassesByRounds}, which
 * re-examines every state in every round: the
 * same partition (block numbers aside) at depths from 0 to beyond the longest distinction, on the
 * byte DFAs of the corpus schemas, the grammar library's rules and random expressions; also with
 * every signature hashed alike, so that states are told apart only by the full comparison.
 */
class ViableClassesDifferentialTest {

    private static final int[] DEPTHS = {0, 1, 2, 3, 7, 16, 64, 300};

    /** Block numbers renamed in order of first appearance. */
    static int[] canonical(int[] block) {
        Map<Integer, Integer> names = new HashMap<>();
        int[] out = new int[block.length];
        for (int i = 0; i < block.length; i++) {
            out[i] = names.computeIfAbsent(block[i], k -> names.size());
        }
        return out;
    }

    static void same(String where, ByteDfa d) {
        int[][] together = d.viableClasses(DEPTHS);
        int[][] colliding = d.viableClasses(DEPTHS, true);
        for (int i = 0; i < DEPTHS.length; i++) {
            int depth = DEPTHS[i];
            int[] slow = canonical(d.viableClassesByRounds(depth));
            assertArrayEquals(slow, canonical(d.viableClasses(depth)), where + " at depth " + depth);
            assertArrayEquals(slow, canonical(together[i]), where + " at depth " + depth + ", all depths in one run");
            assertArrayEquals(slow, canonical(colliding[i]), where + " at depth " + depth + ", every signature hashed alike");
        }
    }

    @Test
    void corpusSchemaAutomataAgree() throws IOException {
        List<Path> files;
        try (Stream<Path> s = Files.list(Path.of("..", "grammars", "schemas"))) {
            files = s.filter(p -> p.toString().endsWith(".schema.json")).sorted().toList();
        }
        int compared = 0;
        for (Path f : files) {
            Grammar g = JsonSchemas.compile(Files.readString(f, StandardCharsets.UTF_8), SchemaOptions.defaults()).grammar();
            try {
                same(f.getFileName().toString(), ByteDfa.fromExpr(Expr.ref(g.start()),
                        n -> g.rule(n).map(Rule::body).orElse(null), 10_000));
                compared++;
            } catch (AutomatonTooLargeException e) {
                // the recursive schema has no automaton: nothing to compare
            }
        }
        assertTrue(compared >= 25, "schemas compared: " + compared);
    }

    @Test
    void libraryAndRandomAutomataAgree() throws IOException {
        List<ByteDfa> dfas = new ArrayList<>();
        try (Stream<Path> s = Files.list(Path.of("..", "grammars"))) {
            for (Path f : s.filter(p -> p.toString().endsWith(".abnf")).sorted().toList()) {
                Grammar g = Abnf.parseWithImports(f).grammar();
                for (Rule r : g.rules()) {
                    if (!ExprNfaDifferentialTest.recursive(g, r.name())) {
                        try {
                            dfas.add(ByteDfa.fromExpr(Expr.ref(r.name()), n -> g.rule(n).map(Rule::body).orElse(null), 10_000));
                        } catch (AutomatonTooLargeException e) {
                            // over the limit: nothing to compare
                        }
                    }
                }
            }
        }
        Random rnd = new Random(31);
        Map<String, Expr> rules = new HashMap<>();
        for (int i = 0; i < 4; i++) {
            rules.put("r" + i, ExprNfaDifferentialTest.random(rnd, 3, i));
        }
        for (int i = 0; i < 400; i++) {
            dfas.add(ByteDfa.fromExpr(ExprNfaDifferentialTest.random(rnd, 4, 4), rules::get, 10_000));
        }
        for (int i = 0; i < dfas.size(); i++) {
            same("automaton " + i, dfas.get(i));
        }
        assertTrue(dfas.size() > 600, "automata: " + dfas.size());
    }
}
