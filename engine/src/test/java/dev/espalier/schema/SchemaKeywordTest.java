package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * One schema per keyword (or combination), with instances the schema accepts and instances it
 * refuses. Each verdict is checked twice: by the outside reference (networknt json-schema-validator,
 * draft 2020-12, which confirms the labels), and by the compiled grammar (the instance laid out by
 * {@link SchemaResult#render}, fed to the Earley recognizer; an instance that cannot be laid out
 * counts as refused). The examples use the orchard scenario (invented demo data).
 */
class SchemaKeywordTest {

    record Case(String keyword, String schema, List<String> valid, List<String> invalid) {
    }

    private static Case c(String keyword, String schema, String valid, String invalid) {
        return new Case(keyword, schema, split(valid), split(invalid));
    }

    /** Instances separated by " | ". */
    private static List<String> split(String s) {
        List<String> out = new ArrayList<>();
        for (String part : s.split(" \\| ")) {
            if (!part.isBlank()) {
                out.add(part.trim());
            }
        }
        return out;
    }

    static Stream<Arguments> cases() {
        List<Case> cs = List.of(
            c("type", "{\"type\":\"string\"}", "\"Bramley\" | \"\" | \"a\\\"b\\\\c\\n\"", "1 | null | [] | {} | true"),
            c("type array", "{\"type\":[\"integer\",\"null\"]}", "1 | -7 | null | 1.0 | 20000000000000000000000", "1.5 | \"1\" | false"),
            c("type number", "{\"type\":\"number\"}", "0 | -0.25 | 1e3 | 12.50 | 3", "\"3\" | null"),
            c("type boolean", "{\"type\":\"boolean\"}", "true | false", "0 | \"true\" | null"),
            c("enum", "{\"enum\":[\"Bramley\",\"Cox\",3,null,{\"graft\":\"whip\"},[1,2]]}",
                "\"Cox\" | 3 | 3.0 | null | {\"graft\":\"whip\"} | [1,2]", "\"cox\" | 4 | {\"graft\":\"cleft\"} | [2,1] | []"),
            c("const", "{\"const\":{\"rootstock\":\"M9\",\"vigour\":2}}",
                "{\"rootstock\":\"M9\",\"vigour\":2} | {\"vigour\":2.0,\"rootstock\":\"M9\"}",
                "{\"rootstock\":\"M9\"} | {\"rootstock\":\"M9\",\"vigour\":3} | \"M9\""),
            c("minLength maxLength", "{\"type\":\"string\",\"minLength\":2,\"maxLength\":4}",
                "\"ab\" | \"abcd\" | \"\\u00e9\\u00e9\" | \"\\ud83c\\udf4e\\ud83c\\udf4e\" | \"\\n\\t\"", "\"a\" | \"abcde\" | \"\" | \"\\ud83c\\udf4e\""),
            c("pattern search", "{\"type\":\"string\",\"pattern\":\"[0-9]{3}\"}", "\"row 123\" | \"123\" | \"x9999\"", "\"12\" | \"1 2 3\" | \"\""),
            c("pattern anchored", "{\"type\":\"string\",\"pattern\":\"^[A-Z]{2}-[0-9]+$\"}", "\"MM-106\" | \"AB-1\"", "\"xMM-106\" | \"MM-106x\" | \"MM-\""),
            c("pattern with quote", "{\"type\":\"string\",\"pattern\":\"^a\\\"b\\\\\\\\?$\"}", "\"a\\\"b\" | \"a\\\"b\\\\\"", "\"ab\" | \"a\\\"b\\\\\\\\\""),
            c("pattern and length", "{\"type\":\"string\",\"pattern\":\"^[a-z]+$\",\"minLength\":3,\"maxLength\":5}",
                "\"abc\" | \"abcde\"", "\"ab\" | \"abcdef\" | \"ABC\""),
            c("minimum maximum", "{\"type\":\"integer\",\"minimum\":-5,\"maximum\":120}", "-5 | 0 | 120 | 7", "-6 | 121 | 1000 | 2.5"),
            c("exclusive bounds", "{\"type\":\"number\",\"exclusiveMinimum\":0,\"exclusiveMaximum\":1.5}",
                "0.001 | 1 | 1.49 | 0.5", "0 | 1.5 | -0.1 | 2"),
            c("multipleOf integer", "{\"type\":\"integer\",\"multipleOf\":7,\"minimum\":0,\"maximum\":100}", "0 | 7 | 98", "1 | 99 | 105 | -7"),
            c("multipleOf power of ten", "{\"type\":\"number\",\"multipleOf\":0.01}", "1 | 2.5 | 3.25 | -0.01", "0.001 | 1.125"),
            c("multipleOf decimal", "{\"type\":\"number\",\"multipleOf\":0.25,\"maximum\":3}", "0 | 0.25 | 1.5 | 3 | -2.75 | 0.5", "0.1 | 3.25 | 1.2 | 0.125"),
            c("multipleOf decimal over integers", "{\"type\":\"integer\",\"multipleOf\":1.5}", "0 | 3 | -6 | 30", "1 | 2 | 4 | 1.5"),
            c("properties required", "{\"type\":\"object\",\"properties\":{\"variety\":{\"type\":\"string\"},\"rows\":{\"type\":\"integer\"}},\"required\":[\"variety\"]}",
                "{\"variety\":\"Cox\"} | {\"rows\":3,\"variety\":\"Cox\"} | {\"variety\":\"Cox\",\"note\":[1]}",
                "{} | {\"rows\":3} | {\"variety\":1} | []"),
            c("additionalProperties false", "{\"properties\":{\"a\":{},\"b\":{}},\"additionalProperties\":false}",
                "{} | {\"b\":1} | {\"a\":1,\"b\":2} | 7", "{\"c\":1} | {\"a\":1,\"c\":2}"),
            c("additionalProperties schema", "{\"properties\":{\"a\":{}},\"additionalProperties\":{\"type\":\"boolean\"}}",
                "{\"a\":1,\"x\":true,\"y\":false} | {\"aa\":true}", "{\"x\":1} | {\"a\":1,\"b\":null}"),
            c("patternProperties", "{\"patternProperties\":{\"^row-\":{\"type\":\"integer\"},\"-east$\":{\"minimum\":10}},\"additionalProperties\":false}",
                "{\"row-1\":3} | {\"row-east\":12} | {\"x-east\":10.5}", "{\"row-1\":\"x\"} | {\"row-east\":3} | {\"x\":1} | {\"row-east\":10.5}"),
            c("propertyNames", "{\"propertyNames\":{\"maxLength\":3,\"pattern\":\"^[a-z]\"}}",
                "{\"abc\":1} | {} | {\"a\":1,\"b\":2}", "{\"abcd\":1} | {\"1a\":2}"),
            c("items", "{\"type\":\"array\",\"items\":{\"type\":\"integer\"},\"minItems\":1,\"maxItems\":3}",
                "[1] | [1,2,3]", "[] | [1,2,3,4] | [1,\"2\"]"),
            c("prefixItems", "{\"prefixItems\":[{\"type\":\"string\"},{\"type\":\"integer\"}],\"items\":false}",
                "[] | [\"Cox\"] | [\"Cox\",4]", "[4] | [\"Cox\",4,5] | [\"Cox\",\"4\"]"),
            c("prefixItems with items", "{\"prefixItems\":[{\"const\":\"row\"}],\"items\":{\"type\":\"integer\"},\"minItems\":2}",
                "[\"row\",1] | [\"row\",1,2,3]", "[\"row\"] | [1,2] | [\"row\",\"x\"]"),
            c("draft-07 items array", "{\"$schema\":\"http://json-schema.org/draft-07/schema#\",\"items\":[{\"type\":\"string\"}],\"additionalItems\":{\"type\":\"boolean\"}}",
                "[\"a\"] | [\"a\",true,false] | []", "[1] | [\"a\",1]"),
            c("minProperties maxProperties", "{\"properties\":{\"a\":{},\"b\":{},\"c\":{}},\"minProperties\":1,\"maxProperties\":2}",
                "{\"a\":1} | {\"a\":1,\"c\":2} | {\"x\":1} | {\"b\":1,\"x\":2}", "{} | {\"a\":1,\"b\":2,\"c\":3} | {\"a\":1,\"x\":2,\"y\":3}"),
            c("dependentRequired", "{\"properties\":{\"graftDate\":{},\"rootstock\":{},\"scion\":{}},\"dependentRequired\":{\"scion\":[\"rootstock\"],\"graftDate\":[\"scion\"]}}",
                "{} | {\"rootstock\":1} | {\"scion\":1,\"rootstock\":2} | {\"graftDate\":1,\"scion\":2,\"rootstock\":3}",
                "{\"scion\":1} | {\"graftDate\":1} | {\"graftDate\":1,\"scion\":2}"),
            c("dependentSchemas", "{\"properties\":{\"scion\":{},\"rootstock\":{}},\"dependentSchemas\":{\"scion\":{\"properties\":{\"rootstock\":{\"enum\":[\"M9\",\"M26\"]}},\"required\":[\"rootstock\"]}}}",
                "{} | {\"rootstock\":\"MM106\"} | {\"scion\":1,\"rootstock\":\"M9\"} | 5", "{\"scion\":1} | {\"scion\":1,\"rootstock\":\"MM106\"}"),
            c("anyOf", "{\"anyOf\":[{\"type\":\"string\",\"maxLength\":2},{\"type\":\"integer\",\"minimum\":10}]}",
                "\"ab\" | 10 | 99", "\"abc\" | 9 | null"),
            c("oneOf disjoint by type", "{\"oneOf\":[{\"type\":\"string\"},{\"type\":\"integer\"}]}", "\"a\" | 1", "1.5 | null"),
            c("oneOf overlapping", "{\"oneOf\":[{\"type\":\"integer\",\"minimum\":0},{\"type\":\"integer\",\"maximum\":10}]}",
                "-5 | 11 | 100", "0 | 5 | 10 | \"x\""),
            c("oneOf closed objects", "{\"oneOf\":[{\"type\":\"object\",\"properties\":{\"kind\":{\"const\":\"tree\"},\"variety\":{}},\"required\":[\"kind\"],\"additionalProperties\":false},"
                + "{\"type\":\"object\",\"properties\":{\"kind\":{\"const\":\"hedge\"},\"length\":{}},\"required\":[\"kind\"],\"additionalProperties\":false}]}",
                "{\"kind\":\"tree\",\"variety\":\"Cox\"} | {\"kind\":\"hedge\",\"length\":4}", "{\"kind\":\"tree\",\"length\":4} | {\"kind\":\"shrub\"}"),
            c("allOf", "{\"allOf\":[{\"properties\":{\"a\":{\"type\":\"integer\"}},\"required\":[\"a\"]},{\"properties\":{\"a\":{\"minimum\":3},\"b\":{\"type\":\"string\"}}}]}",
                "{\"a\":3} | {\"a\":4,\"b\":\"x\"}", "{\"a\":2} | {\"b\":\"x\"} | {\"a\":3,\"b\":1}"),
            c("not type", "{\"not\":{\"type\":[\"string\",\"null\"]}}", "1 | [] | {} | true", "\"a\" | null"),
            c("not enum", "{\"type\":\"string\",\"not\":{\"enum\":[\"Cox\",\"Bramley\"]}}", "\"Gala\" | \"cox\" | \"\"", "\"Cox\" | \"Bramley\""),
            c("not number range", "{\"type\":\"integer\",\"not\":{\"minimum\":3,\"maximum\":5}}", "2 | 6 | -1", "3 | 4 | 5"),
            c("if then else", "{\"if\":{\"properties\":{\"kind\":{\"const\":\"tree\"}},\"required\":[\"kind\"]},"
                + "\"then\":{\"required\":[\"variety\"]},\"else\":{\"required\":[\"length\"]}}",
                "{\"kind\":\"tree\",\"variety\":\"Cox\"} | {\"kind\":\"hedge\",\"length\":3} | {\"length\":1}",
                "{\"kind\":\"tree\"} | {\"kind\":\"hedge\",\"variety\":\"Cox\"} | {}"),
            c("$ref and $defs", "{\"$defs\":{\"tree-record\":{\"type\":\"object\",\"properties\":{\"variety\":{\"type\":\"string\"}},\"required\":[\"variety\"]}},"
                + "\"type\":\"array\",\"items\":{\"$ref\":\"#/$defs/tree-record\"}}",
                "[] | [{\"variety\":\"Cox\"}]", "[{}] | [{\"variety\":1}]"),
            c("pointer escapes", "{\"definitions\":{\"a/b\":{\"type\":\"integer\"},\"c~d\":{\"type\":\"string\"},\"e%f\":{\"type\":\"null\"}},"
                + "\"properties\":{\"x\":{\"$ref\":\"#/definitions/a~1b\"},\"y\":{\"$ref\":\"#/definitions/c~0d\"},\"z\":{\"$ref\":\"#/definitions/e%25f\"}}}",
                "{\"x\":1,\"y\":\"s\",\"z\":null}", "{\"x\":\"s\"} | {\"y\":1} | {\"z\":1}"),
            c("$anchor and $id", "{\"$id\":\"https://orchard.example/tree\",\"$defs\":{\"v\":{\"$anchor\":\"variety\",\"type\":\"string\"},"
                + "\"r\":{\"$id\":\"rootstock\",\"enum\":[\"M9\",\"M26\"]}},\"properties\":{\"v\":{\"$ref\":\"#variety\"},\"r\":{\"$ref\":\"rootstock\"}}}",
                "{\"v\":\"Cox\",\"r\":\"M9\"}", "{\"v\":1} | {\"r\":\"M27\"}"),
            c("recursion", "{\"$defs\":{\"node\":{\"type\":\"object\",\"properties\":{\"name\":{\"type\":\"string\"},"
                + "\"children\":{\"type\":\"array\",\"items\":{\"$ref\":\"#/$defs/node\"}}},\"required\":[\"name\"],\"additionalProperties\":false}},\"$ref\":\"#/$defs/node\"}",
                "{\"name\":\"orchard\",\"children\":[{\"name\":\"row\",\"children\":[{\"name\":\"tree\"}]}]}",
                "{\"name\":\"orchard\",\"children\":[{\"children\":[]}]} | {\"name\":\"x\",\"children\":[{\"name\":1}]}"),
            c("boolean schemas", "{\"properties\":{\"a\":true,\"b\":false}}", "{\"a\":[1,{\"x\":null}]} | {}", "{\"b\":1}"),
            c("uniqueItems over an enum", "{\"type\":\"array\",\"items\":{\"enum\":[\"aphid\",\"scab\",1,{\"a\":[1]}]},\"uniqueItems\":true,\"minItems\":1}",
                "[\"aphid\"] | [\"scab\",\"aphid\"] | [1,{\"a\":[1]},\"scab\",\"aphid\"] | [1.0,\"scab\"]",
                "[] | [\"aphid\",\"aphid\"] | [1,1.0] | [{\"a\":[1]},{\"a\":[1.0]}] | [\"canker\"]"),
            c("uniqueItems over booleans", "{\"type\":\"array\",\"items\":{\"type\":[\"boolean\",\"null\"]},\"uniqueItems\":true}",
                "[] | [true,null,false] | [false]", "[true,true] | [null,false,null]"),
            c("contains", "{\"type\":\"array\",\"items\":{\"type\":\"integer\"},\"contains\":{\"minimum\":10}}",
                "[10] | [1,2,30] | [11,12]", "[] | [1,2,3] | [1,\"x\",10]"),
            c("minContains maxContains", "{\"type\":\"array\",\"contains\":{\"const\":\"scab\"},\"minContains\":2,\"maxContains\":3,\"maxItems\":5}",
                "[\"scab\",\"scab\"] | [1,\"scab\",null,\"scab\",\"scab\"]", "[\"scab\"] | [\"scab\",\"scab\",\"scab\",\"scab\"] | [1,2,3,4,\"scab\",\"scab\"]"),
            c("unevaluatedProperties with allOf and $ref", "{\"$defs\":{\"base\":{\"properties\":{\"id\":{\"type\":\"integer\"}},\"required\":[\"id\"]}},"
                + "\"allOf\":[{\"$ref\":\"#/$defs/base\"}],\"properties\":{\"variety\":{\"type\":\"string\"}},\"unevaluatedProperties\":false}",
                "{\"id\":1} | {\"id\":1,\"variety\":\"Cox\"}", "{\"id\":1,\"row\":2} | {\"variety\":\"Cox\"}"),
            c("unevaluatedItems with prefixItems in allOf", "{\"allOf\":[{\"prefixItems\":[{\"type\":\"string\"}]}],\"unevaluatedItems\":{\"type\":\"integer\"}}",
                "[] | [\"row\"] | [\"row\",1,2]", "[\"row\",\"x\"] | [1,\"row\"]"),
            c("unevaluatedProperties alone", "{\"properties\":{\"a\":{}},\"unevaluatedProperties\":false}", "{\"a\":1} | {}", "{\"b\":1}"));
        return cs.stream().map(x -> Arguments.of(x.keyword(), x));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void verdictsAgreeWithTheReference(String keyword, Case c) {
        Validator reference = new Validator(c.schema());
        SchemaResult compiled = JsonSchemas.compile(c.schema(), SchemaOptions.defaults());
        SchemaResult pretty = JsonSchemas.compile(c.schema(), SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY));
        for (String v : c.valid()) {
            assertTrue(reference.valid(v), "reference refuses the valid example " + v);
            assertTrue(SchemaHarness.acceptsInstance(compiled, v), "grammar refuses " + v + " laid out as "
                    + compiled.render(JsonSchemas.parse(v)));
            assertTrue(SchemaHarness.acceptsInstance(pretty, v), "pretty grammar refuses " + v);
        }
        for (String v : c.invalid()) {
            assertEquals(false, reference.valid(v), "reference accepts the invalid example " + v);
            assertEquals(false, SchemaHarness.acceptsInstance(compiled, v), "grammar accepts " + v);
            assertEquals(false, SchemaHarness.acceptsInstance(pretty, v), "pretty grammar accepts " + v);
        }
    }
}
