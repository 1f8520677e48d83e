package dev.espalier.mask;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/**
 * The split engine's lexical walks, which decide at once the trie subtrees that {@link LiveRuns}
 * vouches for (inside a lexeme, never at its end) and add the tokens of a state's first runs in whole
 * words, against plain walks that step every node: the
 * same inside mask and the same boundary nodes, for every state of every lexical automaton of
 * grammars with strings, bounded counts and numbers, on cl100k and o200k.
 */
class LexicalWalkTest {

    /** Nodes stepped to by the walks with {@link LiveRuns} and by the plain walks, over every comparison. */
    private long steppedWithRuns;
    private long steppedPlain;
    /** Pairs whose walks added the tokens of their first runs in whole words. */
    private int wholeStates;

    private int compare(String where, Grammar g, Vocabulary v) {
        SplitConstraint c = new SplitConstraint(SplitGrammar.compile(g, 10_000), v, MaskSettings.defaults());
        int states = 0;
        for (int t = 0; t < c.grammar.terminalCount(); t++) {
            LiveRuns runs = new LiveRuns(c.grammar.terminal(t), v.trie().maxDepth(), true);
            for (int q = 0; q < c.grammar.terminal(t).stateCount(); q++) {
                long[] fast = new long[v.maskWords()];
                long[] slow = new long[v.maskWords()];
                long[] withWhole = new long[v.maskWords()];
                int[] fastNodes = c.lexicalWalk(t, q, fast, runs, null);
                int[] wholeNodes = c.lexicalWalk(t, q, withWhole, runs, runs.whole(q));
                int[] slowNodes = c.lexicalWalk(t, q, slow, VocabularyTrie.Coverage.NONE, null);
                int term = t;
                int state = q;
                assertArrayEquals(slow, fast, () -> where + ": inside mask of terminal " + term + " state " + state);
                assertArrayEquals(slowNodes, fastNodes, () -> where + ": boundary nodes of terminal " + term + " state " + state);
                assertArrayEquals(slow, withWhole, () -> where + ": inside mask (text tokens whole) of terminal " + term + " state " + state);
                assertArrayEquals(slowNodes, wholeNodes, () -> where + ": boundary nodes (text tokens whole) of terminal " + term + " state " + state);
                // counted only where the trie really supplied the tokens (it keeps a bounded number of sets)
                if (runs.whole(q) != null && runs.whole(q).tokens(v.trie(), v.trie().maxDepth()) != null) {
                    wholeStates++;
                }
                steppedWithRuns += TestGrammars.stepped(v, c.grammar.terminal(t), runs, q);
                steppedPlain += TestGrammars.stepped(v, c.grammar.terminal(t), VocabularyTrie.Coverage.NONE, q);
                states++;
            }
        }
        return states;
    }

    @Test
    void walksThatTakeSubtreesEqualPlainWalks() throws Exception {
        int states = 0;
        for (String vocabulary : new String[] {"cl100k", "o200k"}) {
            Vocabulary v = TestVocabularies.builtin(vocabulary);
            states += compare("site-hierarchy on " + vocabulary, TestGrammars.schema("site-hierarchy"), v);
            for (String name : new String[] {"json", "tree-query", "inspection-report"}) {
                Grammar g = Abnf.parseWithImports(Path.of("..", "grammars", name + ".abnf")).grammar();
                states += compare(name + " on " + vocabulary, g, v);
            }
        }
        assertTrue(states > 100, "lexical states compared: " + states);
        // the comparison is not idle: the walks with runs decide subtrees the plain walks step through
        assertTrue(2 * steppedWithRuns < steppedPlain, "nodes stepped: " + steppedWithRuns + " with runs, " + steppedPlain + " plain");
        assertTrue(wholeStates > 20, "pairs adding text tokens whole: " + wholeStates);
        System.out.println("lexical walks vs plain walks: " + states + " (terminal, state) pairs (" + wholeStates
                + " adding text tokens whole), 0 differences; nodes stepped " + steppedWithRuns + " vs " + steppedPlain);
    }
}
