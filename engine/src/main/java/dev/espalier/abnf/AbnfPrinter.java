package dev.espalier.abnf;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.Set;
import org.antlr.v4.runtime.CharStreams;
import org.antlr.v4.runtime.Token;

/**
 * Writes grammars as ABNF text, and lays out ABNF files in one canonical way.
 *
 * <h2>Printing the IR ({@link #print})</h2>
 * The text reads back ({@link Abnf#parse}) to the same IR, spans aside, for every IR the ABNF front
 * end produces. Forms chosen:
 * <ul>
 *   <li>case-insensitive {@link Expr.Text}: {@code "..."}; case-sensitive: {@code %s"..."}, or dotted
 *       {@code %x} values ({@code %x0D.0A}) when it holds a character that cannot stand in quotes
 *       (a double quote, a control character, a line end);</li>
 *   <li>{@link Expr.Chars}: {@code %x41} or {@code %x30-39}; a set of several ranges becomes an
 *       alternation of ranges;</li>
 *   <li>{@link Expr.Repeat}: {@code [x]} for 0 to 1, else {@code n*m x}, {@code n*x}, {@code *m x},
 *       {@code n x};</li>
 *   <li>nested concatenations and alternations keep their nesting with parentheses.</li>
 * </ul>
 * IR that ABNF cannot spell exactly is written with the same language instead: an empty
 * concatenation as {@code ""}, a one-item concatenation or alternation as its item, a set of several
 * ranges as an alternation, a one-character case-sensitive string that cannot be quoted as a
 * {@code %x} value, a case-insensitive string holding unquotable characters as a concatenation, and
 * the empty language (an alternation with no option, an empty set) as the prose value
 * {@code <matches nothing>}, which the front end reports and reads as matching nothing. The start
 * rule is written first (ABNF's start rule is the first rule). The RFC 5234 core rules the front end
 * would add again are left out.
 *
 * <h2>Layout ({@link #format})</h2>
 * Works on the tokens as written, so literals, names and {@code =/} definitions stay exactly as they
 * are; only white space, line breaks and the place of comments change:
 * <ul>
 *   <li>rule names start at column 1; in each block of rules not separated by a blank line the
 *       {@code =} and {@code =/} stand in one column, one space after the longest name;</li>
 *   <li>elements are separated by one space, with none inside brackets; lines are filled up to
 *       {@value #WIDTH} columns, breaking before a top-level {@code /} when the next alternative
 *       does not fit; continuation lines are indented under the first element;</li>
 *   <li>a comment at the end of a line stays after the same element (the line breaks after it); a
 *       comment line inside a rule stays before the same element; indented comment lines right
 *       after a rule stay under it; other comment lines (and {@code ;@use} directives) belong to
 *       the rule that follows them and start at column 1;</li>
 *   <li>runs of blank lines become one; the file ends with one line end; the line end is CRLF when
 *       the file's first line end is CRLF, else LF.</li>
 * </ul>
 * A text with {@code syntax} errors is returned unchanged. The layout is idempotent and keeps the IR;
 * should a layout ever change the IR, the text is returned unchanged.
 */
public final class AbnfPrinter {

    /** The column up to which lines are filled. */
    public static final int WIDTH = 100;

    private static final String NOTHING = "<matches nothing>";

    private AbnfPrinter() {
    }

    /**
     * The outcome of {@link #layout(String, String)}.
     *
     * @param text        the laid-out text, or the input when it has syntax errors
     * @param applied     whether the layout was applied (false for text with syntax errors)
     * @param diagnostics the front end's diagnostics of the input
     */
    public record Formatted(String text, boolean applied, List<Diagnostic> diagnostics) {
        /** Checks for null and copies the list. */
        public Formatted {
            Objects.requireNonNull(text);
            diagnostics = List.copyOf(diagnostics);
        }
    }

    // ================================================================== IR to text

