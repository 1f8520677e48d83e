package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * References to other schema documents: files beside a schema file, and documents of a
 * {@link SchemaDocuments} set under absolute URIs. Each multi-document schema is checked instance by
 * instance through its grammar ({@link SchemaHarness#acceptsInstance}); where an inlined, one-document
 * equivalent is written out, the outside reference (networknt json-schema-validator, {@link Validator})
 * labels the instances on it, and the one-document compile must agree too. Schemas are orchard demo
 * data (invented).
 */
class SchemaDocumentsTest {

    @TempDir
    Path dir;

    private Path write(String name, String text) throws IOException {
        Path p = dir.resolve(name);
        Files.createDirectories(p.getParent());
        Files.writeString(p, text, StandardCharsets.UTF_8);
        return p;
    }

    private static final String WORK_ORDER = """
            {"type": "object",
             "properties": {
               "order": {"type": "string", "pattern": "^WO-[0-9]{4}$"},
               "tree": {"$ref": "common/tree.schema.json#/$defs/treeId"},
               "site": {"$ref": "common/site.schema.json"},
               "task": {"enum": ["prune", "graft", "spray"]}},
             "required": ["order", "tree", "site"],
             "additionalProperties": false,
             "$defs": {"inspector": {"type": "string", "pattern": "^I[0-9]{2}$"}}}
            """;
    private static final String TREE = """
            {"$defs": {
               "treeId": {"type": "string", "pattern": "^T-[0-9]{3}$"},
               "variety": {"enum": ["Amberglow", "Copperbell"]}}}
            """;
    /** Refers to a third document beside it and back into the root document. */
    private static final String SITE = """
            {"type": "object",
             "properties": {
               "block": {"type": "string", "pattern": "^[A-H]$"},
               "row": {"type": "integer", "minimum": 1, "maximum": 40},
               "variety": {"$ref": "tree.schema.json#/$defs/variety"},
               "inspector": {"$ref": "../work-order.schema.json#/$defs/inspector"}},
             "required": ["block", "row"],
             "additionalProperties": false}
            """;
    /** The same language in one document, for the outside reference. */
    private static final String WORK_ORDER_INLINED = """
            {"type": "object",
             "properties": {
               "order": {"type": "string", "pattern": "^WO-[0-9]{4}$"},
               "tree": {"type": "string", "pattern": "^T-[0-9]{3}$"},
               "site": {"type": "object",
                 "properties": {
                   "block": {"type": "string", "pattern": "^[A-H]$"},
                   "row": {"type": "integer", "minimum": 1, "maximum": 40},
                   "variety": {"enum": ["Amberglow", "Copperbell"]},
                   "inspector": {"type": "string", "pattern": "^I[0-9]{2}$"}},
                 "required": ["block", "row"],
                 "additionalProperties": false},
               "task": {"enum": ["prune", "graft", "spray"]}},
             "required": ["order", "tree", "site"],
             "additionalProperties": false}
            """;
    private static final List<String> WORK_ORDER_VALID = List.of(
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\",\"site\":{\"block\":\"C\",\"row\":12}}",
            "{\"order\":\"WO-0417\",\"tree\":\"T-900\",\"site\":{\"block\":\"H\",\"row\":40,\"variety\":\"Copperbell\","
                    + "\"inspector\":\"I07\"},\"task\":\"graft\"}");
    private static final List<String> WORK_ORDER_INVALID = List.of(
            "{\"order\":\"WO-0001\",\"tree\":\"T-42\",\"site\":{\"block\":\"C\",\"row\":12}}",
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\",\"site\":{\"block\":\"J\",\"row\":12}}",
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\",\"site\":{\"block\":\"C\",\"row\":41}}",
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\",\"site\":{\"block\":\"C\",\"row\":2,\"variety\":\"Russet\"}}",
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\",\"site\":{\"block\":\"C\",\"row\":2,\"inspector\":\"I7\"}}",
            "{\"order\":\"WO-0001\",\"tree\":\"T-042\"}");

    private Path workOrderFiles() throws IOException {
        write("common/tree.schema.json", TREE);
        write("common/site.schema.json", SITE);
        return write("work-order.schema.json", WORK_ORDER);
    }

    @Test
    void filesBesideTheSchemaFileAreReadOnFirstUse() throws IOException {
        SchemaResult r = JsonSchemas.compile(workOrderFiles(), SchemaOptions.defaults());
        SchemaResult inlined = SchemaHarness.compile(WORK_ORDER_INLINED);
        Validator outside = new Validator(WORK_ORDER_INLINED);
        for (String v : WORK_ORDER_VALID) {
            assertTrue(outside.valid(v), "outside reference: " + v);
            assertTrue(SchemaHarness.acceptsInstance(r, v), v);
            assertTrue(SchemaHarness.acceptsInstance(inlined, v), v);
        }
        for (String v : WORK_ORDER_INVALID) {
            assertFalse(outside.valid(v), "outside reference: " + v);
            assertFalse(SchemaHarness.acceptsInstance(r, v), v);
            assertFalse(SchemaHarness.acceptsInstance(inlined, v), v);
        }
        // readable rule names, also for the locations inside the other documents
        List<String> names = r.grammar().rules().stream().map(dev.espalier.grammar.Rule::name).toList();
        assertTrue(names.containsAll(List.of("tree", "site", "block", "row", "variety", "inspector")), names.toString());
        // the same in the pretty layout and in any order
        for (SchemaOptions o : List.of(SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY),
                SchemaOptions.defaults().withOrder(SchemaOptions.Order.ANY))) {
            SchemaResult other = JsonSchemas.compile(dir.resolve("work-order.schema.json"), o);
            WORK_ORDER_VALID.forEach(v -> assertTrue(SchemaHarness.acceptsInstance(other, v), v));
            WORK_ORDER_INVALID.forEach(v -> assertFalse(SchemaHarness.acceptsInstance(other, v), v));
        }
    }

    @Test
    void aRelativePathToTheFileWorksAsWell() throws IOException {
        workOrderFiles();
        Path relative = Path.of("").toAbsolutePath().relativize(dir.resolve("work-order.schema.json"));
        SchemaResult r = JsonSchemas.compile(relative, SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(r, WORK_ORDER_VALID.get(1)));
    }

    @Test
    void theTextAndNodeOverloadsReadNoFiles() throws IOException {
        workOrderFiles();
        SchemaException e = assertThrows(SchemaException.class, () -> SchemaHarness.compile(WORK_ORDER));
        assertEquals("/properties/tree", e.pointer());
        assertEquals("$ref", e.keyword());
        // relative to urn:espalier:schema, which has no path
        assertTrue(e.getMessage().contains("give the schema an absolute $id"), e.getMessage());
        String absolute = "{\"$ref\": \"" + dir.resolve("common/tree.schema.json").toUri() + "#/$defs/treeId\"}";
        e = assertThrows(SchemaException.class, () -> SchemaHarness.compile(absolute));
        assertTrue(e.detail().startsWith("remote reference "), e.getMessage());
        assertTrue(e.getMessage().contains("is not supplied"), e.getMessage());
    }

    /** A tree whose grafts are defined in another file, whose scions are trees again. */
    @Test
    void recursionAcrossTwoFiles() throws IOException {
        write("graft.schema.json", """
                {"type": "object",
                 "properties": {
                   "method": {"enum": ["whip", "cleft", "bud"]},
                   "scion": {"$ref": "tree-node.schema.json"}},
                 "required": ["method"],
                 "additionalProperties": false}
                """);
        Path root = write("tree-node.schema.json", """
                {"type": "object",
                 "properties": {
                   "variety": {"type": "string", "pattern": "^[A-Z][a-z]+$"},
                   "grafts": {"type": "array", "items": {"$ref": "graft.schema.json"}, "maxItems": 3}},
                 "required": ["variety"],
                 "additionalProperties": false}
                """);
        String inlined = """
                {"type": "object",
                 "properties": {
                   "variety": {"type": "string", "pattern": "^[A-Z][a-z]+$"},
                   "grafts": {"type": "array", "items": {"$ref": "#/$defs/graft"}, "maxItems": 3}},
                 "required": ["variety"],
                 "additionalProperties": false,
                 "$defs": {"graft": {"type": "object",
                   "properties": {"method": {"enum": ["whip", "cleft", "bud"]}, "scion": {"$ref": "#"}},
                   "required": ["method"], "additionalProperties": false}}}
                """;
        List<String> valid = List.of(
                "{\"variety\":\"Amberglow\"}",
                "{\"variety\":\"Amberglow\",\"grafts\":[{\"method\":\"whip\",\"scion\":{\"variety\":\"Copperbell\","
                        + "\"grafts\":[{\"method\":\"bud\",\"scion\":{\"variety\":\"Russet\",\"grafts\":[]}}]}}]}",
                "{\"variety\":\"Amberglow\",\"grafts\":[{\"method\":\"cleft\"},{\"method\":\"bud\"}]}");
        List<String> invalid = List.of(
                "{\"variety\":\"Amberglow\",\"grafts\":[{\"method\":\"whip\",\"scion\":{\"variety\":\"copperbell\"}}]}",
                "{\"variety\":\"Amberglow\",\"grafts\":[{\"method\":\"whip\",\"scion\":{\"variety\":\"Copperbell\","
                        + "\"grafts\":[{\"method\":\"saddle\"}]}}]}",
                "{\"variety\":\"Amberglow\",\"grafts\":[{\"scion\":{\"variety\":\"Copperbell\"}}]}");
        SchemaResult r = JsonSchemas.compile(root, SchemaOptions.defaults());
        Validator outside = new Validator(inlined);
        for (String v : valid) {
            assertTrue(outside.valid(v), "outside reference: " + v);
            assertTrue(SchemaHarness.acceptsInstance(r, v), v);
        }
        for (String v : invalid) {
            assertFalse(outside.valid(v), "outside reference: " + v);
            assertFalse(SchemaHarness.acceptsInstance(r, v), v);
        }
        // the grammar is recursive, as a one-document recursive schema's is
        List<String> names = r.grammar().rules().stream().map(dev.espalier.grammar.Rule::name).toList();
        assertTrue(names.stream().anyMatch(n -> n.startsWith("grafts")), names.toString());
    }

    private static JsonNode json(String text) {
        return JsonSchemas.parse(text);
    }

    private static final URI INSPECTION = URI.create("https://orchard.test/schemas/inspection.json");

    /** Documents found by the URI they are given under, by their own $id, and by an embedded $id. */
    @Test
    void documentsOfASetByUriAndById() {
        SchemaDocuments set = SchemaDocuments.empty()
                .with(URI.create("https://orchard.test/schemas/rootstock.json"), json("""
                        {"type": "string", "pattern": "^RS-[0-9]{1,2}$",
                         "$defs": {"vigour": {"$anchor": "vigour", "enum": ["dwarfing", "vigorous"]}}}
                        """))
                .with(URI.create("urn:orchard:variety"), json("""
                        {"$id": "https://orchard.test/schemas/variety.json",
                         "enum": ["Amberglow", "Copperbell"],
                         "$defs": {"method": {"$id": "graft-method.json", "enum": ["whip", "cleft"]}}}
                        """));
        JsonNode schema = json("""
                {"type": "object",
                 "properties": {
                   "rootstock": {"$ref": "rootstock.json"},
                   "vigour": {"$ref": "rootstock.json#vigour"},
                   "variety": {"$ref": "variety.json"},
                   "variety2": {"$ref": "urn:orchard:variety"},
                   "method": {"$ref": "graft-method.json"}},
                 "additionalProperties": false}
                """);
        SchemaResult r = JsonSchemas.compile(schema, INSPECTION, set, SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(r, "{\"rootstock\":\"RS-9\",\"vigour\":\"dwarfing\","
                + "\"variety\":\"Copperbell\",\"variety2\":\"Amberglow\",\"method\":\"cleft\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"rootstock\":\"RS-100\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"vigour\":\"semi-dwarfing\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"variety\":\"Russet\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"variety2\":\"Russet\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"method\":\"bud\"}"));
        // the same schema with $id instead of a base URI
        JsonNode withId = json(schema.toString().replaceFirst("\\{", "{\"\\$id\":\"" + INSPECTION + "\","));
        SchemaResult r2 = JsonSchemas.compile(withId, URI.create("urn:orchard:elsewhere"), set, SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(r2, "{\"rootstock\":\"RS-9\",\"method\":\"whip\"}"));
    }

    /** $id changes the base inside another document; its references go back to the root by URI. */
    @Test
    void idInsideAnotherDocumentAndBackToTheRoot() {
        SchemaDocuments set = SchemaDocuments.empty().with(URI.create("https://orchard.test/lib/rows.json"), json("""
                {"$defs": {
                  "row": {"$id": "blocks/row.json", "type": "integer", "minimum": 1, "maximum": 40}}}
                """))
                .with(URI.create("https://orchard.test/lib/blocks/plot.json"), json("""
                        {"type": "object", "properties": {
                           "row": {"$ref": "row.json"},
                           "tree": {"$ref": "../../schemas/inspection.json#/$defs/tree"}},
                         "required": ["row", "tree"], "additionalProperties": false}
                        """));
        JsonNode schema = json("""
                {"$ref": "../lib/blocks/plot.json",
                 "$defs": {"tree": {"type": "string", "pattern": "^T-[0-9]{3}$"}}}
                """);
        SchemaResult r = JsonSchemas.compile(schema, INSPECTION, set, SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(r, "{\"row\":4,\"tree\":\"T-001\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"row\":41,\"tree\":\"T-001\"}"));
        assertFalse(SchemaHarness.acceptsInstance(r, "{\"row\":4,\"tree\":\"T-1\"}"));
    }

    @Test
    void aDocumentThatIsNotSuppliedIsNeverFetched() {
        JsonNode schema = json("{\"properties\": {\"tree\": {\"$ref\": \"https://orchard.test/schemas/tree.json\"}}}");
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile(schema, INSPECTION, SchemaDocuments.empty(), SchemaOptions.defaults()));
        assertEquals("/properties/tree", e.pointer());
        assertEquals("$ref", e.keyword());
        assertEquals("#/properties/tree $ref: remote reference https://orchard.test/schemas/tree.json"
                + " is not supplied: documents are never fetched; give it in "
                + "the SchemaDocuments set (command line: --schema-document https://orchard.test/schemas/tree.json=FILE)",
                e.getMessage());
        // relative: the document is named
        JsonNode relative = json("{\"$ref\": \"tree.json#/$defs/treeId\"}");
        e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile(relative, INSPECTION, SchemaDocuments.empty(), SchemaOptions.defaults()));
        assertTrue(e.detail().startsWith("remote reference tree.json#/$defs/treeId (document "
                + "https://orchard.test/schemas/tree.json) is not supplied"), e.getMessage());
        SchemaResult lenient = JsonSchemas.compile(schema, INSPECTION, SchemaDocuments.empty(),
                SchemaOptions.defaults().withLenient(true));
        assertEquals(1, lenient.relaxations().size());
        assertEquals("/properties/tree", lenient.relaxations().get(0).pointer());
    }

    @Test
    void aMissingFileNamesTheReferenceAndThePath() throws IOException {
        Path root = write("work-order.schema.json",
                "{\"properties\": {\"tree\": {\"$ref\": \"common/missing.schema.json#/$defs/treeId\"}}}");
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals("/properties/tree", e.pointer());
        assertEquals("$ref", e.keyword());
        assertEquals("#/properties/tree $ref: reference common/missing.schema.json#/$defs/treeId: no such file "
                + dir.resolve("common/missing.schema.json"), e.getMessage());
        // a missing file is not a relaxation, even when lenient
        assertThrows(SchemaException.class,
                () -> JsonSchemas.compile(root, SchemaOptions.defaults().withLenient(true)));
    }

    @Test
    void unreadableFiles() throws IOException {
        Files.createDirectories(dir.resolve("common/site.schema.json"));
        Files.write(dir.resolve("common/latin1.schema.json"), new byte[] {'"', (byte) 0xE9, '"'});
        Path root = write("work-order.schema.json", """
                {"properties": {"site": {"$ref": "common/site.schema.json"}, "name": {"$ref": "common/latin1.schema.json"}}}
                """);
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals("$ref", e.keyword());
        assertTrue(e.pointer().equals("/properties/site") || e.pointer().equals("/properties/name"), e.pointer());
        if (e.pointer().equals("/properties/site")) {
            assertTrue(e.detail().endsWith(dir.resolve("common/site.schema.json") + " is not a regular file"), e.getMessage());
        } else {
            assertTrue(e.detail().endsWith(dir.resolve("common/latin1.schema.json") + " is not UTF-8 text"), e.getMessage());
        }
        Path second = write("name-only.schema.json", "{\"properties\": {\"name\": {\"$ref\": \"common/latin1.schema.json\"}}}");
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(second, SchemaOptions.defaults()));
        assertEquals("#/properties/name $ref: reference common/latin1.schema.json: "
                + dir.resolve("common/latin1.schema.json") + " is not UTF-8 text", e.getMessage());
    }

    @Test
    void malformedJsonGivesFileLineAndColumn() throws IOException {
        write("common/tree.schema.json", "{\"$defs\": {\n  \"treeId\": {\"type\": \"string\",}\n}}\n");
        Path root = write("work-order.schema.json", "{\"properties\": {\"tree\": {\"$ref\": \"common/tree.schema.json#/$defs/treeId\"}}}");
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals("/properties/tree", e.pointer());
        assertEquals("$ref", e.keyword());
        // line 2, column 31: the '}' after the trailing comma (counted by hand: two spaces, then
        // "treeId": {"type": "string",} puts the brace at the 31st character)
        assertTrue(e.detail().startsWith("reference common/tree.schema.json#/$defs/treeId: "
                + dir.resolve("common/tree.schema.json") + ": malformed JSON at line 2, column 31: "), e.getMessage());
        // a document that is JSON but no schema
        write("common/tree.schema.json", "[1, 2]");
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertTrue(e.detail().endsWith("is not a schema (an object or a boolean)"), e.getMessage());
    }

    @Test
    void aPointerOrAnchorToNothingNamesTheDocument() throws IOException {
        write("common/tree.schema.json", TREE);
        Path root = write("work-order.schema.json", """
                {"properties": {"tree": {"$ref": "common/tree.schema.json#/$defs/treeNumber"},
                                "variety": {"$ref": "common/tree.schema.json#cultivar"}}}
                """);
        String doc = SchemaIndex.documentKey(dir.resolve("common/tree.schema.json").toUri());
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals("$ref", e.keyword());
        if (e.pointer().equals("/properties/tree")) {
            assertEquals("#/properties/tree $ref: reference common/tree.schema.json#/$defs/treeNumber points to nothing "
                    + "in document " + doc, e.getMessage());
        } else {
            assertEquals("#/properties/variety $ref: reference common/tree.schema.json#cultivar names no anchor of "
                    + "document " + doc, e.getMessage());
        }
        Path anchorOnly = write("anchor-only.schema.json", "{\"$ref\": \"common/tree.schema.json#cultivar\"}");
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(anchorOnly, SchemaOptions.defaults()));
        assertEquals("# $ref: reference common/tree.schema.json#cultivar names no anchor of document " + doc,
                e.getMessage());
    }

    /** b refers to c, c back to b, with nothing between: no schema recursion, a clear error in document b. */
    @Test
    void aReferenceCycleAcrossDocumentsIsAnError() throws IOException {
        write("b.schema.json", "{\"$ref\": \"c.schema.json\"}");
        write("c.schema.json", "{\"allOf\": [{\"$ref\": \"b.schema.json#\"}]}");
        Path root = write("a.schema.json", "{\"properties\": {\"x\": {\"$ref\": \"b.schema.json\"}}}");
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        String b = SchemaIndex.documentKey(dir.resolve("b.schema.json").toUri());
        assertEquals(b + "#", e.pointer());
        assertEquals("$ref", e.keyword());
        assertEquals(b + "# $ref: the schema refers to itself without descending into a property or an item, so it "
                + "constrains nothing that could be compiled", e.getMessage());
        // the same between the root and another document
        write("loop.schema.json", "{\"$ref\": \"root-loop.schema.json\"}");
        Path rootLoop = write("root-loop.schema.json", "{\"$ref\": \"loop.schema.json\"}");
        e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(rootLoop, SchemaOptions.defaults()));
        assertEquals("$ref", e.keyword());
        assertTrue(e.getMessage().contains("refers to itself"), e.getMessage());
    }

    /** Notes and errors inside another document carry its URI. */
    @Test
    void notesAndErrorsInAnotherDocumentNameIt() throws IOException {
        write("common/site.schema.json", "{\"type\": \"object\", \"properties\": {\"row\": {\"type\": \"integer\", "
                + "\"rowSpacing\": 3}, \"block\": {\"type\": \"string\", \"pattern\": \"(?<=a)b\"}}}");
        Path root = write("work-order.schema.json", "{\"properties\": {\"site\": {\"$ref\": \"common/site.schema.json\"}}}");
        String site = SchemaIndex.documentKey(dir.resolve("common/site.schema.json").toUri());
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals(site + "#/properties/block", e.pointer());
        assertTrue(e.getMessage().startsWith(site + "#/properties/block pattern: "), e.getMessage());
        assertEquals(site + "#/properties/block", e.location());
        write("common/site.schema.json", "{\"type\": \"object\", \"properties\": {\"row\": {\"type\": \"integer\", "
                + "\"rowSpacing\": 3}}}");
        SchemaResult r = JsonSchemas.compile(root, SchemaOptions.defaults());
        assertEquals(List.of(new SchemaNote(site + "#/properties/row", "rowSpacing", "unknown keyword, ignored")),
                r.warnings());
        assertEquals(site + "#/properties/row rowSpacing: unknown keyword, ignored", r.warnings().get(0).toString());
    }

    /** A $dynamicRef is read as a plain reference only in a schema of one document. */
    @Test
    void dynamicReferencesAcrossDocumentsAreRefused() throws IOException {
        write("list.schema.json", "{\"$dynamicAnchor\": \"item\", \"type\": \"string\"}");
        Path root = write("rows.schema.json", """
                {"properties": {"tree": {"$ref": "list.schema.json"}, "row": {"$dynamicRef": "#row"}},
                 "$defs": {"row": {"$dynamicAnchor": "row", "type": "integer"}}}
                """);
        SchemaException e = assertThrows(SchemaException.class, () -> JsonSchemas.compile(root, SchemaOptions.defaults()));
        assertEquals("$dynamicRef", e.keyword());
        assertEquals("/properties/row", e.pointer());
        assertTrue(e.detail().contains("several documents"), e.getMessage());
    }

    /** Another document of another dialect would be read with draft 2020-12's rules: refused instead. */
    @Test
    void aDocumentOfAnotherDialectIsRefused() {
        SchemaDocuments set = SchemaDocuments.empty().with(URI.create("https://orchard.test/old/rows.json"), json("""
                {"$schema": "http://json-schema.org/draft-07/schema#", "items": [{"type": "string"}]}
                """)).with(URI.create("https://orchard.test/new/rows.json"), json("""
                {"$schema": "https://json-schema.org/draft/2020-12/schema", "prefixItems": [{"type": "string"}]}
                """));
        JsonNode old = json("{\"$ref\": \"https://orchard.test/old/rows.json\"}");
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile(old, INSPECTION, set, SchemaOptions.defaults()));
        assertEquals("# $ref: reference https://orchard.test/old/rows.json reaches document "
                + "https://orchard.test/old/rows.json, whose $schema \"http://json-schema.org/draft-07/schema#\" is another "
                + "dialect than draft 2020-12: not supported", e.getMessage());
        SchemaResult r = JsonSchemas.compile(json("{\"$ref\": \"/new/rows.json\"}"), INSPECTION, set,
                SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(r, "[\"row\", 1]"));
        assertFalse(SchemaHarness.acceptsInstance(r, "[1]"));
    }

    @Test
    void theSetIsAnImmutableValue() {
        SchemaDocuments empty = SchemaDocuments.empty();
        SchemaDocuments one = empty.with(URI.create("https://orchard.test/a.json#"), json("true"));
        assertEquals(0, empty.size());
        assertEquals(1, one.size());
        assertTrue(one.get(URI.create("https://orchard.test/./a.json#x")).isPresent());
        assertEquals(one, SchemaDocuments.empty().with(URI.create("https://orchard.test/a.json"), json("true")));
        assertThrows(IllegalArgumentException.class, () -> one.with(URI.create("https://orchard.test/a.json"), json("{}")));
        assertThrows(IllegalArgumentException.class, () -> empty.with(URI.create("a.json"), json("{}")));
        assertThrows(IllegalArgumentException.class, () -> empty.with(URI.create("https://orchard.test/a.json#/x"), json("{}")));
        assertThrows(IllegalArgumentException.class, () -> empty.with(URI.create("https://orchard.test/a.json"), json("3")));
    }

    /**
     * A root whose {@code $schema} names a meta-schema of the set follows its {@code $vocabulary}
     * (draft 2020-12 core specification, section 8.1.2; from memory): without the validation
     * vocabulary, validation keywords are annotations; a required vocabulary that is not known is
     * refused; a meta-schema that is neither standard nor supplied is read as draft 2020-12, with a
     * warning.
     */
    @Test
    void theRootsMetaSchemaChoosesTheVocabularies() {
        URI noValidation = URI.create("https://orchard.test/meta/no-validation.json");
        URI custom = URI.create("https://orchard.test/meta/graft-vocabulary.json");
        SchemaDocuments set = SchemaDocuments.empty()
                .with(noValidation, json("""
                        {"$schema": "https://json-schema.org/draft/2020-12/schema",
                         "$vocabulary": {"https://json-schema.org/draft/2020-12/vocab/core": true,
                                         "https://json-schema.org/draft/2020-12/vocab/applicator": true}}"""))
                .with(custom, json("""
                        {"$vocabulary": {"https://json-schema.org/draft/2020-12/vocab/core": true,
                                         "https://json-schema.org/draft/2020-12/vocab/validation": true,
                                         "https://orchard.test/vocab/graft": true}}"""));
        String rows = "\"properties\": {\"row\": {\"type\": \"integer\", \"minimum\": 1}, \"graft\": false}";

        SchemaResult annotations = JsonSchemas.compile(json("{\"$schema\": \"" + noValidation + "\", " + rows + "}"),
                INSPECTION, set, SchemaOptions.defaults());
        assertTrue(SchemaHarness.acceptsInstance(annotations, "{\"row\":0}"), "minimum is an annotation");
        assertTrue(SchemaHarness.acceptsInstance(annotations, "{\"row\":\"seven\"}"), "type is an annotation");
        assertFalse(SchemaHarness.acceptsInstance(annotations, "{\"graft\":1}"), "applicators still apply");
        assertTrue(annotations.warnings().stream().anyMatch(w -> w.keyword().equals("$schema")), "said so");

        SchemaResult standard = JsonSchemas.compile(json("{\"$schema\": \"https://json-schema.org/draft/2020-12/schema\", "
                + rows + "}"), INSPECTION, set, SchemaOptions.defaults());
        assertFalse(SchemaHarness.acceptsInstance(standard, "{\"row\":0}"));
        assertTrue(SchemaHarness.acceptsInstance(standard, "{\"row\":3}"));
        assertTrue(standard.warnings().isEmpty(), standard.warnings().toString());

        JsonNode requiresGraft = json("{\"$schema\": \"" + custom + "\", " + rows + "}");
        SchemaException e = assertThrows(SchemaException.class,
                () -> JsonSchemas.compile(requiresGraft, INSPECTION, set, SchemaOptions.defaults()));
        assertEquals("$schema", e.keyword());
        assertTrue(e.getMessage().contains("https://orchard.test/vocab/graft"), e.getMessage());
        SchemaResult relaxed = JsonSchemas.compile(requiresGraft, INSPECTION, set, SchemaOptions.defaults().withLenient(true));
        assertEquals("$schema", relaxed.relaxations().get(0).keyword());
        assertFalse(SchemaHarness.acceptsInstance(relaxed, "{\"row\":0}"), "validation in use");

        SchemaResult unknown = JsonSchemas.compile(json("{\"$schema\": \"https://orchard.test/meta/elsewhere.json\", "
                + rows + "}"), INSPECTION, set, SchemaOptions.defaults());
        assertFalse(SchemaHarness.acceptsInstance(unknown, "{\"row\":0}"), "read as draft 2020-12");
        assertTrue(unknown.warnings().stream().anyMatch(w -> w.keyword().equals("$schema")
                && w.message().contains("not known")), unknown.warnings().toString());
    }
}
