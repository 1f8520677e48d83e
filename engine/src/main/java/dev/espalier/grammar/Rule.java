package dev.espalier.grammar;

import java.util.Objects;

/**
 * A named rule of a {@link Grammar}.
 *
 * @param name     the rule name as first written (matching is case-insensitive, RFC 5234 §2.1)
 * @param body     the rule's expression (all {@code =/} alternatives already merged into a {@link Expr.Choice})
 * @param nameSpan where the name is written in its defining line
 * @param span     the whole definition (name to end of its last alternative)
 */
public record Rule(String name, Expr body, Span nameSpan, Span span) {
    public Rule {
        Objects.requireNonNull(name);
        Objects.requireNonNull(body);
        Objects.requireNonNull(nameSpan);
        Objects.requireNonNull(span);
    }

    /** A rule built in code, with no source position. */
    public static Rule of(String name, Expr body) {
        return new Rule(name, body, Span.NONE, Span.NONE);
    }

    /** The case-folded key under which this rule is looked up. */
    public String key() {
        return Grammar.key(name);
    }
}