    /**
     * ABNF text for a grammar, laid out by {@link #format}. See the class documentation for the
     * forms used and the guarantee of reading back to the same IR.
     */
    public static String print(Grammar g) {
        List<Rule> rules = new ArrayList<>(g.rules());
        int start = -1;
        for (int i = 0; i < rules.size(); i++) {
            if (rules.get(i).key().equals(Grammar.key(g.start()))) {
                start = i;
            }
        }
        if (start > 0) {
            rules.add(0, rules.remove(start));
        }
        rules = withoutAddedCoreRules(rules);
        StringBuilder sb = new StringBuilder();
        for (Rule r : rules) {
            sb.append(r.name()).append(" = ");
            expr(r.body(), sb);
            sb.append('\n');
        }
        return format(sb.toString(), "<printed>");
    }

    /** Leaves out a tail of unchanged core rules that reading the text back would add again. */
    private static List<Rule> withoutAddedCoreRules(List<Rule> rules) {
        int cut = rules.size();
        while (cut > 0) {
            Rule r = rules.get(cut - 1);
            Rule core = CoreRules.get(r.name()).orElse(null);
            if (core == null || !core.name().equals(r.name()) || !sameShape(core.body(), r.body())) {
                break;
            }
            cut--;
        }
        if (cut == rules.size()) {
            return rules;
        }
        List<Rule> kept = rules.subList(0, cut);
        Set<String> defined = new HashSet<>();
        for (Rule r : kept) {
            defined.add(r.key());
        }
        List<String> pending = new ArrayList<>();
        for (Rule r : kept) {
            CoreRules.collectReferences(r.body(), pending);
        }
        Set<String> wanted = new HashSet<>();
        while (!pending.isEmpty()) {
            String key = Grammar.key(pending.remove(pending.size() - 1));
            if (!defined.contains(key) && wanted.add(key)) {
                CoreRules.get(key).ifPresent(core -> CoreRules.collectReferences(core.body(), pending));
            }
        }
        List<String> added = new ArrayList<>();
        for (Rule core : CoreRules.all()) {
            if (wanted.contains(core.key())) {
                added.add(core.key());
            }
        }
        List<String> tail = rules.subList(cut, rules.size()).stream().map(Rule::key).toList();
        return added.equals(tail) ? List.copyOf(kept) : rules;
    }

    /** Where an expression is written, which decides whether it needs parentheses. */
    private enum Place { TOP, OPTION, ITEM, REPEATED }

    private record Work(Expr e, Place place) { }

    /** Writes {@code root} as an alternation, with an explicit stack. */
    private static void expr(Expr root, StringBuilder out) {
        Deque<Object> stack = new ArrayDeque<>();
        stack.push(new Work(root, Place.TOP));
        while (!stack.isEmpty()) {
            Object o = stack.pop();
            if (o instanceof String s) {
                out.append(s);
                continue;
            }
            Work w = (Work) o;
            Expr e = w.e();
            Place p = w.place();
            if (e instanceof Expr.Seq s) {
                if (s.items().isEmpty()) {
                    out.append("\"\"");
                } else if (s.items().size() == 1) {
                    stack.push(new Work(s.items().get(0), p));
                } else {
                    boolean paren = p == Place.ITEM || p == Place.REPEATED;
                    pushJoined(stack, s.items(), " ", Place.ITEM, paren);
                }
            } else if (e instanceof Expr.Choice c) {
                if (c.options().isEmpty()) {
                    out.append(NOTHING);
                } else if (c.options().size() == 1) {
                    stack.push(new Work(c.options().get(0), p));
                } else {
                    pushJoined(stack, c.options(), " / ", Place.OPTION, p != Place.TOP);
                }
            } else if (e instanceof Expr.Repeat r) {
                if (r.min() == 0 && r.max() == 1) {
                    stack.push("]");
                    stack.push(new Work(r.body(), Place.TOP));
                    stack.push("[");
                } else {
                    String prefix = r.min() == r.max() ? Integer.toString(r.min())
                            : (r.min() == 0 ? "" : Integer.toString(r.min())) + "*" + (r.unbounded() ? "" : Integer.toString(r.max()));
                    boolean paren = p == Place.REPEATED;
                    if (paren) {
                        stack.push(")");
                    }
                    stack.push(new Work(r.body(), Place.REPEATED));
                    stack.push(prefix);
                    if (paren) {
                        stack.push("(");
                    }
                }
            } else if (e instanceof Expr.Ref r) {
                out.append(r.name());
            } else if (e instanceof Expr.Text t) {
                text(t, p, out);
            } else {
                chars(((Expr.Chars) e).set(), p, out);
            }
        }
    }

