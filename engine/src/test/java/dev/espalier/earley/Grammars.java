package dev.espalier.earley;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import java.nio.charset.StandardCharsets;
import java.util.List;

/** Test helpers: grammars from ABNF text, charts fed with text. */
final class Grammars {

    private Grammars() {
    }

    /** Reads ABNF text (LF line ends are fine), checks it has no diagnostics, compiles it. */
    static EarleyGrammar abnf(String text) {
        AbnfResult r = Abnf.parse(text, "test.abnf");
        assertEquals(List.of(), r.diagnostics(), "ABNF diagnostics");
        return EarleyGrammar.compile(r.grammar());
    }

    /** A fresh chart fed all of {@code text}'s UTF-8 bytes, or null when a byte is refused. */
    static EarleyChart fed(EarleyGrammar g, String text) {
        EarleyChart c = g.newChart();
        byte[] b = text.getBytes(StandardCharsets.UTF_8);
        return c.feedAll(b) == b.length ? c : null;
    }

    /** Whether {@code text} is in the language. */
    static boolean accepts(EarleyGrammar g, String text) {
        EarleyChart c = fed(g, text);
        return c != null && c.accepts();
    }
}
