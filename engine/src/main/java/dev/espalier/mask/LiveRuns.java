package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.VocabularyTrie;

import java.util.Arrays;

/**
 * Per automaton state, the ASCII byte sets over which every run of a given length surely stays
 * alive, and where such runs surely die one byte later, so a trie walk can decide a whole subtree of
 * plain-text tokens at once (inside a JSON string, nearly every subtree below the first byte or two;
 * near a length bound, the tokens up to the bound).
 *
 * <p>From state {@code q0}, let {@code q1} be the state most ASCII bytes lead to and {@code T(q0)}
 * those bytes, and so on along {@code q1, q2, ...}. Then {@code I(k) = T(q0) ∩ ... ∩ T(q(k-1))}
 * is a set every string of at most {@code k} bytes over which leads through {@code q1 ... qk}, all
 * alive. The sets shrink with {@code k}; each state keeps the lengths where they change, and for
 * each such length {@code k} the ASCII bytes that are dead in {@code qk}: a string over them of
 * {@code k + 1} bytes dies. States are worked out on first use; the object is shared by the threads
 * that compute masks.
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
    private final long[] deadLows;
    private final long[] deadHighs;
    private final int[] target = new int[128];
    private final int[] targets = new int[128];
    private final int[] counts = new int[128];

    private static final int UNKNOWN = -2;

    /**
     * The runs of one state: {@code I(k)} is {@code low[j]/high[j]} for the first {@code j} with
     * {@code k <= upTo[j]}, empty past the last; {@code deadLow[j]/deadHigh[j]} are the dead ASCII
     * bytes of the state reached after {@code upTo[j]} bytes.
     */
    private static final class Runs {
        final int[] upTo;
        final long[] low;
        final long[] high;
        final long[] deadLow;
        final long[] deadHigh;

        Runs(int count, int[] upTo, long[] low, long[] high, long[] deadLow, long[] deadHigh) {
            this.upTo = Arrays.copyOf(upTo, count);
            this.low = Arrays.copyOf(low, count);
            this.high = Arrays.copyOf(high, count);
            this.deadLow = Arrays.copyOf(deadLow, count);
            this.deadHigh = Arrays.copyOf(deadHigh, count);
        }
    }

    /**
     * @param longest the longest run ever asked about (the vocabulary's longest token)
     */
    LiveRuns(ByteDfa dfa, int longest) {
        this.dfa = dfa;
        this.longest = longest;
        int n = dfa.stateCount();
        this.runs = new Runs[n];
        this.majors = new int[n];
        Arrays.fill(majors, UNKNOWN);
        this.majorLows = new long[n];
        this.majorHighs = new long[n];
        this.deadLows = new long[n];
        this.deadHighs = new long[n];
    }

    private Runs of(int state) {
        Runs r = runs[state];
        return r != null ? r : runsOf(state);
    }

    @Override
    public int liveLength(int state, long low, long high) {
        Runs r = of(state);
        int[] upTo = r.upTo;
        int live = 0;
        for (int j = 0; j < upTo.length; j++) {
            if ((low & ~r.low[j]) != 0 || (high & ~r.high[j]) != 0) {
                break;
            }
            live = upTo[j];
        }
        return live;
    }

    @Override
    public boolean diesAfter(int state, long low, long high, int length) {
        Runs r = of(state);
        int[] upTo = r.upTo;
        for (int j = 0; j < upTo.length && upTo[j] <= length; j++) {
            if (upTo[j] == length) {
                return (low & ~r.low[j]) == 0 && (high & ~r.high[j]) == 0
                        && (low & ~r.deadLow[j]) == 0 && (high & ~r.deadHigh[j]) == 0;
            }
        }
        return false;
    }

    private synchronized Runs runsOf(int state) {
        if (runs[state] != null) {
            return runs[state];
        }
        int cap = 4;
        int[] upTo = new int[cap];
        long[] lows = new long[cap];
        long[] highs = new long[cap];
        long[] deadLowAt = new long[cap];
        long[] deadHighAt = new long[cap];
        int count = 0;
        long low = -1L;
        long high = -1L;
        int q = state;
        for (int k = 1; k <= longest; k++) {
            int major = major(q);
            long nextLow = low & majorLows[q];
            long nextHigh = high & majorHighs[q];
            boolean forever = major == q || k == longest;
            // I(k - 1) ends here, or (a loop on the same bytes) I(k) holds for every length
            boolean ends = k > 1 && (nextLow != low || nextHigh != high);
            if (ends || forever && (nextLow | nextHigh) != 0) {
                if (count + 2 > cap) {
                    cap *= 2;
                    upTo = Arrays.copyOf(upTo, cap);
                    lows = Arrays.copyOf(lows, cap);
                    highs = Arrays.copyOf(highs, cap);
                    deadLowAt = Arrays.copyOf(deadLowAt, cap);
                    deadHighAt = Arrays.copyOf(deadHighAt, cap);
                }
                if (ends) {
                    upTo[count] = k - 1;
                    lows[count] = low;
                    highs[count] = high;
                    deadLowAt[count] = deadLows[q];
                    deadHighAt[count] = deadHighs[q];
                    count++;
                }
                if (forever && (nextLow | nextHigh) != 0) {
                    upTo[count] = Integer.MAX_VALUE;
                    lows[count] = nextLow;
                    highs[count] = nextHigh;
                    count++;
                    break;
                }
            }
            low = nextLow;
            high = nextHigh;
            if ((low | high) == 0) {
                break;
            }
            q = major;
        }
        Runs r = new Runs(count, upTo, lows, highs, deadLowAt, deadHighAt);
        runs[state] = r;
        return r;
    }

    /**
     * The state most ASCII bytes lead to from {@code q} ({@link ByteDfa#DEAD} when none does), with
     * those bytes in {@link #majorLows}/{@link #majorHighs} and the dead ASCII bytes in
     * {@link #deadLows}/{@link #deadHighs}; worked out once per state. Callers hold the lock.
     */
    private int major(int q) {
        if (majors[q] != UNKNOWN) {
            return majors[q];
        }
        int distinct = 0;
        long deadLow = 0;
        long deadHigh = 0;
        for (int b = 0; b < 128; b++) {
            int t = dfa.step(q, b);
            target[b] = t;
            if (t == ByteDfa.DEAD) {
                if (b < 64) {
                    deadLow |= 1L << b;
                } else {
                    deadHigh |= 1L << (b - 64);
                }
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
        deadLows[q] = deadLow;
        deadHighs[q] = deadHigh;
        return major;
    }
}
