package dev.espalier.automaton;

import dev.espalier.grammar.Expr;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * A deterministic automaton over bytes, in compact array form for the hot path: minimal, except when
 * built by {@link #fromExprUnminimized}. Every state can reach an accepting state (the automaton is
 * trimmed), so "not dead" means "can still be completed". Bytes are grouped into equivalence
 * classes; the transition table has one row per state and one column per class.
 *
 * <p>Immutable and thread-safe.
 */
public final class ByteDfa {

    /** The dead state: returned by {@link #step(int, int)} when a byte leaves the language. */
    public static final int DEAD = -1;

    /** Default limit on states, for every automaton built without an explicit one. */
    public static final int DEFAULT_STATE_LIMIT = 10_000;

    private final int start;
    private final byte[] classOf;
    private final int classCount;
    private final int[] table;
    private final boolean[] accepting;
    private final int[] forcedByte;
    private final boolean[] hasNext;
    /** Whether no two states are equivalent (see {@link #minimal()}). */
    private final boolean minimal;

    private ByteDfa(int start, byte[] classOf, int classCount, int[] table, boolean[] accepting, boolean minimal) {
        this.start = start;
        this.minimal = minimal;
        this.classOf = classOf;
        this.classCount = classCount;
        this.table = table;
        this.accepting = accepting;
        int n = accepting.length;
        this.forcedByte = new int[n];
        this.hasNext = new boolean[n];
        // a byte is forced when one class alone is live and that class is one byte
        int[] classSize = new int[classCount];
        int[] classByte = new int[classCount];
        for (int b = 0; b < 256; b++) {
            classSize[classOf[b] & 0xFF]++;
            classByte[classOf[b] & 0xFF] = b;
        }
        for (int s = 0; s < n; s++) {
            int live = 0;
            int liveClass = -1;
            for (int c = 0; c < classCount && live < 2; c++) {
                if (table[s * classCount + c] != DEAD) {
                    live++;
                    liveClass = c;
                }
            }
            hasNext[s] = live > 0;
            forcedByte[s] = live == 1 && classSize[liveClass] == 1 ? classByte[liveClass] : -1;
        }
    }

    /**
     * Converts a dk.brics automaton over Java chars (supplementary code points as UTF-16 surrogate
     * pairs; deterministic or not) to a minimal byte DFA over the UTF-8 encodings of its strings.
     * Lone surrogates have no UTF-8 encoding and are dropped.
     *
     * @param chars      the character automaton
     * @param stateLimit the most states the byte DFA may have during subset construction
     * @throws AutomatonTooLargeException when subset construction crosses {@code stateLimit}
     */
    public static ByteDfa fromCharAutomaton(Automaton chars, int stateLimit) {
        ByteNfa nfa = ByteNfa.fromCharAutomaton(chars);
        return determinize(nfa, stateLimit);
    }

    /**
     * Compiles a grammar expression straight to a minimal byte DFA over the UTF-8 encodings of its
     * strings, without a character automaton in between (see {@link ExprNfa}). The language is that
     * of {@link CharAutomata#compile} followed by {@link #fromCharAutomaton}, its slower twin.
     *
     * @param rules      rule bodies by name (null for an undefined rule); may be null when the
     *                   expression refers to no rule
     * @param stateLimit the most states of the minimal DFA; the NFA and the unminimised subset
     *                   automaton may have {@link CharAutomata#NFA_FACTOR} times as many
     * @throws AutomatonTooLargeException when an automaton crosses its limit
     * @throws IllegalArgumentException for a reference to an undefined rule
     */
    public static ByteDfa fromExpr(Expr expr, Function<String, Expr> rules, int stateLimit) {
        return fromExpr(expr, rules, stateLimit,
                (int) Math.min(Integer.MAX_VALUE, (long) stateLimit * CharAutomata.NFA_FACTOR));
    }

    /**
     * As {@link #fromExpr(Expr, Function, int)}, with the most states subset construction may make
     * before minimisation given: a caller with a cheaper plan B fails faster with a low one.
     */
    public static ByteDfa fromExpr(Expr expr, Function<String, Expr> rules, int stateLimit, int rawLimit) {
        return fromExpr(expr, rules, stateLimit, rawLimit, true);
    }

    /**
     * As {@link #fromExpr(Expr, Function, int, int)}, without the minimisation: subset construction
     * and trimming only, so {@code stateLimit} bounds the trimmed automaton. The NFA shares the
     * nodes inside a character's encoding and wires a rule once per continuation, so subset
     * construction makes hardly more states than the minimal automaton has (inspection-report's
     * schema: 7,219 against 7,182). For callers that group equivalent states themselves, as mask
     * classes do ({@link #viableClasses}): equivalent states always share a block there.
     * {@link #minimal()} gives the minimal automaton of the same language.
     */
    public static ByteDfa fromExprUnminimized(Expr expr, Function<String, Expr> rules, int stateLimit, int rawLimit) {
        return fromExpr(expr, rules, stateLimit, rawLimit, false);
    }

    private static ByteDfa fromExpr(Expr expr, Function<String, Expr> rules, int stateLimit, int rawLimit,
            boolean minimal) {
        if (stateLimit < 1 || rawLimit < stateLimit) {
            throw new IllegalArgumentException("limits must be positive and the raw limit at least the state limit");
        }
        ByteNfa nfa = ExprNfa.of(expr, rules, (int) Math.min(Integer.MAX_VALUE, 2L * rawLimit), stateLimit);
        return determinize(nfa, rawLimit, stateLimit, minimal);
    }

    /**
     * The minimal automaton of this language: this one when it was built minimal (by every factory
     * but {@link #fromExprUnminimized}), else the result of minimising it.
     */
    public ByteDfa minimal() {
        if (minimal || start == DEAD) {
            return this;
        }
        List<int[]> rows = new ArrayList<>(stateCount());
        for (int s = 0; s < stateCount(); s++) {
            rows.add(Arrays.copyOfRange(table, s * classCount, (s + 1) * classCount));
        }
        int[] inputClass = new int[256];
        for (int b = 0; b < 256; b++) {
            inputClass[b] = classOf(b);
        }
        // the start state is 0 in every automaton built here
        return minimize(rows, accepting, inputClass, true, null, false);
    }

