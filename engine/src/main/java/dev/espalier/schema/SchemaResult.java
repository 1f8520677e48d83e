package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import dev.espalier.grammar.Grammar;
import java.util.List;
import java.util.Optional;
import java.util.function.Function;

/**
 * A compiled schema.
 *
 * @param grammar      the grammar whose language is the accepted JSON texts under the layout policy
 * @param options      the options it was compiled with
 * @param relaxations  what was not enforced exactly (empty unless lenient)
 * @param warnings     unknown keywords and similar remarks
 * @param renderer     lays out an instance the way the grammar expects (see {@link #render})
 */
public record SchemaResult(Grammar grammar, SchemaOptions options, List<SchemaNote> relaxations,
                           List<SchemaNote> warnings, Function<JsonNode, Optional<String>> renderer) {
    public SchemaResult {
        relaxations = List.copyOf(relaxations);
        warnings = List.copyOf(warnings);
    }

    /**
     * Serialises a JSON value under this result's layout policy: spacing, member order, canonical
     * numbers and string escapes, so that a value the schema accepts is in the grammar's language.
     * Empty when the value cannot be laid out that way (for instance members the schema order
     * cannot place); such a value is not in the language.
     */
    public Optional<String> render(JsonNode instance) {
        return renderer.apply(instance);
    }
}
