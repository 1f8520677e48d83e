package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.automaton.Utf8;
import dev.espalier.vocab.RunTokens;
import dev.espalier.vocab.VocabularyTrie;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Per automaton state, the character sets over which every run of a given length surely stays
 * alive, and where such runs surely die one character later, so a trie walk can decide a whole
 * subtree of text tokens at once (inside a JSON string, nearly every subtree below the first byte or
 * two; near a length bound, the tokens up to the bound).
 *
 * <p>From state {@code q0}, let {@code q1} be the state most ASCII bytes lead to and {@code T(q0)}
 * those bytes, together with all characters from U+0080 up when every well-formed UTF-8 encoding of
 * them leads to {@code q1} as well; and so on along {@code q1, q2, ...}. Then
 * {@code I(k) = T(q0) ∩ ... ∩ T(q(k-1))} is a set every string of at most {@code k} characters
 * over which leads through {@code q1 ... qk}, all alive (a last character cut short stops between
 * two of them, alive as well). The sets shrink with {@code k}; each state keeps the lengths where
 * they change, and for each such length {@code k} the ASCII bytes that are dead in {@code qk} and
 * whether every lead byte is: a string over them of {@code k} characters and one more byte dies.
 * States are worked out on first use; the object is shared by the threads that compute masks.
 */
final class LiveRuns implements VocabularyTrie.Coverage {

    private final ByteDfa dfa;
    private final int longest;
    private final boolean avoidAccepting;
    /** Per state, null until first asked. */
    private final Runs[] runs;
    /** Per state, see {@link #major}; touched under the lock only. */
    private final int[] majors;
    private final long[] majorLows;
    private final long[] majorHighs;
    private final boolean[] majorMultibyte;
    private final long[] deadLows;
    private final long[] deadHighs;
    private final boolean[] leadsDead;
    /**
     * The UTF-8 encodings of U+0080..U+10FFFF as byte-range sequences, each range cut down to one
     * byte per byte class of the automaton (bytes of a class lead alike from every state).
     */
    private final int[][][] multibyteClasses;
    private final int[] target = new int[128];
    private final int[] targets = new int[128];
    private final int[] counts = new int[128];

    private static final int UNKNOWN = -2;
    /** Most states a multibyte check follows side by side before it gives up (answering no). */
    private static final int FRONTIER = 64;

    /**
     * One length where the runs of a state change: {@code I(k)} for {@code k <= upTo} (after the
     * entries before it) is the ASCII bytes {@code low/high}, with the multibyte characters when
     * {@code multibyte}; {@code deadLow/deadHigh} are the dead ASCII bytes of the state reached
     * after {@code upTo} characters and {@code leadsDead} whether every lead byte is dead there.
     */
    private record Entry(int upTo, long low, long high, boolean multibyte, long deadLow, long deadHigh,
            boolean leadsDead) {

        /** Whether the set holds the ASCII bytes {@code low/high}, and the multibyte characters if asked. */
        boolean holds(long low, long high, boolean multibyte) {
            return (low & ~this.low) == 0 && (high & ~this.high) == 0 && (!multibyte || this.multibyte);
        }
    }

    /** The runs of one state, entries by ascending length; {@code I(k)} is empty past the last. */
    private static final class Runs {
        final Entry[] entries;
        /** See {@link LiveRuns#whole}. */
        final Whole whole;

        Runs(Entry[] entries) {
            this.entries = entries;
            this.whole = wholeOf(entries);
        }
    }

    /** The UTF-8 encodings of U+0080..U+10FFFF as byte-range sequences. */
    private static final List<Utf8.ByteRanges> MULTIBYTE = Utf8.ranges(0x80, 0x10FFFF);

    /**
     * @param longest the longest run ever asked about (the vocabulary's longest token)
     */
    LiveRuns(ByteDfa dfa, int longest) {
        this(dfa, longest, false);
    }