    /**
     * This automaton's language without the empty string: a non-accepting copy of the start state
     * becomes the start (no step leads back to it), then the reachable part is minimised again.
     */
    public ByteDfa withoutEmptyString() {
        if (start == DEAD || !accepting[start]) {
            return this;
        }
        // states reachable from the new start: the old start drops out when no step returns to it
        int n = stateCount();
        int[] id = new int[n + 1];
        Arrays.fill(id, DEAD);
        List<Integer> order = new ArrayList<>();
        id[0] = 0;
        order.add(0);
        for (int i = 0; i < order.size(); i++) {
            int[] row = shiftedRow(order.get(i) == 0 ? start : order.get(i) - 1);
            for (int t : row) {
                if (t != DEAD && id[t] == DEAD) {
                    id[t] = order.size();
                    order.add(t);
                }
            }
        }
        List<int[]> rows = new ArrayList<>(order.size());
        boolean[] accept = new boolean[order.size()];
        for (int i = 0; i < order.size(); i++) {
            int old = order.get(i);
            int[] row = shiftedRow(old == 0 ? start : old - 1);
            for (int c = 0; c < row.length; c++) {
                row[c] = row[c] == DEAD ? DEAD : id[row[c]];
            }
            rows.add(row);
            accept[i] = old != 0 && accepting[old - 1];
        }
        int[] inputClass = new int[256];
        for (int b = 0; b < 256; b++) {
            inputClass[b] = classOf(b);
        }
        return minimize(rows, accept, inputClass, true, null, false);
    }

    /** State {@code s}'s row with every target one higher (room for a new state 0). */
    private int[] shiftedRow(int s) {
        int[] row = new int[classCount];
        for (int c = 0; c < classCount; c++) {
            int t = table[s * classCount + c];
            row[c] = t == DEAD ? DEAD : t + 1;
        }
        return row;
    }

    /** The start state, or {@link #DEAD} when the language is empty. */
    public int start() {
        return start;
    }

    /** Whether the language is empty. */
    public boolean isEmpty() {
        return start == DEAD;
    }

    /** The state after reading byte {@code b} (0..255) in {@code state}, or {@link #DEAD}. */
    public int step(int state, int b) {
        return table[state * classCount + (classOf[b & 0xFF] & 0xFF)];
    }

    /** The state after reading any byte of class {@code byteClass} in {@code state}, or {@link #DEAD}. */
    public int stepClass(int state, int byteClass) {
        return table[state * classCount + byteClass];
    }

    /** The equivalence class of byte {@code b}: bytes of one class behave alike in every state. */
    public int classOf(int b) {
        return classOf[b & 0xFF] & 0xFF;
    }

    /** Whether some byte leads from {@code state} to a live state. */
    public boolean canContinue(int state) {
        return hasNext[state];
    }

    /** Whether {@code state} is accepting. */
    public boolean accepts(int state) {
        return accepting[state];
    }

    /** The only byte that leaves {@code state} alive, or -1 when there are none or several. */
    public int forcedByte(int state) {
        return forcedByte[state];
    }

    /** Number of states. */
    public int stateCount() {
        return accepting.length;
    }

    /** Number of byte equivalence classes. */
    public int classCount() {
        return classCount;
    }

    /** Bytes used by the tables. */
    public long memoryBytes() {
        return 256 + 4L * table.length + accepting.length + 4L * forcedByte.length;
    }

    /** The state after reading all of {@code bytes} from {@code state}, or {@link #DEAD}. */
    public int run(int state, byte[] bytes) {
        int s = state;
        for (int i = 0; i < bytes.length && s != DEAD; i++) {
            s = step(s, bytes[i]);
        }
        return s;
    }

    /** Whether {@code bytes} is in the language. */
    public boolean matches(byte[] bytes) {
        if (start == DEAD) {
            return false;
        }
        int s = run(start, bytes);
        return s != DEAD && accepting[s];
    }

    /**
     * Partitions the states by the byte strings of length up to {@code depth} that keep them alive:
     * refinement rounds of "same block, and every byte class leads to the same block or dies in
     * both", stopped after {@code depth} rounds or when stable. States of one block allow exactly
     * the same tokens of at most {@code depth} bytes (acceptance aside).
     *
     * <p>Each round re-examines only the states with a successor that changed block in the round
     * before: the others keep the signature they shared when their block was formed, so they stay
     * together, and a re-examined state differs from them on the class leading to the moved
     * successor. {@link #viableClassesByRounds} is the slow twin that re-examines every state in
     * every round.
     *
     * @return the block of each state, numbered from 0
     */
    public int[] viableClasses(int depth) {
        return viableClasses(new int[] {depth})[0];
    }

    /**
     * As {@link #viableClasses(int)} for several depths at once, in one run of the rounds: the
     * partition at each depth is the one after that many rounds.
     *
     * @param depths ascending depths
     * @return per depth, the block of each state
     */
    public int[][] viableClasses(int[] depths) {
        for (int i = 1; i < depths.length; i++) {
            if (depths[i] < depths[i - 1]) {
                throw new IllegalArgumentException("depths must ascend");
            }
        }
        return viableClasses(depths, false);
    }

    /**
     * {@link #viableClasses(int[])}, with every signature hashed alike when {@code collide} is set:
     * each lookup then meets the others of its block and must tell them apart by comparing them in
     * full (for tests of that path).
     */
    int[][] viableClasses(int[] depths, boolean collide) {
        int n = stateCount();
        int[][] out = new int[depths.length][];
        int depth = depths.length == 0 ? 0 : Math.max(0, depths[depths.length - 1]);
        Refiner r = new Refiner(this);
        r.collide = collide;
        int next = 0;
        for (int round = 0; round < depth && r.touchedCount > 0; round++) {
            while (next < depths.length && depths[next] <= round) {
                out[next++] = r.block.clone();
            }
            r.round(round + 1);
        }
        while (next < depths.length) {
            out[next++] = r.block.clone();
        }
        return out;
    }

    /**
     * The rounds of {@link #viableClasses}. A state's signature is its row read as maximal runs of
     * classes whose targets share a block (or die): rows are stored as runs of equal targets, so a
     * signature costs the runs of a row, not its classes. Touched states are grouped by block and
     * signature in an open-addressing table keyed by block and a hash, each hit confirmed in full.
     */
    private static final class Refiner {
        private final int[] runStart;
        private final int[] runClass;
        private final int[] runTarget;
        private final int[] predStart;
        private final int[] pred;
        final int[] block;
        private final int[] blockSize;
        private int blocks = 1;
        private int[] touched;
        int touchedCount;
        private final int[] seen;
        private final int[] touchedInBlock;
        private final int[] keptStamp;
        private final int[] moved;
        private final int[] groupOf;
        private final int[] groupBlock;
        private final int[] groupSize;
        private final int[] groupNew;
        /** Per group, the touched number of its first state. */
        private final int[] groupFirst;
        /** The signatures of this round's touched states, from {@link #sigStart}{@code [i]} for the i-th. */
        private int[] sig;
        private final int[] sigStart;
        private long[] slotKey;
        private int[] slotGroup;
        private int[] slotStamp;

