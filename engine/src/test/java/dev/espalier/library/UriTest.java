package dev.espalier.library;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Grammar;
import java.net.URI;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/**
 * The RFC 3986 grammars ({@code grammars/uri.abnf}, start URI, and {@code grammars/uri-reference.abnf},
 * start URI-reference through a {@code ;@use} import) against the RFC's own examples (written
 * down from memory of RFC 3986) and {@link java.net.URI}.
 */
class UriTest {

    private static final Grammar URI_GRAMMAR = GrammarLibrary.load("uri").grammar();
    private static final Grammar REFERENCE = GrammarLibrary.load("uri-reference").grammar();

    private static boolean uri(String s) {
        return LibraryHarness.accepts(URI_GRAMMAR, s.getBytes(StandardCharsets.UTF_8));
    }

    private static boolean reference(String s) {
        return LibraryHarness.accepts(REFERENCE, s.getBytes(StandardCharsets.UTF_8));
    }

    @Test
    void theSection112ExamplesAreUris() {
        // RFC 3986 section 1.1.2
        for (String s : List.of("ftp://ftp.is.co.za/rfc/rfc1808.txt", "http://www.ietf.org/rfc/rfc2396.txt",
                "ldap://[2001:db8::7]/c=GB?objectClass?one", "mailto:John.Doe@example.com",
                "news:comp.infosystems.www.servers.unix", "tel:+1-816-555-1212", "telnet://192.0.2.16:80/",
                "urn:oasis:names:specification:docbook:dtd:xml:4.1.2")) {
            assertTrue(uri(s), s);
            assertTrue(reference(s), s);
        }
    }

    /** RFC 3986 section 5.4.1 (normal examples), relative reference to target, base below. */
    private static final Map<String, String> NORMAL = new LinkedHashMap<>();
    /** RFC 3986 section 5.4.2 (abnormal examples). */
    private static final Map<String, String> ABNORMAL = new LinkedHashMap<>();

    static {
        String[] normal = {
            "g:h", "g:h", "g", "http://a/b/c/g", "./g", "http://a/b/c/g", "g/", "http://a/b/c/g/",
            "/g", "http://a/g", "//g", "http://g", "?y", "http://a/b/c/d;p?y", "g?y", "http://a/b/c/g?y",
            "#s", "http://a/b/c/d;p?q#s", "g#s", "http://a/b/c/g#s", "g?y#s", "http://a/b/c/g?y#s",
            ";x", "http://a/b/c/;x", "g;x", "http://a/b/c/g;x", "g;x?y#s", "http://a/b/c/g;x?y#s",
            "", "http://a/b/c/d;p?q", ".", "http://a/b/c/", "./", "http://a/b/c/", "..", "http://a/b/",
            "../", "http://a/b/", "../g", "http://a/b/g", "../..", "http://a/", "../../", "http://a/",
            "../../g", "http://a/g"};
        String[] abnormal = {
            "../../../g", "http://a/g", "../../../../g", "http://a/g", "/./g", "http://a/g", "/../g", "http://a/g",
            "g.", "http://a/b/c/g.", ".g", "http://a/b/c/.g", "g..", "http://a/b/c/g..", "..g", "http://a/b/c/..g",
            "./../g", "http://a/b/g", "./g/.", "http://a/b/c/g/", "g/./h", "http://a/b/c/g/h",
            "g/../h", "http://a/b/c/h", "g;x=1/./y", "http://a/b/c/g;x=1/y", "g;x=1/../y", "http://a/b/c/y",
            "g?y/./x", "http://a/b/c/g?y/./x", "g?y/../x", "http://a/b/c/g?y/../x",
            "g#s/./x", "http://a/b/c/g#s/./x", "g#s/../x", "http://a/b/c/g#s/../x", "http:g", "http:g"};
        for (int i = 0; i < normal.length; i += 2) {
            NORMAL.put(normal[i], normal[i + 1]);
        }
        for (int i = 0; i < abnormal.length; i += 2) {
            ABNORMAL.put(abnormal[i], abnormal[i + 1]);
        }
    }

    @Test
    void theSection54ReferencesAreUriReferencesAndTheirTargetsUris() {
        // RFC 3986 section 5.4: base URI http://a/b/c/d;p?q; 23 normal and 19 abnormal examples
        assertEquals(23, NORMAL.size());
        assertEquals(19, ABNORMAL.size());
        assertTrue(uri("http://a/b/c/d;p?q"));
        for (Map<String, String> examples : List.of(NORMAL, ABNORMAL)) {
            examples.forEach((ref, target) -> {
                assertTrue(reference(ref), "reference " + ref);
                assertTrue(uri(target), "target " + target);
            });
        }
        // relative references are no URIs (a URI has a scheme); "g:h" and "http:g" are
        assertFalse(uri("../g"));
        assertFalse(uri("//g"));
        assertFalse(uri(""));
        assertTrue(uri("g:h") && uri("http:g"));
    }

