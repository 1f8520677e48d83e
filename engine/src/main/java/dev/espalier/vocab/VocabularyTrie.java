package dev.espalier.vocab;

import java.util.Arrays;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The ordinary tokens of a vocabulary as a byte trie laid out in preorder: node {@code i}'s
 * subtree is the index range {@code [i, skip(i))}, so a walk that meets a dead byte at node
 * {@code i} jumps straight to {@code skip(i)}. Node 0 is the root (the empty prefix). Several token
 * ids may end at one node (tokenizers that have two ids for the same bytes).
 *
 * <p>Immutable. Built once per vocabulary by {@link Vocabulary#trie()}.
 */
public final class VocabularyTrie {

    private final byte[] label;
    private final int[] depth;
    private final int[] skip;
    private final int[] tokenStart;
    private final int[] tokenIds;
    private final int maxDepth;
    /** depth << 8 | label, one array read per node on the walk. */
    private final int[] packed;
    /**
     * What {@link #collect(Stepper, Coverage, int, long[], int)} asks a {@link Coverage} to vouch
     * for, per node {@code i}: the ASCII bytes on the edges below it (bit {@code b} of
     * {@code belowLow} for {@code b < 64}, bit {@code b - 64} of {@code belowHigh} otherwise),
     * whether some byte below is not ASCII, the longest path below it in bytes ({@code height}) and
     * in characters ({@code chars}: bytes that start a UTF-8 character). {@code chars} is
     * {@code -1} when the path to the node ends inside a character or some string below is not a
     * well-formed UTF-8 prefix from there: such subtrees are always stepped through.
     */
    private final long[] belowLow;
    private final long[] belowHigh;
    private final boolean[] multibyte;
    private final int[] height;
    private final int[] chars;
    /** Characters started on the path to each node. */
    private final int[] starts;
    /** The length in bytes, and the characters started, of the token at each position of the preorder token list. */
    private final int[] tokenLength;
    private final int[] tokenChars;
    /** Per node, the state of {@link #utf8Step} after its path (-1: not well-formed). */
    private final byte[] pending;
    /** Mask words that hold every token id of the trie. */
    private final int words;
    /** {@link #runTokens} made so far, by set and depth, with when each was last asked for; at most {@link #RUN_SETS}. */
    private final ConcurrentHashMap<RunKey, KeptRuns> runTokens = new ConcurrentHashMap<>();
    /** Counts the requests for run tokens: the stamp of the latest. */
    private final java.util.concurrent.atomic.AtomicLong runRequests = new java.util.concurrent.atomic.AtomicLong();

    /** Run tokens kept, and the stamp of the last request for them. */
    private static final class KeptRuns {
        final RunTokens tokens;
        volatile long used;

        KeptRuns(RunTokens tokens, long used) {
            this.tokens = tokens;
            this.used = used;
        }
    }

    /**
     * Most character sets whose {@link RunTokens} a trie keeps: past that, the set asked for least
     * recently is dropped (a service that compiles many schemas keeps the fast path for the ones in
     * use; a dropped set is made again when asked for, in 0.2 ms on cl100k and 0.45 ms on o200k). A
     * set of cl100k takes about 0.2 MB, of o200k about 0.4 MB.
     */
    static final int RUN_SETS = 32;

    /** A set and depth (a plain class: a record's equals and hash are bootstrapped on first use, slowly). */
    private static final class RunKey {
        final long low;
        final long high;
        final boolean multibyte;
        final int maxDepth;

        RunKey(long low, long high, boolean multibyte, int maxDepth) {
            this.low = low;
            this.high = high;
            this.multibyte = multibyte;
            this.maxDepth = maxDepth;
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof RunKey k && k.low == low && k.high == high && k.multibyte == multibyte
                    && k.maxDepth == maxDepth;
        }

        @Override
        public int hashCode() {
            return Long.hashCode(low * 31 + high) * 31 + maxDepth * 2 + (multibyte ? 1 : 0);
        }
    }

    private VocabularyTrie(byte[] label, int[] depth, int[] skip, int[] tokenStart, int[] tokenIds, int maxDepth) {
        this.packed = new int[label.length];
        for (int i = 0; i < label.length; i++) {
            packed[i] = depth[i] << 8 | (label[i] & 0xFF);
        }
        this.label = label;
        this.depth = depth;
        this.skip = skip;
        this.tokenStart = tokenStart;
        this.tokenIds = tokenIds;
        this.maxDepth = maxDepth;
        int n = label.length;
        this.belowLow = new long[n];
        this.belowHigh = new long[n];
        this.multibyte = new boolean[n];
        this.height = new int[n];
        this.chars = new int[n];
        this.starts = new int[n];
        this.tokenLength = new int[tokenIds.length];
        this.tokenChars = new int[tokenIds.length];
        // preorder: the parent of node i is the last node seen at depth(i) - 1
        byte[] pending = new byte[n];
        this.pending = pending;
        int maxId = -1;
        for (int id : tokenIds) {
            maxId = Math.max(maxId, id);
        }
        this.words = (maxId >>> 6) + 1;
        int[] pathPending = new int[maxDepth + 1];
        int[] pathStarts = new int[maxDepth + 1];
        for (int i = 1; i < n; i++) {
            int d = depth[i];
            int b = label[i] & 0xFF;
            int before = pathPending[d - 1];
            pending[i] = (byte) (before < 0 ? -1 : utf8Step(before, b));
            starts[i] = pathStarts[d - 1] + ((b & 0xC0) != 0x80 ? 1 : 0);
            pathPending[d] = pending[i];
            pathStarts[d] = starts[i];
        }
        for (int i = 0; i < n; i++) {
            Arrays.fill(tokenLength, tokenStart[i], tokenStart[i + 1], depth[i]);
            Arrays.fill(tokenChars, tokenStart[i], tokenStart[i + 1], starts[i]);
        }
        // well[i]: bit u set when every string below node i is a well-formed UTF-8 prefix from
        // pending state u; children are at i + 1, skip(i + 1), ... up to skip(i), done first
        short[] well = new short[n];
        int[] charHeight = new int[n];
        for (int i = n - 1; i >= 0; i--) {
            long low = 0;
            long high = 0;
            boolean multi = false;
            int h = 0;
            int ch = 0;
            int w = (1 << UTF8_STATES) - 1;
            for (int c = i + 1; c < skip[i]; c = skip[c]) {
                int b = label[c] & 0xFF;
                if (b < 64) {
                    low |= 1L << b;
                } else if (b < 128) {
                    high |= 1L << (b - 64);
                } else {
                    multi = true;
                }
                low |= belowLow[c];
                high |= belowHigh[c];
                multi |= multibyte[c];
                h = Math.max(h, height[c] + 1);
                ch = Math.max(ch, starts[c] - starts[i] + charHeight[c]);
                int ok = 0;
                for (int u = 0; u < UTF8_STATES; u++) {
                    int v = utf8Step(u, b);
                    if (v >= 0 && (well[c] >> v & 1) != 0) {
                        ok |= 1 << u;
                    }
                }
                w &= ok;
            }
            well[i] = (short) w;
            belowLow[i] = low;
            belowHigh[i] = high;
            multibyte[i] = multi;
            height[i] = h;
            charHeight[i] = ch;
            chars[i] = pending[i] == 0 && (w & 1) != 0 ? ch : -1;
        }
    }

    /** States of the UTF-8 well-formedness automaton: 0 at a character boundary, 1..7 inside one. */
    private static final int UTF8_STATES = 8;

    /**
     * The well-formed UTF-8 byte sequences of the Unicode Standard (chapter 3, table 3-7) as an
     * automaton: the state after byte {@code b} in state {@code u}, or -1 when no well-formed
     * sequence continues so. States: 0 boundary; 1, 2, 3 that many continuation bytes 80..BF due;
     * 4 after E0 (A0..BF, then one more); 5 after ED (80..9F, then one more); 6 after F0 (90..BF, then
     * two more); 7 after F4 (80..8F, then two more).
     */
    static int utf8Step(int u, int b) {
        switch (u) {
            case 0:
                if (b < 0x80) {
                    return 0;
                } else if (b >= 0xC2 && b <= 0xDF) {
                    return 1;
                } else if (b == 0xE0) {
                    return 4;
                } else if (b == 0xED) {
                    return 5;
                } else if (b >= 0xE1 && b <= 0xEF) {
                    return 2;
                } else if (b == 0xF0) {
                    return 6;
                } else if (b == 0xF4) {
                    return 7;
                } else if (b >= 0xF1 && b <= 0xF3) {
                    return 3;
                }
                return -1;
            case 1:
            case 2:
            case 3:
                return b >= 0x80 && b <= 0xBF ? u - 1 : -1;
            case 4:
                return b >= 0xA0 && b <= 0xBF ? 1 : -1;
            case 5:
                return b >= 0x80 && b <= 0x9F ? 1 : -1;
            case 6:
                return b >= 0x90 && b <= 0xBF ? 2 : -1;
            default:
                return b >= 0x80 && b <= 0x8F ? 2 : -1;
        }
    }

    static VocabularyTrie build(byte[][] tokens, boolean[] special) {
        int n = 0;
        for (int id = 0; id < tokens.length; id++) {
            if (tokens[id] != null && tokens[id].length > 0 && !special[id]) {
                n++;
            }
        }
        Integer[] order = new Integer[n];
        int k = 0;
        for (int id = 0; id < tokens.length; id++) {
            if (tokens[id] != null && tokens[id].length > 0 && !special[id]) {
                order[k++] = id;
            }
        }
        Arrays.sort(order, (a, b) -> {
            int c = Arrays.compareUnsigned(tokens[a], tokens[b]);
            return c != 0 ? c : Integer.compare(a, b);
        });

        int cap = 1024;
        byte[] label = new byte[cap];
        int[] depth = new int[cap];
        int[] skip = new int[cap];
        int[] tokenStart = new int[cap + 1];
        int[] tokenIds = new int[n];
        int nodes = 1; // root
        int maxDepth = 0;
        // path[d] = node index at depth d on the current path; path[0] = root
        int[] path = new int[16];
        int pathLen = 1;
        byte[] prev = new byte[0];
        int t = 0;
        for (int idx = 0; idx < n; idx++) {
            int id = order[idx];
            byte[] b = tokens[id];
            int lcp = 0;
            int lim = Math.min(prev.length, b.length);
            while (lcp < lim && prev[lcp] == b[lcp]) {
                lcp++;
            }
            // close nodes deeper than lcp
            while (pathLen - 1 > lcp) {
                skip[path[--pathLen]] = nodes;
            }
            for (int d = lcp; d < b.length; d++) {
                if (nodes == cap) {
                    cap *= 2;
                    label = Arrays.copyOf(label, cap);
                    depth = Arrays.copyOf(depth, cap);
                    skip = Arrays.copyOf(skip, cap);
                    tokenStart = Arrays.copyOf(tokenStart, cap + 1);
                }
                label[nodes] = b[d];
                depth[nodes] = d + 1;
                tokenStart[nodes] = t;
                if (pathLen == path.length) {
                    path = Arrays.copyOf(path, path.length * 2);
                }
                path[pathLen++] = nodes;
                nodes++;
            }
            maxDepth = Math.max(maxDepth, b.length);
            tokenIds[t++] = id;
            prev = b;
        }
        while (pathLen > 1) {
            skip[path[--pathLen]] = nodes;
        }
        skip[0] = nodes;
        tokenStart[nodes] = t;
        // A node's tokens were placed while it was the end of the path: [start(i), start(i + 1)).
        int[] starts = Arrays.copyOf(tokenStart, nodes + 1);
        return new VocabularyTrie(Arrays.copyOf(label, nodes), Arrays.copyOf(depth, nodes),
                Arrays.copyOf(skip, nodes), starts, tokenIds, maxDepth);
    }

    /** A byte automaton seen by {@link #collect}: the state after a byte, or a negative number for "dead". */
    @FunctionalInterface
    public interface Stepper {
        /** The state after byte {@code b} (0..255) in {@code state}, or a negative number when dead. */
        int step(int state, int b);
    }

    /**
     * Vouches for runs of characters from a state during a walk (see
     * {@link #collect(Stepper, Coverage, int, long[], int)}), so whole subtrees are decided at once.
     * A run is a UTF-8 string of characters, each an ASCII byte of the set (bit {@code b} of
     * {@code low} for {@code b < 64}, bit {@code b - 64} of {@code high} otherwise) or, when
     * {@code multibyte} is set, any well-formed encoding of a character from U+0080 up; the last
     * character may be cut short.
     */
    public interface Coverage {
        /**
         * A length {@code L} such that every run of 1 to {@code L} characters surely leads from
         * {@code state} to a live state ({@link Integer#MAX_VALUE} for every length). Answering
         * too little is always allowed (0 vouches for nothing); too much breaks masks.
         */
        int liveLength(int state, long low, long high, boolean multibyte);

        /**
         * Whether every run of {@code length} characters followed by the first byte of one more
         * surely leads from {@code state} to a dead state, where {@code length} is what
         * {@link #liveLength} answered for the same state and set. Answering false is always allowed.
         */
        boolean diesAfter(int state, long low, long high, boolean multibyte, int length);

        /** Vouches for nothing: a walk with it steps every node (the plain twin of any coverage). */
        Coverage NONE = new Coverage() {
            @Override
            public int liveLength(int state, long low, long high, boolean multibyte) {
                return 0;
            }

            @Override
            public boolean diesAfter(int state, long low, long high, boolean multibyte, int length) {
                return false;
            }
        };
    }

    /** Told of the live nodes a walk steps to (see {@link #collect(Stepper, Coverage, int, long[], int, Visitor)}). */
    @FunctionalInterface
    public interface Visitor {
        /** The walk reached trie node {@code node} in automaton state {@code state} (live). */
        void reached(int node, int state);
    }

    /** Told nothing. */
    private static final Visitor NOBODY = (node, state) -> { };

    /**
     * Sets in {@code mask} the bit of every token whose bytes lead {@code stepper} from
     * {@code start} to a live state, walking the trie in preorder and skipping a subtree at its first
     * dead byte.
     */
    public void collect(Stepper stepper, int start, long[] mask) {
        collect(stepper, start, mask, maxDepth);
    }

    /**
     * As {@link #collect(Stepper, int, long[])}, for the tokens of at most {@code maxDepth} bytes
     * only: deeper subtrees are not entered.
     */
    public void collect(Stepper stepper, int start, long[] mask, int maxDepth) {
        collect(stepper, Coverage.NONE, start, mask, maxDepth);
    }

    /**
     * As {@link #collect(Stepper, int, long[], int)}, but where {@code coverage} decides every
     * string below a live node, that node's subtree is taken without stepping through it: all its
     * tokens when every string below stays alive (they are one range of the preorder token list), or
     * the tokens up to the live length in characters when every longer string dies. The mask is the
     * same.
     */
    public void collect(Stepper stepper, Coverage coverage, int start, long[] mask, int maxDepth) {
        collect(stepper, coverage, start, mask, maxDepth, NOBODY);
    }

    /**
     * As {@link #collect(Stepper, Coverage, int, long[], int)}, telling {@code visitor} of every live
     * node stepped to, before its subtree is decided or entered; the nodes inside subtrees decided at
     * once are not told.
     */
    public void collect(Stepper stepper, Coverage coverage, int start, long[] mask, int maxDepth, Visitor visitor) {
        collect(stepper, coverage, start, mask, maxDepth, visitor, null, 0);
    }

    /**
     * As {@link #collect(Stepper, Coverage, int, long[], int)}, where {@code whole} and
     * {@code wholeUpTo} promise that every run over {@code whole}'s set of 1 to {@code wholeUpTo}
     * characters leads from {@code start} to a live state and that every longer one dies
     * ({@link Integer#MAX_VALUE}: none dies). The subtrees whose paths and everything below are such
     * runs are then not visited at all: their tokens are added from {@code whole} in whole words. The
     * mask is the same. {@code whole} must come from this trie, for {@code maxDepth}.
     */
    public void collect(Stepper stepper, Coverage coverage, int start, long[] mask, int maxDepth, RunTokens whole,
            int wholeUpTo) {
        collect(stepper, coverage, start, mask, maxDepth, NOBODY, whole, wholeUpTo);
    }

    /**
     * As {@link #collect(Stepper, Coverage, int, long[], int, RunTokens, int)}, telling
     * {@code visitor} of every live node stepped to, as {@link #collect(Stepper, Coverage, int, long[], int, Visitor)}
     * does; the nodes inside the subtrees left to {@code whole} are not told. {@code whole} may be
     * null (nothing left out).
     */
    public void collect(Stepper stepper, Coverage coverage, int start, long[] mask, int maxDepth, Visitor visitor,
            RunTokens whole, int wholeUpTo) {
        if (whole != null && (whole.trie != this || whole.maxDepth() != maxDepth)) {
            throw new IllegalArgumentException("run tokens of another trie or depth");
        }
        int[] at = new int[this.maxDepth + 1];
        at[0] = start;
        // pure[d]: the path to depth d is a run over whole's set (byte by byte; well-formedness is
        // checked where a subtree is left out)
        boolean[] pure = new boolean[this.maxDepth + 1];
        pure[0] = whole != null;
        final long wholeLow = whole == null ? 0 : whole.low();
        final long wholeHigh = whole == null ? 0 : whole.high();
        final boolean wholeMulti = whole != null && whole.multibyte();
        final int[] packed = this.packed;
        final int[] skip = this.skip;
        final int[] tokenStart = this.tokenStart;
        final int[] tokenIds = this.tokenIds;
        final int[] chars = this.chars;
        int n = packed.length;
        int i = 1;
        while (i < n) {
            int p = packed[i];
            int d = p >>> 8;
            if (d > maxDepth) {
                i = skip[i];
                continue;
            }
            int next = stepper.step(at[d - 1], p & 0xFF);
            if (next < 0) {
                i = skip[i];
                continue;
            }
            visitor.reached(i, next);
            int ch = chars[i];
            int b = p & 0xFF;
            boolean pureHere = pure[d - 1]
                    && RunTokens.holds(wholeLow, wholeHigh, wholeMulti, b);
            if (pureHere && onlyRunsBelow(i, wholeLow, wholeHigh, wholeMulti)) {
                i = skip[i]; // every token below is in whole, alive or dead as its length says
                continue;
            }
            pure[d] = pureHere;
            if (ch > 0 && d < maxDepth) {
                boolean multi = multibyte[i];
                int live = coverage.liveLength(next, belowLow[i], belowHigh[i], multi);
                int charLimit = live >= ch ? Integer.MAX_VALUE
                        : live > 0 && coverage.diesAfter(next, belowLow[i], belowHigh[i], multi, live)
                                ? starts[i] + live : -1;
                if (charLimit >= 0) {
                    int end = tokenStart[skip[i]];
                    if (charLimit == Integer.MAX_VALUE && d + height[i] <= maxDepth) {
                        for (int k = tokenStart[i]; k < end; k++) {
                            int id = tokenIds[k];
                            mask[id >>> 6] |= 1L << id;
                        }
                    } else {
                        final int[] tokenLength = this.tokenLength;
                        final int[] tokenChars = this.tokenChars;
                        for (int k = tokenStart[i]; k < end; k++) {
                            if (tokenLength[k] <= maxDepth && tokenChars[k] <= charLimit) {
                                int id = tokenIds[k];
                                mask[id >>> 6] |= 1L << id;
                            }
                        }
                    }
                    i = skip[i];
                    continue;
                }
            }
            at[d] = next;
            for (int k = tokenStart[i], end = tokenStart[i + 1]; k < end; k++) {
                int id = tokenIds[k];
                mask[id >>> 6] |= 1L << id;
            }
            i++;
        }
        if (whole != null) {
            whole.addUpTo(wholeUpTo, mask);
        }
    }

    /**
     * The tokens of at most {@code maxDepth} bytes that are runs over a character set (as in
     * {@link Coverage}), for {@link #collect(Stepper, Coverage, int, long[], int, RunTokens, int)};
     * made on first use and kept, for the {@value #RUN_SETS} sets and depths asked for last.
     */
    public RunTokens runTokens(long low, long high, boolean multibyte, int maxDepth) {
        RunKey key = new RunKey(low, high, multibyte, maxDepth);
        long now = runRequests.incrementAndGet();
        KeptRuns known = runTokens.get(key);
        if (known != null) {
            known.used = now;
            return known.tokens;
        }
        synchronized (runTokens) {
            known = runTokens.get(key);
            if (known == null) {
                if (runTokens.size() >= RUN_SETS) {
                    RunKey oldest = null;
                    long oldestUse = Long.MAX_VALUE;
                    for (Map.Entry<RunKey, KeptRuns> e : runTokens.entrySet()) {
                        if (e.getValue().used < oldestUse) {
                            oldestUse = e.getValue().used;
                            oldest = e.getKey();
                        }
                    }
                    runTokens.remove(oldest);
                }
                known = new KeptRuns(buildRunTokens(low, high, multibyte, maxDepth), now);
                runTokens.put(key, known);
            }
            known.used = now;
            return known.tokens;
        }
    }

    /** How many sets' {@link RunTokens} the trie keeps now (for tests). */
    int runSetsKept() {
        return runTokens.size();
    }

    private RunTokens buildRunTokens(long low, long high, boolean multibyte, int maxDepth) {
        // the runs are ranges of the token list, found by a walk that takes a subtree whole where
        // everything below is a run (few nodes: the loops are kept plain, as they mostly run before
        // the JIT compiles them)
        int[] ranges = new int[64];
        int count = 0;
        boolean[] pure = new boolean[this.maxDepth + 1];
        pure[0] = true;
        int n = packed.length;
        for (int i = 1; i < n; i++) {
            int d = depth[i];
            int b = label[i] & 0xFF;
            boolean p = pure[d - 1] && pending[i] >= 0
                    && RunTokens.holds(low, high, multibyte, b);
            if (!p || d > maxDepth) {
                // nothing below is a run over the set, or short enough
                i = skip[i] - 1;
                continue;
            }
            if (count + 2 > ranges.length) {
                ranges = Arrays.copyOf(ranges, 2 * ranges.length);
            }
            ranges[count++] = tokenStart[i];
            if (onlyRunsBelow(i, low, high, multibyte)) {
                ranges[count++] = tokenStart[skip[i]];
                i = skip[i] - 1;
            } else {
                ranges[count++] = tokenStart[i + 1];
                pure[d] = true;
            }
        }
        // one pass over the ranges: the runs of each length up to KEPT characters, and the longer ones
        long[][] exact = new long[RunTokens.KEPT + 1][words];
        int[] longer = new int[16];
        int longerCount = 0;
        for (int r = 0; r < count; r += 2) {
            for (int pos = ranges[r], end = ranges[r + 1]; pos < end; pos++) {
                if (tokenLength[pos] > maxDepth) {
                    continue;
                }
                int c = tokenChars[pos];
                int id = tokenIds[pos];
                if (c <= RunTokens.KEPT) {
                    exact[c][id >>> 6] |= 1L << id;
                } else {
                    if (longerCount == longer.length) {
                        longer = Arrays.copyOf(longer, 2 * longer.length);
                    }
                    longer[longerCount++] = pos;
                }
            }
        }
        int[] ids = new int[longerCount];
        int[] counts = new int[longerCount];
        for (int k = 0; k < longerCount; k++) {
            ids[k] = tokenIds[longer[k]];
            counts[k] = tokenChars[longer[k]];
        }
        return RunTokens.of(this, low, high, multibyte, maxDepth, exact, ids, counts);
    }

    /**
     * Whether every string below node {@code i} is a run over the set (well-formed UTF-8 from a
     * character boundary, every byte in the set), so that a node whose path is such a run heads a
     * subtree of such runs.
     */
    private boolean onlyRunsBelow(int i, long low, long high, boolean multibyte) {
        return chars[i] >= 0 && (belowLow[i] & ~low) == 0 && (belowHigh[i] & ~high) == 0
                && (multibyte || !this.multibyte[i]);
    }

    /** Number of nodes, the root included. */
    public int nodeCount() {
        return label.length;
    }

    /** The byte on the edge into node {@code i} (meaningless for the root). */
    public byte label(int i) {
        return label[i];
    }

    /** Depth of node {@code i}: the length of its prefix (0 for the root). */
    public int depth(int i) {
        return depth[i];
    }

    /** Index just past node {@code i}'s subtree. */
    public int skip(int i) {
        return skip[i];
    }

    /** The longest token, in bytes. */
    public int maxDepth() {
        return maxDepth;
    }

    /** Index into {@link #tokenAt(int)} of the first token ending at node {@code i}. */
    public int tokensFrom(int i) {
        return tokenStart[i];
    }

    /** Index just past the last token ending at node {@code i}. */
    public int tokensTo(int i) {
        return tokenStart[i + 1];
    }

    /** The token id at position {@code k} of the preorder token list. */
    public int tokenAt(int k) {
        return tokenIds[k];
    }

    /** Number of tokens in the trie. */
    public int tokenCount() {
        return tokenIds.length;
    }

    /** Bytes used by the trie's arrays. */
    public long memoryBytes() {
        return label.length + 4L * (depth.length + packed.length + skip.length + tokenStart.length + tokenIds.length
                + height.length + chars.length + starts.length + tokenLength.length + tokenChars.length)
                + 8L * (belowLow.length + belowHigh.length) + multibyte.length + pending.length
                + runTokens.values().stream().mapToLong(k -> k.tokens.memoryBytes()).sum();
    }

    /** Ids of tokens whose bytes are exactly {@code bytes}, ascending. */
    public int[] idsOf(byte[] bytes) {
        int node = 0;
        for (byte b : bytes) {
            int child = node + 1;
            int end = skip[node];
            int found = -1;
            while (child < end) {
                if (label[child] == b) {
                    found = child;
                    break;
                }
                child = skip[child];
            }
            if (found < 0) {
                return new int[0];
            }
            node = found;
        }
        if (node == 0) {
            return new int[0];
        }
        int[] ids = Arrays.copyOfRange(tokenIds, tokenStart[node], tokenStart[node + 1]);
        Arrays.sort(ids);
        return ids;
    }
}
