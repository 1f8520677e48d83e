package dev.espalier.testing;

import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Assumptions;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.ConcurrentHashMap;

/** Real vocabularies for tests, loaded once per test JVM. */
public final class TestVocabularies {

    private static final ConcurrentHashMap<String, Vocabulary> CACHE = new ConcurrentHashMap<>();

    private TestVocabularies() {
    }

    /** A built-in (jtokkit resource) vocabulary: r50k, p50k, cl100k, o200k. */
    public static Vocabulary builtin(String name) {
        return CACHE.computeIfAbsent(name, Vocabularies::builtin);
    }

    /** The shared/ folder beside the checkout, or a skipped test when it is absent. */
    public static Path shared() {
        String p = System.getProperty("espalier.shared");
        if (p != null && Files.isDirectory(Path.of(p))) {
            return Path.of(p);
        }
        // a checkout elsewhere (e.g. a git worktree): look for shared/ beside any parent folder
        for (Path dir = Path.of("").toAbsolutePath(); dir != null; dir = dir.getParent()) {
            Path candidate = dir.resolveSibling("shared");
            if (dir.getParent() != null && Files.isDirectory(candidate.resolve("vocab"))) {
                return candidate;
            }
        }
        Assumptions.abort("shared/ folder not available (system property espalier.shared)");
        return null;
    }

    /** A vocabulary file of shared/vocab by file name, loaded once; a skipped test when absent. */
    public static Vocabulary sharedFile(String file) {
        Path f = shared().resolve("vocab").resolve(file);
        Assumptions.assumeTrue(Files.isRegularFile(f), f + " not available");
        return CACHE.computeIfAbsent("shared:" + file, k -> Vocabularies.load(f));
    }

    /** A vocabulary file of shared/vocab (e.g. {@code qwen3}), or a skipped test when absent. */
    public static Vocabulary shared(String model) {
        return sharedFile(model + "-tokenizer.json.gz");
    }
}
