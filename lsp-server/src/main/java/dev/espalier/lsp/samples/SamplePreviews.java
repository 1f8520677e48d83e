package dev.espalier.lsp.samples;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import dev.espalier.lsp.AllowedTokensResult;
import dev.espalier.lsp.DocumentFeatures;
import dev.espalier.lsp.DocumentSnapshot;
import dev.espalier.lsp.ServerContext;
import dev.espalier.lsp.ServerOptions;
import dev.espalier.lsp.samples.PreviewCache.PreviewException;
import dev.espalier.lsp.samples.PreviewCache.Source;
import dev.espalier.lsp.samples.SampleMap.Entry;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.TokenBits;
import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabulary;
import org.eclipse.lsp4j.CodeAction;
import org.eclipse.lsp4j.CodeActionKind;
import org.eclipse.lsp4j.CodeActionParams;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionItemKind;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.FileEvent;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.MarkupContent;
import org.eclipse.lsp4j.MarkupKind;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextEdit;
import org.eclipse.lsp4j.WorkspaceEdit;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.eclipse.lsp4j.jsonrpc.messages.Either;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseError;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseErrorCode;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;

/**
 * The preview of allowed tokens in sample files: the features of every document that is not a
 * grammar file. A sample file is mapped to a constraint and a vocabulary by the nearest workspace
 * file {@value SampleMap#FILE_NAME} in its folder or above (see {@link SampleMapReader}); the
 * workspace file itself gets diagnostics of its own.
 *
 * <ul>
 *   <li>diagnostics: an error at the first character whose bytes leave the language, with what was
 *       expected; an information note at the end when the text is a valid but incomplete beginning.
 *       The sample is the document's text without one final line break, as for {@code espalier test};</li>
 *   <li>completion: the tokens allowed after the text before the cursor, with visible escapes, at
 *       most {@link #MAX_ITEMS}; choosing one inserts its text;</li>
 *   <li>hover: the count of allowed tokens, whether the output may end there, the forced continuation;</li>
 *   <li>{@code espalier/allowedTokens}: the allowed ids and texts.</li>
 * </ul>
 *
 * <p>Constraints and vocabularies come from a {@link PreviewCache} and are prepared in the
 * background; a feature asked while they are being prepared waits at most {@link #READY_WAIT_MILLIS}
 * and otherwise answers that the preview is being prepared (diagnostics are refreshed when it is ready).
 */
public final class SamplePreviews implements DocumentFeatures {

    /** Most completion items listed (the list is marked incomplete beyond). */
    public static final int MAX_ITEMS = 500;
    /** How long a request waits for a constraint being prepared before answering without it. */
    public static final long READY_WAIT_MILLIS = 300;

    private static final PreviewCache SHARED = new PreviewCache();

    private final ServerContext context;
    private final PreviewCache cache;
    private final Map<Path, SampleMap> maps = new HashMap<>();
    private final Map<Path, String> mapTexts = new HashMap<>();
    private final Map<String, Reuse> cursors = new HashMap<>();
    private final Map<String, CompletableFuture<Constraint>> awaited = new HashMap<>();

    /** A cursor kept per document: fed {@code bytes} so far under {@code constraint}. */
    private record Reuse(Constraint constraint, byte[] bytes, Cursor cursor) {
    }

    /** A sample document's mapping: the workspace file and the entry that matched. */
    record Binding(SampleMap map, Entry entry, Source source) {
    }

    /** Sample features over the given cache. */
    public SamplePreviews(ServerContext context, PreviewCache cache) {
        this.context = context;
        this.cache = cache;
    }

    /** The factory for {@link ServerOptions#withSamples}, sharing one cache per process. */
    public static ServerOptions.SampleFeatures features() {
        return context -> new SamplePreviews(context, SHARED);
    }

    /** The factory for {@link ServerOptions#withSamples}, over a given cache. */
    public static ServerOptions.SampleFeatures features(PreviewCache cache) {
        return context -> new SamplePreviews(context, cache);
    }

    // ------------------------------------------------------------------ features

