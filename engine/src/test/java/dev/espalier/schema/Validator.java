package dev.espalier.schema;

import com.networknt.schema.InputFormat;
import com.networknt.schema.Schema;
import com.networknt.schema.SchemaRegistry;
import com.networknt.schema.SpecificationVersion;

/** The outside reference: com.networknt json-schema-validator, draft 2020-12, formats asserted. */
final class Validator {

    private static final SchemaRegistry REGISTRY = SchemaRegistry.withDefaultDialect(SpecificationVersion.DRAFT_2020_12);

    private final Schema schema;

    Validator(String schemaJson) {
        this.schema = REGISTRY.getSchema(schemaJson, InputFormat.JSON);
    }

    /** Whether the validator finds no error in the instance (JSON text). */
    boolean valid(String instanceJson) {
        return schema.validate(instanceJson, InputFormat.JSON, ctx -> ctx.executionConfig(c -> c.formatAssertionsEnabled(true)))
                .isEmpty();
    }
}
