package dev.espalier.earley;

import static dev.espalier.earley.Grammars.abnf;
import static dev.espalier.earley.Grammars.accepts;
import static dev.espalier.earley.Grammars.fed;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigInteger;
import java.time.Duration;
import java.util.Optional;
import org.junit.jupiter.api.Test;

/** Derivation counts, cycles, nullable loops and ambiguity search. */
class ParseCountTest {

    /** Binomial coefficient by the multiplicative formula (independent of the parser). */
    private static BigInteger binomial(int n, int k) {
        BigInteger r = BigInteger.ONE;
        for (int i = 1; i <= k; i++) {
            r = r.multiply(BigInteger.valueOf(n - k + i)).divide(BigInteger.valueOf(i));
        }
        return r;
    }

    @Test
    void binaryBracketingsOfAnAreCatalanNumbers() {
        // Mathematical fact (Catalan numbers, e.g. Stanley, "Catalan Numbers", 2015): the number of
        // binary trees with n leaves is C(n-1) = binomial(2(n-1), n-1) / n, and the derivations of
        // a^n in S = S S / "a" are exactly those trees.
        EarleyGrammar g = abnf("S = S S / \"a\"\n");
        for (int n = 1; n <= 15; n++) {
            int m = n - 1;
            BigInteger catalan = binomial(2 * m, m).divide(BigInteger.valueOf(m + 1));
            ParseForest f = fed(g, "a".repeat(n)).forest();
            assertFalse(f.hasInfinitelyManyParses());
            assertEquals(catalan, f.parseCount(), "a^" + n);
        }
    }

    @Test
    void leftRecursiveListIsUnambiguous() {
        EarleyGrammar g = abnf("list = list \",\" item / item\nitem = 1*%x30-39\n");
        ParseForest f = fed(g, "1,22,333,4").forest();
        assertEquals(BigInteger.ONE, f.parseCount());
        // the tree shows only named rules: list nests to the left, four items
        String text = f.tree().toText();
        assertEquals(4, text.lines().filter(l -> l.trim().startsWith("item")).count(), text);
        assertTrue(text.startsWith("list [0,10)"), text);
    }

    @Test
    void repetitionsDoNotMultiplyCounts() {
        // "a" "b" with bounded and unbounded repetitions: one derivation each
        EarleyGrammar g = abnf("r = 2*5\"a\" *\"b\" 3\"c\" [\"d\"]\n");
        for (String s : new String[] {"aaccc", "aaaaabbbcccd", "aaabccc"}) {
            assertEquals(BigInteger.ONE, fed(g, s).forest().parseCount(), s);
        }
        // two unbounded repetitions of the same thing: n+1 ways to split a^n (common practice)
        EarleyGrammar two = abnf("r = *\"a\" *\"a\"\n");
        assertEquals(BigInteger.valueOf(6), fed(two, "aaaaa").forest().parseCount());
    }

    @Test
    void cycleGivesInfinitelyManyParses() {
        EarleyGrammar g = abnf("A = A / \"a\"\n");
        assertTrue(accepts(g, "a"));
        assertFalse(accepts(g, "aa"));
        ParseForest f = fed(g, "a").forest();
        assertTrue(f.hasInfinitelyManyParses());
        assertThrows(IllegalStateException.class, f::parseCount);
        // one finite derivation is still available
        assertEquals("A [0,1)\n  \"a\"\n", f.tree().toText());
    }

    @Test
    void nullableLoopRecognisesAndCountsAsInfinite() {
        // A = *B with B nullable: any number of empty iterations, so infinitely many derivations
        EarleyGrammar g = abnf("A = *B\nB = [ \"x\" ]\n");
        for (int n = 0; n <= 6; n++) {
            EarleyChart c = fed(g, "x".repeat(n));
            assertNotNull(c);
            assertTrue(c.accepts());
            assertTrue(c.forest().hasInfinitelyManyParses());
        }
        assertFalse(accepts(g, "y"));
    }

    @Test
    void emptyRuleAcceptsOnlyTheEmptyString() {
        EarleyGrammar g = abnf("e = \"\"\n");
        EarleyChart c = g.newChart();
        assertTrue(c.accepts());
        assertFalse(c.canContinue());
        assertFalse(c.feed('a'));
        assertEquals(BigInteger.ONE, c.forest().parseCount());
        assertEquals("e [0,0)\n", c.forest().tree().toText());
    }

    @Test
    void emptyLanguageAcceptsNothing() {
        // a rule that never terminates: its productions are removed, nothing is viable
        EarleyGrammar g = abnf("a = \"x\" a\n");
        assertTrue(g.isEmptyLanguage());
        EarleyChart c = g.newChart();
        assertFalse(c.accepts());
        assertFalse(c.canContinue());
        assertFalse(c.feed('x'));
    }

    @Test
    void unproductiveAlternativesArePruned() {
        // the dead alternative "y" d must not make "y" a viable prefix
        EarleyGrammar g = abnf("s = \"x\" / \"y\" d\nd = \"z\" d\n");
        EarleyChart c = g.newChart();
        assertTrue(c.allows('x'));
        assertFalse(c.allows('y'));
    }

    @Test
    void ambiguousExpressionGrammarShortestWitnessIsOnePlusOnePlusOne() {
        // E = E "+" E / "1": "1+1+1" has two bracketings, (1+1)+1 and 1+(1+1) (common practice:
        // the textbook example of an ambiguous grammar); no shorter string is ambiguous.
        EarleyGrammar g = abnf("E = E \"+\" E / \"1\"\n");
        Optional<Ambiguity> a = ParseForest.findAmbiguity(g, 8, Duration.ofSeconds(20));
        assertTrue(a.isPresent());
        assertEquals("1+1+1", a.get().text());
        assertNotEquals(a.get().first().toText(), a.get().second().toText());
        assertEquals(BigInteger.TWO, fed(g, "1+1+1").forest().parseCount());
    }

    @Test
    void unambiguousGrammarHasNoWitness() {
        EarleyGrammar g = abnf("E = T *(\"+\" T)\nT = \"1\" / \"(\" E \")\"\n");
        assertTrue(ParseForest.findAmbiguity(g, 7, Duration.ofSeconds(20)).isEmpty());
    }

    @Test
    void treeRendersAsJson() {
        EarleyGrammar g = abnf("pair = key \"=\" value\nkey = 1*%x61-7A\nvalue = 1*%x30-39\n");
        ParseTree t = fed(g, "row=12").forest().tree();
        assertEquals("{\"rule\":\"pair\",\"start\":0,\"end\":6,\"children\":["
                + "{\"rule\":\"key\",\"start\":0,\"end\":3,\"children\":[{\"text\":\"row\",\"start\":0,\"end\":3}]},"
                + "{\"text\":\"=\",\"start\":3,\"end\":4},"
                + "{\"rule\":\"value\",\"start\":4,\"end\":6,\"children\":[{\"text\":\"12\",\"start\":4,\"end\":6}]}]}",
                t.toJson());
    }
}
