package dev.espalier.abnf;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Severity;
import dev.espalier.grammar.Span;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.antlr.v4.runtime.BaseErrorListener;
import org.antlr.v4.runtime.CharStreams;
import org.antlr.v4.runtime.CommonToken;
import org.antlr.v4.runtime.CommonTokenStream;
import org.antlr.v4.runtime.ListTokenSource;
import org.antlr.v4.runtime.ParserRuleContext;
import org.antlr.v4.runtime.RecognitionException;
import org.antlr.v4.runtime.Recognizer;
import org.antlr.v4.runtime.Token;
import org.antlr.v4.runtime.tree.TerminalNode;

/**
 * Reads one ABNF file into rules, diagnostics, rule sites and import directives. Not thread-safe;
 * one instance per file.
 *
 * <p>Steps: lex everything; a pass over the tokens re-types definition names, reports stray
 * characters, unterminated strings, unindented continuation lines and over-deep nesting (removing
 * the rule that nests too deep, so that ANTLR's recursive parser stays within its stack); ANTLR
 * parses the remaining tokens with readable error recovery; a walk over the tree builds the IR,
 * recursing only as deep as the (bounded) nesting.
 */
final class AbnfReader {

    /** Diagnostic codes of the front end. */
    static final String SYNTAX = "syntax";
    static final String PROSE_VALUE = "prose-value";
    static final String VALUE_RANGE = "value-range";
    static final String REPEAT_BOUNDS = "repeat-bounds";
    static final String DUPLICATE_DEFINITION = "duplicate-definition";
    static final String INCREMENTAL_UNDEFINED = "incremental-undefined";
    static final String IMPORT = "import";

    /** At most this many {@code syntax} diagnostics per file, so garbage input stays cheap to report. */
    static final int MAX_SYNTAX_DIAGNOSTICS = 100;

    private static final Pattern USE_DIRECTIVE = Pattern.compile(";@use[ \\t]+\"([^\"]*)\"[ \\t]*(;.*)?");

    /** A {@code ;@use "path"} directive. */
    record UseDirective(String path, Span span) { }

    /** What one file yields, before imports and core rules are added. */
    record FileResult(List<Rule> rules, String firstRule, List<Diagnostic> diagnostics,
                      List<RuleSite> sites, List<UseDirective> directives) { }

    private final SourceText src;
    private final String fileName;
    private final List<Diagnostic> diagnostics = new ArrayList<>();
    private final List<RuleSite> sites = new ArrayList<>();
    private final List<UseDirective> directives = new ArrayList<>();
    private final Map<String, RuleDraft> rules = new LinkedHashMap<>();
    private int syntaxCount;
    /** Unindented continuation lines; reported unless the parser reports the same token. */
    private final List<Span> unindented = new ArrayList<>();

    private final int maxNesting;
    private final String nestingNote;

    private AbnfReader(String text, String fileName, int maxNesting, String nestingNote) {
        this.src = new SourceText(text);
        this.fileName = fileName;
        this.maxNesting = maxNesting;
        this.nestingNote = nestingNote;
    }

    /**
     * Reads one file with nesting limited to {@link Abnf#MAX_NESTING}. Should the thread's stack not
     * suffice for that depth, reads again with a limit of {@link #SMALL_STACK_NESTING}.
     */
    static FileResult read(String text, String fileName) {
        try {
            return new AbnfReader(text, fileName, Abnf.MAX_NESTING, "").run();
        } catch (StackOverflowError e) {
            return new AbnfReader(text, fileName, SMALL_STACK_NESTING,
                    " (the stack of this thread is too small for more)").run();
        }
    }

    /** The nesting limit used when the caller's thread has too little stack for {@link Abnf#MAX_NESTING}. */
    static final int SMALL_STACK_NESTING = 64;

    // ------------------------------------------------------------------ driver

    /** A rule as it is being assembled (several {@code =/} definitions may contribute). */
    private static final class RuleDraft {
        final String name;
        final Span nameSpan;
        /** The first definition's body, or an empty Choice when it could not be read. */
        final Expr first;
        /** Bodies of later {@code =/} definitions. */
        final List<Expr> increments = new ArrayList<>();
        int end;

        RuleDraft(String name, Span nameSpan, Expr first, int end) {
            this.name = name;
            this.nameSpan = nameSpan;
            this.first = first;
            this.end = end;
        }

