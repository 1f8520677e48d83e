package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.grammar.Grammar;
import java.nio.charset.StandardCharsets;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.Map;
import java.util.Optional;

/** Compiles schemas and asks the Earley recognizer whether texts are in their language. */
final class SchemaHarness {

    private static final Map<Grammar, EarleyGrammar> EARLEY = Collections.synchronizedMap(new IdentityHashMap<>());

    private SchemaHarness() {
    }

    static SchemaResult compile(String schema) {
        return JsonSchemas.compile(schema, SchemaOptions.defaults());
    }

    static SchemaResult compile(String schema, SchemaOptions options) {
        return JsonSchemas.compile(schema, options);
    }

    /** Whether the grammar accepts the text (fed as UTF-8 to the Earley recognizer). */
    static boolean accepts(SchemaResult r, String text) {
        EarleyChart chart = EARLEY.computeIfAbsent(r.grammar(), EarleyGrammar::compile).newChart();
        byte[] b = text.getBytes(StandardCharsets.UTF_8);
        return chart.feedAll(b) == b.length && chart.accepts();
    }

    /** Whether the instance, rendered under the result's layout, is accepted (empty render: not). */
    static boolean acceptsInstance(SchemaResult r, JsonNode instance) {
        Optional<String> text = r.render(instance);
        return text.isPresent() && accepts(r, text.get());
    }

    static boolean acceptsInstance(SchemaResult r, String instanceJson) {
        return acceptsInstance(r, JsonSchemas.parse(instanceJson));
    }
}