    @Override
    public List<Diagnostic> diagnostics(DocumentSnapshot doc) {
        Optional<Path> path = doc.path();
        if (path.isEmpty()) {
            return List.of();
        }
        if (isMapFile(path.get())) {
            return mapDiagnostics(path.get(), doc.text());
        }
        Optional<Binding> b = binding(path.get());
        if (b.isEmpty()) {
            return List.of();
        }
        Ready r = ready(doc.uri(), b.get());
        if (r.constraint == null) {
            return List.of(diagnostic(doc.range(0, doc.lineEnd(0)), r.pending ? DiagnosticSeverity.Information
                    : DiagnosticSeverity.Error, r.pending ? "preview-preparing" : "preview-unavailable", r.message));
        }
        String text = doc.text();
        String sample = withoutFinalLineBreak(text);
        TokenPreview p;
        try {
            p = preview(doc.uri(), r.constraint, sample.getBytes(StandardCharsets.UTF_8));
        } catch (PreviewException x) {
            return List.of(diagnostic(doc.range(0, doc.lineEnd(0)), DiagnosticSeverity.Warning, "preview-unavailable",
                    "no token preview: " + x.getMessage()));
        }
        if (p.rejected()) {
            int at = Utf8Offsets.charOffset(sample, p.rejectedAt());
            int end = at < sample.length() ? at + Utf8Offsets.width(sample, at) : at;
            String what = at < sample.length() ? "'" + TokenText.escape(sample.substring(at, end)
                    .getBytes(StandardCharsets.UTF_8)) + "'" : "this";
            return List.of(diagnostic(doc.range(at, end), DiagnosticSeverity.Error, "leaves-language",
                    what + " leaves the language of " + b.get().entry().describe() + "; expected " + p.expected()));
        }
        if (!p.endAllowed()) {
            String forced = p.forced().length > 0 ? "; it must go on with " + TokenText.escape(p.forced()) : "";
            return List.of(diagnostic(doc.range(sample.length(), sample.length()), DiagnosticSeverity.Information,
                    "incomplete", "incomplete: the text is a valid beginning but not yet complete; expected "
                            + p.expected() + forced));
        }
        return List.of();
    }

    private static final java.util.regex.Pattern VALUE_BEFORE_CURSOR =
            java.util.regex.Pattern.compile("\"(vocabulary|layout)\"\\s*:\\s*\"([^\"\\\\]*)$");

    @Override
    public CompletionList completion(DocumentSnapshot doc, Position position) {
        Optional<Path> file = doc.path();
        if (file.isPresent() && isMapFile(file.get())) {
            return valueCompletion(doc, position);
        }
        At at = at(doc, position);
        if (at == null || at.preview == null) {
            return new CompletionList(true, List.of());
        }
        TokenPreview p = at.preview;
        Vocabulary v = p.vocabulary();
        Range here = doc.range(at.offset, at.offset);
        String tally = tally(p);
        List<CompletionItem> items = new ArrayList<>();
        long[] mask = p.mask();
        for (int id = TokenBits.next(mask, 0); id >= 0 && items.size() < MAX_ITEMS; id = TokenBits.next(mask, id + 1)) {
            byte[] bytes = v.bytes(id);
            boolean end = id == v.endOfSequence();
            String insert = end ? "" : insertText(bytes);
            CompletionItem item = new CompletionItem(end ? "⟨end of output⟩ " + v.display(id) : TokenText.escape(bytes));
            item.setKind(end ? CompletionItemKind.Event : CompletionItemKind.Text);
            String partial = !end && Utf8Offsets.wholeCharacters(bytes) < bytes.length
                    ? " · ends inside a UTF-8 character: only its whole characters are inserted" : "";
            item.setDetail("token " + id + " · " + tally + partial);
            item.setSortText(sortKey(items.size()));
            item.setTextEdit(Either.forLeft(new TextEdit(here, insert)));
            JsonObject data = new JsonObject();
            data.addProperty("id", id);
            item.setData(data);
            items.add(item);
        }
        return new CompletionList(true, items);
    }