    /**
     * The generator's pieces: the RFC 3986 character classes (unreserved, sub-delims, ":" and "@",
     * percent escapes) and characters it excludes, each with its own chance.
     */
    private static final String[] GOOD = {"a", "z", "Q", "0", "9", "-", ".", "_", "~", "!", "$", "&", "'", "(", ")",
        "*", "+", ",", ";", "=", ":", "@", "%41", "%7e", "/"};
    private static final String[] BAD = {" ", "\"", "<", ">", "\\", "^", "`", "{", "|", "}", "%", "%4", "%G1", "[", "]", "#"};

    private static String part(Random rnd, int max, boolean allowBad) {
        StringBuilder b = new StringBuilder();
        int n = rnd.nextInt(max + 1);
        for (int i = 0; i < n; i++) {
            b.append(allowBad && rnd.nextInt(25) == 0 ? BAD[rnd.nextInt(BAD.length)] : GOOD[rnd.nextInt(GOOD.length)]);
        }
        return b.toString();
    }

    private static String generate(Random rnd) {
        StringBuilder b = new StringBuilder();
        b.append(new String[] {"http", "https", "ftp", "urn", "x-orchard", "s3.v2"}[rnd.nextInt(6)]).append(':');
        if (rnd.nextInt(4) != 0) {
            b.append("//");
            if (rnd.nextInt(5) == 0) {
                b.append(part(rnd, 6, true).replace("@", "").replace("/", "")).append('@');
            }
            b.append(new String[] {"nursery.example", "192.0.2.16", "[2001:db8::7]", "a", "T-0042.example"}[rnd.nextInt(5)]);
            if (rnd.nextInt(3) == 0) {
                b.append(':').append(rnd.nextInt(70000));
            }
            b.append('/');
        }
        b.append(part(rnd, 12, true).replaceFirst("^/+", ""));
        if (rnd.nextInt(3) == 0) {
            b.append('?').append(part(rnd, 8, true));
        }
        if (rnd.nextInt(3) == 0) {
            b.append('#').append(part(rnd, 8, true));
        }
        return b.toString();
    }

    private static boolean javaNetAccepts(String s) {
        try {
            URI u = new URI(s);
            return u.isAbsolute();
        } catch (URISyntaxException e) {
            return false;
        }
    }

    /**
     * Where java.net.URI (RFC 2396 with the IPv6 literals of RFC 2732, per its Javadoc) and RFC 3986
     * differ for the generated texts, or null where both should agree. Found by running the
     * comparison; each is shown on examples in {@link #theKnownDifferencesAreReal()}.
     */
    static String knownDifference(String s) {
        if (s.matches("[^:/?#]*:(#.*)?")) {
            // RFC 3986: hier-part may be path-empty; RFC 2396 (java.net.URI): "Expected scheme-specific part"
            return "empty path after the scheme";
        }
        String outsideHost = s.replaceFirst("^([^:/?#]*://(?:[^/?#@]*@)?)\\[[^\\]/?#]*\\]", "$1");
        if (outsideHost.contains("[") || outsideHost.contains("]")) {
            // RFC 3986 section 3.2.2: "[" and "]" only around an IP literal; RFC 2732 section 3 adds them
            // to RFC 2396's reserved characters, so java.net.URI takes them in paths, queries, fragments
            return "square brackets outside the host";
        }
        return null;
    }

    @Test
    void theKnownDifferencesAreReal() {
        for (String s : List.of("http:", "urn:#f")) {
            assertTrue(uri(s) && !javaNetAccepts(s) && knownDifference(s) != null, s);
        }
        for (String s : List.of("http://nursery.example/rows?r=[1]", "urn:a]b", "https://[2001:db8::7]/x#[")) {
            assertTrue(!uri(s) && javaNetAccepts(s) && knownDifference(s) != null, s);
        }
        assertTrue(knownDifference("ldap://[2001:db8::7]/c=GB?objectClass?one") == null);
    }

    @Test
    void grammarAndJavaNetUriAgreeOnGeneratedUris() {
        Random rnd = new Random(3986);
        TreeMap<String, Integer> excluded = new TreeMap<>();
        List<String> disagreements = new ArrayList<>();
        int accepted = 0;
        int compared = 0;
        for (int i = 0; i < 3000; i++) {
            String s = generate(rnd);
            boolean grammar = uri(s);
            String known = knownDifference(s);
            if (known != null) {
                excluded.merge(known, 1, Integer::sum);
                continue;
            }
            compared++;
            if (grammar) {
                accepted++;
            }
            if (grammar != javaNetAccepts(s)) {
                disagreements.add((grammar ? "grammar only: " : "java.net.URI only: ") + s);
            }
        }
        System.out.printf("RFC 3986 vs java.net.URI: 3000 URIs, %d compared (%d accepted), excluded %s%n",
                compared, accepted, excluded);
        assertEquals(List.of(), disagreements.subList(0, Math.min(10, disagreements.size())));
    }
}
