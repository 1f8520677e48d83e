package dev.espalier.abnf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Span;
import java.util.List;

/** Test helpers: IR without source positions, so that two spellings of one rule compare equal. */
final class IrShapes {

    private IrShapes() {
    }

    static Expr strip(Expr e) {
        if (e instanceof Expr.Seq s) {
            return new Expr.Seq(s.items().stream().map(IrShapes::strip).toList(), Span.NONE);
        } else if (e instanceof Expr.Choice c) {
            return new Expr.Choice(c.options().stream().map(IrShapes::strip).toList(), Span.NONE);
        } else if (e instanceof Expr.Repeat r) {
            return new Expr.Repeat(strip(r.body()), r.min(), r.max(), Span.NONE);
        } else if (e instanceof Expr.Chars c) {
            return new Expr.Chars(c.set(), Span.NONE);
        } else if (e instanceof Expr.Text t) {
            return new Expr.Text(t.text(), t.ignoreCase(), Span.NONE);
        }
        return new Expr.Ref(((Expr.Ref) e).name(), Span.NONE);
    }

    /** Reads {@code text}, asserts it has no diagnostics, returns the body of {@code rule} without spans. */
    static Expr body(String text, String rule) {
        AbnfResult r = Abnf.parse(text, "test.abnf");
        assertEquals(List.of(), r.diagnostics(), () -> "diagnostics for:\n" + text);
        return strip(r.grammar().rule(rule).orElseThrow().body());
    }

    /** The only diagnostic with {@code code}; fails unless there is exactly one. */
    static Diagnostic only(AbnfResult r, String code) {
        List<Diagnostic> ds = r.diagnostics().stream().filter(d -> d.code().equals(code)).toList();
        assertEquals(1, ds.size(), () -> "expected one " + code + " in " + r.diagnostics());
        return ds.get(0);
    }

    /** Asserts that {@code d} covers exactly {@code fragment}, found at its {@code nth} occurrence in {@code text}. */
    static void assertCovers(String text, String fragment, int nth, Span span) {
        int at = -1;
        for (int i = 0; i <= nth; i++) {
            at = text.indexOf(fragment, at + 1);
            assertTrue(at >= 0, "fragment not in text: " + fragment);
        }
        assertEquals(at, span.start(), () -> "start of " + fragment + " in " + span);
        assertEquals(at + fragment.length(), span.end(), () -> "end of " + fragment + " in " + span);
        // line and column recounted independently: lines end at \n (the samples use LF or CRLF)
        int line = 1;
        int lineStart = 0;
        for (int i = 0; i < at; i++) {
            if (text.charAt(i) == '\n') {
                line++;
                lineStart = i + 1;
            }
        }
        assertEquals(line, span.line(), () -> "line of " + fragment);
        assertEquals(at - lineStart + 1, span.column(), () -> "column of " + fragment);
    }
}
