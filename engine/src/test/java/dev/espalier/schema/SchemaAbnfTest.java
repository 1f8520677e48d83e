package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfPrinter;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.GrammarAnalysis;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/** The printed ABNF of a compiled schema: readable, and read back it is the same language. */
class SchemaAbnfTest {

    static Stream<Arguments> schemas() {
        return SchemaAgreementTest.schemas();
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("schemas")
    void printedAbnfReadsBackToTheSameLanguage(String name, String schema) {
        SchemaResult r = JsonSchemas.compile(schema, SchemaOptions.defaults());
        String abnf = AbnfPrinter.print(r.grammar());
        AbnfResult back = Abnf.parse(abnf, name + ".abnf");
        assertFalse(back.hasErrors(), back.diagnostics().toString());
        SchemaResult reread = new SchemaResult(back.grammar(), r.options(), List.of(), List.of(), r::render);
        for (String text : GrammarAnalysis.randomExamples(r.grammar(), 60, 3, 10)) {
            assertTrue(SchemaHarness.accepts(reread, text), text);
        }
        for (String text : GrammarAnalysis.randomExamples(back.grammar(), 60, 4, 10)) {
            assertTrue(SchemaHarness.accepts(r, text), text);
        }
    }

    @Test
    void namesComeFromDefinitionsAndProperties() {
        SchemaResult r = JsonSchemas.compile(SchemaAgreementTest.TREE_RECORD, SchemaOptions.defaults());
        String abnf = AbnfPrinter.print(r.grammar());
        assertTrue(abnf.startsWith("root "), abnf);
        for (String rule : List.of("tree-record-variety", "tree-record-rootstock", "tree-record-grafts", "tree-record-grafts-item")) {
            assertTrue(abnf.contains("\n" + rule + " "), rule + " in\n" + abnf);
        }
        // member names are quoted strings, not hexadecimal
        assertTrue(abnf.contains("%s\"variety\""), abnf);
    }

    @Test
    void sanitisedNamesAreValidAndDistinct() {
        assertEquals("x-1st-row", SchemaCompiler.sanitise("1st row"));
        assertEquals("graft-date", SchemaCompiler.sanitise("graft_date"));
        assertEquals("x-json-value", SchemaCompiler.sanitise("json-value"));
        assertEquals("value", SchemaCompiler.sanitise("%%"));
        SchemaResult r = JsonSchemas.compile("{\"properties\":{\"a b\":{\"type\":\"string\"},\"a-b\":{\"type\":\"integer\"},\"A_B\":{\"type\":\"null\"}}}",
                SchemaOptions.defaults());
        String abnf = AbnfPrinter.print(r.grammar());
        assertFalse(Abnf.parse(abnf, "names.abnf").hasErrors(), abnf);
        assertTrue(abnf.contains("\na-b ") && abnf.contains("\na-b-2 ") && abnf.contains("\nA-B-3 "), abnf);
    }

    @Test
    void prettyRecursionIsBoundedInDepth() {
        SchemaResult r = JsonSchemas.compile(SchemaAgreementTest.TREE_RECORD, SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY));
        StringBuilder deep = new StringBuilder();
        int levels = SchemaCompiler.PRETTY_DEPTH_LIMIT / 2 + 2;
        for (int i = 0; i < levels; i++) {
            deep.append("{\"variety\":\"v\",\"grafts\":[");
        }
        deep.append("{\"variety\":\"leaf\"}");
        deep.append("]}".repeat(levels));
        assertTrue(r.render(JsonSchemas.parse(deep.toString())).isEmpty(), "deeper than the pretty limit");
        String shallow = "{\"variety\":\"v\",\"grafts\":[{\"variety\":\"w\",\"grafts\":[{\"variety\":\"x\"}]}]}";
        assertTrue(SchemaHarness.acceptsInstance(r, shallow));
    }
}