        /** The rule's body: the first definition, with any {@code =/} alternatives merged into one Choice. */
        Expr body() {
            if (increments.isEmpty()) {
                return first;
            }
            List<Expr> options = new ArrayList<>();
            addOptions(options, first);
            for (Expr e : increments) {
                addOptions(options, e);
            }
            Span f = first.span();
            return new Expr.Choice(options, new Span(f.start(), Math.max(f.start(), end), f.line(), f.column()));
        }

        private static void addOptions(List<Expr> into, Expr e) {
            if (e instanceof Expr.Choice c) {
                into.addAll(c.options());
            } else {
                into.add(e);
            }
        }
    }

    /** A rule whose body was not parsed because it nests too deep. */
    private record SkippedRule(Token name, Token definedAs, List<Token> names) { }

    private FileResult run() {
        AbnfSyntaxLexer lexer = new AbnfSyntaxLexer(CharStreams.fromString(src.text(), fileName));
        lexer.removeErrorListeners();
        List<Token> all = new ArrayList<>();
        for (Token t = lexer.nextToken(); ; t = lexer.nextToken()) {
            all.add(t);
            if (t.getType() == Token.EOF) {
                break;
            }
        }
        List<SkippedRule> skipped = new ArrayList<>();
        List<Token> parserTokens = prepare(all, skipped);

        AbnfSyntaxParser parser = new AbnfSyntaxParser(new CommonTokenStream(new ListTokenSource(parserTokens)));
        parser.removeErrorListeners();
        parser.addErrorListener(new BaseErrorListener() {
            @Override
            public void syntaxError(Recognizer<?, ?> recognizer, Object offendingSymbol, int line,
                                    int charPositionInLine, String msg, RecognitionException e) {
                Span at = offendingSymbol instanceof Token t && SourceText.isReal(t)
                        ? src.span(t) : src.span(src.length(), src.length());
                syntax(at, msg);
            }
        });
        parser.setErrorHandler(new ReadableErrors());
        AbnfSyntaxParser.RulelistContext tree = parser.rulelist();
        java.util.Set<Integer> reported = new java.util.HashSet<>();
        for (Diagnostic d : diagnostics) {
            reported.add(d.span().start());
        }
        for (Span u : unindented) {
            if (!reported.contains(u.start())) {
                syntax(u, "this line is not indented, so it cannot continue the rule above; "
                        + "indent it, or write 'name = ...' to start a new rule");
            }
        }

        // definitions in source order: parsed ones and skipped ones interleave
        List<Object> defs = new ArrayList<>(tree.ruleDefinition());
        defs.addAll(skipped);
        defs.sort(Comparator.comparingInt(d -> d instanceof SkippedRule s
                ? s.name().getStartIndex()
                : ((AbnfSyntaxParser.RuleDefinitionContext) d).getStart().getStartIndex()));
        for (Object d : defs) {
            if (d instanceof SkippedRule s) {
                for (Token n : s.names()) {
                    sites.add(new RuleSite(n.getText(), src.span(n), RuleSite.Kind.REFERENCE, fileName));
                }
                define(s.name(), s.definedAs(), null, src.end(s.definedAs()));
            } else {
                AbnfSyntaxParser.RuleDefinitionContext rc = (AbnfSyntaxParser.RuleDefinitionContext) d;
                Token definedAs = rc.definedAs() == null ? null : rc.definedAs().getStart();
                if (definedAs == null || !SourceText.isReal(definedAs)) {
                    continue;
                }
                Expr body = rc.alternation() == null ? null : alternation(rc.alternation());
                define(rc.DEF_NAME().getSymbol(), definedAs, body, body == null ? src.end(definedAs) : body.span().end());
            }
        }

        List<Rule> out = new ArrayList<>();
        String first = null;
        for (RuleDraft d : rules.values()) {
            out.add(new Rule(d.name, d.body(), d.nameSpan, src.span(d.nameSpan.start(), d.end)));
            if (first == null) {
                first = d.name;
            }
        }
        diagnostics.sort(Comparator.comparingInt(x -> x.span().start()));
        sites.sort(Comparator.comparingInt(x -> x.span().start()));
        return new FileResult(out, first, List.copyOf(diagnostics), List.copyOf(sites), List.copyOf(directives));
    }

