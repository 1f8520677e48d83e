package dev.espalier.schema;

import java.util.Objects;

/**
 * A remark about one place of a schema: a relaxation (something not enforced exactly) or a warning
 * (an unknown keyword, an ignored annotation that looks misplaced).
 *
 * @param pointer JSON pointer (RFC 6901) of the schema object holding the keyword, {@code ""} for the root;
 *                in another document reached by a reference, {@code DOCUMENT-URI#POINTER}
 * @param keyword the keyword concerned
 * @param message what was done, in a sentence
 */
public record SchemaNote(String pointer, String keyword, String message) {
    public SchemaNote {
        Objects.requireNonNull(pointer);
        Objects.requireNonNull(keyword);
        Objects.requireNonNull(message);
    }

    /** The location as written in messages: {@code #POINTER}, or {@code DOCUMENT-URI#POINTER} in another document. */
    public String location() {
        return SchemaIndex.display(pointer);
    }

    @Override
    public String toString() {
        return location() + " " + keyword + ": " + message;
    }
}
