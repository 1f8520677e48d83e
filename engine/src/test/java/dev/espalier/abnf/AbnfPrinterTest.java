package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.strip;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dk.brics.automaton.Automaton;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** IR to ABNF text: reading the text back gives the same IR (spans aside), or the same language. */
class AbnfPrinterTest {

    /** The rules of a grammar without spans, in order, with the start rule: the span-insensitive IR. */
    static List<Object> shape(Grammar g) {
        List<Object> out = new ArrayList<>();
        out.add(Grammar.key(g.start()));
        for (Rule r : g.rules()) {
            out.add(r.name());
            out.add(strip(r.body()));
        }
        return out;
    }

    private static Grammar reread(String text) {
        AbnfResult r = Abnf.parse(text, "printed.abnf");
        assertTrue(r.diagnostics().stream().noneMatch(d -> d.code().equals("syntax")), () -> r.diagnostics() + "\n" + text);
        return r.grammar();
    }

    static String rfc5234Section4() throws IOException {
        try (InputStream in = AbnfPrinterTest.class.getResourceAsStream("rfc5234-section4.abnf")) {
            return new String(in.readAllBytes(), StandardCharsets.US_ASCII);
        }
    }

    @Test
    void rfc5234SectionFourRoundTrips() throws IOException {
        Grammar g = Abnf.parse(rfc5234Section4(), "rfc").grammar();
        String printed = AbnfPrinter.print(g);
        assertEquals(shape(g), shape(reread(printed)), printed);
        assertFalse(printed.contains("VCHAR  ") && printed.contains("VCHAR ="), "core rules are added back, not printed");
        assertFalse(printed.contains("HEXDIG ="), printed);
    }

    @Test
    void redefinedCoreRuleIsPrinted() {
        Grammar g = Abnf.parse("hex = 2HEXDIG\nDIGIT = %x30-37\n", "t").grammar();
        String printed = AbnfPrinter.print(g);
        assertTrue(printed.contains("DIGIT = %x30-37"), printed);
        assertEquals(shape(g), shape(reread(printed)));
    }

    @Test
    void literalForms() {
        // RFC 5234 §2.3 and RFC 7405: "..." is case-insensitive, %s"..." case-sensitive; dotted %x values
        Grammar g = Grammar.of(List.of(Rule.of("r", Expr.seq(
                new Expr.Text("Gala", true, dev.espalier.grammar.Span.NONE),
                Expr.text("M9"),
                Expr.text("\r\n"),
                Expr.text("say \"hi\""),
                Expr.chars(CodePointSet.range(0x30, 0x39)),
                Expr.chars(CodePointSet.of(0x1F333)),
                Expr.repeat(Expr.ref("r"), 0, 1),
                Expr.repeat(Expr.ref("r"), 2, 2),
                Expr.repeat(Expr.ref("r"), 1, Expr.UNBOUNDED),
                Expr.repeat(Expr.ref("r"), 0, 3)))), "r");
        String printed = AbnfPrinter.print(g);
        assertEquals("r = \"Gala\" %s\"M9\" %x0D.0A %x73.61.79.20.22.68.69.22 %x30-39 %x1F333 [r] 2r 1*r *3r\n", printed);
        assertEquals(shape(g), shape(reread(printed)));
    }

    @Test
    void startRuleIsPrintedFirst() {
        Grammar g = Grammar.of(List.of(Rule.of("row", Expr.text("r")), Rule.of("orchard", Expr.ref("row"))), "orchard");
        Grammar back = reread(AbnfPrinter.print(g));
        assertEquals("orchard", back.start());
    }

    private static Automaton language(Grammar g, String rule) {
        return CharAutomata.compile(g.rule(rule).orElseThrow().body(), n -> g.rule(n).map(Rule::body).orElse(null), 10_000);
    }

    @Test
    void formsAbnfCannotSpellKeepTheLanguage() {
        // compared as languages with dk.brics (subset both ways)
        List<Expr> bodies = List.of(
                Expr.seq(),
                Expr.seq(Expr.text("x")),
                Expr.choice(Expr.text("y")),
                Expr.chars(CodePointSet.ofRanges('a', 'f', '0', '9', 0xE9, 0xE9)),
                new Expr.Text("a\"b\nc", true, dev.espalier.grammar.Span.NONE),
                Expr.text("\t"),
                Expr.chars(CodePointSet.range(0xD800, 0xE005)),
                Expr.seq(Expr.text("q"), Expr.choice()),
                Expr.repeat(Expr.chars(CodePointSet.ofRanges('a', 'b', 'x', 'y')), 1, 2));
        for (Expr body : bodies) {
            Grammar g = Grammar.single("r", body);
            String printed = AbnfPrinter.print(g);
            Grammar back = Abnf.parse(printed, "t").grammar();
            Automaton a = language(g, "r");
            Automaton b = language(back, "r");
            assertTrue(a.subsetOf(b) && b.subsetOf(a), printed);
        }
    }

