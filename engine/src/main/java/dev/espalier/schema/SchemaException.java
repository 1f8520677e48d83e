package dev.espalier.schema;

/**
 * A schema that cannot be compiled: malformed JSON, a malformed schema, or (when not lenient) a
 * keyword that cannot be enforced exactly. Names the keyword and its JSON pointer.
 */
public final class SchemaException extends RuntimeException {
    private final String pointer;
    private final String keyword;

    public SchemaException(String pointer, String keyword, String message) {
        super((pointer.isEmpty() ? "#" : "#" + pointer) + (keyword.isEmpty() ? "" : " " + keyword) + ": " + message);
        this.pointer = pointer;
        this.keyword = keyword;
    }

    /** JSON pointer (RFC 6901) of the schema object at fault; {@code ""} for the root. */
    public String pointer() {
        return pointer;
    }

    /** The keyword at fault, or {@code ""} when the fault is not one keyword's. */
    public String keyword() {
        return keyword;
    }
}
