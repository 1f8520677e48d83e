package dev.espalier.library;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Grammar;
import java.nio.charset.StandardCharsets;
import java.time.DateTimeException;
import java.time.YearMonth;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * The RFC 3339 grammar ({@code grammars/date-time.abnf}) against
 * {@link DateTimeFormatter#ISO_OFFSET_DATE_TIME} (java.time, strict resolver) on generated
 * timestamps, valid ones and mutations of them.
 *
 * <p>Known differences, excluded from the comparison by {@link #knownDifference(String)} and
 * counted (each is a fact of RFC 3339 or of the java.time documentation, and each is shown on an
 * example in {@link #theKnownDifferencesAreReal()}). Lower-case {@code t} and {@code z}, which the
 * RFC 3339 section 5.6 NOTE allows, are no difference: the ISO formatters parse case-insensitively.
 * <ul>
 *   <li>leap second {@code :60}: RFC 3339 section 5.6/5.7 allows it; java.time's second-of-minute
 *       is 0-59;</li>
 *   <li>offset hours beyond 18: the grammar's time-hour allows up to 23; java.time's
 *       {@code ZoneOffset} is limited to -18:00..+18:00;</li>
 *   <li>dates invalid for their month (31 April, 30 February, 29 February of a common year): the
 *       grammar checks day 01-31 only (RFC 3339 section 5.7 restrictions are not syntax); java.time
 *       with the strict resolver rejects them;</li>
 *   <li>more than nine fraction digits: RFC 3339 allows any number (1*DIGIT); java.time keeps
 *       nanoseconds, at most nine digits;</li>
 *   <li>java.time accepts forms RFC 3339 lacks: a missing seconds field ({@code 10:00Z}), offset
 *       seconds ({@code +01:00:30}), and years beyond four digits with a sign.</li>
 * </ul>
 */
class DateTimeTest {

    private static final Grammar DATE_TIME = GrammarLibrary.load("date-time").grammar();

    /** A loose shape of timestamps, only to classify the known differences. */
    private static final Pattern SHAPE = Pattern.compile(
            "(\\d{4})-(\\d{2})-(\\d{2})([Tt])(\\d{2}):(\\d{2})(?::(\\d{2}))?(?:\\.(\\d+))?([Zz]|[+-](\\d{2}):(\\d{2})(:\\d{2})?)");

    private static boolean grammarAccepts(String s) {
        return LibraryHarness.accepts(DATE_TIME, s.getBytes(StandardCharsets.UTF_8));
    }

    private static boolean javaTimeAccepts(String s) {
        try {
            DateTimeFormatter.ISO_OFFSET_DATE_TIME.parse(s);
            return true;
        } catch (DateTimeException e) {
            return false;
        }
    }

    /** The name of the known difference that applies to this text, or null. */
    static String knownDifference(String s) {
        if (s.startsWith("+") || s.startsWith("-") || s.matches("\\d{5,}-.*")) {
            return "long or signed year";
        }
        Matcher m = SHAPE.matcher(s);
        if (!m.matches()) {
            return null;
        }
        if (m.group(7) == null) {
            return "no seconds";
        }
        if (m.group(12) != null) {
            return "offset seconds";
        }
        int month = Integer.parseInt(m.group(2));
        int day = Integer.parseInt(m.group(3));
        if (month < 1 || month > 12 || day < 1 || day > 31) {
            return null; // both reject
        }
        if (m.group(7).equals("60")) {
            return "leap second";
        }
        if (m.group(8) != null && m.group(8).length() > 9) {
            return "more than nine fraction digits";
        }
        if (m.group(10) != null && Integer.parseInt(m.group(10)) <= 23 && Integer.parseInt(m.group(11)) <= 59
                && (Integer.parseInt(m.group(10)) > 18 || (Integer.parseInt(m.group(10)) == 18 && !m.group(11).equals("00")))) {
            return "offset beyond 18 hours";
        }
        if (day > YearMonth.of(Integer.parseInt(m.group(1)), month).lengthOfMonth()) {
            return "day beyond the month's length";
        }
        return null;
    }

    private static String two(int v) {
        return String.format("%02d", v);
    }

    private static String timestamp(Random rnd) {
        StringBuilder s = new StringBuilder();
        s.append(String.format("%04d", rnd.nextInt(10000))).append('-')
                .append(two(1 + rnd.nextInt(12))).append('-').append(two(1 + rnd.nextInt(rnd.nextInt(8) == 0 ? 31 : 28)))
                .append(rnd.nextInt(20) == 0 ? 't' : 'T')
                .append(two(rnd.nextInt(24))).append(':').append(two(rnd.nextInt(60))).append(':')
                .append(two(rnd.nextInt(30) == 0 ? 60 : rnd.nextInt(60)));
        if (rnd.nextInt(3) == 0) {
            s.append('.').append(String.valueOf(rnd.nextLong() & Long.MAX_VALUE), 0, 1 + rnd.nextInt(12));
        }
        switch (rnd.nextInt(4)) {
            case 0 -> s.append(rnd.nextInt(10) == 0 ? 'z' : 'Z');
            default -> s.append(rnd.nextBoolean() ? '+' : '-').append(two(rnd.nextInt(rnd.nextInt(6) == 0 ? 24 : 15)))
                    .append(':').append(two(rnd.nextInt(4) * 15));
        }
        return s.toString();
    }

    private static final String PIECES = "0123456789-:+.TtZz ,";

    private static String mutate(String s, Random rnd) {
        StringBuilder b = new StringBuilder(s);
        int at = rnd.nextInt(s.length());
        switch (rnd.nextInt(3)) {
            case 0 -> b.deleteCharAt(at);
            case 1 -> b.insert(at, PIECES.charAt(rnd.nextInt(PIECES.length())));
            default -> b.setCharAt(at, PIECES.charAt(rnd.nextInt(PIECES.length())));
        }
        return b.toString();
    }

    @Test
    void grammarAndJavaTimeAgreeApartFromTheKnownDifferences() {
        Random rnd = new Random(19850412);
        TreeMap<String, Integer> excluded = new TreeMap<>();
        List<String> disagreements = new ArrayList<>();
        int compared = 0;
        int accepted = 0;
        for (int i = 0; i < 2500; i++) {
            String valid = timestamp(rnd);
            for (String s : List.of(valid, mutate(valid, rnd))) {
                boolean grammar = grammarAccepts(s);
                String known = knownDifference(s);
                if (known != null) {
                    excluded.merge(known, 1, Integer::sum);
                    continue;
                }
                compared++;
                if (grammar) {
                    accepted++;
                }
                if (grammar != javaTimeAccepts(s)) {
                    disagreements.add((grammar ? "grammar only: " : "java.time only: ") + s);
                }
            }
        }
        System.out.printf("RFC 3339 vs java.time: 5000 timestamps, %d compared (%d accepted), excluded %s%n",
                compared, accepted, excluded);
        assertEquals(List.of(), disagreements.subList(0, Math.min(10, disagreements.size())));
        assertTrue(compared >= 3500 && accepted >= 1500 && compared - accepted >= 1000, compared + " / " + accepted);
    }

    /** Each known difference shows on one example, so the exclusions stay necessary and true. */
    @Test
    void theKnownDifferencesAreReal() {
        // RFC 3339 section 5.6 NOTE: "t" and "z" may be lower case; both accept them
        assertTrue(grammarAccepts("2025-04-12t10:00:00z") && javaTimeAccepts("2025-04-12t10:00:00z"));
        for (String s : List.of("1990-12-31T23:59:60Z", "2025-04-12T10:00:00+19:00",
                "2025-04-31T10:00:00Z", "2025-02-29T10:00:00Z", "2025-04-12T10:00:00.1234567891Z")) {
            assertTrue(grammarAccepts(s), s);
            assertFalse(javaTimeAccepts(s), s);
            assertTrue(knownDifference(s) != null, s);
        }
        for (String s : List.of("2025-04-12T10:00Z", "2025-04-12T10:00:00+01:00:30")) {
            assertFalse(grammarAccepts(s), s);
            assertTrue(javaTimeAccepts(s), s);
            assertTrue(knownDifference(s) != null, s);
        }
    }

    @Test
    void theRfc3339Section58ExamplesAreAccepted() {
        // RFC 3339 section 5.8
        for (String s : List.of("1985-04-12T23:20:50.52Z", "1996-12-19T16:39:57-08:00", "1990-12-31T23:59:60Z",
                "1990-12-31T15:59:60-08:00", "1937-01-01T12:00:27.87+00:20")) {
            assertTrue(grammarAccepts(s), s);
        }
    }
}
