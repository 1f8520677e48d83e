package dev.espalier.regex;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Span;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;
import java.util.Objects;

/**
 * Parses regular expressions in the standard syntax used by JSON Schema's {@code pattern}
 * (ECMA-262 with the {@code u} flag: code points, not UTF-16 units) into the grammar IR.
 *
 * <p>The result matches a string when the <em>whole</em> string matches the pattern. A {@code ^}
 * at the very start and a {@code $} at the very end are accepted and ignored; anchors elsewhere,
 * backreferences, lookaround and word boundaries are rejected with a {@link RegexSyntaxException}
 * naming the construct and its offset. Group names are checked and then ignored; lazy quantifiers
 * denote the same language as greedy ones.
 *
 * <p>Supported: literals; escapes <code>\t \n \r \f \v \0 \cX \xHH &#92;uXXXX &#92;u{X...}</code> (a surrogate
 * pair written as two <code>&#92;u</code> escapes is one code point) and identity escapes of syntax
 * characters; {@code .} (any code point but the line terminators LF, CR, U+2028, U+2029);
 * classes {@code [...]} with ranges, negation and escapes ({@code \b} is backspace there);
 * {@code \d \w \s \D \W \S} with their ECMA-262 meanings; {@code \p{..}} and {@code \P{..}} for
 * general categories (short or long names, optionally as {@code gc=}/{@code General_Category=}),
 * scripts ({@code Script=}/{@code sc=}) and the binary properties {@code Any}, {@code ASCII},
 * {@code Assigned}, {@code Alphabetic}, {@code Lowercase}, {@code Uppercase}, {@code Ideographic},
 * {@code White_Space}, all taken from the running JVM's Unicode data; groups {@code ( )},
 * {@code (?: )}, {@code (?<name> )}; alternation (empty alternatives allowed); quantifiers
 * {@code * + ? {m} {m,} {m,n}} and their lazy forms.
 *
 * <p>Limits: repetition bounds at most {@value #MAX_REPEAT}; groups nested at most
 * {@value #MAX_NESTING} deep. The parser uses an explicit stack, so pattern length never turns into
 * stack depth.
 */
public final class RegexSyntax {

    /** The largest repetition bound accepted in {@code {m,n}}. */
    public static final int MAX_REPEAT = 10_000;

    /** The deepest group nesting accepted. */
    public static final int MAX_NESTING = 1_000;

    private static final String SYNTAX_CHARACTERS = "^$\\.*+?()[]{}|/";

    private final String p;
    private int pos;

    private RegexSyntax(String pattern) {
        this.p = pattern;
    }

    /**
     * Parses {@code pattern} into an expression matching exactly the strings the whole pattern
     * matches. Spans in the result are {@link Span#at(int, int)} offsets into the pattern.
     *
     * @param pattern the regular expression
     * @return its IR
     * @throws RegexSyntaxException if the pattern is malformed or uses an unsupported construct
     */
    public static Expr parse(String pattern) {
        Objects.requireNonNull(pattern, "pattern");
        return new RegexSyntax(pattern).run();
    }

    /** One open group (or the whole pattern) while parsing. */
    private static final class Frame {
        final int open;
        final List<Expr> options = new ArrayList<>();
        List<Expr> items = new ArrayList<>();
        int optionStart;
        boolean lastRepeatable;
        int lastStart;

        Frame(int open, int contentStart) {
            this.open = open;
            this.optionStart = contentStart;
        }
    }

    /** A parsed escape or class atom: a single code point or a set. */
    private record Atom(int codePoint, CodePointSet set) {
        boolean isSet() {
            return set != null;
        }

        CodePointSet asSet() {
            return set != null ? set : CodePointSet.of(codePoint);
        }
    }

