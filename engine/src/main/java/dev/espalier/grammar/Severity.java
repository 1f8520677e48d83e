package dev.espalier.grammar;

/** How serious a {@link Diagnostic} is; the order is from most to least serious. */
public enum Severity {
    /** The grammar cannot be used as written. */
    ERROR,
    /** Probably a mistake; the grammar still works. */
    WARNING,
    /** Worth knowing. */
    INFORMATION,
    /** A suggestion. */
    HINT;

    /** Lower-case name as printed by the command line. */
    public String label() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
