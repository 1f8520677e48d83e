package dev.espalier.earley;

import static dev.espalier.earley.Grammars.abnf;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.charset.StandardCharsets;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestReporter;

/** Long inputs and exploding ambiguity stay within the limits: no stack overflow, no OutOfMemoryError. */
class StressTest {

    /** JSON text (RFC 8259 §2-7, rules from memory, simplified escapes). */
    static final String JSON = String.join("\n",
            "JSON-text = ws value ws",
            "value = object / array / string / number / %s\"true\" / %s\"false\" / %s\"null\"",
            "object = \"{\" ws [member *(ws \",\" ws member)] ws \"}\"",
            "member = string ws \":\" ws value",
            "array = \"[\" ws [value *(ws \",\" ws value)] ws \"]\"",
            "number = [\"-\"] int [frac] [exp]",
            "int = \"0\" / (%x31-39 *DIGIT)",
            "frac = \".\" 1*DIGIT",
            "exp = \"e\" [\"-\" / \"+\"] 1*DIGIT",
            "string = DQUOTE *char DQUOTE",
            "char = %x20-21 / %x23-5B / %x5D-10FFFF / \"\\\" (DQUOTE / \"\\\" / \"/\" / %s\"n\" / %s\"t\")",
            "ws = *(%x20 / %x09 / %x0A / %x0D)",
            "");

    /** About {@code size} bytes of orchard inspection reports as JSON. */
    static String reports(int size, long seed) {
        Random rnd = new Random(seed);
        String[] varieties = {"Gravenstein", "Belle de Boskoop", "Reine des Reinettes", "\u00d6lapfel", "Conference"};
        StringBuilder sb = new StringBuilder("[\n");
        int i = 0;
        while (sb.length() < size) {
            if (i > 0) {
                sb.append(",\n");
            }
            sb.append("  {\"tree\": ").append(1000 + i)
                    .append(", \"variety\": \"").append(varieties[rnd.nextInt(varieties.length)])
                    .append("\", \"rootstock\": \"M").append(rnd.nextInt(30))
                    .append("\", \"graft\": \"20").append(10 + rnd.nextInt(15)).append("-0").append(1 + rnd.nextInt(9))
                    .append("\", \"vigour\": ").append(rnd.nextInt(100)).append('.').append(rnd.nextInt(10))
                    .append(", \"notes\": [\"canker \\\"mild\\\"\", null, true, -").append(rnd.nextInt(5)).append("e-").append(rnd.nextInt(3))
                    .append("], \"rows\": [[1, 2], [], {}]}");
            i++;
        }
        return sb.append("\n]\n").toString();
    }

    @Test
    void hundredKilobytesOfJsonAreRecognised(TestReporter reporter) throws Exception {
        EarleyGrammar g = abnf(JSON);
        String text = reports(100_000, 1);
        // Jackson as an outside check that the input is JSON
        new ObjectMapper().readTree(text);
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        EarleyChart c = g.newChart();
        long t0 = System.nanoTime();
        assertEquals(bytes.length, c.feedAll(bytes));
        long t1 = System.nanoTime();
        assertTrue(c.accepts());
        assertTrue(c.itemCount() < EarleyGrammar.DEFAULT_MAX_ITEMS);
        reporter.publishEntry("bytes/s (informal)", String.valueOf((long) (bytes.length / ((t1 - t0) / 1e9))));
        reporter.publishEntry("items per byte", String.valueOf(c.itemCount() / bytes.length));
        // deep nesting: 50,000 nested arrays, no recursion in recognizing
        EarleyChart d = g.newChart();
        String deep = "[".repeat(50_000) + "]".repeat(50_000);
        assertEquals(100_000, d.feedAll(deep.getBytes(StandardCharsets.US_ASCII)));
        assertTrue(d.accepts());
        // a broken byte is refused where it occurs
        EarleyChart e = g.newChart();
        byte[] broken = text.replaceFirst("\"rootstock\"", "\"rootstock\" :: ").getBytes(StandardCharsets.UTF_8);
        int at = e.feedAll(broken);
        assertEquals(text.indexOf("\"rootstock\"") + "\"rootstock\" :".length(), at);
    }

    @Test
    void deeplyNestedParseTreeRendersWithoutRecursion() {
        EarleyGrammar g = abnf(JSON);
        String deep = "[".repeat(3000) + "]".repeat(3000);
        ParseTree t = Grammars.fed(g, deep).forest().tree();
        String json = t.toJson();
        assertTrue(json.startsWith("{\"rule\":\"JSON-text\""));
        assertEquals(6000, t.toText().lines().filter(l -> l.trim().startsWith("\"")).count());
    }

    @Test
    void explodingAmbiguityHitsTheItemLimit() {
        // S = S S / "a" has Catalan-many parses and a quadratic number of items
        EarleyGrammar g = abnf("S = S S / \"a\"\n");
        EarleyChart c = g.newChart(200_000, true);
        EarleyLimitException e = assertThrows(EarleyLimitException.class, () -> {
            for (int i = 0; i < 5000; i++) {
                c.feed('a');
            }
        });
        assertEquals(200_000, e.limit());
        // the chart is left as it was before the byte that crossed the limit
        assertEquals(e.position(), c.length());
        assertTrue(c.accepts());
        assertTrue(c.itemCount() <= 200_000);
        c.undo(10);
        assertTrue(c.feed('a'));
    }
}