    private Expr run() {
        Deque<Frame> stack = new ArrayDeque<>();
        int len = p.length();
        if (len > 0 && p.charAt(0) == '^') {
            pos = 1;
        }
        Frame cur = new Frame(-1, pos);
        while (pos < len) {
            char c = p.charAt(pos);
            switch (c) {
                case '|' -> {
                    cur.options.add(finishOption(cur, pos));
                    pos++;
                    cur.items = new ArrayList<>();
                    cur.optionStart = pos;
                    cur.lastRepeatable = false;
                }
                case '(' -> {
                    int open = pos;
                    openGroup();
                    if (stack.size() + 1 > MAX_NESTING) {
                        throw new RegexSyntaxException(
                                "groups are nested more than " + MAX_NESTING + " deep", open, 1);
                    }
                    stack.push(cur);
                    cur = new Frame(open, pos);
                }
                case ')' -> {
                    if (stack.isEmpty()) {
                        throw new RegexSyntaxException("unmatched )", pos, 1);
                    }
                    cur.options.add(finishOption(cur, pos));
                    pos++;
                    int open = cur.open;
                    Expr group = finishGroup(cur, Span.at(open, pos - open));
                    cur = stack.pop();
                    add(cur, group, true);
                    cur.lastStart = open;
                }
                case '*', '+', '?' -> {
                    int start = pos;
                    pos++;
                    quantify(cur, start, c == '+' ? 1 : 0, c == '?' ? 1 : Expr.UNBOUNDED);
                }
                case '{' -> {
                    int start = pos;
                    int[] bounds = braces();
                    if (bounds == null) {
                        throw new RegexSyntaxException(
                                "{ does not start a valid quantifier {m}, {m,} or {m,n} (write \\{ for a literal brace)",
                                start, 1);
                    }
                    quantify(cur, start, bounds[0], bounds[1]);
                }
                case '}' -> throw new RegexSyntaxException("unmatched } (write \\} for a literal brace)", pos, 1);
                case ']' -> throw new RegexSyntaxException("unmatched ] (write \\] for a literal bracket)", pos, 1);
                case '^' -> throw new RegexSyntaxException(
                        "anchor ^ is only supported at the start of the pattern", pos, 1);
                case '$' -> {
                    if (pos != len - 1) {
                        throw new RegexSyntaxException("anchor $ is only supported at the end of the pattern", pos, 1);
                    }
                    pos++;
                    // An ignored anchor is not a quantifiable atom; nothing follows it anyway.
                    cur.lastRepeatable = false;
                }
                case '.' -> {
                    add(cur, new Expr.Chars(PropertySets.DOT, Span.at(pos, 1)), true);
                    pos++;
                }
                case '[' -> {
                    int start = pos;
                    CodePointSet set = characterClass();
                    add(cur, new Expr.Chars(set, Span.at(start, pos - start)), true);
                }
                case '\\' -> {
                    int start = pos;
                    Atom a = escape(false);
                    add(cur, atomExpr(a, Span.at(start, pos - start)), true);
                }
                default -> {
                    int start = pos;
                    int cp = p.codePointAt(pos);
                    pos += Character.charCount(cp);
                    add(cur, atomExpr(new Atom(cp, null), Span.at(start, pos - start)), true);
                }
            }
        }
        if (!stack.isEmpty()) {
            throw new RegexSyntaxException("unclosed group (", cur.open, 1);
        }
        cur.options.add(finishOption(cur, pos));
        return finishGroup(cur, Span.at(0, len));
    }

    private static void add(Frame f, Expr e, boolean repeatable) {
        f.items.add(e);
        f.lastRepeatable = repeatable;
        f.lastStart = e.span().start();
    }

    private static Expr atomExpr(Atom a, Span span) {
        if (a.isSet()) {
            return new Expr.Chars(a.set(), span);
        }
        int cp = a.codePoint();
        if (cp >= Character.MIN_SURROGATE && cp <= Character.MAX_SURROGATE) {
            // A lone surrogate is a code point of its own in Unicode mode; keep it as a set so that
            // later stages can see (and drop) it instead of a broken string.
            return new Expr.Chars(CodePointSet.of(cp), span);
        }
        return new Expr.Text(new String(Character.toChars(cp)), false, span);
    }

    private void quantify(Frame f, int start, int min, int max) {
        if (pos < p.length() && p.charAt(pos) == '?') {
            pos++; // lazy: same language
        }
        if (f.items.isEmpty() || !f.lastRepeatable) {
            throw new RegexSyntaxException("nothing to repeat before " + p.substring(start, pos), start, pos - start);
        }
        Expr body = f.items.remove(f.items.size() - 1);
        int from = f.lastStart; // a group's body may start after its parenthesis
        f.items.add(new Expr.Repeat(body, min, max, Span.at(from, pos - from)));
        f.lastRepeatable = false;
    }