    private static void pushJoined(Deque<Object> stack, List<Expr> parts, String sep, Place inner, boolean paren) {
        if (paren) {
            stack.push(")");
        }
        for (int i = parts.size() - 1; i >= 0; i--) {
            stack.push(new Work(parts.get(i), inner));
            if (i > 0) {
                stack.push(sep);
            }
        }
        if (paren) {
            stack.push("(");
        }
    }

    /** Whether a character may stand between double quotes in printed text. */
    private static boolean quotable(int cp) {
        if (cp == '"' || cp < 0x20 || (cp >= 0x7F && cp < 0xA0)) {
            return false;
        }
        int type = Character.getType(cp);
        return type != Character.SURROGATE && type != Character.UNASSIGNED && type != Character.CONTROL
                && type != Character.FORMAT && type != Character.LINE_SEPARATOR
                && type != Character.PARAGRAPH_SEPARATOR && type != Character.PRIVATE_USE
                && (type != Character.SPACE_SEPARATOR || cp == ' ');
    }

    private static boolean allQuotable(String s) {
        return s.codePoints().allMatch(AbnfPrinter::quotable);
    }

    private static String hex(int cp) {
        String h = Integer.toHexString(cp).toUpperCase(Locale.ROOT);
        return h.length() == 1 ? "0" + h : h;
    }

    private static void text(Expr.Text t, Place p, StringBuilder out) {
        String s = t.text();
        if (t.ignoreCase()) {
            if (allQuotable(s)) {
                out.append('"').append(s).append('"');
                return;
            }
            // quoted runs and %x values for the rest: those are no letters, so case does not matter
            List<String> parts = new ArrayList<>();
            StringBuilder run = new StringBuilder();
            s.codePoints().forEach(cp -> {
                if (quotable(cp)) {
                    run.appendCodePoint(cp);
                } else {
                    if (run.length() > 0) {
                        parts.add("\"" + run + "\"");
                        run.setLength(0);
                    }
                    parts.add("%x" + hex(cp));
                }
            });
            if (run.length() > 0) {
                parts.add("\"" + run + "\"");
            }
            boolean paren = parts.size() > 1 && (p == Place.ITEM || p == Place.REPEATED);
            out.append(paren ? "(" : "").append(String.join(" ", parts)).append(paren ? ")" : "");
            return;
        }
        if (allQuotable(s)) {
            out.append("%s\"").append(s).append('"');
        } else {
            out.append("%x");
            int[] cps = s.codePoints().toArray();
            for (int i = 0; i < cps.length; i++) {
                out.append(i == 0 ? "" : ".").append(hex(cps[i]));
            }
        }
    }

    private static void chars(CodePointSet set, Place p, StringBuilder out) {
        List<String> ranges = new ArrayList<>();
        for (int i = 0; i < set.rangeCount(); i++) {
            int lo = set.lo(i);
            int hi = set.hi(i);
            // end points may not be surrogates (the front end rejects them); UTF-8 drops surrogates anyway
            if (lo >= 0xD800 && lo <= 0xDFFF) {
                lo = 0xE000;
            }
            if (hi >= 0xD800 && hi <= 0xDFFF) {
                hi = 0xD7FF;
            }
            if (lo <= hi) {
                ranges.add(lo == hi ? "%x" + hex(lo) : "%x" + hex(lo) + "-" + hex(hi));
            }
        }
        if (ranges.isEmpty()) {
            out.append(NOTHING);
        } else if (ranges.size() == 1) {
            out.append(ranges.get(0));
        } else {
            boolean paren = p != Place.TOP;
            out.append(paren ? "(" : "").append(String.join(" / ", ranges)).append(paren ? ")" : "");
        }
    }

