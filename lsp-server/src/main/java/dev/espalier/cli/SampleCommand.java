package dev.espalier.cli;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.vocab.TokenText;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.util.Random;
import java.util.concurrent.Callable;

/** {@code espalier sample}: random outputs generated token by token under the mask. */
@Command(name = "sample", mixinStandardHelpOptions = true,
        description = "Generate random outputs token by token under the mask (a uniform choice among the allowed "
                + "tokens), one per line as JSON string literals.")
final class SampleCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    ConstraintOptions constraint;

    @Mixin
    VocabOptions vocab;

    @Option(names = "-n", paramLabel = "N", defaultValue = "5", description = "Number of outputs. Default: ${DEFAULT-VALUE}.")
    int count;

    @Option(names = "--seed", paramLabel = "S", description = "Random seed (default: a new one each run).")
    Long seed;

    @Option(names = "--max-tokens", paramLabel = "N", defaultValue = "256",
            description = "Stop an output after this many tokens. Default: ${DEFAULT-VALUE}.")
    int maxTokens;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Constraint c = constraint.compile(vocab.load(), err);
        Random rnd = seed == null ? new Random() : new Random(seed);
        for (int i = 0; i < count; i++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, maxTokens);
            out.println(TokenText.jsonLiteral(s.bytes()));
            if (!s.complete()) {
                out.flush();
                err.println("espalier: output " + (i + 1) + " stopped at " + maxTokens + " tokens before it was complete");
                err.flush();
            }
        }
        return 0;
    }
}
