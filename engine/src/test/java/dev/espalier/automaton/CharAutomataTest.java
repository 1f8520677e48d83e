package dev.espalier.automaton;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Span;
import dev.espalier.regex.RegexSyntax;
import dk.brics.automaton.Automaton;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * Properties of {@link CharAutomata}. The reference for languages is java.util.regex, which
 * matches by code point over Java strings (UTF-16), as the compiled automata must.
 */
class CharAutomataTest {

    private static Automaton compile(Expr e, int limit) {
        return CharAutomata.compile(e, null, limit);
    }

    private static String javaClass(CodePointSet set) {
        StringBuilder sb = new StringBuilder("[");
        for (int i = 0; i < set.rangeCount(); i++) {
            sb.append(String.format("\\x{%X}-\\x{%X}", set.lo(i), set.hi(i)));
        }
        return sb.append(']').toString();
    }

    @Test
    void exponentialDeterminisationFailsFastInsteadOfHanging() {
        // (a|b)*a(a|b){n}: the minimal DFA needs 2^(n+1) states (common practice: the textbook
        // example of subset-construction blow-up).
        Expr e = RegexSyntax.parse("(a|b)*a(a|b){25}");
        AutomatonTooLargeException ex = assertTimeoutPreemptively(Duration.ofSeconds(30),
                () -> assertThrows(AutomatonTooLargeException.class, () -> compile(e, 10_000)));
        assertEquals(10_000, ex.limit());
        assertEquals("the automaton exceeds its limit of 10000 states", ex.getMessage());
    }

    @Test
    void smallInstanceOfTheBlowUpFamilyHasTheTextbookSize() {
        // Same family with n = 3: the minimal DFA has 2^(3+1) = 16 states (common practice);
        // brics counts no extra dead state after minimisation of a DFA without one.
        Automaton a = compile(RegexSyntax.parse("(a|b)*a(a|b){3}"), 10_000);
        assertEquals(16, a.getNumberOfStates());
        Pattern reference = Pattern.compile("(a|b)*a(a|b){3}");
        for (String s : List.of("aaaa", "abbb", "babbb", "bbbb", "aabba", "a")) {
            assertEquals(reference.matcher(s).matches(), a.run(s), s);
        }
    }

    @Test
    void emptyClassHasEmptyLanguage() {
        Automaton a = compile(RegexSyntax.parse("[^\\s\\S]"), 100);
        assertTrue(a.isEmpty());
        assertTrue(compile(Expr.choice(), 100).isEmpty());
        assertTrue(compile(Expr.seq(), 100).isEmptyString());
    }

    @Test
    void codePointSetsAgreeWithJavaUtilRegexIncludingSupplementaryPlanes() {
        Random random = new Random(7_001L);
        for (int round = 0; round < 200; round++) {
            int[] pairs = new int[2 * (1 + random.nextInt(5))];
            for (int i = 0; i < pairs.length; i += 2) {
                int lo = random.nextInt(4) == 0 ? random.nextInt(0x10000) : 0x10000 + random.nextInt(0x100000);
                int width = random.nextInt(3) == 0 ? random.nextInt(0x20000) : random.nextInt(0x800);
                pairs[i] = lo;
                pairs[i + 1] = Math.min(CodePointSet.MAX, lo + width);
            }
            CodePointSet set = CodePointSet.ofRanges(pairs);
            Automaton a = compile(Expr.chars(set), 10_000);
            // Surrogates are dropped; java.util.regex is only asked about well-formed strings.
            Pattern reference = Pattern.compile(javaClass(set));
            for (int k = 0; k < 200; k++) {
                int cp;
                if (k % 2 == 0) {
                    int r = random.nextInt(set.rangeCount());
                    int edge = random.nextInt(4);
                    cp = edge == 0 ? set.lo(r) - 1 : edge == 1 ? set.hi(r) + 1 : edge == 2 ? set.lo(r) : set.hi(r);
                    cp = Math.max(0, Math.min(CodePointSet.MAX, cp));
                } else {
                    cp = random.nextInt(CodePointSet.MAX + 1);
                }
                if (cp >= Character.MIN_SURROGATE && cp <= Character.MAX_SURROGATE) {
                    continue;
                }
                String s = new String(Character.toChars(cp));
                int tested = cp;
                assertEquals(reference.matcher(s).matches(), a.run(s), () -> set + " on U+" + Integer.toHexString(tested));
            }
        }
    }

    @Test
    void supplementaryRangesUseFewPaths() {
        // The whole supplementary range: high surrogates D800-DBFF then any low surrogate.
        Automaton all = compile(Expr.chars(CodePointSet.range(0x10000, CodePointSet.MAX)), 100);
        assertEquals(3, all.getNumberOfStates());
        // A range with partial first and last high surrogates needs at most the three documented parts.
        Automaton partial = compile(Expr.chars(CodePointSet.range(0x1F34E, 0x2A6DF)), 100);
        assertTrue(partial.getNumberOfStates() <= 5, partial.toString());
        assertTrue(partial.run("\uD83C\uDF4E")); // U+1F34E, per UTF-16 (RFC 2781 §2.1)
        assertFalse(partial.run("\uD83C\uDF4D")); // U+1F34D
        assertTrue(partial.run("\uD869\uDEDF")); // U+2A6DF
        assertFalse(partial.run("\uD869\uDEE0")); // U+2A6E0
    }

