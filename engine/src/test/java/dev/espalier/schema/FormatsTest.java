package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.espalier.automaton.ByteDfa;
import dev.espalier.grammar.Rule;
import dk.brics.automaton.Automaton;
import java.io.InputStream;
import java.net.Inet4Address;
import java.net.InetAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.OffsetTime;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.UUID;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/** The format grammars against their standards' examples, java.time, java.util.UUID, java.net and the JSON Schema Test Suite. */
class FormatsTest {

    private static final Map<String, FragmentRecognizer> RECOGNIZERS = new HashMap<>();

    private static synchronized FragmentRecognizer format(String name) {
        return RECOGNIZERS.computeIfAbsent(name, n -> FragmentRecognizer.of(Formats.content("fmt", n).orElseThrow()));
    }

    private static void accepts(String format, String... texts) {
        for (String t : texts) {
            assertTrue(format(format).test(t), () -> format + " should accept " + t);
        }
    }

    private static void rejects(String format, String... texts) {
        for (String t : texts) {
            assertFalse(format(format).test(t), () -> format + " should reject " + t);
        }
    }

    @Test
    void namesAndUnknownFormats() {
        assertEquals(List.of("date-time", "date", "time", "duration", "email", "hostname", "ipv4", "ipv6", "uuid",
                "uri", "uri-reference", "json-pointer", "relative-json-pointer", "uri-template"),
                new ArrayList<>(Formats.names()));
        assertTrue(Formats.content("f", "color").isEmpty());
        assertTrue(Formats.content("f", "Date").isEmpty());
        assertTrue(Formats.automaton("color").isEmpty());
        for (String name : Formats.names()) {
            RegularFragment f = Formats.content("orchard-graft", name).orElseThrow();
            for (Rule r : f.rules()) {
                assertTrue(r.name().startsWith("orchard-graft-"), r.name());
            }
        }
    }

    /** The copies on the class path are the grammar library's files, byte for byte. */
    @Test
    void formatResourcesAreTheLibraryFiles() throws Exception {
        Path grammars = libraryFolder();
        for (String file : List.of("date-time.abnf", "ip-address.abnf", "uri.abnf")) {
            try (InputStream in = Formats.class.getResourceAsStream("formats/" + file)) {
                assertEquals(Files.readString(grammars.resolve(file), StandardCharsets.UTF_8),
                        new String(in.readAllBytes(), StandardCharsets.UTF_8), file + " differs from grammars/" + file);
            }
        }
    }

    /** Every format is regular and compiles to an automaton (the lexical layer needs this), agreeing with Earley. */
    @Test
    void everyFormatCompilesToAnAutomaton() throws Exception {
        for (String name : Formats.names()) {
            Automaton a = Formats.automaton(name).orElseThrow();
            ByteDfa bytes = ByteDfa.fromCharAutomaton(a, ByteDfa.DEFAULT_STATE_LIMIT);
            for (Case c : suite(name)) {
                assertEquals(format(name).test(c.data()), a.run(c.data()), () -> name + ": " + c.data());
                assertEquals(a.run(c.data()), bytes.matches(c.data().getBytes(StandardCharsets.UTF_8)),
                        () -> name + " (bytes): " + c.data());
            }
        }
    }

    /** RFC 6901 section 5 example pointers (from memory) and strings that are not pointers. */
    @Test
    void rfc6901Examples() {
        accepts("json-pointer", "", "/foo", "/foo/0", "/", "/a~1b", "/c%d", "/e^f", "/g|h", "/i\\j", "/k\"l", "/ ",
                "/m~0n", "/\u00e9t\u00e9/\uD83C\uDF4E", "/\u0000");
        rejects("json-pointer", "a", "/~", "/~2", "/a~", "#/foo");
    }

    /** Relative JSON pointers, draft-handrews-relative-json-pointer-01 section 5.1 examples (from memory). */
    @Test
    void relativeJsonPointerExamples() {
        accepts("relative-json-pointer", "0", "1/0", "2/highly/nested/objects", "0#", "1#", "0/objects", "120/foo/bar");
        rejects("relative-json-pointer", "", "/foo", "01/a", "01#", "0##", "-1/foo", "+1/foo", "#");
    }

