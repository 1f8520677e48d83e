package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.net.URI;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * Schema documents that references may reach, each under an absolute URI: the documents a schema
 * refers to by {@code http}, {@code https}, {@code urn} or other URIs, which are never fetched. An
 * immutable value; {@link #with} returns a new set.
 *
 * <p>A document is found by the URI it is given under and, as draft 2020-12 says, by its own
 * {@code $id} and the {@code $id}s of the resources embedded in it (these are seen when a reference
 * names a URI that no document is given under). URIs are compared without their fragment, after
 * RFC 3986 normalisation of dot segments ({@code file:///a} and {@code file:/a} are one URI).
 *
 * <p>Pass a set to {@link JsonSchemas#compile(JsonNode, URI, SchemaDocuments, SchemaOptions)} or
 * {@link JsonSchemas#compile(java.nio.file.Path, SchemaDocuments, SchemaOptions)}. Documents are
 * indexed when a reference first reaches them, so a large set costs nothing for the documents a
 * schema does not use.
 */
public final class SchemaDocuments {

    private static final SchemaDocuments EMPTY = new SchemaDocuments(Map.of());

    /** key: the URI in one spelling, without fragment (see {@link SchemaIndex#documentKey}) */
    private final Map<String, Entry> documents;

    /** One document and the URI it was given under. */
    record Entry(URI uri, JsonNode document) {
    }

    private SchemaDocuments(Map<String, Entry> documents) {
        this.documents = documents;
    }

    /** The empty set: only references inside the schema (and, compiling a file, to other files) resolve. */
    public static SchemaDocuments empty() {
        return EMPTY;
    }

    /**
     * This set with one more document.
     *
     * @param uri      an absolute URI without fragment (an empty fragment, {@code #}, is allowed)
     * @param document the parsed document (see {@link JsonSchemas#parse}); an object or a boolean
     * @throws IllegalArgumentException when the URI is relative, has a non-empty fragment, is already
     *                                  in the set, or the document is not an object or a boolean
     */
    public SchemaDocuments with(URI uri, JsonNode document) {
        Objects.requireNonNull(uri, "uri");
        Objects.requireNonNull(document, "document");
        if (!uri.isAbsolute()) {
            throw new IllegalArgumentException("a schema document needs an absolute URI: " + uri);
        }
        if (uri.getRawFragment() != null && !uri.getRawFragment().isEmpty()) {
            throw new IllegalArgumentException("a schema document's URI has no fragment: " + uri);
        }
        if (!document.isObject() && !document.isBoolean()) {
            throw new IllegalArgumentException("a schema document must be an object or a boolean: " + uri);
        }
        String key = SchemaIndex.documentKey(uri);
        if (documents.containsKey(key)) {
            throw new IllegalArgumentException("two schema documents under one URI: " + uri);
        }
        Map<String, Entry> next = new LinkedHashMap<>(documents);
        next.put(key, new Entry(URI.create(key), document));
        return new SchemaDocuments(Collections.unmodifiableMap(next));
    }

    /** The document given under this URI (its fragment ignored), if any; not found by {@code $id}. */
    public Optional<JsonNode> get(URI uri) {
        Entry e = documents.get(SchemaIndex.documentKey(uri));
        return e == null ? Optional.empty() : Optional.of(e.document());
    }

    /** The URIs the documents were given under (without fragment, in one spelling), in the order they were added. */
    public Set<URI> uris() {
        Set<URI> out = new java.util.LinkedHashSet<>();
        documents.values().forEach(e -> out.add(e.uri()));
        return Collections.unmodifiableSet(out);
    }

    /** How many documents the set holds. */
    public int size() {
        return documents.size();
    }

    /** The entries by key, for the index. */
    Map<String, Entry> entries() {
        return documents;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof SchemaDocuments d && d.documents.equals(documents);
    }

    @Override
    public int hashCode() {
        return documents.hashCode();
    }

    @Override
    public String toString() {
        return "SchemaDocuments" + uris();
    }
}
