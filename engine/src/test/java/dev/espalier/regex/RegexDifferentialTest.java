package dev.espalier.regex;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.automaton.SampleStrings;
import dk.brics.automaton.Automaton;
import java.util.List;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;

/**
 * Differential test: regex text → {@link RegexSyntax} → {@link CharAutomata} → dk.brics
 * {@code run(s)} must agree with the reference, {@code java.util.regex.Pattern...matcher(s).matches()},
 * on strings drawn from walks through the automaton, mutations of them and alphabet noise.
 *
 * <p>Where ECMA-262 and java.util.regex disagree, the Java side gets an explicit translation:
 * <ul>
 *   <li>{@code .}: ECMA-262 excludes LF, CR, U+2028, U+2029; Java's dot also excludes U+0085, so it
 *       is spelled <code>[^\n\r&#92;u2028&#92;u2029]</code>.</li>
 *   <li>{@code \s}: ECMA-262 WhiteSpace + LineTerminator (TAB, VT, FF, U+FEFF, Zs, LF, CR, U+2028,
 *       U+2029, per ECMA-262 §12.2 and §12.3, from memory); Java's {@code \s} is ASCII only, so it
 *       is spelled <code>[\t\n\x0B\f\r&#92;uFEFF&#92;u2028&#92;u2029\p{Zs}]</code>.</li>
 *   <li>{@code \v} is VT in ECMA-262 but a class in Java: spelled {@code \x0B}. {@code \0} becomes
 *       {@code \x00}, {@code [\b]} becomes {@code [\x08]}, <code>&#92;u{...}</code> becomes {@code \x{...}}.</li>
 *   <li>Long property names and {@code Script=} become Java's {@code \p{L}} / {@code \p{IsLatin}}
 *       spellings; both read the same JVM Unicode tables.</li>
 * </ul>
 * Anchors {@code ^...$} are dropped on the Java side because {@code matches()} already anchors.
 */
class RegexDifferentialTest {

    private static final String DOT = "[^\\n\\r\\u2028\\u2029]";
    private static final String SPACE_SET = "\\t\\n\\x0B\\f\\r\\uFEFF\\u2028\\u2029\\p{Zs}";
    private static final int STRINGS_PER_PATTERN = 400;

    /** A pattern, its java.util.regex spelling (same text when null). */
    private record Case(String ecma, String java) {
        String javaPattern() {
            return java == null ? ecma : java;
        }
    }

    private static Case same(String p) {
        return new Case(p, null);
    }

    private static Case as(String ecma, String java) {
        return new Case(ecma, java);
    }

