package dev.espalier.schema;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.math.BigDecimal;
import java.math.BigInteger;

/**
 * Exact languages of JSON numbers under numeric bounds and integer divisibility, as automata over
 * decimal digits turned into grammar fragments.
 *
 * <p>Every language here is a set of number texts in the syntax of RFC 8259 section 6
 * ({@code -?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?}); in particular leading zeros never occur.
 * Choices made where JSON allows several spellings of one value:
 * <ul>
 *   <li>Integers are written without fraction and exponent ({@code 2}, never {@code 2.0} or
 *       {@code 2e0}), so every integer has exactly one spelling.</li>
 *   <li>Bounded decimals are written without exponent; trailing zeros in the fraction are allowed
 *       ({@code 1.50}), since the value is compared exactly, digit by digit.</li>
 *   <li>Negative zero ({@code -0}, {@code -0.0}) is not produced by {@link #integers} or bounded
 *       {@link #decimals}: zero is written without a sign. (RFC 8259 allows {@code -0}; it equals 0.)
 *       Only the unbounded number language, plain RFC 8259 syntax, includes it.</li>
 * </ul>
 *
 * <p>How: a value is a sign and a magnitude. Magnitude bounds become automata comparing digit
 * strings (a longer integer part is larger; equal integer parts compare fractions digit by digit,
 * missing digits counting as zeros), divisibility by {@code m} an automaton whose states are the
 * remainders modulo {@code m} (reading {@code d} moves {@code r} to {@code (10r + d) mod m}); a
 * negative number is divisible exactly when its magnitude is. They are intersected (dk.brics),
 * minimised, and written back as rules by {@link RegularRules}.
 *
 * <p>Limits: bounds with more than {@value #MAX_DIGITS} digits before or after the decimal point,
 * a divisor above {@value #MAX_MODULUS}, or an intersection above {@value #MAX_PRODUCT_STATES}
 * states are refused with an {@link IllegalArgumentException} saying which; the schema compiler
 * reports it at the keyword's JSON pointer.
 */
public final class NumberLanguages {

    /** Most digits a bound may have before, and after, its decimal point. */
    public static final int MAX_DIGITS = 1_000;

    /** Largest divisor for {@code multipleOf} (the remainder automaton has one state per remainder). */
    public static final int MAX_MODULUS = 10_000;

    /** Largest intersection of a bound automaton and a remainder automaton. */
    public static final int MAX_PRODUCT_STATES = 300_000;

    private NumberLanguages() {
    }

    /**
     * JSON integers (RFC 8259 number syntax with no fraction and no exponent) whose value lies within
     * the bounds and, when {@code multipleOf} is given, is divisible by it. Bounds may be fractional
     * ({@code minimum: 0.5} admits 1, 2, ...). Zero is written {@code 0}, never {@code -0}.
     *
     * @param prefix     prefix of every helper rule name
     * @param lower      lower bound, or null for none
     * @param upper      upper bound, or null for none
     * @param multipleOf a positive divisor, or null for none
     * @throws IllegalArgumentException when {@code multipleOf} is not positive or a limit of this
     *                                  class is crossed (see the class documentation)
     */
    public static RegularFragment integers(String prefix, Bound lower, Bound upper, BigInteger multipleOf) {
        // every automaton built here is minimal (minimised by brics, or minimal by construction)
        return RegularRules.ofMinimal(prefix, integerAutomaton(lower, upper, multipleOf));
    }

    /**
     * The language of {@link #integers} as a minimal dk.brics automaton over chars, for callers that
     * combine it with other automata (intersection, difference) before writing rules.
     */
    public static Automaton integerAutomaton(Bound lower, Bound upper, BigInteger multipleOf) {
        Automaton divisible = null;
        if (multipleOf != null) {
            if (multipleOf.signum() <= 0) {
                throw new IllegalArgumentException("multipleOf must be positive: " + multipleOf);
            }
            if (multipleOf.compareTo(BigInteger.valueOf(MAX_MODULUS)) > 0) {
                throw new IllegalArgumentException("multipleOf " + multipleOf + " is above the limit of "
                        + MAX_MODULUS + " for exact integer divisibility");
            }
            if (lower == null && upper == null) {
                return signedMultiples(multipleOf.intValueExact());
            }
            divisible = remainders(multipleOf.intValueExact());
        }
        return numbers(lower, upper, false, divisible);
    }