    /** Whether two expressions are equal apart from their spans (no recursion). */
    static boolean sameShape(Expr a, Expr b) {
        Deque<Expr[]> stack = new ArrayDeque<>();
        stack.push(new Expr[] {a, b});
        while (!stack.isEmpty()) {
            Expr[] pair = stack.pop();
            Expr x = pair[0];
            Expr y = pair[1];
            if (x.getClass() != y.getClass()) {
                return false;
            }
            List<Expr> xs;
            List<Expr> ys;
            if (x instanceof Expr.Seq s) {
                xs = s.items();
                ys = ((Expr.Seq) y).items();
            } else if (x instanceof Expr.Choice c) {
                xs = c.options();
                ys = ((Expr.Choice) y).options();
            } else if (x instanceof Expr.Repeat r) {
                Expr.Repeat q = (Expr.Repeat) y;
                if (r.min() != q.min() || r.max() != q.max()) {
                    return false;
                }
                xs = List.of(r.body());
                ys = List.of(q.body());
            } else if (x instanceof Expr.Chars c) {
                if (!c.set().equals(((Expr.Chars) y).set())) {
                    return false;
                }
                continue;
            } else if (x instanceof Expr.Text t) {
                Expr.Text u = (Expr.Text) y;
                if (!t.text().equals(u.text()) || t.ignoreCase() != u.ignoreCase()) {
                    return false;
                }
                continue;
            } else {
                if (!((Expr.Ref) x).name().equals(((Expr.Ref) y).name())) {
                    return false;
                }
                continue;
            }
            if (xs.size() != ys.size()) {
                return false;
            }
            for (int i = 0; i < xs.size(); i++) {
                stack.push(new Expr[] {xs.get(i), ys.get(i)});
            }
        }
        return true;
    }

    /** Whether two grammars have the same start rule and the same rules in the same order, spans aside. */
    static boolean sameGrammar(Grammar a, Grammar b) {
        if (!Grammar.key(a.start()).equals(Grammar.key(b.start()))) {
            return false;
        }
        List<Rule> x = List.copyOf(a.rules());
        List<Rule> y = List.copyOf(b.rules());
        if (x.size() != y.size()) {
            return false;
        }
        for (int i = 0; i < x.size(); i++) {
            if (!x.get(i).name().equals(y.get(i).name()) || !sameShape(x.get(i).body(), y.get(i).body())) {
                return false;
            }
        }
        return true;
    }

    // ================================================================== layout

    /** The canonical layout of an ABNF text (see the class documentation); unchanged when it has syntax errors. */
    public static String format(String abnfText, String fileName) {
        return layout(abnfText, fileName).text();
    }

    /** As {@link #format}, also telling whether the layout was applied and what the front end found. */
    public static Formatted layout(String abnfText, String fileName) {
        String text = abnfText == null ? "" : abnfText;
        AbnfResult before = Abnf.parse(text, fileName);
        if (before.diagnostics().stream().anyMatch(d -> d.code().equals(AbnfReader.SYNTAX))) {
            return new Formatted(text, false, before.diagnostics());
        }
        String out;
        try {
            out = new Layout(text).run();
        } catch (RuntimeException e) {
            return new Formatted(text, false, before.diagnostics());
        }
        AbnfResult after = Abnf.parse(out, fileName);
        if (!sameGrammar(before.grammar(), after.grammar())
                || after.diagnostics().stream().anyMatch(d -> d.code().equals(AbnfReader.SYNTAX))) {
            return new Formatted(text, false, before.diagnostics()); // never change the meaning
        }
        return new Formatted(out, true, before.diagnostics());
    }

