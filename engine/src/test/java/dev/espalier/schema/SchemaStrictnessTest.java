package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

/**
 * Never silently weaker: what cannot be enforced exactly is an error naming the keyword and the JSON
 * pointer of its schema; with leniency the rest is enforced and each relaxation listed.
 */
class SchemaStrictnessTest {

    private static final SchemaOptions LENIENT = SchemaOptions.defaults().withLenient(true);

    @ParameterizedTest(name = "{0} at {1}")
    @CsvSource(delimiter = '|', value = {
        "uniqueItems      | /properties/rows                 | {'properties':{'rows':{'type':'array','uniqueItems':true}}}",
        "uniqueItems      | ''                               | {'items':{'enum':[1,2,3,4,5,6,7,8,9]},'uniqueItems':true}",
        "minProperties    | ''                               | {'properties':{'a':{}},'minProperties':3}",
        "contains         | /items                           | {'items':{'contains':{'type':'object','additionalProperties':false}}}",
        "multipleOf       | /properties/price                | {'properties':{'price':{'type':'number','multipleOf':0.000123456789}}}",
        "oneOf            | ''                               | {'oneOf':[{'type':'integer'},{'type':'object','additionalProperties':false}, {'type':'object','properties':{'a':{}},'additionalProperties':false}]}",
        "$ref             | /properties/owner                | {'properties':{'owner':{'$ref':'https://orchard.example/person.json'}}}",
        "unevaluatedItems | ''                               | {'contains':{'type':'integer'},'unevaluatedItems':false}",
        "not              | /$defs/x                         | {'$defs':{'x':{'not':{'type':'object','additionalProperties':false}}},'$ref':'#/$defs/x'}",
        "pattern          | /properties/code                 | {'properties':{'code':{'pattern':'(a)\\\\1'}}}",
        "unevaluatedProperties | ''                          | {'anyOf':[{'properties':{'a':{}}},{'properties':{'b':{}}}],'unevaluatedProperties':false}",
        "format           | /properties/host                 | {'properties':{'host':{'type':'string','format':'hostname'}}}",
        "format           | /properties/host                 | {'properties':{'host':{'type':'string','format':'hostname','maxLength':254}}}",
    })
    void refusedWithPointer(String keyword, String pointer, String schema) {
        String json = schema.replace('\'', '"');
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(json, SchemaOptions.defaults()));
        assertEquals(keyword, e.keyword(), e.getMessage());
        assertEquals(pointer, e.pointer(), e.getMessage());
        assertTrue(e.getMessage().startsWith("#" + pointer + " " + keyword + ": "), e.getMessage());

