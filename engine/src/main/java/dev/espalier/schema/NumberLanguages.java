package dev.espalier.schema;

import java.math.BigInteger;

/**
 * Exact languages of JSON numbers under numeric bounds and integer divisibility, as automata over
 * decimal digits turned into grammar fragments.
 */
public final class NumberLanguages {
    private NumberLanguages() {
    }

    /**
     * JSON integers (RFC 8259 number syntax with no fraction and no exponent) whose value lies within
     * the bounds and, when {@code multipleOf} is given, is divisible by it.
     *
     * @param prefix     prefix of every helper rule name
     * @param lower      lower bound, or null for none
     * @param upper      upper bound, or null for none
     * @param multipleOf a positive divisor, or null for none
     */
    public static RegularFragment integers(String prefix, Bound lower, Bound upper, BigInteger multipleOf) {
        throw new UnsupportedOperationException("not yet written");
    }

    /**
     * JSON numbers without an exponent (an integer part and an optional fraction) whose value lies
     * within the bounds; at least one bound is given.
     */
    public static RegularFragment decimals(String prefix, Bound lower, Bound upper) {
        throw new UnsupportedOperationException("not yet written");
    }
}
