package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.TextNode;
import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.ExprFold;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.regex.RegexSyntax;
import dev.espalier.regex.RegexSyntaxException;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.BasicAutomata;
import java.math.BigDecimal;
import java.math.BigInteger;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.IdentityHashMap;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * The schema compiler: one instance compiles one schema document. See {@link JsonSchemas} for the
 * policy; the steps are
 * <ol>
 *   <li>each schema location becomes a union of {@link Facet}s (its disjunctive normal form):
 *       {@code allOf}, {@code $ref} and sibling keywords are merged, {@code anyOf} distributes,
 *       {@code oneOf} is a union once its branches are shown disjoint, {@code not} and
 *       {@code if}/{@code then}/{@code else} go through an exact complement where one exists;</li>
 *   <li>each (set of locations, depth) reached from the root becomes one rule, made of the facets'
 *       alternatives, so recursive schemas give recursive rules;</li>
 *   <li>the same facets drive {@link #render}, so that a valid instance is laid out in the form the
 *       rules accept.</li>
 * </ol>
 */
final class SchemaCompiler {

    /** Most facets in the normal form of one location. */
    static final int MAX_FACETS = 256;
    /** Most rules in one compiled grammar. */
    static final int MAX_RULES = 20_000;
    /** With pretty layout, the deepest nesting the grammar lays out (deeper values are not accepted). */
    static final int PRETTY_DEPTH_LIMIT = 24;
    /** Most patterns of one object whose overlaps are enumerated. */
    static final int MAX_OVERLAPPING_PATTERNS = 4;
    /** Most properties taking part in {@code dependentRequired} of one object. */
    static final int MAX_DEPENDENT = 12;
    /** Most values of items whose distinctness ({@code uniqueItems}) is enforced. */
    static final int MAX_UNIQUE_VALUES = 8;
    /** Most states of one object's or array's counting machine. */
    static final int MAX_STATES = 100_000;
    /** Most named properties whose orders are enumerated, whatever the option says. */
    static final int MAX_ANY_ORDER = 12;
    /** Deepest chain of references and in-place combinators followed at once. */
    static final int MAX_REF_DEPTH = 500;
    /** State limit of intermediate automata. */
    static final int STATE_LIMIT = 50_000;

    private static final Set<String> ANNOTATIONS = Set.of("title", "description", "default", "examples",
            "$comment", "$schema", "$id", "$anchor", "$defs", "definitions", "readOnly", "writeOnly",
            "deprecated", "contentMediaType", "contentEncoding", "contentSchema", "$vocabulary", "$dynamicAnchor",
            "minContains", "maxContains");
    private static final Set<String> HANDLED = Set.of("type", "enum", "const", "minLength", "maxLength", "pattern",
            "format", "minimum", "maximum", "exclusiveMinimum", "exclusiveMaximum", "multipleOf", "items",
            "prefixItems", "additionalItems", "minItems", "maxItems", "uniqueItems", "contains", "properties",
            "required", "additionalProperties", "patternProperties", "propertyNames", "minProperties",
            "maxProperties", "dependentRequired", "dependencies", "dependentSchemas", "unevaluatedProperties",
            "unevaluatedItems", "$ref", "$dynamicRef", "$recursiveRef", "$recursiveAnchor", "allOf", "anyOf",
            "oneOf", "not", "if", "then", "else");
    private static final CodePointSet SPECIAL = CodePointSet.ofRanges(0, 0x1F, '"', '"', '\\', '\\');
    private static final CodePointSet SURROGATES = CodePointSet.range(0xD800, 0xDFFF);
    private static final CodePointSet NOT_SURROGATES = CodePointSet.ALL.minus(SURROGATES);
    private static final CodePointSet DIGITS = CodePointSet.range('0', '9');
    private static final CodePointSet DIGITS19 = CodePointSet.range('1', '9');

    private final SchemaIndex index;
    /** A {@code $dynamicRef} read as a plain reference (one document, one candidate anchor), or null. */
    private String staticDynamicRef;
    private final SchemaOptions options;
    private final boolean pretty;
    private final Set<SchemaNote> relaxations = new LinkedHashSet<>();
    private final Set<SchemaNote> warnings = new LinkedHashSet<>();

    private final Map<String, List<Facet>> dnfMemo = new HashMap<>();
    private final Set<String> dnfActive = new HashSet<>();
    private final Map<String, Automaton> patternAutomata = new HashMap<>();
    private final IdentityHashMap<Facet, Automaton> stringAutomata = new IdentityHashMap<>();

    private final Map<String, String> ruleNames = new HashMap<>();
    private final Set<String> usedNames = new HashSet<>();
    private final List<Rule> rules = new ArrayList<>();
    private final Deque<Object[]> pending = new ArrayDeque<>();
    private final Set<String> shared = new HashSet<>();
    /** Rules already written in their final, readable form (see {@link #encodeReadable}). */
    private final Set<String> readyRules = new HashSet<>();
    /** Literals split for reading, by text. */
    private final Map<String, Expr> splits = new HashMap<>();

    /**
     * Whether large string languages have their state rules written as they are made
     * ({@link RegularRules#ofMinimal(String, UnitDfa, RegularRules.Writer)}) rather than made and
     * then encoded in a second walk: the same rules, faster. Off only in the test of that sameness.
     */
    private final boolean writeStateRules;

    SchemaCompiler(JsonNode root, SchemaOptions options) {
        this(root, options, true);
    }

    SchemaCompiler(JsonNode root, SchemaOptions options, boolean writeStateRules) {
        this(new SchemaIndex(root), options, writeStateRules);
    }

    SchemaCompiler(SchemaIndex index, SchemaOptions options, boolean writeStateRules) {
        this.index = index;
        this.options = options;
        this.pretty = options.spacing() == SchemaOptions.Spacing.PRETTY;
        this.writeStateRules = writeStateRules;
        this.validationAsserts = readMetaSchema();
    }

    // ================================================================== dialect

    /** Meta-schemas whose vocabularies are the standard ones (draft 2020-12 read, with draft-07 forms). */
    private static final java.util.regex.Pattern STANDARD_DIALECTS = java.util.regex.Pattern.compile(
            "https?://json-schema\\.org/(draft/(2020-12|2019-09)/schema|draft-0[467]/schema)#?");
    /** The vocabularies of draft 2020-12 (section 8.1.2 of its core and of its validation specification; from memory). */
    private static final String VOCABULARY = "https://json-schema.org/draft/2020-12/vocab/";
    private static final Set<String> KNOWN_VOCABULARIES = Set.of(VOCABULARY + "core", VOCABULARY + "applicator",
            VOCABULARY + "unevaluated", VOCABULARY + "validation", VOCABULARY + "meta-data",
            VOCABULARY + "format-annotation", VOCABULARY + "format-assertion", VOCABULARY + "content");
    /** The keywords of the validation vocabulary. */
    private static final Set<String> VALIDATION_KEYWORDS = Set.of("type", "enum", "const", "multipleOf", "maximum",
            "exclusiveMaximum", "minimum", "exclusiveMinimum", "maxLength", "minLength", "pattern", "maxItems",
            "minItems", "uniqueItems", "maxContains", "minContains", "maxProperties", "minProperties", "required",
            "dependentRequired");

    /** Whether the keywords of the validation vocabulary assert (the root's meta-schema may leave them out). */
    private final boolean validationAsserts;

    /**
     * Reads the root's {@code $schema}: a standard dialect, or a meta-schema of the document set
     * whose {@code $vocabulary} says which vocabularies are in use. A required vocabulary that is not
     * known is refused (its keywords cannot be enforced); without the validation vocabulary, its
     * keywords are annotations. A meta-schema that is neither is read as draft 2020-12, with a warning.
     *
     * @return whether the validation vocabulary is in use
     */
    private boolean readMetaSchema() {
        JsonNode root = index.node("");
        JsonNode dialect = root != null && root.isObject() ? root.get("$schema") : null;
        if (dialect == null || !dialect.isTextual() || STANDARD_DIALECTS.matcher(dialect.textValue()).matches()) {
            return true;
        }
        java.util.Optional<JsonNode> meta;
        try {
            java.net.URI uri = new java.net.URI(dialect.textValue());
            meta = uri.isAbsolute() ? index.documents().get(uri) : java.util.Optional.empty();
        } catch (java.net.URISyntaxException e) {
            throw malformed("", "$schema", "malformed URI " + dialect.textValue());
        }
        JsonNode vocabularies = meta.map(m -> m.get("$vocabulary")).orElse(null);
        if (vocabularies == null || !vocabularies.isObject()) {
            warnings.add(new SchemaNote("", "$schema", "meta-schema " + dialect.textValue()
                    + " is not known: the schema is read as draft 2020-12"));
            return true;
        }
        for (Iterator<Map.Entry<String, JsonNode>> it = vocabularies.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> v = it.next();
            if (!KNOWN_VOCABULARIES.contains(v.getKey()) && v.getValue().asBoolean(false)) {
                refuse("", "$schema", "meta-schema " + dialect.textValue() + " requires the vocabulary "
                        + v.getKey() + ", whose keywords are not known");
            }
        }
        if (vocabularies.has(VOCABULARY + "validation")) {
            return true;
        }
        warnings.add(new SchemaNote("", "$schema", "meta-schema " + dialect.textValue()
                + " has no validation vocabulary: type, minimum and the other validation keywords are annotations"));
        return false;
    }

    // ================================================================== entry

    SchemaResult compile() {
        Facet.Sub root = Facet.Sub.of("");
        if (dnf(root).isEmpty()) {
            throw new SchemaException("", "", "the schema accepts no instance at all");
        }
        usedNames.add("root");
        ruleNames.put(key(root, 0), "root");
        pending.add(new Object[] {root, 0, "root"});
        while (!pending.isEmpty()) {
            Object[] job = pending.poll();
            generate((Facet.Sub) job[0], (Integer) job[1], (String) job[2]);
        }
        if (staticDynamicRef != null && index.documentCount() > 1) {
            // read as a plain reference while one document was known; another came later
            throw new SchemaException(staticDynamicRef, "$dynamicRef",
                    "a dynamic reference in a schema of several documents is not supported");
        }
        Rule top = rules.stream().filter(r -> r.name().equals("root")).findFirst().orElseThrow();
        if (top.body() instanceof Expr.Choice c && c.options().isEmpty()) {
            throw new SchemaException("", "", "the schema accepts no instance at all");
        }
        List<Rule> readable = new ArrayList<>();
        for (Rule r : rules) {
            readable.add(readyRules.contains(r.name()) ? r : Rule.of(r.name(), readable(r.body(), splits)));
        }
        Grammar g = Grammar.of(readable, "root");
        return new SchemaResult(g, options, List.copyOf(relaxations), List.copyOf(warnings), this::renderTop);
    }

    /**
     * The same language with literals split for reading: runs of printable characters become
     * quoted strings (case-insensitive ones when they hold no letter, which is the same language),
     * the rest (double quotes, line ends) separate literals; nested concatenations are flattened.
     */
    private static Expr readable(Expr body, Map<String, Expr> splits) {
        return new Readable(e -> e, splits).run(body, null);
    }

    /**
     * {@link #readable} of an expression after {@code leaves} has replaced its leaves (a leaf may
     * become any expression; it is made readable in turn).
     */
    private static final class Readable extends ExprFold<Expr> {
        private final java.util.function.UnaryOperator<Expr> leaves;
        private final Map<String, Expr> splits;

        Readable(java.util.function.UnaryOperator<Expr> leaves, Map<String, Expr> splits) {
            this.leaves = leaves;
            this.splits = splits;
        }

        @Override
        protected Expr leaf(Expr original) {
            Expr e = leaves.apply(original);
            if (e instanceof Expr.Text t) {
                return t.ignoreCase() ? t : splits.computeIfAbsent(t.text(), SchemaCompiler::split);
            }
            return e == original ? e : new Readable(x -> x, splits).run(e, null);
        }

        @Override
        protected Expr seq(Expr.Seq s, List<Expr> items) {
            boolean nested = false;
            List<Expr> flat = new ArrayList<>();
            for (Expr e : items) {
                if (e instanceof Expr.Seq q) {
                    flat.addAll(q.items());
                    nested = true;
                } else {
                    flat.add(e);
                }
            }
            if (!nested && items.size() != 1 && same(s.items(), items)) {
                return s;
            }
            return flat.size() == 1 ? flat.get(0) : new Expr.Seq(flat, s.span());
        }

        @Override
        protected Expr choice(Expr.Choice c, List<Expr> options) {
            return same(c.options(), options) ? c : new Expr.Choice(options, c.span());
        }

        @Override
        protected Expr repeat(Expr.Repeat r, Expr body) {
            return body == r.body() ? r : new Expr.Repeat(body, r.min(), r.max(), r.span());
        }
    }

    /** Whether a node's new children are its old ones. */
    private static boolean same(List<Expr> before, List<Expr> after) {
        for (int i = 0; i < before.size(); i++) {
            if (before.get(i) != after.get(i)) {
                return false;
            }
        }
        return true;
    }

    private static boolean printable(int cp) {
        if (cp == '"' || cp < 0x20 || (cp >= 0x7F && cp < 0xA0)) {
            return false;
        }
        int type = Character.getType(cp);
        return type != Character.SURROGATE && type != Character.UNASSIGNED && type != Character.CONTROL
                && type != Character.FORMAT && type != Character.LINE_SEPARATOR
                && type != Character.PARAGRAPH_SEPARATOR && type != Character.PRIVATE_USE
                && (type != Character.SPACE_SEPARATOR || cp == ' ');
    }

    private static Expr split(String s) {
        List<Expr> parts = new ArrayList<>();
        int i = 0;
        while (i < s.length()) {
            int cp = s.codePointAt(i);
            boolean p = printable(cp);
            int j = i;
            boolean letters = false;
            while (j < s.length()) {
                int c = s.codePointAt(j);
                if (printable(c) != p) {
                    break;
                }
                letters |= Character.isLetter(c);
                j += Character.charCount(c);
            }
            String run = s.substring(i, j);
            parts.add(new Expr.Text(run, p && !letters, dev.espalier.grammar.Span.NONE));
            i = j;
        }
        return parts.size() == 1 ? parts.get(0) : new Expr.Seq(parts, dev.espalier.grammar.Span.NONE);
    }

    private void refuse(String pointer, String keyword, String message) {
        if (!options.lenient()) {
            throw new SchemaException(pointer, keyword, message);
        }
        relaxations.add(new SchemaNote(pointer, keyword, message));
    }

    private static SchemaException malformed(String pointer, String keyword, String message) {
        return new SchemaException(pointer, keyword, message);
    }

    // ================================================================== normal form

    private final Map<String, List<Facet>> subMemo = new HashMap<>();

    /** The facets of a conjunction of locations. */
    List<Facet> dnf(Facet.Sub sub) {
        if (sub.parts().size() == 1 && !sub.parts().get(0).startsWith("!") && !sub.isFalse()) {
            return dnf(sub.parts().get(0));
        }
        List<Facet> done = subMemo.get(sub.key());
        if (done == null) {
            done = dnfOfParts(sub);
            subMemo.put(sub.key(), done);
        }
        return done;
    }

    private List<Facet> dnfOfParts(Facet.Sub sub) {
        List<Facet> acc = List.of(Facet.any(sub.parts().isEmpty() ? "" : bare(sub.parts().get(0))));
        for (String part : sub.parts()) {
            if (part.equals(Facet.Sub.FALSE)) {
                return List.of();
            }
            List<Facet> d = part.startsWith("!") ? complement(dnf(part.substring(1)), part.substring(1), "not")
                    : dnf(part);
            acc = conjoin(acc, d, part);
            if (acc.isEmpty()) {
                return acc;
            }
        }
        return acc;
    }

    private static String bare(String part) {
        return part.startsWith("!") ? part.substring(1) : part;
    }

    /** The facets of one location. */
    List<Facet> dnf(String ptr) {
        List<Facet> done = dnfMemo.get(ptr);
        if (done != null) {
            return done;
        }
        if (dnfActive.size() >= MAX_REF_DEPTH) {
            throw new SchemaException(ptr, "$ref", "references and combinators nest more than " + MAX_REF_DEPTH + " deep");
        }
        if (!dnfActive.add(ptr)) {
            throw new SchemaException(ptr, "$ref", "the schema refers to itself without descending into a property "
                    + "or an item, so it constrains nothing that could be compiled");
        }
        try {
            List<Facet> d = dnfOf(ptr);
            dnfMemo.put(ptr, d);
            return d;
        } finally {
            dnfActive.remove(ptr);
        }
    }

    private List<Facet> dnfOf(String ptr) {
        JsonNode n = index.node(ptr);
        if (n == null || n.isMissingNode()) {
            throw malformed(ptr, "", "no schema here");
        }
        if (n.isBoolean()) {
            return n.booleanValue() ? List.of(Facet.any(ptr)) : List.of();
        }
        if (!n.isObject()) {
            throw malformed(ptr, "", "a schema must be an object or a boolean");
        }
        Facet local = local(ptr, n);
        List<Facet> acc = local == null ? List.of() : List.of(local);
        for (String k : List.of("$ref", "$dynamicRef")) {
            JsonNode ref = n.get(k);
            if (ref == null) {
                continue;
            }
            if (!ref.isTextual()) {
                throw malformed(ptr, k, "must be a string");
            }
            if (k.equals("$dynamicRef")) {
                String r = ref.textValue();
                String anchor = r.contains("#") ? r.substring(r.indexOf('#') + 1) : "";
                if (!anchor.isEmpty() && index.dynamicAnchors(anchor) > 1) {
                    refuse(ptr, k, "a dynamic reference with several candidate $dynamicAnchor targets is not supported");
                    continue;
                }
                if (index.documentCount() > 1) {
                    refuse(ptr, k, "a dynamic reference in a schema of several documents is not supported");
                    continue;
                }
                staticDynamicRef = ptr;
            }
            String target;
            try {
                target = index.resolve(ptr, ref.textValue());
            } catch (SchemaException e) {
                if (!options.lenient() || !e.detail().startsWith("remote reference")) {
                    throw e;
                }
                relaxations.add(new SchemaNote(ptr, k, "remote reference " + ref.textValue() + " not enforced"));
                target = null;
            }
            if (target != null) {
                acc = conjoin(acc, dnf(target), ptr);
            }
        }
        // dependent schemas: an object without the property, or with it and satisfying the schema
        for (String k : List.of("dependentSchemas", "dependencies")) {
            JsonNode deps = n.get(k);
            if (deps == null || !deps.isObject()) {
                continue;
            }
            for (Iterator<Map.Entry<String, JsonNode>> it = deps.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> d = it.next();
                if (d.getValue().isArray()) {
                    continue; // dependentRequired form
                }
                String at = ptr + "/" + SchemaIndex.escape(k) + "/" + SchemaIndex.escape(d.getKey());
                List<Facet> union = new ArrayList<>();
                union.add(Facet.ofTypes(ptr, Facet.ALL & ~Facet.OBJ));
                Facet absent = Facet.ofTypes(ptr, Facet.OBJ);
                absent.properties.put(d.getKey(), Facet.Sub.NONE);
                union.add(absent);
                Facet present = Facet.ofTypes(ptr, Facet.OBJ);
                present.required.add(d.getKey());
                union.addAll(conjoin(List.of(present), dnf(at), ptr));
                acc = conjoin(acc, union, ptr);
            }
        }
        if (n.has("$recursiveRef")) {
            refuse(ptr, "$recursiveRef", "dynamic references are not supported");
        }
        JsonNode all = n.get("allOf");
        if (all != null) {
            for (int i = 0; i < arrayOf(ptr, "allOf", all).size(); i++) {
                acc = conjoin(acc, dnf(ptr + "/allOf/" + i), ptr);
            }
        }
        JsonNode any = n.get("anyOf");
        if (any != null) {
            List<Facet> union = new ArrayList<>();
            for (int i = 0; i < arrayOf(ptr, "anyOf", any).size(); i++) {
                union.addAll(dnf(ptr + "/anyOf/" + i));
            }
            acc = conjoin(acc, union, ptr);
        }
        JsonNode one = n.get("oneOf");
        if (one != null) {
            List<List<Facet>> branches = new ArrayList<>();
            for (int i = 0; i < arrayOf(ptr, "oneOf", one).size(); i++) {
                branches.add(conjoin(acc, dnf(ptr + "/oneOf/" + i), ptr));
            }
            List<Facet> union = new ArrayList<>();
            boolean overlap = false;
            List<List<Facet>> exact = new ArrayList<>();
            for (int i = 0; i < branches.size(); i++) {
                List<Facet> only = branches.get(i);
                for (int j = 0; j < branches.size() && !only.isEmpty(); j++) {
                    if (j == i || disjoint(branches.get(i), branches.get(j), 0)) {
                        continue;
                    }
                    overlap = true;
                    // exactly one: branch i and not branch j, for every branch j it may overlap
                    List<Facet> not = complementOrNull(dnf(ptr + "/oneOf/" + j));
                    if (not == null) {
                        refuse(ptr, "oneOf", "branches " + i + " and " + j + " may both match one instance and "
                                + "branch " + j + " has no exact complement; exactly-one cannot be enforced"
                                + (options.lenient() ? " (enforced as anyOf)" : ""));
                        exact = null;
                        break;
                    }
                    only = conjoin(only, not, ptr);
                }
                if (exact == null) {
                    break;
                }
                exact.add(only);
            }
            if (exact != null && overlap) {
                branches = exact;
            }
            branches.forEach(union::addAll);
            acc = union;
            checkSize(acc, ptr, "oneOf");
        }
        JsonNode not = n.get("not");
        if (not != null) {
            List<Facet> c = complement(dnf(ptr + "/not"), ptr, "not");
            acc = conjoin(acc, c, ptr);
        }
        if (n.has("if") && (n.has("then") || n.has("else"))) {
            List<Facet> cond = dnf(ptr + "/if");
            List<Facet> then = n.has("then") ? dnf(ptr + "/then") : List.of(Facet.any(ptr));
            List<Facet> otherwise = n.has("else") ? dnf(ptr + "/else") : List.of(Facet.any(ptr));
            List<Facet> negated = complementOrNull(cond);
            List<Facet> union = new ArrayList<>();
            if (negated == null) {
                refuse(ptr, "if", "the condition has no exact complement, so if/then/else cannot be reduced"
                        + (options.lenient() ? " (enforced as then or else)" : ""));
                union.addAll(then);
                union.addAll(otherwise);
            } else {
                union.addAll(conjoin(cond, then, ptr));
                union.addAll(conjoin(negated, otherwise, ptr));
            }
            acc = conjoin(acc, union, ptr);
        }
        acc = unevaluated(ptr, n, acc);
        return acc;
    }

    /**
     * {@code unevaluatedProperties} and {@code unevaluatedItems}, once the in-place applicators are
     * merged into facets: a facet's evaluated members are the names its merged parts declare or
     * match by pattern (all of them when a part has {@code additionalProperties}), so the keyword's
     * schema joins the facet's schema for other members; likewise for items beyond the prefix. This
     * is exact when no annotations are lost or gained by a branch the facet does not stand for:
     * refused under {@code not}, {@code if}, {@code contains} and {@code anyOf}/{@code oneOf} whose
     * branches are not disjoint.
     */
    private List<Facet> unevaluated(String ptr, JsonNode n, List<Facet> acc) {
        for (String k : List.of("unevaluatedProperties", "unevaluatedItems")) {
            JsonNode u = n.get(k);
            if (u == null) {
                continue;
            }
            boolean props = k.equals("unevaluatedProperties");
            if (u.isBoolean() && u.booleanValue()) {
                // evaluates every member (or item) without constraining it
                List<Facet> out = new ArrayList<>();
                for (Facet f : acc) {
                    Facet g = f.copy();
                    if (props) {
                        g.additionalSet = true;
                    } else {
                        g.itemsSet = true;
                    }
                    out.add(g);
                }
                acc = out;
                continue;
            }
            String obstacle = unevaluatedObstacle(ptr, props);
            if (obstacle != null) {
                refuse(ptr, k, k + " cannot be enforced exactly next to " + obstacle
                        + (options.lenient() ? " (not enforced)" : ""));
                continue;
            }
            Facet.Sub schema = Facet.Sub.of(ptr + "/" + k);
            List<Facet> out = new ArrayList<>();
            for (Facet f : acc) {
                Facet g = f.copy();
                if (props && !g.additionalSet) {
                    g.additional = g.additional.and(schema);
                    g.additionalSet = true;
                } else if (!props && !g.itemsSet) {
                    g.items = g.items.and(schema);
                    g.itemsSet = true;
                }
                out.add(g);
            }
            acc = out;
        }
        return acc;
    }

    /** What in the in-place applicators under a location keeps unevaluated* from being exact; null if nothing. */
    private String unevaluatedObstacle(String ptr, boolean props) {
        Deque<String> work = new ArrayDeque<>();
        Set<String> seen = new HashSet<>();
        work.push(ptr);
        while (!work.isEmpty()) {
            String at = work.pop();
            if (!seen.add(at)) {
                continue;
            }
            JsonNode n = index.node(at);
            if (n == null || !n.isObject()) {
                continue;
            }
            if (n.has("not")) {
                return "not";
            }
            if (n.has("if")) {
                return "if";
            }
            if (!props && n.has("contains")) {
                return "contains";
            }
            for (String k : List.of("anyOf", "oneOf", "allOf")) {
                JsonNode arr = n.get(k);
                if (arr == null || !arr.isArray()) {
                    continue;
                }
                for (int i = 0; i < arr.size(); i++) {
                    work.push(at + "/" + k + "/" + i);
                    for (int j = 0; j < i && !k.equals("allOf"); j++) {
                        if (!disjoint(dnf(at + "/" + k + "/" + i), dnf(at + "/" + k + "/" + j), 0)) {
                            return k + " with branches that may overlap";
                        }
                    }
                }
            }
            for (String k : List.of("$ref", "$dynamicRef")) {
                JsonNode r = n.get(k);
                if (r != null && r.isTextual()) {
                    try {
                        work.push(index.resolve(at, r.textValue()));
                    } catch (SchemaException e) {
                        return "an unresolved reference";
                    }
                }
            }
            for (String k : List.of("dependentSchemas", "dependencies")) {
                JsonNode d = n.get(k);
                if (d != null && d.isObject()) {
                    d.fieldNames().forEachRemaining(name -> {
                        if (d.get(name).isObject() || d.get(name).isBoolean()) {
                            work.push(at + "/" + SchemaIndex.escape(k) + "/" + SchemaIndex.escape(name));
                        }
                    });
                }
            }
        }
        return null;
    }

    private static JsonNode arrayOf(String ptr, String keyword, JsonNode n) {
        if (!n.isArray() || n.isEmpty()) {
            throw malformed(ptr, keyword, "must be a non-empty array of schemas");
        }
        return n;
    }

    private static void checkSize(List<Facet> fs, String ptr, String keyword) {
        if (fs.size() > MAX_FACETS) {
            throw new SchemaException(ptr, keyword, "the combinations of alternatives exceed " + MAX_FACETS
                    + " cases");
        }
    }

    List<Facet> conjoin(List<Facet> a, List<Facet> b, String ptr) {
        List<Facet> out = new ArrayList<>();
        for (Facet x : a) {
            for (Facet y : b) {
                Facet m = merge(x, y);
                if (m != null) {
                    out.add(m);
                }
                checkSize(out, ptr, "anyOf");
            }
        }
        return out;
    }

    private static int nonNegative(String ptr, String keyword, JsonNode v) {
        if (v == null || !v.isNumber() || !JsonText.integral(v) || v.decimalValue().signum() < 0) {
            throw malformed(ptr, keyword, "must be a non-negative integer");
        }
        BigDecimal d = v.decimalValue();
        return d.compareTo(BigDecimal.valueOf(Integer.MAX_VALUE)) > 0 ? Integer.MAX_VALUE : d.intValue();
    }

    private static BigDecimal number(String ptr, String keyword, JsonNode v) {
        if (!v.isNumber()) {
            throw malformed(ptr, keyword, "must be a number");
        }
        return v.decimalValue();
    }

    private static int typeBit(String ptr, JsonNode t) {
        if (!t.isTextual()) {
            throw malformed(ptr, "type", "type names are strings");
        }
        switch (t.textValue()) {
            case "null": return Facet.NULL;
            case "boolean": return Facet.BOOL;
            case "integer": return Facet.INT;
            case "number": return Facet.INT | Facet.FRAC;
            case "string": return Facet.STR;
            case "array": return Facet.ARR;
            case "object": return Facet.OBJ;
            default: throw malformed(ptr, "type", "unknown type " + t.textValue());
        }
    }

    /** The facet of a schema object's own keywords (no combinators). */
    private Facet local(String ptr, JsonNode n) {
        Facet f = new Facet(ptr);
        for (Iterator<Map.Entry<String, JsonNode>> it = n.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            String k = e.getKey();
            JsonNode v = e.getValue();
            String at = ptr + "/" + SchemaIndex.escape(k);
            if (!validationAsserts && VALIDATION_KEYWORDS.contains(k)) {
                continue; // an annotation under the root's meta-schema
            }
            switch (k) {
                case "type" -> {
                    int bits = 0;
                    if (v.isArray()) {
                        for (JsonNode t : v) {
                            bits |= typeBit(ptr, t);
                        }
                    } else {
                        bits = typeBit(ptr, v);
                    }
                    f.types &= bits;
                }
                case "enum" -> {
                    if (!v.isArray()) {
                        throw malformed(ptr, k, "must be an array");
                    }
                    List<JsonNode> vals = new ArrayList<>();
                    v.forEach(vals::add);
                    f.values = f.values == null ? vals : intersectValues(f.values, vals);
                }
                case "const" -> f.values = f.values == null ? new ArrayList<>(List.of(v))
                        : intersectValues(f.values, List.of(v));
                case "minLength" -> f.minLength = Math.max(f.minLength, nonNegative(ptr, k, v));
                case "maxLength" -> f.maxLength = Facet.minMax(f.maxLength, nonNegative(ptr, k, v));
                case "pattern" -> {
                    if (!v.isTextual()) {
                        throw malformed(ptr, k, "must be a string");
                    }
                    if (searchExpr(v.textValue(), ptr) != null) {
                        f.patterns.add(new Facet.Pattern(v.textValue(), ptr));
                    }
                }
                case "format" -> {
                    if (!v.isTextual()) {
                        throw malformed(ptr, k, "must be a string");
                    }
                    if (knownFormat(v.textValue())) {
                        f.formats.add(v.textValue());
                        // format is an annotation in draft 2020-12; what the grammar checks is said plainly
                        Formats.gaps(v.textValue()).ifPresent(g -> warnings.add(new SchemaNote(ptr, k,
                                "format " + v.textValue() + " is enforced by its grammar, which does not check: " + g)));
                    } else {
                        warnings.add(new SchemaNote(ptr, k, "format " + v.textValue()
                                + " is not enforced (an annotation only)"));
                    }
                }
                case "minimum" -> f.lower = Facet.tighterLower(f.lower, new Bound(number(ptr, k, v), false));
                case "maximum" -> f.upper = Facet.tighterUpper(f.upper, new Bound(number(ptr, k, v), false));
                case "exclusiveMinimum" -> f.lower = Facet.tighterLower(f.lower, new Bound(number(ptr, k, v), true));
                case "exclusiveMaximum" -> f.upper = Facet.tighterUpper(f.upper, new Bound(number(ptr, k, v), true));
                case "multipleOf" -> {
                    BigDecimal m = number(ptr, k, v);
                    if (m.signum() <= 0) {
                        throw malformed(ptr, k, "must be greater than 0");
                    }
                    BigDecimal s = m.stripTrailingZeros();
                    if (s.scale() <= 0) {
                        BigInteger i = s.toBigIntegerExact();
                        f.multipleOf = f.multipleOf == null ? i : lcm(f.multipleOf, i);
                        f.types &= ~Facet.FRAC;
                    } else if (s.unscaledValue().equals(BigInteger.ONE)) {
                        f.fractionDigits = Facet.minMax(f.fractionDigits, s.scale());
                    } else if (s.unscaledValue().compareTo(BigInteger.valueOf(NumberLanguages.MAX_MODULUS)) <= 0
                            && s.scale() <= 100) {
                        f.steps.add(s);
                    } else {
                        refuse(ptr, k, "multipleOf " + s.toPlainString() + " has more than "
                                + NumberLanguages.MAX_MODULUS + " as its digits; it cannot be enforced exactly");
                    }
                }
                case "items" -> {
                    if (v.isArray()) { // draft-07 form
                        for (int i = 0; i < v.size(); i++) {
                            f.prefix.add(Facet.Sub.of(at + "/" + i));
                        }
                        if (n.has("additionalItems")) {
                            f.items = Facet.Sub.of(ptr + "/additionalItems");
                            f.itemsSet = true;
                        }
                    } else {
                        f.items = Facet.Sub.of(at);
                        f.itemsSet = true;
                    }
                }
                case "prefixItems" -> {
                    if (!v.isArray()) {
                        throw malformed(ptr, k, "must be an array of schemas");
                    }
                    for (int i = 0; i < v.size(); i++) {
                        f.prefix.add(Facet.Sub.of(at + "/" + i));
                    }
                }
                case "minItems" -> f.minItems = Math.max(f.minItems, nonNegative(ptr, k, v));
                case "maxItems" -> f.maxItems = Facet.minMax(f.maxItems, nonNegative(ptr, k, v));
                case "uniqueItems" -> {
                    if (!v.isBoolean()) {
                        throw malformed(ptr, k, "must be a boolean");
                    }
                    f.unique = v.booleanValue();
                }
                case "contains" -> {
                    f.contains = at;
                    JsonNode lo = n.get("minContains");
                    JsonNode hi = n.get("maxContains");
                    f.minContains = lo == null || !validationAsserts ? 1 : nonNegative(ptr, "minContains", lo);
                    f.maxContains = hi == null || !validationAsserts ? -1 : nonNegative(ptr, "maxContains", hi);
                    if (f.minContains == 0 && f.maxContains < 0) {
                        f.contains = null; // always satisfied
                    }
                }
                case "properties" -> {
                    if (!v.isObject()) {
                        throw malformed(ptr, k, "must be an object of schemas");
                    }
                    v.fieldNames().forEachRemaining(name -> f.properties.put(name,
                            Facet.Sub.of(at + "/" + SchemaIndex.escape(name))));
                }
                case "required" -> {
                    if (!v.isArray()) {
                        throw malformed(ptr, k, "must be an array of strings");
                    }
                    for (JsonNode r : v) {
                        if (!r.isTextual()) {
                            throw malformed(ptr, k, "must be an array of strings");
                        }
                        f.required.add(r.textValue());
                    }
                }
                case "additionalProperties" -> {
                    f.additional = Facet.Sub.of(at);
                    f.additionalSet = true;
                }
                case "patternProperties" -> {
                    if (!v.isObject()) {
                        throw malformed(ptr, k, "must be an object of schemas");
                    }
                    for (Iterator<String> names = v.fieldNames(); names.hasNext(); ) {
                        String p = names.next();
                        if (searchExpr(p, ptr) != null) {
                            f.patternProperties.put(p, Facet.Sub.of(at + "/" + SchemaIndex.escape(p)));
                        }
                    }
                }
                case "propertyNames" -> f.propertyNames = Facet.Sub.of(at);
                case "minProperties" -> f.minProperties = Math.max(f.minProperties, nonNegative(ptr, k, v));
                case "maxProperties" -> f.maxProperties = Facet.minMax(f.maxProperties, nonNegative(ptr, k, v));
                case "dependentRequired", "dependencies" -> {
                    if (!v.isObject()) {
                        throw malformed(ptr, k, "must be an object");
                    }
                    for (Iterator<Map.Entry<String, JsonNode>> jt = v.fields(); jt.hasNext(); ) {
                        Map.Entry<String, JsonNode> d = jt.next();
                        if (d.getValue().isArray()) {
                            Set<String> targets = f.dependentRequired.computeIfAbsent(d.getKey(), x -> new LinkedHashSet<>());
                            for (JsonNode t : d.getValue()) {
                                if (!t.isTextual()) {
                                    throw malformed(ptr, k, "dependencies list property names");
                                }
                                targets.add(t.textValue());
                            }
                        } else if (k.equals("dependencies")) {
                            // schema dependencies: applied in dnfOf, as dependentSchemas
                        } else {
                            throw malformed(ptr, k, "must map names to arrays of names");
                        }
                    }
                }
                case "dependentSchemas" -> {
                    if (!v.isObject()) {
                        throw malformed(ptr, k, "must be an object of schemas");
                    }
                }
                case "unevaluatedProperties", "unevaluatedItems" -> {
                    // applied in dnfOf, once the in-place applicators are merged
                }
                default -> {
                    if (!HANDLED.contains(k) && !ANNOTATIONS.contains(k)) {
                        warnings.add(new SchemaNote(ptr, k, "unknown keyword, ignored"));
                    }
                }
            }
        }
        if (f.unique && f.maxItems >= 0 && f.maxItems <= 1) {
            f.unique = false; // at most one item: always distinct
        }
        return normalise(f);
    }

    private static BigInteger lcm(BigInteger a, BigInteger b) {
        return a.divide(a.gcd(b)).multiply(b);
    }

    private static List<JsonNode> intersectValues(List<JsonNode> a, List<JsonNode> b) {
        List<JsonNode> out = new ArrayList<>();
        for (JsonNode x : a) {
            if (b.stream().anyMatch(y -> JsonText.same(x, y))) {
                out.add(x);
            }
        }
        return out;
    }

    private boolean knownFormat(String name) {
        try {
            return Formats.names().contains(name);
        } catch (UnsupportedOperationException e) {
            return false;
        }
    }

    /** Drops the types a facet leaves no instance of; null when none is left. */
    private Facet normalise(Facet f) {
        if (f.minLength > f.maxLength && f.maxLength >= 0) {
            f.types &= ~Facet.STR;
        }
        if (f.emptyInterval()) {
            f.types &= ~(Facet.INT | Facet.FRAC);
        }
        if (f.minItems > f.maxItems && f.maxItems >= 0) {
            f.types &= ~Facet.ARR;
        }
        if (f.minProperties > f.maxProperties && f.maxProperties >= 0) {
            f.types &= ~Facet.OBJ;
        }
        if (f.values != null) {
            List<JsonNode> kept = new ArrayList<>();
            for (JsonNode v : f.values) {
                if ((typeOf(v) & f.types) != 0 && f.excluded.stream().noneMatch(x -> JsonText.same(x, v))) {
                    kept.add(v);
                }
            }
            f.values = kept;
            if (kept.isEmpty()) {
                f.types = 0;
            }
        }
        return f.types == 0 ? null : f;
    }

    static int typeOf(JsonNode v) {
        if (v.isNull()) {
            return Facet.NULL;
        }
        if (v.isBoolean()) {
            return Facet.BOOL;
        }
        if (v.isNumber()) {
            return JsonText.integral(v) ? Facet.INT : Facet.FRAC;
        }
        if (v.isTextual()) {
            return Facet.STR;
        }
        if (v.isArray()) {
            return Facet.ARR;
        }
        return v.isObject() ? Facet.OBJ : 0;
    }

    /** The conjunction of two facets; null when it is empty. */
    private Facet merge(Facet a, Facet b) {
        Facet m = a.copy();
        m.types &= b.types;
        if (m.types == 0) {
            return null;
        }
        if (b.values != null) {
            m.values = m.values == null ? new ArrayList<>(b.values) : intersectValues(m.values, b.values);
        }
        m.excluded.addAll(b.excluded);
        m.minLength = Math.max(a.minLength, b.minLength);
        m.maxLength = Facet.minMax(a.maxLength, b.maxLength);
        m.patterns.addAll(b.patterns);
        for (String fm : b.formats) {
            if (!m.formats.contains(fm)) {
                m.formats.add(fm);
            }
        }
        m.notStrings.addAll(b.notStrings);
        m.lower = Facet.tighterLower(a.lower, b.lower);
        m.upper = Facet.tighterUpper(a.upper, b.upper);
        m.multipleOf = a.multipleOf == null ? b.multipleOf : b.multipleOf == null ? a.multipleOf : lcm(a.multipleOf, b.multipleOf);
        m.fractionDigits = Facet.minMax(a.fractionDigits, b.fractionDigits);
        for (BigDecimal st : b.steps) {
            if (!m.steps.contains(st)) {
                m.steps.add(st);
            }
        }
        int n = Math.max(a.prefix.size(), b.prefix.size());
        m.prefix = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            m.prefix.add(a.itemAt(i).and(b.itemAt(i)));
        }
        m.items = a.items.and(b.items);
        m.minItems = Math.max(a.minItems, b.minItems);
        m.maxItems = Facet.minMax(a.maxItems, b.maxItems);
        m.unique = a.unique || b.unique;
        if (b.contains != null) {
            if (a.contains != null && !(a.contains.equals(b.contains) && a.minContains == b.minContains
                    && a.maxContains == b.maxContains)) {
                throw new SchemaException(b.pointer, "contains", "cannot be merged with the contains of "
                        + SchemaIndex.display(a.pointer));
            }
            m.contains = b.contains;
            m.minContains = b.minContains;
            m.maxContains = b.maxContains;
        }
        // objects
        if (!a.patternProperties.isEmpty() && !b.patternProperties.isEmpty()
                && !a.patternProperties.keySet().equals(b.patternProperties.keySet())) {
            throw new SchemaException(b.pointer, "patternProperties", "cannot be merged with the patternProperties of "
                    + SchemaIndex.display(a.pointer) + " (allOf, $ref or siblings)");
        }
        m.properties = new LinkedHashMap<>();
        Set<String> names = new LinkedHashSet<>(a.properties.keySet());
        names.addAll(b.properties.keySet());
        for (String name : names) {
            m.properties.put(name, memberSub(a, name).and(memberSub(b, name)));
        }
        m.required.addAll(b.required);
        m.patternProperties = new LinkedHashMap<>();
        if (!a.patternProperties.isEmpty() && !b.patternProperties.isEmpty()) {
            a.patternProperties.forEach((p, s) -> m.patternProperties.put(p, s.and(b.patternProperties.get(p))));
        } else if (!a.patternProperties.isEmpty()) {
            a.patternProperties.forEach((p, s) -> m.patternProperties.put(p, s.and(b.additional)));
        } else {
            b.patternProperties.forEach((p, s) -> m.patternProperties.put(p, s.and(a.additional)));
        }
        m.additional = a.additional.and(b.additional);
        m.additionalSet = a.additionalSet || b.additionalSet;
        m.itemsSet = a.itemsSet || b.itemsSet;
        m.propertyNames = a.propertyNames.and(b.propertyNames);
        m.minProperties = Math.max(a.minProperties, b.minProperties);
        m.maxProperties = Facet.minMax(a.maxProperties, b.maxProperties);
        b.dependentRequired.forEach((k, v) -> m.dependentRequired.computeIfAbsent(k, x -> new LinkedHashSet<>()).addAll(v));
        return normalise(m);
    }

    /**
     * The schema a member named {@code name} must satisfy: its {@code properties} entry and every
     * matching {@code patternProperties} entry, or {@code additionalProperties} when neither applies.
     * Properties with a name {@code propertyNames} refuses get the false schema.
     */
    Facet.Sub memberSub(Facet f, String name) {
        Facet.Sub s = f.properties.get(name);
        boolean matched = s != null;
        if (s == null) {
            s = Facet.Sub.TRUE;
        }
        for (Map.Entry<String, Facet.Sub> e : f.patternProperties.entrySet()) {
            if (searchAutomaton(e.getKey()).run(name)) {
                s = s.and(e.getValue());
                matched = true;
            }
        }
        if (!matched) {
            s = s.and(f.additional);
        }
        if (!f.propertyNames.isTrue() && !matches(TextNode.valueOf(name), f.propertyNames, 0)) {
            return Facet.Sub.NONE;
        }
        return s;
    }

    // ================================================================== complement

    private List<Facet> complementOrNull(List<Facet> fs) {
        try {
            return complementOf(fs);
        } catch (Unexpressible e) {
            return null;
        }
    }

    private List<Facet> complement(List<Facet> fs, String ptr, String keyword) {
        try {
            return complementOf(fs);
        } catch (Unexpressible e) {
            refuse(ptr, keyword, "the complement of this schema cannot be expressed exactly (" + e.getMessage() + ")"
                    + (options.lenient() ? "; not enforced" : ""));
            return List.of(Facet.any(ptr));
        }
    }

    private static final class Unexpressible extends Exception {
        Unexpressible(String m) {
            super(m, null, false, false);
        }
    }

    private List<Facet> complementOf(List<Facet> fs) throws Unexpressible {
        List<Facet> acc = List.of(Facet.any(fs.isEmpty() ? "" : fs.get(0).pointer));
        for (Facet f : fs) {
            acc = conjoin(acc, complementOne(f), f.pointer);
        }
        return acc;
    }

    /** not f = (not its types) or, for each type t of f, (t and not f's constraints on t). */
    private List<Facet> complementOne(Facet f) throws Unexpressible {
        String p = f.pointer;
        List<Facet> out = new ArrayList<>();
        int others = Facet.ALL & ~f.types;
        if (f.values != null) {
            Facet rest = f.copy();
            rest.values = null;
            Facet x = Facet.any(p);
            for (JsonNode v : f.values) {
                if (matchesFacet(v, rest, 0)) {
                    if (v.isContainerNode()) {
                        throw new Unexpressible("excluded object or array values");
                    }
                    x.excluded.add(v);
                }
            }
            return List.of(x);
        }
        if (!f.excluded.isEmpty()) {
            // not (rest and not in E) = (not rest) or (in E)
            for (JsonNode v : f.excluded) {
                Facet x = Facet.any(p);
                x.values = new ArrayList<>(List.of(v));
                out.add(x);
            }
            Facet rest = f.copy();
            rest.excluded = new ArrayList<>();
            out.addAll(complementOne(rest));
            return out;
        }
        if (others != 0) {
            out.add(Facet.ofTypes(p, others));
        }
        int nums = f.types & (Facet.INT | Facet.FRAC);
        if (nums != 0 && !f.noNumberRules()) {
            if (f.multipleOf != null || f.fractionDigits >= 0 || !f.steps.isEmpty()) {
                throw new Unexpressible("multipleOf");
            }
            if (f.lower != null) {
                Facet x = Facet.ofTypes(p, nums);
                x.upper = new Bound(f.lower.value(), !f.lower.exclusive());
                out.add(x);
            }
            if (f.upper != null) {
                Facet x = Facet.ofTypes(p, nums);
                x.lower = new Bound(f.upper.value(), !f.upper.exclusive());
                out.add(x);
            }
        }
        if ((f.types & Facet.STR) != 0 && !f.noStringRules()) {
            Facet x = Facet.ofTypes(p, Facet.STR);
            Facet strOnly = Facet.ofTypes(p, Facet.STR);
            strOnly.minLength = f.minLength;
            strOnly.maxLength = f.maxLength;
            strOnly.patterns = new ArrayList<>(f.patterns);
            strOnly.formats = new ArrayList<>(f.formats);
            strOnly.notStrings = new ArrayList<>(f.notStrings);
            x.notStrings.add(strOnly);
            out.add(x);
        }
        if ((f.types & Facet.ARR) != 0 && !f.noArrayRules()) {
            if (f.unique || f.contains != null) {
                throw new Unexpressible(f.unique ? "uniqueItems" : "contains");
            }
            if (!f.prefix.isEmpty() || !f.items.isTrue()) {
                if (!f.prefix.isEmpty() || f.items.parts().size() != 1) {
                    throw new Unexpressible("array items");
                }
                // some item fails the item schema
                throw new Unexpressible("array items");
            }
            if (f.minItems > 0) {
                Facet x = Facet.ofTypes(p, Facet.ARR);
                x.maxItems = f.minItems - 1;
                out.add(x);
            }
            if (f.maxItems >= 0) {
                Facet x = Facet.ofTypes(p, Facet.ARR);
                x.minItems = f.maxItems + 1;
                out.add(x);
            }
        }
        if ((f.types & Facet.OBJ) != 0 && !f.noObjectRules()) {
            if (!f.patternProperties.isEmpty() || !f.additional.isTrue() || !f.propertyNames.isTrue()
                    || !f.dependentRequired.isEmpty()) {
                throw new Unexpressible("object keywords other than properties, required, min/maxProperties");
            }
            for (String r : f.required) {
                Facet x = Facet.ofTypes(p, Facet.OBJ);
                x.properties.put(r, Facet.Sub.NONE);
                out.add(x);
            }
            for (Map.Entry<String, Facet.Sub> e : f.properties.entrySet()) {
                Facet.Sub s = e.getValue();
                if (s.isTrue()) {
                    continue;
                }
                Facet x = Facet.ofTypes(p, Facet.OBJ);
                x.required.add(e.getKey());
                Facet.Sub negated = negate(s);
                if (!negated.isTrue() && negated.parts().get(0).startsWith("!")) {
                    complementOf(dnf(Facet.Sub.of(negated.parts().get(0).substring(1)))); // expressible?
                }
                x.properties.put(e.getKey(), negated);
                out.add(x);
            }
            if (f.minProperties > 0) {
                Facet x = Facet.ofTypes(p, Facet.OBJ);
                x.maxProperties = f.minProperties - 1;
                out.add(x);
            }
            if (f.maxProperties >= 0) {
                Facet x = Facet.ofTypes(p, Facet.OBJ);
                x.minProperties = f.maxProperties + 1;
                out.add(x);
            }
        }
        List<Facet> kept = new ArrayList<>();
        for (Facet x : out) {
            Facet n = normalise(x);
            if (n != null) {
                kept.add(n);
            }
        }
        return kept;
    }

    private static Facet.Sub negate(Facet.Sub s) throws Unexpressible {
        if (s.isFalse()) {
            return Facet.Sub.TRUE;
        }
        if (s.parts().size() != 1) {
            throw new Unexpressible("a negated conjunction of schemas");
        }
        String part = s.parts().get(0);
        return part.startsWith("!") ? Facet.Sub.of(part.substring(1)) : new Facet.Sub(List.of("!" + part));
    }

    // ================================================================== disjointness

    /** Whether no instance matches both unions (false when unsure). */
    boolean disjoint(List<Facet> a, List<Facet> b, int depth) {
        for (Facet x : a) {
            for (Facet y : b) {
                if (!disjoint(x, y, depth)) {
                    return false;
                }
            }
        }
        return true;
    }

    private boolean disjointSub(Facet.Sub a, Facet.Sub b, int depth) {
        return depth < 4 && disjoint(dnf(a), dnf(b), depth + 1);
    }

    private boolean disjoint(Facet f, Facet g, int depth) {
        int common = f.types & g.types;
        if (common == 0) {
            return true;
        }
        if (f.values != null || g.values != null) {
            Facet withValues = f.values != null ? f : g;
            Facet other = withValues == f ? g : f;
            for (JsonNode v : withValues.values) {
                if (matchesFacet(v, other, 0)) {
                    return false;
                }
            }
            return true;
        }
        for (int t = 1; t <= Facet.OBJ; t <<= 1) {
            if ((common & t) != 0 && !disjointOn(t, f, g, depth)) {
                return false;
            }
        }
        return true;
    }

    private boolean disjointOn(int t, Facet f, Facet g, int depth) {
        switch (t) {
            case Facet.INT, Facet.FRAC -> {
                return below(f.upper, g.lower) || below(g.upper, f.lower);
            }
            case Facet.STR -> {
                if ((f.maxLength >= 0 && f.maxLength < g.minLength) || (g.maxLength >= 0 && g.maxLength < f.minLength)) {
                    return true;
                }
                if (f.noStringRules() || g.noStringRules()) {
                    return false;
                }
                try {
                    return stringAutomaton(f).intersection(stringAutomaton(g)).isEmpty();
                } catch (AutomatonTooLargeException e) {
                    return false;
                }
            }
            case Facet.ARR -> {
                if ((f.maxItems >= 0 && f.maxItems < g.minItems) || (g.maxItems >= 0 && g.maxItems < f.minItems)) {
                    return true;
                }
                int both = Math.min(f.minItems, g.minItems);
                for (int i = 0; i < both && i < Math.max(f.prefix.size(), g.prefix.size()) + 1; i++) {
                    if (disjointSub(f.itemAt(i), g.itemAt(i), depth)) {
                        return true;
                    }
                }
                return false;
            }
            case Facet.OBJ -> {
                if ((f.maxProperties >= 0 && f.maxProperties < g.minProperties)
                        || (g.maxProperties >= 0 && g.maxProperties < f.minProperties)) {
                    return true;
                }
                for (String r : f.required) {
                    if (dnf(memberSub(g, r)).isEmpty()) {
                        return true;
                    }
                    if (g.required.contains(r) && disjointSub(memberSub(f, r), memberSub(g, r), depth)) {
                        return true;
                    }
                }
                for (String r : g.required) {
                    if (dnf(memberSub(f, r)).isEmpty()) {
                        return true;
                    }
                }
                return false;
            }
            default -> {
                return false;
            }
        }
    }

    /** Whether every number at or below {@code hi} is below every number at or above {@code lo}. */
    private static boolean below(Bound hi, Bound lo) {
        if (hi == null || lo == null) {
            return false;
        }
        int c = hi.value().compareTo(lo.value());
        return c < 0 || (c == 0 && (hi.exclusive() || lo.exclusive()));
    }

    // ================================================================== strings as automata

    /**
     * The IR of a {@code pattern} under search semantics (JSON Schema patterns are not anchored):
     * {@code p} matches a string containing a match, so it becomes {@code .*p.*} with {@code .} any
     * code point; a leading {@code ^} or trailing {@code $} drops the corresponding side. Null when
     * the pattern is refused (lenient).
     */
    Expr searchExpr(String regex, String ptr) {
        boolean start = regex.startsWith("^");
        boolean end = endsWithDollar(regex);
        if ((start || end) && topLevelAlternation(regex)) {
            refuse(ptr, "pattern", "pattern " + regex + " anchors only some of its alternatives; write it as ^(...)$");
            return null;
        }
        Expr body;
        try {
            body = RegexSyntax.parse(regex);
        } catch (RegexSyntaxException e) {
            refuse(ptr, "pattern", "pattern " + regex + " is not supported: " + e.getMessage());
            return null;
        }
        Expr anything = Expr.repeat(Expr.chars(CodePointSet.ALL), 0, Expr.UNBOUNDED);
        List<Expr> parts = new ArrayList<>();
        if (!start) {
            parts.add(anything);
        }
        parts.add(body);
        if (!end) {
            parts.add(anything);
        }
        return new Expr.Seq(parts, dev.espalier.grammar.Span.NONE);
    }

    private static boolean endsWithDollar(String r) {
        if (!r.endsWith("$")) {
            return false;
        }
        int bs = 0;
        for (int i = r.length() - 2; i >= 0 && r.charAt(i) == '\\'; i--) {
            bs++;
        }
        return bs % 2 == 0;
    }

    private static boolean topLevelAlternation(String r) {
        int depth = 0;
        boolean inClass = false;
        for (int i = 0; i < r.length(); i++) {
            char c = r.charAt(i);
            if (c == '\\') {
                i++;
            } else if (inClass) {
                if (c == ']') {
                    inClass = false;
                }
            } else if (c == '[') {
                inClass = true;
            } else if (c == '(') {
                depth++;
            } else if (c == ')') {
                depth--;
            } else if (c == '|' && depth == 0) {
                return true;
            }
        }
        return false;
    }

    /** The search automaton of a pattern over decoded strings. */
    Automaton searchAutomaton(String regex) {
        Automaton a = patternAutomata.get(regex);
        if (a == null) {
            Expr e = searchExpr(regex, "");
            a = e == null ? BasicAutomata.makeAnyString() : CharAutomata.compile(e, null, STATE_LIMIT);
            patternAutomata.put(regex, a);
        }
        return a;
    }

    /** The decoded strings a facet's string keywords (not its values) allow. */
    Automaton stringAutomaton(Facet f) {
        Automaton a = stringAutomata.get(f);
        if (a != null) {
            return a;
        }
        if (shaped(f)) {
            a = stringUnits(f).toAutomaton();
        } else {
            a = unbounded(f, false);
            if (a.getNumberOfStates() > STATE_LIMIT) {
                throw new AutomatonTooLargeException(STATE_LIMIT);
            }
        }
        stringAutomata.put(f, a);
        return a;
    }

    /** Whether a facet's strings have a pattern, a format or a negated string schema. */
    private static boolean shaped(Facet f) {
        return !f.patterns.isEmpty() || !f.formats.isEmpty() || !f.notStrings.isEmpty();
    }

    /**
     * The strings of a {@link #shaped} facet as arrays, minimal: the language without its length
     * bounds first (small automata), then the length range as a product with a counter
     * ({@link StringLengths}), which stays fast where the product is large.
     */
    private UnitDfa stringUnits(Facet f) {
        UnitDfa u = stringUnitDfas.get(f);
        if (u == null) {
            u = StringLengths.units(unbounded(f, true), f.minLength, f.maxLength, STATE_LIMIT); // checks the limit itself
            stringUnitDfas.put(f, u);
        }
        return u;
    }

    private final IdentityHashMap<Facet, UnitDfa> stringUnitDfas = new IdentityHashMap<>();

    /**
     * A facet's strings, minimal: with {@code shaped}, without the length bounds (a shared format or
     * pattern automaton is returned as it is, so callers must not change it); otherwise any
     * characters within the length bounds.
     */
    private Automaton unbounded(Facet f, boolean shaped) {
        Automaton a = shaped ? null : CharAutomata.compile(Expr.repeat(Expr.chars(CodePointSet.ALL), f.minLength,
                f.maxLength < 0 ? Expr.UNBOUNDED : f.maxLength), null, STATE_LIMIT);
        boolean shared = shaped; // a pattern's or a format's automaton is shared: operations make new ones
        for (Facet.Pattern p : f.patterns) {
            shared = a == null;
            a = a == null ? searchAutomaton(p.regex()) : a.intersection(searchAutomaton(p.regex()));
        }
        for (String fm : f.formats) {
            shared = a == null;
            a = a == null ? Formats.automaton(fm).orElseThrow() : a.intersection(Formats.automaton(fm).orElseThrow());
        }
        for (Facet neg : f.notStrings) {
            a = (a == null ? Automaton.makeAnyString() : a).minus(stringAutomaton(neg));
            shared = false;
        }
        for (JsonNode x : f.excluded) {
            if (x.isTextual()) {
                a = a.minus(BasicAutomata.makeString(x.textValue()));
                shared = false;
            }
        }
        if (!shared) {
            a.minimize(); // also keeps the length product small
        }
        return a;
    }

    // ================================================================== matching instances

    /** Whether an instance satisfies a conjunction of locations (as compiled). */
    boolean matches(JsonNode v, Facet.Sub s, int depth) {
        if (depth > JsonText.MAX_DEPTH) {
            return false;
        }
        for (Facet f : dnf(s)) {
            if (matchesFacet(v, f, depth)) {
                return true;
            }
        }
        return false;
    }

    boolean matchesFacet(JsonNode v, Facet f, int depth) {
        int t = typeOf(v);
        if ((f.types & t) == 0) {
            return false;
        }
        if (f.values != null && f.values.stream().noneMatch(x -> JsonText.same(x, v))) {
            return false;
        }
        if (f.excluded.stream().anyMatch(x -> JsonText.same(x, v))) {
            return false;
        }
        switch (t) {
            case Facet.STR -> {
                String s = v.textValue();
                int n = s.codePointCount(0, s.length());
                if (n < f.minLength || (f.maxLength >= 0 && n > f.maxLength)) {
                    return false;
                }
                return f.patterns.isEmpty() && f.formats.isEmpty() && f.notStrings.isEmpty() || stringAutomaton(f).run(s);
            }
            case Facet.INT, Facet.FRAC -> {
                BigDecimal d = v.decimalValue();
                if (f.lower != null && (d.compareTo(f.lower.value()) < 0
                        || (f.lower.exclusive() && d.compareTo(f.lower.value()) == 0))) {
                    return false;
                }
                if (f.upper != null && (d.compareTo(f.upper.value()) > 0
                        || (f.upper.exclusive() && d.compareTo(f.upper.value()) == 0))) {
                    return false;
                }
                if (f.multipleOf != null && d.remainder(new BigDecimal(f.multipleOf)).signum() != 0) {
                    return false;
                }
                for (BigDecimal st : f.steps) {
                    if (d.remainder(st).signum() != 0) {
                        return false;
                    }
                }
                return f.fractionDigits < 0 || d.stripTrailingZeros().scale() <= f.fractionDigits;
            }
            case Facet.ARR -> {
                if (v.size() < f.minItems || (f.maxItems >= 0 && v.size() > f.maxItems)) {
                    return false;
                }
                for (int i = 0; i < v.size(); i++) {
                    if (!matches(v.get(i), f.itemAt(i), depth + 1)) {
                        return false;
                    }
                    for (int j = 0; f.unique && j < i; j++) {
                        if (JsonText.same(v.get(i), v.get(j))) {
                            return false;
                        }
                    }
                }
                if (f.contains != null) {
                    int found = 0;
                    for (JsonNode item : v) {
                        found += matches(item, Facet.Sub.of(f.contains), depth + 1) ? 1 : 0;
                    }
                    return found >= f.minContains && (f.maxContains < 0 || found <= f.maxContains);
                }
                return true;
            }
            case Facet.OBJ -> {
                if (v.size() < f.minProperties || (f.maxProperties >= 0 && v.size() > f.maxProperties)) {
                    return false;
                }
                for (String r : f.required) {
                    if (!v.has(r)) {
                        return false;
                    }
                }
                for (Map.Entry<String, Set<String>> d : f.dependentRequired.entrySet()) {
                    if (v.has(d.getKey()) && !d.getValue().stream().allMatch(v::has)) {
                        return false;
                    }
                }
                for (Iterator<Map.Entry<String, JsonNode>> it = v.fields(); it.hasNext(); ) {
                    Map.Entry<String, JsonNode> e = it.next();
                    if (!matches(e.getValue(), memberSub(f, e.getKey()), depth + 1)) {
                        return false;
                    }
                }
                return true;
            }
            default -> {
                return true;
            }
        }
    }

    // ================================================================== rules

    private String key(Facet.Sub s, int depth) {
        return s.key() + "@" + (pretty ? depth : 0);
    }

    /** The rule for the values a conjunction of locations allows at a depth (queued for generation). */
    private String ruleFor(Facet.Sub s, int depth) {
        String k = key(s, depth);
        String name = ruleNames.get(k);
        if (name != null) {
            return name;
        }
        List<Facet> facets = dnf(s);
        if (facets.size() == 1 && facets.get(0).types == Facet.ALL && facets.get(0).typesOnly()) {
            return anyValue(depth);
        }
        if (ruleNames.size() >= MAX_RULES) {
            throw new SchemaException(s.parts().isEmpty() ? "" : bare(s.parts().get(0)), "",
                    "the grammar would need more than " + MAX_RULES + " rules");
        }
        name = fresh(hint(s));
        ruleNames.put(k, name);
        pending.add(new Object[] {s, depth, name});
        return name;
    }

    /** An unused rule name based on {@code base}. */
    private String fresh(String base) {
        if (usedNames.size() >= MAX_RULES) {
            throw new SchemaException("", "", "the grammar would need more than " + MAX_RULES + " rules");
        }
        String name = base;
        for (int i = 2; usedNames.contains(name.toLowerCase(Locale.ROOT)); i++) {
            name = base + "-" + i;
        }
        usedNames.add(name.toLowerCase(Locale.ROOT));
        return name;
    }

    /** A readable rule name for a location, from the property names and definitions on its path. */
    static String hint(Facet.Sub s) {
        if (s.parts().isEmpty()) {
            return "any-value";
        }
        String part = s.parts().get(0);
        boolean negated = part.startsWith("!");
        String document = SchemaIndex.document(bare(part));
        List<String> tokens = SchemaIndex.tokens(SchemaIndex.pointer(bare(part)));
        List<String> words = new ArrayList<>();
        for (int i = 0; i < tokens.size(); i++) {
            String t = tokens.get(i);
            String next = i + 1 < tokens.size() ? tokens.get(i + 1) : null;
            switch (t) {
                case "$defs", "definitions" -> {
                    if (next != null) {
                        words.clear();
                        words.add(next);
                        i++;
                    }
                }
                case "properties", "dependentSchemas" -> {
                    if (next != null) {
                        words.add(next);
                        i++;
                    }
                }
                case "patternProperties" -> {
                    words.add("pattern");
                    i++;
                }
                case "additionalProperties" -> words.add("other");
                case "items", "prefixItems" -> {
                    if (next != null && next.matches("\\d+")) {
                        words.add("item-" + (Integer.parseInt(next) + 1));
                        i++;
                    } else {
                        words.add("item");
                    }
                }
                case "additionalItems" -> words.add("item");
                case "anyOf", "oneOf", "allOf" -> {
                    if (next != null) {
                        words.add((t.equals("allOf") ? "part-" : "option-") + (Integer.parseInt(next) + 1));
                        i++;
                    }
                }
                case "propertyNames" -> words.add("name");
                default -> words.add(t);
            }
        }
        String base = words.isEmpty() ? (document == null ? "root" : documentName(document)) : String.join("-", words);
        if (negated) {
            base = "not-" + base;
        }
        return sanitise(base);
    }

    /** A name for the root of another document: its last path segment without {@code .json} and {@code .schema}. */
    private static String documentName(String document) {
        String last = document.substring(Math.max(document.lastIndexOf('/'), document.lastIndexOf(':')) + 1);
        last = last.replaceAll("(?i)\\.json$", "").replaceAll("(?i)\\.schema$", "");
        return last.isEmpty() ? "document" : last;
    }

    static String sanitise(String s) {
        String t = s.replaceAll("[^A-Za-z0-9-]+", "-").replaceAll("-{2,}", "-").replaceAll("^-|-$", "");
        if (t.isEmpty()) {
            t = "value";
        }
        if (!Character.isLetter(t.charAt(0)) || t.toLowerCase(Locale.ROOT).startsWith("json-")) {
            t = "x-" + t;
        }
        return t;
    }

    private void generate(Facet.Sub s, int depth, String name) {
        Expr body;
        if (pretty && depth > PRETTY_DEPTH_LIMIT) {
            body = Expr.choice();
        } else {
            List<Expr> options = new ArrayList<>();
            for (Facet f : dnf(s)) {
                Expr e = facetExpr(f, depth, name);
                if (e != null) {
                    options.add(e);
                }
            }
            body = options.size() == 1 ? options.get(0) : new Expr.Choice(options, dev.espalier.grammar.Span.NONE);
        }
        rules.add(Rule.of(name, body));
    }

    private static Expr text(String s) {
        return Expr.text(s);
    }

    private static Expr seq(List<Expr> items) {
        List<Expr> flat = new ArrayList<>();
        for (Expr e : items) {
            if (e instanceof Expr.Seq q) {
                flat.addAll(q.items());
            } else {
                flat.add(e);
            }
        }
        // join adjacent case-sensitive texts
        List<Expr> out = new ArrayList<>();
        for (Expr e : flat) {
            if (e instanceof Expr.Text t && !t.ignoreCase() && !out.isEmpty()
                    && out.get(out.size() - 1) instanceof Expr.Text u && !u.ignoreCase()) {
                out.set(out.size() - 1, Expr.text(u.text() + t.text()));
            } else if (!(e instanceof Expr.Text t2 && t2.text().isEmpty() && !t2.ignoreCase())) {
                out.add(e);
            }
        }
        return out.size() == 1 ? out.get(0) : new Expr.Seq(out, dev.espalier.grammar.Span.NONE);
    }

    private static Expr seq(Expr... items) {
        return seq(List.of(items));
    }

    private static Expr choice(List<Expr> options) {
        List<Expr> out = new ArrayList<>();
        for (Expr e : options) {
            if (e instanceof Expr.Choice c) {
                out.addAll(c.options());
            } else {
                out.add(e);
            }
        }
        return out.size() == 1 ? out.get(0) : new Expr.Choice(out, dev.espalier.grammar.Span.NONE);
    }

    /** Largest count written as one repetition (the Earley lowering's limit). */
    static final int MAX_COUNT = 1_000;

    /**
     * {@code x} repeated {@code min..max} times, with counts above {@value #MAX_COUNT} written as
     * nested repetitions of blocks (the same language): {@code x{m}} is {@code (x{B}){m/B} x{m%B}},
     * and {@code x{0,N}} with {@code N = qB + r} is {@code (x{B}){0,q-1} x{0,B-1} / (x{B}){q} x{0,r}}.
     */
    static Expr rep(Expr x, int min, int max) {
        if (min <= MAX_COUNT && (max == Expr.UNBOUNDED || max <= MAX_COUNT)) {
            return Expr.repeat(x, min, max);
        }
        int b = MAX_COUNT;
        Expr block = Expr.repeat(x, b, b);
        Expr head = min <= b ? Expr.repeat(x, min, min)
                : seq(List.of(rep(block, min / b, min / b), Expr.repeat(x, min % b, min % b)));
        if (max == Expr.UNBOUNDED) {
            return seq(List.of(head, Expr.repeat(x, 0, Expr.UNBOUNDED)));
        }
        int n = max - min;
        if (n <= b) {
            return seq(List.of(head, Expr.repeat(x, 0, n)));
        }
        int q = n / b;
        int r = n % b;
        Expr upTo = choice(List.of(seq(List.of(rep(block, 0, q - 1), Expr.repeat(x, 0, b - 1))),
                seq(List.of(rep(block, q, q), Expr.repeat(x, 0, r)))));
        return seq(List.of(head, upTo));
    }

    private static Expr optional(Expr e) {
        return Expr.repeat(e, 0, 1);
    }

    /** The language of one facet at a depth; null when it is empty. */
    private Expr facetExpr(Facet f, int depth, String name) {
        List<Expr> options = new ArrayList<>();
        if (f.values != null) {
            Facet rest = f.copy();
            rest.values = null;
            Set<String> seen = new LinkedHashSet<>();
            for (JsonNode v : f.values) {
                if (matchesFacet(v, rest, 0)) {
                    String t = JsonText.value(v, this.options.spacing(), depth);
                    if (t != null && seen.add(t)) {
                        options.add(text(t));
                    }
                }
            }
            return options.isEmpty() ? null : choice(options);
        }
        if (f.types == Facet.ALL && f.typesOnly()) {
            return Expr.ref(anyValue(depth));
        }
        if ((f.types & Facet.OBJ) != 0) {
            add(options, objectOf(f, depth, name));
        }
        if ((f.types & Facet.ARR) != 0) {
            add(options, arrayExpr(f, depth, name));
        }
        if ((f.types & Facet.STR) != 0) {
            add(options, stringExpr(f, name));
        }
        if ((f.types & (Facet.INT | Facet.FRAC)) != 0) {
            add(options, numberExpr(f, name));
        }
        if ((f.types & Facet.BOOL) != 0) {
            for (boolean b : new boolean[] {true, false}) {
                JsonNode v = com.fasterxml.jackson.databind.node.BooleanNode.valueOf(b);
                if (f.excluded.stream().noneMatch(x -> JsonText.same(x, v))) {
                    options.add(text(Boolean.toString(b)));
                }
            }
        }
        if ((f.types & Facet.NULL) != 0
                && f.excluded.stream().noneMatch(JsonNode::isNull)) {
            options.add(text("null"));
        }
        return options.isEmpty() ? null : choice(options);
    }

    private static void add(List<Expr> options, Expr e) {
        if (e != null) {
            options.add(e);
        }
    }

    // ---- shared rules

    private String sharedRule(String name, java.util.function.Supplier<Expr> body) {
        if (shared.add(name)) {
            usedNames.add(name);
            rules.add(Rule.of(name, body.get()));
        }
        return name;
    }

    private String charRule() {
        return sharedRule("json-char", () -> choice(List.of(
                Expr.chars(CodePointSet.ALL.minus(SPECIAL).minus(SURROGATES)), Expr.ref(escapeRule()))));
    }

    private String escapeRule() {
        return sharedRule("json-escape", () -> seq(text("\\"), choice(List.of(
                text("\""), text("\\"), text("b"), text("f"), text("n"), text("r"), text("t"),
                seq(text("u00"), choice(List.of(
                        seq(text("0"), Expr.chars(CodePointSet.ofRanges('0', '7', 'b', 'b', 'e', 'f'))),
                        seq(text("1"), Expr.chars(CodePointSet.ofRanges('0', '9', 'a', 'f'))))))))));
    }

    private String stringRule() {
        return sharedRule("json-string", () -> seq(text("\""),
                Expr.repeat(Expr.ref(charRule()), 0, Expr.UNBOUNDED), text("\"")));
    }

    private Expr integerIr() {
        return choice(List.of(text("0"), seq(optional(text("-")), Expr.chars(DIGITS19),
                Expr.repeat(Expr.chars(DIGITS), 0, Expr.UNBOUNDED))));
    }

    private Expr fractionIr() {
        return seq(optional(text("-")), choice(List.of(text("0"), seq(Expr.chars(DIGITS19),
                Expr.repeat(Expr.chars(DIGITS), 0, Expr.UNBOUNDED)))), text("."),
                Expr.repeat(Expr.chars(DIGITS), 0, Expr.UNBOUNDED), Expr.chars(DIGITS19));
    }

    private String integerRule() {
        return sharedRule("json-integer", this::integerIr);
    }

    private String fractionRule() {
        return sharedRule("json-fraction", this::fractionIr);
    }

    /** Any JSON value (in canonical form) at a depth. */
    private String anyValue(int depth) {
        int d = pretty ? Math.min(depth, PRETTY_DEPTH_LIMIT + 1) : 0;
        String name = pretty ? "json-value-" + d : "json-value";
        if (shared.contains(name)) {
            return name;
        }
        shared.add(name);
        usedNames.add(name);
        int at = rules.size();
        rules.add(null);
        Expr body;
        if (pretty && d > PRETTY_DEPTH_LIMIT) {
            body = Expr.choice();
        } else {
            JsonText.Punct p = JsonText.punct(options.spacing(), d);
            Expr inner = Expr.ref(anyValue(d + 1));
            Expr member = seq(Expr.ref(stringRule()), text(p.colon()), inner);
            Expr obj = choice(List.of(text("{}"), seq(text("{" + p.open()), member,
                    Expr.repeat(seq(text(p.sep()), member), 0, Expr.UNBOUNDED), text(p.close() + "}"))));
            Expr arr = choice(List.of(text("[]"), seq(text("[" + p.open()), inner,
                    Expr.repeat(seq(text(p.sep()), inner), 0, Expr.UNBOUNDED), text(p.close() + "]"))));
            body = choice(List.of(obj, arr, Expr.ref(stringRule()), Expr.ref(integerRule()),
                    Expr.ref(fractionRule()), text("true"), text("false"), text("null")));
        }
        rules.set(at, Rule.of(name, body));
        return name;
    }

    // ---- strings

    /** Decoded IR to the IR of its canonical JSON encoding (code point by code point). */
    private Expr encode(Expr decoded) {
        return new ExprFold<Expr>() {
            @Override
            protected Expr leaf(Expr e) {
                return encodeLeaf(e);
            }

            @Override
            protected Expr seq(Expr.Seq s, List<Expr> items) {
                return new Expr.Seq(items, s.span());
            }

            @Override
            protected Expr choice(Expr.Choice c, List<Expr> options) {
                return new Expr.Choice(options, c.span());
            }

            @Override
            protected Expr repeat(Expr.Repeat r, Expr body) {
                return new Expr.Repeat(body, r.min(), r.max(), r.span());
            }
        }.run(decoded, null);
    }

    /**
     * {@code readable(encode(decoded))} in one walk, for the many rules of a large string language;
     * their rules then skip the final {@link #readable} pass.
     */
    private Expr encodeReadable(Expr decoded) {
        return new Readable(this::encodeLeaf, splits).run(decoded, null);
    }

    private Expr encodeLeaf(Expr e) {
        if (e instanceof Expr.Chars c) {
            return encodeSet(c.set());
        }
        if (e instanceof Expr.Text t) {
            String text = t.text();
            boolean same = true;
            for (int i = 0; i < text.length() && same; i++) {
                same = !JsonText.escaped(text.charAt(i)) && !Character.isSurrogate(text.charAt(i));
            }
            if (same) {
                return t; // nothing in it is escaped (the common case in a large string language)
            }
            StringBuilder sb = new StringBuilder();
            text.codePoints().forEach(cp -> sb.append(JsonText.encode(cp)));
            return new Expr.Text(sb.toString(), t.ignoreCase(), t.span());
        }
        return e;
    }

    /** Encoded character sets: right-linear rules repeat the same few sets many times. */
    private final Map<CodePointSet, Expr> encodedSets = new HashMap<>();

    private Expr encodeSet(CodePointSet set) {
        return encodedSets.computeIfAbsent(set, this::encodeNewSet);
    }

    private Expr encodeNewSet(CodePointSet set) {
        CodePointSet usable = set.minus(SURROGATES);
        if (usable.equals(NOT_SURROGATES)) {
            return Expr.ref(charRule());
        }
        CodePointSet plain = usable.minus(SPECIAL);
        CodePointSet special = usable.intersect(SPECIAL);
        List<Expr> options = new ArrayList<>();
        if (!plain.isEmpty()) {
            options.add(Expr.chars(plain));
        }
        if (special.equals(SPECIAL)) {
            options.add(Expr.ref(escapeRule()));
        } else {
            for (int i = 0; i < special.rangeCount(); i++) {
                for (int cp = special.lo(i); cp <= special.hi(i); cp++) {
                    options.add(text(JsonText.encode(cp)));
                }
            }
        }
        return options.size() == 1 ? options.get(0) : new Expr.Choice(options, dev.espalier.grammar.Span.NONE);
    }

    /** Rules for an automaton over decoded strings, encoded; returns the body expression (no quotes). */
    private Expr encodedRules(String base, Automaton a) {
        return encodedRules(base, a, false);
    }

    /** As {@link #encodedRules(String, Automaton)}; {@code minimal} when the automaton is known to be minimal. */
    private Expr encodedRules(String base, Automaton a, boolean minimal) {
        if (minimal && writeStateRules && a.isDeterministic()) {
            return encodedRules(base, UnitDfa.of(a));
        }
        String prefix = freshPrefix(base);
        RegularFragment frag = minimal ? RegularRules.ofMinimal(prefix, a) : RegularRules.of(prefix, a);
        for (Rule r : frag.rules()) {
            usedNames.add(r.key());
            rules.add(Rule.of(r.name(), encodeReadable(r.body())));
            readyRules.add(r.name());
        }
        return encode(frag.body());
    }

    /** As {@link #encodedRules(String, Automaton, boolean)} for a minimal automaton given as arrays. */
    private Expr encodedRules(String base, UnitDfa minimal) {
        return writtenRules(RegularRules.ofMinimal(freshPrefix(base), minimal, writer));
    }

    /** Adds the (already written) rules of a fragment; returns its body, encoded. */
    private Expr writtenRules(RegularFragment frag) {
        for (Rule r : frag.rules()) {
            usedNames.add(r.key());
            rules.add(r);
            readyRules.add(r.name());
        }
        return encode(frag.body());
    }

    /** Writes the rules of a string language: {@link #encodeReadable} acts leaf by leaf. */
    private final RegularRules.Writer writer = this::encodeReadable;

    /** A rule-name prefix that no rule name in use starts with. */
    private String freshPrefix(String base) {
        String p = base;
        for (int i = 2; ; i++) {
            String lower = p.toLowerCase(Locale.ROOT);
            if (usedNames.stream().noneMatch(n -> n.startsWith(lower))) {
                usedNames.add(lower);
                return p;
            }
            p = base + "-" + i;
        }
    }

    private Expr stringExpr(Facet f, String name) {
        for (String fm : f.formats) {
            java.util.OptionalInt most = Formats.uncountedLength(fm);
            if (most.isPresent() && (f.maxLength < 0 || f.maxLength > most.getAsInt())) {
                // counting the whole length in the automaton would make it huge; a maxLength bounds it exactly
                refuse(f.pointer, "format", "format " + fm + " allows at most " + most.getAsInt()
                        + " characters in all, which its grammar does not count: give maxLength (at most "
                        + most.getAsInt() + ") to enforce it" + (options.lenient() ? "; longer strings are accepted"
                        : ", or compile leniently to leave it unchecked"));
            }
        }
        Expr content;
        if (f.patterns.isEmpty() && f.formats.isEmpty() && f.notStrings.isEmpty()
                && f.excluded.stream().noneMatch(JsonNode::isTextual)) {
            if (f.minLength == 0 && f.maxLength < 0) {
                return Expr.ref(stringRule());
            }
            content = rep(Expr.ref(charRule()), f.minLength, f.maxLength < 0 ? Expr.UNBOUNDED : f.maxLength);
        } else if (f.patterns.isEmpty() && f.formats.size() == 1 && f.notStrings.isEmpty() && f.minLength == 0
                && f.maxLength < 0 && f.excluded.stream().noneMatch(JsonNode::isTextual)) {
            RegularFragment frag = Formats.content(freshPrefix(name + "-" + sanitise(f.formats.get(0))), f.formats.get(0))
                    .orElseThrow();
            for (Rule r : frag.rules()) {
                usedNames.add(r.key());
                rules.add(Rule.of(r.name(), encode(r.body())));
            }
            content = encode(frag.body());
        } else if (f.patterns.size() == 1 && f.formats.isEmpty() && f.notStrings.isEmpty() && f.minLength == 0
                && f.maxLength < 0 && f.excluded.stream().noneMatch(JsonNode::isTextual)) {
            content = encode(searchExpr(f.patterns.get(0).regex(), f.pointer));
        } else if (shaped(f) && writeStateRules) {
            UnitDfa u = stringUnits(f);
            if (u.isEmpty()) {
                return null;
            }
            content = encodedRules(name + "-text", u); // minimal, as StringLengths makes it
        } else {
            Automaton a = stringAutomaton(f);
            if (a.isEmpty()) {
                return null;
            }
            content = encodedRules(name + "-text", a, true); // stringAutomaton minimises
        }
        return seq(text("\""), content, text("\""));
    }

    // ---- numbers

    private final Map<String, Optional<Expr>> numberCache = new HashMap<>();

    private Expr numberExpr(Facet f, String name) {
        String signature = (f.types & (Facet.INT | Facet.FRAC)) + "|" + f.lower + "|" + f.upper + "|" + f.multipleOf
                + "|" + f.fractionDigits + "|" + f.steps + "|" + f.excluded.stream().filter(JsonNode::isNumber)
                .map(JsonText::number).toList();
        Optional<Expr> known = numberCache.get(signature);
        if (known != null) {
            return known.orElse(null);
        }
        Expr e = numberExprUncached(f, name);
        numberCache.put(signature, Optional.ofNullable(e));
        return e;
    }

    private Expr numberExprUncached(Facet f, String name) {
        try {
            return numbers(f, name);
        } catch (IllegalArgumentException e) {
            throw new SchemaException(f.pointer, f.multipleOf != null ? "multipleOf" : "minimum", e.getMessage());
        }
    }

    private Expr numbers(Facet f, String name) {
        boolean excludes = f.excluded.stream().anyMatch(JsonNode::isNumber);
        if (excludes || !f.steps.isEmpty()) {
            // exclusions: the automaton of the number texts minus the excluded texts
            Automaton a = BasicAutomata.makeEmpty();
            if ((f.types & Facet.INT) != 0) {
                a = a.union(NumberLanguages.integerAutomaton(f.lower, f.upper, f.multipleOf));
            }
            if ((f.types & Facet.FRAC) != 0) {
                a = a.union(fractionAutomaton(f));
            }
            for (BigDecimal st : f.steps) {
                a = a.intersection(multiples(st));
                a.minimize();
            }
            for (JsonNode x : f.excluded) {
                if (x.isNumber()) {
                    a = a.minus(BasicAutomata.makeString(JsonText.number(x)));
                }
            }
            a.minimize();
            return a.isEmpty() ? null : numberRules(name + "-number", a);
        }
        List<Expr> options = new ArrayList<>();
        if ((f.types & Facet.INT) != 0) {
            if (f.lower == null && f.upper == null && f.multipleOf == null) {
                options.add(Expr.ref(integerRule()));
            } else {
                Automaton a = NumberLanguages.integerAutomaton(f.lower, f.upper, f.multipleOf);
                if (!a.isEmpty()) {
                    options.add(numberRules(name + "-integer", a));
                }
            }
        }
        if ((f.types & Facet.FRAC) != 0) {
            if (f.lower == null && f.upper == null && f.fractionDigits < 0) {
                options.add(Expr.ref(fractionRule()));
            } else {
                Automaton a = fractionAutomaton(f);
                if (!a.isEmpty()) {
                    options.add(numberRules(name + "-fraction", a));
                }
            }
        }
        return options.isEmpty() ? null : choice(options);
    }

    /** Rules for a number language; {@code a} is minimal (every number automaton here is minimised). */
    private Expr numberRules(String base, Automaton a) {
        RegularFragment frag = RegularRules.ofMinimal(freshPrefix(base), a);
        for (Rule r : frag.rules()) {
            usedNames.add(r.key());
            rules.add(r);
        }
        return frag.body();
    }

    /**
     * Number texts (optional minus, digits, optional point and digits) whose value is a multiple of
     * {@code step = c / 10^s} (c a positive integer, s > 0): the value times 10^s must be an integer
     * divisible by c. With D the digits read (point skipped) and f the fraction digits, that is at
     * most s fraction digits and D * 10^(s-f) divisible by c; the states are (D mod c, f).
     */
    static Automaton multiples(BigDecimal step) {
        int c = step.unscaledValue().intValueExact();
        int s = step.scale();
        dk.brics.automaton.State[][] ints = new dk.brics.automaton.State[c][1];
        dk.brics.automaton.State[][] fracs = new dk.brics.automaton.State[c][s + 1];
        for (int r = 0; r < c; r++) {
            ints[r][0] = new dk.brics.automaton.State();
            for (int f = 1; f <= s; f++) {
                fracs[r][f] = new dk.brics.automaton.State();
            }
        }
        BigInteger cc = BigInteger.valueOf(c);
        for (int r = 0; r < c; r++) {
            ints[r][0].setAccept(BigInteger.valueOf(r).multiply(BigInteger.TEN.pow(s)).mod(cc).signum() == 0);
            for (int f = 1; f <= s; f++) {
                fracs[r][f].setAccept(BigInteger.valueOf(r).multiply(BigInteger.TEN.pow(s - f)).mod(cc).signum() == 0);
            }
            for (int d = 0; d <= 9; d++) {
                int next = (r * 10 + d) % c;
                ints[r][0].addTransition(new dk.brics.automaton.Transition((char) ('0' + d), ints[next][0]));
                for (int f = 1; f < s; f++) {
                    fracs[r][f].addTransition(new dk.brics.automaton.Transition((char) ('0' + d), fracs[next][f + 1]));
                }
            }
        }
        // the point: from an integer state to a state expecting the first fraction digit
        for (int r = 0; r < c; r++) {
            dk.brics.automaton.State point = new dk.brics.automaton.State();
            ints[r][0].addTransition(new dk.brics.automaton.Transition('.', point));
            for (int d = 0; d <= 9; d++) {
                point.addTransition(new dk.brics.automaton.Transition((char) ('0' + d), fracs[(r * 10 + d) % c][1]));
            }
        }
        dk.brics.automaton.State start = new dk.brics.automaton.State();
        dk.brics.automaton.State afterMinus = new dk.brics.automaton.State();
        start.addTransition(new dk.brics.automaton.Transition('-', afterMinus));
        for (int d = 0; d <= 9; d++) {
            start.addTransition(new dk.brics.automaton.Transition((char) ('0' + d), ints[d % c][0]));
            afterMinus.addTransition(new dk.brics.automaton.Transition((char) ('0' + d), ints[d % c][0]));
        }
        Automaton a = new Automaton();
        a.setInitialState(start);
        a.setDeterministic(true);
        a.minimize();
        return a;
    }

    private static final Map<Integer, Automaton> CANONICAL_FRACTIONS = new java.util.concurrent.ConcurrentHashMap<>();

    /** Canonical non-integers with at most {@code digits} fraction digits (-1: any number). */
    private static Automaton canonicalFractions(int digits) {
        return CANONICAL_FRACTIONS.computeIfAbsent(digits, d -> {
            Expr canonical = seq(optional(text("-")), choice(List.of(text("0"), seq(Expr.chars(DIGITS19),
                    Expr.repeat(Expr.chars(DIGITS), 0, Expr.UNBOUNDED)))), text("."),
                    Expr.repeat(Expr.chars(DIGITS), 0, d < 0 ? Expr.UNBOUNDED : d - 1), Expr.chars(DIGITS19));
            return CharAutomata.compile(canonical, null, STATE_LIMIT);
        }).clone();
    }

    /** Canonical non-integers within the facet's bounds and fraction digits. */
    private Automaton fractionAutomaton(Facet f) {
        if (f.fractionDigits == 0) {
            return BasicAutomata.makeEmpty();
        }
        Automaton a = canonicalFractions(f.fractionDigits);
        if (f.lower != null || f.upper != null) {
            a = a.intersection(NumberLanguages.decimalAutomaton(f.lower, f.upper));
            a.minimize();
        }
        return a;
    }

    // ---- arrays

    private Expr arrayExpr(Facet f, int depth, String name) {
        int k = f.prefix.size();
        int max = f.maxItems;
        if (f.items.isFalse() || dnf(f.items).isEmpty()) {
            max = Facet.minMax(max, k);
        }
        for (int i = 0; i < k; i++) {
            if (dnf(f.prefix.get(i)).isEmpty()) {
                max = Facet.minMax(max, i);
                break;
            }
        }
        int min = f.minItems;
        if (max >= 0 && min > max) {
            return null;
        }
        if (max == 0) {
            return text("[]");
        }
        JsonText.Punct p = JsonText.punct(options.spacing(), depth);
        if (f.contains != null) {
            Expr e = containing(f, min, max, depth, p, name);
            if (e != null || !f.unique) {
                return e;
            }
        }
        if (f.unique) {
            List<String> values = f.prefix.isEmpty() ? finiteTexts(f.items, depth + 1) : null;
            if (values == null || values.size() > MAX_UNIQUE_VALUES) {
                refuse(f.pointer, "uniqueItems", "distinct items can be enforced only for items with at most "
                        + MAX_UNIQUE_VALUES + " possible values" + (options.lenient() ? " (not enforced)" : ""));
            } else {
                return distinctItems(values, min, max, p, name);
            }
        }
        // rest(i): the items from index i on, i items being there already
        Expr rest;
        {
            int lo = Math.max(0, min - Math.max(k, 1));
            int startTail = Math.max(k, 1);
            int hi = max < 0 ? Expr.UNBOUNDED : max - startTail;
            if (hi == 0 || (max >= 0 && startTail >= max)) {
                rest = text("");
            } else {
                Expr item = Expr.ref(ruleFor(f.items, depth + 1));
                rest = rep(seq(text(p.sep()), item), lo, hi);
            }
        }
        for (int i = k - 1; i >= 1; i--) {
            if (max >= 0 && i >= max) {
                rest = text("");
                continue;
            }
            Expr item = seq(text(p.sep()), Expr.ref(ruleFor(f.prefix.get(i), depth + 1)), rest);
            rest = i < min ? item : optional(item);
        }
        Expr first = Expr.ref(ruleFor(f.itemAt(0), depth + 1));
        Expr nonEmpty = seq(text("[" + p.open()), first, rest, text(p.close() + "]"));
        return min == 0 ? choice(List.of(text("[]"), nonEmpty)) : nonEmpty;
    }

    /**
     * Arrays with {@code contains}: items that match the contained schema (Y) and items that do not
     * (N) are told apart, so the count of matches is tracked exactly; states are (items so far,
     * matches so far), each capped where it stops mattering, the saturated ones written as
     * repetitions. Null (after a refusal) when the contained schema has no exact complement, the
     * array has prefix items or distinct items.
     */
    private Expr containing(Facet f, int min, int max, int depth, JsonText.Punct p, String name) {
        Facet.Sub c = Facet.Sub.of(f.contains);
        if (!f.prefix.isEmpty() || f.unique || complementOrNull(dnf(c)) == null) {
            refuse(f.pointer, "contains", "contains can be enforced only with no prefixItems or uniqueItems, and a "
                    + "contained schema with an exact complement" + (options.lenient() ? " (not enforced)" : ""));
            return null;
        }
        Facet.Sub ySub = f.items.and(c);
        Facet.Sub nSub = f.items.and(new Facet.Sub(List.of("!" + f.contains)));
        boolean yOk = !dnf(ySub).isEmpty();
        boolean nOk = !dnf(nSub).isEmpty();
        Expr y = yOk ? Expr.ref(ruleFor(ySub, depth + 1)) : null;
        Expr no = nOk ? Expr.ref(ruleFor(nSub, depth + 1)) : null;
        int lo = f.minContains;
        int hi = f.maxContains;
        int nCap = max >= 0 ? max : Math.max(min, 1);
        int cCap = hi >= 0 ? hi : Math.max(lo, 1);
        if ((long) (nCap + 1) * (cCap + 1) > MAX_STATES) {
            throw new SchemaException(f.pointer, "contains", "item and match counts need more than " + MAX_STATES
                    + " states");
        }
        Map<Long, Expr> memo = new HashMap<>();
        for (int n = nCap; n >= 0; n--) {
            for (int k = cCap; k >= 0; k--) {
                boolean nSat = max < 0 && n == nCap;
                if (k > n && !nSat) {
                    continue; // more matches than items: unreachable
                }
                boolean kSat = hi < 0 && k == cCap;
                Expr open = text(n == 0 ? "[" + p.open() : p.sep());
                Expr close = text(n == 0 ? "[]" : p.close() + "]");
                Expr e;
                if (nSat && kSat) {
                    // any further items
                    Expr item = y == null ? no : no == null ? y : choice(List.of(y, no));
                    e = seq(Expr.repeat(seq(text(p.sep()), item), 0, Expr.UNBOUNDED), close);
                } else if (nSat) {
                    // further non-matching items, then either the end or one more match
                    List<Expr> opts = new ArrayList<>();
                    if (k >= lo) {
                        opts.add(close);
                    }
                    Expr after = memo.get(key(n, k + 1));
                    if (y != null && (hi < 0 || k < hi) && after != null) {
                        opts.add(seq(text(p.sep()), y, after));
                    }
                    Expr rest = opts.isEmpty() ? null : choice(opts);
                    e = rest == null ? null : no == null ? rest
                            : seq(Expr.repeat(seq(text(p.sep()), no), 0, Expr.UNBOUNDED), rest);
                } else if (kSat) {
                    // any items; only their number counts
                    Expr item = y == null ? no : no == null ? y : choice(List.of(y, no));
                    int need = Math.max(0, min - n);
                    int room = max < 0 ? Expr.UNBOUNDED : max - n;
                    if (n == 0) {
                        e = seq(open, item, rep(seq(text(p.sep()), item), Math.max(0, need - 1),
                                room == Expr.UNBOUNDED ? Expr.UNBOUNDED : room - 1), text(p.close() + "]"));
                        if (need == 0) {
                            e = choice(List.of(close, e));
                        }
                    } else {
                        e = seq(rep(seq(text(p.sep()), item), need, room), close);
                    }
                } else {
                    List<Expr> opts = new ArrayList<>();
                    if (n >= min && k >= lo) {
                        opts.add(close);
                    }
                    if (max < 0 || n < max) {
                        int n1 = Math.min(n + 1, nCap);
                        Expr afterY = memo.get(key(n1, Math.min(k + 1, cCap)));
                        if (y != null && (hi < 0 || k < hi) && afterY != null) {
                            opts.add(seq(open, y, afterY));
                        }
                        Expr afterN = memo.get(key(n1, k));
                        if (no != null && afterN != null) {
                            opts.add(seq(open, no, afterN));
                        }
                    }
                    e = opts.isEmpty() ? null : choice(opts);
                }
                if (e != null && size(e) >= 12 && n > 0) {
                    String helper = fresh(name + "-items");
                    rules.add(Rule.of(helper, e));
                    e = Expr.ref(helper);
                }
                memo.put(key(n, k), e);
            }
        }
        return memo.get(key(0, 0));
    }

    private static long key(int a, int b) {
        return ((long) a << 32) | b;
    }

    /** Arrays of distinct values: a state per set of values used so far. */
    private Expr distinctItems(List<String> values, int min, int max, JsonText.Punct p, String name) {
        int k = values.size();
        Map<Integer, Expr> memo = new HashMap<>();
        for (int s = (1 << k) - 1; s >= 0; s--) {
            // supersets have larger numbers: processed first
            int used = Integer.bitCount(s);
            List<Expr> opts = new ArrayList<>();
            if (used >= min) {
                opts.add(text(used == 0 ? "[]" : p.close() + "]"));
            }
            if (max < 0 || used < max) {
                for (int j = 0; j < k; j++) {
                    Expr after = memo.get(s | (1 << j));
                    if ((s & (1 << j)) == 0 && after != null) {
                        opts.add(seq(text(used == 0 ? "[" + p.open() : p.sep()), text(values.get(j)), after));
                    }
                }
            }
            Expr e = opts.isEmpty() ? null : choice(opts);
            if (e != null && s != 0 && size(e) >= 12) {
                String helper = fresh(name + "-distinct");
                rules.add(Rule.of(helper, e));
                e = Expr.ref(helper);
            }
            memo.put(s, e);
        }
        return memo.get(0);
    }

    /** The texts of a location's values at a depth when it allows finitely many; null otherwise. */
    private List<String> finiteTexts(Facet.Sub s, int depth) {
        Set<String> out = new LinkedHashSet<>();
        for (Facet f : dnf(s)) {
            if (f.values != null) {
                Facet rest = f.copy();
                rest.values = null;
                for (JsonNode v : f.values) {
                    if (matchesFacet(v, rest, 0)) {
                        String t = JsonText.value(v, options.spacing(), depth);
                        if (t != null) {
                            out.add(t);
                        }
                    }
                }
            } else if ((f.types & ~(Facet.NULL | Facet.BOOL)) == 0) {
                if ((f.types & Facet.BOOL) != 0) {
                    for (String b : List.of("true", "false")) {
                        if (f.excluded.stream().noneMatch(x -> x.isBoolean() && Boolean.toString(x.booleanValue()).equals(b))) {
                            out.add(b);
                        }
                    }
                }
                if ((f.types & Facet.NULL) != 0 && f.excluded.stream().noneMatch(JsonNode::isNull)) {
                    out.add("null");
                }
            } else {
                return null;
            }
            if (out.size() > MAX_UNIQUE_VALUES) {
                return null;
            }
        }
        return new ArrayList<>(out);
    }

    // ---- objects

    /** Names of the members laid out in schema order: properties, then required and dependency names not among them. */
    List<String> memberNames(Facet f) {
        LinkedHashSet<String> names = new LinkedHashSet<>(f.properties.keySet());
        names.addAll(f.required);
        f.dependentRequired.forEach((k, v) -> {
            names.add(k);
            names.addAll(v);
        });
        return new ArrayList<>(names);
    }

    /** One member's expression: quoted name, colon, value rule. */
    private Expr member(String quotedKey, Facet.Sub value, int depth, JsonText.Punct p) {
        return seq(text(quotedKey + p.colon()), Expr.ref(ruleFor(value, depth + 1)));
    }

    private Expr objectOf(Facet f, int depth, String name) {
        JsonText.Punct p = JsonText.punct(options.spacing(), depth);
        List<String> names = memberNames(f);
        List<String> kept = new ArrayList<>();
        List<Expr> members = new ArrayList<>();
        List<Boolean> req = new ArrayList<>();
        for (String n : names) {
            Facet.Sub s = memberSub(f, n);
            String quoted = JsonText.string(n);
            boolean possible = quoted != null && !dnf(s).isEmpty();
            if (!possible) {
                if (f.required.contains(n)) {
                    return null;
                }
                // a dependency target that cannot be present forbids its sources
                continue;
            }
            kept.add(n);
            members.add(member(quoted, s, depth, p));
            req.add(f.required.contains(n));
        }
        // forbidden names: sources whose targets are impossible
        Set<String> forbidden = new HashSet<>();
        for (Map.Entry<String, Set<String>> d : f.dependentRequired.entrySet()) {
            for (String t : d.getValue()) {
                if (!kept.contains(t)) {
                    forbidden.add(d.getKey());
                }
            }
        }
        for (String fb : forbidden) {
            int i = kept.indexOf(fb);
            if (i >= 0) {
                if (req.get(i)) {
                    return null;
                }
                kept.remove(i);
                members.remove(i);
                req.remove(i);
            }
        }
        Expr tail = tailMember(f, kept, depth, name, p);
        long requiredCount = req.stream().filter(b -> b).count();
        if (tail != null && f.minProperties - requiredCount >= 2) {
            // two other members could share a name, which a grammar cannot rule out: the count would be wrong
            refuse(f.pointer, "minProperties", "minProperties " + f.minProperties + " may have to be reached with "
                    + "several pattern or additional members, whose names a grammar cannot keep distinct"
                    + (options.lenient() ? " (repeated names are not excluded)" : ""));
        }
        ObjectMachine m = new ObjectMachine(f, kept, members, req, tail, p, name);
        if (options.order() == SchemaOptions.Order.ANY && kept.size() > 1) {
            if (kept.size() > Math.min(options.anyOrderLimit(), MAX_ANY_ORDER)) {
                refuse(f.pointer, "properties", "the object has " + kept.size() + " named properties, more than the "
                        + "limit of " + Math.min(options.anyOrderLimit(), MAX_ANY_ORDER) + " for any order"
                        + (options.lenient() ? "; schema order is used" : ""));
                return m.schemaOrder();
            }
            return m.anyOrder();
        }
        return m.schemaOrder();
    }

    /** The members beyond the named ones (pattern and additional properties), or null when there are none. */
    private Expr tailMember(Facet f, List<String> named, int depth, String name, JsonText.Punct p) {
        List<String> patterns = new ArrayList<>(f.patternProperties.keySet());
        boolean additional = !dnf(f.additional).isEmpty();
        if (patterns.isEmpty() && !additional) {
            return null;
        }
        Automaton names = BasicAutomata.makeEmpty();
        for (String n : memberNames(f)) {
            names = names.union(BasicAutomata.makeString(n));
        }
        Automaton keyFilter = BasicAutomata.makeAnyString().minus(names);
        if (!f.propertyNames.isTrue()) {
            keyFilter = keyFilter.intersection(propertyNameAutomaton(f.propertyNames));
        }
        keyFilter.minimize();
        if (patterns.size() > MAX_OVERLAPPING_PATTERNS) {
            for (int i = 0; i < patterns.size(); i++) {
                for (int j = i + 1; j < patterns.size(); j++) {
                    if (!searchAutomaton(patterns.get(i)).intersection(searchAutomaton(patterns.get(j))).isEmpty()) {
                        throw new SchemaException(f.pointer, "patternProperties", "more than "
                                + MAX_OVERLAPPING_PATTERNS + " patterns, some overlapping");
                    }
                }
            }
        }
        List<Expr> options = new ArrayList<>();
        // one region per set of matching patterns (only singletons when there are many disjoint ones)
        int regions = patterns.size() > MAX_OVERLAPPING_PATTERNS ? patterns.size() : (1 << patterns.size()) - 1;
        for (int r = 0; r < regions; r++) {
            int mask = patterns.size() > MAX_OVERLAPPING_PATTERNS ? 1 << r : r + 1;
            Automaton keys = keyFilter.clone();
            Facet.Sub value = Facet.Sub.TRUE;
            for (int i = 0; i < patterns.size(); i++) {
                Automaton pa = searchAutomaton(patterns.get(i));
                if ((mask & (1 << i)) != 0) {
                    keys = keys.intersection(pa);
                    value = value.and(f.patternProperties.get(patterns.get(i)));
                } else if (patterns.size() <= MAX_OVERLAPPING_PATTERNS) {
                    keys = keys.minus(pa);
                }
            }
            keys.minimize();
            if (keys.isEmpty() || dnf(value).isEmpty()) {
                continue;
            }
            options.add(seq(text("\""), keyRule(name + "-pattern-name", keys), text("\"" + p.colon()),
                    Expr.ref(ruleFor(value, depth + 1))));
        }
        if (additional) {
            Automaton keys = keyFilter.clone();
            for (String pat : patterns) {
                keys = keys.minus(searchAutomaton(pat));
            }
            keys.minimize();
            if (!keys.isEmpty()) {
                Expr key = BasicAutomata.makeAnyString().equals(keys) ? Expr.ref(stringRule())
                        : seq(text("\""), keyRule(name + "-other-name", keys), text("\""));
                options.add(seq(key, text(p.colon()), Expr.ref(ruleFor(f.additional, depth + 1))));
            }
        }
        if (options.isEmpty()) {
            return null;
        }
        String member = fresh(name + "-other");
        rules.add(Rule.of(member, choice(options)));
        return Expr.ref(member);
    }

    private final Map<String, Expr> keyRules = new HashMap<>();

    /** A rule for the encoded names an automaton of decoded names allows (one rule per language). */
    private Expr keyRule(String base, Automaton keys) {
        String signature = keys.toString();
        Expr known = keyRules.get(signature);
        if (known != null) {
            return known;
        }
        String rule = fresh(base);
        Expr body = encodedRules(rule, keys);
        rules.add(Rule.of(rule, body));
        keyRules.put(signature, Expr.ref(rule));
        return Expr.ref(rule);
    }

    /** The decoded strings a propertyNames schema allows. */
    private Automaton propertyNameAutomaton(Facet.Sub s) {
        Automaton a = BasicAutomata.makeEmpty();
        for (Facet f : dnf(s)) {
            if (f.values != null) {
                for (JsonNode v : f.values) {
                    if (v.isTextual() && matchesFacet(v, f, 0)) {
                        a = a.union(BasicAutomata.makeString(v.textValue()));
                    }
                }
            } else if ((f.types & Facet.STR) != 0) {
                a = a.union(stringAutomaton(f));
            }
        }
        a.minimize();
        return a;
    }

    /** The members of one object as a state machine over (position, count, dependency bits). */
    private final class ObjectMachine {
        final Facet f;
        final List<String> names;
        final List<Expr> members;
        final List<Boolean> required;
        final Expr tail;
        final JsonText.Punct p;
        final String name;
        final int cap;
        final Map<String, Integer> depIndex = new HashMap<>();
        final List<int[]> deps = new ArrayList<>(); // {source index, target index} in names
        final Map<String, Expr> states = new LinkedHashMap<>();
        final Map<String, Integer> refs = new HashMap<>();

        ObjectMachine(Facet f, List<String> names, List<Expr> members, List<Boolean> required, Expr tail,
                JsonText.Punct p, String name) {
            this.f = f;
            this.names = names;
            this.members = members;
            this.required = required;
            this.tail = tail;
            this.p = p;
            this.name = name;
            this.cap = f.maxProperties >= 0 ? f.maxProperties + 1 : Math.max(1, f.minProperties);
            for (Map.Entry<String, Set<String>> d : f.dependentRequired.entrySet()) {
                int a = names.indexOf(d.getKey());
                if (a < 0) {
                    continue;
                }
                for (String t : d.getValue()) {
                    int b = names.indexOf(t);
                    if (b >= 0 && b != a) {
                        deps.add(new int[] {a, b});
                    }
                }
            }
            if (deps.size() > MAX_DEPENDENT * 2) {
                throw new SchemaException(f.pointer, "dependentRequired", "too many dependencies to enforce");
            }
            long involved = 0;
            for (int[] d : deps) {
                involved |= (1L << d[0]) | (1L << d[1]);
            }
            if ((long) (names.size() + 1) * (cap + 1) * (1L << Long.bitCount(involved)) > MAX_STATES) {
                throw new SchemaException(f.pointer, f.maxProperties >= 0 ? "maxProperties" : "properties",
                        "the members need more than " + MAX_STATES + " states to count and order");
            }
        }

        private Expr open(int count) {
            return text(count == 0 ? "{" + p.open() : p.sep());
        }

        /** The end: tail members, then the closing brace. */
        private Expr end(int count) {
            int lo = Math.max(0, f.minProperties - count);
            int hi = f.maxProperties < 0 ? Expr.UNBOUNDED : f.maxProperties - count;
            if (hi != Expr.UNBOUNDED && hi < 0) {
                return null;
            }
            Expr close = text(p.close() + "}");
            if (tail == null || hi == 0) {
                if (lo > 0) {
                    return null;
                }
                return count == 0 ? text("{}") : close;
            }
            if (count > 0) {
                return seq(rep(seq(text(p.sep()), tail), lo, hi), close);
            }
            Expr some = seq(text("{" + p.open()), tail, rep(seq(text(p.sep()), tail), Math.max(0, lo - 1),
                    hi == Expr.UNBOUNDED ? Expr.UNBOUNDED : hi - 1), close);
            return lo == 0 ? choice(List.of(text("{}"), some)) : some;
        }

        private boolean depsAllowPresent(int j, long mask) {
            for (int[] d : deps) {
                if (d[0] == j && d[1] < j && (mask & (1L << d[1])) == 0) {
                    return false;
                }
            }
            return true;
        }

        private boolean depsAllowAbsent(int j, long mask) {
            for (int[] d : deps) {
                if (d[1] == j && d[0] < j && (mask & (1L << d[0])) != 0) {
                    return false;
                }
            }
            return true;
        }

        private long relevant(int j) {
            for (int[] d : deps) {
                if (d[0] == j || d[1] == j) {
                    return 1L << j;
                }
            }
            return 0;
        }

        Expr schemaOrder() {
            // states (j, count, mask) built from the end; memoised expressions with rule refs for shared states
            Map<String, Expr> memo = new HashMap<>();
            Deque<long[]> work = new ArrayDeque<>();
            work.push(new long[] {0, 0, 0});
            // explicit post-order evaluation
            while (!work.isEmpty()) {
                long[] s = work.peek();
                String k = s[0] + "," + s[1] + "," + s[2];
                if (memo.containsKey(k)) {
                    work.pop();
                    continue;
                }
                int j = (int) s[0];
                int c = (int) s[1];
                long mask = s[2];
                if (j == names.size()) {
                    memo.put(k, end(c));
                    work.pop();
                    continue;
                }
                long[] present = next(j, c, mask, true);
                long[] absent = next(j, c, mask, false);
                boolean missing = false;
                for (long[] t : new long[][] {present, absent}) {
                    if (t != null && !memo.containsKey(t[0] + "," + t[1] + "," + t[2])) {
                        work.push(t);
                        missing = true;
                    }
                }
                if (missing) {
                    continue;
                }
                work.pop();
                Expr pe = present == null ? null : memo.get(present[0] + "," + present[1] + "," + present[2]);
                Expr ae = absent == null ? null : memo.get(absent[0] + "," + absent[1] + "," + absent[2]);
                Expr e;
                if (pe != null && ae != null && Objects.equals(key(present), key(absent)) && c > 0) {
                    e = seq(optional(seq(open(c), members.get(j))), shareable(pe));
                } else {
                    List<Expr> opts = new ArrayList<>();
                    if (pe != null) {
                        opts.add(seq(open(c), members.get(j), shareable(pe)));
                    }
                    if (ae != null) {
                        opts.add(shareable(ae));
                    }
                    e = opts.isEmpty() ? null : choice(opts);
                }
                memo.put(k, e);
            }
            return memo.get("0,0,0");
        }

        private String key(long[] s) {
            return s[0] + "," + s[1] + "," + s[2];
        }

        private final IdentityHashMap<Expr, Expr> helpers = new IdentityHashMap<>();

        /** Large shared continuations become helper rules so the text stays linear in size. */
        private Expr shareable(Expr e) {
            if (e instanceof Expr.Text || e instanceof Expr.Ref || size(e) < 12) {
                return e;
            }
            return helpers.computeIfAbsent(e, x -> {
                String helper = fresh(name + "-members");
                rules.add(Rule.of(helper, x));
                return Expr.ref(helper);
            });
        }

        private long[] next(int j, int c, long mask, boolean present) {
            if (present) {
                if (f.maxProperties >= 0 && c + 1 > f.maxProperties) {
                    return null;
                }
                if (!depsAllowPresent(j, mask)) {
                    return null;
                }
                return new long[] {j + 1, Math.min(c + 1, cap), mask | relevant(j)};
            }
            if (required.get(j) || !depsAllowAbsent(j, mask)) {
                return null;
            }
            return new long[] {j + 1, c, mask};
        }

        Expr anyOrder() {
            int n = names.size();
            Map<Long, Expr> memo = new HashMap<>();
            // subsets in decreasing size order: a state's successors are its supersets
            List<Long> order = new ArrayList<>();
            for (long s = 0; s < (1L << n); s++) {
                order.add(s);
            }
            order.sort((x, y) -> Long.bitCount(y) - Long.bitCount(x));
            for (long s : order) {
                int c = Long.bitCount(s);
                List<Expr> opts = new ArrayList<>();
                boolean canStop = true;
                for (int j = 0; j < n; j++) {
                    if ((s & (1L << j)) == 0 && required.get(j)) {
                        canStop = false;
                    }
                }
                for (int[] d : deps) {
                    if ((s & (1L << d[0])) != 0 && (s & (1L << d[1])) == 0) {
                        canStop = false;
                    }
                }
                if (canStop) {
                    Expr e = end(c);
                    if (e != null) {
                        opts.add(e);
                    }
                }
                if (f.maxProperties < 0 || c < f.maxProperties) {
                    for (int j = 0; j < n; j++) {
                        if ((s & (1L << j)) == 0) {
                            Expr after = memo.get(s | (1L << j));
                            if (after != null) {
                                opts.add(seq(open(c), members.get(j), after));
                            }
                        }
                    }
                }
                Expr e = opts.isEmpty() ? null : choice(opts);
                if (e != null && s != 0 && size(e) >= 12) {
                    String helper = fresh(name + "-members");
                    rules.add(Rule.of(helper, e));
                    e = Expr.ref(helper);
                }
                memo.put(s, e);
            }
            return memo.get(0L);
        }
    }

    private static int size(Expr e) {
        int n = 0;
        Deque<Expr> st = new ArrayDeque<>();
        st.push(e);
        while (!st.isEmpty() && n < 100) {
            Expr x = st.pop();
            n++;
            ExprFold.children(x).forEach(st::push);
        }
        return n;
    }

    // ================================================================== rendering

    private synchronized Optional<String> renderTop(JsonNode instance) {
        try {
            return Optional.ofNullable(render(instance, Facet.Sub.of(""), 0));
        } catch (RuntimeException e) {
            return Optional.empty();
        }
    }

    private String render(JsonNode v, Facet.Sub s, int depth) {
        if (depth > JsonText.MAX_DEPTH || (pretty && depth > PRETTY_DEPTH_LIMIT)) {
            return null;
        }
        List<Facet> facets = dnf(s);
        Facet chosen = null;
        for (Facet f : facets) {
            if (matchesFacet(v, f, depth)) {
                chosen = f;
                break;
            }
        }
        if (chosen == null) {
            for (Facet f : facets) {
                if ((f.types & typeOf(v)) != 0) {
                    chosen = f;
                    break;
                }
            }
        }
        if (chosen == null) {
            return JsonText.value(v, options.spacing(), depth);
        }
        if (chosen.values != null) {
            for (JsonNode x : chosen.values) {
                if (JsonText.same(x, v)) {
                    return JsonText.value(x, options.spacing(), depth);
                }
            }
            return JsonText.value(v, options.spacing(), depth);
        }
        if (!v.isContainerNode()) {
            return JsonText.scalar(v);
        }
        if (v.isEmpty()) {
            return v.isObject() ? "{}" : "[]";
        }
        JsonText.Punct p = JsonText.punct(options.spacing(), depth);
        StringBuilder sb = new StringBuilder();
        if (v.isArray()) {
            sb.append('[').append(p.open());
            for (int i = 0; i < v.size(); i++) {
                Facet.Sub itemSub = chosen.itemAt(i);
                if (chosen.contains != null && chosen.prefix.isEmpty() && !chosen.unique) {
                    itemSub = matches(v.get(i), Facet.Sub.of(chosen.contains), depth + 1)
                            ? itemSub.and(Facet.Sub.of(chosen.contains))
                            : itemSub.and(new Facet.Sub(List.of("!" + chosen.contains)));
                }
                String item = render(v.get(i), itemSub, depth + 1);
                if (item == null) {
                    return null;
                }
                sb.append(i == 0 ? "" : p.sep()).append(item);
            }
            return sb.append(p.close()).append(']').toString();
        }
        List<String> order = new ArrayList<>();
        List<String> named = memberNames(chosen);
        if (options.order() == SchemaOptions.Order.SCHEMA
                || named.size() > Math.min(options.anyOrderLimit(), MAX_ANY_ORDER)) {
            for (String n : named) {
                if (v.has(n)) {
                    order.add(n);
                }
            }
        } else {
            v.fieldNames().forEachRemaining(n -> {
                if (named.contains(n)) {
                    order.add(n);
                }
            });
        }
        v.fieldNames().forEachRemaining(n -> {
            if (!named.contains(n)) {
                order.add(n);
            }
        });
        sb.append('{').append(p.open());
        boolean first = true;
        for (String n : order) {
            String key = JsonText.string(n);
            String val = render(v.get(n), memberSub(chosen, n), depth + 1);
            if (key == null || val == null) {
                return null;
            }
            sb.append(first ? "" : p.sep()).append(key).append(p.colon()).append(val);
            first = false;
        }
        return sb.append(p.close()).append('}').toString();
    }

}
