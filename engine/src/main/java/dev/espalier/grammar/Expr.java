package dev.espalier.grammar;

import java.util.List;
import java.util.Objects;

/**
 * The grammar IR: one expression language shared by every front end (ABNF, regular expressions,
 * JSON Schema). Every node carries the {@link Span} of the source text it came from
 * ({@link Span#NONE} when built in code).
 *
 * <p>An empty {@link Seq} matches the empty string; a {@link Chars} with an empty set or a
 * {@link Choice} with no option matches nothing.
 */
public sealed interface Expr permits Expr.Seq, Expr.Choice, Expr.Repeat, Expr.Chars, Expr.Text, Expr.Ref {

    /** Marks an unbounded {@link Repeat#max()}. */
    int UNBOUNDED = -1;

    /** Where this node came from. */
    Span span();

    /** Concatenation; no items means the empty string. */
    record Seq(List<Expr> items, Span span) implements Expr {
        public Seq {
            items = List.copyOf(items);
            Objects.requireNonNull(span);
        }
    }

    /** Alternation; no options means the empty language. */
    record Choice(List<Expr> options, Span span) implements Expr {
        public Choice {
            options = List.copyOf(options);
            Objects.requireNonNull(span);
        }
    }

    /** {@code body} repeated {@code min} to {@code max} times ({@code max == UNBOUNDED} for no bound). */
    record Repeat(Expr body, int min, int max, Span span) implements Expr {
        public Repeat {
            Objects.requireNonNull(body);
            Objects.requireNonNull(span);
            if (min < 0 || (max != UNBOUNDED && max < 0)) {
                throw new IllegalArgumentException("repetition bounds must not be negative");
            }
        }

        /** Whether there is no upper bound. */
        public boolean unbounded() {
            return max == UNBOUNDED;
        }
    }

    /** Exactly one code point out of {@code set}. */
    record Chars(CodePointSet set, Span span) implements Expr {
        public Chars {
            Objects.requireNonNull(set);
            Objects.requireNonNull(span);
        }
    }

    /**
     * A literal string. With {@code ignoreCase}, each ASCII letter also matches its other case
     * (RFC 5234 §2.3); other characters match only themselves.
     */
    record Text(String text, boolean ignoreCase, Span span) implements Expr {
        public Text {
            Objects.requireNonNull(text);
            Objects.requireNonNull(span);
        }
    }

    /** A reference to a rule by name (rule names are case-insensitive). */
    record Ref(String name, Span span) implements Expr {
        public Ref {
            Objects.requireNonNull(name);
            Objects.requireNonNull(span);
        }
    }

    // ---- convenience factories for code-built expressions ----

    /** Concatenation of the given items. */
    static Expr seq(Expr... items) {
        return new Seq(List.of(items), Span.NONE);
    }

    /** Alternation of the given options. */
    static Expr choice(Expr... options) {
        return new Choice(List.of(options), Span.NONE);
    }

    /** A case-sensitive literal. */
    static Expr text(String s) {
        return new Text(s, false, Span.NONE);
    }

    /** One code point out of {@code set}. */
    static Expr chars(CodePointSet set) {
        return new Chars(set, Span.NONE);
    }

    /** {@code body} repeated {@code min..max} times. */
    static Expr repeat(Expr body, int min, int max) {
        return new Repeat(body, min, max, Span.NONE);
    }

    /** A reference to rule {@code name}. */
    static Expr ref(String name) {
        return new Ref(name, Span.NONE);
    }
}
