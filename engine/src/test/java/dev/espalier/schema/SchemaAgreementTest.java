package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.espalier.grammar.GrammarAnalysis;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.testing.TestVocabularies;
import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Random;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The compiled grammars against the outside reference (networknt json-schema-validator, draft
 * 2020-12): every text the grammar generates is a valid instance whose canonical layout is that very
 * text, and on random instances the grammar's verdict equals the validator's. Orchard schemas are
 * invented demo data.
 */
class SchemaAgreementTest {

    static final String INSPECTION = """
            {"$defs":{"score":{"type":"integer","minimum":0,"maximum":10}},
             "type":"object",
             "properties":{
               "block":{"type":"string","pattern":"^[A-H][0-9]{1,2}$"},
               "inspector":{"type":"string","minLength":2,"maxLength":12},
               "health":{"$ref":"#/$defs/score"},
               "pests":{"type":"array","items":{"enum":["codling moth","aphid","scab","canker"]},"maxItems":3},
               "yieldKg":{"type":"number","minimum":0,"exclusiveMaximum":500},
               "notes":{"type":["string","null"],"maxLength":20}},
             "required":["block","health"],
             "additionalProperties":false}""";

    static final String WORK_ORDER = """
            {"type":"object",
             "properties":{
               "task":{"enum":["prune","graft","spray","harvest"]},
               "trees":{"type":"array","items":{"type":"integer","minimum":1,"multipleOf":1},"minItems":1,"maxItems":4},
               "crew":{"type":"integer","minimum":1,"maximum":6},
               "urgent":{"type":"boolean"}},
             "required":["task","trees"],
             "if":{"properties":{"task":{"const":"spray"}},"required":["task"]},
             "then":{"required":["crew"]},
             "additionalProperties":false}""";

    static final String TREE_RECORD = """
            {"$defs":{
               "tree-record":{"type":"object",
                 "properties":{
                   "variety":{"type":"string","maxLength":10},
                   "rootstock":{"oneOf":[{"enum":["M9","M26","MM106"]},{"type":"object","properties":{"code":{"type":"string","maxLength":5}},"required":["code"],"additionalProperties":false}]},
                   "grafts":{"type":"array","maxItems":3,"items":{"$ref":"#/$defs/tree-record"}}},
                 "required":["variety"],"additionalProperties":false}},
             "$ref":"#/$defs/tree-record"}""";

    static final String CATALOGUE = """
            {"type":"object",
             "patternProperties":{"^sku-[0-9]+$":{"type":"object","properties":{"price":{"type":"number","multipleOf":0.01,"minimum":0},"stock":{"type":"integer","minimum":0}},"required":["price"],"additionalProperties":false}},
             "propertyNames":{"maxLength":8},
             "additionalProperties":false,
             "maxProperties":3}""";

    static final String READING = """
            {"anyOf":[
               {"type":"object","properties":{"sensor":{"const":"soil"},"moisture":{"type":"number","minimum":0,"maximum":1}},"required":["sensor","moisture"],"additionalProperties":false},
               {"type":"object","properties":{"sensor":{"const":"air"},"celsius":{"type":"integer","minimum":-30,"maximum":45}},"required":["sensor","celsius"],"additionalProperties":false},
               {"type":"null"}]}""";

    static final String LABEL = """
            {"type":"object",
             "properties":{"variety":{"type":"string","not":{"enum":["unknown",""]}},
                           "rows":{"type":"array","prefixItems":[{"type":"string","maxLength":2},{"type":"integer"}],"items":false,"minItems":1},
                           "grade":{"type":"integer","not":{"minimum":4,"maximum":6}}},
             "dependentRequired":{"grade":["variety"]},
             "minProperties":1}""";

    static final String HARVEST = """
            {"type":"object",
             "properties":{
               "crates":{"type":"array","items":{"type":"integer","minimum":0,"maximum":40},
                         "contains":{"minimum":30},"minContains":1,"maxContains":2,"maxItems":5},
               "pickers":{"type":"array","items":{"enum":["Ash","Briar","Cedar","Hazel"]},"uniqueItems":true}},
             "required":["crates"],
             "additionalProperties":false}""";

