package dev.espalier.grammar;

import java.util.Objects;

/**
 * A finding about a grammar's source text.
 *
 * @param code     a stable short code such as {@code undefined-rule}
 * @param severity how serious it is
 * @param message  a sentence for people
 * @param span     the source range it is about
 */
public record Diagnostic(String code, Severity severity, String message, Span span) {
    public Diagnostic {
        Objects.requireNonNull(code);
        Objects.requireNonNull(severity);
        Objects.requireNonNull(message);
        Objects.requireNonNull(span);
    }

    /** Whether this is an error. */
    public boolean isError() {
        return severity == Severity.ERROR;
    }

    /** {@code file:line:col: severity: message [code]}, the command line's format. */
    public String format(String file) {
        return file + ":" + span.line() + ":" + span.column() + ": " + severity.label() + ": " + message + " [" + code + "]";
    }
}