    @Override
    public CompletionItem resolve(DocumentSnapshot doc, CompletionItem item) {
        if (doc == null || !(item.getData() instanceof JsonElement e) || !e.isJsonObject()
                || !e.getAsJsonObject().has("id")) {
            return item;
        }
        Optional<Path> path = doc.path();
        Optional<Binding> b = path.flatMap(this::binding);
        if (b.isEmpty()) {
            return item;
        }
        Ready r = ready(doc.uri(), b.get());
        if (r.constraint == null) {
            return item;
        }
        Vocabulary v = r.constraint.vocabulary();
        int id = e.getAsJsonObject().get("id").getAsInt();
        if (!v.has(id)) {
            return item;
        }
        byte[] bytes = v.bytes(id);
        StringBuilder hex = new StringBuilder();
        for (byte x : bytes) {
            hex.append(hex.length() == 0 ? "" : " ").append(String.format(Locale.ROOT, "%02X", x & 0xFF));
        }
        String md = "token **" + id + "** of " + v.name() + (id == v.endOfSequence() ? " (end of sequence)" : "")
                + "\n\nbytes: `" + hex + "` (" + bytes.length + (bytes.length == 1 ? " byte" : " bytes") + ")"
                + "\n\ntext: `" + TokenText.escape(bytes) + "`"
                + (TokenText.isValidUtf8(bytes) ? "" : "\n\nnot whole UTF-8 characters: the next token completes the character");
        item.setDocumentation(new MarkupContent(MarkupKind.MARKDOWN, md));
        return item;
    }

    @Override
    public Hover hover(DocumentSnapshot doc, Position position) {
        Optional<Path> file = doc.path();
        if (file.isPresent() && isMapFile(file.get())) {
            return entryHover(doc, file.get(), position);
        }
        At at = at(doc, position);
        if (at == null) {
            return null;
        }
        String md;
        if (at.preview == null) {
            md = at.message;
        } else if (at.preview.rejected()) {
            String before = doc.text().substring(0, at.offset);
            Position where = doc.position(Utf8Offsets.charOffset(before, at.preview.rejectedAt()));
            md = "The text before this point leaves the language at line " + (where.getLine() + 1) + ", column "
                    + (where.getCharacter() + 1) + " (expected " + at.preview.expected() + "): no token is allowed here.";
        } else {
            TokenPreview p = at.preview;
            Vocabulary v = p.vocabulary();
            StringBuilder sb = new StringBuilder();
            sb.append("**").append(tally(p)).append("** here (").append(at.binding.entry().describe()).append(")\n\n");
            sb.append("end of output: ").append(p.endAllowed() ? "allowed" : "not allowed").append("\n\n");
            if (p.forced().length > 0) {
                sb.append("forced continuation: `").append(TokenText.escape(p.forced())).append("`\n\n");
            }
            sb.append("expected: ").append(p.expected().replace("`", "'"));
            List<String> first = new ArrayList<>();
            long[] mask = p.mask();
            for (int id = TokenBits.next(mask, 0); id >= 0 && first.size() < 12; id = TokenBits.next(mask, id + 1)) {
                first.add("`" + v.display(id) + "`");
            }
            if (!first.isEmpty()) {
                sb.append("\n\nfirst allowed: ").append(String.join(" ", first)).append(p.count() > first.size() ? " …" : "");
            }
            md = sb.toString();
        }
        Range r = doc.range(at.offset, at.offset);
        return new Hover(new MarkupContent(MarkupKind.MARKDOWN, md), r);
    }

    @Override
    public AllowedTokensResult allowedTokens(DocumentSnapshot doc, Position position, int limit) {
        At at = at(doc, position);
        if (at == null) {
            return null;
        }
        if (at.preview == null) {
            throw new ResponseErrorException(new ResponseError(ResponseErrorCode.RequestFailed, at.message, null));
        }
        TokenPreview p = at.preview;
        Vocabulary v = p.vocabulary();
        List<AllowedTokensResult.AllowedToken> tokens = new ArrayList<>();
        long[] mask = p.mask();
        for (int id = TokenBits.next(mask, 0); id >= 0 && tokens.size() < limit; id = TokenBits.next(mask, id + 1)) {
            tokens.add(new AllowedTokensResult.AllowedToken(id, v.display(id)));
        }
        return new AllowedTokensResult(p.count(), v.tokenCount(), p.endAllowed(), TokenText.escape(p.forced()), tokens);
    }