    static Stream<Arguments> schemas() {
        return Stream.of(Arguments.of("inspection report", INSPECTION), Arguments.of("work order", WORK_ORDER),
                Arguments.of("tree record", TREE_RECORD), Arguments.of("catalogue", CATALOGUE),
                Arguments.of("sensor reading", READING), Arguments.of("nursery label", LABEL),
                Arguments.of("harvest log", HARVEST));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("schemas")
    void generatedTextsAreValidAndCanonical(String name, String schema) {
        Validator reference = new Validator(schema);
        for (SchemaOptions o : List.of(SchemaOptions.defaults(), SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY),
                SchemaOptions.defaults().withOrder(SchemaOptions.Order.ANY))) {
            SchemaResult r = JsonSchemas.compile(schema, o);
            List<String> texts = GrammarAnalysis.randomExamples(r.grammar(), 150, 7, 12);
            assertTrue(texts.size() >= 20, "enough examples: " + texts.size());
            for (String t : texts) {
                assertTrue(reference.valid(t), o + ": generated text is invalid: " + t);
                JsonNode parsed;
                try {
                    parsed = JsonSchemas.parse(t);
                } catch (SchemaException e) {
                    // other (pattern or additional) members may repeat a name; each value is valid
                    assertTrue(e.getMessage().contains("Duplicate field"), e.getMessage());
                    continue;
                }
                assertEquals(t, r.render(parsed).orElseThrow(), "generated text is canonical");
            }
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("schemas")
    void randomInstancesGetTheReferenceVerdict(String name, String schema) {
        Validator reference = new Validator(schema);
        SchemaResult r = JsonSchemas.compile(schema, SchemaOptions.defaults());
        List<String> seeds = GrammarAnalysis.randomExamples(r.grammar(), 40, 11, 10);
        Random random = new Random(name.hashCode());
        int valid = 0;
        int total = 0;
        for (int i = 0; i < 300; i++) {
            JsonNode instance;
            try {
                instance = mutate(JsonSchemas.parse(seeds.get(i % seeds.size())), random);
            } catch (SchemaException e) {
                continue; // a seed with a repeated member name
            }
            String text = instance.toString();
            boolean expected = reference.valid(text);
            assertEquals(expected, SchemaHarness.acceptsInstance(r, instance), "verdict on " + text);
            valid += expected ? 1 : 0;
            total++;
        }
        assertTrue(valid > 0 && valid < total, "both verdicts occur: " + valid + " of " + total);
    }

    @Test
    void masksOverARealVocabularyAllowOnlyValidOutputs() {
        // cl100k (jtokkit's bundled encoding): sampled outputs under the token masks are valid
        Constraint c = Constraint.grammar(JsonSchemas.compile(WORK_ORDER, SchemaOptions.defaults()).grammar(),
                TestVocabularies.builtin("cl100k"));
        Validator reference = new Validator(WORK_ORDER);
        Random random = new Random(5);
        int complete = 0;
        for (int i = 0; i < 10; i++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, random, 400, 0.5);
            if (s.complete()) {
                complete++;
                String text = new String(s.bytes(), StandardCharsets.UTF_8);
                assertTrue(reference.valid(text), text);
            }
        }
        assertTrue(complete >= 5, "most samples complete: " + complete);
    }

    private static final String[] NAMES = {"crates", "pickers", "block", "health", "task", "trees", "crew", "variety", "rootstock", "grafts",
        "code", "sku-1", "sku-12345", "sensor", "moisture", "celsius", "rows", "grade", "x"};

    /** A few random edits: replace a value, drop or add a member, change an item. */
    static JsonNode mutate(JsonNode n, Random random) {
        JsonNode copy = n.deepCopy();
        int edits = 1 + random.nextInt(2);
        for (int e = 0; e < edits; e++) {
            copy = edit(copy, random);
        }
        return copy;
    }

    private static JsonNode edit(JsonNode n, Random random) {
        List<JsonNode> containers = new ArrayList<>();
        collect(n, containers);
        if (containers.isEmpty() || random.nextInt(8) == 0) {
            return randomValue(random, 2);
        }
        JsonNode c = containers.get(random.nextInt(containers.size()));
        if (c instanceof ObjectNode o) {
            List<String> names = new ArrayList<>();
            o.fieldNames().forEachRemaining(names::add);
            int what = random.nextInt(3);
            if (what == 0 && !names.isEmpty()) {
                o.remove(names.get(random.nextInt(names.size())));
            } else if (what == 1 && !names.isEmpty()) {
                o.set(names.get(random.nextInt(names.size())), randomValue(random, 2));
            } else {
                o.set(NAMES[random.nextInt(NAMES.length)], randomValue(random, 2));
            }
        } else if (c instanceof ArrayNode a) {
            if (a.size() > 0 && random.nextBoolean()) {
                a.set(random.nextInt(a.size()), randomValue(random, 2));
            } else {
                a.add(randomValue(random, 1));
            }
        }
        return n;
    }

    private static void collect(JsonNode n, List<JsonNode> out) {
        if (n.isContainerNode()) {
            out.add(n);
            for (Iterator<JsonNode> it = n.elements(); it.hasNext(); ) {
                collect(it.next(), out);
            }
        }
    }

    private static final String[] STRINGS = {"", "A1", "H12", "Cox", "spray", "soil", "air", "M9", "unknown", "aphid",
        "prune", "a\"b", "é", "xyzxyzxyzxyzxyz", "Ash", "Hazel"};

    static JsonNode randomValue(Random random, int depth) {
        JsonNodeFactory f = JsonNodeFactory.instance;
        switch (random.nextInt(depth > 0 ? 8 : 6)) {
            case 0: return f.nullNode();
            case 1: return f.booleanNode(random.nextBoolean());
            case 2: return f.numberNode(random.nextInt(25) - 5);
            case 3: return f.numberNode(new BigDecimal(random.nextInt(2000) - 100).movePointLeft(random.nextInt(3)));
            case 4:
            case 5: return f.textNode(STRINGS[random.nextInt(STRINGS.length)]);
            case 6: {
                ArrayNode a = f.arrayNode();
                for (int i = random.nextInt(3); i > 0; i--) {
                    a.add(randomValue(random, depth - 1));
                }
                return a;
            }
            default: {
                ObjectNode o = f.objectNode();
                for (int i = random.nextInt(3); i > 0; i--) {
                    o.set(NAMES[random.nextInt(NAMES.length)], randomValue(random, depth - 1));
                }
                return o;
            }
        }
    }
}