    private void define(Token nameTok, Token definedAs, Expr body, int end) {
        String name = nameTok.getText();
        Span nameSpan = src.span(nameTok);
        boolean incremental = definedAs.getType() == AbnfSyntaxParser.EQUALS_SLASH;
        sites.add(new RuleSite(name, nameSpan, incremental ? RuleSite.Kind.INCREMENTAL_DEFINITION : RuleSite.Kind.DEFINITION, fileName));
        String key = Grammar.key(name);
        RuleDraft existing = rules.get(key);
        if (existing != null && !incremental) {
            report(DUPLICATE_DEFINITION, Severity.ERROR, nameSpan,
                    "rule '" + name + "' is already defined at line " + existing.nameSpan.line()
                            + "; write '" + name + " =/ ...' to add alternatives to it");
            return;
        }
        Expr readable = body != null ? body : new Expr.Choice(List.of(), src.span(end, end));
        if (existing != null) {
            existing.increments.add(readable);
            existing.end = Math.max(existing.end, end);
            return;
        }
        if (incremental) {
            report(INCREMENTAL_UNDEFINED, Severity.WARNING, nameSpan,
                    "'=/' adds alternatives to rule '" + name + "', which is not defined above; read as its definition");
        }
        rules.put(key, new RuleDraft(name, nameSpan, readable, end));
    }

    // ------------------------------------------------------------------ token pass

    private List<Token> prepare(List<Token> all, List<SkippedRule> skipped) {
        int n = all.size();
        // 1. stray characters, unterminated literals, directives; find the line-first tokens
        boolean[] lineFirst = new boolean[n];
        boolean atLineStart = true;
        int i = 0;
        while (i < n) {
            Token t = all.get(i);
            int type = t.getType();
            if (type == AbnfSyntaxLexer.NEWLINE) {
                atLineStart = true;
            } else if (type == AbnfSyntaxLexer.WS) {
                // white space does not change whether the next token starts its line
            } else if (type == AbnfSyntaxLexer.COMMENT) {
                if (atLineStart && t.getText().startsWith(";@")) {
                    directive(t);
                }
            } else if (type == AbnfSyntaxLexer.UNEXPECTED) {
                int j = i;
                while (j + 1 < n && all.get(j + 1).getType() == AbnfSyntaxLexer.UNEXPECTED
                        && all.get(j + 1).getStartIndex() == all.get(j).getStopIndex() + 1) {
                    j++;
                }
                Span s = src.span(src.start(t), src.end(all.get(j)));
                syntax(s, (j == i ? "unexpected character " : "unexpected characters ")
                        + quoted(src.text().substring(s.start(), s.end())));
                i = j + 1;
                continue;
            } else {
                if (type == AbnfSyntaxLexer.UNTERMINATED_CHAR_VAL) {
                    boolean prefixed = t.getText().startsWith("%");
                    syntax(src.spanOfPrefix(t, prefixed ? 3 : 1),
                            "this string has no closing quote; a quoted string ends on the line it starts");
                    ((CommonToken) t).setType(prefixed ? AbnfSyntaxLexer.CASE_CHAR_VAL : AbnfSyntaxLexer.CHAR_VAL);
                } else if (type == AbnfSyntaxLexer.UNTERMINATED_PROSE_VAL) {
                    syntax(src.spanOfPrefix(t, 1), "this prose value has no closing '>'");
                    ((CommonToken) t).setType(AbnfSyntaxLexer.PROSE_VAL);
                }
                lineFirst[i] = atLineStart;
                atLineStart = false;
            }
            i++;
        }

        // significant tokens, in order (stray characters and hidden tokens removed)
        List<Integer> sig = new ArrayList<>();
        for (int k = 0; k < n; k++) {
            Token t = all.get(k);
            if (t.getChannel() == Token.DEFAULT_CHANNEL && t.getType() != AbnfSyntaxLexer.UNEXPECTED) {
                sig.add(k);
            }
        }

        // 2. a rule name that starts its line and is followed by '=' or '=/' starts a definition
        for (int s = 0; s + 1 < sig.size(); s++) {
            Token t = all.get(sig.get(s));
            int nextType = all.get(sig.get(s + 1)).getType();
            if (t.getType() == AbnfSyntaxLexer.NAME && lineFirst[sig.get(s)]
                    && (nextType == AbnfSyntaxLexer.EQUALS || nextType == AbnfSyntaxLexer.EQUALS_SLASH)) {
                ((CommonToken) t).setType(AbnfSyntaxParser.DEF_NAME);
            }
        }

        // 3. continuation lines must be indented (RFC 5234 §4, c-wsp); nesting is bounded
        List<Token> out = new ArrayList<>();
        int ruleIndent = -1;
        int chunkStart = 0; // index into out where the current rule's tokens begin
        int depth = 0;
        boolean dropping = false;
        List<Token> chunkNames = new ArrayList<>();
        Token chunkName = null;
        Token chunkDefinedAs = null;
        // ANTLR cannot resynchronise at the entry of the top-level loop (it would give up on the file),
        // so text before the first rule is reported and dropped here
        int firstRule = 0;
        while (firstRule < sig.size() && all.get(sig.get(firstRule)).getType() != AbnfSyntaxParser.DEF_NAME
                && all.get(sig.get(firstRule)).getType() != Token.EOF) {
            firstRule++;
        }
        if (firstRule > 0) {
            Token junk = all.get(sig.get(0));
            Token last = junk;
            for (int s = 1; s < firstRule && all.get(sig.get(s)).getLine() == junk.getLine(); s++) {
                last = all.get(sig.get(s));
            }
            syntax(src.span(src.start(junk), src.end(last)), "unexpected " + ReadableErrors.describe(junk)
                    + "; a grammar starts with a rule definition (name = ...)");
        }
        for (int s = firstRule; s < sig.size(); s++) {
            int k = sig.get(s);
            Token t = all.get(k);
            int type = t.getType();
            if (type == AbnfSyntaxParser.DEF_NAME || type == Token.EOF) {
                if (dropping) {
                    while (out.size() > chunkStart) {
                        out.remove(out.size() - 1);
                    }
                    if (chunkName != null && chunkDefinedAs != null) {
                        skipped.add(new SkippedRule(chunkName, chunkDefinedAs, List.copyOf(chunkNames)));
                    }
                }
                dropping = false;
                depth = 0;
                chunkStart = out.size();
                chunkNames.clear();
                chunkName = type == AbnfSyntaxParser.DEF_NAME ? t : null;
                chunkDefinedAs = type == AbnfSyntaxParser.DEF_NAME ? all.get(sig.get(s + 1)) : null;
                if (type == AbnfSyntaxParser.DEF_NAME && ruleIndent < 0) {
                    ruleIndent = src.span(t).column();
                }
            } else if (lineFirst[k] && ruleIndent > 0 && src.span(t).column() == 1
                    && all.get(sig.get(s - 1)).getType() != AbnfSyntaxParser.DEF_NAME) {
                unindented.add(src.span(t));
            }
            if (type == AbnfSyntaxLexer.NAME) {
                chunkNames.add(t);
            } else if (type == AbnfSyntaxLexer.LPAREN || type == AbnfSyntaxLexer.LBRACKET) {
                depth++;
                if (depth == maxNesting + 1 && !dropping) {
                    syntax(src.span(t), "groups nested deeper than " + maxNesting
                            + " levels" + nestingNote + "; this rule is not read");
                    dropping = true;
                }
            } else if (type == AbnfSyntaxLexer.RPAREN || type == AbnfSyntaxLexer.RBRACKET) {
                depth = Math.max(0, depth - 1);
            }
            out.add(t);
        }
        return out;
    }