    /**
     * @param longest the longest run ever asked about (the vocabulary's longest token)
     * @param avoidAccepting whether the runs vouched for must also pass through no accepting state
     *     after their first byte, mid-character states included (for walks that must see every node
     *     where a lexeme may end)
     */
    LiveRuns(ByteDfa dfa, int longest, boolean avoidAccepting) {
        this.dfa = dfa;
        this.longest = longest;
        this.avoidAccepting = avoidAccepting;
        int n = dfa.stateCount();
        this.runs = new Runs[n];
        this.majors = new int[n];
        Arrays.fill(majors, UNKNOWN);
        this.majorLows = new long[n];
        this.majorHighs = new long[n];
        this.majorMultibyte = new boolean[n];
        this.deadLows = new long[n];
        this.deadHighs = new long[n];
        this.leadsDead = new boolean[n];
        List<Utf8.ByteRanges> ranges = MULTIBYTE;
        this.multibyteClasses = new int[ranges.size()][][];
        for (int r = 0; r < ranges.size(); r++) {
            Utf8.ByteRanges range = ranges.get(r);
            multibyteClasses[r] = new int[range.length()][];
            for (int pos = 0; pos < range.length(); pos++) {
                boolean[] seen = new boolean[256];
                int[] bytes = new int[range.hi()[pos] - range.lo()[pos] + 1];
                int count = 0;
                for (int b = range.lo()[pos]; b <= range.hi()[pos]; b++) {
                    if (!seen[dfa.classOf(b)]) {
                        seen[dfa.classOf(b)] = true;
                        bytes[count++] = b;
                    }
                }
                multibyteClasses[r][pos] = Arrays.copyOf(bytes, count);
            }
        }
    }

    private Runs of(int state) {
        Runs r = runs[state];
        return r != null ? r : runsOf(state);
    }

    @Override
    public int liveLength(int state, long low, long high, boolean multibyte) {
        int live = 0;
        for (Entry e : of(state).entries) {
            if (!e.holds(low, high, multibyte)) {
                break;
            }
            live = e.upTo;
        }
        return live;
    }

    @Override
    public boolean diesAfter(int state, long low, long high, boolean multibyte, int length) {
        for (Entry e : of(state).entries) {
            if (e.upTo == length) {
                return e.holds(low, high, multibyte) && (low & ~e.deadLow) == 0 && (high & ~e.deadHigh) == 0
                        && (!multibyte || e.leadsDead);
            }
            if (e.upTo > length) {
                break;
            }
        }
        return false;
    }

    /**
     * A character set and a length {@code upTo} such that every run over the set of 1 to
     * {@code upTo} characters leads from {@code state} to a live state and every longer one dies
     * ({@link Integer#MAX_VALUE}: none dies), as a trie walk from {@code state} may take them whole;
     * null when the state's first runs are over fewer than {@link #WHOLE_FEWEST} ASCII bytes and no
     * multibyte character (too few tokens to be worth a set of their own).
     */
    Whole whole(int state) {
        return of(state).whole;
    }

    private static Whole wholeOf(Entry[] entries) {
        if (entries.length == 0) {
            return null;
        }
        Entry e = entries[0];
        Whole w = e.upTo == Integer.MAX_VALUE ? new Whole(e.low, e.high, e.multibyte, e.upTo)
                : new Whole(e.low & e.deadLow, e.high & e.deadHigh, e.multibyte && e.leadsDead, e.upTo);
        return w.multibyte || Long.bitCount(w.low) + Long.bitCount(w.high) >= WHOLE_FEWEST ? w : null;
    }

    /** See {@link #whole}. */
    static final int WHOLE_FEWEST = 16;

    /** The runs over ASCII bytes {@code low/high} (and multibyte characters) that live for {@code upTo} characters and then die. */
    record Whole(long low, long high, boolean multibyte, int upTo) {