    /** Parses {@code {m}}, {@code {m,}} or {@code {m,n}} at pos; null (pos unchanged) if malformed. */
    private int[] braces() {
        int start = pos;
        int i = pos + 1;
        int mStart = i;
        while (i < p.length() && isDigit(p.charAt(i))) {
            i++;
        }
        if (i == mStart || i >= p.length()) {
            return null;
        }
        String mText = p.substring(mStart, i);
        String nText = null;
        boolean unbounded = false;
        if (p.charAt(i) == ',') {
            i++;
            int nStart = i;
            while (i < p.length() && isDigit(p.charAt(i))) {
                i++;
            }
            if (i == nStart) {
                unbounded = true;
            } else {
                nText = p.substring(nStart, i);
            }
        }
        if (i >= p.length() || p.charAt(i) != '}') {
            return null;
        }
        pos = i + 1;
        int m = bound(mText, start);
        int n = unbounded ? Expr.UNBOUNDED : nText == null ? m : bound(nText, start);
        if (n != Expr.UNBOUNDED && n < m) {
            throw new RegexSyntaxException("repetition bounds " + p.substring(start, pos) + " are out of order",
                    start, pos - start);
        }
        return new int[] {m, n};
    }

    private int bound(String digits, int start) {
        String trimmed = digits.replaceFirst("^0+(?=.)", "");
        if (trimmed.length() > 6 || Integer.parseInt(trimmed) > MAX_REPEAT) {
            throw new RegexSyntaxException("repetition bound " + trimmed + " exceeds the limit of " + MAX_REPEAT,
                    start, pos - start);
        }
        return Integer.parseInt(trimmed);
    }

    private static boolean isDigit(char c) {
        return c >= '0' && c <= '9';
    }

    private static boolean isHex(char c) {
        return Character.digit(c, 16) >= 0 && c < 128;
    }

    /** Consumes a group opener at pos: {@code (}, {@code (?:} or {@code (?<name>}. */
    private void openGroup() {
        int open = pos;
        if (!p.startsWith("(?", pos)) {
            pos++;
            return;
        }
        if (p.startsWith("(?:", pos)) {
            pos += 3;
            return;
        }
        if (p.startsWith("(?=", pos)) {
            throw new RegexSyntaxException("lookahead (?= is not supported", open, 3);
        }
        if (p.startsWith("(?!", pos)) {
            throw new RegexSyntaxException("negative lookahead (?! is not supported", open, 3);
        }
        if (p.startsWith("(?<=", pos)) {
            throw new RegexSyntaxException("lookbehind (?<= is not supported", open, 4);
        }
        if (p.startsWith("(?<!", pos)) {
            throw new RegexSyntaxException("negative lookbehind (?<! is not supported", open, 4);
        }
        if (p.startsWith("(?<", pos)) {
            int nameStart = pos + 3;
            int close = p.indexOf('>', nameStart);
            if (close < 0) {
                throw new RegexSyntaxException("group name is not closed with >", open, 3);
            }
            String name = p.substring(nameStart, close);
            if (!isGroupName(name)) {
                throw new RegexSyntaxException("invalid group name <" + name + ">", nameStart, close - nameStart);
            }
            pos = close + 1;
            return;
        }
        throw new RegexSyntaxException(
                "unsupported group syntax (? (only (?: and (?<name> are supported; inline flags are not)", open, 2);
    }

    private static boolean isGroupName(String name) {
        if (name.isEmpty()) {
            return false;
        }
        for (int i = 0; i < name.length(); ) {
            int cp = name.codePointAt(i);
            boolean ok = cp == '$' || cp == '_'
                    || (i == 0 ? Character.isUnicodeIdentifierStart(cp) : Character.isUnicodeIdentifierPart(cp)
                            && !Character.isIdentifierIgnorable(cp));
            if (!ok) {
                return false;
            }
            i += Character.charCount(cp);
        }
        return true;
    }

    private static Expr finishOption(Frame f, int end) {
        List<Expr> merged = new ArrayList<>(f.items.size());
        for (Expr e : f.items) {
            if (!merged.isEmpty() && e instanceof Expr.Text t
                    && merged.get(merged.size() - 1) instanceof Expr.Text prev
                    && prev.span().end() == t.span().start()) {
                int s = prev.span().start();
                merged.set(merged.size() - 1,
                        new Expr.Text(prev.text() + t.text(), false, Span.at(s, t.span().end() - s)));
            } else {
                merged.add(e);
            }
        }
        if (merged.size() == 1) {
            return merged.get(0);
        }
        return new Expr.Seq(merged, Span.at(f.optionStart, end - f.optionStart));
    }

    private static Expr finishGroup(Frame f, Span span) {
        if (f.options.size() == 1) {
            Expr only = f.options.get(0);
            return only instanceof Expr.Seq s ? new Expr.Seq(s.items(), span) : only;
        }
        return new Expr.Choice(f.options, span);
    }

    // ---- character classes ----

