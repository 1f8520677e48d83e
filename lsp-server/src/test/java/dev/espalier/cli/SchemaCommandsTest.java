package dev.espalier.cli;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import dev.espalier.cli.CommandLineTest.Run;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static dev.espalier.cli.CommandLineTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@code espalier schema} and {@code --schema} on mask, sample and bench. Orchard schemas are demo data. */
class SchemaCommandsTest {

    static final Path SCHEMAS = Path.of("..", "grammars", "schemas");
    static final String TREE = SCHEMAS.resolve("tree-record.schema.json").toString();
    static final String ROOTSTOCK = SCHEMAS.resolve("rootstock-spec.schema.json").toString();

    /** Jackson, strict (nothing after the value), as an outside check of RFC 8259 syntax. */
    private static final ObjectMapper STRICT = JsonMapper.builder()
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS).build();

    static final String TREE_INSTANCE = "{\"treeId\":\"T-0042\",\"variety\":\"Copperbell\",\"rootstock\":\"RS-9\","
            + "\"planted\":\"2021-03-18\",\"row\":17,\"heightCm\":182.5,\"grafts\":[{\"date\":\"2020-04-02\","
            + "\"scion\":\"Copperbell\",\"method\":\"chip-bud\",\"took\":true}]}";

    @Test
    void schemaPrintsAnAbnfGrammarThatReadsBackAndAcceptsValidInstances(@TempDir Path dir) throws IOException {
        Run r = run("schema", TREE);
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().isEmpty(), r.err());
        Path abnf = dir.resolve("tree-record.abnf");
        Files.writeString(abnf, r.out(), StandardCharsets.UTF_8);
        // the printed grammar is a grammar file like any other: it checks clean ...
        Run check = run("check", abnf.toString());
        assertEquals(0, check.code(), check.out() + check.err());
        // ... accepts a valid record in the compact layout, and rejects what the schema rejects
        Path samples = dir.resolve("samples");
        Files.createDirectories(samples);
        Files.writeString(samples.resolve("record.accept.json"), TREE_INSTANCE + "\n");
        Files.writeString(samples.resolve("row-zero.reject.json"), TREE_INSTANCE.replace("\"row\":17", "\"row\":0") + "\n");
        Files.writeString(samples.resolve("tree-id.reject.json"), TREE_INSTANCE.replace("T-0042", "T-42") + "\n");
        Files.writeString(samples.resolve("spaces.reject.json"), TREE_INSTANCE.replace(",", ", ") + "\n");
        Files.writeString(samples.resolve("extra.reject.json"), TREE_INSTANCE.replace("{\"treeId\"", "{\"x\":1,\"treeId\"") + "\n");
        Run test = run("test", abnf.toString(), samples.toString());
        assertEquals(0, test.code(), test.out() + test.err());
        assertTrue(test.out().contains("5 passed, 0 failed"), test.out());
    }

    @Test
    void prettyAndAnyOrderChangeTheLayout(@TempDir Path dir) throws IOException {
        Path abnf = dir.resolve("pretty.abnf");
        Run pretty = run("schema", ROOTSTOCK, "--pretty");
        assertEquals(0, pretty.code(), pretty.err());
        Files.writeString(abnf, pretty.out());
        Path samples = dir.resolve("pretty");
        Files.createDirectories(samples);
        String laidOut = "{\n  \"code\": \"RS-12\",\n  \"vigour\": \"dwarfing\",\n  \"heightPct\": 35\n}";
        Files.writeString(samples.resolve("indented.accept.json"), laidOut + "\n");
        Files.writeString(samples.resolve("compact.reject.json"), "{\"code\":\"RS-12\",\"vigour\":\"dwarfing\",\"heightPct\":35}\n");
        Run test = run("test", abnf.toString(), samples.toString());
        assertEquals(0, test.code(), test.out());

        Path any = dir.resolve("any.abnf");
        Run anyOrder = run("schema", ROOTSTOCK, "--any-order");
        assertEquals(0, anyOrder.code(), anyOrder.err());
        Files.writeString(any, anyOrder.out());
        Path swapped = dir.resolve("any");
        Files.createDirectories(swapped);
        Files.writeString(swapped.resolve("swapped.accept.json"), "{\"heightPct\":35,\"code\":\"RS-12\",\"vigour\":\"dwarfing\"}\n");
        Run t2 = run("test", any.toString(), swapped.toString());
        assertEquals(0, t2.code(), t2.out());
        Path schemaOrder = dir.resolve("schema-order.abnf");
        Files.writeString(schemaOrder, run("schema", ROOTSTOCK).out());
        assertEquals(1, run("test", schemaOrder.toString(), swapped.toString()).code(), "schema order refuses it");
    }

    @Test
    void whatCannotBeEnforcedIsAnErrorWithItsPointerUnlessLenient(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("crew.schema.json");
        Files.writeString(f, "{\"type\":\"object\",\"properties\":{\"crew\":{\"$ref\":\"https://orchard.example/crew.json\"}}}");
        Run strict = run("schema", f.toString());
        assertEquals(2, strict.code(), strict.err());
        assertTrue(strict.out().isEmpty(), strict.out());
        assertTrue(strict.err().contains(f + ": #/properties/crew: $ref: error: "), strict.err());
        assertTrue(strict.err().contains("--lenient"), strict.err());
        assertFalse(strict.err().contains("Exception"), strict.err());
        Run lenient = run("schema", f.toString(), "--lenient");
        assertEquals(0, lenient.code(), lenient.err());
        assertTrue(lenient.err().contains(f + ": #/properties/crew: $ref: relaxed: "), lenient.err());
        assertFalse(lenient.out().isBlank());
    }

    @Test
    void unknownKeywordsAreWarnings(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("label.schema.json");
        Files.writeString(f, "{\"type\":\"string\",\"maxLength\":12,\"colour\":\"green\"}");
        Run r = run("schema", f.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().contains(f + ": #: colour: warning: "), r.err());
    }

    @Test
    void malformedAndMissingFilesExitTwoWithAPosition(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("broken.schema.json");
        Files.writeString(f, "{\"type\": \"object\",\n \"properties\": {\"row\": {\"type\": \"integer\",}}}");
        Run r = run("schema", f.toString());
        assertEquals(2, r.code());
        assertTrue(r.err().contains(f + ": #: error: malformed JSON at line 2"), r.err());
        assertFalse(r.err().contains("Exception"), r.err());
        Run missing = run("schema", dir.resolve("none.schema.json").toString());
        assertEquals(2, missing.code());
        assertTrue(missing.err().contains("no such schema file"), missing.err());
        Run sample = run("sample", "--schema", f.toString());
        assertEquals(2, sample.code());
        assertTrue(sample.err().contains("malformed JSON"), sample.err());
    }

    /** A work order in one file, its tree and site in two files under common/, one more by URI. */
    private static Path workOrderFiles(Path dir) throws IOException {
        Files.createDirectories(dir.resolve("common"));
        Files.writeString(dir.resolve("common/tree.schema.json"),
                "{\"$defs\": {\"treeId\": {\"type\": \"string\", \"pattern\": \"^T-[0-9]{3}$\"}}}");
        Files.writeString(dir.resolve("common/site.schema.json"), "{\"type\": \"object\", \"properties\": {"
                + "\"block\": {\"enum\": [\"A\", \"B\"]}, \"row\": {\"type\": \"integer\", \"minimum\": 1, \"maximum\": 9}},"
                + " \"required\": [\"block\", \"row\"], \"additionalProperties\": false}");
        Files.writeString(dir.resolve("crew.json"), "{\"enum\": [\"north\", \"south\"]}");
        Path f = dir.resolve("work-order.schema.json");
        Files.writeString(f, "{\"type\": \"object\", \"properties\": {"
                + "\"tree\": {\"$ref\": \"common/tree.schema.json#/$defs/treeId\"},"
                + " \"site\": {\"$ref\": \"common/site.schema.json\"},"
                + " \"crew\": {\"$ref\": \"https://orchard.example/crew.json\"}},"
                + " \"required\": [\"tree\", \"site\", \"crew\"], \"additionalProperties\": false}");
        return f;
    }

    @Test
    void filesBesideTheSchemaAndDocumentsByUri(@TempDir Path dir) throws IOException {
        Path f = workOrderFiles(dir);
        String doc = "--schema-document=https://orchard.example/crew.json=" + dir.resolve("crew.json");
        Run r = run("schema", f.toString(), doc);
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().isEmpty(), r.err());
        Path abnf = dir.resolve("work-order.abnf");
        Files.writeString(abnf, r.out(), StandardCharsets.UTF_8);
        Path samples = dir.resolve("samples");
        Files.createDirectories(samples);
        String order = "{\"tree\":\"T-042\",\"site\":{\"block\":\"B\",\"row\":3},\"crew\":\"north\"}";
        Files.writeString(samples.resolve("order.accept.json"), order + "\n");
        Files.writeString(samples.resolve("tree.reject.json"), order.replace("T-042", "T-42") + "\n");
        Files.writeString(samples.resolve("row.reject.json"), order.replace("\"row\":3", "\"row\":10") + "\n");
        Files.writeString(samples.resolve("crew.reject.json"), order.replace("north", "east") + "\n");
        Run test = run("test", abnf.toString(), samples.toString());
        assertEquals(0, test.code(), test.out() + test.err());
        assertTrue(test.out().contains("4 passed, 0 failed"), test.out());
        // the same files under --schema, from another working directory's point of view (absolute path)
        Run sample = run("sample", "--schema", f.toAbsolutePath().toString(), doc, "-n", "3", "--seed", "5");
        assertEquals(0, sample.code(), sample.err());
        for (String line : sample.out().lines().toList()) {
            JsonNode o = STRICT.readTree(STRICT.readTree(line).textValue());
            assertTrue(o.get("tree").textValue().matches("T-[0-9]{3}"), line);
            assertTrue(o.get("crew").textValue().matches("north|south"), line);
        }
        // without the document: an error saying how to supply it
        Run missing = run("schema", f.toString());
        assertEquals(2, missing.code());
        assertTrue(missing.err().contains(f + ": #/properties/crew: $ref: error: remote reference "
                + "https://orchard.example/crew.json is not supplied"), missing.err());
        assertTrue(missing.err().contains("--schema-document https://orchard.example/crew.json=FILE"), missing.err());
        Run grammar = run("sample", "--grammar", abnf.toString(), doc);
        assertEquals(2, grammar.code());
        assertTrue(grammar.err().contains("apply to --schema only"), grammar.err());
    }

    @Test
    void problemsInOtherDocumentsNameThem(@TempDir Path dir) throws IOException {
        Path f = workOrderFiles(dir);
        String doc = "--schema-document=https://orchard.example/crew.json=" + dir.resolve("crew.json");
        Path site = dir.resolve("common/site.schema.json");
        Files.writeString(site, "{\"type\": \"object\",\n \"properties\": {\"row\": {\"type\": \"integer\", \"spacing\": 3}}}");
        String siteUri = "file:" + site.toAbsolutePath().toUri().getRawPath();
        Run warned = run("schema", f.toString(), doc);
        assertEquals(0, warned.code(), warned.err());
        assertTrue(warned.err().contains(f + ": " + siteUri + "#/properties/row: spacing: warning: "), warned.err());
        Files.writeString(site, "{\"type\": \"object\",\n \"properties\": {\"row\": {\"type\": \"integer\",}}}");
        Run broken = run("schema", f.toString(), doc);
        assertEquals(2, broken.code());
        assertTrue(broken.err().contains(f + ": #/properties/site: $ref: error: reference common/site.schema.json: "
                + site.toAbsolutePath() + ": malformed JSON at line 2"), broken.err());
        assertFalse(broken.err().contains("Exception"), broken.err());
        Files.delete(site);
        Run gone = run("schema", f.toString(), doc);
        assertEquals(2, gone.code());
        assertTrue(gone.err().contains(f + ": #/properties/site: $ref: error: reference common/site.schema.json: no such file "),
                gone.err());
        Files.writeString(dir.resolve("crew.json"), "{\"enum\": [\"north\",]}");
        Run badDocument = run("schema", f.toString(), doc);
        assertEquals(2, badDocument.code());
        assertTrue(badDocument.err().contains(dir.resolve("crew.json") + ": #: error: malformed JSON at line 1"),
                badDocument.err());
        Run badSpec = run("schema", f.toString(), "--schema-document", "crew.json=" + dir.resolve("crew.json"));
        assertEquals(2, badSpec.code());
        assertTrue(badSpec.err().contains("is not an absolute URI"), badSpec.err());
    }

    @Test
    void sampleOutputsAreValidRecords() throws IOException {
        Run s = run("sample", "--schema", ROOTSTOCK, "-n", "8", "--seed", "3");
        assertEquals(0, s.code(), s.err());
        EarleyGrammar g = EarleyGrammar.compile(JsonSchemas.compile(Path.of(ROOTSTOCK), SchemaOptions.defaults()).grammar());
        List<String> lines = s.out().lines().toList();
        assertEquals(8, lines.size());
        for (String line : lines) {
            String text = STRICT.readTree(line).textValue(); // each line is a JSON string literal
            JsonNode record = STRICT.readTree(text);
            assertTrue(record.get("code").textValue().matches("RS-[0-9]{1,2}"), text);
            int h = record.get("heightPct").intValue();
            assertTrue(h >= 20 && h <= 120, text);
            byte[] b = text.getBytes(StandardCharsets.UTF_8);
            EarleyChart chart = g.newChart();
            assertTrue(chart.feedAll(b) == b.length && chart.accepts(), text);
        }
    }

    @Test
    void maskAfterAPrefixAllowsOnlyWhatTheSchemaAllows() {
        // after "T-" a tree id has four digits: cl100k's digit tokens are 1 to 3 digits long
        Run r = run("mask", "--schema", TREE, "--text", "{\"treeId\":\"T-", "--ids");
        assertEquals(0, r.code(), r.err());
        Vocabulary cl100k = Vocabularies.builtin("cl100k");
        List<String> allowed = r.out().lines().map(id -> new String(cl100k.bytes(Integer.parseInt(id)),
                StandardCharsets.UTF_8)).toList();
        assertFalse(allowed.isEmpty());
        for (String token : allowed) {
            assertTrue(token.matches("[0-9]{1,3}"), "only digits may follow: " + token);
        }
        assertTrue(allowed.contains("0") && allowed.contains("123"), allowed.toString());
        Run bad = run("mask", "--schema", TREE, "--text", "{\"treeId\":\"T-12x");
        assertEquals(1, bad.code(), bad.out());
        Run pretty = run("mask", "--schema", TREE, "--pretty", "--text", "{\n  \"treeId\": \"T-1234\",\n  ");
        assertEquals(0, pretty.code(), pretty.err());
        assertEquals(2, run("mask", "--regex", "a", "--pretty").code(), "--pretty applies to --schema only");
        assertEquals(2, run("mask", "--schema", TREE, "--regex", "a").code(), "one source only");
    }

    @Test
    void benchMeasuresASchema() {
        Run r = run("bench", "--schema", ROOTSTOCK, "--schema", TREE, "--vocab", "cl100k", "--generations", "1",
                "--rounds", "2", "--baseline-masks", "1");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("schema rootstock-spec.schema.json: compiled to a grammar in "), r.out());
        assertTrue(r.out().contains("schema tree-record.schema.json: compiled to a grammar in "), r.out());
        assertTrue(r.out().contains("schemas: compile to a grammar, median "), r.out());
        assertTrue(r.out().lines().anyMatch(l -> l.startsWith("rootstock-spec.schema.json") && l.contains("cl100k")), r.out());
    }
}
