package dev.espalier.cli;

import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Grammar;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;

/** Reads ABNF grammar files for the commands, reporting problems in the command line's format. */
final class GrammarFiles {

    private GrammarFiles() {
    }

    /** Checks a file (imports followed); never throws for bad grammar text. */
    static AbnfResult check(String file) {
        Path p = Path.of(file);
        if (!Files.isRegularFile(p)) {
            throw new UserInputException("no such grammar file: " + file);
        }
        return AbnfCheck.checkFile(p);
    }

    /** Prints diagnostics as {@code file:line:col: severity: message [code]}. */
    static void print(PrintWriter out, String file, AbnfResult r, boolean errorsOnly) {
        for (Diagnostic d : r.diagnostics()) {
            if (!errorsOnly || d.isError()) {
                out.println(d.format(file));
            }
        }
        out.flush();
    }

    /**
     * A usable grammar from a file: errors are printed to {@code err} and end the command (exit 2).
     *
     * @param start the start rule, or null for the file's first rule
     */
    static Grammar load(String file, String start, PrintWriter err) {
        AbnfResult r = check(file);
        if (r.hasErrors()) {
            print(err, file, r, true);
            throw new UserInputException(file + " has errors; `espalier check " + file + "` lists every finding");
        }
        Grammar g = r.grammar();
        if (start != null) {
            if (g.rule(start).isEmpty()) {
                throw new UserInputException("--start " + start + ": no rule of that name in " + file);
            }
            g = g.withStart(g.rule(start).get().name());
        }
        return g;
    }
}