        Refiner(ByteDfa d) {
            int n = d.stateCount();
            int k = d.classCount;
            int[] table = d.table;
            runStart = new int[n + 1];
            int runs = 0;
            for (int st = 0; st < n; st++) {
                runStart[st] = runs;
                int base = st * k;
                runs++;
                for (int c = 1; c < k; c++) {
                    runs += table[base + c] != table[base + c - 1] ? 1 : 0;
                }
            }
            runStart[n] = runs;
            // one slot of slack: each class is written, and kept only when it starts a run
            runClass = new int[runs + 1];
            runTarget = new int[runs + 1];
            for (int st = 0, j = 0; st < n; st++) {
                int base = st * k;
                runClass[j] = 0;
                runTarget[j++] = table[base];
                for (int c = 1; c < k; c++) {
                    int t = table[base + c];
                    runClass[j] = c;
                    runTarget[j] = t;
                    j += t != table[base + c - 1] ? 1 : 0;
                }
            }
            // predecessors of each state (one entry per run leading to it)
            predStart = new int[n + 1];
            for (int j = 0; j < runs; j++) {
                if (runTarget[j] != DEAD) {
                    predStart[runTarget[j] + 1]++;
                }
            }
            for (int i = 0; i < n; i++) {
                predStart[i + 1] += predStart[i];
            }
            pred = new int[predStart[n]];
            int[] fill = Arrays.copyOf(predStart, n);
            for (int st = 0; st < n; st++) {
                for (int j = runStart[st]; j < runStart[st + 1]; j++) {
                    if (runTarget[j] != DEAD) {
                        pred[fill[runTarget[j]]++] = st;
                    }
                }
            }
            block = new int[n];
            blockSize = new int[n + 1];
            blockSize[0] = n;
            seen = new int[n];
            touchedInBlock = new int[n + 1];
            keptStamp = new int[n + 1];
            moved = new int[n];
            groupOf = new int[n];
            groupBlock = new int[n];
            groupSize = new int[n];
            groupNew = new int[n];
            groupFirst = new int[n];
            sigStart = new int[n + 1];
            sig = new int[Math.max(16, 2 * runs)];
            // round 1 examines every state: all start in one block
            touched = new int[n];
            for (int i = 0; i < n; i++) {
                touched[i] = i;
            }
            touchedCount = n;
            slotKey = new long[0];
            slotGroup = new int[0];
            slotStamp = new int[0];
        }

        /** The block of the target of run {@code j}, -1 for dead. */
        private int runBlock(int j) {
            int t = runTarget[j];
            return t == DEAD ? -1 : block[t];
        }

        /** Hash every signature alike (see {@link ByteDfa#viableClasses(int[], boolean)}). */
        boolean collide;

        /**
         * Writes the signature of touched state number {@code i} (state {@code st}) into
         * {@link #sig}: its row as pairs of the first class and the block of each maximal run of
         * classes whose targets share a block (-1 for dead); returns its hash.
         */
        private int signature(int i, int st) {
            int at = sigStart[i];
            int need = at + 2 * (runStart[st + 1] - runStart[st]);
            if (need > sig.length) {
                sig = Arrays.copyOf(sig, Math.max(need, 2 * sig.length));
            }
            int h = 1;
            int last = Integer.MIN_VALUE;
            for (int j = runStart[st]; j < runStart[st + 1]; j++) {
                int b = runBlock(j);
                if (b != last) {
                    sig[at++] = runClass[j];
                    sig[at++] = b;
                    h = (h * 31 + runClass[j]) * 31 + b;
                    last = b;
                }
            }
            sigStart[i + 1] = at;
            return collide ? 0 : h;
        }

        /** Whether touched states number {@code x} and {@code y} have equal signatures. */
        private boolean sameSignature(int x, int y) {
            return Arrays.equals(sig, sigStart[x], sigStart[x + 1], sig, sigStart[y], sigStart[y + 1]);
        }

        /** One round: splits the blocks of the touched states, then touches the moved states' predecessors. */
        void round(int stamp) {
            int capacity = Integer.highestOneBit(Math.max(4, touchedCount) * 2) * 2;
            if (slotKey.length < capacity) {
                slotKey = new long[capacity];
                slotGroup = new int[capacity];
                slotStamp = new int[capacity];
            }
            int mask = slotKey.length - 1;
            int groups = 0;
            for (int i = 0; i < touchedCount; i++) {
                int st = touched[i];
                int b = block[st];
                touchedInBlock[b]++;
                long key = (long) b << 32 | (signature(i, st) & 0xFFFFFFFFL);
                int slot = (int) ((key * 0x9E3779B97F4A7C15L) >>> 40) & mask;
                int g;
                while (true) {
                    if (slotStamp[slot] != stamp) {
                        g = groups++;
                        slotStamp[slot] = stamp;
                        slotKey[slot] = key;
                        slotGroup[slot] = g;
                        groupBlock[g] = b;
                        groupSize[g] = 0;
                        groupFirst[g] = i;
                        break;
                    }
                    if (slotKey[slot] == key && sameSignature(i, groupFirst[slotGroup[slot]])) {
                        g = slotGroup[slot];
                        break;
                    }
                    slot = (slot + 1) & mask;
                }
                groupOf[i] = g;
                groupSize[g]++;
            }
            // a block whose states were all touched keeps its number for its first group; otherwise
            // its untouched states keep it (a touched state differs from them: one of its successors
            // has just changed block)
            for (int g = 0; g < groups; g++) {
                int b = groupBlock[g];
                // decided at a block's first group, before its size shrinks
                if (keptStamp[b] != stamp) {
                    keptStamp[b] = stamp;
                    if (touchedInBlock[b] == blockSize[b]) {
                        groupNew[g] = b;
                        continue;
                    }
                }
                int nb = blocks++;
                groupNew[g] = nb;
                blockSize[nb] = groupSize[g];
                blockSize[b] -= groupSize[g];
            }
            int movedCount = 0;
            for (int i = 0; i < touchedCount; i++) {
                int st = touched[i];
                touchedInBlock[block[st]] = 0;
                int nb = groupNew[groupOf[i]];
                if (nb != block[st]) {
                    moved[movedCount++] = st;
                }
            }
            for (int i = 0; i < touchedCount; i++) {
                block[touched[i]] = groupNew[groupOf[i]];
            }
            touchedCount = 0;
            for (int i = 0; i < movedCount; i++) {
                int st = moved[i];
                for (int k = predStart[st]; k < predStart[st + 1]; k++) {
                    int p = pred[k];
                    if (seen[p] != stamp && blockSize[block[p]] > 1) { // a lone state cannot split
                        seen[p] = stamp;
                        touched[touchedCount++] = p;
                    }
                }
            }
        }
    }