    @Test
    void surrogateCodePointsAreDropped() {
        assertTrue(compile(Expr.chars(CodePointSet.range(0xD800, 0xDFFF)), 10).isEmpty());
        Automaton a = compile(Expr.chars(CodePointSet.range(0xD000, 0xE000)), 10);
        assertTrue(a.run("\uD7FF") && a.run("\uE000"));
        assertFalse(a.run("\uD800") || a.run("\uDC00"));
        assertTrue(compile(Expr.text("graft\uD800"), 10).isEmpty());
    }

    @Test
    void ignoreCaseTextAgreesWithJavaAsciiCaseInsensitiveMatching() {
        // java.util.regex CASE_INSENSITIVE without UNICODE_CASE folds US-ASCII only, which is the
        // documented meaning of Text.ignoreCase (RFC 5234 §2.3 case-insensitive strings).
        String literal = "Graft-Date \u00E9t\u00E9 M9";
        Automaton a = compile(new Expr.Text(literal, true, Span.NONE), 100);
        Pattern reference = Pattern.compile(Pattern.quote(literal), Pattern.CASE_INSENSITIVE);
        SampleStrings strings = new SampleStrings(11L, SampleStrings.alphabetOf("GRAFTdate\u00C9m"));
        Random random = new Random(12L);
        int accepted = 0;
        for (int i = 0; i < 2_000; i++) {
            String s = i % 2 == 0 ? flipCases(literal, random) : strings.next(a);
            boolean expected = reference.matcher(s).matches();
            assertEquals(expected, a.run(s), s);
            accepted += expected ? 1 : 0;
        }
        assertTrue(accepted > 500);
    }

    private static String flipCases(String s, Random random) {
        StringBuilder sb = new StringBuilder();
        for (char c : s.toCharArray()) {
            sb.append(random.nextBoolean() ? Character.toUpperCase(c) : Character.toLowerCase(c));
        }
        return sb.toString();
    }

    @Test
    void referencesResolveThroughTheRuleFunction() {
        Map<String, Expr> rules = new HashMap<>();
        rules.put("digit", Expr.chars(CodePointSet.range('0', '9')));
        rules.put("year", Expr.seq(Expr.ref("DIGIT"), Expr.ref("digit"), Expr.ref("Digit"), Expr.ref("digit")));
        rules.put("date", Expr.seq(Expr.ref("year"), Expr.text("-"), Expr.repeat(Expr.ref("digit"), 2, 2)));
        Automaton a = CharAutomata.compile(Expr.ref("date"), n -> rules.get(n.toLowerCase()), 1_000);
        Pattern reference = Pattern.compile("\\d{4}-\\d{2}");
        for (String s : List.of("2024-03", "2024-3", "202403", "1999-12", "99-12-01", "2024-031")) {
            assertEquals(reference.matcher(s).matches(), a.run(s), s);
        }
    }

    @Test
    void unresolvableReferencesAreNamed() {
        IllegalArgumentException missing = assertThrows(IllegalArgumentException.class,
                () -> CharAutomata.compile(Expr.seq(Expr.text("x"), Expr.ref("rootstock")), n -> null, 100));
        assertTrue(missing.getMessage().contains("rootstock"), missing.getMessage());
        IllegalArgumentException noRules = assertThrows(IllegalArgumentException.class,
                () -> CharAutomata.compile(Expr.ref("variety"), null, 100));
        assertTrue(noRules.getMessage().contains("variety"), noRules.getMessage());
    }