    /** RFC 6570 section 1.2 and 3.2 example templates (from memory) and malformed ones. */
    @Test
    void rfc6570Examples() {
        accepts("uri-template", "", "http://example.com/~{username}/", "{var}", "{+path}/here", "{#x,hello,y}",
                "{;list*}", "{?keys*}", "{var:3}", "{.who,who}", "{/half,list*}", "X{&x,y,empty}", "{var:9999}",
                "map?{x,y}", "{%2Fx.y_1}", "caf\u00e9/{a}");
        rejects("uri-template", "{", "}", "{var", "{var:0}", "{var:10000}", "{ var}", "{$var}", "{var*:3}", "{}",
                "{a..b}", "http://example.com/dictionary/{term:1}/{term", "a b");
    }

    /** RFC 3339 section 5.8 examples (from memory) and section 5.6/5.7 rules. */
    @Test
    void rfc3339Examples() {
        accepts("date-time", "1985-04-12T23:20:50.52Z", "1996-12-19T16:39:57-08:00", "1990-12-31T23:59:60Z",
                "1937-01-01T12:00:27.87+00:20", "2024-02-29t08:00:00z");
        // 1990-12-31T15:59:60-08:00 (section 5.8) is the same leap second with an offset: refused here
        rejects("date-time", "1990-12-31T15:59:60-08:00", "2023-02-29T00:00:00Z", "1985-04-12T23:20:50.52",
                "1985-04-12 23:20:50Z", "1985-04-12T24:00:00Z");
        accepts("date", "1985-04-12", "2000-02-29", "1600-02-29", "2024-02-29", "0000-02-29");
        rejects("date", "1900-02-29", "2023-02-29", "2024-04-31", "2024-13-01", "2024-00-10", "85-04-12");
        accepts("time", "23:20:50.52Z", "16:39:57-08:00", "23:59:60Z", "23:59:60.5+00:00", "00:00:00-00:00");
        rejects("time", "23:20:50", "24:00:00Z", "23:58:60Z", "23:20:50+24:00", "15:59:60-08:00");
    }

    /** RFC 3339 Appendix A duration ABNF; the examples are ISO 8601's usual ones (from memory). */
    @Test
    void durations() {
        accepts("duration", "P3Y6M4DT12H30M5S", "P1W", "PT36H", "P0D", "P1M", "PT1M", "P1Y2M3D", "PT1H2M3S");
        rejects("duration", "P", "PT", "P1Y2D", "PT1H2S", "P1W1D", "P0.5D", "p1d", "P1D ", "-P1D", "P1DT");
    }

    /** RFC 5321 section 4.1.2 Mailbox and Appendix D addresses (from memory). */
    @Test
    void emails() {
        accepts("email", "Smith@bar.com", "Jones@foo.com", "graft.manager+rows@orchard.example",
                "a!#$%&'*+/=?^_`{|}~-@x.y", "tree@[192.0.2.1]", "tree@[IPv6:2001:db8::1]", "tree@[IPv6:::1]", "x@localhost",
                "tree@a--b.orchard.example", "tree@ab-c--d.example", "x--y@a-b", "xn--abc@orchard.example");
        rejects("email", "@orchard.example", "tree@", "tree..row@x.y", ".tree@x.y", "tree.@x.y",
                "tree@-orchard.example", "tree@orchard-.example", "tree@[192.0.2.256]", "tree@[192.0.2.01]", "tree@x_y.z",
                "tree@[tag:anything]", "tree row@x.y",
                // R-LDH domain labels, A-labels among them (RFC 5890 section 2.3.1, from memory), as in host names
                "tree@xn--abc.example", "tree@orchard.XN--ABC", "tree@ab--cd.orchard.example",
                // the tag as RFC 5321 section 4.1.3 writes it, not in other cases (stricter than RFC 5234's reading)
                "tree@[ipv6:::1]", "tree@[Ipv6:2001:db8::1]");
    }