    private static final List<Case> CASES = List.of(
            // literals, concatenation, alternation, groups (orchard work-order vocabulary)
            same("graft"),
            same("apple|pear|plum"),
            same("apple|pear|"),
            same("(?:apple|pear)-(?:M9|MM106|Quince A)"),
            same("(ab|cd)*e"),
            same("(a|)b"),
            same("((a|b)(c|d)?)+"),
            same("(((x)))*y"),
            same("(a(b(c)?)?)?d"),
            same("(?<variety>Gala|Fuji)/(?<rootstock>M26|G41)"),
            // quantifiers, greedy and lazy
            same("a?b+c*"),
            same("x{3}"),
            same("x{2,4}y{0,}"),
            same("(?:ab){2,3}"),
            same("a*?b+?c??d{1,2}?"),
            same("colou?r"),
            same("(ab|a){0,12}"),
            same("[0-9]{40}"),
            same("(a|b)*a(a|b){3}"),
            // classes
            same("[a-z]+"),
            same("[^a-z]*"),
            same("[a-z0-9_-]{1,8}"),
            same("[-a]x"),
            same("[a-]x"),
            same("[\\]\\[]+"),
            same("[.*+?(){}|$^]+"),
            same("[^a]+"),
            same("[\\s\\S]{2,5}"),
            as("[\\b]", "[\\x08]"),
            // \d \w \s and friends
            same("\\d{3}-\\d{4}"),
            same("\\w+@\\w+"),
            same("\\D\\W"),
            same("[\\w.-]+"),
            as("\\s+", "[" + SPACE_SET + "]+"),
            as("\\S+", "[^" + SPACE_SET + "]+"),
            as("[\\d\\s]*", "[\\d" + SPACE_SET + "]*"),
            as("[^\\s]", "[^" + SPACE_SET + "]"),
            // dot and anchors
            as(".", DOT),
            as("a.*z", "a" + DOT + "*z"),
            as("^row-.{2}$", "row-" + DOT + "{2}"),
            as("^$", ""),
            // escapes
            as("\\t\\n\\x41\\u0042\\cJ\\0", "\\t\\n\\x41\\u0042\\cJ\\x00"),
            as("\\v\\f\\r", "\\x0B\\f\\r"),
            same("\\.\\*\\+\\?\\(\\)\\[\\]\\{\\}\\|\\/\\^\\$\\\\"),
            // Unicode letters and supplementary code points
            same("\u00E9t\u00E9|\u0436\u0443\u043A"),
            same("[\uD83D\uDE00-\uD83D\uDE4F]+"),
            same("\uD83C\uDF4E{2}"),
            same("a\uD83D\uDE00*b"),
            as("[\\u{1F600}-\\u{1F64F}]+", "[\\x{1F600}-\\x{1F64F}]+"),
            as("[\\u{1F000}-\\u{1F8FF}]", "[\\x{1F000}-\\x{1F8FF}]"),
            as("[\\u{10400}-\\u{10C00}\\u{20000}-\\u{2A6DF}a-c]+", "[\\x{10400}-\\x{10C00}\\x{20000}-\\x{2A6DF}a-c]+"),
            as("[\\u{10000}-\\u{10FFFF}]", "[\\x{10000}-\\x{10FFFF}]"),
            same("\\uD83C\\uDF4E|\\uD83C\\uDF50"),
            same("[^\\uD83C\\uDF4E]{1,3}"),
            // Unicode property classes (both sides read java.lang.Character data)
            same("\\p{L}+"),
            same("\\p{Lu}\\p{Ll}*"),
            same("\\p{N}"),
            same("\\p{Nd}+"),
            same("\\P{L}"),
            same("[\\p{L}\\p{Nd}_]+"),
            same("\\p{Sc}\\p{P}"),
            same("\\p{LC}"),
            as("\\p{Letter}\\p{Decimal_Number}", "\\p{L}\\p{Nd}"),
            as("\\p{gc=Lu}", "\\p{Lu}"),
            as("\\p{Script=Latin}+", "\\p{IsLatin}+"),
            as("\\p{sc=Cyrillic}", "\\p{IsCyrillic}"),
            as("\\p{Script=Han}{1,2}", "\\p{IsHan}{1,2}"),
            as("\\p{Alphabetic}", "\\p{IsAlphabetic}"),
            as("\\p{White_Space}", "\\p{IsWhite_Space}"),
            as("\\p{Lowercase}\\p{Uppercase}", "\\p{IsLowercase}\\p{IsUppercase}"),
            as("[^\\p{L}\\d]", "[^\\p{L}\\d]"));

    @TestFactory
    Stream<DynamicTest> automatonAgreesWithJavaUtilRegex() {
        return CASES.stream().map(c -> DynamicTest.dynamicTest(c.ecma(), () -> check(c)));
    }

    private static void check(Case c) {
        Automaton automaton = CharAutomata.compile(RegexSyntax.parse(c.ecma()), null, 100_000);
        Pattern reference = Pattern.compile(c.javaPattern());
        SampleStrings strings = new SampleStrings(0x5EED_0000L + c.ecma().hashCode(), SampleStrings.alphabetOf(c.ecma()));
        int accepted = 0;
        for (int i = 0; i < STRINGS_PER_PATTERN; i++) {
            String s = strings.next(automaton);
            boolean expected = reference.matcher(s).matches();
            assertEquals(expected, automaton.run(s),
                    () -> "pattern " + c.ecma() + " (java.util.regex: " + c.javaPattern() + ") on string \""
                            + escape(s) + "\"");
            if (expected) {
                accepted++;
            }
        }
        // Guard against a vacuous comparison: the walks must reach members of the language.
        assertTrue(accepted > 0, "no sample of " + c.ecma() + " was in the language");
    }

    static String escape(String s) {
        StringBuilder sb = new StringBuilder();
        for (char ch : s.toCharArray()) {
            if (ch < 0x20 || ch > 0x7E) {
                sb.append(String.format("\\u%04X", (int) ch));
            } else {
                sb.append(ch);
            }
        }
        return sb.toString();
    }
}
