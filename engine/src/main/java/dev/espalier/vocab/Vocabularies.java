package dev.espalier.vocab;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Loads vocabularies: Hugging Face {@code tokenizer.json} files, rank files ({@code base64 rank}
 * per line) and the built-in encodings that ship with jtokkit. The entry point of this package.
 *
 * <p><b>Token bytes.</b> The mask engine works on the raw byte stream a model produces, so every
 * token is read as the exact bytes it contributes:
 * <ul>
 *   <li>byte-level BPE (a {@code ByteLevel} pre-tokenizer or decoder): each character of a token
 *       stands for one byte through the GPT-2 byte alphabet ({@code Ġ} = space, {@code Ċ} =
 *       newline, ...);</li>
 *   <li>SentencePiece-style BPE (a decoder replacing {@code ▁} by a space, a {@code ByteFallback}
 *       or {@code Metaspace} step, or {@code model.byte_fallback}): a token's UTF-8 with every
 *       {@code ▁} read as a space, and {@code <0xNN>} as the single byte NN. A tokenizer's decoder
 *       may strip the space at the very start of a text; token bytes here always keep it, as the
 *       model's byte stream does;</li>
 *   <li>otherwise the UTF-8 of the token string.</li>
 * </ul>
 * Entries of {@code added_tokens} decode to the UTF-8 of their {@code content}; those marked
 * {@code special} become special tokens, the others are ordinary tokens.
 *
 * <p>Errors in a file raise {@link VocabularyFormatException} with the file name and a line number
 * or JSON path; failures to read raise {@link UncheckedIOException}.
 */
public final class Vocabularies {

    /** Built-in encoding names, in the order of {@link #builtinNames()}. */
    private static final List<String> BUILTIN = List.of("r50k", "p50k", "cl100k", "o200k");

    private Vocabularies() {
    }

    /**
     * Loads a vocabulary file, detecting its kind: a {@code tokenizer.json} (plain, or gzip by its
     * magic bytes) when its content is a JSON object, otherwise a rank file. For a tokenizer.json,
     * the end-of-sequence token is taken from the {@code eos_token} of a configuration file beside
     * it: for {@code NAME-tokenizer.json(.gz)} first {@code NAME-tokenizer_config.json}, then
     * {@code tokenizer_config.json} in the same folder. Without one, and for rank files, the
     * vocabulary has no end-of-sequence token (see {@link Vocabulary#withEndOfSequence(int)}).
     *
     * @param path the file
     * @return the vocabulary, named after the file
     * @throws VocabularyFormatException if the file (or its configuration) is malformed
     * @throws UncheckedIOException      if a file cannot be read
     */
    public static Vocabulary load(Path path) {
        String name = path.getFileName() == null ? path.toString() : path.getFileName().toString();
        try (InputStream raw = Files.newInputStream(path)) {
            BufferedInputStream in;
            boolean json;
            try {
                in = Inputs.gunzipIfNeeded(raw);
                json = Inputs.looksLikeJsonObject(in);
            } catch (IOException e) {
                throw TokenizerJsonReader.ioError(name, e);
            }
            if (!json) {
                return fromRankFile(in, name, Map.of(), null);
            }
            Path config = configBeside(path);
            if (config == null) {
                return TokenizerJsonReader.read(in, name, null, null);
            }
            try (InputStream c = Files.newInputStream(config)) {
                return TokenizerJsonReader.read(in, name, c, config.getFileName().toString());
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + path + ": " + e.getMessage(), e);
        }
    }

    /** The tokenizer_config.json that belongs to a tokenizer.json, or {@code null}. */
    private static Path configBeside(Path path) {
        Path dir = path.toAbsolutePath().getParent();
        if (dir == null) {
            return null;
        }
        String file = path.getFileName().toString();
        List<Path> candidates = new ArrayList<>();
        int at = file.lastIndexOf("tokenizer.json");
        if (at > 0) {
            candidates.add(dir.resolve(file.substring(0, at) + "tokenizer_config.json"));
        }
        candidates.add(dir.resolve("tokenizer_config.json"));
        for (Path c : candidates) {
            if (Files.isRegularFile(c)) {
                return c;
            }
        }
        return null;
    }

    /**
     * Reads a Hugging Face {@code tokenizer.json} (plain or gzip) from a stream.
     *
     * @param json          the tokenizer.json content; read to its end, not closed
     * @param name          the file name for messages and {@link Vocabulary#name()}
     * @param configOrNull  a {@code tokenizer_config.json} whose {@code eos_token} (a string, or an
     *                      object with {@code content}) names the end-of-sequence token; or
     *                      {@code null} for a vocabulary without one; read to its end, not closed.
     *                      Messages about it call it {@code tokenizer_config.json}
     * @return the vocabulary
     * @throws VocabularyFormatException if either file is malformed, or the end-of-sequence token is
     *                                   not in the vocabulary
     * @throws UncheckedIOException      if a stream cannot be read
     */
    public static Vocabulary fromTokenizerJson(InputStream json, String name, InputStream configOrNull) {
        BufferedInputStream in;
        try {
            in = Inputs.gunzipIfNeeded(json);
        } catch (IOException e) {
            throw TokenizerJsonReader.ioError(name, e);
        }
        return TokenizerJsonReader.read(in, name, configOrNull, "tokenizer_config.json");
    }

