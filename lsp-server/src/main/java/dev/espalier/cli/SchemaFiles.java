package dev.espalier.cli;

import com.fasterxml.jackson.databind.JsonNode;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaDocuments;
import dev.espalier.schema.SchemaException;
import dev.espalier.schema.SchemaNote;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.schema.SchemaResult;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.net.URI;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

/**
 * Reads and compiles JSON Schema files for the commands. Relaxations, warnings and errors are
 * printed as {@code FILE: POINTER: KEYWORD: relaxed|warning|error: MESSAGE}, with the JSON pointer
 * written as a URI fragment ({@code #/properties/row}, {@code #} for the root), preceded by the
 * document's URI for a place in another document ({@code file:/orchard/common/site.schema.json#/properties/row}).
 */
final class SchemaFiles {

    private SchemaFiles() {
    }

    /** The help text of the option that maps an absolute URI to a local file. */
    static final String DOCUMENT_HELP = "Serve FILE as the schema document at the absolute URI (http, https, urn...), "
            + "which references may reach; repeatable. Documents are never fetched; relative file references "
            + "are read beside the schema file without this option.";

    /**
     * A compiled schema; its relaxations and warnings are printed to {@code err}. A schema that cannot
     * be compiled is printed to {@code err} and ends the command (exit 2).
     */
    static SchemaResult load(String file, SchemaOptions options, PrintWriter err) {
        return load(file, options, List.of(), err);
    }

    /**
     * A compiled schema whose references may reach the files beside it and the documents given as
     * {@code URI=FILE}; notes and errors are printed as by {@link #load(String, SchemaOptions, PrintWriter)}.
     */
    static SchemaResult load(String file, SchemaOptions options, List<String> documents, PrintWriter err) {
        Path p = Path.of(file);
        if (!Files.isRegularFile(p)) {
            throw new UserInputException("no such schema file: " + file);
        }
        SchemaDocuments set = documents(documents, err);
        SchemaResult r;
        try {
            r = JsonSchemas.compile(p, set, options);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (SchemaException e) {
            err.println(line(file, e.location(), e.keyword(), "error", e.detail()));
            err.flush();
            throw new UserInputException(file + " cannot be compiled"
                    + (options.lenient() ? "" : "; --lenient relaxes what cannot be enforced exactly and lists it"));
        }
        for (SchemaNote n : r.relaxations()) {
            err.println(line(file, n.location(), n.keyword(), "relaxed", n.message()));
        }
        for (SchemaNote n : r.warnings()) {
            err.println(line(file, n.location(), n.keyword(), "warning", n.message()));
        }
        err.flush();
        return r;
    }

    /** The documents of {@code URI=FILE} arguments (split at the last {@code =}), each file parsed strictly. */
    static SchemaDocuments documents(List<String> specs, PrintWriter err) {
        SchemaDocuments set = SchemaDocuments.empty();
        for (String spec : specs) {
            int eq = spec.lastIndexOf('=');
            if (eq <= 0 || eq == spec.length() - 1) {
                throw new UserInputException("--schema-document takes URI=FILE: " + spec);
            }
            String uriText = spec.substring(0, eq);
            String file = spec.substring(eq + 1);
            URI uri;
            try {
                uri = new URI(uriText);
            } catch (URISyntaxException e) {
                throw new UserInputException("--schema-document: malformed URI " + uriText);
            }
            if (!uri.isAbsolute() || (uri.getRawFragment() != null && !uri.getRawFragment().isEmpty())) {
                throw new UserInputException("--schema-document: " + uriText + " is not an absolute URI without fragment");
            }
            Path p = Path.of(file);
            if (!Files.isRegularFile(p)) {
                throw new UserInputException("no such schema document file: " + file);
            }
            JsonNode doc;
            try {
                doc = JsonSchemas.parse(Files.readString(p, StandardCharsets.UTF_8));
            } catch (IOException e) {
                throw new UserInputException("schema document " + file + " cannot be read: " + e.getMessage());
            } catch (SchemaException e) {
                err.println(line(file, e.location(), e.keyword(), "error", e.detail()));
                err.flush();
                throw new UserInputException(file + " is not a schema document");
            }
            try {
                set = set.with(uri, doc);
            } catch (IllegalArgumentException e) {
                throw new UserInputException("--schema-document: " + e.getMessage());
            }
        }
        return set;
    }

    /** {@code FILE: LOCATION: KEYWORD: KIND: MESSAGE}; the keyword part is left out when there is none. */
    static String line(String file, String location, String keyword, String kind, String message) {
        return file + ": " + location + ": " + (keyword.isEmpty() ? "" : keyword + ": ") + kind + ": " + message;
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
