package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.net.URI;
import java.net.URISyntaxException;
import java.net.URLDecoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The subschemas of one schema document by JSON pointer, with their base URIs ({@code $id}) and
 * anchors ({@code $anchor}, and draft-07's {@code $id: "#name"}), for resolving {@code $ref}. Only
 * keywords whose values are schemas are walked, so a {@code $id} inside an {@code enum} value is not
 * mistaken for one.
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
    private final Map<String, JsonNode> nodes = new HashMap<>();
    private final Map<String, URI> bases = new HashMap<>();
    /** absolute URI without fragment, or with a plain-name fragment, to pointer */
    private final Map<String, String> resources = new HashMap<>();
    private final Map<String, Integer> dynamic = new HashMap<>();

    SchemaIndex(JsonNode root) {
        this.root = root;
        Deque<Object[]> work = new ArrayDeque<>();
        work.push(new Object[] {"", root, DEFAULT_BASE});
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
                        resources.put(strip(base) + s, ptr); // draft-07 anchor form
                    } else {
                        base = resolve(base, s, ptr, "$id");
                        resources.put(strip(base), ptr);
                    }
                }
                JsonNode anchor = n.get("$anchor");
                if (anchor != null && anchor.isTextual()) {
                    resources.put(strip(base) + "#" + anchor.textValue(), ptr);
                }
                JsonNode dyn = n.get("$dynamicAnchor");
                if (dyn != null && dyn.isTextual()) {
                    resources.putIfAbsent(strip(base) + "#" + dyn.textValue(), ptr);
                    dynamic.merge(dyn.textValue(), 1, Integer::sum);
                }
            }
            nodes.put(ptr, n);
            bases.put(ptr, base);
            if (ptr.isEmpty()) {
                resources.putIfAbsent(strip(base), "");
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

    /** The schema at a pointer of the document (walked or not), or null. */
    JsonNode node(String pointer) {
        JsonNode n = nodes.get(pointer);
        return n != null ? n : root.at(pointer.isEmpty() ? "" : pointer);
    }

    /** The base URI in effect at a walked pointer. */
    URI base(String pointer) {
        URI b = bases.get(pointer);
        return b != null ? b : DEFAULT_BASE;
    }

    /**
     * The pointer a {@code $ref} at {@code from} refers to.
     *
     * @throws SchemaException for a reference outside the document or to nothing
     */
    String resolve(String from, String ref) {
        URI target = resolve(base(from), ref, from, "$ref");
        String frag = target.getRawFragment();
        String doc = strip(target);
        String docPtr = resources.get(doc);
        if (docPtr == null) {
            throw new SchemaException(from, "$ref", "remote reference " + ref
                    + " is not supported: only references inside the schema document are resolved");
        }
        if (frag == null || frag.isEmpty()) {
            return docPtr;
        }
        if (frag.startsWith("/")) {
            String decoded = URLDecoder.decode(frag.replace("+", "%2B"), StandardCharsets.UTF_8);
            String ptr = docPtr + decoded;
            JsonNode n = node(ptr);
            if (n == null || n.isMissingNode()) {
                throw new SchemaException(from, "$ref", "reference " + ref + " points to nothing");
            }
            return normalise(ptr);
        }
        String anchored = resources.get(doc + "#" + URLDecoder.decode(frag, StandardCharsets.UTF_8));
        if (anchored == null) {
            throw new SchemaException(from, "$ref", "reference " + ref + " names no anchor of the document");
        }
        return anchored;
    }

    /** Pointer text with the tokens escaped the same way as the index builds them. */
    private static String normalise(String ptr) {
        return ptr;
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
            return base.resolve(r);
        } catch (URISyntaxException e) {
            throw new SchemaException(ptr, keyword, "malformed URI reference " + ref);
        }
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
