package dev.espalier.vocab;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonStreamContext;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.Deque;
import java.util.HashMap;
import java.util.Iterator;
import java.util.Map;
import java.util.zip.ZipException;

/**
 * Reads Hugging Face {@code tokenizer.json} files with Jackson's streaming API (the merge list, the
 * bulk of the file, is skipped without building objects).
 */
final class TokenizerJsonReader {

    /** How token strings of {@code model.vocab} turn into bytes. */
    enum Style {
        /** The GPT-2 byte alphabet: every character stands for one byte. */
        BYTE_LEVEL,
        /** {@code ▁} for space and {@code <0xNN>} byte-fallback tokens. */
        SENTENCE_PIECE,
        /** The token string's UTF-8 as is. */
        PLAIN
    }

    private static final JsonFactory FACTORY = JsonFactory.builder()
            .disable(JsonFactory.Feature.CANONICALIZE_FIELD_NAMES)
            .disable(JsonFactory.Feature.INTERN_FIELD_NAMES)
            .build();
    private static final ObjectMapper MAPPER = new ObjectMapper(FACTORY);

    private final String name;
    private String[] keys = new String[1024];
    private int[] ids = new int[1024];
    private int count;
    private boolean vocabSeen;
    private boolean modelSeen;
    private boolean byteFallback;
    private JsonNode preTokenizer;
    private JsonNode decoder;
    private JsonNode addedTokens;

    private TokenizerJsonReader(String name) {
        this.name = name;
    }

    static Vocabulary read(InputStream json, String name, InputStream config, String configName) {
        TokenizerJsonReader r = new TokenizerJsonReader(name);
        r.parse(json);
        return r.build(config, configName);
    }

    // ---------------------------------------------------------------- parsing

