package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;

/** The entry point: JSON Schema to grammar. */
public final class JsonSchemas {
    private JsonSchemas() {
    }

    /** Compiles a parsed schema. */
    public static SchemaResult compile(JsonNode schema, SchemaOptions options) {
        throw new UnsupportedOperationException("schema compiler not yet written");
    }

    /** Parses (strict JSON) and compiles a schema text; malformed JSON is a {@link SchemaException} at {@code ""}. */
    public static SchemaResult compile(String schemaJson, SchemaOptions options) {
        throw new UnsupportedOperationException("schema compiler not yet written");
    }

    /** Reads, parses and compiles a schema file. */
    public static SchemaResult compile(Path file, SchemaOptions options) throws java.io.IOException {
        throw new UnsupportedOperationException("schema compiler not yet written");
    }
}
