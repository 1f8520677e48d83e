package dev.espalier.regex;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Expr;
import dk.brics.automaton.Automaton;
import java.util.Random;
import java.util.regex.Pattern;
import java.util.regex.PatternSyntaxException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Errors for unsupported constructs and malformed patterns: each must be a
 * {@link RegexSyntaxException} pointing at the offending text.
 *
 * <p>Malformed patterns follow the ECMA-262 pattern grammar in Unicode mode (§22.2.1, from memory:
 * no identity escapes of letters, no lone braces or brackets, no octal escapes, no class escape
 * as a range end). Where java.util.regex also rejects the pattern, the test says so and checks it,
 * as an outside confirmation that the text is malformed in common practice as well.
 * Unsupported-but-valid constructs (lookaround, backreferences, word boundaries, inner anchors)
 * are the project's documented subset.
 */
class RegexSyntaxErrorTest {

    @ParameterizedTest(name = "{0} -> offset {1}")
    @CsvSource(delimiter = '\t', quoteCharacter = '`', textBlock = """
            ab(?=c)	2	lookahead (?= is not supported
            ab(?!c)	2	negative lookahead (?! is not supported
            (?<=a)b	0	lookbehind (?<= is not supported
            x(?<!a)b	1	negative lookbehind (?<! is not supported
            (a)\\1	3	backreference \\1 is not supported
            (?<n>a)\\k<n>	7	backreference \\k<name> is not supported
            a\\bc	1	word boundary \\b is not supported
            a\\B	1	word boundary \\B is not supported
            a^b	1	anchor ^ is only supported at the start of the pattern
            (^a)	1	anchor ^ is only supported at the start of the pattern
            a$b	1	anchor $ is only supported at the end of the pattern
            (a$)	2	anchor $ is only supported at the end of the pattern
            (?i)apple	0	unsupported group syntax (?
            (?<1st>x)	3	invalid group name
            """)
    void unsupportedConstructsAreNamedWithTheirOffset(String pattern, int offset, String reason) {
        RegexSyntaxException e = assertThrows(RegexSyntaxException.class, () -> RegexSyntax.parse(pattern));
        assertEquals(offset, e.index(), e.getMessage());
        assertTrue(e.reason().startsWith(reason), e.getMessage());
        assertEquals(e.reason() + ", at offset " + offset, e.getMessage());
    }

    @Test
    void messageWordingMatchesTheDocumentedForm() {
        RegexSyntaxException e = assertThrows(RegexSyntaxException.class, () -> RegexSyntax.parse("tree(?=s)"));
        assertEquals("lookahead (?= is not supported, at offset 4", e.getMessage());
        assertEquals(3, e.length());
    }

    @ParameterizedTest(name = "{0} -> offset {1}")
    @CsvSource(delimiter = '\t', quoteCharacter = '`', textBlock = """
            *a	0	nothing to repeat	true
            a|?	2	nothing to repeat	true
            (+)	1	nothing to repeat	true
            ^*a	1	nothing to repeat	false
            a{5,3}	1	repetition bounds {5,3} are out of order	true
            a{2,10001}	1	repetition bound 10001 exceeds the limit of 10000	false
            a{99999999999}	1	repetition bound 99999999999 exceeds the limit	true
            a{	1	{ does not start a valid quantifier	true
            a{,5}	1	{ does not start a valid quantifier	false
            {	0	{ does not start a valid quantifier	true
            x{1}{2}	4	nothing to repeat	false
            x}	1	unmatched }	false
            x]	1	unmatched ]	false
            (ab	0	unclosed group (	true
            a(b(c)	1	unclosed group (	true
            ab)	2	unmatched )	true
            [abc	0	unclosed character class [	true
            x[z-a]	2	range z-a is out of order	true
            [\\d-z]	1	a class escape such as \\d cannot be the end of a range	false
            ab\\	2	the pattern ends with a lone backslash	true
            \\q	0	invalid escape \\q	false
            a\\-	1	invalid escape \\-	false
            \\x4	0	\\x must be followed by two hexadecimal digits	true
            \\u12	0	\\u must be followed by four hexadecimal digits	true
            \\u{110000}	0	code point \\u{110000} is above U+10FFFF	false
            \\u{}	0	\\u{ must be followed by hexadecimal digits	false
            \\c1	0	\\c must be followed by a letter	false
            \\01	0	octal escapes are not allowed	false
            [\\B]	1	invalid escape \\B in a character class	false
            \\pL	0	\\p must be followed by {property}	false
            \\p{Foo}	0	unknown or unsupported property value in \\p{Foo}	true
            \\p{Script=Nope}	0	unknown or unsupported property value	true
            \\p{scx=Latin}	0	property scx is not supported	false
            \\p{L	0	unclosed property escape	true
            """)
    void malformedPatternsFailAtTheirOffset(String pattern, int offset, String reason, boolean javaRejectsToo) {
        RegexSyntaxException e = assertThrows(RegexSyntaxException.class, () -> RegexSyntax.parse(pattern));
        assertEquals(offset, e.index(), e.getMessage());
        assertTrue(e.reason().startsWith(reason), e.getMessage());
        assertTrue(e.index() + e.length() <= pattern.length(), "span inside the pattern");
        if (javaRejectsToo) {
            assertThrows(PatternSyntaxException.class, () -> Pattern.compile(pattern),
                    "java.util.regex rejects " + pattern + " as well");
        }
    }

