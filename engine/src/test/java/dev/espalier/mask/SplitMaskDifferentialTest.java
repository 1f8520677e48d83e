package dev.espalier.mask;

import dev.espalier.abnf.Abnf;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The split engine (lexical DFAs cached per state, parser only across lexeme boundaries) against its
 * slow twin (the whole trie walked with a byte-level Earley chart), mask for mask.
 */
class SplitMaskDifferentialTest {

    static final Path GRAMMARS = Path.of("..", "grammars");

    @Test
    void libraryGrammarsOnCl100k() throws Exception {
        Vocabulary v = TestVocabularies.builtin("cl100k");
        long masks = 0;
        for (String name : List.of("json", "arithmetic", "tree-query", "email", "inspection-report", "csv")) {
            Grammar g = Abnf.parseWithImports(GRAMMARS.resolve(name + ".abnf")).grammar();
            Constraint fast = new SplitConstraint(SplitGrammar.compile(g, 10_000), v, MaskSettings.defaults());
            Constraint slow = new EarleyConstraint(EarleyGrammar.compile(g), v, MaskSettings.defaults());
            Random rnd = new Random(name.hashCode());
            for (int walk = 0; walk < 3; walk++) {
                MaskedSampler.Sample s = MaskedSampler.sample(fast, rnd, 30, 0.05);
                Cursor a = fast.start();
                Cursor b = slow.start();
                long[] ma = new long[v.maskWords()];
                long[] mb = new long[v.maskWords()];
                for (int id : s.tokens()) {
                    a.fillMask(ma);
                    b.fillMask(mb);
                    masks++;
                    if (!Arrays.equals(ma, mb)) {
                        int diff = firstDifference(ma, mb);
                        throw new AssertionError(name + ": masks differ after " + a.steps() + " tokens of "
                                + Arrays.toString(s.tokens()) + "; first differing token " + diff + " "
                                + v.display(diff) + " split=" + TokenBits.get(ma, diff));
                    }
                    assertEquals(a.isComplete(), b.isComplete());
                    a.feed(id);
                    b.feed(id);
                }
            }
        }
        System.out.println("split vs byte-level Earley masks compared: " + masks);
        assertTrue(masks > 50);
    }

    static int firstDifference(long[] a, long[] b) {
        for (int w = 0; w < a.length; w++) {
            if (a[w] != b[w]) {
                return (w << 6) + Long.numberOfTrailingZeros(a[w] ^ b[w]);
            }
        }
        return -1;
    }
}