    @Test
    void randomIrRoundTrips() {
        Random rnd = new Random(20240611L);
        for (int round = 0; round < 400; round++) {
            int n = 1 + rnd.nextInt(4);
            List<Rule> rules = new ArrayList<>();
            for (int i = 0; i < n; i++) {
                rules.add(Rule.of((rnd.nextBoolean() ? "row-" : "Tree") + i, randomExpr(rnd, n, 4)));
            }
            Grammar g = Grammar.of(rules, rules.get(0).name());
            String printed = AbnfPrinter.print(g);
            assertEquals(shape(g), shape(reread(printed)), printed);
            assertEquals(printed, AbnfPrinter.format(printed, "p"), "printing is already in the canonical layout");
        }
    }

    @Test
    void deepNestingPrintsOnASmallStack() throws InterruptedException {
        // 900 nested groups: within the front end's nesting limit of 1000, printed without recursion
        Expr e = Expr.ref("leaf");
        for (int i = 0; i < 900; i++) {
            e = i % 2 == 0 ? Expr.seq(Expr.text("("), e) : Expr.choice(e, Expr.text("x"));
        }
        Grammar g = Grammar.of(List.of(Rule.of("deep", e), Rule.of("leaf", Expr.text("z"))), "deep");
        String[] printed = new String[1];
        Thread t = new Thread(null, () -> printed[0] = AbnfPrinter.print(g), "small", 256 * 1024);
        t.start();
        t.join();
        assertEquals(shape(g), shape(reread(printed[0])));
    }

    private static final String QUOTABLE = "aZ09 -_.,!#~éÄ中🌳";
    private static final int[] ANY = {'a', 'Q', '7', '"', '\t', '\n', '\r', ' ', 0x7F, 0xA0, 0xE9, 0x4E2D, 0x1F333, 0x10FFFF, 0};

    /** Random IR in the forms the ABNF front end produces. */
    private static Expr randomExpr(Random rnd, int rules, int depth) {
        int kind = depth == 0 ? rnd.nextInt(4) : rnd.nextInt(7);
        switch (kind) {
            case 0: {
                StringBuilder sb = new StringBuilder();
                int len = rnd.nextInt(4);
                for (int i = 0; i < len; i++) {
                    sb.appendCodePoint(QUOTABLE.codePointAt(QUOTABLE.offsetByCodePoints(0, rnd.nextInt(QUOTABLE.codePointCount(0, QUOTABLE.length())))));
                }
                return new Expr.Text(sb.toString(), true, dev.espalier.grammar.Span.NONE);
            }
            case 1: {
                StringBuilder sb = new StringBuilder();
                boolean quotableOnly = rnd.nextBoolean();
                int len = quotableOnly ? rnd.nextInt(4) : 2 + rnd.nextInt(3);
                for (int i = 0; i < len; i++) {
                    if (quotableOnly) {
                        sb.appendCodePoint(QUOTABLE.codePointAt(QUOTABLE.offsetByCodePoints(0, rnd.nextInt(QUOTABLE.codePointCount(0, QUOTABLE.length())))));
                    } else {
                        sb.appendCodePoint(ANY[rnd.nextInt(ANY.length)]);
                    }
                }
                return Expr.text(sb.toString());
            }
            case 2: {
                int lo = ANY[rnd.nextInt(ANY.length)];
                int hi = rnd.nextBoolean() ? lo : Math.max(lo, ANY[rnd.nextInt(ANY.length)]);
                return Expr.chars(CodePointSet.range(lo, hi));
            }
            case 3:
                return Expr.ref((rnd.nextBoolean() ? "row-" : "Tree") + rnd.nextInt(rules));
            case 4: {
                List<Expr> items = new ArrayList<>();
                for (int i = 2 + rnd.nextInt(2); i > 0; i--) {
                    items.add(randomExpr(rnd, rules, depth - 1));
                }
                return new Expr.Seq(items, dev.espalier.grammar.Span.NONE);
            }
            case 5: {
                List<Expr> options = new ArrayList<>();
                for (int i = 2 + rnd.nextInt(2); i > 0; i--) {
                    options.add(randomExpr(rnd, rules, depth - 1));
                }
                return new Expr.Choice(options, dev.espalier.grammar.Span.NONE);
            }
            default: {
                int min = rnd.nextInt(3);
                int max = switch (rnd.nextInt(4)) {
                    case 0 -> Expr.UNBOUNDED;
                    case 1 -> min;
                    case 2 -> 1;
                    default -> min + rnd.nextInt(5);
                };
                if (max != Expr.UNBOUNDED && max < min) {
                    max = min;
                }
                return Expr.repeat(randomExpr(rnd, rules, depth - 1), min, max);
            }
        }
    }
}
