package dev.espalier.schema;

/**
 * A schema that cannot be compiled: malformed JSON, a malformed schema, a reference that cannot be
 * resolved, or (when not lenient) a keyword that cannot be enforced exactly. Names the keyword and
 * its location.
 */
public final class SchemaException extends RuntimeException {
    private final String pointer;
    private final String keyword;
    private final String detail;

    /**
     * @param pointer the location at fault (see {@link #pointer()})
     * @param keyword the keyword at fault, or {@code ""}
     * @param message what is wrong, in a sentence
     */
    public SchemaException(String pointer, String keyword, String message) {
        super(SchemaIndex.display(pointer) + (keyword.isEmpty() ? "" : " " + keyword) + ": " + message);
        this.pointer = pointer;
        this.keyword = keyword;
        this.detail = message;
    }

    /**
     * The location of the schema object at fault: in the compiled document, its JSON pointer
     * (RFC 6901), {@code ""} for the root; in another document reached by a reference,
     * {@code DOCUMENT-URI#POINTER}.
     */
    public String pointer() {
        return pointer;
    }

    /** The location as written in messages: {@code #POINTER}, or {@code DOCUMENT-URI#POINTER} in another document. */
    public String location() {
        return SchemaIndex.display(pointer);
    }

    /** The keyword at fault, or {@code ""} when the fault is not one keyword's. */
    public String keyword() {
        return keyword;
    }

    /** What is wrong, without the location and keyword the message starts with. */
    public String detail() {
        return detail;
    }
}
