package dev.espalier.lsp.samples;

import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.Range;

import java.nio.file.Path;
import java.nio.file.PathMatcher;
import java.util.List;
import java.util.Optional;

/**
 * A parsed workspace file {@value #FILE_NAME}: which sample files are previewed under which
 * constraint and vocabulary. Read by {@link SampleMapReader}; immutable.
 *
 * @param file     the workspace file (absolute)
 * @param entries  the entries that could be read, in file order (the first whose globs match a
 *                 file decides its preview)
 * @param problems what is wrong with the file, with ranges in it
 */
public record SampleMap(Path file, List<Entry> entries, List<Problem> problems) {

    /** The workspace file's name. */
    public static final String FILE_NAME = "espalier-samples.json";

    /** Copies the lists. */
    public SampleMap {
        entries = List.copyOf(entries);
        problems = List.copyOf(problems);
    }

    /** The folder globs and relative paths are resolved against. */
    public Path folder() {
        return file.getParent();
    }

    /** The first entry whose globs match a file, if the file lies under the workspace file's folder. */
    public Optional<Entry> entryFor(Path sample) {
        Path abs = sample.toAbsolutePath().normalize();
        if (!abs.startsWith(folder()) || abs.equals(file)) {
            return Optional.empty();
        }
        Path rel = folder().relativize(abs);
        for (Entry e : entries) {
            if (e.matches(rel)) {
                return Optional.of(e);
            }
        }
        return Optional.empty();
    }

    /** Where in the workspace file something was written (LSP positions). */
    public record Located<T>(T value, Range range) {
    }

    /** Which front end reads a constraint. */
    public enum Kind {
        /** An ABNF grammar file and its start rule. */
        GRAMMAR,
        /** A regular expression (the syntax of JSON Schema's {@code pattern}). */
        REGEX,
        /** A JSON Schema file. */
        SCHEMA
    }

    /**
     * One mapping: sample files to a constraint and a vocabulary.
     *
     * @param range      the entry's object in the workspace file
     * @param globs      the glob patterns as written (relative to the workspace file's folder)
     * @param matchers   the compiled globs
     * @param kind       the constraint's front end
     * @param source     the pattern ({@link Kind#REGEX}) or the file as written (grammar, schema)
     * @param sourceFile the grammar or schema file resolved against the folder; null for a regex
     * @param start      the start rule of a grammar, or null for its first rule
     * @param pretty     for a schema: whether JSON is laid out one member per line (else compact)
     * @param vocabulary the vocabulary: a built-in name or a file resolved against the folder
     */
    public record Entry(Range range, List<Located<String>> globs, List<PathMatcher> matchers, Kind kind,
                        Located<String> source, Path sourceFile, Located<String> start, boolean pretty,
                        VocabularySpec vocabulary) {

        /** Copies the lists. */
        public Entry {
            globs = List.copyOf(globs);
            matchers = List.copyOf(matchers);
        }

        /** Whether a path relative to the workspace file's folder matches one of the globs. */
        public boolean matches(Path relative) {
            for (PathMatcher m : matchers) {
                if (m.matches(relative)) {
                    return true;
                }
            }
            return false;
        }

        /** A short description, e.g. {@code grammar work-order.abnf (start order) on cl100k}. */
        public String describe() {
            String what = switch (kind) {
                case GRAMMAR -> "grammar " + source.value() + (start == null ? "" : " (start " + start.value() + ")");
                case REGEX -> "regex " + source.value();
                case SCHEMA -> "schema " + source.value() + (pretty ? " (pretty layout)" : "");
            };
            return what + " on " + vocabulary.label();
        }
    }

    /**
     * The vocabulary of an entry: a built-in encoding (see
     * {@link dev.espalier.vocab.Vocabularies#builtin}) or a file.
     *
     * @param builtin the built-in name, or null
     * @param file    the file, or null
     * @param written the value as written, with its range
     */
    public record VocabularySpec(String builtin, Path file, Located<String> written) {

        /** The name shown to people. */
        public String label() {
            return builtin != null ? builtin : written.value();
        }
    }

    /**
     * A finding about the workspace file.
     *
     * @param range    where (LSP positions in the workspace file)
     * @param severity how bad
     * @param code     a stable code, e.g. {@code unknown-key}
     * @param message  for people
     */
    public record Problem(Range range, DiagnosticSeverity severity, String code, String message) {
    }
}