    /**
     * RFC 5321 section 4.1.2 Quoted-string local parts (rules from memory): DQUOTE *QcontentSMTP
     * DQUOTE, where qtextSMTP is %d32-33 / %d35-91 / %d93-126 and quoted-pairSMTP is %d92 %d32-126.
     * The strings are decoded (raw) characters, as in the grammar.
     */
    @Test
    void quotedLocalParts() {
        accepts("email",
                "\"tree row\"@orchard.example", // space is qtextSMTP (%d32)
                "\"graft..row\"@orchard.example", // dots are qtextSMTP; Dot-string's rule does not apply
                "\"block@7\"@orchard.example", // "@" (%d64) is qtextSMTP inside the quotes
                "\"\"@orchard.example", // *QcontentSMTP: an empty quoted string
                "\"row \\\"B\\\" \\\\ 7\"@orchard.example", // quoted pairs of DQUOTE (%d34) and backslash (%d92)
                "\"\\ \\~\\a\"@orchard.example", // quoted-pairSMTP takes %d32 to %d126
                "\" !#[]~\"@[192.0.2.1]", // qtextSMTP's range ends: %d32-33, %d35 and %d91, %d93 and %d126
                "\"Tree.Row\"@x", "\"a\"@[IPv6:2001:db8::1]");
        rejects("email",
                "\"tree row@orchard.example", // no closing DQUOTE
                "\"tree\\\"@orchard.example", // the closing DQUOTE is quoted: still unterminated
                "\"tree\"row\"@orchard.example", // a bare DQUOTE (%d34) is not qtextSMTP
                "\"tree\\\"@x.y\"", // no "@" Domain after the quoted string
                "\"tree\\\"", "\"tree\"", "\"tree\"@", // no domain
                "\"tree\trow\"@orchard.example", // TAB (%d9) is neither qtextSMTP nor a quoted pair's second character
                "\"tree\\\trow\"@orchard.example", // quoted-pairSMTP: %d32-126 only
                "\"tree\u007frow\"@orchard.example", // DEL (%d127)
                "\"tree\u00e9\"@orchard.example", // RFC 5321 is ASCII (RFC 6531 widens it, for idn-email)
                "\"tree\".row@orchard.example", "tree.\"row\"@orchard.example", // Local-part is one or the other
                "tree\"row\"@orchard.example", "\"\"\"@orchard.example", "\"tree row\" @orchard.example");
    }

    /** RFC 1123 section 2.1 host names: a leading digit is allowed; labels of 1 to 63 characters. */
    @Test
    void hostnames() {
        accepts("hostname", "orchard.example", "3com.example", "a", "a-b.c", "x" + "y".repeat(61) + "z.example");
        rejects("hostname", "", "-orchard.example", "orchard-.example", "orchard..example", "orchard.example.",
                "x" + "y".repeat(62) + "z.example", "under_score.example", "orchard example");
    }

    /**
     * RFC 5890 section 2.3.1 (from memory): an LDH label whose third and fourth characters are both
     * "-" is an R-LDH label (reserved); A-labels ("xn--") are among them. Their Punycode is not
     * decoded, so every one is refused; hyphens elsewhere in a label are not affected.
     */
    @Test
    void hostnamesRefuseRldhLabels() {
        accepts("hostname",
                "a--b.example", "x--y", // hyphens in positions 2 and 3: not R-LDH
                "ab-c--d.example", "abc--d.orchard.example", // "--" later in the label
                "a-b", "ab-c.example", "ab-cd", "ab-c-d", // "-" third, a letter or digit fourth
                "xn-a.orchard.example", "xnab.example", // neither is an A-label
                "ab-" + "y".repeat(59) + "z.example", // 63 characters, third "-"
                "pear-row-7.nursery.orchard.example");
        rejects("hostname",
                "xn--abc.example", "XN--ABC.example", "orchard.xn--abc", "pear.xn--abc.orchard.example", // A-labels
                "ab--cd.example", "12--34.example", "ab---cd.example", "ab--c", // other R-LDH labels
                "ab--" + "y".repeat(58) + "z.example", // 63 characters, "--" third and fourth
                "ab-" + "y".repeat(60) + "z.example"); // 64 characters: the label limit is unchanged
    }