    /**
     * For an {@code incomplete} note whose text has a forced continuation: a quick fix that appends
     * it (its whole UTF-8 characters).
     */
    @Override
    public List<CodeAction> codeActions(DocumentSnapshot doc, CodeActionParams params) {
        List<CodeAction> out = new ArrayList<>();
        List<Diagnostic> ds = params.getContext() == null || params.getContext().getDiagnostics() == null ? List.of()
                : params.getContext().getDiagnostics();
        for (Diagnostic d : ds) {
            if (d.getCode() == null || !d.getCode().isLeft() || !"incomplete".equals(d.getCode().getLeft())) {
                continue;
            }
            At at = at(doc, d.getRange().getEnd());
            if (at == null || at.preview == null || at.preview.rejected() || at.preview.forced().length == 0) {
                continue;
            }
            String insert = insertText(at.preview.forced());
            if (insert.isEmpty()) {
                continue;
            }
            CodeAction a = new CodeAction("Append the forced continuation " + TokenText.escape(
                    insert.getBytes(StandardCharsets.UTF_8)));
            a.setKind(CodeActionKind.QuickFix);
            a.setDiagnostics(List.of(d));
            a.setEdit(new WorkspaceEdit(Map.of(doc.uri(), List.of(new TextEdit(doc.range(at.offset, at.offset), insert)))));
            out.add(a);
        }
        return out;
    }

    @Override
    public List<String> watchedGlobs() {
        return List.of("**/" + SampleMap.FILE_NAME, "**/*.abnf", "**/*.json");
    }

    @Override
    public void filesChanged(List<FileEvent> events) {
        for (FileEvent e : events) {
            if (DocumentSnapshot.hasExtension(e.getUri(), ".abnf")) {
                cache.forgetConstraints(); // an imported grammar may have changed
                return;
            }
        }
    }

    @Override
    public void closed(String uri) {
        cursors.remove(uri);
        awaited.remove(uri);
    }

    // ------------------------------------------------------------------ the workspace file

    private static boolean isMapFile(Path p) {
        return p.getFileName() != null && p.getFileName().toString().equals(SampleMap.FILE_NAME);
    }

    private List<Diagnostic> mapDiagnostics(Path file, String text) {
        SampleMap map = readMap(file, text);
        List<Diagnostic> out = new ArrayList<>();
        for (SampleMap.Problem p : map.problems()) {
            out.add(diagnostic(p.range(), p.severity(), p.code(), p.message()));
        }
        for (Entry e : map.entries()) {
            Source s;
            try {
                s = source(e);
                PreviewCache.checkWithoutVocabulary(s);
            } catch (PreviewException x) {
                out.add(diagnostic(e.source().range(), DiagnosticSeverity.Error, "constraint-error", x.getMessage()));
                continue;
            }
            CompletableFuture<Constraint> f = cache.peek(s);
            if (f != null && f.isCompletedExceptionally()) {
                out.add(diagnostic(e.source().range(), DiagnosticSeverity.Error, "constraint-error",
                        failureOf(f)));
            }
        }
        return out;
    }

    /** In the workspace file, inside the string value of {@code vocabulary} or {@code layout}: the known values. */
    private static CompletionList valueCompletion(DocumentSnapshot doc, Position position) {
        int offset = doc.offset(position);
        int lineStart = doc.lineStart(doc.position(offset).getLine());
        java.util.regex.Matcher m = VALUE_BEFORE_CURSOR.matcher(doc.text().substring(lineStart, offset));
        if (!m.find()) {
            return new CompletionList(false, List.of());
        }
        List<String> values = m.group(1).equals("layout") ? List.of("compact", "pretty")
                : dev.espalier.vocab.Vocabularies.builtinNames();
        Range typed = doc.range(offset - m.group(2).length(), offset);
        List<CompletionItem> items = new ArrayList<>();
        for (String v : values) {
            CompletionItem item = new CompletionItem(v);
            item.setKind(CompletionItemKind.Value);
            item.setDetail(m.group(1).equals("layout") ? "JSON layout of a schema's samples"
                    : "built-in vocabulary" + (v.equals(SampleMapReader.DEFAULT_VOCABULARY) ? " (the default)" : ""));
            item.setTextEdit(Either.forLeft(new TextEdit(typed, v)));
            items.add(item);
        }
        return new CompletionList(false, items);
    }

