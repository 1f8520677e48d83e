package dev.espalier.vocab;

import java.util.Arrays;
import java.util.Objects;

/**
 * A model's vocabulary: token id to byte string, plus which ids are special (end of sequence and
 * other control tokens). Special tokens never appear in ordinary masks; the end-of-sequence token is
 * allowed exactly when the text so far is complete.
 *
 * <p>Immutable and thread-safe. Ids run from 0 to {@link #size()}{@code - 1}; an id may be unused
 * (a gap in the tokenizer's numbering), in which case it has no bytes and is never allowed. A
 * non-special token with an empty byte string is never allowed either (it would not move the text).
 */
public final class Vocabulary {

    private final String name;
    private final byte[][] tokens;
    private final boolean[] special;
    private final int endOfSequence;
    private volatile VocabularyTrie trie;
    private volatile VocabularyTrie longTrie;
    private int longTrieBytes;

    private Vocabulary(String name, byte[][] tokens, boolean[] special, int endOfSequence) {
        this.name = name;
        this.tokens = tokens;
        this.special = special;
        this.endOfSequence = endOfSequence;
    }

    /**
     * Builds a vocabulary.
     *
     * @param name          a name for messages (a file name or a built-in name)
     * @param tokens        bytes by id; {@code null} marks an unused id. The arrays are copied.
     * @param specialIds    ids of special tokens (they may have display bytes such as {@code <|end|>})
     * @param endOfSequence id of the end-of-sequence token, or -1 when the vocabulary has none; it is
     *                      made special if it is not already
     */
    public static Vocabulary of(String name, byte[][] tokens, int[] specialIds, int endOfSequence) {
        Objects.requireNonNull(name);
        byte[][] copy = new byte[tokens.length][];
        for (int i = 0; i < tokens.length; i++) {
            copy[i] = tokens[i] == null ? null : tokens[i].clone();
        }
        boolean[] sp = new boolean[tokens.length];
        for (int id : specialIds) {
            checkId(id, tokens.length);
            sp[id] = true;
        }
        if (endOfSequence >= 0) {
            checkId(endOfSequence, tokens.length);
            sp[endOfSequence] = true;
        } else if (endOfSequence != -1) {
            throw new IllegalArgumentException("end-of-sequence id must be -1 (none) or a token id");
        }
        return new Vocabulary(name, copy, sp, endOfSequence);
    }

    private static void checkId(int id, int size) {
        if (id < 0 || id >= size) {
            throw new IllegalArgumentException("token id " + id + " outside 0.." + (size - 1));
        }
    }

    /** The same tokens with another end-of-sequence id (which becomes special). */
    public Vocabulary withEndOfSequence(int id) {
        checkId(id, tokens.length);
        boolean[] sp = special.clone();
        sp[id] = true;
        return new Vocabulary(name, tokens, sp, id);
    }

    /** The same vocabulary under another name (shares the token arrays). */
    Vocabulary renamed(String newName) {
        return new Vocabulary(Objects.requireNonNull(newName), tokens, special, endOfSequence);
    }

    /** A name for messages. */
    public String name() {
        return name;
    }

    /** Size of the id space (largest id + 1); masks have this many bits. */
    public int size() {
        return tokens.length;
    }

    /** Number of {@code long} words a mask over this vocabulary needs. */
    public int maskWords() {
        return (tokens.length + 63) >>> 6;
    }

    /** Whether id {@code id} names a token. */
    public boolean has(int id) {
        return id >= 0 && id < tokens.length && tokens[id] != null;
    }

    /** A copy of the bytes of token {@code id} (display bytes for a special token). */
    public byte[] bytes(int id) {
        byte[] b = tokens[id];
        if (b == null) {
            throw new IllegalArgumentException("no token with id " + id + " in " + name);
        }
        return b.clone();
    }

    /** Length in bytes of token {@code id}, or -1 for an unused id. */
    public int length(int id) {
        byte[] b = tokens[id];
        return b == null ? -1 : b.length;
    }

    /** Byte {@code i} of token {@code id}, without copying. */
    public byte byteAt(int id, int i) {
        return tokens[id][i];
    }

    /** Whether {@code id} is a special (control) token. */
    public boolean isSpecial(int id) {
        return id >= 0 && id < special.length && special[id];
    }

    /** Ids of all special tokens, ascending. */
    public int[] specialIds() {
        int n = 0;
        for (boolean b : special) {
            if (b) {
                n++;
            }
        }
        int[] out = new int[n];
        int k = 0;
        for (int i = 0; i < special.length; i++) {
            if (special[i]) {
                out[k++] = i;
            }
        }
        return out;
    }

    /** The end-of-sequence id, or -1 when there is none. */
    public int endOfSequence() {
        return endOfSequence;
    }

    /** Number of ids that name a token. */
    public int tokenCount() {
        int n = 0;
        for (byte[] t : tokens) {
            if (t != null) {
                n++;
            }
        }
        return n;
    }

    /** Ids of the ordinary tokens whose bytes are exactly {@code bytes}, ascending (usually one). */
    public int[] idsOf(byte[] bytes) {
        return trie().idsOf(bytes);
    }

    /** Token {@code id} as readable text: see {@link TokenText#escape(byte[])}. */
    public String display(int id) {
        return has(id) ? TokenText.escape(tokens[id]) : "<unused " + id + ">";
    }

    /**
     * The trie of the ordinary (non-special, non-empty) tokens, built on first use (for a 200k
     * vocabulary, a few hundred milliseconds) and shared by every constraint over this vocabulary.
     */
    public VocabularyTrie trie() {
        VocabularyTrie t = trie;
        if (t == null) {
            synchronized (this) {
                t = trie;
                if (t == null) {
                    t = VocabularyTrie.build(tokens, special);
                    trie = t;
                }
            }
        }
        return t;
    }

    /**
     * The trie of the ordinary tokens longer than {@code bytes} bytes alone, built on first use and
     * kept for the most recent {@code bytes}: masks computed in two parts walk it for their long
     * tokens, which share prefixes the walk prunes together.
     */
    public VocabularyTrie trieLongerThan(int bytes) {
        synchronized (this) {
            if (longTrie == null || longTrieBytes != bytes) {
                byte[][] longer = new byte[tokens.length][];
                for (int id = 0; id < tokens.length; id++) {
                    if (tokens[id] != null && tokens[id].length > bytes) {
                        longer[id] = tokens[id];
                    }
                }
                longTrie = VocabularyTrie.build(longer, special);
                longTrieBytes = bytes;
            }
            return longTrie;
        }
    }

    @Override
    public String toString() {
        return name + " (" + tokens.length + " ids, " + Arrays.stream(specialIds()).count() + " special)";
    }
}
