package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Writing the state rules of a large string language as they are made (escaped for JSON, literals
 * split for reading) gives exactly the rules that making them and then encoding them in a second
 * walk gives: the compiler's fast path against its slow twin, grammar for grammar.
 */
class StateRuleWritingTest {

    /**
     * String languages large enough for one rule per state (more than
     * {@link RegularRules#ELIMINATION_STATES} states), with characters that JSON escapes, characters
     * outside the BMP and literals that split for reading.
     */
    private static final List<String> LARGE = List.of(
            "{\"type\":\"string\",\"format\":\"email\",\"maxLength\":60}",
            "{\"type\":\"string\",\"format\":\"email\",\"minLength\":5,\"maxLength\":40}",
            "{\"type\":\"string\",\"format\":\"hostname\",\"maxLength\":80}",
            "{\"type\":\"string\",\"format\":\"uri\",\"maxLength\":40}",
            "{\"type\":\"string\",\"pattern\":\"^([a-z\\\"\\\\\\\\]{1,9}\\\\n|[\\\\u0001-\\\\u001f]x){1,30}$\",\"maxLength\":90}",
            "{\"type\":\"string\",\"pattern\":\"^(\\\"[^\\\"]{0,20}\\\"|[\uD83C\uDF30-\uD83C\uDF4F]{2}|ab){1,12}$\",\"maxLength\":70}",
            "{\"type\":\"object\",\"properties\":{\"a\":{\"type\":\"string\",\"format\":\"email\",\"maxLength\":30},"
                    + "\"b\":{\"type\":\"string\",\"format\":\"email\",\"maxLength\":30}}}");

    @Test
    void largeStringLanguagesGetTheSameRulesBothWays() {
        for (String schema : LARGE) {
            int[] sizes = compareBothWays(schema, SchemaOptions.defaults(), schema);
            assertTrue(sizes[0] > RegularRules.ELIMINATION_STATES / 2,
                    "the language is large enough for state rules: " + sizes[0] + " rules, " + schema);
        }
    }

    @Test
    void corpusSchemasGetTheSameRulesBothWays() throws Exception {
        int largest = 0;
        for (Path f : SchemaCorpusTest.corpus()) {
            String text = Files.readString(f);
            for (SchemaOptions options : List.of(SchemaOptions.defaults(),
                    SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY))) {
                largest = Math.max(largest, compareBothWays(text, options, f.getFileName().toString())[0]);
            }
        }
        assertTrue(largest > RegularRules.ELIMINATION_STATES, "some corpus schema has state rules: " + largest);
    }

    /** Compiles both ways, asserts the same rules in the same order; returns the rule count. */
    private static int[] compareBothWays(String schema, SchemaOptions options, String label) {
        Grammar fast = new SchemaCompiler(JsonSchemas.parse(schema), options, true).compile().grammar();
        Grammar slow = new SchemaCompiler(JsonSchemas.parse(schema), options, false).compile().grammar();
        List<Rule> a = new ArrayList<>(fast.rules());
        List<Rule> b = new ArrayList<>(slow.rules());
        assertEquals(b.size(), a.size(), label);
        for (int i = 0; i < a.size(); i++) {
            assertEquals(b.get(i), a.get(i), label + ": rule " + b.get(i).name());
        }
        assertEquals(slow.start(), fast.start(), label);
        return new int[] {a.size()};
    }
}
