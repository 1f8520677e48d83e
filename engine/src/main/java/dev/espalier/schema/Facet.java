package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.math.BigDecimal;
import java.math.BigInteger;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

/**
 * One conjunction of constraints on an instance: the normal form of a schema is a union of facets.
 * Keywords for one JSON type constrain only instances of that type. Values are copied, never
 * changed after construction is over.
 */
final class Facet {

    static final int NULL = 1;
    static final int BOOL = 2;
    static final int INT = 4;
    /** Numbers that are not integers. */
    static final int FRAC = 8;
    static final int STR = 16;
    static final int ARR = 32;
    static final int OBJ = 64;
    static final int ALL = 127;

    /** A set of schema locations, all of which apply (their conjunction); no location means any value. */
    record Sub(List<String> parts) {
        static final String FALSE = "false";
        static final Sub TRUE = new Sub(List.of());
        static final Sub NONE = new Sub(List.of(FALSE));

        Sub {
            parts = List.copyOf(new TreeSet<>(parts));
        }

        static Sub of(String pointer) {
            return new Sub(List.of(pointer));
        }

        /** The complement of a location. */
        static Sub not(String pointer) {
            return new Sub(List.of("!" + pointer));
        }

        Sub and(Sub other) {
            if (other.parts.isEmpty()) {
                return this;
            }
            List<String> all = new ArrayList<>(parts);
            all.addAll(other.parts);
            return new Sub(all);
        }

        boolean isTrue() {
            return parts.isEmpty();
        }

        boolean isFalse() {
            return parts.contains(FALSE);
        }

        String key() {
            return parts.isEmpty() ? "*" : "#" + String.join("&#", parts);
        }
    }

    /** A {@code pattern} and where it was written. */
    record Pattern(String regex, String pointer) {
    }

    String pointer;
    int types = ALL;
    /** Finite set of allowed values ({@code enum}, {@code const}); null when not restricted. */
    List<JsonNode> values;
    /** Scalar values excluded (from {@code not}). */
    List<JsonNode> excluded = new ArrayList<>();

    int minLength;
    int maxLength = -1;
    List<Pattern> patterns = new ArrayList<>();
    /** Formats (known ones; unknown formats are annotations). */
    List<String> formats = new ArrayList<>();
    /** String facets whose strings are excluded (from {@code not}). */
    List<Facet> notStrings = new ArrayList<>();

    Bound lower;
    Bound upper;
    BigInteger multipleOf;
    /** Most fraction digits ({@code multipleOf} a power of ten below one); -1 for no limit. */
    int fractionDigits = -1;
    /** Other non-integer {@code multipleOf} steps. */
    List<BigDecimal> steps = new ArrayList<>();

    List<Sub> prefix = new ArrayList<>();
    Sub items = Sub.TRUE;
    int minItems;
    int maxItems = -1;
    boolean unique;
    /** The {@code contains} location, or null. */
    String contains;
    int minContains = 1;
    int maxContains = -1;

    Map<String, Sub> properties = new LinkedHashMap<>();
    Set<String> required = new LinkedHashSet<>();
    Map<String, Sub> patternProperties = new LinkedHashMap<>();
    Sub additional = Sub.TRUE;
    Sub propertyNames = Sub.TRUE;
    /** Whether some merged part has {@code additionalProperties}, so every member is evaluated. */
    boolean additionalSet;
    /** Whether some merged part has an {@code items} schema, so every item is evaluated. */
    boolean itemsSet;
    int minProperties;
    int maxProperties = -1;
    Map<String, Set<String>> dependentRequired = new LinkedHashMap<>();

    Facet(String pointer) {
        this.pointer = pointer;
    }

    static Facet any(String pointer) {
        return new Facet(pointer);
    }

    static Facet ofTypes(String pointer, int types) {
        Facet f = new Facet(pointer);
        f.types = types;
        return f;
    }

    Facet copy() {
        Facet f = new Facet(pointer);
        f.types = types;
        f.values = values == null ? null : new ArrayList<>(values);
        f.excluded = new ArrayList<>(excluded);
        f.minLength = minLength;
        f.maxLength = maxLength;
        f.patterns = new ArrayList<>(patterns);
        f.formats = new ArrayList<>(formats);
        f.notStrings = new ArrayList<>(notStrings);
        f.lower = lower;
        f.upper = upper;
        f.multipleOf = multipleOf;
        f.fractionDigits = fractionDigits;
        f.steps = new ArrayList<>(steps);
        f.prefix = new ArrayList<>(prefix);
        f.items = items;
        f.minItems = minItems;
        f.maxItems = maxItems;
        f.unique = unique;
        f.contains = contains;
        f.minContains = minContains;
        f.maxContains = maxContains;
        f.properties = new LinkedHashMap<>(properties);
        f.required = new LinkedHashSet<>(required);
        f.patternProperties = new LinkedHashMap<>(patternProperties);
        f.additional = additional;
        f.propertyNames = propertyNames;
        f.additionalSet = additionalSet;
        f.itemsSet = itemsSet;
        f.minProperties = minProperties;
        f.maxProperties = maxProperties;
        f.dependentRequired = new LinkedHashMap<>();
        dependentRequired.forEach((k, v) -> f.dependentRequired.put(k, new LinkedHashSet<>(v)));
        return f;
    }

    /** Whether nothing but the types is constrained. */
    boolean typesOnly() {
        return values == null && excluded.isEmpty() && noStringRules() && noNumberRules() && noArrayRules()
                && noObjectRules();
    }

    boolean noStringRules() {
        return minLength == 0 && maxLength < 0 && patterns.isEmpty() && formats.isEmpty() && notStrings.isEmpty();
    }

    boolean noNumberRules() {
        return lower == null && upper == null && multipleOf == null && fractionDigits < 0 && steps.isEmpty();
    }

    boolean noArrayRules() {
        return prefix.isEmpty() && items.isTrue() && minItems == 0 && maxItems < 0 && !unique && contains == null;
    }

    boolean noObjectRules() {
        return properties.isEmpty() && required.isEmpty() && patternProperties.isEmpty() && additional.isTrue()
                && propertyNames.isTrue() && minProperties == 0 && maxProperties < 0 && dependentRequired.isEmpty();
    }

    /** The item schema at index {@code i}. */
    Sub itemAt(int i) {
        return i < prefix.size() ? prefix.get(i) : items;
    }

    static Bound tighterLower(Bound a, Bound b) {
        if (a == null) {
            return b;
        }
        if (b == null) {
            return a;
        }
        int c = a.value().compareTo(b.value());
        return c > 0 || (c == 0 && a.exclusive()) ? a : b;
    }

    static Bound tighterUpper(Bound a, Bound b) {
        if (a == null) {
            return b;
        }
        if (b == null) {
            return a;
        }
        int c = a.value().compareTo(b.value());
        return c < 0 || (c == 0 && a.exclusive()) ? a : b;
    }

    static int minMax(int a, int b) {
        return a < 0 ? b : b < 0 ? a : Math.min(a, b);
    }

    /** Whether the numeric bounds leave no value. */
    boolean emptyInterval() {
        if (lower == null || upper == null) {
            return false;
        }
        int c = lower.value().compareTo(upper.value());
        return c > 0 || (c == 0 && (lower.exclusive() || upper.exclusive()));
    }

    static BigDecimal value(Bound b) {
        return b == null ? null : b.value();
    }
}
