package dev.espalier.lsp;

import dev.espalier.grammar.Grammar;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Optional;

/**
 * The core rules of RFC 5234 Appendix B.1 as the RFC writes them, for completion and hover. The
 * engine's ABNF front end adds these rules when a file uses them without defining them.
 */
final class CoreRuleTexts {

    /** Definition and comment of each core rule, in the RFC's order (RFC 5234 Appendix B.1). */
    private static final Map<String, String[]> RULES = new LinkedHashMap<>();

    static {
        add("ALPHA", "%x41-5A / %x61-7A", "A-Z / a-z");
        add("BIT", "\"0\" / \"1\"", "");
        add("CHAR", "%x01-7F", "any 7-bit US-ASCII character, excluding NUL");
        add("CR", "%x0D", "carriage return");
        add("CRLF", "CR LF", "Internet standard newline");
        add("CTL", "%x00-1F / %x7F", "controls");
        add("DIGIT", "%x30-39", "0-9");
        add("DQUOTE", "%x22", "\" (Double Quote)");
        add("HEXDIG", "DIGIT / \"A\" / \"B\" / \"C\" / \"D\" / \"E\" / \"F\"", "");
        add("HTAB", "%x09", "horizontal tab");
        add("LF", "%x0A", "linefeed");
        add("LWSP", "*(WSP / CRLF WSP)", "linear white space (use with caution: it permits lines of only white space)");
        add("OCTET", "%x00-FF", "8 bits of data; here the code points U+0000 to U+00FF");
        add("SP", "%x20", "");
        add("VCHAR", "%x21-7E", "visible (printing) characters");
        add("WSP", "SP / HTAB", "white space");
    }

    private static void add(String name, String definition, String comment) {
        RULES.put(Grammar.key(name), new String[] {name, definition, comment});
    }

    private CoreRuleTexts() {
    }

    /** Whether a name (any case) is a core rule's. */
    static boolean isCore(String name) {
        return RULES.containsKey(Grammar.key(name));
    }

    /** The core rule names as the RFC writes them. */
    static Iterable<String> names() {
        return RULES.values().stream().map(r -> r[0]).toList();
    }

    /** {@code NAME = definition ; comment}, as in the RFC, or empty for a name that is not a core rule. */
    static Optional<String> definition(String name) {
        String[] r = RULES.get(Grammar.key(name));
        if (r == null) {
            return Optional.empty();
        }
        return Optional.of(r[0] + " = " + r[1] + (r[2].isEmpty() ? "" : "   ; " + r[2]));
    }
}