    /** The slow twin of {@link #viableClasses}: every state re-examined in every round. */
    int[] viableClassesByRounds(int depth) {
        int n = stateCount();
        int[] block = new int[n];
        int blocks = 1;
        for (int round = 0; round < depth; round++) {
            Map<IntSet, Integer> ids = new HashMap<>();
            int[] next = new int[n];
            for (int s = 0; s < n; s++) {
                int[] key = new int[classCount + 1];
                key[0] = block[s];
                for (int c = 0; c < classCount; c++) {
                    int t = table[s * classCount + c];
                    key[c + 1] = t == DEAD ? DEAD : block[t];
                }
                int size = ids.size();
                next[s] = ids.computeIfAbsent(new IntSet(key), k -> size);
            }
            block = next;
            if (ids.size() == blocks) {
                break;
            }
            blocks = ids.size();
        }
        return block;
    }

    /** The bytes that leave {@code state} alive, ascending. */
    public int[] liveBytes(int state) {
        int[] out = new int[256];
        int n = 0;
        for (int b = 0; b < 256; b++) {
            if (step(state, b) != DEAD) {
                out[n++] = b;
            }
        }
        return Arrays.copyOf(out, n);
    }

    // ---------------------------------------------------------------------------------------------

    /** A byte NFA: transitions (lo, hi, target) per node, and optional epsilon moves. */
    static final class ByteNfa {
        final List<int[]> edges = new ArrayList<>(); // per node: flattened lo,hi,to triples
        /** Per node, the number of triples in its {@link #edges} array in use. */
        int[] edgeCounts = new int[16];
        final List<int[]> epsilon = new ArrayList<>(); // per node: targets of epsilon moves, or null
        boolean hasEpsilon;
        boolean[] accept = new boolean[16];
        int start;
        /** The most nodes, and the state limit reported when a new node would cross it. */
        private int nodeLimit = Integer.MAX_VALUE;
        private int reportedLimit;
        /** The UTF-8 byte ranges of the code point ranges met so far (the same classes recur). */
        private final Map<Long, List<Utf8.ByteRanges>> encodings = new HashMap<>();
        /** Nodes inside a character's encoding, by (next node, byte range): see {@link #addCodePoints}. */
        private final LongIntTable innerNodes = new LongIntTable();

        /**
         * A map key made from packed numbers, multiplied by an odd constant (a bijection, so keys
         * stay distinct): {@link Long#hashCode} folds the two halves by exclusive or, which sends
         * many packed pairs (lo == hi, or swapped halves) to one bucket.
         */
        static long mixed(long packed) {
            return packed * 0x9E3779B97F4A7C15L;
        }

        /** Whether every node can reach an accepting node (breadth-first over reversed edges and epsilon moves). */
        boolean allCoReachable() {
            int n = size();
            int[] revStart = new int[n + 2];
            for (int node = 0; node < n; node++) {
                int[] e = edges.get(node);
                for (int k = 0, c = edgeCounts[node]; k < c; k++) {
                    revStart[e[3 * k + 2] + 2]++;
                }
                int[] eps = epsilon.get(node);
                if (eps != null) {
                    for (int to : eps) {
                        revStart[to + 2]++;
                    }
                }
            }
            for (int i = 0; i < n; i++) {
                revStart[i + 2] += revStart[i + 1];
            }
            int[] rev = new int[revStart[n + 1]];
            for (int node = 0; node < n; node++) {
                int[] e = edges.get(node);
                for (int k = 0, c = edgeCounts[node]; k < c; k++) {
                    rev[revStart[e[3 * k + 2] + 1]++] = node;
                }
                int[] eps = epsilon.get(node);
                if (eps != null) {
                    for (int to : eps) {
                        rev[revStart[to + 1]++] = node;
                    }
                }
            }
            boolean[] reached = backwards(revStart, rev, Arrays.copyOf(accept, n));
            for (boolean r : reached) {
                if (!r) {
                    return false;
                }
            }
            return true;
        }

        /** Limits the nodes to {@code nodeLimit}, reporting {@code stateLimit} when crossed. */
        void limit(int nodeLimit, int stateLimit) {
            this.nodeLimit = nodeLimit;
            this.reportedLimit = stateLimit;
        }

        int newNode() {
            if (edges.size() >= nodeLimit) {
                throw new AutomatonTooLargeException(reportedLimit,
                        "the byte automaton exceeds its limit of " + reportedLimit + " states");
            }
            edges.add(new int[6]);
            epsilon.add(null);
            int id = edges.size() - 1;
            if (id >= accept.length) {
                accept = Arrays.copyOf(accept, accept.length * 2);
                edgeCounts = Arrays.copyOf(edgeCounts, accept.length);
            }
            return id;
        }

        int size() {
            return edges.size();
        }

        void addEdge(int from, int lo, int hi, int to) {
            int[] e = edges.get(from);
            int c = edgeCounts[from];
            if (3 * c + 3 > e.length) {
                e = Arrays.copyOf(e, e.length * 2);
                edges.set(from, e);
            }
            e[3 * c] = lo;
            e[3 * c + 1] = hi;
            e[3 * c + 2] = to;
            edgeCounts[from] = c + 1;
        }

        void addEpsilon(int from, int to) {
            int[] e = epsilon.get(from);
            if (e == null) {
                e = new int[] {to};
            } else {
                e = Arrays.copyOf(e, e.length + 1);
                e[e.length - 1] = to;
            }
            epsilon.set(from, e);
            hasEpsilon = true;
        }

        /**
         * Per node, its epsilon closure (itself included), computed on first use; only the nodes
         * with byte edges or acceptance are kept.
         */
        private int[][] nodeClosure;

        /**
         * The epsilon closure of the first {@code count} nodes of {@code set} (in any order, repeats
         * allowed): its nodes with byte edges or acceptance (without epsilon moves, the nodes
         * themselves), sorted, each once. {@code mark} is scratch space per node. The result may be
         * shared: callers do not write to it.
         */
        int[] closure(int[] set, int count, int[] mark, int stamp) {
            if (nodeClosure == null) {
                nodeClosure = new int[size()][];
            }
            if (count == 1) {
                // a single node's closure is kept sorted: shared, not copied
                return closureOf1(set[0]);
            }
            int n = 0;
            int[] out = new int[Math.max(8, count * 2)];
            for (int i = 0; i < count; i++) {
                for (int x : closureOf1(set[i])) {
                    if (mark[x] != stamp) {
                        mark[x] = stamp;
                        if (n == out.length) {
                            out = Arrays.copyOf(out, n * 2);
                        }
                        out[n++] = x;
                    }
                }
            }
            out = Arrays.copyOf(out, n);
            Arrays.sort(out);
            return out;
        }

        /** The closure of one node, computed on first use; without epsilon moves, the node alone. */
        private int[] closureOf1(int node) {
            int[] c = nodeClosure[node];
            if (c == null) {
                c = hasEpsilon ? closureOf(node) : new int[] {node};
                nodeClosure[node] = c;
            }
            return c;
        }

        private int[] closureSeen;
        private int closureStamp;