    /**
     * The host-name rule on every label over letters, digits and hyphens up to 7 characters (and
     * some of 60 to 65): RFC 1123 section 2.1 labels (letters, digits and hyphens, no hyphen first or
     * last, 1 to 63 characters) that are not R-LDH labels (RFC 5890 section 2.3.1, from memory). The
     * e-mail domain (RFC 5321 sub-domain, no length limit here) refuses the same R-LDH labels.
     */
    @Test
    void hostnameLabelsAgreeWithTheirDefinition() {
        Automaton host = Formats.automaton("hostname").orElseThrow();
        Automaton email = Formats.automaton("email").orElseThrow();
        List<String> labels = new ArrayList<>(List.of(""));
        for (int from = 0, length = 1; length <= 7; length++) {
            int to = labels.size();
            for (int k = from; k < to; k++) {
                for (char c : new char[] {'a', '7', '-'}) {
                    labels.add(labels.get(k) + c);
                }
            }
            from = to;
        }
        for (int length = 60; length <= 65; length++) {
            labels.add("ab" + "-".repeat(length - 3) + "c");
            labels.add("ab-" + "c".repeat(length - 3));
            labels.add("ab--" + "c".repeat(length - 4));
            labels.add("a" + "-".repeat(length - 2) + "b");
        }
        int refusedAsRldh = 0;
        for (String label : labels) {
            boolean ldh = LDH_LABEL.matcher(label).matches();
            boolean expected = ldh && !rldh(label);
            refusedAsRldh += ldh && rldh(label) ? 1 : 0;
            assertEquals(expected, host.run(label), label);
            assertEquals(expected, host.run("orchard." + label + ".example"), label);
            assertEquals(LDH_STRING.matcher(label).matches() && !rldh(label), email.run("grafts@nursery." + label),
                    label);
        }
        assertTrue(refusedAsRldh > 100, "too few R-LDH labels: " + refusedAsRldh);
    }

    /** RFC 9562 section 4 textual form, checked by a round trip through java.util.UUID on random values. */
    @Test
    void uuidsRoundTripThroughJavaUtilUuid() {
        Random random = new Random(0x5EED_3001L);
        for (int i = 0; i < 1000; i++) {
            UUID u = new UUID(random.nextLong(), random.nextLong());
            String lower = u.toString();
            accepts("uuid", lower, lower.toUpperCase());
            assertEquals(u, UUID.fromString(lower));
            // one character dropped, or a dash moved: not a UUID (java.util.UUID would still accept some of these)
            int at = random.nextInt(lower.length());
            rejects("uuid", lower.substring(0, at) + lower.substring(at + 1));
            rejects("uuid", lower.replaceFirst("-", "") + "-");
        }
        rejects("uuid", "1-2-3-4-5", "urn:uuid:00000000-0000-0000-0000-000000000000", "{00000000-0000-0000-0000-000000000000}");
    }

    /** Oracle: java.time (STRICT ISO formatters) on random near-valid dates; they agree exactly. */
    @Test
    void datesAgreeWithJavaTime() {
        Random random = new Random(0x5EED_3002L);
        int accepted = 0;
        for (int i = 0; i < 3000; i++) {
            String s = String.format("%04d-%02d-%02d", random.nextInt(10000), random.nextInt(14), random.nextInt(33));
            boolean java = parses(() -> LocalDate.parse(s, DateTimeFormatter.ISO_LOCAL_DATE));
            assertEquals(java, format("date").test(s), s);
            accepted += java ? 1 : 0;
        }
        // every 29 February of 2000 years (leap years: Gregorian rule, java.time)
        for (int y = 0; y < 2000; y++) {
            String s = String.format("%04d-02-29", y);
            assertEquals(LocalDate.of(y, 1, 1).isLeapYear(), format("date").test(s), s);
        }
        assertTrue(accepted > 1000, "too few valid dates: " + accepted);
    }

    /**
     * Oracle: java.time ISO_OFFSET_TIME / ISO_OFFSET_DATE_TIME on random near-valid times. Known
     * differences, kept out of the generated set: java.time accepts no leap second (second 60),
     * offsets only up to 18 hours, fractions only up to 9 digits, and times without seconds; RFC 3339
     * requires seconds and allows offset hours up to 23 and any fraction.
     */
    @Test
    void timesAgreeWithJavaTime() {
        Random random = new Random(0x5EED_3003L);
        int accepted = 0;
        for (int i = 0; i < 3000; i++) {
            String time = randomTime(random);
            boolean java = parses(() -> OffsetTime.parse(time, DateTimeFormatter.ISO_OFFSET_TIME));
            assertEquals(java, format("time").test(time), time);
            String dateTime = String.format("%04d-%02d-%02d", random.nextInt(10000), 1 + random.nextInt(12),
                    1 + random.nextInt(28)) + (random.nextInt(5) == 0 ? "t" : "T") + time;
            boolean javaDt = parses(() -> OffsetDateTime.parse(dateTime, DateTimeFormatter.ISO_OFFSET_DATE_TIME));
            assertEquals(javaDt, format("date-time").test(dateTime), dateTime);
            accepted += java ? 1 : 0;
        }
        assertTrue(accepted > 300, "too few valid times: " + accepted);
    }

