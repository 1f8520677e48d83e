package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.net.URI;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The reference resolution that finds other documents, against outside sources: RFC 3986's examples
 * of reference resolution, and RFC 6901's examples of JSON pointers in URI fragments, here inside
 * another document of a set. Both tables are written from memory of the RFCs (section 5.4 of RFC 3986,
 * section 6 of RFC 6901).
 */
class ReferenceResolutionTest {

    /** RFC 3986 section 5.4: base URI of the examples. */
    private static final String BASE = "http://a/b/c/d;p?q";

    /** RFC 3986 section 5.4.1, normal examples (from memory). */
    private static final String[][] NORMAL = {
        {"g:h", "g:h"}, {"g", "http://a/b/c/g"}, {"./g", "http://a/b/c/g"}, {"g/", "http://a/b/c/g/"},
        {"/g", "http://a/g"}, {"//g", "http://g"}, {"?y", "http://a/b/c/d;p?y"}, {"g?y", "http://a/b/c/g?y"},
        {"#s", "http://a/b/c/d;p?q#s"}, {"g#s", "http://a/b/c/g#s"}, {"g?y#s", "http://a/b/c/g?y#s"},
        {";x", "http://a/b/c/;x"}, {"g;x", "http://a/b/c/g;x"}, {"g;x?y#s", "http://a/b/c/g;x?y#s"},
        {"", "http://a/b/c/d;p?q"}, {".", "http://a/b/c/"}, {"./", "http://a/b/c/"}, {"..", "http://a/b/"},
        {"../", "http://a/b/"}, {"../g", "http://a/b/g"}, {"../..", "http://a/"}, {"../../", "http://a/"},
        {"../../g", "http://a/g"},
    };

    /** RFC 3986 section 5.4.2, abnormal examples (from memory; the strict reading of "http:g"). */
    private static final String[][] ABNORMAL = {
        {"../../../g", "http://a/g"}, {"../../../../g", "http://a/g"}, {"/./g", "http://a/g"}, {"/../g", "http://a/g"},
        {"g.", "http://a/b/c/g."}, {".g", "http://a/b/c/.g"}, {"g..", "http://a/b/c/g.."}, {"..g", "http://a/b/c/..g"},
        {"./../g", "http://a/b/g"}, {"./g/.", "http://a/b/c/g/"}, {"g/./h", "http://a/b/c/g/h"},
        {"g/../h", "http://a/b/c/h"}, {"g;x=1/./y", "http://a/b/c/g;x=1/y"}, {"g;x=1/../y", "http://a/b/c/y"},
        {"g?y/./x", "http://a/b/c/g?y/./x"}, {"g?y/../x", "http://a/b/c/g?y/../x"},
        {"g#s/./x", "http://a/b/c/g#s/./x"}, {"g#s/../x", "http://a/b/c/g#s/../x"}, {"http:g", "http:g"},
    };

    @Test
    void rfc3986ReferenceResolutionExamples() {
        for (String[][] table : new String[][][] {NORMAL, ABNORMAL}) {
            for (String[] c : table) {
                assertEquals(c[1], SchemaIndex.resolveReference(BASE, c[0]), "RFC 3986 5.4: " + c[0]);
            }
        }
    }

    /**
     * RFC 3986 examples through the document set: a reference resolved against the base reaches the
     * document given under the expected URI (the others would not be found).
     */
    @Test
    void documentsAreFoundUnderTheResolvedUri() {
        String[][] some = {{"../g", "http://a/b/g"}, {"../../../g", "http://a/g"}, {"g;x=1/../y", "http://a/b/c/y"},
            {"//g", "http://g"}, {"g?y", "http://a/b/c/g?y"}};
        for (String[] c : some) {
            SchemaDocuments set = SchemaDocuments.empty().with(URI.create(c[1]), JsonSchemas.parse("{\"const\": \"found\"}"));
            JsonNode schema = JsonSchemas.parse("{\"$ref\": \"" + c[0] + "\"}");
            SchemaResult r = JsonSchemas.compile(schema, URI.create(BASE), set, SchemaOptions.defaults());
            assertTrue(SchemaHarness.acceptsInstance(r, "\"found\""), c[0]);
            assertFalse(SchemaHarness.acceptsInstance(r, "\"lost\""), c[0]);
        }
    }

    /** RFC 6901 section 6: the example document and its pointers written as URI fragments (from memory). */
    @Test
    void rfc6901PointersInAnotherDocument() {
        // RFC 6901's example document, each value v made the schema {"const": v}
        JsonNode doc = JsonSchemas.parse("""
                {"$defs": {"foo": {"prefixItems": [{"const": "bar"}, {"const": "baz"}]},
                 "": {"const": 0}, "a/b": {"const": 1}, "c%d": {"const": 2}, "e^f": {"const": 3},
                 "g|h": {"const": 4}, "i\\\\j": {"const": 5}, "k\\"l": {"const": 6}, " ": {"const": 7},
                 "m~n": {"const": 8}}}
                """);
        SchemaDocuments set = SchemaDocuments.empty().with(URI.create("https://orchard.test/pointers.json"), doc);
        Map<String, String> fragments = Map.ofEntries(
                Map.entry("#/$defs/foo/prefixItems/0", "\"bar\""), Map.entry("#/$defs/", "0"),
                Map.entry("#/$defs/a~1b", "1"), Map.entry("#/$defs/c%25d", "2"), Map.entry("#/$defs/e%5Ef", "3"),
                Map.entry("#/$defs/g%7Ch", "4"), Map.entry("#/$defs/i%5Cj", "5"), Map.entry("#/$defs/k%22l", "6"),
                Map.entry("#/$defs/%20", "7"), Map.entry("#/$defs/m~0n", "8"));
        for (Map.Entry<String, String> f : fragments.entrySet()) {
            JsonNode schema = JsonSchemas.parse("{\"$ref\": \"pointers.json" + f.getKey().replace("\"", "\\\"") + "\"}");
            SchemaResult r = JsonSchemas.compile(schema, URI.create("https://orchard.test/inspection.json"), set,
                    SchemaOptions.defaults());
            assertTrue(SchemaHarness.acceptsInstance(r, f.getValue()), f.getKey());
            assertFalse(SchemaHarness.acceptsInstance(r, "9"), f.getKey());
        }
    }
}
