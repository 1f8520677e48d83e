package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.VocabularyTrie;

import java.util.Arrays;

/**
 * Per automaton state, the ASCII byte sets over which every run of a given length surely stays
 * alive, so a trie walk can take a whole subtree of plain-text tokens at once (inside a JSON string,
 * nearly every subtree below the first byte or two).
 *
 * <p>From state {@code q0}, let {@code q1} be the state most ASCII bytes lead to and {@code T(q0)}
 * those bytes, and so on along {@code q1, q2, ...}. Then {@code I(k) = T(q0) ∩ ... ∩ T(q(k-1))}
 * is a set every string of at most {@code k} bytes over which leads through {@code q1 ... qk}, all
 * alive. The sets shrink with {@code k}; each state keeps the lengths where they change. States are
 * worked out on first use; the object is shared by the threads that compute masks.
 */
final class LiveRuns implements VocabularyTrie.Coverage {

    private final ByteDfa dfa;
    private final int longest;
    /** Per state, null until first asked. */
    private final Runs[] runs;
    /** Per state, see {@link #major}; touched under the lock only. */
    private final int[] majors;
    private final long[] majorLows;
    private final long[] majorHighs;
    private final int[] target = new int[128];
    private final int[] targets = new int[128];
    private final int[] counts = new int[128];

    private static final int UNKNOWN = -2;

    /** The runs of one state: {@code I(k)} is {@code low[j]/high[j]} for the first {@code j} with {@code k <= upTo[j]}, empty past the last. */
    private static final class Runs {
        final int[] upTo;
        final long[] low;
        final long[] high;

        Runs(int[] upTo, long[] low, long[] high) {
            this.upTo = upTo;
            this.low = low;
            this.high = high;
        }
    }

    /**
     * @param longest the longest run ever asked about (the vocabulary's longest token)
     */
    LiveRuns(ByteDfa dfa, int longest) {
        this.dfa = dfa;
        this.longest = longest;
        this.runs = new Runs[dfa.stateCount()];
        this.majors = new int[dfa.stateCount()];
        Arrays.fill(majors, UNKNOWN);
        this.majorLows = new long[dfa.stateCount()];
        this.majorHighs = new long[dfa.stateCount()];
    }

    @Override
    public boolean keepsAlive(int state, long low, long high, int length) {
        Runs r = runs[state];
        if (r == null) {
            r = runsOf(state);
        }
        int[] upTo = r.upTo;
        for (int j = 0; j < upTo.length; j++) {
            if (length <= upTo[j]) {
                return (low & ~r.low[j]) == 0 && (high & ~r.high[j]) == 0;
            }
        }
        return false;
    }

    private synchronized Runs runsOf(int state) {
        if (runs[state] != null) {
            return runs[state];
        }
        int[] upTo = new int[4];
        long[] lows = new long[4];
        long[] highs = new long[4];
        int count = 0;
        long low = -1L;
        long high = -1L;
        int q = state;
        for (int k = 1; k <= longest; k++) {
            int major = major(q);
            long majorLow = majorLows[q];
            long majorHigh = majorHighs[q];
            long nextLow = low & majorLow;
            long nextHigh = high & majorHigh;
            if (k > 1 && (nextLow != low || nextHigh != high)) {
                // I(k - 1) ends here
                if (count == upTo.length) {
                    upTo = Arrays.copyOf(upTo, 2 * count);
                    lows = Arrays.copyOf(lows, 2 * count);
                    highs = Arrays.copyOf(highs, 2 * count);
                }
                upTo[count] = k - 1;
                lows[count] = low;
                highs[count] = high;
                count++;
            }
            low = nextLow;
            high = nextHigh;
            if ((low | high) == 0) {
                break;
            }
            if (major == q || k == longest) {
                // a loop on the same bytes: the set holds for every length
                if (count == upTo.length) {
                    upTo = Arrays.copyOf(upTo, count + 1);
                    lows = Arrays.copyOf(lows, count + 1);
                    highs = Arrays.copyOf(highs, count + 1);
                }
                upTo[count] = Integer.MAX_VALUE;
                lows[count] = low;
                highs[count] = high;
                count++;
                break;
            }
            q = major;
        }
        Runs r = new Runs(Arrays.copyOf(upTo, count), Arrays.copyOf(lows, count),
                Arrays.copyOf(highs, count));
        runs[state] = r;
        return r;
    }

    /**
     * The state most ASCII bytes lead to from {@code q} ({@link ByteDfa#DEAD} when none does), with
     * those bytes in {@link #majorLows}/{@link #majorHighs}; worked out once per state. Callers hold
     * the lock.
     */
    private int major(int q) {
        if (majors[q] != UNKNOWN) {
            return majors[q];
        }
        int distinct = 0;
        for (int b = 0; b < 128; b++) {
            int t = dfa.step(q, b);
            target[b] = t;
            if (t == ByteDfa.DEAD) {
                continue;
            }
            int j = 0;
            while (j < distinct && targets[j] != t) {
                j++;
            }
            if (j == distinct) {
                targets[distinct] = t;
                counts[distinct++] = 0;
            }
            counts[j]++;
        }
        int major = ByteDfa.DEAD;
        for (int j = 0, most = 0; j < distinct; j++) {
            if (counts[j] > most) {
                most = counts[j];
                major = targets[j];
            }
        }
        long low = 0;
        long high = 0;
        for (int b = 0; b < 128; b++) {
            if (major != ByteDfa.DEAD && target[b] == major) {
                if (b < 64) {
                    low |= 1L << b;
                } else {
                    high |= 1L << (b - 64);
                }
            }
        }
        majors[q] = major;
        majorLows[q] = low;
        majorHighs[q] = high;
        return major;
    }
}