    private static String randomTime(Random random) {
        StringBuilder sb = new StringBuilder(String.format("%02d:%02d:%02d", random.nextInt(26), random.nextInt(62),
                random.nextInt(60)));
        if (random.nextBoolean()) {
            sb.append('.');
            for (int k = 1 + random.nextInt(9); k > 0; k--) {
                sb.append(random.nextInt(10));
            }
        }
        switch (random.nextInt(4)) {
            case 0 -> sb.append('Z');
            case 1 -> sb.append('z');
            default -> {
                int[] hours = {0, 1, 5, 9, 12, 14, 17, 24, 25};
                sb.append(random.nextBoolean() ? '+' : '-')
                        .append(String.format("%02d:%02d", hours[random.nextInt(hours.length)], random.nextInt(62)));
            }
        }
        return sb.toString();
    }

    /**
     * Oracle: java.net.InetAddress, one way (it accepts forms RFC 3986 does not, such as shortened
     * IPv4): every accepted literal parses to the address written. The rejections follow RFC 3986
     * dec-octet: 0 to 255 without leading zeros.
     */
    @Test
    void ipv4AgreesWithInetAddress() throws Exception {
        Random random = new Random(0x5EED_3004L);
        for (int i = 0; i < 2000; i++) {
            int[] o = new int[4];
            StringBuilder sb = new StringBuilder();
            boolean valid = true;
            for (int k = 0; k < 4; k++) {
                o[k] = random.nextInt(10) == 0 ? 256 + random.nextInt(50) : random.nextInt(256);
                boolean padded = random.nextInt(12) == 0;
                valid &= o[k] <= 255 && !padded;
                sb.append(k > 0 ? "." : "").append(padded ? "0" : "").append(o[k]);
            }
            String s = sb.toString();
            assertEquals(valid, format("ipv4").test(s), s);
            if (valid) {
                assertEquals(s, InetAddress.getByName(s).getHostAddress());
            }
        }
    }

    /**
     * Oracle: java.net.InetAddress on random addresses, written in full (java's own text form) and
     * compressed with "::" (RFC 5952 section 4.2, from memory): both accepted, and the compressed
     * text parses back to the same address.
     */
    @Test
    void ipv6AgreesWithInetAddress() throws Exception {
        Random random = new Random(0x5EED_3005L);
        for (int i = 0; i < 1000; i++) {
            byte[] bytes = new byte[16];
            random.nextBytes(bytes);
            // runs of zero groups, so that "::" has something to compress
            int from = random.nextInt(8);
            int to = from + random.nextInt(9 - from);
            Arrays.fill(bytes, 2 * from, 2 * to, (byte) 0);
            String full = InetAddress.getByAddress(bytes).getHostAddress();
            String compressed = compress(bytes);
            accepts("ipv6", full, compressed);
            InetAddress back = InetAddress.getByName(compressed);
            byte[] got = back.getAddress();
            if (back instanceof Inet4Address) { // java maps ::ffff:a.b.c.d to IPv4
                assertEquals(Arrays.toString(Arrays.copyOfRange(bytes, 12, 16)), Arrays.toString(got), compressed);
            } else {
                assertEquals(Arrays.toString(bytes), Arrays.toString(got), compressed);
            }
        }
        rejects("ipv6", "1:2:3:4:5:6:7", "1::2::3", "12345::", "::g", "[::1]", "fe80::1%eth0", "1:2:3:4:5:6:7:8:9");
    }