    /**
     * JSON numbers without an exponent (an integer part and an optional fraction) whose value lies
     * within the bounds; when both bounds are null, every JSON number (RFC 8259 section 6, exponent
     * and {@code -0} included). Values are compared exactly: with an exclusive lower bound 0.5, the
     * texts {@code 0.5} and {@code 0.50} are refused and {@code 0.500001} accepted. Zero is written
     * without a sign.
     *
     * @throws IllegalArgumentException when a bound crosses {@link #MAX_DIGITS}
     */
    public static RegularFragment decimals(String prefix, Bound lower, Bound upper) {
        if (lower == null && upper == null) {
            return new RegularFragment(anyJsonNumberExpr(), java.util.List.of());
        }
        return RegularRules.ofMinimal(prefix, decimalAutomaton(lower, upper));
    }

    /**
     * The language of {@link #decimals} as a minimal dk.brics automaton over chars (with no bounds,
     * every JSON number).
     */
    public static Automaton decimalAutomaton(Bound lower, Bound upper) {
        return lower == null && upper == null ? anyJsonNumber() : numbers(lower, upper, true, null);
    }

    // ------------------------------------------------------------------ assembly

    /** Signed numbers within the bounds; magnitudes optionally divisible. */
    static Automaton numbers(Bound lower, Bound upper, boolean fractions, Automaton divisible) {
        // non-negative values: the magnitude is the value
        Automaton positive = magnitudes(fractions);
        if (lower != null && lower.value().signum() >= 0) {
            positive = meet(positive, atLeast(lower.value(), lower.exclusive(), fractions));
        }
        if (upper != null) {
            positive = upper.value().signum() < 0 ? Automaton.makeEmpty()
                    : meet(positive, atMost(upper.value(), upper.exclusive(), fractions));
        }
        // negative values -m, m > 0:  -m >= lo  iff  m <= -lo;  -m <= up  iff  m >= -up
        Automaton negative = atLeast(BigDecimal.ZERO, true, fractions);
        if (lower != null) {
            negative = lower.value().signum() >= 0 ? Automaton.makeEmpty()
                    : meet(negative, atMost(lower.value().negate(), lower.exclusive(), fractions));
        }
        if (upper != null && upper.value().signum() < 0) {
            negative = meet(negative, atLeast(upper.value().negate(), upper.exclusive(), fractions));
        }
        if (divisible != null) {
            positive = product(positive, divisible);
            negative = product(negative, divisible);
        }
        Automaton all = positive.union(Automaton.makeChar('-').concatenate(negative));
        all.minimize();
        return all;
    }

    private static Automaton meet(Automaton a, Automaton b) {
        Automaton c = a.intersection(b);
        c.minimize();
        return c;
    }

    private static Automaton product(Automaton a, Automaton divisible) {
        if (a.isEmpty()) {
            return a;
        }
        long size = (long) a.getNumberOfStates() * divisible.getNumberOfStates();
        if (size > MAX_PRODUCT_STATES) {
            throw new IllegalArgumentException("the bounds and multipleOf together need up to " + size
                    + " automaton states, above the limit of " + MAX_PRODUCT_STATES);
        }
        return meet(a, divisible);
    }

    // ------------------------------------------------------------------ magnitudes

    private static final Automaton DIGIT = Automaton.makeCharRange('0', '9');
    private static final Automaton NONZERO = Automaton.makeCharRange('1', '9');

    /** {@code 0|[1-9][0-9]*}, with an optional {@code \.[0-9]+} when {@code fractions}. */
    static Automaton magnitudes(boolean fractions) {
        Automaton a = naturals().concatenate(fractions ? fraction().optional() : Automaton.makeEmptyString());
        a.minimize();
        return a;
    }

