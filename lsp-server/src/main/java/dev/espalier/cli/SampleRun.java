package dev.espalier.cli;

import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.mask.ByteSets;

import java.nio.charset.StandardCharsets;

/**
 * One input run through a grammar's Earley chart: accepted, or where it left the language and what
 * was expected there.
 *
 * @param accepted whether the whole input is a string of the language
 * @param offset   the first byte that leaves the language, or the input's length when the input is
 *                 a proper prefix of the language (or accepted)
 * @param message  a sentence for people ("" when accepted)
 * @param chart    the chart after the accepted bytes
 */
record SampleRun(boolean accepted, int offset, String message, EarleyChart chart) {

    static SampleRun of(EarleyGrammar grammar, byte[] input) {
        EarleyChart chart = grammar.newChart();
        int n = chart.feedAll(input);
        String expected = ByteSets.describe(chart.expectedByteSet(), chart.accepts());
        if (n < input.length) {
            return new SampleRun(false, n, "rejected at " + where(input, n) + ": found "
                    + ByteSets.show(input[n] & 0xFF) + ", expected " + expected, chart);
        }
        if (!chart.accepts()) {
            return new SampleRun(false, n, "incomplete: the input ends at " + where(input, n) + " where "
                    + expected + " must follow", chart);
        }
        return new SampleRun(true, n, "", chart);
    }

    /** {@code line L, column C (byte B)}; columns count characters. */
    static String where(byte[] input, int offset) {
        int line = 1;
        int lineStart = 0;
        for (int i = 0; i < offset; i++) {
            if (input[i] == '\n') {
                line++;
                lineStart = i + 1;
            }
        }
        int column = new String(input, lineStart, offset - lineStart, StandardCharsets.UTF_8).codePointCount(0,
                new String(input, lineStart, offset - lineStart, StandardCharsets.UTF_8).length()) + 1;
        return "line " + line + ", column " + column + " (byte " + offset + ")";
    }
}
