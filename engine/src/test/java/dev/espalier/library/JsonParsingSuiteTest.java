package dev.espalier.library;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.espalier.grammar.Grammar;
import dev.espalier.testing.TestVocabularies;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * The RFC 8259 grammar ({@code grammars/json.abnf}) against two outside references:
 * <ul>
 *   <li>the JSON parsing test suite (nst/JSONTestSuite, MIT licence, commit in its
 *       {@code SOURCE-COMMIT}; copied to {@code shared/testdata/json-parsing-suite}): every
 *       {@code y_} file must be accepted, every {@code n_} file rejected; {@code i_} files
 *       (implementation-defined) are listed with the grammar's verdict. Files are taken byte for
 *       byte (no line-break stripping: JSON-text allows surrounding white space anyway);</li>
 *   <li>Jackson, strict (a default {@link ObjectMapper} with FAIL_ON_TRAILING_TOKENS), on generated
 *       JSON documents and mutations of them: the grammar and Jackson agree on every one.</li>
 * </ul>
 */
class JsonParsingSuiteTest {

    private static final Grammar JSON = GrammarLibrary.load("json").grammar();

    private static Path suite() {
        Path dir = TestVocabularies.shared().resolve("testdata").resolve("json-parsing-suite").resolve("test_parsing");
        assumeTrue(Files.isDirectory(dir), dir + " is missing");
        return dir;
    }

    private static List<Path> files(String prefix) throws IOException {
        try (Stream<Path> s = Files.list(suite())) {
            return s.filter(p -> p.getFileName().toString().startsWith(prefix)).sorted().toList();
        }
    }

    /** The grammar's verdict by the Earley recognizer. */
    private static Boolean verdict(Path file) throws IOException {
        return LibraryHarness.accepts(JSON, Files.readAllBytes(file));
    }

    @Test
    void everyYFileIsAcceptedAndEveryNFileRejected() throws IOException {
        List<String> wrong = new ArrayList<>();
        int y = 0;
        int n = 0;
        for (Path f : files("y_")) {
            y++;
            if (!verdict(f)) {
                wrong.add("rejected " + f.getFileName());
            }
        }
        for (Path f : files("n_")) {
            n++;
            if (verdict(f)) {
                wrong.add("accepted " + f.getFileName());
            }
        }
        System.out.printf("JSON parsing suite: %d y_ files accepted, %d n_ files rejected, %d disagreements%n",
                y - wrong.stream().filter(w -> w.startsWith("rejected")).count(),
                n - wrong.stream().filter(w -> w.startsWith("accepted")).count(), wrong.size());
        assertTrue(y >= 90 && n >= 180, "the suite has about 95 y_ and 188 n_ files");
        assertEquals(List.of(), wrong);
    }

    @Test
    void implementationDefinedFilesAreListed() throws IOException {
        TreeMap<String, String> verdicts = new TreeMap<>();
        for (Path f : files("i_")) {
            Boolean v = verdict(f);
            verdicts.put(f.getFileName().toString(), v == null ? "undecided" : v ? "accepted" : "rejected");
        }
        long accepted = verdicts.values().stream().filter("accepted"::equals).count();
        System.out.printf("JSON parsing suite: %d i_ files, %d accepted, %d rejected%n", verdicts.size(), accepted,
                verdicts.values().stream().filter("rejected"::equals).count());
        verdicts.forEach((k, v) -> System.out.println("  " + k + ": " + v));
        assertTrue(verdicts.size() >= 30, "the suite has about 35 i_ files");
        // RFC 8259 section 8.2: escapes of lone surrogates are syntactically allowed ("\uDEAD")
        assertEquals("accepted", verdicts.get("i_string_1st_surrogate_but_2nd_missing.json"));
        // RFC 8259 section 8.1: JSON text is UTF-8; ill-formed UTF-8 is no JSON text
        assertEquals("rejected", verdicts.get("i_string_UTF-8_invalid_sequence.json"));
    }

    // ---- Jackson on generated documents ----

    private static final ObjectMapper JACKSON = new ObjectMapper().enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

    /** Jackson's verdict. It reads empty content as a missing node rather than failing: no JSON text. */
    private static boolean jacksonAccepts(byte[] doc) {
        try {
            JsonNode node = JACKSON.readTree(doc);
            return node != null && !node.isMissingNode();
        } catch (IOException e) {
            return false;
        }
    }

    @Test
    void grammarAndJacksonAgreeOnGeneratedDocumentsAndTheirMutations() {
        Random rnd = new Random(20250412);
        int accepted = 0;
        int rejected = 0;
        List<String> disagreements = new ArrayList<>();
        for (int i = 0; i < 1000; i++) {
            String doc = JsonDocuments.document(rnd);
            for (String text : List.of(doc, JsonDocuments.mutate(doc, rnd))) {
                byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
                boolean grammar = LibraryHarness.accepts(JSON, bytes);
                boolean jackson = jacksonAccepts(bytes);
                if (grammar != jackson) {
                    disagreements.add((grammar ? "grammar accepts, Jackson rejects: " : "grammar rejects, Jackson accepts: ") + text);
                }
                if (grammar) {
                    accepted++;
                } else {
                    rejected++;
                }
            }
        }
        System.out.printf("JSON vs Jackson: 2000 documents, %d accepted, %d rejected%n", accepted, rejected);
        assertEquals(List.of(), disagreements.subList(0, Math.min(10, disagreements.size())));
        assertTrue(accepted >= 1000 && rejected >= 300, accepted + " accepted, " + rejected + " rejected");
    }
}
