package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.net.URI;
import java.net.URISyntaxException;
import java.net.URLDecoder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The subschemas of the schema documents a compilation reaches, by location, with their base URIs
 * ({@code $id}) and anchors ({@code $anchor}, and draft-07's {@code $id: "#name"}), for resolving
 * {@code $ref}. Only keywords whose values are schemas are walked, so a {@code $id} inside an
 * {@code enum} value is not mistaken for one.
 *
 * <p>A location in the root document is its JSON pointer ({@code ""}, {@code /properties/row}); a
 * location in another document is {@code DOCUMENT#POINTER}, the document's URI without fragment in
 * one spelling ({@link #documentKey}) then its pointer, so that the compiler's pointer arithmetic
 * ({@code location + "/" + token}) works unchanged. Other documents are indexed when a reference
 * first reaches them: documents of the {@link SchemaDocuments} set by the URI they are given under,
 * then (on a miss) by the {@code $id}s inside the set's documents, then, when {@code readFiles},
 * {@code file:} URIs read from disk. Nothing else is fetched.
 */
final class SchemaIndex {

    /** The base URI of a schema without {@code $id}. */
    static final URI DEFAULT_BASE = URI.create("urn:espalier:schema");

    /** Keywords whose value is one schema. */
    static final Set<String> ONE = Set.of("additionalProperties", "propertyNames", "contains", "not", "if", "then",
            "else", "additionalItems", "unevaluatedItems", "unevaluatedProperties", "items");
    /** Keywords whose value is an array of schemas. */
    static final Set<String> MANY = Set.of("allOf", "anyOf", "oneOf", "prefixItems", "items");
    /** Keywords whose value is an object of schemas. */
    static final Set<String> NAMED = Set.of("properties", "patternProperties", "$defs", "definitions",
            "dependentSchemas", "dependencies");

    private final JsonNode root;
    private final URI rootBase;
    private final SchemaDocuments documents;
    private final boolean readFiles;
    private final Map<String, JsonNode> nodes = new HashMap<>();
    private final Map<String, URI> bases = new HashMap<>();
    /** absolute URI without fragment, or with a plain-name fragment, to location */
    private final Map<String, String> resources = new HashMap<>();
    private final Map<String, Integer> dynamic = new HashMap<>();
    /** the other documents indexed, by key: their parsed text and initial base */
    private final Map<String, JsonNode> loaded = new HashMap<>();
    private final Map<String, URI> loadedBases = new HashMap<>();
    private boolean setIndexed;
    /** other documents that declare (somewhere) a {@code $schema} other than draft 2020-12's, by key */
    private final Map<String, String> foreign = new HashMap<>();
    /** The draft 2020-12 meta-schema URI, the one dialect followed in other documents. */
    private static final java.util.regex.Pattern DIALECT =
            java.util.regex.Pattern.compile("https?://json-schema\\.org/draft/2020-12/schema#?");

    /** One document alone, as before: base {@link #DEFAULT_BASE}, no other documents. */
    SchemaIndex(JsonNode root) {
        this(root, DEFAULT_BASE, SchemaDocuments.empty(), false);
    }

    /**
     * @param rootBase  the root document's base URI before its own {@code $id} (its retrieval URI)
     * @param documents documents that references may reach
     * @param readFiles whether {@code file:} URIs outside the set are read from disk
     */
    SchemaIndex(JsonNode root, URI rootBase, SchemaDocuments documents, boolean readFiles) {
        this.root = root;
        this.rootBase = rootBase;
        this.documents = documents;
        this.readFiles = readFiles;
        if (!rootBase.equals(DEFAULT_BASE)) {
            resources.put(documentKey(rootBase), "");
        }
        walk("", root, rootBase);
    }

    /** Indexes one document whose locations start with {@code prefix} ({@code ""} for the root). */
    private void walk(String prefix, JsonNode doc, URI docBase) {
        // in another document, a URI already known keeps its resource (the URI a document is given
        // under wins over another document's $id)
        boolean first = prefix.isEmpty();
        Deque<Object[]> work = new ArrayDeque<>();
        work.push(new Object[] {prefix, doc, docBase});
        while (!work.isEmpty()) {
            Object[] w = work.pop();
            String ptr = (String) w[0];
            JsonNode n = (JsonNode) w[1];
            URI base = (URI) w[2];
            if (!n.isObject() && !n.isBoolean()) {
                continue;
            }
            if (n.isObject()) {
                JsonNode id = n.get("$id");
                if (id != null && id.isTextual()) {
                    String s = id.textValue();
                    if (s.startsWith("#")) {
                        register(strip(base) + s, ptr, first); // draft-07 anchor form
                    } else {
                        base = resolve(base, s, ptr, "$id");
                        register(strip(base), ptr, first);
                    }
                }
                JsonNode dialect = n.get("$schema");
                if (!first && dialect != null && !(dialect.isTextual() && DIALECT.matcher(dialect.textValue()).matches())) {
                    foreign.putIfAbsent(prefix.substring(0, prefix.length() - 1), dialect.toString());
                }
                JsonNode anchor = n.get("$anchor");
                if (anchor != null && anchor.isTextual()) {
                    register(strip(base) + "#" + anchor.textValue(), ptr, first);
                }
                JsonNode dyn = n.get("$dynamicAnchor");
                if (dyn != null && dyn.isTextual()) {
                    resources.putIfAbsent(strip(base) + "#" + dyn.textValue(), ptr);
                    dynamic.merge(dyn.textValue(), 1, Integer::sum);
                }
            }
            nodes.put(ptr, n);
            bases.put(ptr, base);
            if (ptr.equals(prefix)) {
                resources.putIfAbsent(strip(base), ptr);
            }
            if (!n.isObject()) {
                continue;
            }
            for (Iterator<Map.Entry<String, JsonNode>> it = n.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                String k = e.getKey();
                JsonNode v = e.getValue();
                String p = ptr + "/" + escape(k);
                if (ONE.contains(k) && (v.isObject() || v.isBoolean())) {
                    work.push(new Object[] {p, v, base});
                } else if (MANY.contains(k) && v.isArray()) {
                    for (int i = 0; i < v.size(); i++) {
                        work.push(new Object[] {p + "/" + i, v.get(i), base});
                    }
                } else if (NAMED.contains(k) && v.isObject()) {
                    for (Iterator<Map.Entry<String, JsonNode>> jt = v.fields(); jt.hasNext(); ) {
                        Map.Entry<String, JsonNode> f = jt.next();
                        work.push(new Object[] {p + "/" + escape(f.getKey()), f.getValue(), base});
                    }
                }
            }
        }
    }

    private void register(String uri, String location, boolean replace) {
        if (replace) {
            resources.put(uri, location);
        } else {
            resources.putIfAbsent(uri, location);
        }
    }

    /** The schema at a location (walked or not), or null or a missing node. */
    JsonNode node(String location) {
        JsonNode n = nodes.get(location);
        if (n != null) {
            return n;
        }
        String doc = document(location);
        if (doc == null) {
            return root.at(location);
        }
        JsonNode d = loaded.get(doc);
        String ptr = location.substring(doc.length() + 1);
        return d == null ? null : d.at(ptr);
    }

    /** The base URI in effect at a walked location. */
    URI base(String location) {
        URI b = bases.get(location);
        if (b != null) {
            return b;
        }
        String doc = document(location);
        if (doc == null) {
            return rootBase;
        }
        return loadedBases.getOrDefault(doc, rootBase);
    }

    /** The documents that references may reach (also where a meta-schema is looked up). */
    SchemaDocuments documents() {
        return documents;
    }

    /** How many documents are indexed, the root among them. */
    int documentCount() {
        return 1 + loaded.size();
    }

    /**
     * The location a {@code $ref} at {@code from} refers to, indexing the document it reaches on first use.
     *
     * @throws SchemaException for a reference to a document that is not supplied (the message starts
     *                         with "remote reference"), a file that cannot be read or parsed, or nothing
     */
    String resolve(String from, String ref) {
        String location = locate(from, ref);
        String doc = document(location);
        if (doc != null && foreign.containsKey(doc)) {
            throw new SchemaException(from, "$ref", "reference " + ref + " reaches document " + doc + ", whose $schema "
                    + foreign.get(doc) + " is another dialect than draft 2020-12: not supported");
        }
        return location;
    }

    private String locate(String from, String ref) {
        URI target = resolve(base(from), ref, from, "$ref");
        String frag = target.getRawFragment();
        String doc = strip(target);
        String docPtr = resources.get(doc);
        if (docPtr == null) {
            docPtr = load(from, ref, target, doc);
        }
        String where = docPtr.isEmpty() || docPtr.startsWith("/") ? "the schema document" : "document " + doc;
        if (frag == null || frag.isEmpty()) {
            return docPtr;
        }
        if (frag.startsWith("/")) {
            String decoded = URLDecoder.decode(frag.replace("+", "%2B"), StandardCharsets.UTF_8);
            String ptr = docPtr + decoded;
            JsonNode n = node(ptr);
            if (n == null || n.isMissingNode()) {
                throw new SchemaException(from, "$ref", "reference " + ref + " points to nothing in " + where);
            }
            return ptr;
        }
        String anchored = resources.get(doc + "#" + URLDecoder.decode(frag, StandardCharsets.UTF_8));
        if (anchored == null) {
            throw new SchemaException(from, "$ref", "reference " + ref + " names no anchor of " + where);
        }
        return anchored;
    }

    /** Indexes the document a reference reaches and returns the location of its resource. */
    private String load(String from, String ref, URI target, String doc) {
        SchemaDocuments.Entry given = documents.entries().get(doc);
        if (given != null && !loaded.containsKey(doc)) {
            index(doc, given.document(), given.uri());
            return resources.get(doc) != null ? resources.get(doc) : doc + "#";
        }
        if (!setIndexed) {
            // a document (or an embedded resource) known by its $id only
            setIndexed = true;
            for (String key : documents.entries().keySet()) {
                if (!loaded.containsKey(key)) {
                    resources.putIfAbsent(key, key + "#");
                }
            }
            for (Map.Entry<String, SchemaDocuments.Entry> e : documents.entries().entrySet()) {
                if (!loaded.containsKey(e.getKey())) {
                    index(e.getKey(), e.getValue().document(), e.getValue().uri());
                }
            }
            String found = resources.get(doc);
            if (found != null) {
                return found;
            }
        }
        if (readFiles && "file".equalsIgnoreCase(target.getScheme()) && !loaded.containsKey(doc)) {
            index(doc, readFile(from, ref, URI.create(doc)), URI.create(doc));
            return resources.get(doc) != null ? resources.get(doc) : doc + "#";
        }
        String named = ref.equals(doc) || ref.startsWith(doc + "#") ? ref : ref + " (document " + doc + ")";
        throw new SchemaException(from, "$ref", "remote reference " + named
                + " is not supplied: documents are never fetched; give it in the SchemaDocuments set"
                + ("file".equalsIgnoreCase(target.getScheme()) ? " or compile the schema from its file" : "")
                + " (command line: --schema-document " + doc + "=FILE)");
    }

    private void index(String key, JsonNode doc, URI base) {
        loaded.put(key, doc);
        loadedBases.put(key, base);
        resources.putIfAbsent(key, key + "#");
        walk(key + "#", doc, base);
    }

    /** Reads and parses a {@code file:} document (strictly, as {@link JsonSchemas#parse}). */
    private static JsonNode readFile(String from, String ref, URI uri) {
        Path file;
        try {
            file = Path.of(uri);
        } catch (IllegalArgumentException | java.nio.file.FileSystemNotFoundException e) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + uri + " is not a local file");
        }
        if (!Files.exists(file)) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": no such file " + file);
        }
        if (!Files.isRegularFile(file)) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + file + " is not a regular file");
        }
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (java.nio.charset.MalformedInputException e) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + file + " is not UTF-8 text");
        } catch (IOException e) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + file + " cannot be read ("
                    + e.getClass().getSimpleName() + (e.getMessage() == null ? "" : ": " + e.getMessage()) + ")");
        }
        JsonNode doc;
        try {
            doc = JsonSchemas.parse(text);
        } catch (SchemaException e) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + file + ": " + e.detail());
        }
        if (!doc.isObject() && !doc.isBoolean()) {
            throw new SchemaException(from, "$ref", "reference " + ref + ": " + file
                    + " is not a schema (an object or a boolean)");
        }
        return doc;
    }

    /** The key of the document a location lies in, or null for the root document. */
    static String document(String location) {
        if (location.isEmpty() || location.charAt(0) == '/') {
            return null;
        }
        int hash = location.indexOf('#');
        return hash < 0 ? null : location.substring(0, hash);
    }

    /** The JSON pointer of a location inside its document. */
    static String pointer(String location) {
        String doc = document(location);
        return doc == null ? location : location.substring(doc.length() + 1);
    }

    /** A location as written in messages: {@code #POINTER} in the root document, {@code DOCUMENT#POINTER} elsewhere. */
    static String display(String location) {
        return document(location) == null ? "#" + location : location;
    }

    /** A document's URI without fragment in one spelling, as locations and {@link SchemaDocuments} use it. */
    static String documentKey(URI uri) {
        return strip(uri);
    }

    private static URI resolve(URI base, String ref, String ptr, String keyword) {
        try {
            URI r = new URI(ref);
            if (base.isOpaque()) {
                if (r.isAbsolute()) {
                    return r;
                }
                // urn bases: only fragments are relative
                String s = base.toString();
                int hash = s.indexOf('#');
                String stem = hash < 0 ? s : s.substring(0, hash);
                if (ref.startsWith("#")) {
                    return new URI(stem + ref);
                }
                if (ref.isEmpty()) {
                    return new URI(stem);
                }
                throw new SchemaException(ptr, keyword, "relative reference " + ref
                        + " against a base without a path; give the schema an absolute $id");
            }
            return new URI(resolveReference(base.toString(), ref));
        } catch (URISyntaxException e) {
            throw new SchemaException(ptr, keyword, "malformed URI reference " + ref);
        }
    }

    /** RFC 3986 appendix B: scheme (2), authority (4), path (5), query (7), fragment (9). */
    private static final java.util.regex.Pattern URI_PARTS =
            java.util.regex.Pattern.compile("^(([^:/?#]+):)?(//([^/?#]*))?([^?#]*)(\\?([^#]*))?(#(.*))?", java.util.regex.Pattern.DOTALL);

    /**
     * Reference resolution as RFC 3986 section 5.2.2 gives it (strict: a reference with a scheme is
     * absolute), with dot segments removed as in section 5.2.4 and the result recomposed as in 5.3;
     * {@code java.net.URI.resolve} departs from it for empty references, query-only references and
     * {@code ..} above the root.
     */
    static String resolveReference(String base, String ref) {
        java.util.regex.Matcher b = URI_PARTS.matcher(base);
        java.util.regex.Matcher r = URI_PARTS.matcher(ref);
        if (!b.matches() || !r.matches()) {
            throw new IllegalArgumentException(base + " / " + ref);
        }
        String scheme;
        String authority;
        String path;
        String query;
        if (r.group(1) != null) {
            scheme = r.group(2);
            authority = r.group(3) != null ? r.group(4) : null;
            path = removeDotSegments(r.group(5));
            query = r.group(6) != null ? r.group(7) : null;
        } else {
            if (r.group(3) != null) {
                authority = r.group(4);
                path = removeDotSegments(r.group(5));
                query = r.group(6) != null ? r.group(7) : null;
            } else {
                if (r.group(5).isEmpty()) {
                    path = b.group(5);
                    query = r.group(6) != null ? r.group(7) : b.group(6) != null ? b.group(7) : null;
                } else {
                    if (r.group(5).startsWith("/")) {
                        path = removeDotSegments(r.group(5));
                    } else {
                        String bp = b.group(5);
                        String merged = b.group(3) != null && bp.isEmpty() ? "/" + r.group(5)
                                : bp.substring(0, bp.lastIndexOf('/') + 1) + r.group(5);
                        path = removeDotSegments(merged);
                    }
                    query = r.group(6) != null ? r.group(7) : null;
                }
                authority = b.group(3) != null ? b.group(4) : null;
            }
            scheme = b.group(2);
        }
        String fragment = r.group(8) != null ? r.group(9) : null;
        StringBuilder out = new StringBuilder();
        if (scheme != null) {
            out.append(scheme).append(':');
        }
        if (authority != null) {
            out.append("//").append(authority);
        }
        out.append(path);
        if (query != null) {
            out.append('?').append(query);
        }
        if (fragment != null) {
            out.append('#').append(fragment);
        }
        return out.toString();
    }

    /** RFC 3986 section 5.2.4. */
    static String removeDotSegments(String path) {
        String in = path;
        StringBuilder out = new StringBuilder();
        while (!in.isEmpty()) {
            if (in.startsWith("../")) {
                in = in.substring(3);
            } else if (in.startsWith("./")) {
                in = in.substring(2);
            } else if (in.startsWith("/./")) {
                in = in.substring(2);
            } else if (in.equals("/.")) {
                in = "/";
            } else if (in.startsWith("/../") || in.equals("/..")) {
                in = in.equals("/..") ? "/" : in.substring(3);
                int last = out.lastIndexOf("/");
                out.setLength(Math.max(last, 0));
            } else if (in.equals(".") || in.equals("..")) {
                in = "";
            } else {
                int next = in.indexOf('/', in.startsWith("/") ? 1 : 0);
                String segment = next < 0 ? in : in.substring(0, next);
                out.append(segment);
                in = in.substring(segment.length());
            }
        }
        return out.toString();
    }

    /** The URI without fragment, in one spelling ({@code file:///a} and {@code file:/a} agree). */
    private static String strip(URI u) {
        if (u.isOpaque()) {
            String s = u.toString();
            int hash = s.indexOf('#');
            return hash < 0 ? s : s.substring(0, hash);
        }
        URI n = u.normalize();
        return n.getScheme() + ":" + (n.getRawAuthority() == null ? "" : "//" + n.getRawAuthority())
                + (n.getRawPath() == null ? "" : n.getRawPath()) + (n.getRawQuery() == null ? "" : "?" + n.getRawQuery());
    }

    /** How many schemas declare {@code $dynamicAnchor} with this name. */
    int dynamicAnchors(String name) {
        return dynamic.getOrDefault(name, 0);
    }

    /** One JSON pointer reference token (RFC 6901). */
    static String escape(String token) {
        return token.replace("~", "~0").replace("/", "~1");
    }

    /** The reference tokens of a pointer, unescaped. */
    static List<String> tokens(String pointer) {
        if (pointer.isEmpty()) {
            return List.of();
        }
        String[] parts = pointer.substring(1).split("/", -1);
        java.util.ArrayList<String> out = new java.util.ArrayList<>();
        for (String p : parts) {
            out.add(p.replace("~1", "/").replace("~0", "~"));
        }
        return out;
    }
}