    private void directive(Token t) {
        String text = t.getText();
        if (!text.startsWith(";@use")) {
            return; // other ";@" comments are plain comments
        }
        Matcher m = USE_DIRECTIVE.matcher(text);
        Span span = src.span(t);
        if (!m.matches() || m.group(1).isEmpty()) {
            report(IMPORT, Severity.ERROR, span, "malformed directive; write ;@use \"file.abnf\"");
            return;
        }
        directives.add(new UseDirective(m.group(1), span));
    }

    // ------------------------------------------------------------------ IR

    /**
     * The IR of an alternation, built with an explicit stack: compiled frames of a recursive walk are
     * large enough that a thread's default stack would not reach the nesting limit.
     */
    private Expr alternation(AbnfSyntaxParser.AlternationContext root) {
        ArrayDeque<BuildFrame> stack = new ArrayDeque<>();
        stack.push(new BuildFrame(root));
        Expr returned = null;
        boolean hasReturned = false;
        while (true) {
            BuildFrame f = stack.peek();
            if (hasReturned) {
                f.results.add(returned);
                hasReturned = false;
            }
            ParserRuleContext next = f.nextChild();
            if (next != null) {
                stack.push(new BuildFrame(next));
                continue;
            }
            Expr result = finish(f);
            stack.pop();
            if (stack.isEmpty()) {
                return result;
            }
            returned = result;
            hasReturned = true;
        }
    }