        private int[] closureOf(int start) {
            if (closureSeen == null) {
                closureSeen = new int[size()];
            }
            int stamp = ++closureStamp;
            int[] out = new int[8];
            int n = 0;
            ArrayDeque<Integer> work = new ArrayDeque<>();
            closureSeen[start] = stamp;
            work.push(start);
            while (!work.isEmpty()) {
                int node = work.pop();
                // only nodes with byte edges or acceptance shape the future: subsets that differ in
                // pass-through nodes alone (the middle of a sequence, a rule's entry) are one state
                if (edgeCounts[node] > 0 || accept[node]) {
                    if (n == out.length) {
                        out = Arrays.copyOf(out, n * 2);
                    }
                    out[n++] = node;
                }
                int[] e = epsilon.get(node);
                if (e != null) {
                    for (int to : e) {
                        if (closureSeen[to] != stamp) {
                            closureSeen[to] = stamp;
                            work.push(to);
                        }
                    }
                }
            }
            out = Arrays.copyOf(out, n);
            Arrays.sort(out);
            return out;
        }

        /** Adds paths from {@code from} to {@code to} for the UTF-8 encodings of code points lo..hi. */
        void addCodePoints(int from, int lo, int hi, int to) {
            if (lo < 0x80) {
                // ASCII is its own one-byte encoding
                addEdge(from, lo, Math.min(hi, 0x7F), to);
                if (hi < 0x80) {
                    return;
                }
                lo = 0x80;
            }
            List<Utf8.ByteRanges> ranges = encodings.get(mixed((long) lo << 32 | hi));
            if (ranges == null) {
                ranges = Utf8.ranges(lo, hi);
                encodings.put(mixed((long) lo << 32 | hi), ranges);
            }
            for (Utf8.ByteRanges r : ranges) {
                // the nodes inside a character are shared from the end: one node per (byte range,
                // next node), whatever leads to it, so that subset construction meets one state
                // where it would meet one per path
                int next = to;
                for (int i = r.length() - 1; i > 0; i--) {
                    long key = (long) next << 16 | r.lo()[i] << 8 | r.hi()[i];
                    int inner = innerNodes.get(key);
                    if (inner == LongIntTable.MISSING) {
                        inner = newNode();
                        addEdge(inner, r.lo()[i], r.hi()[i], next);
                        innerNodes.put(key, inner);
                    }
                    next = inner;
                }
                addEdge(from, r.lo()[0], r.hi()[0], next);
            }
        }

        static ByteNfa fromCharAutomaton(Automaton a) {
            ByteNfa nfa = new ByteNfa();
            Map<State, Integer> ids = new IdentityHashMap<>();
            List<State> states = new ArrayList<>(a.getStates());
            // the initial state first, so node 0 is the start
            states.remove(a.getInitialState());
            states.add(0, a.getInitialState());
            for (State s : states) {
                int id = nfa.newNode();
                ids.put(s, id);
            }
            for (State s : states) {
                nfa.accept[ids.get(s)] = s.isAccept();
            }
            for (State s : states) {
                int from = ids.get(s);
                for (Transition t : s.getTransitions()) {
                    int min = t.getMin();
                    int max = t.getMax();
                    int to = ids.get(t.getDest());
                    // BMP scalar values (surrogates are skipped by Utf8.ranges)
                    nfa.addCodePoints(from, min, max, to);
                    // high surrogate followed by low surrogate: supplementary code points
                    int h1 = Math.max(min, 0xD800);
                    int h2 = Math.min(max, 0xDBFF);
                    if (h1 <= h2) {
                        for (Transition u : t.getDest().getTransitions()) {
                            int l1 = Math.max(u.getMin(), 0xDC00);
                            int l2 = Math.min(u.getMax(), 0xDFFF);
                            if (l1 > l2) {
                                continue;
                            }
                            int dest = ids.get(u.getDest());
                            if (l1 == 0xDC00 && l2 == 0xDFFF) {
                                nfa.addCodePoints(from, supplementary(h1, l1), supplementary(h2, l2), dest);
                            } else {
                                for (int h = h1; h <= h2; h++) {
                                    nfa.addCodePoints(from, supplementary(h, l1), supplementary(h, l2), dest);
                                }
                            }
                        }
                    }
                }
            }
            nfa.start = 0;
            return nfa;
        }

        private static int supplementary(int high, int low) {
            return 0x10000 + ((high - 0xD800) << 10) + (low - 0xDC00);
        }
    }

    /** Subset construction with a state limit, then trimming and minimisation. */
    static ByteDfa determinize(ByteNfa nfa, int stateLimit) {
        return determinize(nfa, stateLimit, stateLimit, true);
    }

    /**
     * Subset construction (with epsilon closure) then trimming and minimisation.
     *
     * @param rawLimit   the most states subset construction may make before minimisation
     * @param stateLimit the most states the minimal automaton may have
     */
    static ByteDfa determinize(ByteNfa nfa, int rawLimit, int stateLimit, boolean minimal) {
        return determinize(nfa, rawLimit, stateLimit, minimal, false);
    }

