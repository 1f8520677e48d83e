package dev.espalier.mask;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.regex.RegexSyntax;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Masks as computed for the cache (in two parts: short tokens from a mask cached per short class,
 * long tokens by a walk of their own trie; whole subtrees taken where {@link LiveRuns} vouches for
 * them, and the tokens of a state's first runs added in whole words) against one plain walk of the
 * whole vocabulary trie that steps every node, for every state
 * of automata with length bounds: the corpus schemas with a bounded free text or a bounded e-mail
 * address, and patterns, on cl100k; and on o200k, whose many multibyte tokens are taken by
 * character counts, for a bounded free text.
 */
class TwoPartMaskTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    /** States whose masks took the tokens of their first runs in whole words, over every comparison. */
    private int wholeStates;

    private int compare(String where, DfaConstraint c) {
        LiveRuns runs = new LiveRuns(c.dfa, c.trie.maxDepth());
        for (int s = 0; s < c.dfa.stateCount(); s++) {
            int state = s;
            assertArrayEquals(c.computeByWalk(state), c.compute(state), () -> where + ": state " + state);
            if (runs.whole(state) != null) {
                wholeStates++;
            }
        }
        return c.dfa.stateCount();
    }

    @Test
    void twoPartMasksEqualOneWalkInEveryState() {
        List<DfaConstraint> constraints = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (String schema : List.of("pruning-plan", "inspection-report", "customer-contact", "label-print-job")) {
            constraints.add(new DfaConstraint(TestGrammars.automaton(TestGrammars.schema(schema)), CL100K, MaskSettings.defaults()));
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
        // the comparison is not idle: in most states of the bounded texts, text tokens are added whole
        assertTrue(wholeStates > states / 4, "states with text tokens added whole: " + wholeStates + " of " + states);
        System.out.println("cached masks vs one plain walk: " + constraints.size() + " automata (" + twoPart
                + " in two parts), " + states + " states (" + wholeStates + " adding text tokens whole), 0 differences");
    }

    @Test
    void multibyteTokensAreCountedByCharacters() {
        Vocabulary o200k = TestVocabularies.builtin("o200k");
        List<ByteDfa> automata = List.of(
                TestGrammars.automaton(TestGrammars.schema("customer-contact")),
                ByteDfa.fromExpr(RegexSyntax.parse("\"[^\"\\\\]{0,30}\""), null, 10_000),
                ByteDfa.fromExpr(RegexSyntax.parse("[a-zé€ ]{0,20}!"), null, 10_000));
        int states = 0;
        for (int i = 0; i < automata.size(); i++) {
            states += compare("automaton " + i + " on o200k", new DfaConstraint(automata.get(i), o200k, MaskSettings.defaults()));
        }
        // the bounded free text is not compared idly: inside it, most of o200k's subtrees (many of them
        // multibyte) are decided at once
        ByteDfa text = automata.get(1);
        int inside = text.step(text.start(), '"');
        LiveRuns runs = new LiveRuns(text, o200k.trie().maxDepth());
        long withRuns = TestGrammars.stepped(o200k, text, runs, inside);
        long plain = TestGrammars.stepped(o200k, text, VocabularyTrie.Coverage.NONE, inside);
        assertTrue(10 * withRuns < plain, "nodes stepped in the free text: " + withRuns + " with runs, " + plain + " plain");
        assertTrue(wholeStates > states / 4, "states with text tokens added whole: " + wholeStates + " of " + states);
        System.out.println("cached masks vs one plain walk on o200k: " + automata.size() + " automata, " + states
                + " states (" + wholeStates + " adding text tokens whole), 0 differences; in the free text "
                + withRuns + " nodes stepped instead of " + plain);
    }
}
