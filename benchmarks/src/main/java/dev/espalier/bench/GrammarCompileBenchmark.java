package dev.espalier.bench;

import dev.espalier.abnf.Abnf;
import dev.espalier.grammar.Grammar;
import dev.espalier.mask.Constraint;
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
import java.util.concurrent.TimeUnit;

/**
 * Time to first mask of a grammar: compile against a vocabulary whose trie is already built, then
 * the mask of the start state. Run from the repository root:
 * {@code java -jar benchmarks/target/benchmarks.jar GrammarCompile}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class GrammarCompileBenchmark {

    @Param({"cl100k", "o200k"})
    public String vocab;

    @Param({"json", "work-order", "inspection-report"})
    public String grammar;

    private Vocabulary v;
    private Grammar g;
    private long[] mask;

    @Setup(Level.Trial)
    public void setUp() {
        v = Vocabularies.builtin(vocab);
        v.trie();
        g = Abnf.parseWithImports(Path.of("grammars", grammar + ".abnf")).grammar();
        mask = new long[v.maskWords()];
    }

    /** A fresh constraint and its first mask. */
    @Benchmark
    public long[] firstMask() {
        Constraint.grammar(g, v).start().fillMask(mask);
        return mask;
    }
}
