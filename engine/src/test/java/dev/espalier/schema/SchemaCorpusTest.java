package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.networknt.schema.InputFormat;
import com.networknt.schema.Schema;
import com.networknt.schema.SchemaRegistry;
import com.networknt.schema.SpecificationVersion;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * Soundness of the compiled grammars on the corpus of orchard schemas ({@code grammars/schemas},
 * invented demo data): constrained random generations over a real vocabulary (cl100k, jtokkit's
 * bundled encoding) under the token masks, and every complete output
 * <ul>
 *   <li>parses with Jackson in strict mode (RFC 8259; nothing after the value; duplicate member names
 *       are counted apart), and</li>
 *   <li>is valid by the outside reference, com.networknt json-schema-validator (draft 2020-12,
 *       formats asserted).</li>
 * </ul>
 * Every output that stopped at the token bound before it was complete is a viable prefix for a
 * fresh byte-level Earley chart of the grammar. The default run makes {@link #OUTPUTS} outputs per
 * schema in the default layout and {@link #LAYOUT_OUTPUTS} in the pretty and any-order layouts, each
 * within a time bound ({@link #DEFAULT_MILLIS}); {@code -Despalier.longTests=true} makes 10,000 and
 * 1,000 with no time bound.
 */
class SchemaCorpusTest {

    static final boolean LONG = Boolean.getBoolean("espalier.longTests");

    /** Outputs per schema in the default layout. */
    static final int OUTPUTS = LONG ? 10_000 : 1_000;

    /** Outputs per schema in each of the pretty and any-order layouts. */
    static final int LAYOUT_OUTPUTS = LONG ? 1_000 : 100;

    /**
     * In the default run, generation for one schema and layout also stops after this much time (with
     * at least {@link #MIN_OUTPUTS} outputs): where a string's lexical part is too large for an
     * automaton (formats such as email, uri and hostname inside JSON strings, free text with a length
     * bound) the masks come from the byte-level Earley walk of the whole vocabulary, hundreds of
     * milliseconds per output, so 1,000 outputs of every schema do not fit the suite's budget. The
     * printed counts say how many outputs each schema got; the longer run has no time bound.
     */
    static final long DEFAULT_MILLIS = 250;

    static final int MIN_OUTPUTS = 2;

    static final Path CORPUS = Path.of("..", "grammars", "schemas");

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    /**
     * Jackson, strict: nothing after the value, numbers kept exactly. Numbers of any length: a
     * decimal without {@code multipleOf} has unboundedly many fraction digits, which uniform token
     * choices make long (RFC 8259 sets no limit).
     */
    private static final ObjectMapper STRICT = JsonMapper.builder(com.fasterxml.jackson.core.JsonFactory.builder()
                    .streamReadConstraints(StreamReadConstraints.builder().maxNumberLength(Integer.MAX_VALUE).build()).build())
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS).build();

    /** The same, refusing repeated member names. */
    private static final ObjectMapper NO_DUPLICATES = JsonMapper.builder(com.fasterxml.jackson.core.JsonFactory.builder()
                    .streamReadConstraints(StreamReadConstraints.builder().maxNumberLength(Integer.MAX_VALUE).build()).build())
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS)
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION).build();

    static List<Path> corpus() throws IOException {
        try (Stream<Path> s = Files.list(CORPUS)) {
            return s.filter(p -> p.getFileName().toString().endsWith(".schema.json")).sorted().toList();
        }
    }

    @Test
    void theCorpusHasThirtySchemasAndTheReadmeListsThem() throws IOException {
        List<Path> files = corpus();
        assertTrue(files.size() >= 30, "schemas: " + files.size());
        String readme = Files.readString(CORPUS.resolve("README.md"), StandardCharsets.UTF_8);
        for (Path f : files) {
            assertTrue(readme.contains("(" + f.getFileName() + ")"), "README.md lists " + f.getFileName());
        }
    }

    @TestFactory
    Stream<DynamicTest> generatedOutputsAreValid() throws IOException {
        return corpus().stream().map(f -> DynamicTest.dynamicTest(f.getFileName().toString(), () -> {
            String schema = Files.readString(f, StandardCharsets.UTF_8);
            Reference reference = new Reference(schema);
            String name = f.getFileName().toString();
            Stats d = generate(name, schema, reference, SchemaOptions.defaults(), OUTPUTS);
            Stats p = generate(name, schema, reference,
                    SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY), LAYOUT_OUTPUTS);
            String a;
            try {
                a = generate(name, schema, reference,
                        SchemaOptions.defaults().withOrder(SchemaOptions.Order.ANY), LAYOUT_OUTPUTS).toString();
            } catch (SchemaException e) {
                // more named properties than the any-order limit: refused with a clear error, as documented
                assertTrue(e.getMessage().contains("for any order"), e.getMessage());
                a = "refused (" + e.getMessage() + ")";
            }
            System.out.printf("%-36s default %s; pretty %s; any order %s%n", name, d, p, a);
        }));
    }

    /** Counts of one schema under one layout. */
    record Stats(int outputs, int complete, int duplicates, long millis) {
        @Override
        public String toString() {
            return String.format("%d/%d complete and valid%s, %d ms", complete, outputs,
                    duplicates == 0 ? "" : " (" + duplicates + " with a repeated member name)", millis);
        }
    }

    static Stats generate(String name, String schema, Reference reference, SchemaOptions options, int n) {
        long t0 = System.nanoTime();
        SchemaResult r = JsonSchemas.compile(schema, options);
        Constraint c = Constraint.grammar(r.grammar(), CL100K);
        EarleyGrammar recognizer = EarleyGrammar.compile(r.grammar());
        Random rnd = new Random(name.hashCode() * 31L + options.hashCode());
        int complete = 0;
        int duplicates = 0;
        String where = name + " " + options.spacing() + "/" + options.order();
        long budget = (n == OUTPUTS ? DEFAULT_MILLIS : DEFAULT_MILLIS / 3) * 1_000_000L;
        long g0 = System.nanoTime();
        int made = 0;
        for (int i = 0; i < n; i++) {
            if (!LONG && i >= MIN_OUTPUTS && System.nanoTime() - g0 > budget) {
                break;
            }
            made++;
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 600, 1.0);
            String text = new String(s.bytes(), StandardCharsets.UTF_8);
            if (!s.complete()) {
                EarleyChart chart = recognizer.newChart();
                assertEquals(s.bytes().length, chart.feedAll(s.bytes()),
                        () -> where + ": an unfinished output is not a viable prefix: " + text);
                continue;
            }
            complete++;
            try {
                STRICT.readTree(text);
            } catch (IOException e) {
                fail(where + ": Jackson (strict) refuses a generated text: " + e.getMessage() + "\n" + text);
            }
            List<String> errors = reference.errors(text);
            if (!errors.isEmpty()) {
                fail(where + ": json-schema-validator finds a generated text invalid: " + errors + "\n" + text);
            }
            try {
                NO_DUPLICATES.readTree(text);
            } catch (IOException e) {
                duplicates++; // allowed for members matched by patternProperties; each value was validated
            }
        }
        // uniform choices make strings without a length bound (email, hostname) run on to the token
        // bound, so some schemas finish few or no outputs; every unfinished output was checked as a
        // viable prefix above, and the printed counts say how many finished
        assertTrue(made >= MIN_OUTPUTS, where);
        return new Stats(made, complete, duplicates, (System.nanoTime() - t0) / 1_000_000);
    }

    /**
     * The outside reference: com.networknt json-schema-validator, draft 2020-12, formats asserted.
     * Instances are read by its own Jackson with numbers of any length kept exactly (decimal bounds
     * compared without rounding).
     */
    static final class Reference {
        private static final SchemaRegistry REGISTRY = SchemaRegistry.withDefaultDialect(SpecificationVersion.DRAFT_2020_12);
        private static final tools.jackson.databind.ObjectMapper READER = tools.jackson.databind.json.JsonMapper.builder(
                        tools.jackson.core.json.JsonFactory.builder().streamReadConstraints(
                                tools.jackson.core.StreamReadConstraints.builder().maxNumberLength(Integer.MAX_VALUE).build()).build())
                .enable(tools.jackson.databind.DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS).build();

        private final Schema schema;

        Reference(String schemaJson) {
            this.schema = REGISTRY.getSchema(schemaJson, InputFormat.JSON);
        }

        /** The validator's errors on an instance (JSON text); empty when it is valid. */
        List<String> errors(String instanceJson) {
            return schema.validate(READER.readTree(instanceJson), ctx -> ctx.executionConfig(c -> c.formatAssertionsEnabled(true)))
                    .stream().map(Object::toString).toList();
        }
    }
}
