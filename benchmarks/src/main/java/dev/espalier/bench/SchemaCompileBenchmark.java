package dev.espalier.bench;

import dev.espalier.grammar.Grammar;
import dev.espalier.mask.Constraint;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
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

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;

/**
 * Schema compile time on orchard schemas of {@code grammars/schemas}: the JSON Schema to its grammar
 * ({@code schemaToGrammar}), and on to a constraint over cl100k with its first mask
 * ({@code schemaToFirstMask}; the vocabulary trie is built beforehand). Run from the repository
 * root: {@code java -jar benchmarks/target/benchmarks.jar SchemaCompile}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SampleTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 3, time = 2)
@Fork(1)
public class SchemaCompileBenchmark {

    @Param({"tree-record", "work-order", "site-hierarchy", "pruning-plan", "inspection-report"})
    public String schema;

    private String text;
    private Vocabulary v;
    private long[] mask;

    @Setup(Level.Trial)
    public void setUp() throws IOException {
        text = Files.readString(Path.of("grammars", "schemas", schema + ".schema.json"));
        v = Vocabularies.builtin("cl100k");
        v.trie();
        mask = new long[v.maskWords()];
    }

    /** The schema's grammar. */
    @Benchmark
    public Grammar schemaToGrammar() {
        return JsonSchemas.compile(text, SchemaOptions.defaults()).grammar();
    }

    /** The schema's grammar, its constraint and the first mask. */
    @Benchmark
    public long[] schemaToFirstMask() {
        Constraint.grammar(JsonSchemas.compile(text, SchemaOptions.defaults()).grammar(), v).start().fillMask(mask);
        return mask;
    }
}
