package dev.espalier.mask;

import java.io.ByteArrayOutputStream;
import java.util.Random;

/**
 * Generates outputs token by token under a constraint's masks, choosing uniformly at random among the
 * allowed tokens: a stand-in for a model, for demos and tests.
 */
public final class MaskedSampler {

    private MaskedSampler() {
    }

    /**
     * One generated output.
     *
     * @param bytes    the output's bytes (end of sequence not included)
     * @param tokens   the token ids chosen, end of sequence included when it was chosen
     * @param complete whether the output is a string of the language (it ended with end of
     *                 sequence, or the language allows nothing more)
     */
    public record Sample(byte[] bytes, int[] tokens, boolean complete) {
    }

    /**
     * Samples one output.
     *
     * @param constraint the constraint
     * @param random     the source of choices
     * @param maxTokens  stop after this many tokens even if the output is incomplete
     */
    public static Sample sample(Constraint constraint, Random random, int maxTokens) {
        return sample(constraint, random, maxTokens, 0.0);
    }

    /**
     * Samples one output, choosing end of sequence with probability {@code endChance} whenever it is
     * allowed (and otherwise uniformly among all allowed tokens, end of sequence included), so that
     * outputs of infinite languages finish.
     */
    public static Sample sample(Constraint constraint, Random random, int maxTokens, double endChance) {
        Cursor cursor = constraint.start();
        long[] mask = new long[constraint.vocabulary().maskWords()];
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int[] tokens = new int[Math.min(maxTokens, 1024)];
        int n = 0;
        int eos = constraint.vocabulary().endOfSequence();
        while (n < maxTokens) {
            cursor.fillMask(mask);
            int count = TokenBits.count(mask);
            if (count == 0) {
                break;
            }
            int pick = eos >= 0 && endChance > 0 && TokenBits.get(mask, eos) && random.nextDouble() < endChance
                    ? eos : TokenBits.nth(mask, random.nextInt(count));
            if (n == tokens.length) {
                tokens = java.util.Arrays.copyOf(tokens, tokens.length * 2);
            }
            tokens[n++] = pick;
            cursor.feed(pick);
            if (pick == eos) {
                break;
            }
            out.writeBytes(constraint.vocabulary().bytes(pick));
        }
        boolean complete = cursor.isFinished() || (cursor.isComplete() && !cursor.canContinue());
        return new Sample(out.toByteArray(), java.util.Arrays.copyOf(tokens, n), complete);
    }

}