    @Test
    void referenceCyclesAreReported() {
        Map<String, Expr> rules = Map.of(
                "row", Expr.seq(Expr.text("r"), Expr.ref("tree")),
                "tree", Expr.choice(Expr.text("t"), Expr.ref("row")));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> CharAutomata.compile(Expr.ref("row"), rules::get, 100));
        assertEquals("rule row is recursive", e.getMessage());
        Map<String, Expr> self = Map.of("bud", Expr.seq(Expr.text("b"), Expr.ref("bud")));
        assertThrows(IllegalArgumentException.class, () -> CharAutomata.compile(Expr.ref("bud"), self::get, 100));
    }

    @Test
    void sharedReferencesAreNotCycles() {
        Map<String, Expr> rules = Map.of("d", Expr.chars(CodePointSet.range('0', '9')));
        Expr twice = Expr.choice(Expr.seq(Expr.ref("d"), Expr.ref("d")), Expr.ref("d"));
        Automaton a = CharAutomata.compile(twice, rules::get, 100);
        assertTrue(a.run("1") && a.run("12") && !a.run("123"));
    }

    @Test
    void largeCountedRepetitionIsExactAndQuick() {
        Expr e = Expr.repeat(Expr.chars(CodePointSet.range('a', 'c')), 0, 5_000);
        Automaton a = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> compile(e, 10_000));
        assertTrue(a.run("abc".repeat(1_666)));
        assertTrue(a.run("c".repeat(5_000)));
        assertFalse(a.run("c".repeat(5_001)));
        assertFalse(a.run("d"));
        // Minimal DFA of [a-c]{0,5000} has 5001 states (common practice: one per count).
        assertEquals(5_001, a.getNumberOfStates());
        Expr exact = Expr.repeat(Expr.text("ab"), 3_000, 3_000);
        Automaton b = compile(exact, 10_000);
        assertTrue(b.run("ab".repeat(3_000)));
        assertFalse(b.run("ab".repeat(2_999)));
        assertThrows(AutomatonTooLargeException.class, () -> compile(exact, 1_000));
    }

    @Test
    void unboundedRepetitionWithLowerBound() {
        Automaton a = compile(RegexSyntax.parse("(?:ab|c){3,}"), 1_000);
        Pattern reference = Pattern.compile("(?:ab|c){3,}");
        SampleStrings strings = new SampleStrings(3L, SampleStrings.alphabetOf("abc"));
        for (int i = 0; i < 2_000; i++) {
            String s = strings.next(a);
            assertEquals(reference.matcher(s).matches(), a.run(s), s);
        }
    }

    @Test
    void degenerateRepetitions() {
        assertTrue(compile(Expr.repeat(Expr.seq(), 10_000, 10_000), 10).isEmptyString());
        assertTrue(compile(Expr.repeat(Expr.choice(), 0, 5), 10).isEmptyString());
        assertTrue(compile(Expr.repeat(Expr.choice(), 1, 5), 10).isEmpty());
        assertTrue(compile(Expr.repeat(Expr.text("x"), 0, 0), 10).isEmptyString());
        Automaton star = compile(Expr.repeat(Expr.repeat(Expr.text("a"), 0, Expr.UNBOUNDED), 10_000, 10_000), 10);
        assertTrue(star.run("") && star.run("aaaa"));
    }

    @Test
    void deeplyNestedExpressionsCompileWithoutRecursion() {
        Expr e = Expr.text("x");
        for (int i = 0; i < 50_000; i++) {
            e = i % 2 == 0 ? Expr.seq(e) : Expr.choice(e, Expr.choice());
        }
        Automaton a = compile(e, 10);
        assertTrue(a.run("x"));
        assertFalse(a.run(""));
    }

    @Test
    void largeAlternationOfWordsStaysExact() {
        List<Expr> words = new ArrayList<>();
        List<String> texts = new ArrayList<>();
        for (int i = 0; i < 3_000; i++) {
            String w = "tree-" + Integer.toString(i * 7919, 36);
            texts.add(w);
            words.add(Expr.text(w));
        }
        Automaton a = compile(new Expr.Choice(words, Span.NONE), 20_000);
        Pattern reference = Pattern.compile(String.join("|", texts));
        SampleStrings strings = new SampleStrings(5L, SampleStrings.alphabetOf("tree-0123456789abcdefghijklmnopqrstuvwxyz"));
        for (int i = 0; i < 3_000; i++) {
            String s = strings.next(a);
            assertEquals(reference.matcher(s).matches(), a.run(s), s);
        }
    }

    @Test
    void resultIsDeterministicAndMinimal() {
        Automaton a = compile(RegexSyntax.parse("(apple|apricot|pear)+[0-9]{2,3}"), 1_000);
        assertTrue(a.isDeterministic());
        Automaton again = a.clone();
        again.minimize();
        assertEquals(again.getNumberOfStates(), a.getNumberOfStates());
    }

    @Test
    void nonPositiveLimitIsRejected() {
        assertThrows(IllegalArgumentException.class, () -> compile(Expr.text("a"), 0));
    }

    /**
     * Rules that share rules: r0 = "a" r1 / "b" r1, ..., r39 = "a" / "b" (the language (a|b){40}).
     * Copied per reference without minimising, the unminimised compilation would grow as 2^40;
     * shared rules are minimised once, so it stays linear.
     */
    @Test
    void sharedRulesDoNotMultiply() {
        int depth = 40;
        Map<String, Expr> rules = new HashMap<>();
        for (int i = 0; i < depth; i++) {
            Expr next = i + 1 < depth ? Expr.ref("r" + (i + 1)) : Expr.seq();
            rules.put("r" + i, Expr.choice(Expr.seq(Expr.text("a"), next), Expr.seq(Expr.text("b"), next)));
        }
        Automaton a = assertTimeoutPreemptively(Duration.ofSeconds(20),
                () -> CharAutomata.compileUnminimized(Expr.ref("r0"), rules::get, 1_000));
        ByteDfa dfa = ByteDfa.fromCharAutomaton(a, 1_000);
        assertEquals(depth + 1, dfa.stateCount());
        assertTrue(a.run("ab".repeat(depth / 2)));
        assertFalse(a.run("ab".repeat(depth / 2) + "a"));
    }
}
