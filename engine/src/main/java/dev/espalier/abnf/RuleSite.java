package dev.espalier.abnf;

import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Span;
import java.util.Objects;

/**
 * One occurrence of a rule name in ABNF source: where a rule is defined ({@code name = ...}),
 * extended ({@code name =/ ...}) or referenced (a rule name used as an element). A language server
 * builds go-to-definition, find-references and rename on these: every occurrence whose
 * {@link #key()} is equal belongs to the same rule (rule names are case-insensitive, RFC 5234 §2.1).
 *
 * @param name   the name exactly as written at this occurrence
 * @param span   the exact source range of the name
 * @param kind   definition, incremental definition or reference
 * @param source the file name the occurrence is in, as given to {@link Abnf#parse} or as resolved
 *               for an imported file
 */
public record RuleSite(String name, Span span, Kind kind, String source) {

    /** What an occurrence of a rule name does. */
    public enum Kind {
        /** {@code name = elements}: defines the rule (RFC 5234 §2.2). */
        DEFINITION,
        /** {@code name =/ elements}: adds alternatives to the rule (RFC 5234 §3.3). */
        INCREMENTAL_DEFINITION,
        /** The name used as an element of some rule's definition. */
        REFERENCE
    }

    /** Checks that no component is null. */
    public RuleSite {
        Objects.requireNonNull(name);
        Objects.requireNonNull(span);
        Objects.requireNonNull(kind);
        Objects.requireNonNull(source);
    }

    /** Whether this occurrence defines the rule, with {@code =} or {@code =/}. */
    public boolean isDefinition() {
        return kind != Kind.REFERENCE;
    }

    /** The case-folded name under which the rule is looked up in a {@link Grammar}. */
    public String key() {
        return Grammar.key(name);
    }
}