    private static Automaton naturals() {
        return Automaton.makeChar('0').union(NONZERO.concatenate(DIGIT.repeat()));
    }

    private static Automaton fraction() {
        return Automaton.makeChar('.').concatenate(DIGIT.repeat(1));
    }

    /** An exact decimal split into its integer digits (no leading zeros) and fraction digits (no trailing zeros). */
    record Digits(String whole, String fraction) {
        static Digits of(BigDecimal value) {
            BigDecimal v = value.abs().stripTrailingZeros();
            if (v.signum() == 0) {
                return new Digits("0", "");
            }
            long intDigits = (long) v.precision() - v.scale();
            long fracDigits = Math.max(0, v.scale());
            if (intDigits > MAX_DIGITS || fracDigits > MAX_DIGITS) {
                throw new IllegalArgumentException("the bound " + value + " has more than " + MAX_DIGITS
                        + " digits before or after the decimal point");
            }
            String plain = v.toPlainString();
            int dot = plain.indexOf('.');
            return dot < 0 ? new Digits(plain, "") : new Digits(plain.substring(0, dot), plain.substring(dot + 1));
        }
    }

    /** Magnitude texts (canonical integer part, optional fraction when allowed) with value >= c (> c when exclusive), c >= 0. */
    static Automaton atLeast(BigDecimal c, boolean exclusive, boolean fractions) {
        Digits d = Digits.of(c);
        Automaton frac = fractions ? fraction().optional() : Automaton.makeEmptyString();
        // a larger integer part, any fraction
        Automaton bigger = naturalsAtLeast(new BigInteger(d.whole()).add(BigInteger.ONE).toString()).concatenate(frac);
        // the same integer part, a fraction at least d.fraction
        Automaton same = Automaton.makeString(d.whole()).concatenate(fractionsAtLeast(d.fraction(), exclusive, fractions));
        Automaton a = bigger.union(same);
        a.minimize();
        return a;
    }

    /** Magnitude texts with value <= c (< c when exclusive), c >= 0. */
    static Automaton atMost(BigDecimal c, boolean exclusive, boolean fractions) {
        Digits d = Digits.of(c);
        Automaton frac = fractions ? fraction().optional() : Automaton.makeEmptyString();
        BigInteger whole = new BigInteger(d.whole());
        Automaton smaller = whole.signum() == 0 ? Automaton.makeEmpty()
                : naturalsAtMost(whole.subtract(BigInteger.ONE).toString()).concatenate(frac);
        Automaton same = Automaton.makeString(d.whole()).concatenate(fractionsAtMost(d.fraction(), exclusive, fractions));
        Automaton a = smaller.union(same);
        a.minimize();
        return a;
    }

    /**
     * What may follow an integer part equal to the bound's: nothing, or {@code .F} with
     * {@code 0.F >= 0.f} ({@code >} when exclusive), f having no trailing zeros.
     */
    private static Automaton fractionsAtLeast(String f, boolean exclusive, boolean fractions) {
        Automaton none = f.isEmpty() && !exclusive ? Automaton.makeEmptyString() : Automaton.makeEmpty();
        if (!fractions) {
            return none;
        }
        // states: tight[i] = read f[0..i); greater = already above; equal = f read, only zeros since
        int len = f.length();
        State[] tight = new State[len + 1];
        for (int i = 0; i <= len; i++) {
            tight[i] = new State();
        }
        State greater = new State();
        greater.setAccept(true);
        greater.addTransition(new Transition('0', '9', greater));
        for (int i = 0; i < len; i++) {
            char c = f.charAt(i);
            tight[i].addTransition(new Transition(c, tight[i + 1]));
            if (c < '9') {
                tight[i].addTransition(new Transition((char) (c + 1), '9', greater));
            }
        }
        // tight[len]: equal so far (or, for f empty, nothing read yet)
        State equal = tight[len];
        if (len == 0) {
            // at least one digit must follow the point
            State eq2 = new State();
            equal.addTransition(new Transition('0', eq2));
            equal.addTransition(new Transition('1', '9', greater));
            equal = eq2;
        }
        equal.setAccept(!exclusive);
        equal.addTransition(new Transition('0', equal));
        equal.addTransition(new Transition('1', '9', greater));
        State start = new State();
        start.addTransition(new Transition('.', tight[0]));
        Automaton dotted = new Automaton();
        dotted.setInitialState(start);
        return dotted.union(none);
    }

