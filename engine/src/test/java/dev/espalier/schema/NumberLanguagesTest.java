package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.espalier.automaton.CharAutomata;
import dk.brics.automaton.Automaton;
import java.math.BigDecimal;
import java.math.BigInteger;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Number languages against plain Java arithmetic ({@link BigInteger}, {@link BigDecimal#compareTo}),
 * with Jackson (strict) confirming that every accepted text is a JSON number. Membership is decided
 * through the engine ({@link FragmentRecognizer}): the fragment's IR compiled by CharAutomata, or the
 * Earley chart when the rules are right-linear recursive.
 */
class NumberLanguagesTest {

    private static final ObjectMapper JACKSON = new ObjectMapper()
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS);
    private static final ObjectMapper PLAIN_JACKSON = new ObjectMapper()
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);
    private static final int RANGE = 2000;

    /** Oracle: BigInteger arithmetic, over every integer in [-2000, 2000] written canonically. */
    @Test
    void integersAgreeWithArithmeticExhaustively() {
        Random random = new Random(0x5EED_1001L);
        long checked = 0;
        int earleyCombos = 0;
        for (int combo = 0; combo < 160; combo++) {
            Bound lower = randomBound(random);
            Bound upper = randomBound(random);
            BigInteger m = switch (random.nextInt(6)) {
                case 0, 1 -> null;
                case 2 -> BigInteger.valueOf(1 + random.nextInt(12));
                case 3 -> BigInteger.valueOf(List.of(10, 20, 25, 100, 125, 1000).get(random.nextInt(6)));
                default -> BigInteger.valueOf(1 + random.nextInt(200));
            };
            FragmentRecognizer language = FragmentRecognizer.of(NumberLanguages.integers("n", lower, upper, m));
            if (!language.usesAutomaton()) {
                earleyCombos++;
            }
            for (int v = -RANGE; v <= RANGE; v++) {
                BigInteger value = BigInteger.valueOf(v);
                boolean expected = within(new BigDecimal(value), lower, upper)
                        && (m == null || value.mod(m).signum() == 0);
                String text = Integer.toString(v);
                assertEquals(expected, language.test(text),
                        () -> text + " with lower " + lower + ", upper " + upper + ", multipleOf " + m);
                checked++;
            }
            // spellings outside the integer language
            for (String odd : List.of("-0", "00", "01", "-01", "1.0", "1e0", "+1", "", "-", " 1")) {
                assertFalse(language.test(odd), () -> odd + " with " + lower + ", " + upper + ", " + m);
            }
        }
        assertEquals(160L * (2 * RANGE + 1), checked);
        assertTrue(earleyCombos > 0, "some divisors should leave right-linear rules (Earley path)");
    }

    /** Oracle: BigInteger arithmetic, for larger values near the bounds and far from them. */
    @Test
    void integersNearLargeBoundsAndDivisors() {
        Random random = new Random(0x5EED_1002L);
        for (int combo = 0; combo < 20; combo++) {
            BigInteger lo = new BigInteger(70, random).subtract(BigInteger.ONE.shiftLeft(69));
            BigInteger hi = lo.add(new BigInteger(40, random));
            BigInteger m = BigInteger.valueOf(1 + random.nextInt(60));
            Bound lower = new Bound(new BigDecimal(lo), random.nextBoolean());
            Bound upper = new Bound(new BigDecimal(hi), random.nextBoolean());
            FragmentRecognizer language = FragmentRecognizer.of(NumberLanguages.integers("n", lower, upper, m));
            List<BigInteger> probes = new ArrayList<>();
            for (int d = -300; d <= 300; d++) {
                probes.add(lo.add(BigInteger.valueOf(d)));
                probes.add(hi.add(BigInteger.valueOf(d)));
            }
            for (int k = 0; k < 200; k++) {
                probes.add(lo.add(new BigInteger(hi.subtract(lo).bitLength() + 2, random)));
            }
            for (BigInteger v : probes) {
                boolean expected = within(new BigDecimal(v), lower, upper) && v.mod(m).signum() == 0;
                assertEquals(expected, language.test(v.toString()), () -> v + " in " + lower + ".." + upper + " / " + m);
            }
        }
    }

    /** Oracle: BigDecimal.compareTo, over random texts with up to 3 fraction digits, odd spellings included. */
    @Test
    void decimalsAgreeWithBigDecimal() throws Exception {
        Random random = new Random(0x5EED_1003L);
        long checked = 0;
        long accepted = 0;
        for (int combo = 0; combo < 150; combo++) {
            Bound lower = randomDecimalBound(random);
            Bound upper = randomDecimalBound(random);
            if (lower == null && upper == null) {
                lower = new Bound(new BigDecimal("-1.5"), false);
            }
            Bound lo = lower;
            Bound hi = upper;
            FragmentRecognizer language = FragmentRecognizer.of(NumberLanguages.decimals("d", lo, hi));
            for (int k = 0; k < 3000; k++) {
                String text = randomNumberText(random);
                BigDecimal value = canonicalValue(text);
                boolean expected = value != null && within(value, lo, hi);
                boolean actual = language.test(text);
                assertEquals(expected, actual, () -> text + " with lower " + lo + ", upper " + hi);
                if (actual) {
                    JsonNode node = JACKSON.readTree(text);
                    assertTrue(node.isNumber(), text);
                    assertEquals(0, node.decimalValue().compareTo(value), text);
                    accepted++;
                }
                checked++;
            }
        }
        assertTrue(accepted > checked / 10, "too few accepted texts for a meaningful comparison: " + accepted);
    }

    /**
     * Soundness on the languages' own members: texts drawn by random walks through the automata,
     * when the fragment accepts them, are JSON numbers for Jackson (strict) within the bounds
     * (BigDecimal) and, for integers, divisible (BigInteger).
     */
    @Test
    void walkedMembersAreJsonNumbersWithinBounds() throws Exception {
        Random random = new Random(0x5EED_1007L);
        int members = 0;
        for (int combo = 0; combo < 60; combo++) {
            boolean integer = combo % 2 == 0;
            Bound lower = integer ? randomBound(random) : randomDecimalBound(random);
            Bound upper = integer ? randomBound(random) : randomDecimalBound(random);
            BigInteger m = integer && random.nextBoolean() ? BigInteger.valueOf(1 + random.nextInt(40)) : null;
            Automaton automaton = integer ? NumberLanguages.integerAutomaton(lower, upper, m)
                    : NumberLanguages.decimalAutomaton(lower, upper);
            FragmentRecognizer language = FragmentRecognizer.of(integer ? NumberLanguages.integers("n", lower, upper, m)
                    : NumberLanguages.decimals("d", lower, upper));
            dev.espalier.automaton.SampleStrings walks = new dev.espalier.automaton.SampleStrings(combo, new int[] {'0'});
            for (int k = 0; k < 200; k++) {
                String s = walks.walk(automaton, 30);
                assertEquals(automaton.run(s), language.test(s), s);
                if (!language.test(s)) {
                    continue;
                }
                members++;
                if (!integer && lower == null && upper == null) {
                    // plain RFC 8259 syntax, exponents of any size: Jackson (strict, as double) reads a number
                    assertTrue(PLAIN_JACKSON.readTree(s).isNumber(), s);
                    continue;
                }
                JsonNode node = JACKSON.readTree(s);
                assertTrue(node.isNumber(), s);
                BigDecimal value = node.decimalValue();
                assertTrue(within(value, lower, upper), () -> s + " outside " + lower + ".." + upper);
                assertFalse(s.startsWith("-") && value.signum() == 0, () -> "negative zero " + s);
                if (integer) {
                    assertTrue(node.isIntegralNumber(), s);
                    assertTrue(m == null || value.toBigIntegerExact().mod(m).signum() == 0, s);
                }
            }
        }
        assertTrue(members > 3000, "too few members walked: " + members);
    }

    /** The example of the specification: exclusive lower bound 0.5. */
    @Test
    void exclusiveHalf() {
        FragmentRecognizer d = FragmentRecognizer.of(NumberLanguages.decimals("d", new Bound(new BigDecimal("0.5"), true), null));
        assertFalse(d.test("0.5"));
        assertFalse(d.test("0.50"));
        assertFalse(d.test("0.4999"));
        assertTrue(d.test("0.500001"));
        assertTrue(d.test("0.51"));
        assertTrue(d.test("1"));
        assertTrue(d.test("12.0"));
        assertFalse(d.test("-1"));
        assertFalse(d.test("1e3")); // bounded decimals are written without exponent
    }

    /** Oracle: RFC 8259 section 6 examples and Jackson; unbounded decimals are full JSON number syntax. */
    @Test
    void unboundedDecimalsAreJsonNumbers() throws Exception {
        FragmentRecognizer d = FragmentRecognizer.of(NumberLanguages.decimals("d", null, null));
        for (String ok : List.of("0", "-0", "1", "-12.5e+3", "1E400", "0.000", "3.141592653589793", "1e-7")) {
            assertTrue(d.test(ok), ok);
            assertTrue(JACKSON.readTree(ok).isNumber(), ok);
        }
        for (String bad : List.of("01", "+1", ".5", "1.", "1e", "1e+", "--1", "0x10", "NaN", "Infinity", "")) {
            assertFalse(d.test(bad), bad);
        }
    }

    /** The spelled-out RFC 8259 expression and the automaton built from operations are one language. */
    @Test
    void unboundedNumberExpressionMatchesItsAutomaton() {
        assertTrue(dev.espalier.automaton.CharAutomata.compile(NumberLanguages.anyJsonNumberExpr(), null, 1000)
                .equals(NumberLanguages.anyJsonNumber()));
    }

    /** The rules written for an automaton, compiled back, are the automaton's language (dk.brics equality). */
    @Test
    void fragmentsCompileBackToTheirAutomata() {
        Random random = new Random(0x5EED_1005L);
        int compared = 0;
        for (int k = 0; k < 40; k++) {
            Bound lower = randomBound(random);
            Bound upper = randomBound(random);
            BigInteger m = random.nextBoolean() ? null : BigInteger.valueOf(1 + random.nextInt(30));
            Automaton expected = NumberLanguages.integerAutomaton(lower, upper, m);
            RegularFragment f = NumberLanguages.integers("n", lower, upper, m);
            if (f.rules().isEmpty()) {
                assertEquals(expected, CharAutomata.compile(f.body(), null, 100_000), lower + " " + upper + " " + m);
                compared++;
            }
            Bound dl = randomDecimalBound(random);
            Bound du = randomDecimalBound(random);
            RegularFragment d = NumberLanguages.decimals("d", dl, du);
            if (d.rules().isEmpty()) {
                assertEquals(NumberLanguages.decimalAutomaton(dl, du), CharAutomata.compile(d.body(), null, 100_000),
                        dl + " " + du);
                compared++;
            }
        }
        assertTrue(compared > 60, "too few fragments without rules: " + compared);
    }

    /**
     * Wide bounds with a divisor leave rules whose states are shared; they still compile to one byte
     * automaton (oracle: BigInteger arithmetic on the automaton's verdicts).
     */
    @Test
    void boundedDivisibleRulesCompileToAByteAutomaton() {
        Bound lower = new Bound(new BigDecimal(-50), false);
        Bound upper = new Bound(new BigDecimal("1e12"), false);
        BigInteger m = BigInteger.valueOf(25);
        RegularFragment f = NumberLanguages.integers("n", lower, upper, m);
        assertFalse(f.rules().isEmpty(), "expected rules, not one expression");
        dev.espalier.grammar.Grammar g = FragmentRecognizer.grammar(f);
        dev.espalier.automaton.ByteDfa dfa = dev.espalier.automaton.ByteDfa.fromCharAutomaton(
                CharAutomata.compileUnminimized(f.body(), n -> g.rule(n).map(dev.espalier.grammar.Rule::body).orElse(null),
                        dev.espalier.automaton.ByteDfa.DEFAULT_STATE_LIMIT), dev.espalier.automaton.ByteDfa.DEFAULT_STATE_LIMIT);
        Random random = new Random(0x5EED_1006L);
        for (int k = 0; k < 2000; k++) {
            BigInteger v = k < 200 ? BigInteger.valueOf(k - 100) : new BigInteger(42, random).subtract(BigInteger.valueOf(100));
            boolean expected = within(new BigDecimal(v), lower, upper) && v.mod(m).signum() == 0;
            assertEquals(expected, dfa.matches(v.toString().getBytes(java.nio.charset.StandardCharsets.US_ASCII)), v::toString);
        }
    }

    /** Empty ranges give the empty language, not an error. */
    @Test
    void emptyRanges() {
        RegularFragment f = NumberLanguages.integers("n", new Bound(new BigDecimal("2.1"), false),
                new Bound(new BigDecimal("2.9"), false), null);
        FragmentRecognizer r = FragmentRecognizer.of(f);
        for (int v = -5; v <= 5; v++) {
            assertFalse(r.test(Integer.toString(v)));
        }
        assertFalse(r.test(""));
    }

    /** Oracle: BigInteger arithmetic for a divisor near the documented limit. */
    @Test
    void largeDivisor() {
        BigInteger m = BigInteger.valueOf(9973);
        FragmentRecognizer r = FragmentRecognizer.of(NumberLanguages.integers("n", null, null, m));
        Random random = new Random(0x5EED_1004L);
        for (int k = 0; k < 300; k++) {
            BigInteger v = new BigInteger(60, random).subtract(BigInteger.ONE.shiftLeft(59));
            BigInteger multiple = v.multiply(m);
            assertTrue(r.test(multiple.toString()), multiple::toString);
            assertFalse(r.test(multiple.add(BigInteger.ONE).toString()));
        }
    }

    @Test
    void limitsAreClearErrors() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> NumberLanguages.integers("n", null, null, BigInteger.valueOf(10_001)));
        assertTrue(e.getMessage().contains("10000"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> NumberLanguages.decimals("d", new Bound(new BigDecimal("1e-2000"), false), null));
        assertTrue(e.getMessage().contains("digits"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> NumberLanguages.integers("n", null, null, BigInteger.ZERO));
    }

    // ------------------------------------------------------------------ helpers

    private static boolean within(BigDecimal v, Bound lower, Bound upper) {
        if (lower != null) {
            int c = v.compareTo(lower.value());
            if (c < 0 || (c == 0 && lower.exclusive())) {
                return false;
            }
        }
        if (upper != null) {
            int c = v.compareTo(upper.value());
            if (c > 0 || (c == 0 && upper.exclusive())) {
                return false;
            }
        }
        return true;
    }

    private static Bound randomBound(Random random) {
        if (random.nextInt(4) == 0) {
            return null;
        }
        int whole = random.nextInt(2 * RANGE + 201) - RANGE - 100;
        BigDecimal v = switch (random.nextInt(4)) {
            case 0 -> new BigDecimal(whole).add(new BigDecimal("0.5"));
            case 1 -> new BigDecimal(whole).subtract(new BigDecimal("0.001"));
            default -> new BigDecimal(whole);
        };
        if (random.nextInt(8) == 0) {
            v = BigDecimal.ZERO;
        }
        return new Bound(v, random.nextBoolean());
    }

    private static Bound randomDecimalBound(Random random) {
        if (random.nextInt(4) == 0) {
            return null;
        }
        BigDecimal v = BigDecimal.valueOf(random.nextInt(60001) - 30000, random.nextInt(4));
        if (random.nextInt(8) == 0) {
            v = BigDecimal.ZERO;
        }
        return new Bound(v, random.nextBoolean());
    }

    /** A number-like text: mostly canonical with up to 3 fraction digits, sometimes a wrong spelling. */
    private static String randomNumberText(Random random) {
        StringBuilder sb = new StringBuilder();
        if (random.nextInt(3) == 0) {
            sb.append('-');
        }
        int kind = random.nextInt(20);
        if (kind == 0) {
            sb.append('0').append(random.nextInt(10)); // leading zero
        } else {
            sb.append(random.nextInt(4) == 0 ? random.nextInt(10) : random.nextInt(40));
        }
        int frac = random.nextInt(5) - 1;
        if (frac >= 0) {
            sb.append('.');
            for (int i = 0; i < frac; i++) {
                sb.append(random.nextInt(10));
            }
        }
        if (kind == 1) {
            sb.append("e1");
        }
        return sb.toString();
    }

    /**
     * The value of a text if it is a canonical bounded-decimal spelling (RFC 8259 syntax, no exponent,
     * no negative zero), else null.
     */
    private static BigDecimal canonicalValue(String text) {
        if (!text.matches("-?(0|[1-9][0-9]*)(\\.[0-9]+)?")) {
            return null;
        }
        BigDecimal v = new BigDecimal(text);
        if (text.startsWith("-") && v.signum() == 0) {
            return null;
        }
        return v;
    }
}
