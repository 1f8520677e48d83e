package dev.espalier.cli;

import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code espalier vocab}: facts about a vocabulary and token lookups. */
@Command(name = "vocab", mixinStandardHelpOptions = true,
        description = "Show a vocabulary's size, special tokens and end of sequence; look tokens up by id or text.")
final class VocabCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "NAME|PATH", description = "A built-in name (r50k, p50k, cl100k, o200k) or a file.")
    String vocab;

    @Option(names = "--eos", paramLabel = "TOKEN", description = "End-of-sequence token (id or text) if the file names none.")
    String eos;

    @Option(names = "--id", paramLabel = "ID", description = "Show the token with this id (repeatable).")
    List<Integer> ids = List.of();

    @Option(names = "--find", paramLabel = "TEXT", description = "Show the ids of the token with exactly this text (repeatable).")
    List<String> texts = List.of();

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        Vocabulary v = VocabOptions.load(vocab, eos);
        int[] special = v.specialIds();
        out.println("vocabulary: " + v.name());
        out.println("ids: " + v.size() + " (" + v.tokenCount() + " tokens, " + special.length + " special)");
        int e = v.endOfSequence();
        out.println("end of sequence: " + (e < 0 ? "none (use --eos)" : e + " " + v.display(e)));
        out.println("longest token: " + v.trie().maxDepth() + " bytes");
        int shown = Math.min(special.length, 20);
        for (int i = 0; i < shown; i++) {
            out.printf("special %8d  %s%n", special[i], v.display(special[i]));
        }
        if (special.length > shown) {
            out.printf("special  ... and %d more%n", special.length - shown);
        }
        for (int id : ids) {
            if (!v.has(id)) {
                throw new UserInputException("no token with id " + id + " in " + v.name());
            }
            out.printf("id %d: %s  bytes %s%s%n", id, v.display(id), hex(v.bytes(id)), v.isSpecial(id) ? "  (special)" : "");
        }
        for (String t : texts) {
            int[] found = v.idsOf(t.getBytes(StandardCharsets.UTF_8));
            out.printf("text %s: %s%n", TokenText.jsonLiteral(t.getBytes(StandardCharsets.UTF_8)),
                    found.length == 0 ? "no token" : java.util.Arrays.toString(found));
        }
        return 0;
    }

    private static String hex(byte[] b) {
        StringBuilder sb = new StringBuilder();
        for (byte x : b) {
            sb.append(String.format("%02X ", x & 0xFF));
        }
        return sb.toString().trim();
    }
}