    /** On an entry of the workspace file: what it maps and how far its preview is prepared. */
    private Hover entryHover(DocumentSnapshot doc, Path file, Position position) {
        SampleMap map = readMap(file, doc.text());
        int offset = doc.offset(position);
        for (Entry e : map.entries()) {
            if (offset < doc.offset(e.range().getStart()) || offset > doc.offset(e.range().getEnd())) {
                continue;
            }
            StringBuilder sb = new StringBuilder("**").append(e.describe()).append("**\n\nfiles: ");
            sb.append(String.join(", ", e.globs().stream().map(g -> "`" + g.value() + "`").toList()));
            String status;
            try {
                Source src = source(e);
                CompletableFuture<Constraint> f = cache.peek(src);
                if (f == null) {
                    PreviewCache.checkWithoutVocabulary(src);
                    status = "not compiled yet (it is, when a sample it maps is opened)";
                } else if (!f.isDone()) {
                    status = "being prepared";
                } else if (f.isCompletedExceptionally()) {
                    status = "cannot be compiled: " + failureOf(f);
                } else {
                    Constraint c = f.join();
                    status = "compiled: " + c.describe() + "; " + String.format(Locale.ROOT, "%,d", c.vocabulary().tokenCount())
                            + " tokens in " + c.vocabulary().name();
                }
            } catch (PreviewException x) {
                status = x.getMessage();
            }
            sb.append("\n\n").append(status);
            return new Hover(new MarkupContent(MarkupKind.MARKDOWN, sb.toString()), e.range());
        }
        return null;
    }

    /** The workspace file's parse, read again only when its text changed; a change refreshes every document. */
    private SampleMap readMap(Path file, String text) {
        String old = mapTexts.get(file);
        SampleMap m = maps.get(file);
        if (m != null && text.equals(old)) {
            return m;
        }
        m = SampleMapReader.read(file, text);
        boolean changed = old != null;
        maps.put(file, m);
        mapTexts.put(file, text);
        if (changed) {
            context.refreshDiagnostics();
        }
        return m;
    }

