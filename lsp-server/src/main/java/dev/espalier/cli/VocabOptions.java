package dev.espalier.cli;

import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.Option;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/** The {@code --vocab} and {@code --eos} options shared by the commands. */
final class VocabOptions {

    @Option(names = "--vocab", paramLabel = "NAME|PATH", defaultValue = "cl100k",
            description = "Vocabulary: a built-in name (r50k, p50k, cl100k, o200k), a tokenizer.json (plain or gzip) "
                    + "or a rank file. Default: ${DEFAULT-VALUE}.")
    String vocab;

    @Option(names = "--eos", paramLabel = "TOKEN",
            description = "End-of-sequence token (id or exact text) when the vocabulary file does not name one.")
    String eos;

    Vocabulary load() {
        return load(vocab, eos);
    }

    static Vocabulary load(String nameOrPath, String eos) {
        Vocabulary v;
        if (Vocabularies.builtinNames().contains(nameOrPath.replace("_base", ""))) {
            v = Vocabularies.builtin(nameOrPath);
        } else {
            Path p = Path.of(nameOrPath);
            if (!Files.isRegularFile(p)) {
                throw new UserInputException("no such vocabulary: '" + nameOrPath + "' is neither a built-in name "
                        + Vocabularies.builtinNames() + " nor a file");
            }
            long t0 = System.nanoTime();
            v = Vocabularies.load(p);
            Progress.done("loaded " + p.getFileName(), t0);
        }
        if (eos != null) {
            v = v.withEndOfSequence(resolve(v, eos));
        }
        return v;
    }

    private static int resolve(Vocabulary v, String token) {
        try {
            int id = Integer.parseInt(token);
            if (!v.has(id)) {
                throw new UserInputException("--eos " + token + ": no token with that id in " + v.name());
            }
            return id;
        } catch (NumberFormatException e) {
            byte[] b = token.getBytes(StandardCharsets.UTF_8);
            for (int id = 0; id < v.size(); id++) {
                if (v.has(id) && java.util.Arrays.equals(v.bytes(id), b)) {
                    return id;
                }
            }
            throw new UserInputException("--eos " + token + ": no token with that text in " + v.name());
        }
    }
}
