package dev.espalier.mask;

import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.GrammarAnalysis;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Context-free token masks ({@link Cursor#fillMask}) against {@link ReferenceMasks}, the oracle that
 * runs a fresh Earley chart over prefix + token for every token. Prefixes come from random
 * derivations of the grammar and from constrained samples, cut at random bytes (often inside a
 * multi-byte UTF-8 character), and from random mutations of those (mostly invalid).
 *
 * <p>Per prefix the comparison covers a deterministic random subset of the vocabulary, every token
 * the engine allows (false positives), every token sharing a first byte with an allowed token (false
 * negatives near the frontier), the special tokens and end of sequence. The count of checks is
 * printed; {@code -Despalier.longTests=true} multiplies the prefixes by 10.
 */
class GrammarMaskDifferentialTest {

    static final int SCALE = Boolean.getBoolean("espalier.longTests") ? 10 : 1;

    /** Random tokens checked per prefix besides the frontier. */
    static final int SUBSET = 3000;

        @Test
    void cl100kMasksAgreeWithTheReference() {
        long checks = 0;
        Vocabulary v = TestVocabularies.builtin("cl100k");
        for (String name : TestGrammars.ALL) {
            checks += run(name, v, prefixes(name, 1), 1000 + name.hashCode());
        }
        report(v, checks, 100_000);
    }

    @Test
    void qwen3MasksAgreeWithTheReference() {
        Vocabulary v = TestVocabularies.shared("qwen3");
        long checks = 0;
        for (String name : TestGrammars.ALL) {
            checks += run(name, v, prefixes(name, 0.5), 2000 + name.hashCode());
        }
        report(v, checks, 30_000);
    }

    @Test
    void llama2MasksAgreeWithTheReference() {
        Vocabulary v = TestVocabularies.shared("llama2");
        long checks = 0;
        for (String name : TestGrammars.ALL) {
            checks += run(name, v, prefixes(name, 0.5), 3000 + name.hashCode());
        }
        report(v, checks, 30_000);
    }

    /** Byte strings the reference refuses are refused by feedBytes at the same offset, cursor unchanged. */
    @Test
    void feedBytesRefusesExactlyWhatTheReferenceRefuses() {
        Vocabulary v = TestVocabularies.builtin("cl100k");
        long checks = 0;
        long refused = 0;
        for (String name : TestGrammars.ALL) {
            Grammar g = TestGrammars.load(name);
            Constraint c = Constraint.grammar(g, v);
            ReferenceMasks ref = new ReferenceMasks(g, v);
            Random rnd = new Random(4000 + name.hashCode());
            List<byte[]> valid = derivations(g, rnd, 40 * SCALE);
            for (byte[] s : valid) {
                for (byte[] x : List.of(s, mutate(s, rnd), mutate(s, rnd), mutate(mutate(s, rnd), rnd))) {
                    int expected = ref.firstRefused(x);
                    // feed a random first piece, then the rest: the refusal offset is within the failing step
                    int split = rnd.nextInt(x.length + 1);
                    Cursor cursor = c.start();
                    byte[] head = Arrays.copyOf(x, split);
                    byte[] tail = Arrays.copyOfRange(x, split, x.length);
                    boolean headOk = expected < 0 || expected >= split;
                    checkStep(cursor, head, headOk ? -1 : expected, name, x);
                    if (headOk) {
                        checkStep(cursor, tail, expected < 0 ? -1 : expected - split, name, x);
                        assertEquals(expected < 0 ? 2 : 1, cursor.steps(), name);
                        if (expected < 0) {
                            assertEquals(ref.accepts(x), cursor.isComplete(), () -> name + " complete " + show(x));
                        }
                    }
                    checks++;
                    refused += expected >= 0 ? 1 : 0;
                }
            }
        }
        System.out.printf("grammar feedBytes vs reference: %d byte strings (%d refused), 0 disagreements%n",
                checks, refused);
        assertTrue(refused > checks / 5, "enough refused strings: " + refused);
        assertTrue(refused < checks * 4 / 5, "enough accepted strings: " + refused);
    }

    private static void checkStep(Cursor cursor, byte[] piece, int refusedAt, String name, byte[] whole) {
        int stepsBefore = cursor.steps();
        boolean completeBefore = cursor.isComplete();
        if (refusedAt < 0) {
            cursor.feedBytes(piece);
            assertEquals(stepsBefore + 1, cursor.steps());
            return;
        }
        RejectedInputException e = assertThrows(RejectedInputException.class, () -> cursor.feedBytes(piece),
                () -> name + ": " + show(whole) + " should be refused at " + refusedAt);
        assertEquals(refusedAt, e.offset(), () -> name + ": refusal offset in " + show(whole));
        assertEquals(stepsBefore, cursor.steps(), "refused bytes leave the cursor unchanged");
        assertEquals(completeBefore, cursor.isComplete(), "refused bytes leave the cursor unchanged");
        assertEquals(false, cursor.tryFeedBytes(piece));
    }

    /** Number of sampled prefixes for a grammar, scaled. */
    private static int prefixes(String name, double factor) {
        int base = switch (name) {
            // where most tokens are allowed (inside strings and fields) or share a first byte with an
            // allowed one (white space), a prefix costs up to 100,000 fresh-chart checks
            case "json", "arithmetic" -> 6;
            case "csv", "orchard-query" -> 4;
            default -> 10;
        };
        return Math.max(2, (int) Math.round(base * factor * SCALE));
    }

    /** Compares masks on {@code n} valid prefixes and their mutations; returns the number of checks. */
    private static long run(String name, Vocabulary v, int n, long seed) {
        Grammar g = TestGrammars.load(name);
        Constraint c = Constraint.grammar(g, v);
        ReferenceMasks ref = new ReferenceMasks(g, v);
        Random rnd = new Random(seed);
        List<byte[]> sources = new ArrayList<>(derivations(g, rnd, (n + 1) / 2));
        for (int i = 0; sources.size() < n; i++) {
            sources.add(MaskedSampler.sample(c, rnd, 12, 0.1).bytes());
        }
        List<byte[]> prefixes = new ArrayList<>();
        prefixes.add(new byte[0]);
        for (byte[] s : sources) {
            byte[] p = cut(s, rnd);
            prefixes.add(p);
            if (rnd.nextInt(3) == 0) {
                prefixes.add(mutate(p, rnd));
            }
        }
        int[][] byFirst = byFirstByte(v);
        long[] mask = new long[v.maskWords()];
        long checks = 0;
        long t0 = System.nanoTime();
        long engineNanos = 0;
        int longest = 0;
        for (int k = 0; k < prefixes.size(); k++) {
            byte[] prefix = prefixes.get(k);
            if (!ref.viable(prefix)) {
                continue; // refusals are the feedBytes test's subject
            }
            long e0 = System.nanoTime();
            Cursor cursor = reach(c, prefix, rnd);
            cursor.fillMask(mask);
            engineNanos += System.nanoTime() - e0;
            longest = Math.max(longest, prefix.length);
            BitSet ids = chosen(v, mask, byFirst, new Random(seed * 31 + k));
            for (int id = ids.nextSetBit(0); id >= 0; id = ids.nextSetBit(id + 1)) {
                boolean want = ref.allows(prefix, id);
                boolean got = TokenBits.get(mask, id);
                if (want != got) {
                    fail(name + " on " + v.name() + " after " + show(prefix) + ": token " + id + " "
                            + v.display(id) + " " + show(v.bytes(id)) + " reference " + want + ", engine " + got);
                }
                checks++;
            }
        }
        System.out.printf("  %s on %s: %d prefixes (longest %d bytes), %d checks, %d ms (engine %d ms)%n", name,
                v.name(), prefixes.size(), longest, checks, (System.nanoTime() - t0) / 1_000_000, engineNanos / 1_000_000);
        return checks;
    }

    /**
     * A cursor holding {@code prefix}, reached in random pieces; sometimes via a detour of extra
     * allowed tokens that are then undone, sometimes as a fork.
     */
    private static Cursor reach(Constraint c, byte[] prefix, Random rnd) {
        Cursor cursor = c.start();
        int at = 0;
        while (at < prefix.length) {
            int len = 1 + rnd.nextInt(prefix.length - at);
            cursor.feedBytes(Arrays.copyOfRange(prefix, at, at + len));
            at += len;
        }
        switch (rnd.nextInt(3)) {
            case 0 -> {
                long[] m = new long[c.vocabulary().maskWords()];
                int detour = 0;
                for (int i = 0; i < 3; i++) {
                    cursor.fillMask(m);
                    int count = TokenBits.count(m);
                    int eos = c.vocabulary().endOfSequence();
                    if (count == 0 || (count == 1 && eos >= 0 && TokenBits.get(m, eos))) {
                        break;
                    }
                    int pick = TokenBits.nth(m, rnd.nextInt(count));
                    cursor.feed(pick);
                    detour++;
                }
                cursor.undo(detour);
            }
            case 1 -> cursor = cursor.fork();
            default -> {
            }
        }
        return cursor;
    }

    /** The tokens to compare: a random subset, the allowed ones, their first-byte neighbours, specials, end. */
    private static BitSet chosen(Vocabulary v, long[] mask, int[][] byFirst, Random rnd) {
        BitSet ids = new BitSet(v.size());
        for (int i = 0; i < SUBSET; i++) {
            ids.set(rnd.nextInt(v.size()));
        }
        boolean[] firsts = new boolean[256];
        for (int id = TokenBits.next(mask, 0); id >= 0; id = TokenBits.next(mask, id + 1)) {
            ids.set(id);
            if (v.has(id) && v.length(id) > 0) {
                firsts[v.byteAt(id, 0) & 0xFF] = true;
            }
        }
        for (int b = 0; b < 256; b++) {
            if (firsts[b]) {
                for (int id : byFirst[b]) {
                    ids.set(id);
                }
            }
        }
        for (int id : v.specialIds()) {
            ids.set(id);
        }
        if (v.endOfSequence() >= 0) {
            ids.set(v.endOfSequence());
        }
        return ids;
    }

    private static int[][] byFirstByte(Vocabulary v) {
        int[] counts = new int[256];
        for (int id = 0; id < v.size(); id++) {
            if (v.has(id) && !v.isSpecial(id) && v.length(id) > 0) {
                counts[v.byteAt(id, 0) & 0xFF]++;
            }
        }
        int[][] out = new int[256][];
        for (int b = 0; b < 256; b++) {
            out[b] = new int[counts[b]];
            counts[b] = 0;
        }
        for (int id = 0; id < v.size(); id++) {
            if (v.has(id) && !v.isSpecial(id) && v.length(id) > 0) {
                int b = v.byteAt(id, 0) & 0xFF;
                out[b][counts[b]++] = id;
            }
        }
        return out;
    }

    /** UTF-8 strings of random derivations of the grammar. */
    static List<byte[]> derivations(Grammar g, Random rnd, int n) {
        List<byte[]> out = new ArrayList<>();
        for (String s : GrammarAnalysis.randomExamples(g, n, rnd.nextLong(), 4 + rnd.nextInt(4))) {
            out.add(s.getBytes(StandardCharsets.UTF_8));
        }
        return out;
    }

    /**
     * Longest prefix compared: the reference re-reads the prefix for every token, so its cost grows
     * with the prefix (deep nesting still shows up well within this length).
     */
    static final int MAX_PREFIX = 96;

    /**
     * A random cut of {@code s} no longer than {@link #MAX_PREFIX}; a third of the time inside a
     * multi-byte character when there is one.
     */
    static byte[] cut(byte[] s, Random rnd) {
        s = Arrays.copyOf(s, Math.min(s.length, MAX_PREFIX));
        List<Integer> inside = new ArrayList<>();
        for (int i = 1; i < s.length; i++) {
            if ((s[i] & 0xC0) == 0x80) {
                inside.add(i);
            }
        }
        int at = !inside.isEmpty() && rnd.nextInt(3) == 0 ? inside.get(rnd.nextInt(inside.size()))
                : rnd.nextInt(s.length + 1);
        return Arrays.copyOf(s, at);
    }

    /** One random edit: replace, insert, delete or append a byte (random, or one the string already has). */
    static byte[] mutate(byte[] s, Random rnd) {
        byte b = s.length > 0 && rnd.nextBoolean() ? s[rnd.nextInt(s.length)] : (byte) rnd.nextInt(256);
        int op = s.length == 0 ? 3 : rnd.nextInt(4);
        int at = rnd.nextInt(s.length + 1);
        byte[] out;
        switch (op) {
            case 0 -> {
                out = s.clone();
                out[Math.min(at, s.length - 1)] = b;
            }
            case 1 -> {
                out = new byte[s.length + 1];
                System.arraycopy(s, 0, out, 0, at);
                out[at] = b;
                System.arraycopy(s, at, out, at + 1, s.length - at);
            }
            case 2 -> {
                int d = Math.min(at, s.length - 1);
                out = new byte[s.length - 1];
                System.arraycopy(s, 0, out, 0, d);
                System.arraycopy(s, d + 1, out, d, s.length - d - 1);
            }
            default -> {
                out = Arrays.copyOf(s, s.length + 1);
                out[s.length] = b;
            }
        }
        return out;
    }

    private static void report(Vocabulary v, long checks, long minimum) {
        System.out.printf("grammar masks vs fresh-chart reference on %s: %d (prefix, token) checks, 0 disagreements%n",
                v.name(), checks);
        assertTrue(checks >= minimum * SCALE, "checks: " + checks);
    }

    static String show(byte[] b) {
        return dev.espalier.vocab.TokenText.jsonLiteral(b) + " " + Arrays.toString(b);
    }
}