    /** A run of tokens written without spaces between them, with the comments attached to it. */
    private static final class Word {
        final StringBuilder text = new StringBuilder();
        boolean topSlash;
        String commentAfter;
        final List<String> commentsBefore = new ArrayList<>();
    }

    /** One rule as laid out: its name, {@code =} or {@code =/}, words and surrounding comments. */
    private static final class RuleText {
        String name;
        String definedAs;
        String definedAsComment;
        final List<Token> body = new ArrayList<>();
        final List<String> bodyEol = new ArrayList<>();
        final List<List<String>> bodyBefore = new ArrayList<>();
        final List<String> looseBefore = new ArrayList<>();
        /** Comment lines and blank lines (null) before the rule. */
        final List<String> leading = new ArrayList<>();
        final List<String> trailing = new ArrayList<>();
    }

    private static final class Layout {
        private final String text;
        private final String eol;

        Layout(String text) {
            this.text = text;
            int nl = text.indexOf('\n');
            int cr = text.indexOf('\r');
            this.eol = cr >= 0 && (nl < 0 || cr < nl) && cr + 1 < text.length() && text.charAt(cr + 1) == '\n' ? "\r\n" : "\n";
        }

        private static boolean hidden(Token t) {
            int y = t.getType();
            return y == AbnfSyntaxLexer.WS || y == AbnfSyntaxLexer.NEWLINE || y == AbnfSyntaxLexer.COMMENT;
        }

        String run() {
            AbnfSyntaxLexer lexer = new AbnfSyntaxLexer(CharStreams.fromString(text));
            lexer.removeErrorListeners();
            List<List<Token>> lines = new ArrayList<>();
            List<Token> line = new ArrayList<>();
            List<Token> sig = new ArrayList<>();
            for (Token t = lexer.nextToken(); t.getType() != Token.EOF; t = lexer.nextToken()) {
                int y = t.getType();
                if (y == AbnfSyntaxLexer.NEWLINE) {
                    lines.add(line);
                    line = new ArrayList<>();
                    continue;
                }
                if (y == AbnfSyntaxLexer.UNEXPECTED || y == AbnfSyntaxLexer.UNTERMINATED_CHAR_VAL
                        || y == AbnfSyntaxLexer.UNTERMINATED_PROSE_VAL) {
                    throw new IllegalStateException("not well-formed");
                }
                line.add(t);
                if (!hidden(t)) {
                    sig.add(t);
                }
            }
            lines.add(line);
            Set<Token> starts = new HashSet<>();
            for (int i = 0; i + 1 < sig.size(); i++) {
                int next = sig.get(i + 1).getType();
                if (sig.get(i).getType() == AbnfSyntaxLexer.NAME
                        && (next == AbnfSyntaxLexer.EQUALS || next == AbnfSyntaxLexer.EQUALS_SLASH)) {
                    starts.add(sig.get(i));
                }
            }

            List<RuleText> rules = new ArrayList<>();
            List<String> pending = new ArrayList<>(); // comment lines and blanks (null) since the last token
            List<Boolean> pendingIndented = new ArrayList<>();
            RuleText cur = null;
            for (List<Token> ln : lines) {
                List<Token> toks = ln.stream().filter(t -> t.getType() != AbnfSyntaxLexer.WS).toList();
                if (toks.isEmpty()) {
                    pending.add(null);
                    pendingIndented.add(false);
                    continue;
                }
                if (toks.get(0).getType() == AbnfSyntaxLexer.COMMENT) {
                    pending.add(trimEnd(toks.get(0).getText()));
                    pendingIndented.add(ln.get(0).getType() == AbnfSyntaxLexer.WS);
                    continue;
                }
                String eolComment = toks.get(toks.size() - 1).getType() == AbnfSyntaxLexer.COMMENT
                        ? trimEnd(toks.get(toks.size() - 1).getText()) : null;
                int count = eolComment == null ? toks.size() : toks.size() - 1;
                int from = 0;
                if (starts.contains(toks.get(0))) {
                    RuleText next = new RuleText();
                    split(cur, pending, pendingIndented, next);
                    cur = next;
                    rules.add(cur);
                    cur.name = toks.get(0).getText();
                    from = 1;
                } else if (cur == null) {
                    throw new IllegalStateException("text before the first rule");
                } else {
                    // comment lines between two lines of one rule stay before the next element
                    for (String c : pending) {
                        if (c != null) {
                            cur.looseBefore.add(c);
                        }
                    }
                    pending.clear();
                    pendingIndented.clear();
                }
                for (int i = from; i < count; i++) {
                    Token t = toks.get(i);
                    if (cur.definedAs == null) {
                        cur.definedAs = t.getText();
                        continue;
                    }
                    cur.body.add(t);
                    cur.bodyEol.add(null);
                    cur.bodyBefore.add(new ArrayList<>(cur.looseBefore));
                    cur.looseBefore.clear();
                }
                if (eolComment != null) {
                    if (cur.body.isEmpty()) {
                        cur.definedAsComment = cur.definedAsComment == null ? eolComment : cur.definedAsComment + " " + eolComment;
                    } else {
                        cur.bodyEol.set(cur.body.size() - 1, eolComment);
                    }
                }
            }
            split(cur, pending, pendingIndented, null);
            if (cur != null && !cur.looseBefore.isEmpty()) {
                throw new IllegalStateException("comment with no element after it");
            }
            return write(rules, pending);
        }

