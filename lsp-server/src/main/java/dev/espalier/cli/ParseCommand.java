package dev.espalier.cli;

import dev.espalier.earley.EarleyGrammar;
import dev.espalier.earley.ParseForest;
import dev.espalier.grammar.Samples;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code espalier parse}: the parse tree of an input. */
@Command(name = "parse", mixinStandardHelpOptions = true,
        description = "Print the parse tree of an input file (indented text, or JSON with --json). One final "
                + "line break of the file is not part of the input unless --exact is given.")
final class ParseCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "GRAMMAR", description = "An ABNF file.")
    String grammar;

    @Parameters(index = "1", paramLabel = "FILE", description = "The input.")
    Path input;

    @Option(names = "--start", paramLabel = "RULE", description = "Start rule (default: the file's first rule).")
    String start;

    @Option(names = "--json", description = "Print the tree as JSON.")
    boolean json;

    @Option(names = "--exact", description = "Parse the file's bytes exactly, final line break included.")
    boolean exact;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        EarleyGrammar g = EarleyGrammar.compile(GrammarFiles.load(grammar, start, err));
        if (!Files.isRegularFile(input)) {
            throw new UserInputException("no such file: " + input);
        }
        byte[] bytes = Files.readAllBytes(input);
        SampleRun run = SampleRun.of(g, exact ? bytes : Samples.text(bytes));
        if (!run.accepted()) {
            err.println("espalier: " + input + ": " + run.message());
            err.flush();
            return 1;
        }
        ParseForest forest = run.chart().forest();
        out.print(json ? forest.tree().toJson() + "\n" : forest.tree().toText());
        if (forest.isAmbiguous()) {
            err.println("espalier: the input is ambiguous: "
                    + (forest.hasInfinitelyManyParses() ? "infinitely many" : forest.parseCount()) + " parses; one is shown");
            err.flush();
        }
        return 0;
    }
}
