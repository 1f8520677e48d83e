package dev.espalier.lsp;

import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextDocumentContentChangeEvent;
import org.junit.jupiter.api.Test;

import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Positions and incremental changes. Positions count UTF-16 code units (the LSP's default position
 * encoding, LSP 3.17 "Position"); Java strings are UTF-16, so the oracle is plain {@code String}
 * indexing.
 */
class DocumentSnapshotTest {

    @Test
    void positionsCountUtf16UnitsAndEveryLineBreakKind() {
        // 🍎 (U+1F34E) is two UTF-16 code units
        DocumentSnapshot d = new DocumentSnapshot("file:///a.abnf", "abnf", 1, "a = \"🍎\" b\r\nc = d\re = f\n");
        assertEquals(new Position(0, 9), d.position(d.text().indexOf(" b") + 1));
        assertEquals(d.text().indexOf(" b") + 1, d.offset(new Position(0, 9)));
        assertEquals(new Position(1, 0), d.position(d.text().indexOf('c')));
        assertEquals(new Position(2, 4), d.position(d.text().indexOf('f')));
        assertEquals(4, d.lineCount());
        // past the end of a line: the end of that line (LSP 3.17 "Position"); past the last line: the end
        assertEquals(d.text().indexOf("\r\n"), d.offset(new Position(0, 99)));
        assertEquals(d.text().length(), d.offset(new Position(9, 0)));
    }

    @Test
    void incrementalChangesAgreeWithStringReplacementOnRandomEdits() {
        Random rnd = new Random(7);
        String alphabet = "ab=/ \n\r\"🍎;";
        DocumentSnapshot doc = new DocumentSnapshot("file:///r.abnf", "abnf", 0, "orchard = row\n");
        StringBuilder expected = new StringBuilder(doc.text());
        for (int v = 1; v <= 500; v++) {
            int a = rnd.nextInt(expected.length() + 1);
            int b = a + rnd.nextInt(expected.length() - a + 1);
            // never split a surrogate pair: editors do not
            if (a > 0 && a < expected.length() && Character.isLowSurrogate(expected.charAt(a))) {
                a--;
            }
            if (b > 0 && b < expected.length() && Character.isLowSurrogate(expected.charAt(b))) {
                b++;
            }
            StringBuilder ins = new StringBuilder();
            for (int k = rnd.nextInt(4); k > 0; k--) {
                int c = rnd.nextInt(alphabet.length());
                ins.append(alphabet.charAt(c));
                if (Character.isHighSurrogate(alphabet.charAt(c))) {
                    ins.append(alphabet.charAt(c + 1));
                }
            }
            Range r = new Range(doc.position(a), doc.position(b));
            // the position of an offset between \r and \n is that of the \r's line end; skip such edits
            if (doc.offset(r.getStart()) != a || doc.offset(r.getEnd()) != b) {
                continue;
            }
            doc = doc.apply(List.of(new TextDocumentContentChangeEvent(r, ins.toString())), v);
            expected.replace(a, b, ins.toString());
            assertEquals(expected.toString(), doc.text(), "after edit " + v);
            assertEquals(v, doc.version());
        }
    }

    @Test
    void aChangeWithoutRangeReplacesTheText() {
        DocumentSnapshot d = new DocumentSnapshot("file:///a.abnf", "abnf", 1, "a = b\n");
        d = d.apply(List.of(new TextDocumentContentChangeEvent("x = y\n"),
                new TextDocumentContentChangeEvent(new Range(new Position(0, 4), new Position(0, 5)), "z")), 2);
        assertEquals("x = z\n", d.text());
    }
}
