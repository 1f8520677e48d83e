package dev.espalier.schema;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.io.IOException;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Objects;

/**
 * The entry point: JSON Schema to grammar.
 *
 * <h2>What the grammar accepts</h2>
 * The language of the compiled grammar is the set of JSON texts that (a) the schema accepts and (b)
 * are laid out under the {@link SchemaOptions layout policy}: canonical strings and numbers (see
 * below), the chosen white space, and members in the chosen order. Every valid instance has exactly
 * one such text in schema order (one per member order with {@link SchemaOptions.Order#ANY}), which
 * {@link SchemaResult#render} produces; every accepted text is a valid instance.
 * <ul>
 *   <li>Strings: characters are written as themselves except {@code "} and {@code \} ({@code \"},
 *       {@code \\}), the control characters with short escapes ({@code \b \f \n \r \t}) and the other
 *       characters below U+0020 as {@code \}{@code u00xx} with lowercase hex digits. So a string
 *       has one text, and {@code pattern}, {@code format} and the lengths (in code points) are
 *       compiled over decoded characters and then mapped character by character to that text.</li>
 *   <li>Numbers: RFC 8259 syntax without exponent, without leading zeros, without trailing zeros in
 *       the fraction, and integral values without a fraction ({@code 1.0} is written {@code 1},
 *       which also makes it an integer for {@code "type": "integer"} as JSON Schema says).</li>
 *   <li>White space: none ({@link SchemaOptions.Spacing#COMPACT}), or the two-space indented layout
 *       ({@link SchemaOptions.Spacing#PRETTY}): after {@code &#123;} or {@code [} a line break, each
 *       member or item on its own line indented two spaces per level, {@code ": "} between a name
 *       and its value, the closing bracket on its own line at the container's indentation, and
 *       {@code &#123;&#125;} and {@code []} for empty containers. The pretty grammar lays out at most
 *       {@value SchemaCompiler#PRETTY_DEPTH_LIMIT} levels of nesting.</li>
 *   <li>Member order: schema order puts the names listed in {@code properties} (then names that are
 *       only {@code required} or in {@code dependentRequired}) in the order written, then any other
 *       members ({@code patternProperties}, {@code additionalProperties}) in any order; any order
 *       lets the listed names come in any order, still before the others. Other members may repeat
 *       a name; each occurrence is valid.</li>
 *   <li>{@code pattern} is a search, as JSON Schema specifies: {@code p} is compiled as
 *       {@code .*p.*} over any code point, {@code ^p} as {@code p.*}, {@code p$} as {@code .*p}.</li>
 * </ul>
 *
 * <h2>Keywords</h2>
 * {@code type} (also as an array), {@code enum}, {@code const}, {@code properties}, {@code required},
 * {@code additionalProperties}, {@code patternProperties} (up to four overlapping patterns; any
 * number of disjoint ones), {@code propertyNames}, {@code minProperties}/{@code maxProperties},
 * {@code dependentRequired}, {@code dependentSchemas} (and draft-07 {@code dependencies}),
 * {@code items}, {@code prefixItems} (and draft-07 array {@code items} with {@code additionalItems}),
 * {@code minItems}/{@code maxItems}, {@code contains} with {@code minContains}/{@code maxContains},
 * {@code uniqueItems} for items with at most eight possible values, {@code minLength}/{@code maxLength}
 * (code points), {@code pattern}, {@code format} (the formats of {@link Formats#names()} are enforced,
 * which is stricter than draft 2020-12's default of annotation only; what a format's grammar does
 * not check is a warning; other formats are annotations), {@code minimum}/{@code maximum}/{@code exclusiveMinimum}/{@code exclusiveMaximum},
 * {@code multipleOf} (integers, and decimal steps whose digits are at most
 * {@link NumberLanguages#MAX_MODULUS}), {@code allOf}, {@code anyOf}, {@code oneOf}, {@code not},
 * {@code if}/{@code then}/{@code else}, {@code $ref} to {@code $defs}/{@code definitions} and to other documents (files beside a schema
 * file, and the documents of a {@link SchemaDocuments} set), JSON
 * pointers (with {@code ~0}, {@code ~1} and percent escapes), {@code $id}-identified subschemas and
 * {@code $anchor}s, recursive schemas, {@code $dynamicRef} where only one {@code $dynamicAnchor} can
 * match, boolean schemas, and {@code unevaluatedProperties}/{@code unevaluatedItems} over merged
 * {@code allOf}/{@code $ref}/disjoint {@code anyOf}/{@code oneOf}. Annotations ({@code title},
 * {@code description}, {@code default}, {@code examples}, {@code $comment}, ...) are ignored.
 *
 * <p>{@code oneOf} is exact when its branches are disjoint (different types, values, numeric ranges,
 * string languages, lengths, counts, or a required property with disjoint schemas or forbidden by
 * the other branch), and otherwise when the other branches have exact complements: branch i and not
 * branch j. {@code not} and {@code if} need an exact complement: of types, of scalar values, of
 * numeric bounds, of string constraints, of {@code minItems}/{@code maxItems}, and of objects
 * constrained by {@code properties}, {@code required} and property counts.
 *
 * <h2>Strictness</h2>
 * A keyword that cannot be enforced exactly is a {@link SchemaException} naming the keyword and the
 * JSON pointer of its schema, unless the options are lenient: then it is relaxed (enforced more
 * weakly, or not at all) and listed in {@link SchemaResult#relaxations()}. Refused: {@code uniqueItems}
 * over items with more than eight possible values, {@code contains} next to {@code prefixItems} or
 * with a contained schema without exact complement, {@code $ref} to a document that is not supplied
 * (see {@link SchemaDocuments}), dynamic references with
 * several candidate anchors (or in a schema of several documents), {@code multipleOf} with more digits than the limit, {@code oneOf} whose
 * overlapping branches lack complements, {@code not} and {@code if} without exact complement,
 * {@code unevaluated*} next to {@code not}, {@code if}, {@code contains} or overlapping branches,
 * {@code minProperties} that could only be reached with two or more pattern or additional members
 * (their names could repeat), objects with more named properties than
 * {@link SchemaOptions#anyOrderLimit()} in any order, and patterns outside the supported syntax.
 * Unknown keywords and unknown formats are warnings ({@link SchemaResult#warnings()}).
 */
