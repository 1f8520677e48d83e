package dev.espalier.lsp;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfPrinter;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.abnf.RuleSite;
import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.automaton.ByteDfa;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.RuleFacts;
import dev.espalier.grammar.Severity;
import dev.espalier.grammar.Span;
import dev.espalier.vocab.TokenText;
import org.eclipse.lsp4j.CodeAction;
import org.eclipse.lsp4j.CodeActionKind;
import org.eclipse.lsp4j.CodeActionParams;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionItemKind;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.DocumentSymbol;
import org.eclipse.lsp4j.FileEvent;
import org.eclipse.lsp4j.FoldingRange;
import org.eclipse.lsp4j.FoldingRangeKind;
import org.eclipse.lsp4j.FormattingOptions;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.InsertTextFormat;
import org.eclipse.lsp4j.Location;
import org.eclipse.lsp4j.MarkupContent;
import org.eclipse.lsp4j.MarkupKind;
import org.eclipse.lsp4j.MessageType;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.SymbolKind;
import org.eclipse.lsp4j.TextEdit;
import org.eclipse.lsp4j.WorkspaceEdit;
import org.eclipse.lsp4j.WorkspaceSymbol;
import org.eclipse.lsp4j.jsonrpc.messages.Either;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.FileVisitResult;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.SimpleFileVisitor;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The features of ABNF grammar files ({@code .abnf}), each an engine call on the checked document
 * ({@link GrammarDocument}, cached per version):
 * <ul>
 *   <li>diagnostics: {@link dev.espalier.abnf.AbnfCheck} with ranges, severities and codes;</li>
 *   <li>completion of rule names (this file's, imported ones, the RFC 5234 core rules) and value
 *       syntaxes as snippets; resolve adds a rule's definition;</li>
 *   <li>hover on a rule: definition, nullable, regular (with the size of its byte automaton) or
 *       context-free, a shortest string and random examples ({@link dev.espalier.grammar.GrammarAnalysis});</li>
 *   <li>definition, references, rename (case-insensitive names, across the file and the files it
 *       imports), document and workspace symbols, semantic tokens, folding, formatting in the
 *       {@code espalier fmt} layout ({@link AbnfPrinter}), and quick fixes.</li>
 * </ul>
 */
public final class GrammarFeatures implements DocumentFeatures {

    /** Directory entries a workspace walk visits at most (a folder may be a whole home directory). */
    static final int MAX_WORKSPACE_ENTRIES = 50_000;
    /** Workspace files listed by {@code workspace/symbol} at most. */
    static final int MAX_WORKSPACE_FILES = 2_000;
    /** Symbols returned by {@code workspace/symbol} at most. */
    static final int MAX_WORKSPACE_SYMBOLS = 1_000;
    /** Random examples shown on hover. */
    static final int HOVER_EXAMPLES = 3;
    /** Characters of a string shown on hover before it is cut. */
    static final int HOVER_STRING_CHARS = 80;

    private static final String SORT_OWN = "0";
    private static final String SORT_IMPORTED = "1";
    private static final String SORT_CORE = "2";
    private static final String SORT_SNIPPET = "3";

    private final ServerContext context;
    private final Map<String, GrammarDocument> checked = new ConcurrentHashMap<>();
    private final Map<Path, DiskSymbols> diskSymbols = new ConcurrentHashMap<>();

    private record DiskSymbols(Object stamp, List<WorkspaceSymbol> symbols) {
    }

    /** One value syntax offered as a snippet. */
    private record Snippet(String label, String filter, String body, String detail) {
    }

    private static final List<Snippet> SNIPPETS = List.of(
            new Snippet("%x41", "%x", "%x${1:41}", "one character by its hexadecimal code point (RFC 5234 §2.3)"),
            new Snippet("%x30-39", "%x", "%x${1:30}-${2:39}", "a range of code points, hexadecimal (RFC 5234 §3.4)"),
            new Snippet("%x0D.0A", "%x", "%x${1:0D}.${2:0A}", "a string of code points, hexadecimal (RFC 5234 §2.3)"),
            new Snippet("%d65", "%d", "%d${1:65}", "one character by its decimal code point (RFC 5234 §2.3)"),
            new Snippet("%b1000001", "%b", "%b${1:1000001}", "one character by its binary code point (RFC 5234 §2.3)"),
            new Snippet("%s\"…\"", "%s", "%s\"${1:text}\"", "a case-sensitive string (RFC 7405)"),
            new Snippet("%i\"…\"", "%i", "%i\"${1:text}\"", "a case-insensitive string, said explicitly (RFC 7405)"));

    /** Features for the documents of a server. */
    public GrammarFeatures(ServerContext context) {
        this.context = context;
    }

    /** The checked version of a snapshot: cached while the snapshot and its imports are unchanged. */
    GrammarDocument document(DocumentSnapshot doc) {
        GrammarDocument g = checked.get(doc.uri());
        if (g != null && g.doc == doc && g.importsUnchanged(context)) {
            return g;
        }
        g = GrammarDocument.check(doc, context);
        if (context.openDocument(doc.uri()).isPresent()) {
            checked.put(doc.uri(), g);
        }
        return g;
    }

    @Override
    public List<String> watchedGlobs() {
        return List.of("**/*.abnf");
    }

    @Override
    public void filesChanged(List<FileEvent> events) {
        for (FileEvent e : events) {
            DocumentSnapshot.pathOf(e.getUri()).ifPresent(diskSymbols::remove);
        }
    }

    @Override
    public void closed(String uri) {
        checked.remove(uri);
    }

    // ---------------------------------------------------------------- diagnostics

    @Override
    public List<Diagnostic> diagnostics(DocumentSnapshot doc) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            context.log(MessageType.Warning, doc.uri() + ": " + g.refusal);
            Diagnostic d = new Diagnostic(doc.range(0, 0), g.refusal, DiagnosticSeverity.Warning, "espalier");
            d.setCode(Either.forLeft("not-checked"));
            return List.of(d);
        }
        List<Diagnostic> out = new ArrayList<>();
        for (dev.espalier.grammar.Diagnostic d : g.result.diagnostics()) {
            Diagnostic lsp = toLsp(doc, d);
            if (d.code().equals("duplicate-definition") && d.span().isKnown() && d.span().end() <= doc.text().length()) {
                String key = GrammarDocument.key(doc.text().substring(d.span().start(), d.span().end()));
                g.definitions(key).stream().filter(x -> x.kind() == RuleSite.Kind.DEFINITION).findFirst()
                        .filter(first -> first.span().start() != d.span().start())
                        .ifPresent(first -> lsp.setRelatedInformation(List.of(
                                new org.eclipse.lsp4j.DiagnosticRelatedInformation(g.location(first), "first definition"))));
            }
            out.add(lsp);
        }
        doc.path().ifPresent(this::refreshImporters);
        return out;
    }

    /** Asks for fresh diagnostics of the open grammars that import a file whose text just changed. */
    private void refreshImporters(Path changed) {
        for (GrammarDocument other : checked.values()) {
            if (other.imports(changed) && context.openDocument(other.doc.uri()).isPresent()
                    && !other.importsUnchanged(context)) {
                context.refreshDiagnostics(other.doc.uri());
            }
        }
    }

    static Diagnostic toLsp(DocumentSnapshot doc, dev.espalier.grammar.Diagnostic d) {
        Span s = d.span();
        Range range = s.isKnown() ? doc.range(s.start(), s.end()) : doc.range(0, 0);
        Diagnostic out = new Diagnostic(range, d.message(), severity(d.severity()), "espalier");
        out.setCode(Either.forLeft(d.code()));
        return out;
    }

    static DiagnosticSeverity severity(Severity s) {
        return switch (s) {
            case ERROR -> DiagnosticSeverity.Error;
            case WARNING -> DiagnosticSeverity.Warning;
            case INFORMATION -> DiagnosticSeverity.Information;
            case HINT -> DiagnosticSeverity.Hint;
        };
    }

    // ---------------------------------------------------------------- completion

    @Override
    public CompletionList completion(DocumentSnapshot doc, Position position) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return new CompletionList(false, List.of());
        }
        String text = doc.text();
        int at = doc.offset(position);
        int lineStart = doc.lineStart(position.getLine());
        if (AbnfTokens.inCommentOrString(text, lineStart, at)) {
            return new CompletionList(false, List.of());
        }
        int start = at;
        while (start > lineStart && (AbnfTokens.isAlpha(text.charAt(start - 1))
                || AbnfTokens.isDigit(text.charAt(start - 1)) || text.charAt(start - 1) == '-')) {
            start--;
        }
        boolean value = start > lineStart && text.charAt(start - 1) == '%';
        if (value) {
            start--;
        }
        Range replace = doc.range(start, at);
        List<CompletionItem> items = new ArrayList<>();
        if (!value) {
            Set<String> seen = new HashSet<>();
            for (Rule r : g.result.grammar().rules()) {
                List<RuleSite> defs = g.definitions(r.key());
                if (defs.isEmpty()) {
                    continue; // an added core rule: listed below with its RFC text
                }
                boolean own = defs.get(0).source().equals(g.name);
                CompletionItem item = new CompletionItem(r.name());
                item.setKind(CompletionItemKind.Function);
                item.setDetail(own ? "rule, line " + defs.get(0).span().line()
                        : "rule from " + GrammarDocument.fileName(defs.get(0).source()));
                item.setSortText((own ? SORT_OWN : SORT_IMPORTED) + r.name().toLowerCase(Locale.ROOT));
                item.setTextEdit(Either.forLeft(new TextEdit(replace, r.name())));
                JsonObject data = new JsonObject();
                data.addProperty("rule", r.key());
                item.setData(data);
                items.add(item);
                seen.add(r.key());
            }
            for (String core : CoreRuleTexts.names()) {
                if (seen.contains(GrammarDocument.key(core))) {
                    continue;
                }
                CompletionItem item = new CompletionItem(core);
                item.setKind(CompletionItemKind.Constant);
                item.setDetail("core rule (RFC 5234 Appendix B.1)");
                item.setSortText(SORT_CORE + core.toLowerCase(Locale.ROOT));
                item.setTextEdit(Either.forLeft(new TextEdit(replace, core)));
                item.setDocumentation(new MarkupContent(MarkupKind.MARKDOWN,
                        "```abnf\n" + CoreRuleTexts.definition(core).orElse(core) + "\n```"));
                items.add(item);
            }
        }
        for (Snippet s : SNIPPETS) {
            CompletionItem item = new CompletionItem(s.label());
            item.setKind(CompletionItemKind.Snippet);
            item.setDetail(s.detail());
            item.setFilterText(s.filter());
            item.setSortText(SORT_SNIPPET + s.label());
            item.setInsertTextFormat(InsertTextFormat.Snippet);
            item.setTextEdit(Either.forLeft(new TextEdit(replace, s.body())));
            items.add(item);
        }
        return new CompletionList(false, items);
    }

    @Override
    public CompletionItem resolve(DocumentSnapshot doc, CompletionItem item) {
        if (doc == null || !(item.getData() instanceof JsonObject data) || !data.has("rule")) {
            return item;
        }
        JsonElement rule = data.get("rule");
        GrammarDocument g = document(doc);
        if (!g.analysed() || !rule.isJsonPrimitive()) {
            return item;
        }
        String key = rule.getAsString();
        g.definitionText(key).ifPresent(def -> item.setDocumentation(new MarkupContent(MarkupKind.MARKDOWN,
                "```abnf\n" + def + "\n```\n\n" + g.origin(key))));
        return item;
    }

    // ---------------------------------------------------------------- hover

    @Override
    public Hover hover(DocumentSnapshot doc, Position position) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return null;
        }
        Optional<RuleSite> site = g.siteAt(doc.offset(position));
        if (site.isEmpty()) {
            return null;
        }
        RuleSite s = site.get();
        String md = g.hovers.computeIfAbsent(s.key() + "\u0000" + s.name(), k -> ruleSummary(g, s.key(), s.name()));
        return new Hover(new MarkupContent(MarkupKind.MARKDOWN, md), doc.range(s.span().start(), s.span().end()));
    }

    /** The hover text of a rule: definition, facts, shortest string and examples. */
    String ruleSummary(GrammarDocument g, String key, String written) {
        Optional<Rule> rule = g.result.grammar().rule(key);
        String name = g.displayName(key, written);
        StringBuilder md = new StringBuilder();
        if (rule.isEmpty()) {
            return md.append("**").append(written).append("** is not defined (and is not an RFC 5234 core rule)")
                    .toString();
        }
        md.append("**").append(name).append("** — ").append(g.origin(key)).append("\n\n");
        g.definitionText(key).ifPresent(def -> md.append("```abnf\n").append(def).append("\n```\n\n"));
        RuleFacts f;
        try {
            f = g.analysis().facts(key);
        } catch (IllegalArgumentException e) {
            return md.toString();
        }
        md.append("- nullable: ").append(f.nullable() ? "yes, derives the empty string" : "no").append('\n');
        if (!f.productive()) {
            md.append("- derives no finite string\n");
            return md.toString();
        }
        md.append("- ").append(shape(g, rule.get(), f)).append('\n');
        Optional<String> shortest = f.shortest();
        if (shortest.isPresent()) {
            md.append("- shortest string: ").append(code(literal(shortest.get())))
                    .append(" (").append(f.shortestLength()).append(f.shortestLength() == 1 ? " byte)" : " bytes)")
                    .append('\n');
        } else {
            md.append("- shortest string: ").append(f.shortestLength()).append(" bytes, too long to show\n");
        }
        List<String> examples = g.analysis().examples(key, HOVER_EXAMPLES, key.hashCode(), 6);
        if (!examples.isEmpty()) {
            md.append("- examples: ");
            for (int i = 0; i < examples.size(); i++) {
                md.append(i == 0 ? "" : ", ").append(code(literal(examples.get(i))));
            }
            md.append('\n');
        }
        return md.toString();
    }

    /** Regular (with its automaton's size) or context-free. */
    private String shape(GrammarDocument g, Rule rule, RuleFacts f) {
        if (!f.regular()) {
            return "context-free (recursive" + (f.leftRecursive() ? ", left-recursive" : "")
                    + "): masks use the Earley parser";
        }
        int limit = ByteDfa.DEFAULT_STATE_LIMIT;
        try {
            var chars = CharAutomata.compileUnminimized(rule.body(),
                    n -> g.result.grammar().rule(n).map(Rule::body).orElse(null), limit);
            ByteDfa dfa = ByteDfa.fromCharAutomaton(chars, limit);
            return "regular: compiles to a byte automaton of " + dfa.stateCount()
                    + (dfa.stateCount() == 1 ? " state" : " states");
        } catch (AutomatonTooLargeException e) {
            context.log(MessageType.Info, "hover on " + rule.name() + ": " + e.getMessage());
            return String.format("regular, but its byte automaton would exceed %,d states: masks use the Earley "
                    + "parser for it", limit);
        } catch (IllegalArgumentException e) {
            return "regular, but it cannot be compiled: " + e.getMessage();
        }
    }

    /** A string as a JSON literal, cut after {@link #HOVER_STRING_CHARS} characters. */
    static String literal(String s) {
        boolean cut = s.length() > HOVER_STRING_CHARS;
        String shown = cut ? s.substring(0, HOVER_STRING_CHARS) : s;
        if (cut && Character.isHighSurrogate(shown.charAt(shown.length() - 1))) {
            shown = shown.substring(0, shown.length() - 1);
        }
        return TokenText.jsonLiteral(shown.getBytes(StandardCharsets.UTF_8)) + (cut ? "…" : "");
    }

    /** Markdown inline code that survives backticks in the text. */
    static String code(String s) {
        String fence = s.contains("`") ? "``" : "`";
        return fence + (s.startsWith("`") || s.endsWith("`") ? " " + s + " " : s) + fence;
    }

    // ---------------------------------------------------------------- navigation

    @Override
    public List<Location> definition(DocumentSnapshot doc, Position position) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        int at = doc.offset(position);
        Optional<RuleSite> site = g.siteAt(at);
        if (site.isPresent()) {
            List<Location> out = new ArrayList<>();
            for (RuleSite d : g.definitions(site.get().key())) {
                out.add(g.location(d));
            }
            return out;
        }
        return importTarget(g, at).map(p -> List.of(new Location(p.toUri().toString(),
                new Range(new Position(0, 0), new Position(0, 0))))).orElse(List.of());
    }

    /** The file a {@code ;@use "path"} directive at an offset names, when it exists. */
    private static Optional<Path> importTarget(GrammarDocument g, int at) {
        DocumentSnapshot doc = g.doc;
        int line = doc.position(at).getLine();
        int ls = doc.lineStart(line);
        String lineText = doc.text().substring(ls, doc.lineEnd(line));
        for (AbnfTokens.Token t : AbnfTokens.lex(lineText)) {
            if (t.kind() == AbnfTokens.Kind.DIRECTIVE_PATH && at >= ls + t.start() && at <= ls + t.end()) {
                String path = lineText.substring(t.start() + 1, t.end() - (lineText.charAt(t.end() - 1) == '"'
                        && t.length() > 1 ? 1 : 0));
                try {
                    Path p = Path.of(g.name).resolveSibling(path).toAbsolutePath().normalize();
                    return Files.isRegularFile(p) ? Optional.of(p) : Optional.empty();
                } catch (RuntimeException e) {
                    return Optional.empty();
                }
            }
        }
        return Optional.empty();
    }

    @Override
    public List<Location> references(DocumentSnapshot doc, Position position, boolean includeDeclaration) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        Optional<RuleSite> site = g.siteAt(doc.offset(position));
        if (site.isEmpty()) {
            return List.of();
        }
        List<Location> out = new ArrayList<>();
        for (RuleSite s : g.sites(site.get().key())) {
            if (includeDeclaration || !s.isDefinition()) {
                out.add(g.location(s));
            }
        }
        return out;
    }

    @Override
    public Range prepareRename(DocumentSnapshot doc, Position position) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return null;
        }
        Optional<RuleSite> site = g.siteAt(doc.offset(position));
        if (site.isEmpty()) {
            return null;
        }
        RuleSite s = site.get();
        if (g.definitions(s.key()).isEmpty() && CoreRuleTexts.isCore(s.key())) {
            throw new IllegalArgumentException(s.name() + " is an RFC 5234 core rule; define it in this file to rename it");
        }
        return doc.range(s.span().start(), s.span().end());
    }

    @Override
    public WorkspaceEdit rename(DocumentSnapshot doc, Position position, String newName) {
        Range r = prepareRename(doc, position);
        if (r == null) {
            return null;
        }
        if (!AbnfTokens.isRuleName(newName)) {
            throw new IllegalArgumentException("'" + newName + "' is not an ABNF rule name: a letter, then letters, "
                    + "digits and hyphens (RFC 5234 §4)");
        }
        GrammarDocument g = document(doc);
        RuleSite s = g.siteAt(doc.offset(position)).orElseThrow();
        String newKey = GrammarDocument.key(newName);
        if (!newKey.equals(s.key()) && (g.definedKeys().contains(newKey) || CoreRuleTexts.isCore(newKey))) {
            throw new IllegalArgumentException("a rule named " + g.displayName(newKey, newName)
                    + " already exists; renaming would merge two rules");
        }
        Map<String, List<TextEdit>> changes = new LinkedHashMap<>();
        for (RuleSite site : g.sites(s.key())) {
            Location l = g.location(site);
            changes.computeIfAbsent(l.getUri(), u -> new ArrayList<>()).add(new TextEdit(l.getRange(), newName));
        }
        return new WorkspaceEdit(changes);
    }

    // ---------------------------------------------------------------- symbols

    @Override
    public List<DocumentSymbol> documentSymbols(DocumentSnapshot doc) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        List<DocumentSymbol> out = new ArrayList<>();
        for (RuleSite s : g.ownSites()) {
            if (!s.isDefinition()) {
                continue;
            }
            int[] e = g.extent(s);
            String firstLine = doc.text().substring(s.span().end(), doc.lineEnd(doc.position(s.span().start()).getLine()))
                    .strip();
            DocumentSymbol sym = new DocumentSymbol(s.name(), SymbolKind.Function, doc.range(e[0], e[1]),
                    doc.range(s.span().start(), s.span().end()), firstLine);
            out.add(sym);
        }
        return out;
    }

    @Override
    public List<WorkspaceSymbol> workspaceSymbols(String query) {
        String q = query.toLowerCase(Locale.ROOT);
        List<WorkspaceSymbol> out = new ArrayList<>();
        Set<Path> openPaths = new HashSet<>();
        for (DocumentSnapshot d : context.openDocuments()) {
            if (!DocumentSnapshot.hasExtension(d.uri(), ".abnf")) {
                continue;
            }
            d.path().ifPresent(openPaths::add);
            if (GrammarDocument.refusal(d) != null) {
                continue;
            }
            addMatching(symbolsOf(d.uri(), Abnf.parse(d.text(), d.uri()), d), q, out);
        }
        int files = 0;
        for (Path folder : context.workspaceFolders()) {
            for (Path p : abnfFiles(folder)) {
                if (files++ >= MAX_WORKSPACE_FILES || out.size() >= MAX_WORKSPACE_SYMBOLS) {
                    break;
                }
                if (!openPaths.contains(p)) {
                    addMatching(diskSymbols(p), q, out);
                }
            }
        }
        return out.size() > MAX_WORKSPACE_SYMBOLS ? out.subList(0, MAX_WORKSPACE_SYMBOLS) : out;
    }

    private static void addMatching(List<WorkspaceSymbol> symbols, String query, List<WorkspaceSymbol> out) {
        for (WorkspaceSymbol s : symbols) {
            if (matches(s.getName().toLowerCase(Locale.ROOT), query)) {
                out.add(s);
            }
        }
    }

    /** Whether the query's characters occur in the name in order (an empty query matches all). */
    static boolean matches(String name, String query) {
        int i = 0;
        for (int j = 0; j < name.length() && i < query.length(); j++) {
            if (name.charAt(j) == query.charAt(i)) {
                i++;
            }
        }
        return i == query.length();
    }

    private static List<WorkspaceSymbol> symbolsOf(String uri, AbnfResult r, DocumentSnapshot view) {
        List<WorkspaceSymbol> out = new ArrayList<>();
        String container = GrammarDocument.fileName(view.path().map(Path::toString).orElse(uri));
        for (RuleSite s : r.sites()) {
            if (s.kind() == RuleSite.Kind.DEFINITION) {
                out.add(new WorkspaceSymbol(s.name(), SymbolKind.Function,
                        Either.forLeft(new Location(uri, view.range(s.span().start(), s.span().end()))), container));
            }
        }
        return out;
    }

    private List<WorkspaceSymbol> diskSymbols(Path p) {
        Object stamp;
        try {
            BasicFileAttributes a = Files.readAttributes(p, BasicFileAttributes.class);
            stamp = a.lastModifiedTime().toMillis() + ":" + a.size();
            if (a.size() > GrammarDocument.MAX_CHARS) {
                return List.of();
            }
        } catch (IOException e) {
            return List.of();
        }
        DiskSymbols cached = diskSymbols.get(p);
        if (cached != null && cached.stamp().equals(stamp)) {
            return cached.symbols();
        }
        List<WorkspaceSymbol> symbols;
        try {
            String text = Files.readString(p, StandardCharsets.UTF_8);
            String uri = p.toUri().toString();
            DocumentSnapshot view = new DocumentSnapshot(uri, "abnf", 0, text);
            symbols = GrammarDocument.refusal(view) != null ? List.of()
                    : symbolsOf(uri, Abnf.parse(text, p.toString()), view);
        } catch (IOException | RuntimeException e) {
            symbols = List.of();
        }
        diskSymbols.put(p, new DiskSymbols(stamp, symbols));
        return symbols;
    }

    /** The {@code .abnf} files under a folder, skipping hidden folders and build output. */
    static List<Path> abnfFiles(Path folder) {
        List<Path> out = new ArrayList<>();
        if (!Files.isDirectory(folder)) {
            return out;
        }
        try {
            Files.walkFileTree(folder, Set.of(), 12, new SimpleFileVisitor<>() {
                private int entries;

                @Override
                public FileVisitResult preVisitDirectory(Path dir, BasicFileAttributes attrs) {
                    if (++entries > MAX_WORKSPACE_ENTRIES) {
                        return FileVisitResult.TERMINATE;
                    }
                    String n = dir.getFileName() == null ? "" : dir.getFileName().toString();
                    if (!dir.equals(folder) && (n.startsWith(".") || n.equals("target") || n.equals("node_modules")
                            || n.equals("build"))) {
                        return FileVisitResult.SKIP_SUBTREE;
                    }
                    return FileVisitResult.CONTINUE;
                }

                @Override
                public FileVisitResult visitFile(Path file, BasicFileAttributes attrs) {
                    if (++entries > MAX_WORKSPACE_ENTRIES) {
                        return FileVisitResult.TERMINATE;
                    }
                    if (attrs.isRegularFile() && file.toString().toLowerCase(Locale.ROOT).endsWith(".abnf")) {
                        out.add(file.toAbsolutePath().normalize());
                    }
                    return out.size() >= MAX_WORKSPACE_FILES ? FileVisitResult.TERMINATE : FileVisitResult.CONTINUE;
                }

                @Override
                public FileVisitResult visitFileFailed(Path file, IOException exc) {
                    return FileVisitResult.CONTINUE;
                }
            });
        } catch (IOException e) { // unreadable folder: list what was found
        }
        out.sort(Comparator.naturalOrder());
        return out;
    }

    // ---------------------------------------------------------------- presentation

    @Override
    public List<Integer> semanticTokens(DocumentSnapshot doc) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        Set<Integer> declarations = new HashSet<>();
        for (RuleSite s : g.ownSites()) {
            if (s.isDefinition()) {
                declarations.add(s.span().start());
            }
        }
        Set<String> defined = g.definedKeys();
        List<Integer> data = new ArrayList<>();
        int prevLine = 0;
        int prevChar = 0;
        String text = doc.text();
        for (AbnfTokens.Token t : AbnfTokens.lex(text)) {
            int type;
            int modifiers = 0;
            switch (t.kind()) {
                case NAME -> {
                    type = SemanticLegend.FUNCTION;
                    if (declarations.contains(t.start())) {
                        modifiers |= SemanticLegend.DECLARATION;
                    }
                    String key = GrammarDocument.key(text.substring(t.start(), t.end()));
                    if (!defined.contains(key) && CoreRuleTexts.isCore(key)) {
                        modifiers |= SemanticLegend.DEFAULT_LIBRARY;
                    }
                }
                case STRING, PROSE, DIRECTIVE_PATH -> type = SemanticLegend.STRING;
                case VALUE, REPEAT -> type = SemanticLegend.NUMBER;
                case COMMENT -> type = SemanticLegend.COMMENT;
                case DIRECTIVE -> type = SemanticLegend.KEYWORD;
                case DEFINE, SLASH -> type = SemanticLegend.OPERATOR;
                default -> {
                    continue;
                }
            }
            Position p = doc.position(t.start());
            int deltaLine = p.getLine() - prevLine;
            data.add(deltaLine);
            data.add(deltaLine == 0 ? p.getCharacter() - prevChar : p.getCharacter());
            data.add(t.length());
            data.add(type);
            data.add(modifiers);
            prevLine = p.getLine();
            prevChar = p.getCharacter();
        }
        return data;
    }

    @Override
    public List<FoldingRange> foldingRanges(DocumentSnapshot doc) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        List<FoldingRange> out = new ArrayList<>();
        for (RuleSite s : g.ownSites()) {
            if (s.isDefinition()) {
                int[] e = g.extent(s);
                int a = doc.position(e[0]).getLine();
                int b = doc.position(e[1]).getLine();
                if (b > a) {
                    FoldingRange f = new FoldingRange(a, b);
                    f.setKind(FoldingRangeKind.Region);
                    out.add(f);
                }
            }
        }
        String text = doc.text();
        int runStart = -1;
        String runKind = null;
        for (int line = 0; line <= doc.lineCount(); line++) {
            String kind = null;
            if (line < doc.lineCount()) {
                String content = text.substring(doc.lineStart(line), doc.lineEnd(line)).strip();
                if (content.startsWith(";@use")) {
                    kind = FoldingRangeKind.Imports;
                } else if (content.startsWith(";")) {
                    kind = FoldingRangeKind.Comment;
                }
            }
            if (!java.util.Objects.equals(kind, runKind)) {
                if (runKind != null && line - 1 > runStart) {
                    FoldingRange f = new FoldingRange(runStart, line - 1);
                    f.setKind(runKind);
                    out.add(f);
                }
                runStart = line;
                runKind = kind;
            }
        }
        out.sort(Comparator.comparingInt(FoldingRange::getStartLine));
        return out;
    }

    @Override
    public List<TextEdit> formatting(DocumentSnapshot doc, FormattingOptions options) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        AbnfPrinter.Formatted f = AbnfPrinter.layout(doc.text(), g.name);
        if (!f.applied()) {
            context.log(MessageType.Info, doc.uri() + " has syntax errors; formatting left it as it is");
            return List.of();
        }
        if (f.text().equals(doc.text())) {
            return List.of();
        }
        return List.of(new TextEdit(doc.range(0, doc.text().length()), f.text()));
    }

    // ---------------------------------------------------------------- code actions

    @Override
    public List<CodeAction> codeActions(DocumentSnapshot doc, CodeActionParams params) {
        GrammarDocument g = document(doc);
        if (!g.analysed()) {
            return List.of();
        }
        int a = doc.offset(params.getRange().getStart());
        int b = doc.offset(params.getRange().getEnd());
        List<CodeAction> out = new ArrayList<>();
        for (dev.espalier.grammar.Diagnostic d : g.result.diagnostics()) {
            Span s = d.span();
            if (!s.isKnown() || s.end() < a || s.start() > b || s.end() > doc.text().length()) {
                continue;
            }
            Diagnostic lsp = toLsp(doc, d);
            switch (d.code()) {
                case "undefined-rule" -> defineRule(g, s, lsp, out);
                case "case-insensitive-string" -> out.add(fix(doc, "Make the string case-sensitive: %s" + doc.text()
                        .substring(s.start(), s.end()), lsp, true, new TextEdit(doc.range(s.start(), s.start()), "%s")));
                case "unused-rule" -> removeRule(g, s, lsp, out);
                case "duplicate-definition" -> defineOperator(doc, s, "=", "=/",
                        "Turn the second '=' into '=/' (add alternatives)", lsp, out);
                case "incremental-undefined" -> defineOperator(doc, s, "=/", "=",
                        "Turn '=/' into '=' (this is the first definition)", lsp, out);
                default -> {
                }
            }
        }
        return out;
    }

    private void defineRule(GrammarDocument g, Span s, Diagnostic lsp, List<CodeAction> out) {
        DocumentSnapshot doc = g.doc;
        String name = doc.text().substring(s.start(), s.end());
        // right after the rule that refers to it, or at the end
        int insertAt = doc.text().length();
        for (RuleSite d : g.ownSites()) {
            if (d.isDefinition() && d.span().start() <= s.start()) {
                insertAt = g.extent(d)[1];
            }
        }
        String newline = doc.text().contains("\r\n") ? "\r\n" : "\n";
        String prefix = insertAt == 0 ? "" : newline;
        String suffix = insertAt == doc.text().length() && insertAt > 0 ? newline : "";
        out.add(fix(doc, "Define rule '" + name + "'", lsp, false,
                new TextEdit(doc.range(insertAt, insertAt), prefix + name + " = \"\"" + suffix)));
        for (String candidate : nearNames(g, name)) {
            out.add(fix(doc, "Change to '" + candidate + "'", lsp, false,
                    new TextEdit(doc.range(s.start(), s.end()), candidate)));
        }
    }

    /** Defined or core rule names within two edits of a name (a likely typo), closest first. */
    private static List<String> nearNames(GrammarDocument g, String name) {
        String key = GrammarDocument.key(name);
        Map<String, Integer> found = new LinkedHashMap<>();
        List<String> names = new ArrayList<>();
        for (String k : g.definedKeys()) {
            names.add(g.displayName(k, k));
        }
        for (String core : CoreRuleTexts.names()) {
            names.add(core);
        }
        int limit = Math.min(2, Math.max(1, key.length() / 3));
        for (String n : names) {
            int d = distance(key, GrammarDocument.key(n));
            if (d > 0 && d <= limit) {
                found.putIfAbsent(n, d);
            }
        }
        return found.entrySet().stream().sorted(Map.Entry.comparingByValue()).limit(3).map(Map.Entry::getKey).toList();
    }

    /** Edit distance with adjacent transpositions (optimal string alignment): "DIGTI" is one edit from "DIGIT". */
    static int distance(String a, String b) {
        int[][] d = new int[a.length() + 1][b.length() + 1];
        for (int i = 0; i <= a.length(); i++) {
            d[i][0] = i;
        }
        for (int j = 0; j <= b.length(); j++) {
            d[0][j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                d[i][j] = Math.min(Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1), d[i - 1][j - 1] + cost);
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
                }
            }
        }
        return d[a.length()][b.length()];
    }

    private static void removeRule(GrammarDocument g, Span s, Diagnostic lsp, List<CodeAction> out) {
        DocumentSnapshot doc = g.doc;
        String key = GrammarDocument.key(doc.text().substring(s.start(), s.end()));
        List<TextEdit> edits = new ArrayList<>();
        for (RuleSite d : g.ownSites()) {
            if (d.isDefinition() && d.key().equals(key)) {
                int[] e = g.extent(d);
                int line = doc.position(e[0]).getLine();
                int from = doc.text().substring(doc.lineStart(line), e[0]).isBlank() ? doc.lineStart(line) : e[0];
                int endLine = doc.position(e[1]).getLine();
                int to = endLine + 1 < doc.lineCount() ? doc.lineStart(endLine + 1) : e[1];
                edits.add(new TextEdit(doc.range(from, to), ""));
            }
        }
        if (!edits.isEmpty()) {
            out.add(fix(doc, "Remove unused rule '" + g.displayName(key, key) + "'", lsp, false,
                    edits.toArray(TextEdit[]::new)));
        }
    }

    private static void defineOperator(DocumentSnapshot doc, Span name, String from, String to, String title,
                                       Diagnostic lsp, List<CodeAction> out) {
        String text = doc.text();
        int i = name.end();
        while (i < text.length() && Character.isWhitespace(text.charAt(i))) {
            i++;
        }
        boolean incremental = text.startsWith("=/", i);
        if (!text.startsWith(from, i) || (from.equals("=") && incremental)) {
            return;
        }
        out.add(fix(doc, title, lsp, true, new TextEdit(doc.range(i, i + from.length()), to)));
    }

    private static CodeAction fix(DocumentSnapshot doc, String title, Diagnostic lsp, boolean preferred, TextEdit... edits) {
        CodeAction a = new CodeAction(title);
        a.setKind(CodeActionKind.QuickFix);
        a.setDiagnostics(List.of(lsp));
        a.setEdit(new WorkspaceEdit(Map.of(doc.uri(), List.of(edits))));
        if (preferred) {
            a.setIsPreferred(true);
        }
        return a;
    }
}