    /**
     * As {@link #determinize(ByteNfa, int, int, boolean)}; with {@code collideColumns}, every column
     * of the table hashes alike, so the byte classes are found by the path taken after a hash
     * collision (for tests of that path).
     */
    static ByteDfa determinize(ByteNfa nfa, int rawLimit, int stateLimit, boolean minimal, boolean collideColumns) {
        // byte classes: bytes no edge boundary separates behave alike in every subset
        boolean[] cut = new boolean[257];
        cut[0] = true;
        cut[256] = true;
        for (int node = 0; node < nfa.size(); node++) {
            int[] e = nfa.edges.get(node);
            for (int k = 0, c = nfa.edgeCounts[node]; k < c; k++) {
                cut[e[3 * k]] = true;
                cut[e[3 * k + 1] + 1] = true;
            }
        }
        int[] classOf = new int[256];
        int[] classLo = new int[257];
        int classes = 0;
        for (int b = 0; b < 256; b++) {
            if (cut[b]) {
                classLo[classes++] = b;
            }
            classOf[b] = classes - 1;
        }
        classLo[classes] = 256;
        int[][] edges = nfa.edges.toArray(new int[0][]);
        int[] edgeCounts = nfa.edgeCounts;
        int[] mark = new int[nfa.size()];
        int stamp = 1;
        Map<IntSet, Integer> index = new HashMap<>();
        List<int[]> sets = new ArrayList<>();
        List<int[]> rows = new ArrayList<>();
        // most subsets are one node (a right-linear rule system is nearly deterministic): those are
        // found by their node, every other subset by its nodes
        int[] singleState = new int[nfa.size()];
        Arrays.fill(singleState, -1);
        int[] startSet = nfa.closure(new int[] {nfa.start}, 1, mark, stamp++);
        if (startSet.length == 1) {
            singleState[startSet[0]] = 0;
        } else {
            index.put(new IntSet(startSet), 0);
        }
        sets.add(startSet);
        // when every NFA node can reach acceptance, so can every state (a non-empty set of them):
        // nothing to trim, and the columns are hashed for the byte classes as the rows are made
        long[] columnHash = nfa.allCoReachable() ? new long[classes] : null;
        int[][] buckets = new int[classes][];
        int[] bucketSize = new int[classes];
        // per class, the last state where some member edge starts at it, and where one ends at it
        int[] startsAt = new int[classes];
        int[] endsAt = new int[classes];
        Arrays.fill(startsAt, -1);
        Arrays.fill(endsAt, -1);
        // states are numbered as found and expanded in that order
        for (int d = 0; d < sets.size(); d++) {
            int[] members = sets.get(d);
            Arrays.fill(bucketSize, 0);
            for (int node : members) {
                int[] e = edges[node];
                int c = edgeCounts[node];
                for (int k = 0; k < c; k++) {
                    int to = e[3 * k + 2];
                    int first = classOf[e[3 * k]];
                    int last = classOf[e[3 * k + 1]];
                    startsAt[first] = d;
                    endsAt[last] = d;
                    for (int cl = first; cl <= last; cl++) {
                        if (buckets[cl] == null) {
                            buckets[cl] = new int[4];
                        } else if (bucketSize[cl] == buckets[cl].length) {
                            buckets[cl] = Arrays.copyOf(buckets[cl], bucketSize[cl] * 2);
                        }
                        buckets[cl][bucketSize[cl]++] = to;
                    }
                }
            }
            int[] row = new int[classes];
            Arrays.fill(row, DEAD);
            for (int cl = 0; cl < classes; cl++) {
                if (bucketSize[cl] == 0) {
                    continue;
                }
                // edges cover runs of classes: when no member edge starts at this class or ends at
                // the one before, both are covered by the same edges, read in one order, so their
                // buckets are equal element for element: the same target
                if (cl > 0 && bucketSize[cl - 1] > 0 && startsAt[cl] != d && endsAt[cl - 1] != d) {
                    row[cl] = row[cl - 1];
                    continue;
                }
                // the closure drops repeated nodes and sorts
                int[] target = nfa.closure(buckets[cl], bucketSize[cl], mark, stamp++);
                int id;
                if (target.length == 1) {
                    id = singleState[target[0]];
                    if (id < 0) {
                        id = newState(sets, target, rawLimit, stateLimit);
                        singleState[target[0]] = id;
                    }
                } else {
                    IntSet key = new IntSet(target);
                    Integer known = index.get(key);
                    if (known == null) {
                        known = newState(sets, target, rawLimit, stateLimit);
                        index.put(key, known);
                    }
                    id = known;
                }
                row[cl] = id;
            }
            rows.add(row);
            if (columnHash != null) {
                long w = rowWeight(d);
                for (int cl = 0; cl < classes; cl++) {
                    columnHash[cl] += row[cl] * w;
                }
            }
        }
        int n = sets.size();
        boolean[] accept = new boolean[n];
        for (int d = 0; d < n; d++) {
            for (int node : sets.get(d)) {
                if (nfa.accept[node]) {
                    accept[d] = true;
                    break;
                }
            }
        }
        ByteDfa dfa = minimize(rows, accept, classOf, minimal, columnHash, collideColumns);
        if (dfa.stateCount() > stateLimit) {
            throw new AutomatonTooLargeException(stateLimit,
                    "the byte automaton exceeds its limit of " + stateLimit + " states");
        }
        return dfa;
    }

    /** Numbers the subset {@code nodes} as the next state, within {@code rawLimit}. */
    private static int newState(List<int[]> sets, int[] nodes, int rawLimit, int stateLimit) {
        int id = sets.size();
        if (id >= rawLimit) {
            throw new AutomatonTooLargeException(stateLimit,
                    "the byte automaton exceeds its limit of " + stateLimit + " states");
        }
        sets.add(nodes);
        return id;
    }

    /**
     * Trims {@code rows} to the states that can reach acceptance, groups bytes into classes, and
     * when {@code minimal} merges equivalent states (Hopcroft's refinement, see {@link #hopcroft}).
     * {@code inputClass} is a byte partition every row respects (bytes of one class have one target
     * in every row), so one column per input class is enough to find the final classes.
     *
     * @param liveColumnHash null, or the hash of each column over all rows in order when every
     *                       state is known to reach acceptance (nothing to trim)
     */
    private static ByteDfa minimize(List<int[]> rowList, boolean[] acc, int[] inputClass, boolean minimal,
            long[] liveColumnHash, boolean collideColumns) {
        int n = acc.length;
        int[][] rows = rowList.toArray(new int[0][]);
        boolean[] live;
        if (liveColumnHash != null) {
            live = new boolean[n];
            Arrays.fill(live, true);
        } else {
            live = liveStates(rows, acc);
            if (!live[0]) {
                return new ByteDfa(DEAD, new byte[256], 1, new int[0], new boolean[0], true);
            }
        }
        int[] renum = new int[n];
        int m = 0;
        for (int i = 0; i < n; i++) {
            renum[i] = live[i] ? m++ : DEAD;
        }
        int inputs = 0;
        for (int b = 0; b < 256; b++) {
            inputs = Math.max(inputs, inputClass[b] + 1);
        }
        // byte classes: bytes whose columns agree over the live states. The columns are hashed
        // reading the rows in order (row by row is far cheaper than column by column); input
        // classes with equal hashes are taken as one, and checked while the table is built
        long[] columnHash = liveColumnHash;
        if (columnHash == null) {
            columnHash = new long[inputs];
            for (int i = 0; i < n; i++) {
                if (live[i]) {
                    int[] row = rows[i];
                    long w = rowWeight(i);
                    for (int c = 0; c < inputs; c++) {
                        columnHash[c] += target(row[c], renum) * w;
                    }
                }
            }
        }
        if (collideColumns) {
            columnHash = new long[columnHash.length];
        }
        int[] columnOfInput = hashedColumns(columnHash);
        Table t = table(rows, live, renum, acc, inputClass, columnOfInput, m);
        if (t == null) {
            // a hash collision: every match compared in full
            t = table(rows, live, renum, acc, inputClass, comparedColumns(rows, live, renum, columnHash), m);
        }
        byte[] classOf = t.classOf;
        int classes = t.classes;
        int[] delta = t.delta;
        boolean[] accepting = t.accepting;
        if (!minimal) {
            return new ByteDfa(0, classOf, classes, delta, accepting, false);
        }
        int[] block = hopcroft(m, classes, delta, accepting);
        int blocks = Arrays.stream(block).max().orElse(-1) + 1;
        // renumber blocks so the start state is 0 and the rest follow first appearance
        int[] order = new int[blocks];
        java.util.Arrays.fill(order, -1);
        int k = 0;
        order[block[0]] = k++;
        for (int i = 0; i < m; i++) {
            if (order[block[i]] < 0) {
                order[block[i]] = k++;
            }
        }
        int[] table = new int[blocks * classes];
        boolean[] acceptingMin = new boolean[blocks];
        for (int i = 0; i < m; i++) {
            int b = order[block[i]];
            acceptingMin[b] = accepting[i];
            for (int c = 0; c < classes; c++) {
                int to = delta[i * classes + c];
                table[b * classes + c] = to == DEAD ? DEAD : order[block[to]];
            }
        }
        return new ByteDfa(0, classOf, classes, table, acceptingMin, true);
    }

