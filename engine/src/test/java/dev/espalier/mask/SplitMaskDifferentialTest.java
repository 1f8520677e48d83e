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

    /** Walks and steps per walk are multiplied by this under {@code -Despalier.longTests=true}. */
    static final int SCALE = Boolean.getBoolean("espalier.longTests") ? 4 : 1;

    @Test
    void libraryGrammarsOnCl100k() throws Exception {
        long masks = compare(TestVocabularies.builtin("cl100k"),
                List.of("json", "arithmetic", "tree-query", "email", "inspection-report", "csv"), 3, 30);
        System.out.println("split vs byte-level Earley masks compared on cl100k: " + masks);
        assertTrue(masks > 50);
    }

    @Test
    void jsonAndQueriesOnQwen3() throws Exception {
        // a second real vocabulary (byte-level BPE of another family), when shared/vocab has it
        long masks = compare(TestVocabularies.shared("qwen3"), List.of("json", "tree-query"), 2, 25);
        System.out.println("split vs byte-level Earley masks compared on Qwen3: " + masks);
        assertTrue(masks > 20);
    }

    /** Compares masks along sampled generations; returns the number of masks compared. */
    static long compare(Vocabulary v, List<String> grammars, int walks, int steps) throws Exception {
        long masks = 0;
        for (String name : grammars) {
            Grammar g = Abnf.parseWithImports(GRAMMARS.resolve(name + ".abnf")).grammar();
            Constraint fast = new SplitConstraint(SplitGrammar.compile(g, 10_000), v, MaskSettings.defaults());
            Constraint slow = new EarleyConstraint(EarleyGrammar.compile(g), v, MaskSettings.defaults());
            Random rnd = new Random(name.hashCode());
            for (int walk = 0; walk < walks * SCALE; walk++) {
                MaskedSampler.Sample s = MaskedSampler.sample(fast, rnd, steps * SCALE, 0.05);
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
        return masks;
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