        /** The tokens of {@code trie} of at most {@code maxDepth} bytes that are these runs. */
        RunTokens tokens(VocabularyTrie trie, int maxDepth) {
            return trie.runTokens(low, high, multibyte, maxDepth);
        }
    }

    private synchronized Runs runsOf(int state) {
        if (runs[state] != null) {
            return runs[state];
        }
        List<Entry> entries = new ArrayList<>();
        long low = -1L;
        long high = -1L;
        boolean multi = true;
        int q = state;
        for (int k = 1; k <= longest; k++) {
            int major = major(q);
            long nextLow = low & majorLows[q];
            long nextHigh = high & majorHighs[q];
            boolean nextMulti = multi && majorMultibyte[q];
            boolean nextEmpty = (nextLow | nextHigh) == 0 && !nextMulti;
            if (k > 1 && (nextLow != low || nextHigh != high || nextMulti != multi)) {
                // I(k - 1) ends here
                entries.add(new Entry(k - 1, low, high, multi, deadLows[q], deadHighs[q], leadsDead[q]));
            }
            if ((major == q || k == longest) && !nextEmpty) {
                // a loop on the same characters: I(k) holds for every length
                entries.add(new Entry(Integer.MAX_VALUE, nextLow, nextHigh, nextMulti, 0, 0, false));
                break;
            }
            low = nextLow;
            high = nextHigh;
            multi = nextMulti;
            if (nextEmpty) {
                break;
            }
            q = major;
        }
        Runs r = new Runs(entries.toArray(new Entry[0]));
        runs[state] = r;
        return r;
    }

    /**
     * The state most ASCII bytes lead to from {@code q} ({@link ByteDfa#DEAD} when none does), with
     * those bytes in {@link #majorLows}/{@link #majorHighs}, whether every character from U+0080 up
     * leads there too in {@link #majorMultibyte}, and the dead ASCII bytes and whether every lead
     * byte is dead in {@link #deadLows}/{@link #deadHighs}/{@link #leadsDead}; worked out once per
     * state. Callers hold the lock.
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
        boolean allLeadsDead = true;
        for (int b = 0xC2; b <= 0xF4 && allLeadsDead; b++) {
            allLeadsDead = dfa.step(q, b) == ByteDfa.DEAD;
        }
        boolean open = major != ByteDfa.DEAD && !(avoidAccepting && dfa.accepts(major));
        majors[q] = major;
        majorLows[q] = open ? low : 0;
        majorHighs[q] = open ? high : 0;
        majorMultibyte[q] = open && multibyteLeadTo(q, major);
        deadLows[q] = deadLow;
        deadHighs[q] = deadHigh;
        leadsDead[q] = allLeadsDead;
        return major;
    }

    /**
     * Whether every UTF-8 encoding of a character from U+0080 up leads from {@code q} to {@code to}
     * (with {@link #avoidAccepting}, through no accepting state; {@code to} is not accepting then).
     */
    private boolean multibyteLeadTo(int q, int to) {
        int[] frontier = new int[FRONTIER];
        int[] next = new int[FRONTIER];
        for (int[][] range : multibyteClasses) {
            frontier[0] = q;
            int size = 1;
            for (int[] bytes : range) {
                int nextSize = 0;
                for (int f = 0; f < size; f++) {
                    for (int b : bytes) {
                        int t = dfa.step(frontier[f], b);
                        if (t == ByteDfa.DEAD || avoidAccepting && dfa.accepts(t)) {
                            return false;
                        }
                        int j = 0;
                        while (j < nextSize && next[j] != t) {
                            j++;
                        }
                        if (j == nextSize) {
                            if (nextSize == FRONTIER) {
                                return false;
                            }
                            next[nextSize++] = t;
                        }
                    }
                }
                int[] swap = frontier;
                frontier = next;
                next = swap;
                size = nextSize;
            }
            if (size != 1 || frontier[0] != to) {
                return false;
            }
        }
        return true;
    }
}