    /** Nothing, or {@code .F} with {@code 0.F <= 0.f} ({@code <} when exclusive). */
    private static Automaton fractionsAtMost(String f, boolean exclusive, boolean fractions) {
        // the integer part alone equals A <= A.f; strictly less when f is not empty
        Automaton none = !exclusive || !f.isEmpty() ? Automaton.makeEmptyString() : Automaton.makeEmpty();
        if (!fractions) {
            return none;
        }
        int len = f.length();
        State[] tight = new State[len + 1];
        for (int i = 0; i <= len; i++) {
            tight[i] = new State();
        }
        State less = new State();
        less.setAccept(true);
        less.addTransition(new Transition('0', '9', less));
        for (int i = 0; i < len; i++) {
            char c = f.charAt(i);
            tight[i].addTransition(new Transition(c, tight[i + 1]));
            if (c > '0') {
                tight[i].addTransition(new Transition('0', (char) (c - 1), less));
            }
            // a fraction ending inside f is below it (f has no trailing zeros), except before any digit
            tight[i].setAccept(i > 0);
        }
        State equal = tight[len];
        if (!exclusive) {
            // equal (only zeros follow): accepted, but the point needs one digit
            if (len == 0) {
                State eq2 = new State();
                equal.addTransition(new Transition('0', eq2));
                equal = eq2;
            }
            equal.setAccept(true);
            equal.addTransition(new Transition('0', equal));
        }
        State start = new State();
        start.addTransition(new Transition('.', tight[0]));
        Automaton dotted = new Automaton();
        dotted.setInitialState(start);
        return dotted.union(none);
    }

    /** Canonical naturals (no leading zeros) >= s, s canonical. */
    static Automaton naturalsAtLeast(String s) {
        if (s.equals("0")) {
            return naturals();
        }
        int len = s.length();
        Automaton longer = NONZERO.concatenate(DIGIT.repeat(len));
        State[] tight = new State[len + 1];
        State[] loose = new State[len + 1];
        for (int i = 0; i <= len; i++) {
            tight[i] = new State();
            loose[i] = new State();
        }
        tight[len].setAccept(true);
        loose[len].setAccept(true);
        for (int i = 0; i < len; i++) {
            char c = s.charAt(i);
            tight[i].addTransition(new Transition(c, tight[i + 1]));
            if (c < '9') {
                tight[i].addTransition(new Transition((char) (c + 1), '9', loose[i + 1]));
            }
            loose[i].addTransition(new Transition('0', '9', loose[i + 1]));
        }
        Automaton same = new Automaton();
        same.setInitialState(tight[0]);
        Automaton a = longer.union(same);
        a.minimize();
        return a;
    }

    /** Canonical naturals <= s, s canonical. */
    static Automaton naturalsAtMost(String s) {
        int len = s.length();
        Automaton shorter = len == 1 ? Automaton.makeEmpty()
                : Automaton.makeChar('0').union(NONZERO.concatenate(DIGIT.repeat(0, len - 2)));
        State[] tight = new State[len + 1];
        State[] loose = new State[len + 1];
        for (int i = 0; i <= len; i++) {
            tight[i] = new State();
            loose[i] = new State();
        }
        tight[len].setAccept(true);
        loose[len].setAccept(true);
        for (int i = 0; i < len; i++) {
            char c = s.charAt(i);
            char lowest = i == 0 && len > 1 ? '1' : '0';
            tight[i].addTransition(new Transition(c, tight[i + 1]));
            if (c > lowest) {
                tight[i].addTransition(new Transition(lowest, (char) (c - 1), loose[i + 1]));
            }
            loose[i].addTransition(new Transition('0', '9', loose[i + 1]));
        }
        Automaton same = new Automaton();
        same.setInitialState(tight[0]);
        Automaton a = shorter.union(same);
        a.minimize();
        return a;
    }