    /** The states of {@code rows} that can reach an accepting state (breadth-first over reversed edges). */
    private static boolean[] liveStates(int[][] rows, boolean[] acc) {
        int n = acc.length;
        // a target repeated in the next column adds nothing, and rows repeat targets in runs
        int[] revStart = new int[n + 2];
        for (int[] row : rows) {
            for (int c = 0, last = DEAD; c < row.length; c++) {
                int to = row[c];
                if (to != DEAD && to != last) {
                    revStart[to + 2]++;
                }
                last = to;
            }
        }
        for (int i = 0; i < n; i++) {
            revStart[i + 2] += revStart[i + 1];
        }
        int[] rev = new int[revStart[n + 1]];
        for (int i = 0; i < n; i++) {
            int[] row = rows[i];
            for (int c = 0, last = DEAD; c < row.length; c++) {
                int to = row[c];
                if (to != DEAD && to != last) {
                    rev[revStart[to + 1]++] = i;
                }
                last = to;
            }
        }
        // revStart[t] .. revStart[t + 1] now holds t's predecessors
        return backwards(revStart, rev, acc.clone());
    }

    /**
     * Marks in {@code marked} (which it returns) every node that reaches a node marked on entry,
     * breadth first over reversed edges: {@code rev[revStart[t] .. revStart[t + 1]]} are the
     * predecessors of {@code t}.
     */
    private static boolean[] backwards(int[] revStart, int[] rev, boolean[] marked) {
        int[] queue = new int[marked.length];
        int tail = 0;
        for (int i = 0; i < marked.length; i++) {
            if (marked[i]) {
                queue[tail++] = i;
            }
        }
        for (int head = 0; head < tail; head++) {
            int t = queue[head];
            for (int k = revStart[t]; k < revStart[t + 1]; k++) {
                if (!marked[rev[k]]) {
                    marked[rev[k]] = true;
                    queue[tail++] = rev[k];
                }
            }
        }
        return marked;
    }

    /** Per input class, the first input class with the same column hash: a guess that {@link #table} checks. */
    private static int[] hashedColumns(long[] columnHash) {
        int[] guess = new int[columnHash.length];
        Map<Long, Integer> first = new HashMap<>();
        for (int in = 0; in < columnHash.length; in++) {
            Integer f = first.putIfAbsent(columnHash[in], in);
            guess[in] = f == null ? in : f;
        }
        return guess;
    }

    /** Byte classes and the transition table over the live states, before minimisation. */
    private record Table(byte[] classOf, int classes, int[] delta, boolean[] accepting) {
    }

    /**
     * The byte classes (numbered by first byte) and the table of the live states renumbered, when
     * each input class has the column of the input class {@code columnOfInput} maps it to: checked
     * row by row as the table is built, null when some row tells them apart.
     */
    private static Table table(int[][] rows, boolean[] live, int[] renum, boolean[] acc, int[] inputClass,
            int[] columnOfInput, int m) {
        int inputs = columnOfInput.length;
        byte[] classOf = new byte[256];
        int[] columnOfClass = new int[256];
        int[] classOfColumn = new int[inputs];
        Arrays.fill(classOfColumn, -1);
        int classes = 0;
        for (int b = 0; b < 256; b++) {
            int col = columnOfInput[inputClass[b]];
            if (classOfColumn[col] < 0) {
                columnOfClass[classes] = col;
                classOfColumn[col] = classes++;
            }
            classOf[b] = (byte) classOfColumn[col];
        }
        int[] merged = new int[inputs];
        int mergedCount = 0;
        for (int in = 0; in < inputs; in++) {
            if (columnOfInput[in] != in) {
                merged[mergedCount++] = in;
            }
        }
        int[] delta = new int[m * classes];
        boolean[] accepting = new boolean[m];
        for (int i = 0; i < rows.length; i++) {
            if (!live[i]) {
                continue;
            }
            int[] row = rows[i];
            for (int k = 0; k < mergedCount; k++) {
                int in = merged[k];
                // renumbering is one to one on live states: comparing before it is enough, and
                // two targets that differ may still both be trimmed
                int x = row[in];
                int y = row[columnOfInput[in]];
                if (x != y && target(x, renum) != target(y, renum)) {
                    return null;
                }
            }
            int base = renum[i] * classes;
            accepting[renum[i]] = acc[i];
            if (m == rows.length) {
                // nothing trimmed: state numbers stay
                for (int c = 0; c < classes; c++) {
                    delta[base + c] = row[columnOfClass[c]];
                }
            } else {
                for (int c = 0; c < classes; c++) {
                    delta[base + c] = target(row[columnOfClass[c]], renum);
                }
            }
        }
        return new Table(classOf, classes, delta, accepting);
    }

    private static int target(int to, int[] renum) {
        return to == DEAD ? DEAD : renum[to];
    }

    /**
     * The weight of row {@code i} in the column hashes (a column hashes to the sum of its entries
     * times their rows' weights): odd, and spread by a 64-bit mix, so that unequal columns collide
     * only by chance; a sum of independent terms is cheaper than a chained multiply per entry.
     */
    private static long rowWeight(int i) {
        long z = (i + 1) * 0x9E3779B97F4A7C15L;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return (z ^ (z >>> 31)) | 1;
    }

    /** As {@link #hashedColumns}, each match compared in full: the path after a hash collision. */
    private static int[] comparedColumns(int[][] rows, boolean[] live, int[] renum, long[] columnHash) {
        int[] out = new int[columnHash.length];
        for (int in = 0; in < columnHash.length; in++) {
            out[in] = in;
            for (int other = 0; other < in; other++) {
                if (out[other] == other && columnHash[other] == columnHash[in]
                        && sameColumn(rows, live, renum, other, in)) {
                    out[in] = other;
                    break;
                }
            }
        }
        return out;
    }

    /** Whether input classes {@code a} and {@code b} lead every live row to the same live state or both die. */
    private static boolean sameColumn(int[][] rows, boolean[] live, int[] renum, int a, int b) {
        for (int i = 0; i < live.length; i++) {
            if (live[i]) {
                int[] row = rows[i];
                if (target(row[a], renum) != target(row[b], renum)) {
                    return false;
                }
            }
        }
        return true;
    }