    /** The longest run (at least two) of zero groups replaced by "::", leftmost on ties. */
    private static String compress(byte[] b) {
        int[] g = new int[8];
        for (int k = 0; k < 8; k++) {
            g[k] = ((b[2 * k] & 0xFF) << 8) | (b[2 * k + 1] & 0xFF);
        }
        int bestAt = -1;
        int bestLen = 1;
        for (int k = 0; k < 8; ) {
            if (g[k] != 0) {
                k++;
                continue;
            }
            int j = k;
            while (j < 8 && g[j] == 0) {
                j++;
            }
            if (j - k > bestLen) {
                bestLen = j - k;
                bestAt = k;
            }
            k = j;
        }
        StringBuilder sb = new StringBuilder();
        for (int k = 0; k < 8; k++) {
            if (k == bestAt) {
                sb.append("::");
                k += bestLen - 1;
                continue;
            }
            if (sb.length() > 0 && sb.charAt(sb.length() - 1) != ':') {
                sb.append(':');
            }
            sb.append(Integer.toHexString(g[k]));
        }
        return sb.toString();
    }

    /** RFC 3986 section 1.1.2 and 5.4.1 examples (from memory). */
    @Test
    void uris() {
        String[] absolute = {"ftp://ftp.is.co.za/rfc/rfc1808.txt", "http://www.ietf.org/rfc/rfc2396.txt",
            "ldap://[2001:db8::7]/c=GB?objectClass?one", "mailto:John.Doe@example.com",
            "news:comp.infosystems.www.servers.unix", "tel:+1-816-555-1212", "telnet://192.0.2.16:80/",
            "urn:oasis:names:specification:docbook:dtd:xml:4.1.2", "http://a/b/c/d;p?q", "g:h"};
        accepts("uri", absolute);
        accepts("uri-reference", absolute);
        String[] relative = {"g", "./g", "g/", "/g", "//g", "?y", "g?y", "#s", "g#s", "g?y#s", ";x", "g;x", "g;x?y#s",
            "", ".", "./", "..", "../", "../g", "../..", "../../", "../../g"};
        accepts("uri-reference", relative);
        rejects("uri", relative);
        rejects("uri-reference", "http://orchard.example/a b", "%zz", "1:b", "http://[::1", "\\\\orchard");
    }

    // ------------------------------------------------------------------ JSON Schema Test Suite

    /** One string instance of a format test file. */
    record Case(String description, String data, boolean valid) {
    }

    private static List<Case> suite(String format) throws Exception {
        try (InputStream in = FormatsTest.class.getResourceAsStream("suite-formats/" + format + ".json")) {
            JsonNode groups = new ObjectMapper().readTree(in);
            List<Case> cases = new ArrayList<>();
            for (JsonNode group : groups) {
                for (JsonNode t : group.get("tests")) {
                    if (t.get("data").isTextual()) {
                        cases.add(new Case(t.get("description").asText(), t.get("data").asText(), t.get("valid").asBoolean()));
                    }
                }
            }
            return cases;
        }
    }

    /**
     * The known disagreements with the JSON Schema Test Suite (draft 2020-12, optional/format), by
     * data, with the reason, except the hostname ones, which {@link #hostnameDifference} derives
     * from the data. Everything else must agree; this list must be exact (a disagreement that
     * disappears must be removed from it).
     */
    private static final Map<String, String> KNOWN = Map.ofEntries(
            Map.entry("date-time|1998-12-31T15:59:60.123-08:00", "stricter: leap second with a non-zero offset, refused"),
            Map.entry("time|01:29:60+01:30", "stricter: leap second with a non-zero offset, refused"),
            Map.entry("time|23:29:60+23:30", "stricter: leap second with a non-zero offset, refused"),
            Map.entry("time|15:59:60-08:00", "stricter: leap second with a non-zero offset, refused"),
            Map.entry("time|00:29:60-23:30", "stricter: leap second with a non-zero offset, refused"));

    /** An RFC 1123 section 2.1 label: letters, digits and hyphens, no hyphen first or last, 1 to 63 characters. */
    private static final Pattern LDH_LABEL = Pattern.compile("[A-Za-z0-9]([A-Za-z0-9-]{0,61}[A-Za-z0-9])?");

    /** An RFC 5321 section 4.1.2 sub-domain, Let-dig [Ldh-str]: the same without a length limit. */
    private static final Pattern LDH_STRING = Pattern.compile("[A-Za-z0-9]([A-Za-z0-9-]*[A-Za-z0-9])?");

    /** An R-LDH label (RFC 5890 section 2.3.1, from memory): "-" as both third and fourth character. */
    private static boolean rldh(String label) {
        return label.length() >= 4 && label.charAt(2) == '-' && label.charAt(3) == '-';
    }

