package dev.espalier.abnf;

import static dev.espalier.abnf.AbnfPrinterTest.shape;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Diagnostic;
import java.io.IOException;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The canonical layout: idempotent, keeps the IR and the findings, keeps comments where they belong. */
class AbnfFormatTest {

    static final String TABS_AND_INCREMENTS = String.join("\n",
            ";@use \"rootstocks.abnf\"   ",
            "; work orders of the nursery",
            "",
            "",
            "",
            "order\t=\tid SP action\t; what to do",
            "\t\t[SP  note]",
            "action =\t\"prune\"/\"graft\" ",
            "action =/ \"inspect\"",
            "  ; indented note under action",
            "",
            "id=%s\"WO-\"4DIGIT",
            "note = DQUOTE *( %x20-21 / %x23-7E ) DQUOTE",
            "");

    static final String CRLF_AND_LONG = String.join("\r\n",
            "; inspection report",
            "report = header *(CRLF finding) [CRLF]",
            "header = \"inspected\" SP date SP \"block\" SP 1*3DIGIT SP \"rows\" SP 1*3DIGIT \"-\" 1*3DIGIT SP \"by\" SP inspector SP \"weather\" SP weather",
            "finding = \"scab\" / \"canker\" / \"aphids\" / \"fire blight\" / \"powdery mildew\" / \"codling moth\" / \"woolly aphid\" / \"bitter pit\" / \"frost damage\" / \"hail damage\"",
            "date = 4DIGIT \"-\" 2DIGIT \"-\" 2DIGIT",
            "inspector = 1*ALPHA",
            "weather = \"dry\" / \"wet\"",
            "");

    static final String COMMENTS_INSIDE = String.join("\n",
            "   tree   =   variety",
            "              ; the variety first",
            "              \"/\" rootstock   ; then the rootstock",
            "",
            "              / \"unknown\"",
            "   variety   = \"Gala\" / \"Elstar\" ; common ones",
            "               / %s\"Cox's Orange\"",
            "   rootstock = \"M9\"",
            "             ; dwarfing",
            "             / \"M26\"",
            "             ; semi-dwarfing",
            "; end of file",
            "");

    static final String ODD_PLACES = String.join("\n",
            "graft ; a comment after the name",
            "  = date",
            "  ; a full line before the first element",
            "  sep scion",
            "date = 8DIGIT",
            "sep = ( ; inside a group",
            "   \"/\"",
            "   ; and before its end",
            "   )",
            "scion = 1*( ALPHA",
            "    / DIGIT )    \t",
            "spare = <not enforced>",
            "   ",
            "   ",
            "");

    static final List<String> MESSY = List.of(TABS_AND_INCREMENTS, CRLF_AND_LONG, COMMENTS_INSIDE, ODD_PLACES);

    @Test
    void idempotentAndKeepsTheIr() throws IOException {
        List<String> all = new java.util.ArrayList<>(MESSY);
        all.add(AbnfPrinterTest.rfc5234Section4());
        for (String text : all) {
            AbnfPrinter.Formatted f = AbnfPrinter.layout(text, "messy.abnf");
            assertTrue(f.applied(), text);
            String once = f.text();
            assertEquals(once, AbnfPrinter.format(once, "messy.abnf"), "idempotent:\n" + once);
            AbnfResult before = Abnf.parse(text, "messy.abnf");
            AbnfResult after = Abnf.parse(once, "messy.abnf");
            assertEquals(shape(before.grammar()), shape(after.grammar()), once);
            assertEquals(before.diagnostics().stream().map(Diagnostic::code).toList(),
                    after.diagnostics().stream().map(Diagnostic::code).toList(), once);
            assertEquals(comments(text), comments(once), "every comment kept, in order");
        }
    }

    /** The comments of a text in order, without trailing white space (ABNF comments run to the line end, RFC 5234 §4). */
    private static List<String> comments(String text) {
        List<String> out = new java.util.ArrayList<>();
        for (String line : text.split("\r\n|\r|\n")) {
            boolean inString = false;
            for (int i = 0; i < line.length(); i++) {
                char c = line.charAt(i);
                if (c == '"') {
                    inString = !inString;
                } else if (c == ';' && !inString) {
                    out.add(line.substring(i).stripTrailing());
                    break;
                }
            }
        }
        return out;
    }

    @Test
    void definedAsAlignedPerBlock() {
        String out = AbnfPrinter.format(TABS_AND_INCREMENTS, "t");
        assertEquals(String.join("\n",
                ";@use \"rootstocks.abnf\"",
                "; work orders of the nursery",
                "",
                "order  =  id SP action ; what to do",
                "          [SP note]",
                "action =  \"prune\" / \"graft\"",
                "action =/ \"inspect\"",
                "          ; indented note under action",
                "",
                "id   = %s\"WO-\" 4DIGIT",
                "note = DQUOTE *(%x20-21 / %x23-7E) DQUOTE",
                ""), out);
    }

    @Test
    void crlfKeptAndLongAlternativesWrapped() {
        String out = AbnfPrinter.format(CRLF_AND_LONG, "t");
        assertFalse(out.replace("\r\n", "").contains("\n"), "CRLF throughout");
        for (String line : out.split("\r\n")) {
            assertTrue(line.length() <= AbnfPrinter.WIDTH, line);
        }
        String[] lines = out.split("\r\n");
        int finding = java.util.Arrays.asList(lines).indexOf(java.util.Arrays.stream(lines)
                .filter(l -> l.startsWith("finding")).findFirst().orElseThrow());
        int col = lines[finding].indexOf("\"scab\"");
        assertTrue(lines[finding + 1].startsWith(" ".repeat(col) + "/ "), "continuation under the first element:\n" + out);
    }

    @Test
    void commentsStayWithTheirElements() {
        String out = AbnfPrinter.format(COMMENTS_INSIDE, "t");
        assertEquals(String.join("\n",
                "tree      = variety",
                "            ; the variety first",
                "            \"/\" rootstock ; then the rootstock",
                "            / \"unknown\"",
                "variety   = \"Gala\" / \"Elstar\" ; common ones",
                "            / %s\"Cox's Orange\"",
                "rootstock = \"M9\"",
                "            ; dwarfing",
                "            / \"M26\"",
                "            ; semi-dwarfing",
                "; end of file",
                ""), out);
    }

    @Test
    void syntaxErrorsLeaveTheTextAlone() {
        String text = "tree = variety /\n  = oops\n\n\n";
        AbnfPrinter.Formatted f = AbnfPrinter.layout(text, "t");
        assertFalse(f.applied());
        assertEquals(text, f.text());
        assertTrue(f.diagnostics().stream().anyMatch(d -> d.code().equals("syntax")));
    }

    @Test
    void otherErrorsStillFormat() {
        // duplicate definitions and prose values are findings about meaning, not layout
        String text = "a=\"x\"\na=\"y\"\nb=<words>\n";
        AbnfPrinter.Formatted f = AbnfPrinter.layout(text, "t");
        assertTrue(f.applied());
        assertEquals("a = \"x\"\na = \"y\"\nb = <words>\n", f.text());
    }

    @Test
    void emptyAndCommentOnlyFiles() {
        assertEquals("", AbnfPrinter.format("", "t"));
        assertEquals("", AbnfPrinter.format("\n\n  \n", "t"));
        assertEquals("; nothing yet\n", AbnfPrinter.format("\n; nothing yet   \n\n", "t"));
    }
}
