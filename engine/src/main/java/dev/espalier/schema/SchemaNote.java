package dev.espalier.schema;

import java.util.Objects;

/**
 * A remark about one place of a schema: a relaxation (something not enforced exactly) or a warning
 * (an unknown keyword, an ignored annotation that looks misplaced).
 *
 * @param pointer JSON pointer (RFC 6901) of the schema object holding the keyword, {@code ""} for the root
 * @param keyword the keyword concerned
 * @param message what was done, in a sentence
 */
public record SchemaNote(String pointer, String keyword, String message) {
    public SchemaNote {
        Objects.requireNonNull(pointer);
        Objects.requireNonNull(keyword);
        Objects.requireNonNull(message);
    }

    @Override
    public String toString() {
        return (pointer.isEmpty() ? "#" : "#" + pointer) + " " + keyword + ": " + message;
    }
}
