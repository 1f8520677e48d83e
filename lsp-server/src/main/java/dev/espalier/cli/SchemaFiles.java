package dev.espalier.cli;

import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaException;
import dev.espalier.schema.SchemaNote;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.schema.SchemaResult;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Reads and compiles JSON Schema files for the commands. Relaxations, warnings and errors are
 * printed as {@code FILE: POINTER: KEYWORD: relaxed|warning|error: MESSAGE}, with the JSON pointer
 * written as a URI fragment ({@code #/properties/row}, {@code #} for the root).
 */
final class SchemaFiles {

    private SchemaFiles() {
    }

    /**
     * A compiled schema; its relaxations and warnings are printed to {@code err}. A schema that cannot
     * be compiled is printed to {@code err} and ends the command (exit 2).
     */
    static SchemaResult load(String file, SchemaOptions options, PrintWriter err) {
        Path p = Path.of(file);
        if (!Files.isRegularFile(p)) {
            throw new UserInputException("no such schema file: " + file);
        }
        String text;
        try {
            text = Files.readString(p, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        SchemaResult r;
        try {
            r = JsonSchemas.compile(text, options);
        } catch (SchemaException e) {
            err.println(line(file, e.pointer(), e.keyword(), "error", message(e)));
            err.flush();
            throw new UserInputException(file + " cannot be compiled"
                    + (options.lenient() ? "" : "; --lenient relaxes what cannot be enforced exactly and lists it"));
        }
        for (SchemaNote n : r.relaxations()) {
            err.println(line(file, n.pointer(), n.keyword(), "relaxed", n.message()));
        }
        for (SchemaNote n : r.warnings()) {
            err.println(line(file, n.pointer(), n.keyword(), "warning", n.message()));
        }
        err.flush();
        return r;
    }

    /** {@code FILE: POINTER: KEYWORD: KIND: MESSAGE}; the keyword part is left out when there is none. */
    static String line(String file, String pointer, String keyword, String kind, String message) {
        return file + ": #" + pointer + ": " + (keyword.isEmpty() ? "" : keyword + ": ") + kind + ": " + message;
    }

    /** The exception's own message, without the pointer and keyword it starts with. */
    static String message(SchemaException e) {
        String m = e.getMessage();
        String prefix = "#" + e.pointer() + (e.keyword().isEmpty() ? "" : " " + e.keyword()) + ": ";
        return m.startsWith(prefix) ? m.substring(prefix.length()) : m;
    }

    /** Options from the command-line flags. */
    static SchemaOptions options(boolean pretty, boolean anyOrder, boolean lenient) {
        SchemaOptions o = SchemaOptions.defaults().withLenient(lenient);
        if (pretty) {
            o = o.withSpacing(SchemaOptions.Spacing.PRETTY);
        }
        if (anyOrder) {
            o = o.withOrder(SchemaOptions.Order.ANY);
        }
        return o;
    }
}
