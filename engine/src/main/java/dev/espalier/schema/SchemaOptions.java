package dev.espalier.schema;

/**
 * The layout policy and strictness of a schema compilation.
 *
 * @param spacing     how whitespace between JSON tokens is laid out
 * @param order       whether object members follow the schema's property order or may come in any order
 * @param anyOrderLimit with {@link Order#ANY}, the largest number of named properties of one object
 *                    whose orders are enumerated; larger objects are an error (or, when lenient,
 *                    fall back to schema order with a relaxation)
 * @param lenient     whether keywords that cannot be enforced exactly are relaxed (and listed)
 *                    instead of refused
 */
public record SchemaOptions(Spacing spacing, Order order, int anyOrderLimit, boolean lenient) {

    /** Whitespace between JSON tokens. */
    public enum Spacing {
        /** No whitespace at all: {@code {"a":1,"b":[2,3]}}. */
        COMPACT,
        /** One member or item per line, indented by two spaces per level; nothing else. */
        PRETTY
    }

    /** Order of object members. */
    public enum Order {
        /** Members in the order the schema lists its properties. */
        SCHEMA,
        /** Any order of the named properties (bounded by {@code anyOrderLimit}). */
        ANY
    }

    public SchemaOptions {
        if (spacing == null || order == null) {
            throw new IllegalArgumentException("spacing and order must be given");
        }
        if (anyOrderLimit < 1) {
            throw new IllegalArgumentException("anyOrderLimit must be at least 1");
        }
    }

    /** Compact, schema order, strict. */
    public static SchemaOptions defaults() {
        return new SchemaOptions(Spacing.COMPACT, Order.SCHEMA, 6, false);
    }

    public SchemaOptions withSpacing(Spacing value) {
        return new SchemaOptions(value, order, anyOrderLimit, lenient);
    }

    public SchemaOptions withOrder(Order value) {
        return new SchemaOptions(spacing, value, anyOrderLimit, lenient);
    }

    public SchemaOptions withAnyOrderLimit(int value) {
        return new SchemaOptions(spacing, order, value, lenient);
    }

    public SchemaOptions withLenient(boolean value) {
        return new SchemaOptions(spacing, order, anyOrderLimit, value);
    }
}
