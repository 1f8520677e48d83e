package dev.espalier.lsp;

import java.util.ArrayList;
import java.util.List;

/**
 * A forgiving lexer for ABNF text, for editor features that work on what is written (semantic
 * tokens, folding, the context of a completion): it never fails and never needs the text to parse.
 * Token shapes follow RFC 5234 §4 (rule names, quoted strings, num-vals, prose values, comments)
 * and RFC 7405 ({@code %s"..."}, {@code %i"..."}); a string or prose value ends at its closing mark
 * or at the end of the line.
 */
final class AbnfTokens {

    /** What a token is. */
    enum Kind {
        /** A rule name: ALPHA *(ALPHA / DIGIT / "-"). */
        NAME,
        /** A quoted string, with its {@code %s} or {@code %i} prefix. */
        STRING,
        /** A num-val ({@code %x41-5A}, {@code %d13.10}, {@code %b101}). */
        VALUE,
        /** A repetition count or range ({@code 1*2}, {@code 3}, {@code *}). */
        REPEAT,
        /** A prose value {@code <...>}. */
        PROSE,
        /** A comment, from {@code ;} to the end of the line (without a {@code ;@use} directive's head). */
        COMMENT,
        /** The head {@code ;@use} of an import directive. */
        DIRECTIVE,
        /** The quoted path of an import directive. */
        DIRECTIVE_PATH,
        /** {@code =} or {@code =/}. */
        DEFINE,
        /** {@code /}. */
        SLASH,
        /** One of {@code ( ) [ ]}. */
        BRACKET,
        /** Any other character that is not white space. */
        OTHER
    }

    /**
     * One token.
     *
     * @param kind  what it is
     * @param start offset of its first character
     * @param end   offset just past it
     */
    record Token(Kind kind, int start, int end) {
        int length() {
            return end - start;
        }
    }

    private AbnfTokens() {
    }

    /** The tokens of a text, in order; white space and line ends are not tokens. */
    static List<Token> lex(String text) {
        List<Token> out = new ArrayList<>();
        int n = text.length();
        int i = 0;
        boolean lineStart = true;
        while (i < n) {
            char c = text.charAt(i);
            if (c == '\n' || c == '\r') {
                lineStart = true;
                i++;
                continue;
            }
            if (c == ' ' || c == '\t') {
                i++;
                continue;
            }
            int s = i;
            if (c == ';') {
                int e = lineEnd(text, i);
                if (lineStart && text.startsWith(";@use", i)) {
                    out.add(new Token(Kind.DIRECTIVE, i, i + 5));
                    int j = i + 5;
                    while (j < e && (text.charAt(j) == ' ' || text.charAt(j) == '\t')) {
                        j++;
                    }
                    if (j < e && text.charAt(j) == '"') {
                        int q = text.indexOf('"', j + 1);
                        int pe = q < 0 || q > e ? e : q + 1;
                        out.add(new Token(Kind.DIRECTIVE_PATH, j, pe));
                        j = pe;
                    }
                    while (j < e && (text.charAt(j) == ' ' || text.charAt(j) == '\t')) {
                        j++;
                    }
                    if (j < e) {
                        out.add(new Token(Kind.COMMENT, j, e));
                    }
                } else {
                    out.add(new Token(Kind.COMMENT, i, e));
                }
                i = e;
                continue;
            }
            lineStart = false;
            if (isAlpha(c)) {
                i++;
                while (i < n && (isAlpha(text.charAt(i)) || isDigit(text.charAt(i)) || text.charAt(i) == '-')) {
                    i++;
                }
                out.add(new Token(Kind.NAME, s, i));
            } else if (c == '"') {
                i = closing(text, i + 1, '"');
                out.add(new Token(Kind.STRING, s, i));
            } else if (c == '<') {
                i = closing(text, i + 1, '>');
                out.add(new Token(Kind.PROSE, s, i));
            } else if (c == '%') {
                char k = i + 1 < n ? Character.toLowerCase(text.charAt(i + 1)) : 0;
                if ((k == 's' || k == 'i') && i + 2 < n && text.charAt(i + 2) == '"') {
                    i = closing(text, i + 3, '"');
                    out.add(new Token(Kind.STRING, s, i));
                } else {
                    i++;
                    if (k == 'x' || k == 'd' || k == 'b') {
                        i++;
                        while (i < n && (isHex(text.charAt(i)) || text.charAt(i) == '.' || text.charAt(i) == '-')) {
                            i++;
                        }
                    }
                    out.add(new Token(Kind.VALUE, s, i));
                }
            } else if (isDigit(c) || c == '*') {
                while (i < n && (isDigit(text.charAt(i)) || text.charAt(i) == '*')) {
                    i++;
                }
                out.add(new Token(Kind.REPEAT, s, i));
            } else if (c == '=') {
                i++;
                if (i < n && text.charAt(i) == '/') {
                    i++;
                }
                out.add(new Token(Kind.DEFINE, s, i));
            } else if (c == '/') {
                i++;
                out.add(new Token(Kind.SLASH, s, i));
            } else if (c == '(' || c == ')' || c == '[' || c == ']') {
                i++;
                out.add(new Token(Kind.BRACKET, s, i));
            } else {
                i++;
                out.add(new Token(Kind.OTHER, s, i));
            }
        }
        return out;
    }

    /** Whether an offset is inside a comment or an unfinished string or prose value on its line. */
    static boolean inCommentOrString(String text, int lineStart, int offset) {
        int i = lineStart;
        while (i < offset) {
            char c = text.charAt(i);
            if (c == ';') {
                return true;
            }
            if (c == '"' || c == '<') {
                int close = text.indexOf(c == '"' ? '"' : '>', i + 1);
                if (close < 0 || close >= offset) {
                    return true;
                }
                i = close + 1;
                continue;
            }
            i++;
        }
        return false;
    }

    private static int closing(String text, int from, char mark) {
        int e = lineEnd(text, from);
        int q = text.indexOf(mark, from);
        return q < 0 || q >= e ? e : q + 1;
    }

    static int lineEnd(String text, int from) {
        int i = from;
        while (i < text.length() && text.charAt(i) != '\n' && text.charAt(i) != '\r') {
            i++;
        }
        return i;
    }

    static boolean isAlpha(char c) {
        return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z');
    }

    static boolean isDigit(char c) {
        return c >= '0' && c <= '9';
    }

    private static boolean isHex(char c) {
        return isDigit(c) || (c >= 'A' && c <= 'F') || (c >= 'a' && c <= 'f');
    }

    /** Whether a string is a valid ABNF rule name (RFC 5234 §4: ALPHA *(ALPHA / DIGIT / "-")). */
    static boolean isRuleName(String s) {
        if (s == null || s.isEmpty() || !isAlpha(s.charAt(0))) {
            return false;
        }
        for (int i = 1; i < s.length(); i++) {
            char c = s.charAt(i);
            if (!isAlpha(c) && !isDigit(c) && c != '-') {
                return false;
            }
        }
        return true;
    }
}