    /** One node of the parse tree being turned into IR: its children are visited first. */
    private static final class BuildFrame {
        final ParserRuleContext ctx;
        final List<? extends ParserRuleContext> children;
        final List<Expr> results = new ArrayList<>();
        int next;

        BuildFrame(ParserRuleContext ctx) {
            this.ctx = ctx;
            if (ctx instanceof AbnfSyntaxParser.AlternationContext a) {
                children = a.concatenation();
            } else if (ctx instanceof AbnfSyntaxParser.ConcatenationContext c) {
                children = c.repetition();
            } else if (ctx instanceof AbnfSyntaxParser.GroupElementContext g && g.alternation() != null) {
                children = List.of(g.alternation());
            } else if (ctx instanceof AbnfSyntaxParser.OptionElementContext o && o.alternation() != null) {
                children = List.of(o.alternation());
            } else {
                children = List.of();
            }
        }

        ParserRuleContext nextChild() {
            return next < children.size() ? children.get(next++) : null;
        }
    }

    private Expr finish(BuildFrame f) {
        List<Expr> parts = new ArrayList<>();
        for (Expr e : f.results) {
            if (e != null) {
                parts.add(e);
            }
        }
        if (f.ctx instanceof AbnfSyntaxParser.RepetitionContext r) {
            return repetition(r, parts.isEmpty() ? null : parts.get(0));
        }
        if (parts.isEmpty()) {
            return null;
        }
        if (parts.size() == 1) {
            return parts.get(0);
        }
        return f.ctx instanceof AbnfSyntaxParser.AlternationContext
                ? new Expr.Choice(parts, cover(parts))
                : new Expr.Seq(parts, cover(parts));
    }

    private Span cover(List<Expr> parts) {
        Span a = parts.get(0).span();
        Span b = parts.get(parts.size() - 1).span();
        return new Span(a.start(), Math.max(a.start(), b.end()), a.line(), a.column());
    }

    /** The IR of one repetition; {@code inner} is the IR of a group's or option's content. */
    private Expr repetition(AbnfSyntaxParser.RepetitionContext ctx, Expr inner) {
        Expr element;
        AbnfSyntaxParser.RepeatContext repeat;
        if (ctx instanceof AbnfSyntaxParser.RefElementContext c) {
            repeat = c.repeat();
            Token t = c.NAME().getSymbol();
            if (!SourceText.isReal(t)) {
                return null;
            }
            element = new Expr.Ref(t.getText(), src.span(t));
            sites.add(new RuleSite(t.getText(), element.span(), RuleSite.Kind.REFERENCE, fileName));
        } else if (ctx instanceof AbnfSyntaxParser.GroupElementContext c) {
            repeat = c.repeat();
            element = inner != null ? inner : new Expr.Choice(List.of(), bracketed(c.LPAREN(), c.RPAREN(), null));
        } else if (ctx instanceof AbnfSyntaxParser.OptionElementContext c) {
            repeat = c.repeat();
            Span s = bracketed(c.LBRACKET(), c.RBRACKET(), inner);
            element = new Expr.Repeat(inner != null ? inner : new Expr.Seq(List.of(), s), 0, 1, s);
        } else if (ctx instanceof AbnfSyntaxParser.CharValElementContext c) {
            repeat = c.repeat();
            Token t = c.CHAR_VAL() != null ? c.CHAR_VAL().getSymbol() : c.CASE_CHAR_VAL() == null ? null : c.CASE_CHAR_VAL().getSymbol();
            if (!SourceText.isReal(t)) {
                return null;
            }
            element = charVal(t);
        } else if (ctx instanceof AbnfSyntaxParser.NumValElementContext c) {
            repeat = c.repeat();
            Token t = c.NUM_VAL().getSymbol();
            if (!SourceText.isReal(t)) {
                return null;
            }
            element = numVal(t);
        } else if (ctx instanceof AbnfSyntaxParser.ProseValElementContext c) {
            repeat = c.repeat();
            Token t = c.PROSE_VAL().getSymbol();
            if (!SourceText.isReal(t)) {
                return null;
            }
            Span s = src.span(t);
            report(PROSE_VALUE, Severity.ERROR, s, "a prose value describes text in words and cannot be enforced; "
                    + "write the rule in ABNF instead");
            element = new Expr.Choice(List.of(), s);
        } else {
            return null; // a repetition ANTLR could not read; already reported
        }
        if (repeat == null) {
            return element;
        }
        Token elementToken = ctx.getChildCount() > 1 && ctx.getChild(1) instanceof TerminalNode tn ? tn.getSymbol() : null;
        Token last = ctx.getStop();
        int elementEnd = SourceText.isReal(last) && src.end(last) > element.span().end() ? src.end(last) : element.span().end();
        return repeated(repeat, elementToken, element, elementEnd);
    }