        SchemaResult lenient = JsonSchemas.compile(json, LENIENT);
        assertTrue(lenient.relaxations().stream().anyMatch(n -> n.keyword().equals(keyword) && n.pointer().equals(pointer)),
                "relaxation listed: " + lenient.relaxations());
    }

    /**
     * A host name has at most 253 characters (RFC 1123 section 2.1; from memory), which the format's
     * grammar does not count: with a {@code maxLength} of at most 253 the whole name is counted
     * exactly; leniently, without one, longer names pass and the relaxation says so.
     */
    @Test
    void hostNamesAreCountedThroughMaxLength() {
        String longest = "a".repeat(63) + "." + "b".repeat(63) + "." + "c".repeat(63) + "." + "d".repeat(61);
        assertEquals(253, longest.length());
        SchemaResult exact = JsonSchemas.compile("{\"type\":\"string\",\"format\":\"hostname\",\"maxLength\":253}",
                SchemaOptions.defaults());
        assertTrue(exact.relaxations().isEmpty());
        assertTrue(SchemaHarness.acceptsInstance(exact, "\"" + longest + "\""), "253 characters");
        assertFalse(SchemaHarness.acceptsInstance(exact, "\"" + longest + "d\""), "254 characters");
        assertFalse(SchemaHarness.acceptsInstance(exact, "\"orchard..example\""), "still a host name");

        SchemaResult relaxed = JsonSchemas.compile("{\"type\":\"string\",\"format\":\"hostname\"}", LENIENT);
        assertEquals(1, relaxed.relaxations().size());
        assertTrue(relaxed.relaxations().get(0).message().contains("longer strings are accepted"),
                relaxed.relaxations().get(0).message());
        assertTrue(SchemaHarness.acceptsInstance(relaxed, "\"" + longest + ".e\""), "255 characters, relaxed");
        assertFalse(SchemaHarness.acceptsInstance(relaxed, "\"-orchard.example\""), "labels still checked");
    }

    @Test
    void lenientKeepsEnforcingTheRest() {
        SchemaResult r = JsonSchemas.compile("{\"type\":\"array\",\"items\":{\"type\":\"integer\"},\"maxItems\":3,\"uniqueItems\":true}", LENIENT);
        assertEquals(1, r.relaxations().size());
        assertTrue(SchemaHarness.acceptsInstance(r, "[1,1]"), "uniqueItems relaxed");
        assertFalse(SchemaHarness.acceptsInstance(r, "[1,\"a\"]"), "items still enforced");
        assertFalse(SchemaHarness.acceptsInstance(r, "[1,2,3,4]"), "maxItems still enforced");
    }

    @Test
    void lenientOverlappingOneOfBecomesAnyOf() {
        String schema = "{\"oneOf\":[{\"type\":\"object\",\"additionalProperties\":false},{\"type\":\"object\",\"properties\":{\"a\":{}},\"additionalProperties\":false}]}";
        SchemaResult r = JsonSchemas.compile(schema, LENIENT);
        assertEquals("oneOf", r.relaxations().get(0).keyword());
        assertTrue(SchemaHarness.acceptsInstance(r, "{}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "[]"));
    }

    @Test
    void uniqueItemsWithAtMostOneItemIsExact() {
        SchemaResult r = JsonSchemas.compile("{\"type\":\"array\",\"maxItems\":1,\"uniqueItems\":true}", SchemaOptions.defaults());
        assertTrue(r.relaxations().isEmpty());
        assertTrue(SchemaHarness.acceptsInstance(r, "[1]"));
        assertFalse(SchemaHarness.acceptsInstance(r, "[1,2]"));
    }

    @Test
    void unknownKeywordsAndFormatsAreWarnings() {
        SchemaResult r = JsonSchemas.compile("{\"properties\":{\"graft\":{\"type\":\"string\",\"format\":\"graft-code\",\"x-colour\":\"red\"}}}",
                SchemaOptions.defaults());
        assertTrue(r.relaxations().isEmpty());
        List<String> warned = r.warnings().stream().map(n -> n.pointer() + " " + n.keyword()).toList();
        assertEquals(List.of("/properties/graft format", "/properties/graft x-colour"), warned.stream().sorted().toList());
    }

    @Test
    void annotationsAreIgnoredSilently() {
        SchemaResult r = JsonSchemas.compile("{\"title\":\"Tree\",\"description\":\"d\",\"default\":1,\"examples\":[1],\"$comment\":\"c\","
                + "\"$schema\":\"https://json-schema.org/draft/2020-12/schema\",\"type\":\"integer\"}", SchemaOptions.defaults());
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
    }

    @Test
    void malformedJsonGivesLineAndColumn() {
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile("{\n  \"type\": \"string\",\n  \"maxLength\": }", SchemaOptions.defaults()));
        assertEquals("", e.pointer());
        assertTrue(e.getMessage().contains("line 3, column 16"), e.getMessage());
        assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"a\":1} x", SchemaOptions.defaults()));
        assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"type\":\"string\",\"type\":\"integer\"}", SchemaOptions.defaults()));
    }

    @Test
    void malformedSchemasNameTheKeyword() {
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile("{\"properties\":{\"rows\":{\"minItems\":-1}}}", SchemaOptions.defaults()));
        assertEquals("/properties/rows", e.pointer());
        assertEquals("minItems", e.keyword());
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"type\":\"tree\"}", SchemaOptions.defaults()));
        assertEquals("type", e.keyword());
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"$ref\":\"#/$defs/missing\"}", SchemaOptions.defaults()));
        assertEquals("$ref", e.keyword());
    }

    @Test
    void schemaAcceptingNothingIsAnError() {
        assertThrows(SchemaException.class, () -> JsonSchemas.compile("false", SchemaOptions.defaults()));
        assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"type\":\"object\",\"properties\":{\"a\":false},\"required\":[\"a\"]}", SchemaOptions.defaults()));
        assertThrows(SchemaException.class, () -> JsonSchemas.compile("{\"type\":\"integer\",\"minimum\":5,\"maximum\":4}", SchemaOptions.defaults()));
    }

    @Test
    void referenceCycleWithoutStructureIsAnError() {
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile("{\"$defs\":{\"a\":{\"$ref\":\"#/$defs/b\"},\"b\":{\"$ref\":\"#/$defs/a\"}},\"$ref\":\"#/$defs/a\"}",
                        SchemaOptions.defaults()));
        assertEquals("$ref", e.keyword());
    }
}
