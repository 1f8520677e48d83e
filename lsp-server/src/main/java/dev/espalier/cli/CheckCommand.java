package dev.espalier.cli;

import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.Diagnostic;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code espalier check}: diagnostics of grammar files. */
@Command(name = "check", mixinStandardHelpOptions = true,
        description = "Check ABNF grammar files: print every finding as file:line:col: severity: message [code]. "
                + "Exit 1 if any error.")
final class CheckCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(arity = "1..*", paramLabel = "FILE", description = "ABNF files.")
    List<String> files;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        int errors = 0;
        int others = 0;
        for (String f : files) {
            AbnfResult r = GrammarFiles.check(f);
            GrammarFiles.print(out, f, r, false);
            for (Diagnostic d : r.diagnostics()) {
                if (d.isError()) {
                    errors++;
                } else {
                    others++;
                }
            }
        }
        err.printf("espalier: %d file%s checked: %d error%s, %d other finding%s%n", files.size(),
                files.size() == 1 ? "" : "s", errors, errors == 1 ? "" : "s", others, others == 1 ? "" : "s");
        err.flush();
        return errors > 0 ? 1 : 0;
    }
}
