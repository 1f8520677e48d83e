package dev.espalier.lsp;

import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.abnf.ImportResolver;
import dev.espalier.abnf.RuleSite;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.GrammarAnalysis;
import dev.espalier.grammar.Span;
import org.eclipse.lsp4j.Location;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;

/**
 * One version of a grammar document, checked: the engine's result ({@link AbnfCheck} with the
 * document's {@code ;@use} imports resolved relative to it, open documents before files on disk),
 * the rule-name occurrences indexed by rule, and what each imported file looked like when it was
 * read, so that the server notices when an import changed.
 *
 * <p>Documents larger than {@link #MAX_CHARS} characters and binary content (a NUL character, or
 * more than 1% control characters or U+FFFD, the mark of bytes that are not UTF-8) are not analysed: they get one diagnostic saying why, and the other features
 * offer nothing for them.
 */
final class GrammarDocument {

    /** The largest grammar text that is analysed; past it, checking takes seconds and blocks other work. */
    static final int MAX_CHARS = 1_000_000;

    private static final Object MISSING = "missing";

    final DocumentSnapshot doc;
    /** The name the engine knows the document by: its normalised path, or its URI when it is not a file. */
    final String name;
    /** The check's result, or null when the document was not analysed ({@link #refusal}). */
    final AbnfResult result;
    /** Why the document was not analysed, or null. */
    final String refusal;
    private final Map<String, Object> importStamps;
    private final Map<String, String> texts;
    private final Map<String, List<RuleSite>> sitesByKey = new HashMap<>();
    private final Map<String, List<RuleSite>> sitesByFile = new HashMap<>();
    private final Map<String, DocumentSnapshot> views = new HashMap<>();
    private final Map<RuleSite, int[]> extents = new HashMap<>();
    private GrammarAnalysis analysis;
    /** Hover texts by rule key: deterministic for a version, and building an automaton is not free. */
    final Map<String, String> hovers = new HashMap<>();

    private GrammarDocument(DocumentSnapshot doc, String name, AbnfResult result, String refusal,
                            Map<String, Object> importStamps, Map<String, String> texts) {
        this.doc = doc;
        this.name = name;
        this.result = result;
        this.refusal = refusal;
        this.importStamps = importStamps;
        this.texts = texts;
        if (result != null) {
            for (RuleSite s : result.sites()) {
                sitesByKey.computeIfAbsent(s.key(), k -> new ArrayList<>()).add(s);
                sitesByFile.computeIfAbsent(s.source(), k -> new ArrayList<>()).add(s);
            }
            for (List<RuleSite> l : sitesByFile.values()) {
                l.sort(Comparator.comparingInt(s -> s.span().start()));
            }
        }
    }

    /** Checks a snapshot, reading its imports through the open documents and the disk. */
    static GrammarDocument check(DocumentSnapshot doc, ServerContext context) {
        String name = doc.path().map(Path::toString).orElse(doc.uri());
        Map<String, String> texts = new LinkedHashMap<>();
        texts.put(name, doc.text());
        String refusal = refusal(doc);
        if (refusal != null) {
            return new GrammarDocument(doc, name, null, refusal, Map.of(), texts);
        }
        Map<String, Object> stamps = new LinkedHashMap<>();
        ImportResolver resolver = (from, path) -> {
            Path p;
            try {
                p = Path.of(from).resolveSibling(path).toAbsolutePath().normalize();
            } catch (RuntimeException e) { // the importing document is not a file, or a malformed path
                return Optional.empty();
            }
            String key = p.toString();
            Optional<DocumentSnapshot> open = openByPath(context, p);
            if (open.isPresent()) {
                stamps.put(key, open.get());
                texts.put(key, open.get().text());
                return Optional.of(new ImportResolver.Source(key, open.get().text()));
            }
            Object stamp = diskStamp(p);
            stamps.put(key, stamp);
            if (stamp == MISSING) {
                return Optional.empty();
            }
            try {
                String text = Files.readString(p, StandardCharsets.UTF_8);
                if (text.length() > MAX_CHARS) {
                    return Optional.empty();
                }
                texts.put(key, text);
                return Optional.of(new ImportResolver.Source(key, text));
            } catch (IOException | RuntimeException e) {
                stamps.put(key, MISSING);
                return Optional.empty();
            }
        };
        AbnfResult r = AbnfCheck.checkWithImports(doc.text(), name, resolver);
        return new GrammarDocument(doc, name, r, null, stamps, texts);
    }

