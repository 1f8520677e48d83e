package dev.espalier.library;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.stream.Stream;

/**
 * The repository's {@code grammars/} folder as the tests see it: the grammar files and their
 * samples, following the convention of {@code grammars/README.md}.
 */
final class GrammarLibrary {

    private static final Map<String, AbnfResult> LOADED = new ConcurrentHashMap<>();

    private GrammarLibrary() {
    }

    /**
     * One sample: its file, the verdict its name announces, and its text.
     *
     * @param grammar the grammar's name (file name without {@code .abnf})
     * @param file    the sample file
     * @param accept  true for {@code .accept.}, false for {@code .reject.}
     * @param text    the file's bytes without one final line break (LF or CRLF)
     */
    record Sample(String grammar, Path file, boolean accept, byte[] text) {
        /** The file name, for test names. */
        String name() {
            return file.getFileName().toString();
        }
    }

    /** The {@code grammars/} folder: found by walking up from the working directory. */
    static Path folder() {
        for (Path dir = Path.of(System.getProperty("user.dir")).toAbsolutePath(); dir != null; dir = dir.getParent()) {
            if (Files.isDirectory(dir.resolve("grammars").resolve("samples"))) {
                return dir.resolve("grammars");
            }
        }
        throw new IllegalStateException("no grammars/ folder above " + System.getProperty("user.dir"));
    }

    /** The names of all grammars (file names without {@code .abnf}), sorted. */
    static List<String> names() {
        try (Stream<Path> files = Files.list(folder())) {
            return files.map(p -> p.getFileName().toString())
                    .filter(n -> n.endsWith(".abnf"))
                    .map(n -> n.substring(0, n.length() - ".abnf".length()))
                    .sorted().toList();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A grammar file read with its {@code ;@use} imports (read once per test run). */
    static AbnfResult load(String name) {
        return LOADED.computeIfAbsent(name, n -> Abnf.parseWithImports(folder().resolve(n + ".abnf")));
    }

    /** The samples of a grammar, sorted by file name. */
    static List<Sample> samples(String name) {
        Path dir = folder().resolve("samples").resolve(name);
        if (!Files.isDirectory(dir)) {
            return List.of();
        }
        List<Sample> out = new ArrayList<>();
        try (Stream<Path> files = Files.list(dir)) {
            for (Path f : files.sorted().toList()) {
                out.add(new Sample(name, f, verdict(f), text(Files.readAllBytes(f))));
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return out;
    }

    /** The verdict a sample's file name announces: its dot-separated part "accept" or "reject". */
    static boolean verdict(Path file) {
        List<String> parts = Arrays.asList(file.getFileName().toString().split("\\."));
        boolean accept = parts.contains("accept");
        boolean reject = parts.contains("reject");
        if (accept == reject) {
            throw new IllegalArgumentException(file + ": the name must contain exactly one of .accept. or .reject.");
        }
        return accept;
    }

    /** The sample text: the bytes without one final LF or CRLF. */
    static byte[] text(byte[] bytes) {
        int n = bytes.length;
        if (n > 0 && bytes[n - 1] == '\n') {
            n -= (n > 1 && bytes[n - 2] == '\r') ? 2 : 1;
        }
        return Arrays.copyOf(bytes, n);
    }
}
