package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.AutomatonTooLargeException;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.RegExp;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * {@link StringLengths#bounded} against its slow twin {@link StringLengths#byIntersection}: the same
 * language (dk.brics subset checks both ways) and the same number of states (both minimal), over the
 * format automata of the grammar library and a set of patterns, for many length ranges. Lengths are
 * in code points, as JSON Schema counts them (draft 2020-12, Validation section 6.3.1, from memory):
 * checked directly on strings with supplementary characters.
 */
class StringLengthsTest {

    private static final int LIMIT = 50_000;

    private static void same(String what, Automaton language, int min, int max) {
        Automaton fast = StringLengths.bounded(language, min, max, LIMIT);
        Automaton slow = StringLengths.byIntersection(language, min, max, LIMIT);
        String where = what + " {" + min + "," + max + "}";
        assertTrue(fast.subsetOf(slow), where + ": the product accepts a string the intersection does not");
        assertTrue(slow.subsetOf(fast), where + ": the intersection accepts a string the product does not");
        assertEquals(slow.getNumberOfStates(), fast.getNumberOfStates(), where + ": minimal automata differ in size");
        // the schema compiler reads the product as it is (RegularRules.ofMinimal): it holds no lone
        // surrogate, and reading it gives the rules that restricting and minimising it again gives
        assertTrue(fast.subsetOf(RegularRules.CodePointDfa.wellFormedUtf16()), where + ": a lone surrogate is accepted");
        assertEquals(RegularRules.of("p", fast).toString(), RegularRules.ofMinimal("p", fast).toString(), where);
    }

    private static final int[][] RANGES = {{0, 0}, {0, 1}, {1, 3}, {2, 10}, {0, 40}, {5, 60}, {3, -1}, {0, -1}, {12, 12}};

    @Test
    void formatsAgreeWithTheIntersection() {
        for (String format : List.of("email", "hostname", "date-time", "uuid", "ipv4", "ipv6", "duration")) {
            Automaton a = Formats.automaton(format).orElseThrow();
            for (int[] r : RANGES) {
                same(format, a, r[0], r[1]);
            }
        }
    }

    @Test
    void patternsWithSupplementaryCharactersAgree() {
        List<String> patterns = List.of("[a-c]*", "x[\uD83C\uDF4E\uD83C\uDF50]+y", "(ab|\uD801\uDC00)*", "[^z]*", "[\uD7FF-\uE001]*");
        for (String p : patterns) {
            Automaton a = dev.espalier.automaton.CharAutomata.compile(dev.espalier.regex.RegexSyntax.parse(p), null, LIMIT);
            assertTrue(a.subsetOf(RegularRules.CodePointDfa.wellFormedUtf16()), p + ": a lone surrogate is accepted");
            assertEquals(RegularRules.of("p", a).toString(), RegularRules.ofMinimal("p", a).toString(), p);
            for (int[] r : RANGES) {
                same(p, a, r[0], r[1]);
            }
        }
    }

    @Test
    void lengthsCountCodePoints() {
        Automaton any = new RegExp(".*").toAutomaton();
        Automaton two = StringLengths.bounded(any, 2, 2, LIMIT);
        assertTrue(two.run("\uD83C\uDF4E\uD83C\uDF50"), "two supplementary characters are two code points");
        assertTrue(two.run("ab"));
        assertFalse(two.run("\uD83C\uDF4E"), "one supplementary character is one code point");
        assertFalse(two.run("a\uD800"), "a lone surrogate is not a code point");
        assertFalse(two.run("abc"));
    }

    @Test
    void oversizedProductsStopWithTheLimit() {
        Automaton a = Formats.automaton("uri").orElseThrow();
        assertThrows(AutomatonTooLargeException.class, () -> StringLengths.bounded(a, 0, 254, 1_000));
        Automaton letters = new RegExp("[a-c]*x").toAutomaton();
        assertThrows(AutomatonTooLargeException.class, () -> StringLengths.bounded(letters, 0, Integer.MAX_VALUE, LIMIT),
                "the largest maxLength is refused with the limit, not an arithmetic overflow");
    }
}
