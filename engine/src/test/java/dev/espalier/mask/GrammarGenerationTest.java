package dev.espalier.mask;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Constrained random generation ({@link MaskedSampler}) under grammar constraints: every complete
 * output is a string of the language by a fresh Earley chart ({@link ReferenceMasks}), every
 * unfinished one a viable prefix, and every JSON output parses with Jackson in strict mode (an
 * outside reference for RFC 8259). {@code -Despalier.longTests=true} generates 10 times as many.
 *
 * <p>Uniform choices inside a JSON string or a quoted query value allow nearly the whole vocabulary,
 * where a mask from the parser walks the whole trie (tens of milliseconds with the current engine):
 * The orchard query gets fewer outputs in the default run.
 */
class GrammarGenerationTest {

    static final int SCALE = Boolean.getBoolean("espalier.longTests") ? 10 : 1;

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    /**
     * Jackson with its strict defaults (no comments, no single quotes, no unquoted names, no leading
     * zeros, no NaN, no control characters in strings) and nothing allowed after the value.
     */
    private static final ObjectMapper STRICT = JsonMapper.builder()
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS).build();

    @Test
    void jsonOutputsParseWithJackson() {
        int parsed = generate("json", 1000 * SCALE, 64, 0.2, 11, bytes -> {
            try {
                STRICT.readTree(bytes);
            } catch (IOException e) {
                fail("Jackson (strict) refuses a generated JSON text " + GrammarMaskDifferentialTest.show(bytes)
                        + ": " + e.getMessage());
            }
        });
        System.out.printf("JSON generation on cl100k: %d complete outputs, all parsed by Jackson (strict)%n", parsed);
    }

    @Test
    void arithmeticOutputsAreInTheLanguage() {
        generate("arithmetic", 1000 * SCALE, 40, 0.15, 12, null);
    }

    @Test
    void csvOutputsAreInTheLanguage() {
        generate("csv", 1000 * SCALE, 40, 0.15, 13, null);
    }

    @Test
    void orchardQueryOutputsAreInTheLanguage() {
        // clauses chain and quoted values run on under uniform choices: fewer outputs finish
        generate("orchard-query", 500 * SCALE, 32, 0.3, 14, null);
    }

    @Test
    void smallGrammarOutputsAreInTheLanguage() {
        for (String name : new String[] {"ambiguous", "nullable", "high-values"}) {
            generate(name, 1000 * SCALE, 40, 0.15, 15 + name.hashCode(), null);
        }
        // a fixed 60-byte record: uniform choices favour short tokens, so allow many
        generate("orchard-record", 1000 * SCALE, 120, 0.15, 16, null);
    }

    interface Check {
        void accept(byte[] output);
    }

    /** Generates {@code n} outputs; returns how many were complete (and passed {@code extra}). */
    private static int generate(String name, int n, int maxTokens, double endChance, long seed, Check extra) {
        Grammar g = TestGrammars.load(name);
        Constraint c = Constraint.grammar(g, CL100K);
        ReferenceMasks ref = new ReferenceMasks(g, CL100K);
        Random rnd = new Random(seed);
        int complete = 0;
        long t0 = System.nanoTime();
        for (int i = 0; i < n; i++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, maxTokens, endChance);
            byte[] out = s.bytes();
            if (s.complete()) {
                complete++;
                if (!ref.accepts(out)) {
                    fail(name + ": complete output is not in the language: " + GrammarMaskDifferentialTest.show(out));
                }
                if (extra != null) {
                    extra.accept(out);
                }
            } else if (!ref.viable(out)) {
                fail(name + ": unfinished output is not a viable prefix: " + GrammarMaskDifferentialTest.show(out));
            }
        }
        System.out.printf("%s generation on cl100k: %d outputs, %d complete, %d ms%n", name, n, complete,
                (System.nanoTime() - t0) / 1_000_000);
        // end of sequence is chosen with endChance whenever allowed, so many outputs finish
        assertTrue(complete >= n / (name.equals("orchard-query") ? 8 : 4), name + ": only " + complete + " of " + n + " outputs complete");
        return complete;
    }
}
