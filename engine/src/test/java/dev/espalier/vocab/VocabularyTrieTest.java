package dev.espalier.vocab;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;

import org.junit.jupiter.api.Test;

/**
 * The vocabulary trie over real vocabularies: jtokkit's cl100k (always) and the shared Qwen3 and
 * Llama 2 files (when present). Each check compares the trie with the vocabulary's own byte table,
 * which the loader tests tie to jtokkit and to the files.
 */
class VocabularyTrieTest {

    private static void checkTrie(Vocabulary v) {
        VocabularyTrie t = v.trie();
        // Every ordinary token is found by its bytes; special tokens are absent.
        int ordinary = 0;
        int maxLen = 0;
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id) || v.length(id) == 0) {
                continue;
            }
            int[] ids = v.idsOf(v.bytes(id));
            int fixed = id;
            if (v.isSpecial(id)) {
                assertTrue(Arrays.binarySearch(ids, id) < 0, () -> "special token in trie: " + fixed);
            } else {
                assertTrue(Arrays.binarySearch(ids, id) >= 0, () -> "token not found: " + fixed);
                ordinary++;
                maxLen = Math.max(maxLen, v.length(id));
            }
            for (int other : ids) {
                assertArrayEquals(v.bytes(id), v.bytes(other));
                assertFalse(v.isSpecial(other));
            }
        }
        assertEquals(ordinary, t.tokenCount());
        assertEquals(maxLen, t.maxDepth());

        // Preorder invariants, walked with an explicit stack of open nodes.
        int n = t.nodeCount();
        assertEquals(0, t.depth(0));
        assertEquals(n, t.skip(0));
        int[] stack = new int[t.maxDepth() + 1];
        byte[] prefix = new byte[t.maxDepth()];
        int top = 0;
        stack[0] = 0;
        int tokensSeen = t.tokensTo(0) - t.tokensFrom(0);
        assertEquals(0, tokensSeen, "the root ends no token");
        for (int i = 1; i < n; i++) {
            while (t.skip(stack[top]) <= i) {
                top--;
            }
            int parent = stack[top];
            assertTrue(t.skip(i) > i, "skip > i");
            assertTrue(t.skip(i) <= t.skip(parent), "child range inside parent's range");
            assertEquals(t.depth(parent) + 1, t.depth(i), "depth = parent depth + 1");
            prefix[t.depth(i) - 1] = t.label(i);
            stack[++top] = i;
            // The tokens ending here are exactly the path's bytes.
            byte[] path = Arrays.copyOf(prefix, t.depth(i));
            for (int k = t.tokensFrom(i); k < t.tokensTo(i); k++) {
                assertArrayEquals(path, v.bytes(t.tokenAt(k)));
                tokensSeen++;
            }
            // Siblings have distinct labels in ascending unsigned order.
            if (i + 1 < n && t.skip(i) < t.skip(parent) && t.skip(i) < n) {
                int sibling = t.skip(i);
                assertTrue(Byte.toUnsignedInt(t.label(i)) < Byte.toUnsignedInt(t.label(sibling)));
            }
        }
        assertEquals(t.tokenCount(), tokensSeen, "every token ends at exactly one node");
    }

    @Test
    void cl100kTrie() {
        checkTrie(BuiltinVocabularyTest.builtin("cl100k"));
    }

    @Test
    void qwen3Trie() {
        checkTrie(SharedVocab.load("qwen3-tokenizer.json.gz"));
    }

    @Test
    void llama2Trie() throws java.io.IOException {
        Vocabulary v = SharedVocab.load("llama2-tokenizer.json.gz");
        checkTrie(v);
        // Llama 2 has ids with equal bytes: the piece "▁" and its byte-fallback twin "<0x20>"
        // are both a space (ids read from the file with Jackson).
        var vocab = SharedVocab.json("llama2-tokenizer.json.gz").get("model").get("vocab");
        int[] expected = {vocab.get("▁").asInt(), vocab.get("<0x20>").asInt()};
        Arrays.sort(expected);
        assertArrayEquals(expected, v.idsOf(new byte[] {' '}));
    }

    @Test
    void duplicateBytesShareANode() {
        byte[][] tokens = {"ab".getBytes(), "a".getBytes(), "ab".getBytes(), null, "b".getBytes(), new byte[0]};
        Vocabulary v = Vocabulary.of("rows", tokens, new int[] {4}, -1);
        assertArrayEquals(new int[] {0, 2}, v.idsOf("ab".getBytes()));
        assertArrayEquals(new int[] {1}, v.idsOf("a".getBytes()));
        assertArrayEquals(new int[0], v.idsOf("b".getBytes()), "special");
        assertArrayEquals(new int[0], v.idsOf(new byte[0]), "empty");
        assertArrayEquals(new int[0], v.idsOf("abc".getBytes()));
        checkTrie(v);
    }
}
