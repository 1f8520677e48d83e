package dev.espalier.cli;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.util.Random;
import java.util.concurrent.Callable;

/** {@code espalier demo}: the main job on a built-in default. */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Constrain output to a nursery tag line (a built-in regular expression) on a built-in "
                + "vocabulary: show the allowed tokens at a few points and some constrained samples.")
final class DemoCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    VocabOptions vocab;

    @Option(names = "--seed", paramLabel = "S", defaultValue = "7", description = "Random seed for the samples. Default: ${DEFAULT-VALUE}.")
    long seed;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        Vocabulary v = vocab.load();
        out.println("Espalier demo: every output must be a nursery tag line matching");
        out.println("  " + Orchard.TAG_PATTERN);
        out.println("vocabulary: " + v.name() + " (" + v.tokenCount() + " tokens)");
        long t0 = System.nanoTime();
        v.trie();
        long t1 = System.nanoTime();
        Constraint c = Constraint.regex(Orchard.TAG_PATTERN, v);
        long t2 = System.nanoTime();
        out.printf("compiled to %s in %.1f ms (vocabulary trie built once in %.0f ms)%n%n",
                c.describe(), (t2 - t1) / 1e6, (t1 - t0) / 1e6);
        for (String prefix : new String[] {"", "Row 07, tree 12: ", "Row 07, tree 12: Russet Vale on RS-9, grafted 2024-0"}) {
            Cursor cursor = c.start();
            cursor.feedText(prefix);
            out.println("after " + TokenText.jsonLiteral(prefix.getBytes(java.nio.charset.StandardCharsets.UTF_8)) + ":");
            Listing.print(out, cursor, 8);
            out.println();
        }
        out.println("five outputs sampled token by token under the mask (uniform choice, seed " + seed + "):");
        Random rnd = new Random(seed);
        for (int i = 0; i < 5; i++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 256);
            out.printf("  %s  (%d tokens%s)%n", TokenText.jsonLiteral(s.bytes()), s.tokens().length,
                    s.complete() ? "" : ", incomplete");
        }
        return 0;
    }
}
