package dev.espalier.cli;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.RejectedInputException;
import dev.espalier.mask.TokenBits;
import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code espalier mask}: the tokens allowed after a prefix. */
@Command(name = "mask", mixinStandardHelpOptions = true,
        description = "Print how many tokens are allowed after a prefix, then the tokens (or only their ids).")
final class MaskCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    ConstraintOptions constraint;

    @Mixin
    VocabOptions vocab;

    static final class Prefix {
        @Option(names = "--text", paramLabel = "PREFIX", description = "The output so far (default: empty).")
        String text;

        @Option(names = "--text-file", paramLabel = "FILE", description = "Read the output so far from a file (exact bytes).")
        Path file;
    }

    @ArgGroup(exclusive = true)
    Prefix prefix;

    @Option(names = "--ids", description = "Print only the allowed ids, ascending, one per line.")
    boolean idsOnly;

    @Option(names = "--limit", paramLabel = "N", defaultValue = "50", description = "Most tokens to list. Default: ${DEFAULT-VALUE}.")
    int limit;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        byte[] bytes = new byte[0];
        if (prefix != null && prefix.text != null) {
            bytes = prefix.text.getBytes(StandardCharsets.UTF_8);
        } else if (prefix != null && prefix.file != null) {
            bytes = Files.readAllBytes(prefix.file);
        }
        Vocabulary v = vocab.load();
        Constraint c = constraint.compile(v, err);
        Cursor cursor = c.start();
        try {
            cursor.feedBytes(bytes);
        } catch (RejectedInputException e) {
            err.println("espalier: the prefix cannot be completed: " + e.getMessage());
            err.flush();
            return Main.EXIT_REJECTED;
        }
        if (idsOnly) {
            long[] mask = new long[v.maskWords()];
            cursor.fillMask(mask);
            StringBuilder sb = new StringBuilder();
            for (int id : TokenBits.ids(mask)) {
                sb.append(id).append('\n');
            }
            out.print(sb);
            return 0;
        }
        out.println(constraint.label());
        out.println("vocabulary: " + v.name() + " (" + v.tokenCount() + " tokens)");
        out.println("prefix: " + TokenText.escape(bytes) + " (" + bytes.length + " bytes)");
        Listing.print(out, cursor, limit);
        return 0;
    }
}
