package dev.espalier.abnf;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.GrammarAnalysis;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Severity;
import dev.espalier.grammar.Span;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Everything a checker reports about an ABNF file: the front end's diagnostics ({@link Abnf}) merged
 * with those of {@link GrammarAnalysis}, plus one finding of its own, ordered by position.
 *
 * <p>{@code case-insensitive-string} (hint): a string written plainly in quotes that contains
 * letters matches them in any case (RFC 5234 §2.3); the hint points at {@code %s"..."} for an exact
 * match. Strings written {@code %i"..."} say so on purpose and get no hint.
 *
 * <p>Only the rules defined in the checked file are reported on: imported rules and the core rules
 * the front end adds are analysed but not reported (an unused imported rule is not a finding).
 */
public final class AbnfCheck {

    private AbnfCheck() {
    }

    /**
     * Reads and checks one ABNF text (without following {@code ;@use} directives).
     *
     * @return the grammar, all diagnostics ordered by position, and the rule sites
     */
    public static AbnfResult check(String text, String fileName) {
        return merge(Abnf.parse(text, fileName), text == null ? "" : text, fileName == null ? "<input>" : fileName);
    }

    /** Reads and checks an ABNF text and the files its directives name (see {@link Abnf#parseWithImports}). */
    public static AbnfResult checkWithImports(String text, String fileName, ImportResolver resolver) {
        return merge(Abnf.parseWithImports(text, fileName, resolver), text == null ? "" : text,
                fileName == null ? "<input>" : fileName);
    }

    /**
     * Reads and checks an ABNF file (UTF-8) and the files its directives name, relative to it.
     *
     * @throws java.io.UncheckedIOException when the file cannot be read
     */
    public static AbnfResult checkFile(java.nio.file.Path file) {
        java.nio.file.Path main = file.toAbsolutePath().normalize();
        String text;
        try {
            text = java.nio.file.Files.readString(main, java.nio.charset.StandardCharsets.UTF_8);
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        return checkWithImports(text, main.toString(), Abnf.fileResolver());
    }

    private static AbnfResult merge(AbnfResult read, String text, String fileName) {
        Set<String> own = new HashSet<>();
        for (RuleSite s : read.sites()) {
            if (s.isDefinition() && s.source().equals(fileName)) {
                own.add(s.key());
            }
        }
        List<Diagnostic> all = new ArrayList<>(read.diagnostics());
        try {
            all.addAll(GrammarAnalysis.of(read.grammar(), r -> own.contains(r.key())).diagnostics());
        } catch (RuntimeException | StackOverflowError e) { // analysis never fails, it reports
            all.add(new Diagnostic("internal", Severity.ERROR, "internal error while analysing the grammar (" + e + ")",
                    new Span(0, 0, 1, 1)));
        }
        for (Rule r : read.grammar().rules()) {
            if (own.contains(r.key())) {
                plainStrings(r.body(), text, all);
            }
        }
        all.sort(Comparator.comparingInt((Diagnostic d) -> d.span().start()));
        return new AbnfResult(read.grammar(), all, read.sites());
    }

    /** Hints at quoted strings with letters written without {@code %s} or {@code %i}. */
    private static void plainStrings(Expr body, String text, List<Diagnostic> into) {
        List<Expr> stack = new ArrayList<>();
        stack.add(body);
        while (!stack.isEmpty()) {
            Expr e = stack.remove(stack.size() - 1);
            if (e instanceof Expr.Seq s) {
                stack.addAll(s.items());
            } else if (e instanceof Expr.Choice c) {
                stack.addAll(c.options());
            } else if (e instanceof Expr.Repeat r) {
                stack.add(r.body());
            } else if (e instanceof Expr.Text t && t.ignoreCase() && hasLetter(t.text())) {
                Span s = t.span();
                if (s.isKnown() && s.start() < text.length() && s.end() <= text.length() && text.charAt(s.start()) == '"') {
                    into.add(new Diagnostic("case-insensitive-string", Severity.HINT,
                            "matches any case: write %s\"" + t.text() + "\" for exactly this case", s));
                }
            }
        }
    }

    private static boolean hasLetter(String s) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if ((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')) {
                return true;
            }
        }
        return false;
    }
}