    /**
     * All JSON integers divisible by m, built directly: after the sign and first digit, both signs
     * share the remainder states.
     */
    static Automaton signedMultiples(int m) {
        State start = new State();
        State minus = new State();
        State zero = new State();
        zero.setAccept(true);
        State[] r = remainderStates(m);
        start.addTransition(new Transition('0', zero));
        start.addTransition(new Transition('-', minus));
        for (int d = 1; d <= 9; d++) {
            start.addTransition(new Transition((char) ('0' + d), r[d % m]));
            minus.addTransition(new Transition((char) ('0' + d), r[d % m]));
        }
        Automaton a = new Automaton();
        a.setInitialState(start);
        a.setDeterministic(true);
        if (!coprimeWithTen(m)) {
            a.minimize();
        }
        return a;
    }

    /**
     * With m coprime with 10 the remainder automaton is already minimal: the digits of n < m lead to
     * remainder n, and remainders r != r' are told apart by a suffix w of k digits with
     * w = -r * 10^k (mod m), 10^k > m, since 10 is invertible modulo m.
     */
    private static boolean coprimeWithTen(int m) {
        return m % 2 != 0 && m % 5 != 0;
    }

    private static State[] remainderStates(int m) {
        State[] r = new State[m];
        for (int i = 0; i < m; i++) {
            r[i] = new State();
        }
        r[0].setAccept(true);
        for (int i = 0; i < m; i++) {
            for (int d = 0; d <= 9; d++) {
                r[i].addTransition(new Transition((char) ('0' + d), r[(int) ((10L * i + d) % m)]));
            }
        }
        return r;
    }

    /** Digit strings whose value is divisible by m: states are remainders, reading d moves r to (10r+d) mod m. */
    static Automaton remainders(int m) {
        Automaton a = new Automaton();
        a.setInitialState(remainderStates(m)[0]);
        a.setDeterministic(true);
        a.minimize(); // also when already minimal: the products below run faster on brics's minimised form
        return a;
    }

    /**
     * RFC 8259 section 6, spelled as its ABNF: {@code [ minus ] int [ frac ] [ exp ]} with
     * {@code int = zero / ( digit1-9 *DIGIT )}, {@code frac = decimal-point 1*DIGIT},
     * {@code exp = e [ minus / plus ] 1*DIGIT}.
     */
    static Expr anyJsonNumberExpr() {
        Expr digit = Expr.chars(CodePointSet.range('0', '9'));
        Expr integer = Expr.choice(RegularRules.text("0"), Expr.seq(Expr.chars(CodePointSet.range('1', '9')),
                Expr.repeat(digit, 0, Expr.UNBOUNDED)));
        Expr frac = Expr.seq(RegularRules.text("."), Expr.repeat(digit, 1, Expr.UNBOUNDED));
        Expr exp = Expr.seq(Expr.chars(CodePointSet.ofRanges('e', 'e', 'E', 'E')),
                Expr.repeat(Expr.chars(CodePointSet.ofRanges('+', '+', '-', '-')), 0, 1),
                Expr.repeat(digit, 1, Expr.UNBOUNDED));
        return Expr.seq(Expr.repeat(RegularRules.text("-"), 0, 1), integer, Expr.repeat(frac, 0, 1), Expr.repeat(exp, 0, 1));
    }

    /** The automaton of {@link #anyJsonNumberExpr()}, built independently (for tests). */
    static Automaton anyJsonNumber() {
        Automaton exponent = Automaton.makeCharSet("eE")
                .concatenate(Automaton.makeCharSet("+-").optional())
                .concatenate(DIGIT.repeat(1));
        Automaton a = Automaton.makeChar('-').optional()
                .concatenate(naturals())
                .concatenate(fraction().optional())
                .concatenate(exponent.optional());
        a.minimize();
        return a;
    }
}
