package dev.espalier.bench;

import dev.espalier.abnf.Abnf;
import dev.espalier.grammar.Grammar;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.concurrent.TimeUnit;

/**
 * Mask time of grammar constraints at the states met along constrained generations (caches warm).
 * Run from the repository root: {@code java -jar benchmarks/target/benchmarks.jar GrammarMask}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class GrammarMaskBenchmark {

    @Param({"cl100k", "o200k"})
    public String vocab;

    @Param({"json", "tree-query", "work-order"})
    public String grammar;

    private List<Cursor> cursors;
    private long[] mask;
    private int next;

    @Setup(Level.Trial)
    public void setUp() {
        Vocabulary v = Vocabularies.builtin(vocab);
        Grammar g = Abnf.parseWithImports(Path.of("grammars", grammar + ".abnf")).grammar();
        Constraint c = Constraint.grammar(g, v);
        cursors = new ArrayList<>();
        Random rnd = new Random(1);
        for (int gen = 0; gen < 8; gen++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 120, 0.05);
            Cursor cur = c.start();
            for (int id : s.tokens()) {
                cursors.add(cur.fork());
                cur.feed(id);
            }
        }
        mask = new long[v.maskWords()];
    }

    /** One mask at a state met along the generations, round robin. */
    @Benchmark
    public long[] mask() {
        Cursor c = cursors.get(next++ % cursors.size());
        c.fillMask(mask);
        return mask;
    }
}