    private CodePointSet characterClass() {
        int open = pos;
        pos++;
        boolean negate = false;
        if (pos < p.length() && p.charAt(pos) == '^') {
            negate = true;
            pos++;
        }
        List<CodePointSet> parts = new ArrayList<>();
        List<Integer> pairs = new ArrayList<>();
        while (true) {
            if (pos >= p.length()) {
                throw new RegexSyntaxException("unclosed character class [", open, 1);
            }
            if (p.charAt(pos) == ']') {
                pos++;
                break;
            }
            int atomStart = pos;
            Atom a = classAtom();
            if (pos + 1 < p.length() && p.charAt(pos) == '-' && p.charAt(pos + 1) != ']') {
                pos++;
                Atom b = classAtom();
                if (a.isSet() || b.isSet()) {
                    throw new RegexSyntaxException(
                            "a class escape such as \\d cannot be the end of a range "
                                    + p.substring(atomStart, pos), atomStart, pos - atomStart);
                }
                if (a.codePoint() > b.codePoint()) {
                    throw new RegexSyntaxException("range " + p.substring(atomStart, pos) + " is out of order",
                            atomStart, pos - atomStart);
                }
                pairs.add(a.codePoint());
                pairs.add(b.codePoint());
            } else if (a.isSet()) {
                parts.add(a.set());
            } else {
                pairs.add(a.codePoint());
                pairs.add(a.codePoint());
            }
        }
        int[] raw = new int[pairs.size()];
        for (int i = 0; i < raw.length; i++) {
            raw[i] = pairs.get(i);
        }
        CodePointSet set = CodePointSet.ofRanges(raw);
        for (CodePointSet part : parts) {
            set = set.union(part);
        }
        return negate ? set.complement() : set;
    }

    private Atom classAtom() {
        if (p.charAt(pos) == '\\') {
            return escape(true);
        }
        int cp = p.codePointAt(pos);
        pos += Character.charCount(cp);
        return new Atom(cp, null);
    }

    // ---- escapes ----

    /** Parses the escape starting with the backslash at pos. */
    private Atom escape(boolean inClass) {
        int start = pos;
        if (pos + 1 >= p.length()) {
            throw new RegexSyntaxException("the pattern ends with a lone backslash", start, 1);
        }
        char c = p.charAt(pos + 1);
        pos += 2;
        switch (c) {
            case 'd':
                return new Atom(-1, PropertySets.DIGIT);
            case 'D':
                return new Atom(-1, PropertySets.DIGIT.complement());
            case 'w':
                return new Atom(-1, PropertySets.WORD);
            case 'W':
                return new Atom(-1, PropertySets.WORD.complement());
            case 's':
                return new Atom(-1, PropertySets.space());
            case 'S':
                return new Atom(-1, PropertySets.space().complement());
            case 'p':
            case 'P':
                return new Atom(-1, property(start, c == 'P'));
            case 't':
                return new Atom('\t', null);
            case 'n':
                return new Atom('\n', null);
            case 'r':
                return new Atom('\r', null);
            case 'f':
                return new Atom('\f', null);
            case 'v':
                return new Atom(0x0B, null);
            case 'b':
                if (inClass) {
                    return new Atom(0x08, null);
                }
                throw new RegexSyntaxException("word boundary \\b is not supported", start, 2);
            case 'B':
                if (inClass) {
                    throw new RegexSyntaxException("invalid escape \\B in a character class", start, 2);
                }
                throw new RegexSyntaxException("word boundary \\B is not supported", start, 2);
            case '0':
                if (pos < p.length() && isDigit(p.charAt(pos))) {
                    throw new RegexSyntaxException("octal escapes are not allowed (use \\x or \\u)", start, 3);
                }
                return new Atom(0, null);
            case 'c': {
                if (pos < p.length() && isAsciiLetter(p.charAt(pos))) {
                    return new Atom(p.charAt(pos++) % 32, null);
                }
                throw new RegexSyntaxException("\\c must be followed by a letter A-Z or a-z", start, 2);
            }
            case 'x': {
                if (pos + 1 < p.length() && isHex(p.charAt(pos)) && isHex(p.charAt(pos + 1))) {
                    int v = Integer.parseInt(p.substring(pos, pos + 2), 16);
                    pos += 2;
                    return new Atom(v, null);
                }
                throw new RegexSyntaxException("\\x must be followed by two hexadecimal digits", start, 2);
            }
            case 'u':
                return new Atom(unicodeEscape(start), null);
            case 'k':
                if (inClass) {
                    throw new RegexSyntaxException("invalid escape \\k in a character class", start, 2);
                }
                throw new RegexSyntaxException("backreference \\k<name> is not supported", start, 2);
            case '-':
                if (inClass) {
                    return new Atom('-', null);
                }
                throw new RegexSyntaxException("invalid escape \\- outside a character class", start, 2);
            default:
                break;
        }
        if (c >= '1' && c <= '9') {
            while (pos < p.length() && isDigit(p.charAt(pos))) {
                pos++;
            }
            String ref = p.substring(start, pos);
            if (inClass) {
                throw new RegexSyntaxException("invalid escape " + ref + " in a character class", start, pos - start);
            }
            throw new RegexSyntaxException("backreference " + ref + " is not supported", start, pos - start);
        }
        if (SYNTAX_CHARACTERS.indexOf(c) >= 0) {
            return new Atom(c, null);
        }
        int cp = p.codePointAt(start + 1);
        pos = start + 1 + Character.charCount(cp);
        throw new RegexSyntaxException("invalid escape \\" + new String(Character.toChars(cp))
                + " (only syntax characters may be escaped)", start, pos - start);
    }

