package dev.espalier.grammar;

import static dev.espalier.grammar.GrammarAnalysisTest.abnf;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.CharAutomata;
import dk.brics.automaton.Automaton;
import java.util.List;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * Random examples are strings of the grammar: for non-recursive grammars checked with the automaton
 * compiler and dk.brics's {@code run}; for recursive ones with independent recognisers.
 */
class GrammarExamplesTest {

    private static Automaton automaton(Grammar g) {
        return CharAutomata.compile(g.rule(g.start()).orElseThrow().body(),
                name -> g.rule(name).map(Rule::body).orElse(null), 100_000);
    }

    private static void allAccepted(String abnf, int n, int expectAtLeast) {
        Grammar g = abnf(abnf);
        Automaton a = automaton(g);
        for (long seed = 0; seed < 5; seed++) {
            List<String> xs = GrammarAnalysis.randomExamples(g, n, seed, 8);
            assertTrue(xs.size() >= expectAtLeast, () -> "too few examples: " + xs);
            for (String x : xs) {
                assertTrue(a.run(x), () -> "not in the language: " + x);
            }
        }
    }

    @Test
    void workOrderLines() {
        allAccepted(String.join("\n",
                "order = %s\"WO-\" 4DIGIT SP action SP tree-id [SP note]",
                "action = %s\"prune\" / %s\"graft\" / %s\"inspect\" / %s\"spray\"",
                "tree-id = 1*3ALPHA \"-\" 1*5DIGIT",
                "note = DQUOTE *(%x20-21 / %x23-7E / %xA0-10FFFF) DQUOTE", ""), 30, 20);
    }

    @Test
    void rfc3339FullDate() {
        // RFC 3339 §5.6 (from memory): full-date = date-fullyear "-" date-month "-" date-mday
        allAccepted(String.join("\n",
                "full-date = date-fullyear \"-\" date-month \"-\" date-mday",
                "date-fullyear = 4DIGIT",
                "date-month = 2DIGIT",
                "date-mday = 2DIGIT", ""), 20, 15);
    }

    @Test
    void caseInsensitiveAndUnicodeStrings() {
        allAccepted("variety = \"Gala\" / %s\"Boskoop\" / %x41.70.66.65.6C / \"Äpfel\" 0*2%x1F333 / %d39.32\n", 10, 4);
    }

    @Test
    void boundedRepetitions() {
        allAccepted("row = 2*4(\"A\" / \"B\") 3\"-\" *2%x30-39 [\"!\"] 0%s\"never\"\n", 40, 20);
    }

    @Test
    void sameSeedSameExamples() {
        Grammar g = abnf("s = 1*8(ALPHA / DIGIT)\n");
        assertEquals(GrammarAnalysis.randomExamples(g, 10, 42, 5), GrammarAnalysis.randomExamples(g, 10, 42, 5));
    }

    @Test
    void finiteLanguageGivesAtMostItsStrings() {
        List<String> xs = GrammarAnalysis.randomExamples(abnf("s = %s\"a\" / %s\"b\"\n"), 10, 3, 5);
        assertEquals(List.of("a", "b"), xs.stream().sorted().toList());
    }

    @Test
    void balancedBracketsAreBalanced() {
        // not regular; checked with a bracket counter (common practice)
        Grammar g = abnf("s = *(%s\"(\" s %s\")\" / %s\"[\" s %s\"]\" / %s\"x\")\n");
        List<String> xs = GrammarAnalysis.randomExamples(g, 50, 7, 6);
        assertTrue(xs.size() > 10);
        for (String x : xs) {
            assertTrue(balanced(x), x);
        }
    }

    private static boolean balanced(String s) {
        StringBuilder open = new StringBuilder();
        for (char c : s.toCharArray()) {
            if (c == '(' || c == '[') {
                open.append(c);
            } else if (c == ')' || c == ']') {
                if (open.length() == 0 || open.charAt(open.length() - 1) != (c == ')' ? '(' : '[')) {
                    return false;
                }
                open.setLength(open.length() - 1);
            } else if (c != 'x') {
                return false;
            }
        }
        return open.length() == 0;
    }

    @Test
    void ambiguousRecursionEndsAtTheDepthBound() {
        // S = S S / "a" derives exactly a+ (java.util.regex as the reference)
        Grammar g = abnf("s = s s / %s\"a\"\n");
        Pattern aPlus = Pattern.compile("a+");
        for (int depth : new int[] {0, 3, 30}) {
            List<String> xs = GrammarAnalysis.randomExamples(g, 20, depth, depth);
            assertFalse(xs.isEmpty());
            for (String x : xs) {
                assertTrue(aPlus.matcher(x).matches(), x);
            }
        }
        for (String x : GrammarAnalysis.randomExamples(g, 5, 1, 0)) {
            assertTrue(x.equals("a") || x.equals("aa"), "below depth 0 only shortest derivations: " + x);
        }
    }

    @Test
    void depthZeroTakesShortestBelowTheStart() {
        // with depth 0 every reference from the start rule takes its shortest derivation
        Grammar g = abnf("s = %s\"(\" s %s\")\" / %s\"x\"\n");
        for (String x : GrammarAnalysis.randomExamples(g, 10, 5, 0)) {
            assertTrue(x.equals("x") || x.equals("(x)"), x);
        }
    }

    @Test
    void hugeRepetitionDoesNotHang() {
        Grammar g = abnf("s = 1000000000%s\"ab\" / %s\"c\"\nt = 1000000000*[%s\"a\"]\n");
        for (String x : GrammarAnalysis.randomExamples(g, 5, 1, 5)) {
            assertEquals("c", x, "the long alternative cannot be spelled within the limit");
        }
        assertEquals(java.util.Optional.empty(), GrammarAnalysis.of(g).facts("s").shortest().filter(x -> !x.equals("c")));
        List<String> ts = GrammarAnalysis.of(g).examples("t", 5, 1, 5);
        assertFalse(ts.isEmpty());
        for (String x : ts) {
            assertTrue(x.matches("a*"), x);
        }
    }
}
