package dev.espalier.cli;

import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.GrammarAnalysis;
import dev.espalier.vocab.TokenText;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.Callable;

/** {@code espalier examples}: random strings derived from a grammar. */
@Command(name = "examples", mixinStandardHelpOptions = true,
        description = "Print random strings derived from a grammar (bounded depth, no vocabulary involved), "
                + "one per line as JSON string literals.")
final class ExamplesCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FILE", description = "An ABNF file.")
    String file;

    @Option(names = "-n", paramLabel = "N", defaultValue = "10", description = "Number of strings. Default: ${DEFAULT-VALUE}.")
    int count;

    @Option(names = "--seed", paramLabel = "S", defaultValue = "1", description = "Random seed. Default: ${DEFAULT-VALUE}.")
    long seed;

    @Option(names = "--start", paramLabel = "RULE", description = "Start rule (default: the file's first rule).")
    String start;

    @Option(names = "--depth", paramLabel = "D", defaultValue = "12",
            description = "Nesting depth beyond which the shortest derivations are taken. Default: ${DEFAULT-VALUE}.")
    int depth;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        Grammar g = GrammarFiles.load(file, start, spec.commandLine().getErr());
        for (String s : GrammarAnalysis.randomExamples(g, count, seed, depth)) {
            out.println(TokenText.jsonLiteral(s.getBytes(StandardCharsets.UTF_8)));
        }
        return 0;
    }
}
