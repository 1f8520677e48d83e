package dev.espalier.bench;

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

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Mask time of regular-expression constraints along constrained generations, beside the baseline of
 * testing every token with java.util.regex. Run: {@code java -jar benchmarks/target/benchmarks.jar RegexMask}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class RegexMaskBenchmark {

    @Param({"cl100k", "o200k"})
    public String vocab;

    @Param({"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])",
            "[0-9a-f]{8}-[0-9a-f]{4}-[1-5][0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}",
            "[a-z ]{0,200}"})
    public String pattern;

    private Vocabulary vocabulary;
    private Constraint constraint;
    private List<Cursor> cursors;
    private List<String> prefixes;
    private long[] mask;
    private int next;
    private Matcher matcher;

    @Setup(Level.Trial)
    public void setUp() {
        vocabulary = Vocabularies.builtin(vocab);
        vocabulary.trie();
        constraint = Constraint.regex(pattern, vocabulary);
        cursors = new ArrayList<>();
        prefixes = new ArrayList<>();
        Random rnd = new Random(1);
        for (int g = 0; g < 4; g++) {
            MaskedSampler.Sample s = MaskedSampler.sample(constraint, rnd, 256);
            Cursor c = constraint.start();
            StringBuilder text = new StringBuilder();
            for (int id : s.tokens()) {
                cursors.add(c.fork());
                prefixes.add(text.toString());
                if (id == vocabulary.endOfSequence()) {
                    break;
                }
                c.feed(id);
                text.append(new String(vocabulary.bytes(id), StandardCharsets.UTF_8));
            }
        }
        mask = new long[vocabulary.maskWords()];
        matcher = Pattern.compile(pattern).matcher("");
    }

    /** Steady state: the mask of a state met before (a cache hit). */
    @Benchmark
    public long[] steadyMask() {
        Cursor c = cursors.get(next++ % cursors.size());
        c.fillMask(mask);
        return mask;
    }

    /** Compile and first mask of the start state, trie excluded (built in setUp). */
    @Benchmark
    @BenchmarkMode(Mode.SingleShotTime)
    @Measurement(iterations = 20)
    @Warmup(iterations = 5)
    public long[] compileAndFirstMask() {
        Constraint fresh = Constraint.regex(pattern, vocabulary);
        fresh.start().fillMask(mask);
        return mask;
    }

    /** The baseline: every token tested on prefix + token with java.util.regex. */
    @Benchmark
    @OutputTimeUnit(TimeUnit.MILLISECONDS)
    public long[] baselineJavaRegex() {
        String prefix = prefixes.get(next++ % prefixes.size());
        java.util.Arrays.fill(mask, 0L);
        for (int id = 0; id < vocabulary.size(); id++) {
            if (!vocabulary.has(id) || vocabulary.isSpecial(id)) {
                continue;
            }
            matcher.reset(prefix + new String(vocabulary.bytes(id), StandardCharsets.UTF_8));
            if (matcher.matches() || matcher.hitEnd()) {
                mask[id >>> 6] |= 1L << id;
            }
        }
        return mask;
    }
}
