package dev.espalier.lsp;

import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextDocumentContentChangeEvent;

import java.net.URI;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.Optional;

/**
 * One version of an open document: its URI, the version number the client gave it, and its text.
 * Immutable; an edit yields a new snapshot ({@link #apply}).
 *
 * <p>Positions follow the LSP's default encoding: a zero-based line and a zero-based column in UTF-16
 * code units, which is exactly a Java {@code char} index within the line. Lines end at {@code \n},
 * {@code \r\n} or a lone {@code \r}. A position past the end of its line means the end of that line,
 * and a line past the last means the end of the text (the LSP's rule for out-of-range positions).
 */
public final class DocumentSnapshot {

    private final String uri;
    private final String languageId;
    private final int version;
    private final String text;
    private volatile int[] lineStarts;

    /**
     * A snapshot of a document.
     *
     * @param uri        the document's URI as the client sent it
     * @param languageId the client's language id (may be empty)
     * @param version    the client's version number
     * @param text       the full text
     */
    public DocumentSnapshot(String uri, String languageId, int version, String text) {
        this.uri = Objects.requireNonNull(uri);
        this.languageId = languageId == null ? "" : languageId;
        this.version = version;
        this.text = Objects.requireNonNull(text);
    }

    /** The document's URI as the client sent it. */
    public String uri() {
        return uri;
    }

    /** The client's language id, or the empty string. */
    public String languageId() {
        return languageId;
    }

    /** The client's version number of this text. */
    public int version() {
        return version;
    }

    /** The full text. */
    public String text() {
        return text;
    }

    /** The local file this document is, when its URI is a {@code file:} URI. */
    public Optional<Path> path() {
        return pathOf(uri);
    }

    /** The local file a {@code file:} URI names, or empty for other schemes and malformed URIs. */
    public static Optional<Path> pathOf(String uri) {
        try {
            URI u = new URI(uri);
            if (!"file".equalsIgnoreCase(u.getScheme())) {
                return Optional.empty();
            }
            return Optional.of(Path.of(u).toAbsolutePath().normalize());
        } catch (Exception e) { // malformed URI, or not a path on this system
            return Optional.empty();
        }
    }

    /** Whether the URI's path ends with the extension (case-insensitive, with or without the dot). */
    public static boolean hasExtension(String uri, String extension) {
        String ext = extension.startsWith(".") ? extension : "." + extension;
        String path = uri;
        int cut = path.indexOf('?');
        if (cut >= 0) {
            path = path.substring(0, cut);
        }
        cut = path.indexOf('#');
        if (cut >= 0) {
            path = path.substring(0, cut);
        }
        return path.toLowerCase(Locale.ROOT).endsWith(ext.toLowerCase(Locale.ROOT));
    }

    /** The number of lines (one more than the number of line breaks). */
    public int lineCount() {
        return lineStarts().length;
    }

    /** The offset of the first character of a zero-based line. */
    public int lineStart(int line) {
        int[] starts = lineStarts();
        if (line < 0) {
            return 0;
        }
        return line >= starts.length ? text.length() : starts[line];
    }

    /** The offset just past the last character of a zero-based line, before its line break. */
    public int lineEnd(int line) {
        int[] starts = lineStarts();
        if (line < 0) {
            line = 0;
        }
        if (line >= starts.length - 1) {
            return text.length();
        }
        int end = starts[line + 1];
        if (end > 0 && text.charAt(end - 1) == '\n') {
            end--;
            if (end > starts[line] && text.charAt(end - 1) == '\r') {
                end--;
            }
        } else if (end > 0 && text.charAt(end - 1) == '\r') {
            end--;
        }
        return end;
    }

    /** The character offset of an LSP position, clamped to the text. */
    public int offset(Position p) {
        if (p == null) {
            return 0;
        }
        int[] starts = lineStarts();
        if (p.getLine() < 0) {
            return 0;
        }
        if (p.getLine() >= starts.length) {
            return text.length();
        }
        int start = starts[p.getLine()];
        int end = lineEnd(p.getLine());
        return Math.min(start + Math.max(0, p.getCharacter()), end);
    }

    /** The LSP position of a character offset (clamped to the text). */
    public Position position(int offset) {
        int o = Math.max(0, Math.min(offset, text.length()));
        int[] starts = lineStarts();
        int i = Arrays.binarySearch(starts, o);
        int line = i >= 0 ? i : -i - 2;
        // an offset between \r and \n of a CRLF belongs to the line the \r ends
        return new Position(line, o - starts[line]);
    }

    /** The LSP range of the offsets {@code [start, end)}. */
    public Range range(int start, int end) {
        return new Range(position(start), position(Math.max(start, end)));
    }

    /** The text between two positions. */
    public String text(Range r) {
        int a = offset(r.getStart());
        int b = offset(r.getEnd());
        return text.substring(Math.min(a, b), Math.max(a, b));
    }

    /**
     * Applies the changes of one {@code textDocument/didChange} notification, in order: a change with a
     * range replaces that range (positions in the text as left by the previous change), a change
     * without one replaces the whole text.
     */
    public DocumentSnapshot apply(List<TextDocumentContentChangeEvent> changes, int newVersion) {
        DocumentSnapshot doc = this;
        for (TextDocumentContentChangeEvent c : changes) {
            String replacement = c.getText() == null ? "" : c.getText();
            if (c.getRange() == null) {
                doc = new DocumentSnapshot(uri, languageId, newVersion, replacement);
            } else {
                int a = doc.offset(c.getRange().getStart());
                int b = doc.offset(c.getRange().getEnd());
                if (b < a) {
                    int t = a;
                    a = b;
                    b = t;
                }
                StringBuilder sb = new StringBuilder(doc.text.length() - (b - a) + replacement.length());
                sb.append(doc.text, 0, a).append(replacement).append(doc.text, b, doc.text.length());
                doc = new DocumentSnapshot(uri, languageId, newVersion, sb.toString());
            }
        }
        return doc.version == newVersion ? doc : new DocumentSnapshot(uri, languageId, newVersion, doc.text);
    }

    private int[] lineStarts() {
        int[] s = lineStarts;
        if (s == null) {
            int n = 1;
            for (int i = 0; i < text.length(); i++) {
                char c = text.charAt(i);
                if (c == '\n' || (c == '\r' && (i + 1 == text.length() || text.charAt(i + 1) != '\n'))) {
                    n++;
                }
            }
            s = new int[n];
            int k = 1;
            for (int i = 0; i < text.length(); i++) {
                char c = text.charAt(i);
                if (c == '\n' || (c == '\r' && (i + 1 == text.length() || text.charAt(i + 1) != '\n'))) {
                    s[k++] = i + 1;
                }
            }
            lineStarts = s;
        }
        return s;
    }

    @Override
    public String toString() {
        return uri + " v" + version + " (" + text.length() + " chars)";
    }
}
