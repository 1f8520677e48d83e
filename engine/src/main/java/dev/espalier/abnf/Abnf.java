package dev.espalier.abnf;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Severity;
import dev.espalier.grammar.Span;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * The ABNF front end: reads grammars written in ABNF (RFC 5234, with the case-sensitive strings of
 * RFC 7405) into the grammar IR. Reading never fails: it returns the IR of whatever could be
 * recovered, diagnostics with exact source ranges, and every rule-name occurrence
 * ({@link RuleSite}) for editor features.
 *
 * <h2>Reading</h2>
 * <ul>
 *   <li>Line ends may be LF, CRLF or CR; tabs are white space; the final line end may be missing;
 *       rules may be indented uniformly. A rule's elements continue on following lines that start
 *       with white space (RFC 5234 §4); a line that is not indented and does not start a rule is
 *       reported.</li>
 *   <li>Rule names are case-insensitive (RFC 5234 §2.1); the first rule of the file is the start rule.</li>
 *   <li>{@code "abc"} and {@code %i"abc"} are case-insensitive strings (RFC 5234 §2.3, RFC 7405),
 *       {@code %s"abc"} is case-sensitive. Num-vals are Unicode code points: {@code %x41} is one code
 *       point, {@code %x30-39} a range, {@code %d13.10} a case-sensitive string. Values above 10FFFF
 *       and surrogates (D800-DFFF) are errors: the engine matches text as UTF-8.</li>
 *   <li>{@code name =/ more} adds alternatives to {@code name} (RFC 5234 §3.3); the merged Choice's
 *       span runs from the first definition's elements to the end of the last {@code =/}.</li>
 *   <li>A group {@code (x)} becomes its content; an option {@code [x]} becomes {@code Repeat(x, 0, 1)}.</li>
 *   <li>The core rules of RFC 5234 Appendix B.1 (ALPHA, BIT, CHAR, CR, CRLF, CTL, DIGIT, DQUOTE,
 *       HEXDIG, HTAB, LF, LWSP, OCTET, SP, VCHAR, WSP) need no definition: those referenced but not
 *       defined are appended to the grammar after the file's rules (with {@link Span#NONE}). A file
 *       may redefine them. Since values are code points, {@code OCTET} (%x00-FF) means U+0000 to
 *       U+00FF, not arbitrary bytes.</li>
 *   <li>Groups and options nest at most {@value #MAX_NESTING} levels; a rule nesting deeper is
 *       reported at the offending bracket and left with an empty body. Reading that deep takes about
 *       1 MB of thread stack (the usual default); on a thread with less, the reader falls back to a
 *       limit of 64 levels and says so in the diagnostic.</li>
 * </ul>
 *
 * <h2>Diagnostic codes</h2>
 * {@code syntax} (malformed text), {@code prose-value} ({@code <...>} cannot be enforced),
 * {@code value-range} (bad num-val: digits, range order, above 10FFFF, surrogate),
 * {@code repeat-bounds} (reversed or too large repetition counts), {@code duplicate-definition}
 * (a second {@code =} for a rule; the first definition is kept), {@code incremental-undefined}
 * (warning: {@code =/} before any {@code =}; read as the definition), {@code import} (see below).
 *
 * <h2>Extension: using rules from other files</h2>
 * A line whose first non-blank text is the comment
 * <pre>;@use "rootstocks.abnf"</pre>
 * makes the rules of that file available, as if they were written after this file's rules. Since
 * the directive is an ABNF comment, the file stays valid RFC 5234 input for any other tool. The rules:
 * <ul>
 *   <li>The path is written in double quotes and is resolved relative to the importing file (by
 *       {@link #parseWithImports(Path)}, or by the caller's {@link ImportResolver}). A trailing
 *       comment may follow. Any other text after {@code ;@use} is an {@code import} error.</li>
 *   <li>Imports are transitive. Cycles are fine: each file is read once.</li>
 *   <li>The importing file's own definitions win over imported ones; among imported files, the one
 *       loaded first wins (files load breadth-first in directive order).</li>
 *   <li>A missing file is an {@code import} error at the directive; errors inside an imported file
 *       are summarised by one {@code import} error at the directive that brought the file in.</li>
 *   <li>{@link #parse(String, String)} does not follow directives (it only checks their form).</li>
 * </ul>
 */
public final class Abnf {

    /** The deepest nesting of groups and options that is read. */
    public static final int MAX_NESTING = 1000;

    private Abnf() {
    }

    /**
     * Reads one ABNF grammar. Never throws: failures of any kind become {@code syntax} diagnostics.
     *
     * @param text     the grammar text
     * @param fileName a name for the text, recorded in each {@link RuleSite#source()}
     * @return the grammar, diagnostics and rule-name occurrences
     */
    public static AbnfResult parse(String text, String fileName) {
        String name = fileName == null ? "<input>" : fileName;
        try {
            AbnfReader.FileResult f = AbnfReader.read(text == null ? "" : text, name);
            return assemble(f.rules(), f.firstRule(), f.diagnostics(), f.sites());
        } catch (Throwable e) { // a front end that never fails, even on its own bugs or a too-small stack
            return failed(e);
        }
    }

    /**
     * Reads an ABNF grammar and the files its {@code ;@use} directives name, transitively (see the
     * class documentation).
     *
     * @param text     the main grammar's text
     * @param fileName the main grammar's name, passed to {@code resolver} for its directives
     * @param resolver loads the files directives name
     * @return the merged grammar (start rule: the main file's first rule), the main file's
     *         diagnostics plus {@code import} diagnostics at its directives, and the rule sites of
     *         all files read
     */
    public static AbnfResult parseWithImports(String text, String fileName, ImportResolver resolver) {
        String name = fileName == null ? "<input>" : fileName;
        try {
            return readWithImports(text == null ? "" : text, name, resolver);
        } catch (Throwable e) {
            return failed(e);
        }
    }

    /**
     * Reads an ABNF file (UTF-8) and the files its {@code ;@use} directives name, relative to the
     * directory of the file holding each directive. Files are named by their normalised absolute path.
     *
     * @param file the main grammar file
     * @return as {@link #parseWithImports(String, String, ImportResolver)}; an unreadable main file
     *         gives an empty grammar and an {@code import} error
     */
    public static AbnfResult parseWithImports(Path file) {
        Path main = file.toAbsolutePath().normalize();
        String text;
        try {
            text = Files.readString(main, StandardCharsets.UTF_8);
        } catch (IOException | RuntimeException e) {
            return new AbnfResult(Grammar.of(List.of(), ""), List.of(new Diagnostic(AbnfReader.IMPORT, Severity.ERROR,
                    "cannot read " + main + ": " + e.getMessage(), Span.NONE)), List.of());
        }
        return parseWithImports(text, main.toString(), fileResolver());
    }

    /**
     * The resolver {@link #parseWithImports(Path)} uses: a directive's path is read (UTF-8) relative
     * to the directory of the file holding it; files are named by their normalised path.
     */
    public static ImportResolver fileResolver() {
        return (from, path) -> {
            try {
                Path p = Path.of(from).resolveSibling(path).toAbsolutePath().normalize();
                return Optional.of(new ImportResolver.Source(p.toString(), Files.readString(p, StandardCharsets.UTF_8)));
            } catch (IOException | RuntimeException e) {
                return Optional.empty();
            }
        };
    }

    private static AbnfResult readWithImports(String text, String fileName, ImportResolver resolver) {
        AbnfReader.FileResult main = AbnfReader.read(text, fileName);
        List<Diagnostic> diagnostics = new ArrayList<>(main.diagnostics());
        List<RuleSite> sites = new ArrayList<>(main.sites());
        Map<String, Rule> rules = new LinkedHashMap<>();
        for (Rule r : main.rules()) {
            rules.put(r.key(), r);
        }
        record Pending(String from, AbnfReader.UseDirective directive, Span rootSpan, String chain) { }
        Deque<Pending> queue = new ArrayDeque<>();
        for (AbnfReader.UseDirective d : main.directives()) {
            queue.add(new Pending(fileName, d, d.span(), ""));
        }
        Set<String> seen = new HashSet<>();
        seen.add(fileName);
        Map<String, Integer> errorsAtRoot = new HashMap<>();
        while (!queue.isEmpty()) {
            Pending p = queue.poll();
            Optional<ImportResolver.Source> found;
            try {
                found = resolver.resolve(p.from(), p.directive().path());
            } catch (RuntimeException e) {
                found = Optional.empty();
            }
            if (found == null || found.isEmpty()) {
                diagnostics.add(new Diagnostic(AbnfReader.IMPORT, Severity.ERROR, "cannot find \""
                        + p.directive().path() + "\"" + p.chain(), p.rootSpan()));
                continue;
            }
            ImportResolver.Source src = found.get();
            if (!seen.add(src.name())) {
                continue; // already read: a cycle or a diamond
            }
            AbnfReader.FileResult f = AbnfReader.read(src.text(), src.name());
            sites.addAll(f.sites());
            for (Rule r : f.rules()) {
                rules.putIfAbsent(r.key(), r);
            }
            List<Diagnostic> errors = f.diagnostics().stream().filter(Diagnostic::isError).toList();
            if (!errors.isEmpty() && errorsAtRoot.merge(src.name(), 1, Integer::sum) == 1) {
                Diagnostic e = errors.get(0);
                diagnostics.add(new Diagnostic(AbnfReader.IMPORT, Severity.ERROR, src.name() + " has "
                        + errors.size() + (errors.size() == 1 ? " error" : " errors") + "; the first, at line "
                        + e.span().line() + ", column " + e.span().column() + ": " + e.message() + p.chain(),
                        p.rootSpan()));
            }
            for (AbnfReader.UseDirective d : f.directives()) {
                queue.add(new Pending(src.name(), d, p.rootSpan(), " (used by " + src.name() + p.chain() + ")"));
            }
        }
        diagnostics.sort((a, b) -> Integer.compare(a.span().start(), b.span().start()));
        return assemble(new ArrayList<>(rules.values()), main.firstRule(), diagnostics, sites);
    }

    /** Appends the core rules that are referenced but not defined, and builds the result. */
    private static AbnfResult assemble(List<Rule> fileRules, String firstRule, List<Diagnostic> diagnostics,
                                       List<RuleSite> sites) {
        List<Rule> all = new ArrayList<>(fileRules);
        Set<String> defined = new HashSet<>();
        for (Rule r : fileRules) {
            defined.add(r.key());
        }
        List<String> pending = new ArrayList<>();
        for (Rule r : fileRules) {
            CoreRules.collectReferences(r.body(), pending);
        }
        Set<String> wanted = new HashSet<>();
        while (!pending.isEmpty()) {
            String key = Grammar.key(pending.remove(pending.size() - 1));
            if (defined.contains(key) || !wanted.add(key)) {
                continue;
            }
            CoreRules.get(key).ifPresent(core -> CoreRules.collectReferences(core.body(), pending));
        }
        for (Rule core : CoreRules.all()) { // the RFC's order, so results do not depend on hashing
            if (wanted.contains(core.key())) {
                all.add(core);
            }
        }
        return new AbnfResult(Grammar.of(all, firstRule == null ? "" : firstRule), diagnostics, sites);
    }

    private static AbnfResult failed(Throwable e) {
        String why = e instanceof StackOverflowError ? "the grammar is nested too deeply for the available stack"
                : "internal error while reading the grammar (" + e + ")";
        return new AbnfResult(Grammar.of(List.of(), ""),
                List.of(new Diagnostic(AbnfReader.SYNTAX, Severity.ERROR, why, new Span(0, 0, 1, 1))), List.of());
    }
}