    private void parse(InputStream in) {
        JsonParser p = null;
        try {
            p = FACTORY.createParser(in);
            p.setCodec(MAPPER);
            JsonToken t = p.nextToken();
            if (t != JsonToken.START_OBJECT) {
                throw new VocabularyFormatException(name, "$",
                        t == null ? "the file is empty" : "a tokenizer.json file must hold a JSON object");
            }
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String field = p.currentName();
                JsonToken v = p.nextToken();
                switch (field) {
                    case "model" -> readModel(p, v);
                    case "added_tokens" -> addedTokens = p.readValueAsTree();
                    case "pre_tokenizer" -> preTokenizer = p.readValueAsTree();
                    case "decoder" -> decoder = p.readValueAsTree();
                    default -> p.skipChildren();
                }
            }
            if (p.nextToken() != null) {
                throw new VocabularyFormatException(name, "$", "unexpected content after the top-level object");
            }
        } catch (JsonProcessingException e) {
            throw jsonError(name, p, e);
        } catch (IOException e) {
            throw ioError(name, e);
        }
    }

    private void readModel(JsonParser p, JsonToken t) throws IOException {
        if (t != JsonToken.START_OBJECT) {
            throw new VocabularyFormatException(name, "$.model", "expected an object, found " + describe(t));
        }
        modelSeen = true;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String field = p.currentName();
            JsonToken v = p.nextToken();
            switch (field) {
                case "vocab" -> readVocab(p, v);
                case "byte_fallback" -> byteFallback = v == JsonToken.VALUE_TRUE;
                default -> p.skipChildren();
            }
        }
    }

    private void readVocab(JsonParser p, JsonToken t) throws IOException {
        vocabSeen = true;
        if (t == JsonToken.START_OBJECT) {
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String key = p.currentName();
                JsonToken v = p.nextToken();
                int id = readId(p, v, vocabPath(key));
                add(key, id);
            }
        } else if (t == JsonToken.START_ARRAY) {
            // Unigram models: [[piece, score], ...], the id being the position.
            int index = 0;
            while (p.nextToken() != JsonToken.END_ARRAY) {
                String path = "$.model.vocab[" + index + "]";
                if (p.currentToken() != JsonToken.START_ARRAY || p.nextToken() != JsonToken.VALUE_STRING) {
                    throw new VocabularyFormatException(name, path, "expected [piece, score]");
                }
                String key = p.getText();
                while (p.nextToken() != JsonToken.END_ARRAY) {
                    p.skipChildren();
                }
                if (index >= TokenTable.MAX_IDS) {
                    throw new VocabularyFormatException(name, path,
                            "more than " + TokenTable.MAX_IDS + " tokens");
                }
                add(key, index++);
            }
        } else {
            throw new VocabularyFormatException(name, "$.model.vocab",
                    "expected an object from token to id, found " + describe(t));
        }
    }

    private int readId(JsonParser p, JsonToken v, String path) throws IOException {
        if (v != JsonToken.VALUE_NUMBER_INT) {
            throw new VocabularyFormatException(name, path, "id must be an integer, found " + describe(v));
        }
        if (p.getNumberType() != JsonParser.NumberType.INT) {
            throw new VocabularyFormatException(name, path, "id " + TokenTable.snippet(p.getText()) + " is out of range");
        }
        return checkId(p.getIntValue(), path);
    }

    private int checkId(int id, String path) {
        if (id < 0) {
            throw new VocabularyFormatException(name, path, "id is negative: " + id);
        }
        if (id >= TokenTable.MAX_IDS) {
            throw new VocabularyFormatException(name, path, "id " + id + " exceeds the limit of "
                    + TokenTable.MAX_IDS + " ids");
        }
        return id;
    }

    private void add(String key, int id) {
        if (count == keys.length) {
            keys = Arrays.copyOf(keys, count * 2);
            ids = Arrays.copyOf(ids, count * 2);
        }
        keys[count] = key;
        ids[count++] = id;
    }

    // ---------------------------------------------------------------- building

    private Vocabulary build(InputStream config, String configName) {
        if (!modelSeen) {
            throw new VocabularyFormatException(name, "$.model", "missing: a tokenizer.json file needs a model");
        }
        if (!vocabSeen) {
            throw new VocabularyFormatException(name, "$.model.vocab",
                    "missing: the model has no token table");
        }
        Style style = style();
        TokenTable table = new TokenTable();
        int[] bad = new int[1];
        for (int i = 0; i < count; i++) {
            String key = keys[i];
            byte[] b = decode(key, style, bad);
            if (b == null) {
                char c = key.charAt(bad[0]);
                throw new VocabularyFormatException(name, vocabPath(key), String.format(
                        "character '%s' (U+%04X) at index %d is not in the byte-level alphabet",
                        TokenTable.snippet(String.valueOf(c)), (int) c, bad[0]));
            }
            if (table.put(ids[i], b, key) == TokenTable.Put.CONFLICT) {
                throw new VocabularyFormatException(name, vocabPath(key), "id " + ids[i]
                        + " is already used by " + quote(table.origin(ids[i])) + " with different bytes");
            }
        }

        Map<String, Integer> addedByContent = new HashMap<>();
        int[] specialIds = new int[0];
        int specials = 0;
        if (addedTokens != null && !addedTokens.isNull()) {
            if (!addedTokens.isArray()) {
                throw new VocabularyFormatException(name, "$.added_tokens", "expected an array");
            }
            specialIds = new int[addedTokens.size()];
            Map<Integer, String> addedById = new HashMap<>();
            for (int i = 0; i < addedTokens.size(); i++) {
                String path = "$.added_tokens[" + i + "]";
                JsonNode a = addedTokens.get(i);
                if (!a.isObject()) {
                    throw new VocabularyFormatException(name, path, "expected an object");
                }
                JsonNode idNode = a.get("id");
                if (idNode == null || !idNode.isIntegralNumber() || !idNode.canConvertToInt()) {
                    throw new VocabularyFormatException(name, path + ".id", "missing or not an integer id");
                }
                int id = checkId(idNode.intValue(), path + ".id");
                JsonNode contentNode = a.get("content");
                if (contentNode == null || !contentNode.isTextual()) {
                    throw new VocabularyFormatException(name, path + ".content", "missing or not a string");
                }
                String content = contentNode.textValue();
                String previous = addedById.putIfAbsent(id, content);
                if (previous != null && !previous.equals(content)) {
                    throw new VocabularyFormatException(name, path + ".id", "id " + id
                            + " is already used by added token " + quote(previous));
                }
                JsonNode sp = a.get("special");
                if (sp != null && !sp.isBoolean() && !sp.isNull()) {
                    throw new VocabularyFormatException(name, path + ".special", "expected true or false");
                }
                // An added token decodes to its content, whatever model.vocab says for the id.
                table.replace(id, content.getBytes(StandardCharsets.UTF_8), content);
                if (sp != null && sp.booleanValue()) {
                    specialIds[specials++] = id;
                }
                addedByContent.putIfAbsent(content, id);
            }
        }
        if (table.size() == 0) {
            throw new VocabularyFormatException(name, "$.model.vocab", "the vocabulary has no tokens");
        }
        int eos = config == null ? -1 : endOfSequence(config, configName, addedByContent);
        return Vocabulary.of(name, table.toArray(), Arrays.copyOf(specialIds, specials), eos);
    }

    private byte[] decode(String key, Style style, int[] bad) {
        switch (style) {
            case BYTE_LEVEL:
                return ByteLevelAlphabet.decode(key, bad);
            case SENTENCE_PIECE:
                int fallback = byteFallback(key);
                if (fallback >= 0) {
                    return new byte[] {(byte) fallback};
                }
                return key.replace('\u2581', ' ').getBytes(StandardCharsets.UTF_8);
            default:
                return key.getBytes(StandardCharsets.UTF_8);
        }
    }

    /** The byte of a {@code <0xNN>} token, or -1. */
    private static int byteFallback(String key) {
        if (key.length() != 6 || !key.startsWith("<0x") || key.charAt(5) != '>') {
            return -1;
        }
        int hi = Character.digit(key.charAt(3), 16);
        int lo = Character.digit(key.charAt(4), 16);
        return hi < 0 || lo < 0 ? -1 : hi * 16 + lo;
    }

    /**
     * The decoding style, from the pre-tokenizer, decoder and model: a {@code ByteLevel} step
     * anywhere in the pre-tokenizer or decoder means the byte alphabet; a decoder that replaces
     * {@code ▁} by a space, a {@code ByteFallback} or {@code Metaspace} step, or
     * {@code model.byte_fallback} means SentencePiece-style pieces.
     */
    private Style style() {
        if (hasStep(decoder, "ByteLevel") || hasStep(preTokenizer, "ByteLevel")) {
            return Style.BYTE_LEVEL;
        }
        if (byteFallback || hasStep(decoder, "ByteFallback") || hasStep(decoder, "Metaspace")
                || hasStep(preTokenizer, "Metaspace") || hasSpaceReplace(decoder)) {
            return Style.SENTENCE_PIECE;
        }
        return Style.PLAIN;
    }

    private static boolean hasStep(JsonNode root, String type) {
        return find(root, n -> type.equals(n.path("type").asText(null)));
    }

    private static boolean hasSpaceReplace(JsonNode root) {
        return find(root, n -> "Replace".equals(n.path("type").asText(null))
                && "\u2581".equals(n.path("pattern").path("String").asText(null)));
    }

    /** Whether any object nested in {@code root} passes {@code test}; an explicit stack, no recursion. */
    private static boolean find(JsonNode root, java.util.function.Predicate<JsonNode> test) {
        if (root == null) {
            return false;
        }
        Deque<JsonNode> stack = new ArrayDeque<>();
        stack.push(root);
        while (!stack.isEmpty()) {
            JsonNode n = stack.pop();
            if (n.isObject() && test.test(n)) {
                return true;
            }
            if (n.isContainerNode()) {
                for (Iterator<JsonNode> it = n.elements(); it.hasNext(); ) {
                    stack.push(it.next());
                }
            }
        }
        return false;
    }

    private int endOfSequence(InputStream config, String configName, Map<String, Integer> addedByContent) {
        JsonNode root;
        try {
            root = MAPPER.readTree(Inputs.gunzipIfNeeded(config));
        } catch (JsonProcessingException e) {
            throw jsonError(configName, null, e);
        } catch (IOException e) {
            throw ioError(configName, e);
        }
        if (root == null || !root.isObject()) {
            throw new VocabularyFormatException(configName, "$", "a tokenizer_config.json file must hold a JSON object");
        }
        JsonNode eos = root.get("eos_token");
        String path = "$.eos_token";
        if (eos != null && eos.isObject()) {
            eos = eos.get("content");
            path += ".content";
        }
        if (eos == null || eos.isNull()) {
            return -1;
        }
        if (!eos.isTextual()) {
            throw new VocabularyFormatException(configName, path, "expected a string");
        }
        String text = eos.textValue();
        Integer id = addedByContent.get(text);
        if (id != null) {
            return id;
        }
        for (int i = 0; i < count; i++) {
            if (keys[i].equals(text)) {
                return ids[i];
            }
        }
        throw new VocabularyFormatException(configName, path,
                "end-of-sequence token " + quote(text) + " is not in " + name);
    }

    // ---------------------------------------------------------------- messages

    private static String vocabPath(String key) {
        return "$.model.vocab[" + quote(key) + "]";
    }

    private static String quote(String s) {
        return TokenText.jsonLiteral(TokenTable.snippet(s).getBytes(StandardCharsets.UTF_8));
    }

    private static String describe(JsonToken t) {
        if (t == null) {
            return "the end of the file";
        }
        return switch (t) {
            case START_OBJECT -> "an object";
            case START_ARRAY -> "an array";
            case VALUE_STRING -> "a string";
            case VALUE_NUMBER_INT, VALUE_NUMBER_FLOAT -> "a number";
            case VALUE_TRUE, VALUE_FALSE -> "a boolean";
            case VALUE_NULL -> "null";
            default -> t.toString();
        };
    }

    /** A JSON path like {@code $.model.vocab["abc"]} for the parser's position. */
    static String path(JsonStreamContext ctx) {
        Deque<JsonStreamContext> chain = new ArrayDeque<>();
        for (JsonStreamContext c = ctx; c != null && !c.inRoot(); c = c.getParent()) {
            chain.push(c);
        }
        StringBuilder sb = new StringBuilder("$");
        for (JsonStreamContext c : chain) {
            if (c.inArray()) {
                sb.append('[').append(Math.max(0, c.getCurrentIndex())).append(']');
            } else if (c.inObject() && c.getCurrentName() != null) {
                String n = c.getCurrentName();
                boolean plain = n.matches("[A-Za-z_][A-Za-z0-9_]*") && !sb.toString().equals("$.model.vocab");
                sb.append(plain ? "." + n : "[" + quote(n) + "]");
            }
        }
        return sb.toString();
    }

    static VocabularyFormatException jsonError(String source, JsonParser p, JsonProcessingException e) {
        String where = p == null ? "$" : path(p.getParsingContext());
        var loc = e.getLocation();
        String at = loc == null ? "" : " (line " + loc.getLineNr() + ", column " + loc.getColumnNr() + ")";
        String what = e.getOriginalMessage();
        if (what != null) {
            int nl = what.indexOf('\n');
            what = nl >= 0 ? what.substring(0, nl) : what;
        }
        return new VocabularyFormatException(source, where, "not valid JSON" + at + ": " + what, e);
    }

    static RuntimeException ioError(String source, IOException e) {
        if (e instanceof EOFException || e instanceof ZipException) {
            return new VocabularyFormatException(source, null, "truncated or corrupt gzip data: " + e.getMessage(), e);
        }
        return new UncheckedIOException("cannot read " + source + ": " + e.getMessage(), e);
    }
}