    private Span bracketed(TerminalNode open, TerminalNode close, Expr inner) {
        int start = src.start(open.getSymbol());
        int end = close != null && SourceText.isReal(close.getSymbol()) ? src.end(close.getSymbol())
                : inner != null ? inner.span().end() : src.end(open.getSymbol());
        return src.span(start, end);
    }

    private Expr repeated(AbnfSyntaxParser.RepeatContext rc, Token elementToken, Expr element, int elementEnd) {
        Token first = rc.getStart();
        if (!SourceText.isReal(first)) {
            return element;
        }
        Span repeatSpan = src.span(src.start(first), src.end(rc.getStop()));
        if (elementToken != null && SourceText.isReal(elementToken) && src.start(elementToken) != repeatSpan.end()) {
            syntax(src.span(repeatSpan.end(), Math.max(repeatSpan.end(), src.start(elementToken))),
                    "no space is allowed between a repetition count and its element");
        }
        int min = 0;
        int max = Expr.UNBOUNDED;
        boolean starSeen = false;
        boolean tooLarge = false;
        for (int i = 0; i < rc.getChildCount(); i++) {
            if (!(rc.getChild(i) instanceof TerminalNode tn)) {
                continue;
            }
            Token t = tn.getSymbol();
            if (t.getType() == AbnfSyntaxLexer.STAR) {
                starSeen = true;
            } else if (t.getType() == AbnfSyntaxLexer.DIGITS && SourceText.isReal(t)) {
                long v = 0;
                for (char ch : t.getText().toCharArray()) {
                    v = Math.min((long) Integer.MAX_VALUE + 1, v * 10 + (ch - '0'));
                }
                if (v > Integer.MAX_VALUE) {
                    tooLarge = true;
                }
                if (starSeen) {
                    max = (int) Math.min(v, Integer.MAX_VALUE);
                } else {
                    min = (int) Math.min(v, Integer.MAX_VALUE);
                }
            }
        }
        if (!starSeen) {
            max = min;
        }
        Span whole = src.span(repeatSpan.start(), Math.max(repeatSpan.end(), elementEnd));
        if (tooLarge) {
            report(REPEAT_BOUNDS, Severity.ERROR, repeatSpan, "repetition count is too large (at most " + Integer.MAX_VALUE + ")");
        }
        if (max != Expr.UNBOUNDED && min > max) {
            report(REPEAT_BOUNDS, Severity.ERROR, repeatSpan, "repetition bounds are reversed: at least " + min
                    + " but at most " + max + " can never match; write " + max + "*" + min);
            return new Expr.Choice(List.of(), whole);
        }
        return new Expr.Repeat(element, min, max, whole);
    }

    private Expr charVal(Token t) {
        String text = t.getText();
        boolean caseSensitive = false;
        int skip = 1;
        if (text.startsWith("%")) {
            caseSensitive = text.charAt(1) == 's' || text.charAt(1) == 'S';
            skip = 3;
        }
        String body = text.substring(Math.min(skip, text.length()));
        if (body.endsWith("\"")) {
            body = body.substring(0, body.length() - 1);
        }
        return new Expr.Text(body, !caseSensitive, src.span(t));
    }

