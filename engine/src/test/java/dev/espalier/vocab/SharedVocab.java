package dev.espalier.vocab;

import static org.junit.jupiter.api.Assumptions.assumeTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.ConcurrentHashMap;
import java.util.zip.GZIPInputStream;

/** Access to the real vocabularies in the shared folder (property {@code espalier.shared}). */
final class SharedVocab {

    private static final ConcurrentHashMap<String, JsonNode> TREES = new ConcurrentHashMap<>();

    private SharedVocab() {
    }

    /** The file {@code vocab/<file>} of the shared folder; skips the test when it is missing. */
    static Path file(String file) {
        Path p = dev.espalier.testing.TestVocabularies.shared().resolve("vocab").resolve(file);
        assumeTrue(Files.isRegularFile(p), p + " is missing");
        return p;
    }

    /** Loads (once per test run) a shared vocabulary through {@link Vocabularies#load(Path)}. */
    static Vocabulary load(String file) {
        return dev.espalier.testing.TestVocabularies.sharedFile(file);
    }

    /** Reads a shared JSON file (gzip or plain) with Jackson's tree API: the independent reference. */
    static JsonNode json(String file) throws IOException {
        JsonNode cached = TREES.get(file);
        if (cached == null) {
            cached = readJson(file);
            TREES.put(file, cached);
        }
        return cached;
    }

    private static JsonNode readJson(String file) throws IOException {
        Path p = file(file);
        try (InputStream raw = Files.newInputStream(p);
             InputStream in = file.endsWith(".gz") ? new GZIPInputStream(raw) : raw) {
            return new ObjectMapper().readTree(in);
        }
    }
}