        /** Splits the lines between two rules into the first one's trailing and the next one's leading lines. */
        private static void split(RuleText prev, List<String> pending, List<Boolean> indented, RuleText next) {
            int i = 0;
            if (prev != null) {
                while (i < pending.size() && pending.get(i) != null && indented.get(i)) {
                    prev.trailing.add(pending.get(i));
                    i++;
                }
                if (!prev.looseBefore.isEmpty()) {
                    throw new IllegalStateException("comment with no element after it");
                }
            }
            if (next != null) {
                next.leading.addAll(pending.subList(i, pending.size()));
                pending.clear();
                indented.clear();
            } else {
                List<String> rest = new ArrayList<>(pending.subList(i, pending.size()));
                pending.clear();
                pending.addAll(rest);
                indented.clear();
            }
        }

        private String write(List<RuleText> rules, List<String> fileEnd) {
            List<String> out = new ArrayList<>();
            int i = 0;
            while (i < rules.size()) {
                int j = i + 1;
                while (j < rules.size() && !rules.get(j).leading.contains(null)) {
                    j++;
                }
                int nameWidth = 0;
                boolean incremental = false;
                for (int k = i; k < j; k++) {
                    nameWidth = Math.max(nameWidth, rules.get(k).name.length());
                    incremental |= rules.get(k).definedAs.equals("=/");
                }
                for (int k = i; k < j; k++) {
                    writeRule(rules.get(k), nameWidth, incremental ? 3 : 2, out);
                }
                i = j;
            }
            for (String c : fileEnd) {
                out.add(c == null ? "" : c);
            }
            // blank lines: at most one in a row, none at the start or the end
            List<String> lines = new ArrayList<>();
            for (String l : out) {
                String s = trimEnd(l);
                if (s.isEmpty() && (lines.isEmpty() || lines.get(lines.size() - 1).isEmpty())) {
                    continue;
                }
                lines.add(s);
            }
            while (!lines.isEmpty() && lines.get(lines.size() - 1).isEmpty()) {
                lines.remove(lines.size() - 1);
            }
            StringBuilder sb = new StringBuilder();
            for (String l : lines) {
                sb.append(l).append(eol);
            }
            return sb.toString();
        }