    @Test
    void nestingBeyondTheLimitIsAnErrorAtTheFirstExcessGroup() {
        int depth = RegexSyntax.MAX_NESTING;
        String ok = "(".repeat(depth) + "a" + ")".repeat(depth);
        Automaton a = CharAutomata.compile(RegexSyntax.parse(ok), null, 100);
        assertTrue(a.run("a"));
        String deep = "(".repeat(depth + 1) + "a" + ")".repeat(depth + 1);
        RegexSyntaxException e = assertThrows(RegexSyntaxException.class, () -> RegexSyntax.parse(deep));
        assertEquals(depth, e.index());
        assertTrue(e.getMessage().contains("nested more than " + depth), e.getMessage());
    }

    @Test
    void longPatternsNeedNoDeepStack() {
        // 200,000 alternatives and 100,000 items in one sequence: the parser and the compiler work
        // with explicit stacks, so this needs no deep recursion.
        String alternatives = "a|".repeat(200_000) + "b";
        Automaton a = CharAutomata.compile(RegexSyntax.parse(alternatives), null, 100);
        assertTrue(a.run("a") && a.run("b") && !a.run("ab"));
        String sequence = "(?:x)".repeat(100_000);
        Expr e = RegexSyntax.parse(sequence);
        assertTrue(CharAutomata.compile(e, null, 200_000).run("x".repeat(100_000)));
    }

    @Test
    void randomPatternTextEitherParsesOrFailsWithAnOffsetInsideThePattern() {
        String alphabet = "ab()[]{}|*+?^$\\.-,0123456789dDwWsSpPuxckbB<>=!:L";
        Random random = new Random(20_240_611L);
        for (int i = 0; i < 20_000; i++) {
            int len = random.nextInt(14);
            StringBuilder sb = new StringBuilder();
            for (int k = 0; k < len; k++) {
                sb.append(alphabet.charAt(random.nextInt(alphabet.length())));
            }
            String pattern = sb.toString();
            try {
                RegexSyntax.parse(pattern);
            } catch (RegexSyntaxException e) {
                if (e.index() < 0 || e.index() > pattern.length() || e.index() + e.length() > pattern.length()) {
                    fail("offset outside the pattern for " + pattern + ": " + e.getMessage());
                }
            } catch (RuntimeException e) {
                throw new AssertionError("pattern " + pattern + " raised " + e, e);
            }
        }
    }

    @Test
    void spansPointAtTheSourceText() {
        String pattern = "^graft(ed)?-\\d{4}$";
        Expr.Seq seq = (Expr.Seq) RegexSyntax.parse(pattern);
        Expr.Text graft = (Expr.Text) seq.items().get(0);
        assertEquals("graft", pattern.substring(graft.span().start(), graft.span().end()));
        Expr.Repeat ed = (Expr.Repeat) seq.items().get(1);
        assertEquals("(ed)?", pattern.substring(ed.span().start(), ed.span().end()));
        Expr.Repeat year = (Expr.Repeat) seq.items().get(3);
        assertEquals("\\d{4}", pattern.substring(year.span().start(), year.span().end()));
        assertEquals(4, year.min());
        assertEquals(4, year.max());
    }

    @Test
    void anchorsAtTheEdgesAreIgnored() {
        Automaton anchored = CharAutomata.compile(RegexSyntax.parse("^M(9|26)$"), null, 100);
        Automaton plain = CharAutomata.compile(RegexSyntax.parse("M(9|26)"), null, 100);
        assertEquals(plain, anchored); // brics equals() compares languages
        assertTrue(CharAutomata.compile(RegexSyntax.parse("\\$"), null, 10).run("$"));
    }
}
