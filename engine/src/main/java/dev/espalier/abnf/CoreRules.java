package dev.espalier.abnf;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The core rules of RFC 5234 Appendix B.1, read once from the RFC's own text by this front end. They
 * carry {@link Span#NONE}: they have no place in the user's file.
 *
 * <p>Unicode reading: ABNF values are code points here (the engine matches them as UTF-8), so
 * {@code OCTET = %x00-FF} means the code points U+0000 to U+00FF, not arbitrary bytes, and
 * {@code CHAR = %x01-7F} the ASCII characters except NUL.
 */
final class CoreRules {

    /** RFC 5234 Appendix B.1 "Core Rules", copied from the RFC text (rules and comments). */
    static final String RFC5234_APPENDIX_B1 = """
            ALPHA          =  %x41-5A / %x61-7A   ; A-Z / a-z
            BIT            =  "0" / "1"
            CHAR           =  %x01-7F
                                   ; any 7-bit US-ASCII character,
                                   ;  excluding NUL
            CR             =  %x0D
                                   ; carriage return
            CRLF           =  CR LF
                                   ; Internet standard newline
            CTL            =  %x00-1F / %x7F
                                   ; controls
            DIGIT          =  %x30-39
                                   ; 0-9
            DQUOTE         =  %x22
                                   ; " (Double Quote)
            HEXDIG         =  DIGIT / "A" / "B" / "C" / "D" / "E" / "F"
            HTAB           =  %x09
                                   ; horizontal tab
            LF             =  %x0A
                                   ; linefeed
            LWSP           =  *(WSP / CRLF WSP)
                                   ; Use of this linear-white-space rule
                                   ;  permits lines containing only white
                                   ;  space that are no longer legal in
                                   ;  mail headers and have caused
                                   ;  interoperability problems in other
                                   ;  contexts.
                                   ; Do not use when defining mail
                                   ;  headers and use with caution in
                                   ;  other contexts.
            OCTET          =  %x00-FF
                                   ; 8 bits of data
            SP             =  %x20
            VCHAR          =  %x21-7E
                                   ; visible (printing) characters
            WSP            =  SP / HTAB
                                   ; white space
            """;

    private static final Map<String, Rule> RULES;

    static {
        Map<String, Rule> m = new LinkedHashMap<>();
        for (Rule r : AbnfReader.read(RFC5234_APPENDIX_B1, "RFC 5234 Appendix B.1").rules()) {
            m.put(r.key(), new Rule(r.name(), withoutSpans(r.body()), Span.NONE, Span.NONE));
        }
        RULES = Collections.unmodifiableMap(m);
    }

    private CoreRules() {
    }

    /** The core rule named {@code name} (case-insensitive), if there is one. */
    static Optional<Rule> get(String name) {
        return Optional.ofNullable(RULES.get(Grammar.key(name)));
    }

    /** All core rules in the RFC's order. */
    static List<Rule> all() {
        return List.copyOf(RULES.values());
    }

    /** The same expression with every span {@link Span#NONE} (core rules are tiny and shallow). */
    private static Expr withoutSpans(Expr e) {
        if (e instanceof Expr.Seq s) {
            return new Expr.Seq(s.items().stream().map(CoreRules::withoutSpans).toList(), Span.NONE);
        } else if (e instanceof Expr.Choice c) {
            return new Expr.Choice(c.options().stream().map(CoreRules::withoutSpans).toList(), Span.NONE);
        } else if (e instanceof Expr.Repeat r) {
            return new Expr.Repeat(withoutSpans(r.body()), r.min(), r.max(), Span.NONE);
        } else if (e instanceof Expr.Chars c) {
            return new Expr.Chars(c.set(), Span.NONE);
        } else if (e instanceof Expr.Text t) {
            return new Expr.Text(t.text(), t.ignoreCase(), Span.NONE);
        } else {
            Expr.Ref r = (Expr.Ref) e;
            return new Expr.Ref(r.name(), Span.NONE);
        }
    }

    /** Names referenced anywhere in {@code e}, without recursion (bodies may nest up to the limit). */
    static void collectReferences(Expr e, List<String> into) {
        List<Expr> stack = new ArrayList<>();
        stack.add(e);
        while (!stack.isEmpty()) {
            Expr x = stack.remove(stack.size() - 1);
            if (x instanceof Expr.Ref r) {
                into.add(r.name());
            } else if (x instanceof Expr.Seq s) {
                stack.addAll(s.items());
            } else if (x instanceof Expr.Choice c) {
                stack.addAll(c.options());
            } else if (x instanceof Expr.Repeat r) {
                stack.add(r.body());
            }
        }
    }
}
