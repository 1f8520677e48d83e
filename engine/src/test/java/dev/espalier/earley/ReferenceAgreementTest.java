package dev.espalier.earley;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.Set;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;

/**
 * Recognition and the viable-prefix property against {@link NaiveLanguage}, the textbook
 * least-fixpoint reading of the grammar, over every byte string up to a length.
 */
class ReferenceAgreementTest {


    /**
     * Walks every byte string over {@code alphabet} up to {@code maxLen} bytes with one chart (feed
     * and undo), checking each byte's verdict against the prefixes of the reference's words up to
     * {@code wordLen} bytes (enough when every viable prefix of the test grammars completes within
     * {@code wordLen - maxLen} more bytes) and each string's acceptance against the words.
     */
    private static int check(Grammar ir, int[] alphabet, String label, int maxLen, int wordLen) {
        return check(ir, alphabet, label, maxLen, wordLen, true);
    }

    /**
     * As above; with {@code strict} false, a byte the chart accepts but whose string is no prefix of
     * a reference word up to {@code wordLen} is not counted as a failure (its shortest completion may
     * be longer), while a refused byte must still start no reference word.
     */
    private static int check(Grammar ir, int[] alphabet, String label, int maxLen, int wordLen, boolean strict) {
        EarleyGrammar g = EarleyGrammar.compile(ir);
        Set<String> words = NaiveLanguage.of(ir, wordLen);
        Set<String> viable = NaiveLanguage.prefixes(words);
        EarleyChart c = g.newChart();
        StringBuilder s = new StringBuilder();
        int[] next = new int[maxLen + 1];
        int checked = 0;
        assertEquals(words.contains(""), c.accepts(), label + ": empty string");
        while (true) {
            int d = s.length();
            if (d < maxLen && next[d] < alphabet.length) {
                int b = alphabet[next[d]++];
                String t = s.toString() + (char) b;
                boolean ok = c.feed(b);
                checked++;
                if (strict || !ok) {
                    assertEquals(viable.contains(t), ok, label + ": viable prefix " + show(t));
                }
                if (ok) {
                    assertEquals(words.contains(t), c.accepts(), label + ": accepts " + show(t));
                    s.append((char) b);
                    next[d + 1] = 0;
                }
            } else {
                if (d == 0) {
                    break;
                }
                c.undo(1);
                s.setLength(d - 1);
            }
        }
        return checked;
    }

    private static String show(String bytes) {
        StringBuilder sb = new StringBuilder("\"");
        for (char ch : bytes.toCharArray()) {
            sb.append(ch >= 0x20 && ch < 0x7F ? String.valueOf(ch) : String.format("\\x%02X", (int) ch));
        }
        return sb.append('"').toString();
    }

    private static Grammar abnf(String text) {
        AbnfResult r = Abnf.parse(text, "t.abnf");
        assertEquals(List.of(), r.diagnostics());
        return r.grammar();
    }

    @Test
    void fixedGrammarsAgreeWithTheReference() {
        int[] ab = {'a', 'b', 'c'};
        // %s: case-sensitive strings (RFC 7405), so the alphabet stays small
        String[] grammars = {
            "s = %s\"a\" s %s\"b\" / %s\"\"\n",                       // a^n b^n
            "s = %s\"a\" s %s\"a\" / %s\"b\" s %s\"b\" / %s\"a\" / %s\"b\" / %s\"\"\n", // palindromes
            "s = s %s\"a\" / %s\"b\"\n",                             // left recursion
            "s = %s\"a\" s / %s\"b\"\n",                             // right recursion
            "s = *x %s\"c\"\nx = [%s\"a\"] [%s\"b\"]\n",               // nullable loop
            "s = 2*3(%s\"ab\" / %s\"a\") *%s\"c\"\n",                   // bounded repetition
            "s = %i\"aB\" / 1*2%x61-62 \"c\"\n",                // case-insensitive text (A and b)
            "s = s s / %s\"a\" / %s\"\"\n",                          // highly ambiguous with nullable
            "s = a b\na = %s\"a\" a / %s\"\"\nb = b %s\"b\" / %s\"c\"\n",
        };
        for (String text : grammars) {
            int[] alpha = text.contains("%i") ? new int[] {'a', 'A', 'b', 'B', 'c'} : ab;
            check(abnf(text), alpha, text.trim(), 6, 12);
        }
    }

    @Test
    void multiByteCharactersAgreeWithTheReference() {
        // %x E9 is U+00E9 (UTF-8 C3 A9, RFC 3629), %x 20AC is U+20AC (E2 82 AC)
        Grammar g = abnf("s = 1*(%xE9 / %x20AC / \"a\")\n");
        check(g, new int[] {'a', 0xC3, 0xA9, 0xE2, 0x82, 0xAC}, "utf-8", 6, 10);
    }

    @Test
    void randomGrammarsAgreeWithTheReference() {
        Random rnd = new Random(20240611L);
        int total = 0;
        for (int round = 0; round < 150; round++) {
            List<Rule> rules = new ArrayList<>();
            for (int r = 0; r < 3; r++) {
                rules.add(Rule.of("r" + r, randomExpr(rnd, 3)));
            }
            Grammar g = Grammar.of(rules, "r0");
            total += check(g, new int[] {'a', 'b', 0xC3, 0xA9}, "random grammar " + round + ": " + describe(g), 5, 9, false);
        }
        assertEquals(true, total > 1000, "checked " + total + " strings");
    }

    private static String describe(Grammar g) {
        StringBuilder sb = new StringBuilder();
        for (Rule r : g.rules()) {
            sb.append(r.name()).append(" = ").append(r.body()).append("; ");
        }
        return sb.toString();
    }

    private static Expr randomExpr(Random rnd, int depth) {
        int k = depth == 0 ? rnd.nextInt(4) : rnd.nextInt(8);
        switch (k) {
            case 0:
                return Expr.text(new String[] {"a", "b", "ab", "", "\u00e9"}[rnd.nextInt(5)]);
            case 1:
                return Expr.chars(rnd.nextBoolean() ? CodePointSet.range('a', 'b') : CodePointSet.ofRanges('b', 'b', 0xE9, 0xE9));
            case 2:
            case 3:
                return Expr.ref("r" + rnd.nextInt(3));
            case 4:
            case 5: {
                Expr[] items = new Expr[1 + rnd.nextInt(3)];
                for (int i = 0; i < items.length; i++) {
                    items[i] = randomExpr(rnd, depth - 1);
                }
                return Expr.seq(items);
            }
            case 6: {
                Expr[] opts = new Expr[1 + rnd.nextInt(3)];
                for (int i = 0; i < opts.length; i++) {
                    opts[i] = randomExpr(rnd, depth - 1);
                }
                return Expr.choice(opts);
            }
            default: {
                int min = rnd.nextInt(3);
                int max = rnd.nextInt(3) == 0 ? Expr.UNBOUNDED : min + rnd.nextInt(3);
                return Expr.repeat(randomExpr(rnd, depth - 1), min, max);
            }
        }
    }

    @Test
    void alphabetOfReferenceIsWhatTheGrammarUses() {
        // guard for the test itself: the reference sees the same bytes the chart is fed
        Set<String> words = new TreeSet<>(NaiveLanguage.of(abnf("s = %xE9\n"), 4));
        assertEquals(Set.of("\u00c3\u00a9"), words);
    }
}
