package dev.espalier.mask;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.regex.RegexSyntax;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Masks as computed for the cache (in two parts: short tokens from a mask cached per short class,
 * long tokens by a walk of their own trie; whole subtrees taken where {@link LiveRuns} vouches for
 * them) against one plain walk of the whole vocabulary trie that steps every node, for every state
 * of automata with length bounds: the corpus schemas with a bounded free text or a bounded e-mail
 * address, and patterns, on cl100k; and on o200k, whose many multibyte tokens are taken by
 * character counts, for a bounded free text.
 */
class TwoPartMaskTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    private static Grammar schema(String name) throws IOException {
        return JsonSchemas.compile(Files.readString(Path.of("..", "grammars", "schemas", name + ".schema.json"),
                StandardCharsets.UTF_8), SchemaOptions.defaults()).grammar();
    }

    private static int compare(String where, DfaConstraint c) {
        for (int s = 0; s < c.dfa.stateCount(); s++) {
            int state = s;
            assertArrayEquals(c.computeByWalk(state), c.compute(state), () -> where + ": state " + state);
        }
        return c.dfa.stateCount();
    }

    @Test
    void twoPartMasksEqualOneWalkInEveryState() throws IOException {
        List<DfaConstraint> constraints = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (String schema : List.of("pruning-plan", "inspection-report", "customer-contact", "label-print-job")) {
            Grammar g = schema(schema);
            ByteDfa d = ByteDfa.fromExpr(Expr.ref(g.start()), n -> g.rule(n).map(Rule::body).orElse(null), 10_000);
            constraints.add(new DfaConstraint(d, CL100K, MaskSettings.defaults()));
            names.add(schema);
        }
        for (String pattern : List.of("[a-z ]{0,40}", "\"([^\"\\\\]|\\\\.){2,30}\"", "(ab|c){0,25}x")) {
            ByteDfa d = ByteDfa.fromExpr(RegexSyntax.parse(pattern), null, 10_000);
            constraints.add(new DfaConstraint(d, CL100K, MaskSettings.defaults()));
            names.add(pattern);
        }
        int twoPart = 0;
        int states = 0;
        for (int i = 0; i < constraints.size(); i++) {
            if (constraints.get(i).twoPart()) {
                twoPart++;
            }
            states += compare(names.get(i), constraints.get(i));
        }
        assertTrue(twoPart >= 4, "constraints computing masks in two parts: " + twoPart);
        System.out.println("cached masks vs one plain walk: " + constraints.size() + " automata (" + twoPart
                + " in two parts), " + states + " states, 0 differences");
    }

    @Test
    void multibyteTokensAreCountedByCharacters() throws IOException {
        Vocabulary o200k = TestVocabularies.builtin("o200k");
        Grammar g = schema("customer-contact");
        List<ByteDfa> automata = List.of(
                ByteDfa.fromExpr(Expr.ref(g.start()), n -> g.rule(n).map(Rule::body).orElse(null), 10_000),
                ByteDfa.fromExpr(RegexSyntax.parse("\"[^\"\\\\]{0,30}\""), null, 10_000),
                ByteDfa.fromExpr(RegexSyntax.parse("[a-zé€ ]{0,20}!"), null, 10_000));
        int states = 0;
        for (int i = 0; i < automata.size(); i++) {
            states += compare("automaton " + i + " on o200k", new DfaConstraint(automata.get(i), o200k, MaskSettings.defaults()));
        }
        System.out.println("cached masks vs one plain walk on o200k: " + automata.size() + " automata, " + states
                + " states, 0 differences");
    }
}