    /** Why a document is not analysed, or null when it is. */
    static String refusal(DocumentSnapshot doc) {
        String text = doc.text();
        if (text.length() > MAX_CHARS) {
            return String.format("this file is too large to check: %,d characters (the limit is %,d)",
                    text.length(), MAX_CHARS);
        }
        int first = -1;
        int odd = 0;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            boolean control = (c < 0x20 && c != '\t' && c != '\n' && c != '\r') || c == 0x7F || c == '\uFFFD';
            if (control) {
                odd++;
                if (first < 0) {
                    first = i;
                }
            }
        }
        int nul = text.indexOf('\0');
        if (nul >= 0 || (odd >= 8 && odd * 100L > text.length())) {
            int at = nul >= 0 ? nul : first;
            var p = doc.position(at);
            return "this file holds binary content (" + (nul >= 0 ? "a NUL character" : odd + " control or undecodable characters, the first")
                    + " at line " + (p.getLine() + 1) + ", column " + (p.getCharacter() + 1)
                    + "); ABNF is text, so it is not checked";
        }
        return null;
    }

    private static Optional<DocumentSnapshot> openByPath(ServerContext context, Path p) {
        for (DocumentSnapshot d : context.openDocuments()) {
            if (d.path().map(p::equals).orElse(false)) {
                return Optional.of(d);
            }
        }
        return Optional.empty();
    }

    private static Object diskStamp(Path p) {
        try {
            BasicFileAttributes a = Files.readAttributes(p, BasicFileAttributes.class);
            if (!a.isRegularFile()) {
                return MISSING;
            }
            return "disk:" + a.lastModifiedTime().toMillis() + ":" + a.size();
        } catch (IOException | RuntimeException e) {
            return MISSING;
        }
    }

    /** Whether every import still reads as it did when this version was checked. */
    boolean importsUnchanged(ServerContext context) {
        for (Map.Entry<String, Object> e : importStamps.entrySet()) {
            Path p = Path.of(e.getKey());
            Optional<DocumentSnapshot> open = openByPath(context, p);
            Object now = open.isPresent() ? open.get() : diskStamp(p);
            if (!Objects.equals(now, e.getValue())) {
                return false;
            }
        }
        return true;
    }

    /** Whether this version read the file at a path (as an import). */
    boolean imports(Path p) {
        return importStamps.containsKey(p.toString());
    }

    boolean analysed() {
        return result != null;
    }

    /** The grammar facts, computed on first use. */
    GrammarAnalysis analysis() {
        if (analysis == null) {
            analysis = GrammarAnalysis.of(result.grammar());
        }
        return analysis;
    }

    /** Every occurrence of the rule with this key, in every file read. */
    List<RuleSite> sites(String key) {
        return sitesByKey.getOrDefault(key, List.of());
    }

    /** The occurrences in one file, by position. */
    List<RuleSite> sitesIn(String file) {
        return sitesByFile.getOrDefault(file, List.of());
    }

    /** The occurrences in this document, by position. */
    List<RuleSite> ownSites() {
        return sitesIn(name);
    }

    /** The definition sites of a rule ({@code =} first, then {@code =/}), in every file read. */
    List<RuleSite> definitions(String key) {
        List<RuleSite> out = new ArrayList<>();
        for (RuleSite s : sites(key)) {
            if (s.isDefinition()) {
                out.add(s);
            }
        }
        return out;
    }

    /** The keys of every rule defined in some file read. */
    java.util.Set<String> definedKeys() {
        java.util.Set<String> out = new java.util.HashSet<>();
        for (var e : sitesByKey.entrySet()) {
            if (e.getValue().stream().anyMatch(RuleSite::isDefinition)) {
                out.add(e.getKey());
            }
        }
        return out;
    }

    /** The rule-name occurrence in this document at an offset (its end included), or empty. */
    Optional<RuleSite> siteAt(int offset) {
        List<RuleSite> own = ownSites();
        int lo = 0;
        int hi = own.size() - 1;
        while (lo <= hi) {
            int mid = (lo + hi) >>> 1;
            Span s = own.get(mid).span();
            if (s.end() < offset) {
                lo = mid + 1;
            } else if (s.start() > offset) {
                hi = mid - 1;
            } else {
                return Optional.of(own.get(mid));
            }
        }
        return Optional.empty();
    }

    /** The URI of a file the engine read. */
    String uriOf(String file) {
        if (file.equals(name)) {
            return doc.uri();
        }
        try {
            return Path.of(file).toUri().toString();
        } catch (RuntimeException e) {
            return file;
        }
    }

    /** A snapshot of a file the engine read, for position conversion (null when its text is unknown). */
    DocumentSnapshot view(String file) {
        if (file.equals(name)) {
            return doc;
        }
        return views.computeIfAbsent(file, f -> {
            String t = texts.get(f);
            return t == null ? null : new DocumentSnapshot(uriOf(f), "abnf", 0, t);
        });
    }

    /** Where an occurrence is, as an LSP location. */
    Location location(RuleSite s) {
        DocumentSnapshot v = view(s.source());
        if (v == null) {
            var start = new org.eclipse.lsp4j.Position(Math.max(0, s.span().line() - 1), Math.max(0, s.span().column() - 1));
            return new Location(uriOf(s.source()), new org.eclipse.lsp4j.Range(start, start));
        }
        return new Location(v.uri(), v.range(s.span().start(), s.span().end()));
    }

    /**
     * The text extent {@code [start, end)} of a definition: from the rule name to the end of its
     * last line before the next definition, leaving out trailing blank and comment lines (those
     * belong to the next rule, as in the {@code fmt} layout).
     */
    int[] extent(RuleSite def) {
        return extents.computeIfAbsent(def, d -> {
            DocumentSnapshot v = view(d.source());
            if (v == null) {
                return new int[] {d.span().start(), d.span().end()};
            }
            String text = v.text();
            int next = text.length();
            for (RuleSite s : sitesIn(d.source())) {
                if (s.isDefinition() && s.span().start() > d.span().start()) {
                    next = v.lineStart(v.position(s.span().start()).getLine());
                    break;
                }
            }
            int nameLine = v.position(d.span().start()).getLine();
            int endLine = v.position(next).getLine();
            int lastLine = next == v.lineStart(endLine) && endLine > 0 ? endLine - 1 : endLine;
            while (lastLine > nameLine) {
                String content = text.substring(v.lineStart(lastLine), v.lineEnd(lastLine)).strip();
                if (!content.isEmpty() && !content.startsWith(";")) {
                    break;
                }
                lastLine--;
            }
            int end = v.lineEnd(Math.max(lastLine, nameLine));
            return new int[] {d.span().start(), Math.max(end, d.span().end())};
        });
    }

    /** The source text of a rule's definitions, or the RFC's text of a core rule, or empty. */
    Optional<String> definitionText(String key) {
        List<RuleSite> defs = definitions(key);
        if (defs.isEmpty()) {
            return CoreRuleTexts.definition(key);
        }
        StringBuilder sb = new StringBuilder();
        for (RuleSite d : defs) {
            DocumentSnapshot v = view(d.source());
            if (v == null) {
                continue;
            }
            int[] e = extent(d);
            if (!sb.isEmpty()) {
                sb.append('\n');
            }
            sb.append(v.text(), e[0], e[1]);
        }
        return sb.isEmpty() ? Optional.empty() : Optional.of(sb.toString());
    }

    /** The name of a rule as defined (first definition), or as written at the given occurrence. */
    String displayName(String key, String fallback) {
        return result.grammar().rule(key).map(dev.espalier.grammar.Rule::name).orElse(fallback);
    }

    /** A short description of where a rule comes from. */
    String origin(String key) {
        List<RuleSite> defs = definitions(key);
        if (defs.isEmpty()) {
            return CoreRuleTexts.isCore(key) && result.grammar().rule(key).isPresent() ? "RFC 5234 core rule"
                    : "not defined";
        }
        RuleSite d = defs.get(0);
        String where = d.source().equals(name) ? "this file" : fileName(d.source());
        return "defined in " + where + ", line " + d.span().line();
    }

    static String fileName(String file) {
        try {
            Path f = Path.of(file).getFileName();
            return f == null ? file : f.toString();
        } catch (RuntimeException e) {
            return file;
        }
    }

    /** The key of a rule name. */
    static String key(String ruleName) {
        return Grammar.key(ruleName);
    }
}