    /**
     * Why a hostname case of the suite differs by design, decided from its data alone, or null when
     * it must agree. A valid name with an R-LDH label (in the suite these are A-labels, xn--) is
     * refused: the grammar refuses every R-LDH label, since it cannot decode Punycode (stricter). An
     * invalid name whose labels are all valid but which is longer than 253 characters (RFC 1034
     * section 3.1 allows 255 octets on the wire, 253 characters as text; from memory) is accepted
     * (weaker). Invalid names with an R-LDH label, A-labels whose Punycode or IDNA rules fail, agree:
     * they are refused.
     */
    private static String hostnameDifference(Case c) {
        List<String> labels = Arrays.asList(c.data().split("\\.", -1));
        boolean anyRldh = labels.stream().anyMatch(FormatsTest::rldh);
        if (c.valid() && anyRldh) {
            return "stricter: a valid name with an A-label, refused as an R-LDH label (Punycode is not decoded)";
        }
        if (!c.valid() && !anyRldh && c.data().length() > 253
                && labels.stream().allMatch(l -> LDH_LABEL.matcher(l).matches())) {
            return "weaker: valid labels but " + c.data().length() + " characters, accepted (total length not enforced)";
        }
        return null;
    }

    @Test
    void jsonSchemaTestSuiteFormats() throws Exception {
        Map<String, int[]> table = new TreeMap<>();
        List<String> unexpected = new ArrayList<>();
        Map<String, String> differences = new LinkedHashMap<>();
        Map<String, Integer> byKind = new TreeMap<>();
        for (String name : Formats.names()) {
            int agree = 0;
            int total = 0;
            for (Case c : suite(name)) {
                total++;
                boolean actual = format(name).test(c.data());
                String key = name + "|" + c.data();
                String reason = KNOWN.containsKey(key) ? KNOWN.get(key)
                        : name.equals("hostname") ? hostnameDifference(c) : null;
                if (actual == c.valid()) {
                    agree++;
                    if (reason != null) {
                        unexpected.add("expected to differ (" + reason + ") but agrees: " + key);
                    }
                } else if (reason == null) {
                    unexpected.add(name + ": " + c.description() + " (" + c.data() + ") expected " + c.valid());
                } else {
                    // a stricter difference refuses a valid case, a weaker one accepts an invalid case
                    assertEquals(c.valid() ? "stricter" : "weaker", reason.substring(0, reason.indexOf(':')), key);
                    differences.put(key, reason);
                    byKind.merge(name + " " + reason.substring(0, reason.indexOf(':')), 1, Integer::sum);
                }
            }
            table.put(name, new int[] {agree, total});
        }
        StringBuilder report = new StringBuilder("JSON Schema Test Suite, optional/format, string instances agreeing:");
        table.forEach((k, v) -> report.append(' ').append(k).append(' ').append(v[0]).append('/').append(v[1]));
        report.append("\ndifferences by design: ").append(byKind);
        differences.forEach((k, r) -> report.append("\n  ").append(k).append(": ").append(r));
        System.out.println(report);
        assertEquals(List.of(), unexpected);
        // every listed difference occurs in the suite (a stale entry would otherwise go unnoticed)
        assertTrue(differences.keySet().containsAll(KNOWN.keySet()), () -> "not in the suite: " + KNOWN.keySet());
        // the only weaker differences are hostname ones, which hostnameDifference limits to the total length
        assertTrue(byKind.keySet().stream().filter(k -> k.endsWith(" weaker"))
                .allMatch(k -> k.equals("hostname weaker")), byKind::toString);
        int agreeing = table.values().stream().mapToInt(a -> a[0]).sum();
        int cases = table.values().stream().mapToInt(a -> a[1]).sum();
        assertEquals(cases - differences.size(), agreeing);
    }

    // ------------------------------------------------------------------ helpers

    private static boolean parses(Runnable parse) {
        try {
            parse.run();
            return true;
        } catch (DateTimeParseException e) {
            return false;
        }
    }

    private static Path libraryFolder() {
        Path dir = Path.of("").toAbsolutePath();
        while (dir != null) {
            if (Files.isDirectory(dir.resolve("grammars").resolve("samples"))) {
                return dir.resolve("grammars");
            }
            dir = dir.getParent();
        }
        throw new IllegalStateException("grammars/ not found above " + Path.of("").toAbsolutePath());
    }
}
