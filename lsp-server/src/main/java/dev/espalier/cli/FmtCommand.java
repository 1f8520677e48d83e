package dev.espalier.cli;

import dev.espalier.abnf.AbnfPrinter;
import dev.espalier.grammar.Diagnostic;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code espalier fmt}: the canonical layout of an ABNF file. */
@Command(name = "fmt", mixinStandardHelpOptions = true,
        description = "Print an ABNF file in the canonical layout (aligned =, wrapped alternatives, comments kept).")
final class FmtCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FILE", description = "An ABNF file.")
    Path file;

    @Option(names = "--write", description = "Rewrite the file in place instead of printing it.")
    boolean write;

    @Option(names = "--check", description = "Print nothing; exit 1 if the file is not in the canonical layout.")
    boolean check;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (!Files.isRegularFile(file)) {
            throw new UserInputException("no such grammar file: " + file);
        }
        String text = Files.readString(file, StandardCharsets.UTF_8);
        AbnfPrinter.Formatted f = AbnfPrinter.layout(text, file.toString());
        if (!f.applied()) {
            for (Diagnostic d : f.diagnostics()) {
                if (d.isError()) {
                    err.println(d.format(file.toString()));
                }
            }
            err.println("espalier: " + file + " has syntax errors; left as it is");
            err.flush();
            return 1;
        }
        if (check) {
            return f.text().equals(text) ? 0 : 1;
        }
        if (write) {
            if (!f.text().equals(text)) {
                Files.writeString(file, f.text(), StandardCharsets.UTF_8);
            }
            return 0;
        }
        out.print(f.text());
        return 0;
    }
}
