package dev.espalier.mask;

import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

/**
 * One grammar constraint shared by 8 threads, each with its own cursors, gives the masks of one
 * thread (the grammar counterpart of {@link ConcurrencyTest}).
 */
class GrammarConcurrencyTest {

    @Test
    void sharedGrammarConstraintGivesTheSameMasksAsOneThread() throws Exception {
        Vocabulary v = TestVocabularies.builtin("cl100k");
        for (String name : List.of("arithmetic", "nullable", "orchard-record", "json")) {
            // reference masks: one thread, its own constraint
            Constraint single = Constraint.grammar(TestGrammars.load(name), v);
            List<int[]> walks = new ArrayList<>();
            Random rnd = new Random(name.hashCode());
            for (int i = 0; i < 8; i++) {
                walks.add(MaskedSampler.sample(single, rnd, name.equals("json") ? 6 : 16, 0.1).tokens());
            }
            List<List<long[]>> expected = new ArrayList<>();
            for (int[] walk : walks) {
                expected.add(masksAlong(single, walk, v));
            }
            Constraint shared = Constraint.grammar(TestGrammars.load(name), v,
                    MaskSettings.defaults().withCacheBudget(20 * 8L * v.maskWords()));
            ExecutorService pool = Executors.newFixedThreadPool(8);
            try {
                List<Future<List<long[]>>> results = new ArrayList<>();
                for (int round = 0; round < 2; round++) {
                    for (int[] walk : walks) {
                        results.add(pool.submit(() -> masksAlong(shared, walk, v)));
                    }
                }
                for (int i = 0; i < results.size(); i++) {
                    List<long[]> got = results.get(i).get();
                    List<long[]> want = expected.get(i % walks.size());
                    for (int k = 0; k < want.size(); k++) {
                        assertArrayEquals(want.get(k), got.get(k), name + " walk " + i + " step " + k);
                    }
                }
            } finally {
                pool.shutdownNow();
            }
        }
    }

    private static List<long[]> masksAlong(Constraint c, int[] walk, Vocabulary v) {
        Cursor cursor = c.start();
        List<long[]> out = new ArrayList<>();
        for (int id : walk) {
            long[] m = new long[v.maskWords()];
            cursor.fillMask(m);
            out.add(m);
            cursor.feed(id);
        }
        long[] last = new long[v.maskWords()];
        cursor.fillMask(last);
        out.add(last);
        return out;
    }
}