    /** The text of a file as the editor holds it when open, else from disk; null when unreadable. */
    private String textOf(Path file) {
        for (DocumentSnapshot d : context.openDocuments()) {
            if (d.path().filter(file::equals).isPresent()) {
                return d.text();
            }
        }
        try {
            return Files.isRegularFile(file) ? Files.readString(file, StandardCharsets.UTF_8) : null;
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    /** The nearest workspace file in the sample's folder or above decides; empty when none maps it. */
    Optional<Binding> binding(Path sample) {
        for (Path dir = sample.getParent(); dir != null; dir = dir.getParent()) {
            Path mapFile = dir.resolve(SampleMap.FILE_NAME);
            String text = textOf(mapFile);
            if (text == null) {
                continue;
            }
            SampleMap map = readMap(mapFile, text);
            Optional<Entry> e = map.entryFor(sample);
            if (e.isEmpty()) {
                return Optional.empty();
            }
            try {
                return Optional.of(new Binding(map, e.get(), source(e.get())));
            } catch (PreviewException x) {
                return Optional.of(new Binding(map, e.get(), null));
            }
        }
        return Optional.empty();
    }

    private Source source(Entry e) {
        String text;
        if (e.kind() == SampleMap.Kind.REGEX) {
            text = e.source().value();
        } else {
            text = textOf(e.sourceFile());
            if (text == null) {
                throw new PreviewException("cannot read " + e.sourceFile());
            }
        }
        return new Source(e.kind(), e.sourceFile(), text, e.start() == null ? null : e.start().value(), e.pretty(),
                e.vocabulary(), PreviewCache.vocabularyKey(e.vocabulary()));
    }

    // ------------------------------------------------------------------ preparing and computing

    /** A constraint ready for use, or why there is none (still being prepared, or failed). */
    private record Ready(Constraint constraint, boolean pending, String message) {
    }

    private Ready ready(String uri, Binding b) {
        String where = " (" + b.map().file().getFileName() + ": " + b.entry().describe() + ")";
        if (b.source() == null) {
            return new Ready(null, false, "no token preview: cannot read " + b.entry().sourceFile());
        }
        CompletableFuture<Constraint> f = cache.constraint(b.source());
        try {
            return new Ready(f.get(READY_WAIT_MILLIS, TimeUnit.MILLISECONDS), false, null);
        } catch (TimeoutException e) {
            if (awaited.put(uri, f) != f) {
                f.whenComplete((c, x) -> context.refreshDiagnostics());
            }
            return new Ready(null, true, "preparing the token preview" + where + " …");
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return new Ready(null, true, "preparing the token preview" + where + " …");
        } catch (ExecutionException | RuntimeException e) {
            return new Ready(null, false, "no token preview: " + PreviewCache.failure(e) + where);
        }
    }

    private static String failureOf(CompletableFuture<?> f) {
        try {
            f.join();
            return "";
        } catch (RuntimeException e) {
            return PreviewCache.failure(e);
        }
    }

    /** The preview at a position: the binding, the character offset, and the preview or why there is none. */
    private record At(Binding binding, int offset, TokenPreview preview, String message) {
    }

    private At at(DocumentSnapshot doc, Position position) {
        Optional<Path> path = doc.path();
        if (path.isEmpty() || isMapFile(path.get())) {
            return null;
        }
        Optional<Binding> b = binding(path.get());
        if (b.isEmpty()) {
            return null;
        }
        int offset = doc.offset(position);
        String text = doc.text();
        if (offset > 0 && offset < text.length() && Character.isHighSurrogate(text.charAt(offset - 1))
                && Character.isLowSurrogate(text.charAt(offset))) {
            offset--; // between the two halves of a character: its start
        }
        Ready r = ready(doc.uri(), b.get());
        if (r.constraint == null) {
            return new At(b.get(), offset, null, r.message);
        }
        byte[] prefix = doc.text().substring(0, offset).getBytes(StandardCharsets.UTF_8);
        try {
            return new At(b.get(), offset, preview(doc.uri(), r.constraint, prefix), null);
        } catch (PreviewException x) {
            return new At(b.get(), offset, null, "no token preview: " + x.getMessage());
        }
    }

    /**
     * The preview of a prefix, continuing the document's last cursor when the prefix extends what
     * it was fed (typing at the end), else from a fresh cursor.
     */
    private TokenPreview preview(String uri, Constraint c, byte[] prefix) {
        Reuse last = cursors.get(uri);
        Cursor from = c.start();
        int fromBytes = 0;
        if (last != null && last.constraint == c && last.bytes.length <= prefix.length
                && java.util.Arrays.equals(last.bytes, 0, last.bytes.length, prefix, 0, last.bytes.length)) {
            from = last.cursor.fork();
            fromBytes = last.bytes.length;
        }
        TokenPreview p;
        try {
            p = TokenPreview.compute(c, prefix, from, fromBytes);
        } catch (dev.espalier.earley.EarleyLimitException e) {
            cursors.remove(uri);
            throw new PreviewException("the text is too long for the parser's limits here (" + e.getMessage() + ")");
        }
        if (!p.rejected()) {
            cursors.put(uri, new Reuse(c, prefix, from));
        }
        return p;
    }

    /** A key that sorts as the list is ordered: the index, zero-padded. */
    private static String sortKey(int index) {
        String n = Integer.toString(index);
        return "0000000".substring(Math.min(7, n.length())) + n;
    }

    private static String tally(TokenPreview p) {
        return String.format(Locale.ROOT, "%,d of %,d tokens allowed", p.count(), p.vocabulary().tokenCount());
    }

    /** The text a token inserts: its whole UTF-8 characters (a token may end inside one). */
    static String insertText(byte[] bytes) {
        int n = Utf8Offsets.wholeCharacters(bytes);
        return new String(bytes, 0, n, StandardCharsets.UTF_8);
    }

    static String withoutFinalLineBreak(String text) {
        if (text.endsWith("\r\n")) {
            return text.substring(0, text.length() - 2);
        }
        return text.endsWith("\n") ? text.substring(0, text.length() - 1) : text;
    }

    private static Diagnostic diagnostic(Range r, DiagnosticSeverity s, String code, String message) {
        return new Diagnostic(r, message, s, "espalier", code);
    }
}