    /**
     * Hopcroft's partition refinement in Valmari and Lehtinen's form for partial transition functions
     * ("Efficient minimization of DFAs with partial transition functions", 2008): blocks of states
     * and cords of transitions refine each other, and {@link #DEAD} transitions are simply absent, so
     * the work is O(t log n) for t live transitions and n states instead of paying for every dead
     * one. The states must be trimmed (each can reach acceptance), so none is equivalent to
     * {@link #DEAD}.
     *
     * @return the block of each state, numbered from 0 in order of first appearance
     */
    static int[] hopcroft(int m, int classes, int[] delta, boolean[] accepting) {
        if (m == 0) {
            return new int[0];
        }
        int t = 0;
        for (int x : delta) {
            if (x != DEAD) {
                t++;
            }
        }
        // transitions ordered by label: tail and head of each
        int[] tail = new int[t];
        int[] head = new int[t];
        int[] labelStart = new int[classes + 1];
        for (int i = 0; i < delta.length; i++) {
            if (delta[i] != DEAD) {
                labelStart[i % classes + 1]++;
            }
        }
        for (int c = 0; c < classes; c++) {
            labelStart[c + 1] += labelStart[c];
        }
        int[] fill = Arrays.copyOf(labelStart, classes);
        for (int i = 0; i < delta.length; i++) {
            if (delta[i] != DEAD) {
                int k = fill[i % classes]++;
                tail[k] = i / classes;
                head[k] = delta[i];
            }
        }
        // incoming transitions per state
        int[] inStart = new int[m + 1];
        for (int k = 0; k < t; k++) {
            inStart[head[k] + 1]++;
        }
        for (int i = 0; i < m; i++) {
            inStart[i + 1] += inStart[i];
        }
        int[] in = new int[t];
        int[] inFill = Arrays.copyOf(inStart, m);
        for (int k = 0; k < t; k++) {
            in[inFill[head[k]]++] = k;
        }
        Refinement blocks = new Refinement(m, 1);
        for (int st = 0; st < m; st++) {
            if (accepting[st]) {
                blocks.mark(st);
            }
        }
        blocks.split();
        Refinement cords = new Refinement(t, 0);
        for (int c = 0; c < classes; c++) {
            if (labelStart[c + 1] > labelStart[c]) {
                cords.addSet(labelStart[c], labelStart[c + 1]);
            }
        }
        // a cord splits the blocks by "has a transition in it"; a new block splits the cords by "leads
        // into it"; the first block needs no turn (its complement does the same work)
        int b = 1;
        for (int c = 0; c < cords.sets; c++) {
            for (int i = cords.first[c]; i < cords.past[c]; i++) {
                blocks.mark(tail[cords.elems[i]]);
            }
            blocks.split();
            for (; b < blocks.sets; b++) {
                for (int i = blocks.first[b]; i < blocks.past[b]; i++) {
                    int st = blocks.elems[i];
                    for (int k = inStart[st]; k < inStart[st + 1]; k++) {
                        cords.mark(in[k]);
                    }
                }
                cords.split();
            }
        }
        int[] number = new int[blocks.sets];
        Arrays.fill(number, -1);
        int[] out = new int[m];
        int next = 0;
        for (int st = 0; st < m; st++) {
            int bl = blocks.setOf[st];
            if (number[bl] < 0) {
                number[bl] = next++;
            }
            out[st] = number[bl];
        }
        return out;
    }

    /**
     * A refinable partition of 0..n-1 (Valmari and Lehtinen): each set is a range of {@link #elems};
     * marked elements are moved to the front of their set, and {@link #split} cuts every touched set
     * in two, the smaller part becoming a new set (numbered after all the others).
     */
    private static final class Refinement {
        final int[] elems;
        final int[] location;
        final int[] setOf;
        final int[] first;
        final int[] past;
        final int[] marked;
        final int[] touched;
        int touchedCount;
        int sets;

        /** One set holding every element ({@code initialSets} 1), or none yet ({@code 0}). */
        Refinement(int n, int initialSets) {
            elems = new int[n];
            location = new int[n];
            setOf = new int[n];
            first = new int[n + 1];
            past = new int[n + 1];
            marked = new int[n + 1];
            touched = new int[n + 1];
            for (int i = 0; i < n; i++) {
                elems[i] = i;
                location[i] = i;
            }
            if (initialSets == 1 && n > 0) {
                sets = 1;
                past[0] = n;
            }
        }

        /** Makes the elements in positions [from, to) a set of their own (only while building). */
        void addSet(int from, int to) {
            for (int i = from; i < to; i++) {
                setOf[elems[i]] = sets;
            }
            first[sets] = from;
            past[sets] = to;
            sets++;
        }

        void mark(int e) {
            int s = setOf[e];
            int i = location[e];
            int j = first[s] + marked[s];
            elems[i] = elems[j];
            location[elems[i]] = i;
            elems[j] = e;
            location[e] = j;
            if (marked[s]++ == 0) {
                touched[touchedCount++] = s;
            }
        }

        void split() {
            while (touchedCount > 0) {
                int s = touched[--touchedCount];
                int j = first[s] + marked[s];
                if (j == past[s]) {
                    marked[s] = 0;
                    continue;
                }
                int z = sets++;
                if (marked[s] <= past[s] - j) {
                    first[z] = first[s];
                    past[z] = j;
                    first[s] = j;
                } else {
                    past[z] = past[s];
                    first[z] = j;
                    past[s] = j;
                }
                for (int i = first[z]; i < past[z]; i++) {
                    setOf[elems[i]] = z;
                }
                marked[s] = 0;
                marked[z] = 0;
            }
        }
    }

    /** Moore's refinement, the slow twin of {@link #hopcroft}: rounds until the partition is stable. */
    static int[] moore(int m, int classes, int[] delta, boolean[] accepting) {
        int[] block = new int[m];
        for (int i = 0; i < m; i++) {
            block[i] = accepting[i] ? 1 : 0;
        }
        int blocks = (int) Arrays.stream(block).distinct().count();
        while (true) {
            Map<IntSet, Integer> sig = new HashMap<>();
            int[] next = new int[m];
            for (int i = 0; i < m; i++) {
                int[] key = new int[classes + 1];
                key[0] = block[i];
                for (int c = 0; c < classes; c++) {
                    int to = delta[i * classes + c];
                    key[c + 1] = to == DEAD ? DEAD : block[to];
                }
                int size = sig.size();
                next[i] = sig.computeIfAbsent(new IntSet(key), x -> size);
            }
            block = next;
            if (sig.size() == blocks) {
                return block;
            }
            blocks = sig.size();
        }
    }

    /** An int array with value equality, for hashing state sets and columns. */
    private record IntSet(int[] values) {
        @Override
        public boolean equals(Object o) {
            return o instanceof IntSet s && Arrays.equals(values, s.values);
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(values);
        }
    }
}
