package dev.espalier.lsp.samples;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import dev.espalier.lsp.DocumentSnapshot;
import dev.espalier.lsp.samples.SampleMap.Entry;
import dev.espalier.lsp.samples.SampleMap.Kind;
import dev.espalier.lsp.samples.SampleMap.Located;
import dev.espalier.lsp.samples.SampleMap.Problem;
import dev.espalier.lsp.samples.SampleMap.VocabularySpec;
import dev.espalier.vocab.Vocabularies;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.Range;

import java.io.IOException;
import java.nio.file.FileSystems;
import java.nio.file.InvalidPathException;
import java.nio.file.Path;
import java.nio.file.PathMatcher;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Reads a workspace file {@value SampleMap#FILE_NAME}. Never throws for bad content: every problem
 * becomes a {@link Problem} with its range, and every entry that can be understood is kept.
 *
 * <pre>{@code
 * {
 *   "samples": [
 *     { "files": ["work-orders/*.txt"], "grammar": "work-order.abnf", "start": "order", "vocabulary": "cl100k" },
 *     { "files": "tags/*.tag", "regex": "Row [0-9]{2}", "vocabulary": "vocab/tokenizer.json" },
 *     { "files": "reports/*.json", "schema": "inspection.schema.json", "layout": "pretty" }
 *   ]
 * }
 * }</pre>
 * The file format is described in {@code docs/sample-previews.md}.
 */
public final class SampleMapReader {

    /** The vocabulary of an entry that names none. */
    public static final String DEFAULT_VOCABULARY = "cl100k";

    private static final JsonFactory JSON = JsonFactory.builder().build();

    private final Path file;
    private final DocumentSnapshot text;
    private final List<Problem> problems = new ArrayList<>();
    private final List<Entry> entries = new ArrayList<>();

    private SampleMapReader(Path file, String text) {
        this.file = file.toAbsolutePath().normalize();
        this.text = new DocumentSnapshot(this.file.toUri().toString(), "json", 0, text);
    }

    /**
     * Reads the content of a workspace file.
     *
     * @param file where the file is (relative paths in it are resolved against its folder)
     * @param text its content
     */
    public static SampleMap read(Path file, String text) {
        SampleMapReader r = new SampleMapReader(file, text == null ? "" : text);
        r.readAll();
        return new SampleMap(r.file, r.entries, r.problems);
    }

    private void readAll() {
        try (JsonParser p = JSON.createParser(text.text())) {
            JsonToken t = p.nextToken();
            if (t == null) {
                problem(range(0, 0), DiagnosticSeverity.Error, "empty-file",
                        "the file is empty; it should hold an object with a \"samples\" list");
                return;
            }
            if (t != JsonToken.START_OBJECT) {
                Range r = valueRange(p);
                problem(r, DiagnosticSeverity.Error, "not-an-object",
                        "the file should hold one JSON object with a \"samples\" list");
                return;
            }
            boolean sawSamples = false;
            Map<String, Boolean> seen = new HashMap<>();
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String key = p.currentName();
                Range keyRange = tokenRange(p);
                p.nextToken();
                if (seen.put(key, true) != null) {
                    problem(keyRange, DiagnosticSeverity.Error, "duplicate-key", "\"" + key + "\" is given twice");
                    p.skipChildren();
                    continue;
                }
                switch (key) {
                    case "samples" -> {
                        sawSamples = true;
                        readSamples(p);
                    }
                    case "description", "$comment" -> p.skipChildren();
                    default -> {
                        problem(keyRange, DiagnosticSeverity.Warning, "unknown-key",
                                "unknown key \"" + key + "\" (known: samples, description)");
                        p.skipChildren();
                    }
                }
            }
            if (p.nextToken() != null) {
                problem(tokenRange(p), DiagnosticSeverity.Error, "trailing-content",
                        "nothing may follow the top-level object");
            }
            if (!sawSamples) {
                problem(range(0, 1), DiagnosticSeverity.Warning, "no-samples",
                        "no \"samples\" list: no file gets a preview");
            }
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            int offset = at == null ? text.text().length() : offsetOf(at);
            String msg = e.getOriginalMessage();
            problem(range(offset, Math.min(text.text().length(), offset + 1)), DiagnosticSeverity.Error, "json-syntax",
                    "not valid JSON: " + (msg == null ? e.getClass().getSimpleName() : firstLine(msg)));
        } catch (IOException e) {
            problem(range(0, 0), DiagnosticSeverity.Error, "json-syntax", "cannot read the file: " + e.getMessage());
        }
    }

    private void readSamples(JsonParser p) throws IOException {
        if (p.currentToken() != JsonToken.START_ARRAY) {
            problem(valueRange(p), DiagnosticSeverity.Error, "wrong-type", "\"samples\" should be a list of objects");
            return;
        }
        while (p.nextToken() != JsonToken.END_ARRAY) {
            if (p.currentToken() != JsonToken.START_OBJECT) {
                problem(valueRange(p), DiagnosticSeverity.Error, "wrong-type",
                        "each element of \"samples\" should be an object");
                continue;
            }
            readEntry(p);
        }
    }

    private void readEntry(JsonParser p) throws IOException {
        int startOffset = offsetOf(p.currentTokenLocation());
        Map<String, Located<String>> strings = new HashMap<>();
        List<Located<String>> globs = new ArrayList<>();
        Range filesRange = null;
        boolean bad = false;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String key = p.currentName();
            Range keyRange = tokenRange(p);
            p.nextToken();
            if (strings.containsKey(key) || (key.equals("files") && filesRange != null)) {
                problem(keyRange, DiagnosticSeverity.Error, "duplicate-key", "\"" + key + "\" is given twice");
                p.skipChildren();
                bad = true;
                continue;
            }
            switch (key) {
                case "files" -> {
                    filesRange = keyRange;
                    if (p.currentToken() == JsonToken.VALUE_STRING) {
                        globs.add(new Located<>(p.getText(), tokenRange(p)));
                    } else if (p.currentToken() == JsonToken.START_ARRAY) {
                        while (p.nextToken() != JsonToken.END_ARRAY) {
                            if (p.currentToken() == JsonToken.VALUE_STRING) {
                                globs.add(new Located<>(p.getText(), tokenRange(p)));
                            } else {
                                problem(valueRange(p), DiagnosticSeverity.Error, "wrong-type",
                                        "each element of \"files\" should be a glob pattern (a string)");
                                bad = true;
                            }
                        }
                    } else {
                        problem(valueRange(p), DiagnosticSeverity.Error, "wrong-type",
                                "\"files\" should be a glob pattern or a list of them");
                        bad = true;
                    }
                }
                case "grammar", "start", "regex", "schema", "layout", "vocabulary" -> {
                    if (p.currentToken() == JsonToken.VALUE_STRING) {
                        strings.put(key, new Located<>(p.getText(), tokenRange(p)));
                    } else {
                        problem(valueRange(p), DiagnosticSeverity.Error, "wrong-type",
                                "\"" + key + "\" should be a string");
                        bad = true;
                    }
                }
                case "description", "$comment" -> p.skipChildren();
                default -> {
                    problem(keyRange, DiagnosticSeverity.Warning, "unknown-key", "unknown key \"" + key
                            + "\" (known: files, grammar, start, regex, schema, layout, vocabulary, description)");
                    p.skipChildren();
                }
            }
        }
        Range whole = range(startOffset, offsetOf(p.currentLocation()));
        Range head = range(startOffset, startOffset + 1);
        if (filesRange == null) {
            problem(head, DiagnosticSeverity.Error, "missing-files", "this entry names no \"files\" (glob patterns)");
            bad = true;
        }
        List<PathMatcher> matchers = new ArrayList<>();
        for (Located<String> g : globs) {
            try {
                matchers.add(FileSystems.getDefault().getPathMatcher("glob:" + g.value()));
            } catch (IllegalArgumentException e) {
                problem(g.range(), DiagnosticSeverity.Error, "bad-glob", "not a valid glob pattern: " + firstLine(e.getMessage()));
                bad = true;
            }
        }
        List<String> sources = new ArrayList<>();
        for (String k : List.of("grammar", "regex", "schema")) {
            if (strings.containsKey(k)) {
                sources.add(k);
            }
        }
        if (sources.size() != 1) {
            problem(head, DiagnosticSeverity.Error, "constraint",
                    sources.isEmpty() ? "this entry names no constraint: give one of \"grammar\", \"regex\" or \"schema\""
                            : "give only one of \"grammar\", \"regex\" or \"schema\" (this entry has " + String.join(", ", sources) + ")");
            return;
        }
        Kind kind = Kind.valueOf(sources.get(0).toUpperCase(Locale.ROOT));
        Located<String> source = strings.get(sources.get(0));
        Located<String> start = strings.get("start");
        if (start != null && kind != Kind.GRAMMAR) {
            problem(start.range(), DiagnosticSeverity.Error, "start-without-grammar", "\"start\" applies to a grammar only");
            bad = true;
        }
        Located<String> layout = strings.get("layout");
        boolean pretty = false;
        if (layout != null) {
            if (kind != Kind.SCHEMA) {
                problem(layout.range(), DiagnosticSeverity.Error, "layout-without-schema", "\"layout\" applies to a schema only");
                bad = true;
            } else if (layout.value().equals("pretty")) {
                pretty = true;
            } else if (!layout.value().equals("compact")) {
                problem(layout.range(), DiagnosticSeverity.Error, "bad-layout", "\"layout\" is \"compact\" or \"pretty\"");
                bad = true;
            }
        }
        Path sourceFile = null;
        if (kind != Kind.REGEX) {
            sourceFile = resolve(source);
            if (sourceFile == null) {
                bad = true;
            } else if (!java.nio.file.Files.isRegularFile(sourceFile)) {
                problem(source.range(), DiagnosticSeverity.Error, "missing-file", "no such file: " + sourceFile);
                bad = true;
            }
        }
        VocabularySpec vocabulary = vocabulary(strings.get("vocabulary"), head);
        if (vocabulary == null) {
            bad = true;
        }
        if (!bad) {
            entries.add(new Entry(whole, globs, matchers, kind, source, sourceFile, start, pretty, vocabulary));
        }
    }

    private VocabularySpec vocabulary(Located<String> written, Range head) {
        if (written == null) {
            return new VocabularySpec(DEFAULT_VOCABULARY, null, new Located<>(DEFAULT_VOCABULARY, head));
        }
        String v = written.value();
        String shortName = v.endsWith("_base") ? v.substring(0, v.length() - 5) : v;
        if (Vocabularies.builtinNames().contains(shortName)) {
            return new VocabularySpec(shortName, null, written);
        }
        Path f = resolve(written);
        if (f == null) {
            return null;
        }
        if (!java.nio.file.Files.isRegularFile(f)) {
            problem(written.range(), DiagnosticSeverity.Error, "unknown-vocabulary", "\"" + v
                    + "\" is neither a built-in vocabulary (" + String.join(", ", Vocabularies.builtinNames())
                    + ") nor an existing file (" + f + ")");
            return null;
        }
        return new VocabularySpec(null, f, written);
    }

    private Path resolve(Located<String> written) {
        try {
            return file.getParent().resolve(written.value()).toAbsolutePath().normalize();
        } catch (InvalidPathException e) {
            problem(written.range(), DiagnosticSeverity.Error, "bad-path", "not a valid path: " + e.getReason());
            return null;
        }
    }

    private void problem(Range r, DiagnosticSeverity s, String code, String message) {
        problems.add(new Problem(r, s, code, message));
    }

    private int offsetOf(JsonLocation at) {
        long c = at.getCharOffset();
        if (c >= 0) {
            return (int) Math.min(c, text.text().length());
        }
        int line = Math.max(0, at.getLineNr() - 1);
        int col = Math.max(0, at.getColumnNr() - 1);
        return text.offset(new org.eclipse.lsp4j.Position(line, col));
    }

    /**
     * The range of the current scalar token or field name. A field name ends at its closing quote
     * (the parser's own location is already past the colon).
     */
    private Range tokenRange(JsonParser p) {
        int a = offsetOf(p.currentTokenLocation());
        if (p.currentToken() == JsonToken.FIELD_NAME) {
            return range(a, stringEnd(a));
        }
        return range(a, offsetOf(p.currentLocation()));
    }

    /** The offset just past the JSON string literal starting at {@code a}. */
    private int stringEnd(int a) {
        String t = text.text();
        if (a >= t.length() || t.charAt(a) != '"') {
            return a;
        }
        for (int i = a + 1; i < t.length(); i++) {
            char c = t.charAt(i);
            if (c == '\\') {
                i++;
            } else if (c == '"') {
                return i + 1;
            }
        }
        return t.length();
    }

    /** The range of the current value, skipping over it when it is an object or array. */
    private Range valueRange(JsonParser p) throws IOException {
        int a = offsetOf(p.currentTokenLocation());
        p.skipChildren();
        return range(a, offsetOf(p.currentLocation()));
    }

    private Range range(int a, int b) {
        return text.range(a, b);
    }

    private static String firstLine(String s) {
        int nl = s.indexOf('\n');
        return nl < 0 ? s : s.substring(0, nl);
    }
}