    /**
     * Reads a rank file (plain or gzip): one {@code base64 rank} pair per line, the rank being the
     * token id; blank lines are ignored. The id space runs to the largest id + 1; ids named by no
     * line are unused.
     *
     * @param in                  the content; read to its end, not closed
     * @param name                the file name for messages and {@link Vocabulary#name()}
     * @param specialTokens       special tokens (text to id) to add; their text becomes their
     *                            display bytes. An id may not collide with a rank of other bytes.
     * @param endOfSequenceOrNull the text of the end-of-sequence token, one of
     *                            {@code specialTokens}' keys; or {@code null} for none
     * @return the vocabulary
     * @throws VocabularyFormatException if a line is malformed or two lines give one rank different
     *                                   bytes
     * @throws IllegalArgumentException  if a special token id is negative or the end-of-sequence
     *                                   text is not a special token
     * @throws UncheckedIOException      if the stream cannot be read
     */
    public static Vocabulary fromRankFile(InputStream in, String name, Map<String, Integer> specialTokens,
                                          String endOfSequenceOrNull) {
        byte[] data;
        try {
            data = Inputs.gunzipIfNeeded(in).readAllBytes();
        } catch (IOException e) {
            throw TokenizerJsonReader.ioError(name, e);
        }
        return RankFileReader.read(data, name, specialTokens, endOfSequenceOrNull);
    }

    /**
     * A built-in encoding, read from the rank files that the jtokkit jar
     * ({@code com.knuddels:jtokkit}) carries as class path resources; jtokkit must be on the class
     * path at run time, nothing else of it is used. Each comes with its special tokens, and
     * {@code <|endoftext|>} as end of sequence.
     *
     * @param name {@code r50k}, {@code p50k}, {@code cl100k} or {@code o200k}, optionally with the
     *             suffix {@code _base}
     * @return the vocabulary, named by the short name (e.g. {@code cl100k})
     * @throws IllegalArgumentException if the name is unknown
     * @throws IllegalStateException    if the resource is not on the class path
     */
    public static Vocabulary builtin(String name) {
        String shortName = name.endsWith("_base") ? name.substring(0, name.length() - 5) : name;
        if (!BUILTIN.contains(shortName)) {
            throw new IllegalArgumentException("unknown built-in vocabulary '" + name + "'; known: "
                    + String.join(", ", BUILTIN));
        }
        String resource = "com/knuddels/jtokkit/" + shortName + "_base.tiktoken";
        InputStream in = null;
        ClassLoader own = Vocabularies.class.getClassLoader();
        if (own != null) {
            in = own.getResourceAsStream(resource);
        }
        if (in == null && Thread.currentThread().getContextClassLoader() != null) {
            in = Thread.currentThread().getContextClassLoader().getResourceAsStream(resource);
        }
        if (in == null) {
            throw new IllegalStateException("built-in vocabulary '" + shortName + "' not found: the built-in"
                    + " vocabularies need com.knuddels:jtokkit on the class path (resource " + resource + ")");
        }
        try (InputStream r = in) {
            Vocabulary v = fromRankFile(r, shortName + "_base.tiktoken", specialTokens(shortName), "<|endoftext|>");
            return v.renamed(shortName);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read resource " + resource, e);
        }
    }

    /**
     * Special tokens of the built-in encodings. The ids are written from memory; the tests
     * (BuiltinVocabularyTest) compare them with what jtokkit itself reports. p50k_base has only
     * {@code <|endoftext|>}: the fill-in-the-middle tokens 50281-50283 belong to p50k_edit.
     */
    private static Map<String, Integer> specialTokens(String shortName) {
        Map<String, Integer> m = new LinkedHashMap<>();
        switch (shortName) {
            case "r50k", "p50k" -> m.put("<|endoftext|>", 50256);
            case "cl100k" -> {
                m.put("<|endoftext|>", 100257);
                m.put("<|fim_prefix|>", 100258);
                m.put("<|fim_middle|>", 100259);
                m.put("<|fim_suffix|>", 100260);
                m.put("<|endofprompt|>", 100276);
            }
            case "o200k" -> {
                m.put("<|endoftext|>", 199999);
                m.put("<|endofprompt|>", 200018);
            }
            default -> throw new IllegalArgumentException(shortName);
        }
        return m;
    }

    /** Names accepted by {@link #builtin(String)} (without the {@code _base} suffix). */
    public static List<String> builtinNames() {
        return BUILTIN;
    }
}