        private void writeRule(RuleText r, int nameWidth, int afterEquals, List<String> out) {
            for (String c : r.leading) {
                out.add(c == null ? "" : c);
            }
            int elemCol = nameWidth + 1 + afterEquals;
            String indent = " ".repeat(elemCol);
            StringBuilder line = new StringBuilder(r.name);
            line.append(" ".repeat(nameWidth + 1 - r.name.length())).append(r.definedAs);
            line.append(" ".repeat(elemCol - line.length()));
            boolean lineHasWords = false;
            if (r.definedAsComment != null) {
                out.add(line + r.definedAsComment);
                line = new StringBuilder(indent);
            }
            List<Word> words = words(r);
            for (int w = 0; w < words.size(); w++) {
                Word word = words.get(w);
                if (!word.commentsBefore.isEmpty()) {
                    if (!line.toString().isBlank()) {
                        out.add(line.toString());
                    }
                    for (String c : word.commentsBefore) {
                        out.add(indent + c);
                    }
                    line = new StringBuilder(indent);
                    lineHasWords = false;
                }
                if (lineHasWords) {
                    int need = word.text.length();
                    if (word.topSlash) {
                        need = groupLength(words, w);
                    }
                    if (line.length() + 1 + need > WIDTH) {
                        out.add(line.toString());
                        line = new StringBuilder(indent);
                        lineHasWords = false;
                    }
                }
                if (lineHasWords) {
                    line.append(' ');
                }
                line.append(word.text);
                lineHasWords = true;
                if (word.commentAfter != null) {
                    line.append(' ').append(word.commentAfter);
                    out.add(line.toString());
                    line = new StringBuilder(indent);
                    lineHasWords = false;
                }
            }
            if (!line.toString().isBlank()) {
                out.add(line.toString());
            }
            for (String c : r.trailing) {
                out.add(indent + c);
            }
        }

        /** Length of the alternative starting with the top-level slash at {@code w}, up to the next one or a forced break. */
        private static int groupLength(List<Word> words, int w) {
            int len = words.get(w).text.length();
            for (int k = w + 1; k < words.size(); k++) {
                Word x = words.get(k);
                if (x.topSlash || !x.commentsBefore.isEmpty()) {
                    break;
                }
                len += 1 + x.text.length();
                if (x.commentAfter != null) {
                    break;
                }
            }
            if (words.get(w).commentAfter != null) {
                return words.get(w).text.length();
            }
            return len;
        }

        private static List<Word> words(RuleText r) {
            List<Word> words = new ArrayList<>();
            Word cur = null;
            boolean glue = false;
            int depth = 0;
            for (int i = 0; i < r.body.size(); i++) {
                Token t = r.body.get(i);
                int y = t.getType();
                List<String> before = r.bodyBefore.get(i);
                boolean closing = y == AbnfSyntaxLexer.RPAREN || y == AbnfSyntaxLexer.RBRACKET;
                if (cur == null || !before.isEmpty() || cur.commentAfter != null || !(glue || closing)) {
                    cur = new Word();
                    words.add(cur);
                    cur.commentsBefore.addAll(before);
                }
                cur.text.append(t.getText());
                if (y == AbnfSyntaxLexer.SLASH && depth == 0 && cur.text.length() == 1) {
                    cur.topSlash = true;
                }
                if (y == AbnfSyntaxLexer.LPAREN || y == AbnfSyntaxLexer.LBRACKET) {
                    depth++;
                } else if (closing) {
                    depth--;
                }
                glue = y == AbnfSyntaxLexer.DIGITS || y == AbnfSyntaxLexer.STAR
                        || y == AbnfSyntaxLexer.LPAREN || y == AbnfSyntaxLexer.LBRACKET;
                if (r.bodyEol.get(i) != null) {
                    cur.commentAfter = r.bodyEol.get(i);
                }
            }
            return words;
        }

        private static String trimEnd(String s) {
            int e = s.length();
            while (e > 0 && (s.charAt(e - 1) == ' ' || s.charAt(e - 1) == '\t')) {
                e--;
            }
            return s.substring(0, e);
        }
    }
}
