package dev.espalier.abnf;

import dev.espalier.grammar.Span;
import java.util.Arrays;
import org.antlr.v4.runtime.Token;

/**
 * A grammar's text with the position arithmetic spans need. ANTLR counts code points, while spans
 * count UTF-16 code units (as editors and the LSP do); this class translates. Lines end at LF, CRLF
 * or a lone CR, like the lexer's NEWLINE token.
 */
final class SourceText {

    private final String text;
    /** UTF-16 offset of each code point index (and one past the end); null when they coincide. */
    private final int[] charOfCodePoint;
    private final int[] lineStarts;

    SourceText(String text) {
        this.text = text;
        int cpCount = text.codePointCount(0, text.length());
        if (cpCount == text.length()) {
            charOfCodePoint = null;
        } else {
            int[] map = new int[cpCount + 1];
            int c = 0;
            for (int i = 0; i < cpCount; i++) {
                map[i] = c;
                c += Character.charCount(text.codePointAt(c));
            }
            map[cpCount] = text.length();
            charOfCodePoint = map;
        }
        int[] starts = new int[16];
        int n = 0;
        starts[n++] = 0;
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            if (ch == '\n' || (ch == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'))) {
                if (n == starts.length) {
                    starts = Arrays.copyOf(starts, n * 2);
                }
                starts[n++] = i + 1;
            }
        }
        lineStarts = Arrays.copyOf(starts, n);
    }

    String text() {
        return text;
    }

    int length() {
        return text.length();
    }

    /** The UTF-16 offset of ANTLR's code point index {@code cp}, clamped to the text. */
    int charOffset(int cp) {
        if (cp <= 0) {
            return 0;
        }
        if (charOfCodePoint == null) {
            return Math.min(cp, text.length());
        }
        return charOfCodePoint[Math.min(cp, charOfCodePoint.length - 1)];
    }

    /** The span of UTF-16 offsets {@code [start, end)}. */
    Span span(int start, int end) {
        start = Math.max(0, Math.min(start, text.length()));
        end = Math.max(start, Math.min(end, text.length()));
        int line = Arrays.binarySearch(lineStarts, start);
        if (line < 0) {
            line = -line - 2;
        }
        return new Span(start, end, line + 1, start - lineStarts[line] + 1);
    }

    /** Whether a token has real source positions (conjured tokens from error recovery do not). */
    static boolean isReal(Token t) {
        return t != null && t.getStartIndex() >= 0 && t.getStopIndex() >= t.getStartIndex() - 1;
    }

    /** UTF-16 offset of a token's first character. */
    int start(Token t) {
        return charOffset(t.getStartIndex());
    }

    /** UTF-16 offset just past a token's last character. */
    int end(Token t) {
        return Math.max(start(t), charOffset(t.getStopIndex() + 1));
    }

    /** The span of one token (zero length at end of file for EOF). */
    Span span(Token t) {
        return span(start(t), end(t));
    }

    /** The span of a token's first {@code n} characters (for prefixes such as an opening quote). */
    Span spanOfPrefix(Token t, int n) {
        int s = start(t);
        return span(s, Math.min(end(t), s + n));
    }
}
