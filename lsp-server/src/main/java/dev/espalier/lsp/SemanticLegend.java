package dev.espalier.lsp;

import org.eclipse.lsp4j.SemanticTokensLegend;

import java.util.List;

/** The semantic token types and modifiers the server declares; features index into these lists. */
public final class SemanticLegend {

    private SemanticLegend() {
    }

    /** A rule name (definition or use). */
    public static final int FUNCTION = 0;
    /** A quoted string. */
    public static final int STRING = 1;
    /** A numeric value ({@code %x41}, a repetition count). */
    public static final int NUMBER = 2;
    /** A comment. */
    public static final int COMMENT = 3;
    /** An operator ({@code =}, {@code =/}, {@code /}, {@code *}). */
    public static final int OPERATOR = 4;
    /** A directive keyword ({@code ;@use}). */
    public static final int KEYWORD = 5;

    /** Modifier bit: the occurrence defines the symbol. */
    public static final int DECLARATION = 1;
    /** Modifier bit: the symbol is built in (an RFC 5234 core rule). */
    public static final int DEFAULT_LIBRARY = 1 << 1;

    /** Token type names in index order. */
    public static final List<String> TYPES = List.of("function", "string", "number", "comment", "operator", "keyword");

    /** Modifier names in bit order. */
    public static final List<String> MODIFIERS = List.of("declaration", "defaultLibrary");

    /** The legend sent in the server's capabilities. */
    public static SemanticTokensLegend legend() {
        return new SemanticTokensLegend(TYPES, MODIFIERS);
    }
}
