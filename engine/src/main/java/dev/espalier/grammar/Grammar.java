package dev.espalier.grammar;

import java.util.Collection;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/**
 * A set of named rules and a start rule: the IR every front end produces. Rule names are
 * case-insensitive (RFC 5234 §2.1); rules keep their definition order.
 */
public final class Grammar {

    private final Map<String, Rule> rules;
    private final String start;

    private Grammar(Map<String, Rule> rules, String start) {
        this.rules = rules;
        this.start = start;
    }

    /**
     * Builds a grammar. A later rule with the same (case-folded) name replaces an earlier one.
     *
     * @param rules the rules in definition order
     * @param start the start rule's name
     */
    public static Grammar of(List<Rule> rules, String start) {
        Map<String, Rule> m = new LinkedHashMap<>();
        for (Rule r : rules) {
            m.put(r.key(), r);
        }
        return new Grammar(Collections.unmodifiableMap(m), start);
    }

    /** A grammar of one rule named {@code name} whose body is {@code body}. */
    public static Grammar single(String name, Expr body) {
        return of(List.of(Rule.of(name, body)), name);
    }

    /** The lookup key of a rule name. */
    public static String key(String name) {
        return name.toLowerCase(Locale.ROOT);
    }

    /** The start rule's name. */
    public String start() {
        return start;
    }

    /** The same rules with another start rule. */
    public Grammar withStart(String name) {
        return new Grammar(rules, name);
    }

    /** The rule named {@code name} (case-insensitive), if defined. */
    public Optional<Rule> rule(String name) {
        return Optional.ofNullable(rules.get(key(name)));
    }

    /** All rules in definition order. */
    public Collection<Rule> rules() {
        return rules.values();
    }
}