    /** %b, %d or %x value: single, range or dotted (RFC 5234 §2.3 and §4 num-val). */
    private Expr numVal(Token t) {
        String text = t.getText();
        int base0 = src.start(t); // NUM_VAL is ASCII, so offsets within it are char offsets
        Span whole = src.span(t);
        char b = Character.toLowerCase(text.charAt(1));
        int radix = b == 'b' ? 2 : b == 'd' ? 10 : 16;
        String baseName = b == 'b' ? "binary" : b == 'd' ? "decimal" : "hexadecimal";
        List<int[]> parts = new ArrayList<>(); // [from, to) within text
        StringBuilder seps = new StringBuilder();
        int from = 2;
        for (int i = 2; i <= text.length(); i++) {
            if (i == text.length() || text.charAt(i) == '.' || text.charAt(i) == '-') {
                parts.add(new int[] {from, i});
                if (i < text.length()) {
                    seps.append(text.charAt(i));
                }
                from = i + 1;
            }
        }
        Expr nothing = new Expr.Chars(CodePointSet.EMPTY, whole);
        boolean dotted = seps.length() > 0 && seps.chars().allMatch(c -> c == '.');
        boolean range = seps.toString().equals("-");
        if (seps.length() > 0 && !dotted && !range) {
            report(VALUE_RANGE, Severity.ERROR, whole, "a value is a single number, one range (%x30-39) or "
                    + "numbers joined by dots (%d13.10), not a mix");
            return nothing;
        }
        int[] values = new int[parts.size()];
        boolean ok = true;
        for (int p = 0; p < parts.size(); p++) {
            int[] r = parts.get(p);
            Span ps = src.span(base0 + r[0], base0 + r[1]);
            if (r[0] == r[1]) {
                report(VALUE_RANGE, Severity.ERROR, src.span(base0 + r[0] - 1, base0 + r[0]),
                        "missing " + baseName + " digits after '" + text.charAt(r[0] - 1) + "'");
                ok = false;
                continue;
            }
            long v = 0;
            boolean badDigit = false;
            for (int i = r[0]; i < r[1]; i++) {
                int d = Character.digit(text.charAt(i), radix);
                if (d < 0) {
                    report(VALUE_RANGE, Severity.ERROR, src.span(base0 + i, base0 + i + 1),
                            "'" + text.charAt(i) + "' is not a " + baseName + " digit");
                    badDigit = true;
                    break;
                }
                v = Math.min(v * radix + d, 0x110000L);
            }
            if (badDigit) {
                ok = false;
                continue;
            }
            if (v > CodePointSet.MAX) {
                report(VALUE_RANGE, Severity.ERROR, ps, "value " + text.substring(r[0], r[1])
                        + " is above the largest Unicode code point, 10FFFF");
                ok = false;
            } else if (v >= 0xD800 && v <= 0xDFFF) {
                report(VALUE_RANGE, Severity.ERROR, ps, String.format("U+%04X is a surrogate code point, not a "
                        + "Unicode scalar value; UTF-8 cannot encode it", v));
                ok = false;
            }
            values[p] = (int) v;
        }
        if (!ok) {
            return nothing;
        }
        if (range) {
            if (values[0] > values[1]) {
                report(VALUE_RANGE, Severity.ERROR, whole, "range is reversed: " + text.substring(parts.get(0)[0], parts.get(0)[1])
                        + " is above " + text.substring(parts.get(1)[0], parts.get(1)[1]));
                return nothing;
            }
            return new Expr.Chars(CodePointSet.range(values[0], values[1]), whole);
        }
        if (dotted) {
            return new Expr.Text(new String(values, 0, values.length), false, whole);
        }
        return new Expr.Chars(CodePointSet.of(values[0]), whole);
    }

    // ------------------------------------------------------------------ diagnostics

    private void syntax(Span at, String message) {
        syntaxCount++;
        if (syntaxCount < MAX_SYNTAX_DIAGNOSTICS) {
            diagnostics.add(new Diagnostic(SYNTAX, Severity.ERROR, message, at));
        } else if (syntaxCount == MAX_SYNTAX_DIAGNOSTICS) {
            diagnostics.add(new Diagnostic(SYNTAX, Severity.ERROR, message + " (further syntax errors in this file are not reported)", at));
        }
    }

    private void report(String code, Severity severity, Span at, String message) {
        diagnostics.add(new Diagnostic(code, severity, message, at));
    }

    private static String quoted(String s) {
        StringBuilder sb = new StringBuilder("'");
        int shown = 0;
        for (int i = 0; i < s.length() && shown < 12; ) {
            int cp = s.codePointAt(i);
            i += Character.charCount(cp);
            shown++;
            if (cp >= 0x20 && cp < 0x7F) {
                sb.appendCodePoint(cp);
            } else {
                sb.append(String.format("\\u{%X}", cp));
            }
        }
        if (s.codePointCount(0, s.length()) > shown) {
            sb.append("...");
        }
        return sb.append('\'').toString();
    }
}