    private static boolean isAsciiLetter(char c) {
        return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
    }

    /** After backslash-u (pos just past the u): {@code XXXX}, a surrogate pair of two such, or {@code {X...}}. */
    private int unicodeEscape(int start) {
        if (pos < p.length() && p.charAt(pos) == '{') {
            int i = pos + 1;
            while (i < p.length() && isHex(p.charAt(i))) {
                i++;
            }
            if (i == pos + 1 || i >= p.length() || p.charAt(i) != '}') {
                throw new RegexSyntaxException("\\u{ must be followed by hexadecimal digits and }", start, 3);
            }
            String digits = p.substring(pos + 1, i).replaceFirst("^0+(?=.)", "");
            pos = i + 1;
            if (digits.length() > 6 || Integer.parseInt(digits, 16) > CodePointSet.MAX) {
                throw new RegexSyntaxException("code point " + p.substring(start, pos) + " is above U+10FFFF",
                        start, pos - start);
            }
            return Integer.parseInt(digits, 16);
        }
        int v = fourHex(pos);
        if (v < 0) {
            throw new RegexSyntaxException("\\u must be followed by four hexadecimal digits or {code point}",
                    start, 2);
        }
        pos += 4;
        if (Character.isHighSurrogate((char) v) && p.startsWith("\\u", pos)) {
            int low = fourHex(pos + 2);
            if (low >= 0 && Character.isLowSurrogate((char) low)) {
                pos += 6;
                return Character.toCodePoint((char) v, (char) low);
            }
        }
        return v;
    }

    private int fourHex(int at) {
        if (at + 4 > p.length()) {
            return -1;
        }
        for (int i = at; i < at + 4; i++) {
            if (!isHex(p.charAt(i))) {
                return -1;
            }
        }
        return Integer.parseInt(p.substring(at, at + 4), 16);
    }

    /** After {@code \p} or {@code \P} (pos just past the letter): {@code {...}}. */
    private CodePointSet property(int start, boolean negate) {
        if (pos >= p.length() || p.charAt(pos) != '{') {
            throw new RegexSyntaxException("\\" + p.charAt(start + 1) + " must be followed by {property}", start, 2);
        }
        int close = p.indexOf('}', pos);
        if (close < 0) {
            throw new RegexSyntaxException("unclosed property escape " + p.substring(start), start,
                    p.length() - start);
        }
        String body = p.substring(pos + 1, close);
        pos = close + 1;
        String shown = p.substring(start, pos);
        CodePointSet set;
        int eq = body.indexOf('=');
        if (eq >= 0) {
            String name = body.substring(0, eq);
            String value = body.substring(eq + 1);
            switch (name) {
                case "General_Category", "gc" -> set = PropertySets.generalCategory(value);
                case "Script", "sc" -> set = value.isEmpty() ? null : PropertySets.script(value);
                case "Script_Extensions", "scx" -> throw new RegexSyntaxException(
                        "property " + name + " is not supported in " + shown + " (use Script=)", start, pos - start);
                default -> throw new RegexSyntaxException("unknown property " + name + " in " + shown,
                        start, pos - start);
            }
        } else {
            set = PropertySets.generalCategory(body);
            if (set == null) {
                set = PropertySets.binary(body);
            }
        }
        if (set == null) {
            throw new RegexSyntaxException("unknown or unsupported property value in " + shown, start, pos - start);
        }
        return negate ? set.complement() : set;
    }
}