public final class JsonSchemas {

    private static final ObjectMapper MAPPER = JsonMapper.builder()
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .build();

    private JsonSchemas() {
    }

    /**
     * Compiles a parsed schema on its own: its base URI is {@code urn:espalier:schema} (unless it
     * has a {@code $id}) and only references inside it resolve.
     *
     * @throws SchemaException when the schema is malformed or (not lenient) asks for something that
     *                         cannot be enforced exactly
     */
    public static SchemaResult compile(JsonNode schema, SchemaOptions options) {
        return compile(schema, SchemaIndex.DEFAULT_BASE, SchemaDocuments.empty(), false, options);
    }

    /**
     * Compiles a parsed schema whose references may reach other documents: the root's base URI is
     * {@code base} (its own {@code $id} resolved against it, when it has one), and a reference to
     * another document resolves to a document of {@code documents} (by the URI it is given under,
     * or by a {@code $id} inside it). Nothing is fetched or read: a reference to any other document
     * is a {@link SchemaException}.
     *
     * @param base an absolute URI, the schema's retrieval URI
     * @throws SchemaException when the schema is malformed, a reference cannot be resolved, or (not
     *                         lenient) the schema asks for something that cannot be enforced exactly
     */
    public static SchemaResult compile(JsonNode schema, URI base, SchemaDocuments documents, SchemaOptions options) {
        Objects.requireNonNull(base, "base");
        if (!base.isAbsolute()) {
            throw new IllegalArgumentException("the base URI must be absolute: " + base);
        }
        return compile(schema, base, documents, false, options);
    }

    /** Parses (strict JSON) and compiles a schema text; malformed JSON is a {@link SchemaException} at {@code ""}. */
    public static SchemaResult compile(String schemaJson, SchemaOptions options) {
        return compile(parse(schemaJson), options);
    }

    /**
     * Reads, parses and compiles a schema file. Its base URI is the file's {@code file:} URI (unless
     * it has a {@code $id}), so relative references reach the files beside it; see
     * {@link #compile(Path, SchemaDocuments, SchemaOptions)}.
     */
    public static SchemaResult compile(Path file, SchemaOptions options) throws IOException {
        return compile(file, SchemaDocuments.empty(), options);
    }

    /**
     * Reads, parses and compiles a schema file whose references may reach other documents. The
     * root's base URI is the file's absolute {@code file:} URI (its own {@code $id} resolved against
     * it, when it has one). A reference to another document resolves to a document of
     * {@code documents} (by the URI it is given under, or a {@code $id} inside it), else, for a
     * {@code file:} URI, to that file, read from disk on first use and parsed as {@link #parse}
     * does; {@code http}, {@code https}, {@code urn} and other URIs are never fetched. A referenced
     * file that is missing, unreadable or malformed is a {@link SchemaException} at the reference.
     *
     * @throws IOException when the schema file itself cannot be read
     */
    public static SchemaResult compile(Path file, SchemaDocuments documents, SchemaOptions options)
            throws IOException {
        Path abs = file.toAbsolutePath().normalize();
        JsonNode schema = parse(Files.readString(abs, StandardCharsets.UTF_8));
        return compile(schema, abs.toUri(), documents, true, options);
    }

    /**
     * As {@link #compile(Path, SchemaDocuments, SchemaOptions)} for a schema text that stands for the
     * file's content (an editor's buffer, saved or not): the file is not read, the files beside it
     * are. Malformed text is a {@link SchemaException} at {@code ""}.
     */
    public static SchemaResult compile(String schemaJson, Path file, SchemaDocuments documents, SchemaOptions options) {
        Path abs = file.toAbsolutePath().normalize();
        return compile(parse(schemaJson), abs.toUri(), documents, true, options);
    }

    private static SchemaResult compile(JsonNode schema, URI base, SchemaDocuments documents, boolean readFiles,
                                        SchemaOptions options) {
        Objects.requireNonNull(schema, "schema");
        Objects.requireNonNull(documents, "documents");
        Objects.requireNonNull(options, "options");
        if (!schema.isObject() && !schema.isBoolean()) {
            throw new SchemaException("", "", "a schema must be an object or a boolean");
        }
        return new SchemaCompiler(new SchemaIndex(schema, base, documents, readFiles), options, true).compile();
    }

    /**
     * Parses JSON strictly (no comments, no trailing data, no duplicate names), with numbers kept
     * exactly; malformed text is a {@link SchemaException} at {@code ""} giving line and column.
     */
    public static JsonNode parse(String json) {
        try {
            return MAPPER.readTree(json);
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String where = at == null ? "" : " at line " + at.getLineNr() + ", column " + at.getColumnNr();
            throw new SchemaException("", "", "malformed JSON" + where + ": " + e.getOriginalMessage());
        }
    }
}
