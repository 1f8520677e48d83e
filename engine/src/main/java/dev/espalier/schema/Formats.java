package dev.espalier.schema;

import java.util.Optional;
import java.util.Set;

/** The string formats of JSON Schema that are enforced, built from the grammar library. */
public final class Formats {
    private Formats() {
    }

    /** Names of the enforced formats (date-time, date, time, duration, email, hostname, ...). */
    public static Set<String> names() {
        throw new UnsupportedOperationException("not yet written");
    }

    /**
     * The content of a string of the given format: decoded characters, before JSON escaping.
     *
     * @param prefix prefix of every helper rule name
     * @return empty when the format is not one of {@link #names()}
     */
    public static Optional<RegularFragment> content(String prefix, String format) {
        throw new UnsupportedOperationException("not yet written");
    }
}
