package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.automaton.SampleStrings;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import dev.espalier.regex.RegexSyntax;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.util.List;
import java.util.Random;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * Automata written back as rules keep their language. Oracle: java.util.regex on random regular
 * expressions (in the syntax both {@link RegexSyntax} and java.util.regex read alike: literals,
 * classes, ranges of supplementary characters, alternation, groups, quantifiers), on strings drawn
 * from walks through the automaton, mutations and noise, astral characters included.
 */
class RegularRulesTest {

    private static final String[] ATOMS = {"a", "b", "c", "\u00E9", "\uD83D\uDE00", "\uD83C\uDF4E", "[ab]", "[^a]",
        "[a-c\uD83C\uDF4E]", "[\uD83D\uDE00-\uD83D\uDE4F]", "[\\u{10000}-\\u{10FFFF}]", "\\d", "[\u00E0-\u00FF]"};
    private static final int PATTERNS = 500;
    private static final int STRINGS = 150;

    /** Random pattern → RegexSyntax → CharAutomata → RegularRules, both shapes, against java.util.regex. */
    @Test
    void rulesAgreeWithJavaUtilRegex() {
        Random random = new Random(0x5EED_2001L);
        int single = 0;
        int withRules = 0;
        long compared = 0;
        long matched = 0;
        for (int p = 0; p < PATTERNS; p++) {
            String pattern = randomPattern(random, 4);
            Pattern reference = Pattern.compile(pattern.replace("\\u{10000}", "\\x{10000}").replace("\\u{10FFFF}", "\\x{10FFFF}"));
            Automaton automaton = CharAutomata.compile(RegexSyntax.parse(pattern), null, 100_000);
            RegularFragment eliminated = RegularRules.of("r", automaton);
            RegularFragment perState = RegularRules.of("r", automaton, -1);
            if (eliminated.rules().isEmpty()) {
                single++;
            } else {
                withRules++;
            }
            FragmentRecognizer a = FragmentRecognizer.of(eliminated);
            FragmentRecognizer b = FragmentRecognizer.earley(perState);
            SampleStrings strings = new SampleStrings(0x5EED_2002L + p, SampleStrings.alphabetOf(pattern));
            for (int i = 0; i < STRINGS; i++) {
                String s = strings.next(automaton);
                boolean expected = reference.matcher(s).matches();
                assertEquals(expected, a.test(s), () -> "pattern " + pattern + " (one expression) on " + s);
                assertEquals(expected, b.test(s), () -> "pattern " + pattern + " (rule per state) on " + s);
                compared++;
                matched += expected ? 1 : 0;
            }
        }
        assertEquals((long) PATTERNS * STRINGS, compared);
        assertTrue(matched > compared / 5 && matched < compared * 4 / 5, "unbalanced samples: " + matched + " of " + compared);
        assertTrue(single > PATTERNS / 2, "most small automata should become one expression: " + single);
    }

    /** Names carry the prefix; references stay in tail position (right-linear). */
    @Test
    void ruleNamesAndShape() {
        Automaton a = CharAutomata.compile(RegexSyntax.parse("(ab|ba)*c(a|b)*"), null, 1000);
        RegularFragment f = RegularRules.of("orchard-row", a, -1);
        assertFalse(f.rules().isEmpty());
        for (Rule r : f.rules()) {
            assertTrue(r.name().startsWith("orchard-row-s"), r.name());
        }
    }

    /** Lone surrogates are dropped; a surrogate pair is one code point. */
    @Test
    void loneSurrogatesDropped() {
        // an automaton accepting a lone high surrogate, a lone low surrogate, and one proper pair
        State s = new State();
        State end = new State();
        end.setAccept(true);
        State high = new State();
        s.addTransition(new Transition('\uD800', '\uDBFF', high));
        high.addTransition(new Transition('\uDC00', '\uDC05', end));
        high.setAccept(true); // lone high surrogate
        s.addTransition(new Transition('\uDC00', '\uDFFF', end)); // lone low surrogate
        s.addTransition(new Transition('x', end));
        Automaton a = new Automaton();
        a.setInitialState(s);
        RegularFragment f = RegularRules.of("p", a);
        FragmentRecognizer r = FragmentRecognizer.of(f);
        assertTrue(r.test("x"));
        assertTrue(r.test(new String(Character.toChars(0x10000))));
        assertTrue(r.test(new String(Character.toChars(0x10FC05)))); // DBFF DC05
        assertFalse(r.test(new String(Character.toChars(0x10006))));
        assertEquals(List.of(), f.rules());
        Expr.Chars chars = (Expr.Chars) f.body(); // one step over code points: 'x' and the pairs
        assertTrue(chars.set().contains('x'));
        assertTrue(chars.set().contains(0x10FC05));
        assertFalse(chars.set().contains(0xD800));
        assertFalse(chars.set().contains(0xDC00));
    }

    /** The empty language and the empty string. */
    @Test
    void emptyLanguageAndEmptyString() {
        RegularFragment none = RegularRules.of("e", Automaton.makeEmpty());
        assertEquals(new Expr.Choice(List.of(), dev.espalier.grammar.Span.NONE), none.body());
        RegularFragment eps = RegularRules.of("e", Automaton.makeEmptyString());
        assertTrue(FragmentRecognizer.of(eps).test(""));
        assertFalse(FragmentRecognizer.of(eps).test("a"));
    }

    /**
     * Over {@link RegularRules#ELIMINATION_STATES} states nothing is eliminated, and the rules are
     * written straight from the automaton: they must be exactly those of an elimination that
     * eliminates nothing (its slow twin), loops, acceptance and a start state referred to included.
     */
    @Test
    void largeAutomataGetTheRulesOfAnEliminationOfNothing() {
        String[] patterns = {
            "[a-z]{0,1600}",
            "(?:[a-c]|d[e-f\uD83C\uDF4E]){0,900}x?",
            "(?:[a-z]{1,3}\\.){0,700}[a-z]+",
            "(?:a{0,1600}b)*",
        };
        for (String pattern : patterns) {
            Automaton automaton = CharAutomata.compile(RegexSyntax.parse(pattern), null, 100_000);
            RegularFragment direct = RegularRules.of("big", automaton);
            RegularFragment twin = RegularRules.of("big", automaton, -1);
            assertTrue(twin.rules().size() > RegularRules.ELIMINATION_STATES, pattern + ": " + twin.rules().size() + " rules");
            assertEquals(twin.body(), direct.body(), pattern);
            assertEquals(twin.rules(), direct.rules(), pattern);
        }
    }

    private static String randomPattern(Random random, int depth) {
        int kind = depth == 0 ? 0 : random.nextInt(6);
        switch (kind) {
            case 0, 1:
                return ATOMS[random.nextInt(ATOMS.length)];
            case 2:
                return randomPattern(random, depth - 1) + randomPattern(random, depth - 1);
            case 3:
                return "(?:" + randomPattern(random, depth - 1) + "|" + randomPattern(random, depth - 1) + ")";
            case 4: {
                String q = switch (random.nextInt(5)) {
                    case 0 -> "*";
                    case 1 -> "+";
                    case 2 -> "?";
                    case 3 -> "{2}";
                    default -> "{1,3}";
                };
                return "(?:" + randomPattern(random, depth - 1) + ")" + q;
            }
            default:
                return randomPattern(random, depth - 1) + randomPattern(random, depth - 1) + randomPattern(random, depth - 1);
        }
    }
}
