package dev.espalier.schema;

import java.math.BigDecimal;
import java.util.Objects;

/**
 * One end of a numeric interval.
 *
 * @param value     the bound
 * @param exclusive whether the bound itself is excluded
 */
public record Bound(BigDecimal value, boolean exclusive) {
    public Bound {
        Objects.requireNonNull(value);
    }
}
