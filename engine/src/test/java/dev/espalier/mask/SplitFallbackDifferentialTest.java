package dev.espalier.mask;

import dev.espalier.abnf.Abnf;
import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Lexical fragments too large for one automaton are lowered into the skeleton, part by part. Forced
 * here with tiny state limits, the masks must still equal those of the byte-level Earley walk.
 */
class SplitFallbackDifferentialTest {

    static final Path GRAMMARS = Path.of("..", "grammars");

    @Test
    void tinyStateLimitsKeepTheLanguage() throws Exception {
        Vocabulary v = TestVocabularies.builtin("cl100k");
        long masks = 0;
        int compiled = 0;
        for (String name : List.of("date-time", "json", "inspection-report", "work-order", "semver", "ip-address")) {
            Grammar g = Abnf.parseWithImports(GRAMMARS.resolve(name + ".abnf")).grammar();
            Constraint slow = new EarleyConstraint(EarleyGrammar.compile(g), v, MaskSettings.defaults());
            for (int limit : new int[] {4, 12, 40}) {
                SplitGrammar split;
                try {
                    split = SplitGrammar.compile(g, limit);
                } catch (AutomatonTooLargeException e) {
                    continue; // an indivisible piece (one long string or class) is over this limit
                }
                compiled++;
                Constraint fast = new SplitConstraint(split, v, MaskSettings.defaults());
                Random rnd = new Random(name.hashCode() * 31L + limit);
                for (int walk = 0; walk < 2; walk++) {
                    MaskedSampler.Sample s = MaskedSampler.sample(slow, rnd, 25, 0.05);
                    Cursor a = fast.start();
                    Cursor b = slow.start();
                    long[] ma = new long[v.maskWords()];
                    long[] mb = new long[v.maskWords()];
                    for (int id : s.tokens()) {
                        a.fillMask(ma);
                        b.fillMask(mb);
                        masks++;
                        if (!Arrays.equals(ma, mb)) {
                            int diff = SplitMaskDifferentialTest.firstDifference(ma, mb);
                            throw new AssertionError(name + " (state limit " + limit + "): masks differ after "
                                    + a.steps() + " tokens; first differing token " + diff + " " + v.display(diff));
                        }
                        assertEquals(b.isComplete(), a.isComplete());
                        a.feed(id);
                        b.feed(id);
                    }
                }
            }
        }
        System.out.println("split with tiny state limits: " + compiled + " grammars compiled, " + masks + " masks compared");
        assertTrue(compiled >= 12, "grammar and limit pairs compiled: " + compiled);
        assertTrue(masks > 100, "masks compared: " + masks);
    }

    @Test
    void aNonRecursiveGrammarOverTheLimitStillSplits() throws Exception {
        Grammar g = Abnf.parseWithImports(GRAMMARS.resolve("date-time.abnf")).grammar();
        SplitGrammar split = SplitGrammar.compile(g, 12);
        assertTrue(split.terminalCount() > 1, "parts became terminals of their own");
        assertTrue(split.nonterminalCount() > 1);
    }

    @Test
    void anIndivisiblePieceOverTheLimitIsStillAnError() {
        Grammar g = Abnf.parse("word = %s\"Amberglow-Copperbell-Russet\"\n", "word.abnf").grammar();
        assertThrows(AutomatonTooLargeException.class, () -> SplitGrammar.compile(g, 5));
    }
}
