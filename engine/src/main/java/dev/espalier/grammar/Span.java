package dev.espalier.grammar;

/**
 * A range of source text: character offsets {@code [start, end)} plus the 1-based line and column of
 * {@code start}. Columns count UTF-16 code units, as editors and the LSP do.
 *
 * @param start  offset of the first character
 * @param end    offset just past the last character
 * @param line   1-based line of {@code start}
 * @param column 1-based column of {@code start}
 */
public record Span(int start, int end, int line, int column) {

    /** The span of something that has no source text (built in code, or a core rule). */
    public static final Span NONE = new Span(0, 0, 0, 0);

    /** Length in characters. */
    public int length() {
        return end - start;
    }

    /** Whether this span points at real source text. */
    public boolean isKnown() {
        return line > 0;
    }

    /** A span of a single position within a one-line text such as a regular expression. */
    public static Span at(int offset, int length) {
        return new Span(offset, offset + length, 1, offset + 1);
    }
}
