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
import dev.espalier.mask.Cursor;
import dev.espalier.mask.TokenBits;
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
 * schema in the default layout and {@link #LAYOUT_OUTPUTS} in the pretty and any-order layouts,
 * these within a time bound ({@link #LAYOUT_MILLIS}); {@code -Despalier.longTests=true} makes 10,000 and
 * 1,000 with no time bound.
 */
class SchemaCorpusTest {

    static final boolean LONG = Boolean.getBoolean("espalier.longTests");

    /** Outputs per schema in the default layout. */
    static final int OUTPUTS = LONG ? 10_000 : 1_000;

    /** Outputs per schema in each of the pretty and any-order layouts. */
    static final int LAYOUT_OUTPUTS = LONG ? 1_000 : 100;

    /**
     * In the default run, generation for one schema in the pretty or any-order layout also stops
     * after this much time (with at least {@link #MIN_OUTPUTS} outputs): the any-order layout of
     * objects with many properties is too large for one automaton and falls back to the byte-level
     * parser, hundreds of milliseconds per output. The default layout always makes all
     * {@link #OUTPUTS}; the longer run has no time bound.
     */
    static final long LAYOUT_MILLIS = 1_500;

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
    record Stats(int outputs, int complete, int duplicates, int domains, long millis) {
        @Override
        public String toString() {
            return String.format("%d/%d complete and valid%s%s, %d ms", complete, outputs,
                    duplicates == 0 ? "" : " (" + duplicates + " with a repeated member name)",
                    domains == 0 ? "" : " (" + domains + " e-mail domains or leap-second dates outside the validator's tables)", millis);
        }
    }

    static Stats generate(String name, String schema, Reference reference, SchemaOptions options, int n) {
        long t0 = System.nanoTime();
        SchemaResult r = JsonSchemas.compile(schema, options);
        Constraint c = Constraint.grammar(r.grammar(), CL100K);
        EarleyGrammar recognizer = EarleyGrammar.compile(r.grammar());
        long[] closers = closers(CL100K);
        long[] singles = singleBytes(CL100K);
        Random rnd = new Random(name.hashCode() * 31L + options.toString().hashCode());
        int complete = 0;
        int duplicates = 0;
        int domains = 0;
        String where = name + " " + options.spacing() + "/" + options.order();
        boolean bounded = !LONG && n != OUTPUTS;
        long g0 = System.nanoTime();
        int made = 0;
        for (int i = 0; i < n; i++) {
            if (bounded && i >= MIN_OUTPUTS && System.nanoTime() - g0 > LAYOUT_MILLIS * 1_000_000L) {
                break;
            }
            made++;
            Generated s = generate(c, closers, singles, rnd, MAX_TOKENS);
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
            List<com.networknt.schema.Error> errors = reference.validate(text);
            int unlisted = Reference.outsideTheValidatorsTables(errors);
            if (unlisted < 0) {
                fail(where + ": json-schema-validator finds a generated text invalid: " + errors + "\n" + text);
            }
            domains += unlisted;
            try {
                NO_DUPLICATES.readTree(text);
            } catch (IOException e) {
                duplicates++; // allowed for members matched by patternProperties; each value was validated
            }
        }
        assertTrue(made >= MIN_OUTPUTS, where);
        if (n == OUTPUTS) {
            assertEquals(OUTPUTS, made, where);
            assertEquals(OUTPUTS, complete, where + ": outputs that finished within " + MAX_TOKENS + " tokens");
        }
        return new Stats(made, complete, duplicates, domains, (System.nanoTime() - t0) / 1_000_000);
    }

    /** Most tokens of one output. */
    static final int MAX_TOKENS = 1_500;

    /**
     * How often a step picks among the allowed tokens that hold a closing character, and how often
     * among the allowed tokens of one byte.
     */
    static final double CLOSING_CHANCE = 0.3;

    /** One generated output, and whether it is a complete string of the language. */
    record Generated(byte[] bytes, boolean complete) {
    }

    /**
     * The tokens whose bytes hold one of {@code " } ]}: the characters that end a JSON string, object
     * or array.
     */
    static long[] closers(Vocabulary v) {
        long[] set = new long[v.maskWords()];
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id) || v.isSpecial(id)) {
                continue;
            }
            for (byte x : v.bytes(id)) {
                if (x == '"' || x == '}' || x == ']') {
                    TokenBits.set(set, id);
                    break;
                }
            }
        }
        return set;
    }

    /** The tokens of one byte. */
    static long[] singleBytes(Vocabulary v) {
        long[] set = new long[v.maskWords()];
        for (int id = 0; id < v.size(); id++) {
            if (v.has(id) && !v.isSpecial(id) && v.length(id) == 1) {
                TokenBits.set(set, id);
            }
        }
        return set;
    }

    /**
     * A random output under the masks. Uniform choice over a large vocabulary makes free strings and
     * digit runs go on for hundreds of tokens, so with probability {@link #CLOSING_CHANCE} a step
     * chooses among the allowed tokens that hold a closing character, and with the same probability
     * among the allowed tokens of one byte (when there are any; else among all allowed tokens), and
     * end of sequence is taken as soon as it is allowed. Every choice is still one the mask allows,
     * which is what the test is about.
     */
    static Generated generate(Constraint c, long[] closers, long[] singles, Random rnd, int maxTokens) {
        Cursor cursor = c.start();
        Vocabulary v = c.vocabulary();
        long[] mask = new long[v.maskWords()];
        long[] closing = new long[mask.length];
        java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
        int eos = v.endOfSequence();
        for (int n = 0; n < maxTokens; n++) {
            cursor.fillMask(mask);
            int count = TokenBits.count(mask);
            if (count == 0) {
                break;
            }
            if (eos >= 0 && TokenBits.get(mask, eos)) {
                cursor.feed(eos);
                break;
            }
            int pick = -1;
            double dice = rnd.nextDouble();
            long[] preferred = dice < CLOSING_CHANCE ? closers : dice < 2 * CLOSING_CHANCE ? singles : null;
            if (preferred != null) {
                for (int w = 0; w < mask.length; w++) {
                    closing[w] = mask[w] & preferred[w];
                }
                int k = TokenBits.count(closing);
                if (k > 0) {
                    pick = TokenBits.nth(closing, rnd.nextInt(k));
                }
            }
            if (pick < 0) {
                pick = TokenBits.nth(mask, rnd.nextInt(count));
            }
            cursor.feed(pick);
            out.writeBytes(v.bytes(pick));
        }
        return new Generated(out.toByteArray(), cursor.isFinished() || (cursor.isComplete() && !cursor.canContinue()));
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

        private static final Schema EMAIL = REGISTRY.getSchema("{\"type\":\"string\",\"format\":\"email\"}", InputFormat.JSON);
        private static final Schema DATE_TIME = REGISTRY.getSchema("{\"type\":\"string\",\"format\":\"date-time\"}", InputFormat.JSON);

        /** The validator's errors on an instance (JSON text), as it reports them. */
        List<com.networknt.schema.Error> validate(String instanceJson) {
            return validate(schema, instanceJson);
        }

        private static List<com.networknt.schema.Error> validate(Schema s, String instanceJson) {
            return s.validate(READER.readTree(instanceJson), ctx -> ctx.executionConfig(c -> c.formatAssertionsEnabled(true)));
        }

        /**
         * The validator checks an e-mail address's last domain label against its own list of top-level
         * domains ({@code a@b.com} and {@code a@b} pass, {@code a@b.example} fails, as measured with
         * this version), a rule beyond the Mailbox syntax of RFC 5321 section 4.1.2 that the JSON
         * Schema format refers to. Returns how many errors are only that: an e-mail format error on an
         * address that the validator accepts once its last label is replaced by {@code com}. Returns -1
         * when any error is something else. A leap second refused by the validator's table of announced
         * leap seconds counts the same way (see below).
         */
        static int outsideTheValidatorsTables(List<com.networknt.schema.Error> errors) {
            for (com.networknt.schema.Error e : errors) {
                String address = e.getInstanceNode() != null && e.getInstanceNode().isString()
                        ? e.getInstanceNode().asString() : null;
                if (!"format".equals(e.getKeyword()) || address == null) {
                    return -1;
                }
                if (e.getMessage().contains("date-time")) {
                    // the validator also checks a leap second against its table of the leap seconds
                    // announced (1998-12-31T23:59:60Z passes, 2020-04-18T23:59:60Z fails, as measured);
                    // RFC 3339 section 5.7 leaves that table to the application and the grammar takes
                    // 23:59:60 with a zero offset on any date (a documented gap of the format)
                    String second = address.length() >= 20 ? address.substring(11, 19) : "";
                    if (!second.equals("23:59:60") || !validate(DATE_TIME,
                            READER.writeValueAsString(address.substring(0, 17) + "59" + address.substring(19))).isEmpty()) {
                        return -1;
                    }
                    continue;
                }
                if (!e.getMessage().contains("email")) {
                    return -1;
                }
                int at = address.lastIndexOf('@');
                int dot = address.lastIndexOf('.');
                if (at < 0 || dot < at || address.endsWith("]")) {
                    return -1;
                }
                String relabelled = address.substring(0, dot + 1) + "com";
                if (!validate(EMAIL, READER.writeValueAsString(relabelled)).isEmpty()) {
                    return -1;
                }
            }
            return errors.size();
        }
    }
}
