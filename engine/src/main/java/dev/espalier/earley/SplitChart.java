package dev.espalier.earley;

import dev.espalier.automaton.ByteDfa;

import java.util.Arrays;

/**
 * An Earley chart over a {@link SplitGrammar}: skeleton items (dot position, origin set) plus
 * <em>runs</em> — a terminal's DFA in progress: (terminal, origin set, DFA state). Bytes are fed one
 * at a time; every run steps its DFA; a run whose DFA accepts scans its terminal (the lexeme may end
 * here) and keeps running (the lexeme may continue). Sets form a stack, so undo is a truncation.
 *
 * <p>Besides byte sets, {@link #pushEnd(int, int)} pushes a set in which one run's terminal has just
 * ended, consuming no byte: the mask engine uses it to continue a token past a lexeme boundary.
 *
 * <p>Not thread-safe. Every run can still complete and every item can still be completed (the
 * grammar keeps productive productions only), so a chart that accepted a byte holds a viable prefix.
 */
public final class SplitChart implements ByteChart {

    private final SplitGrammar g;
    private final long maxItems;

    // sets: items [setItem[s], setItem[s+1]), runs [setRun[s], setRun[s+1]); the top set ends at the counters
    private int[] setItem = new int[64];
    private int[] setRun = new int[64];
    private boolean[] setAccept = new boolean[64];
    /** Bytes fed up to and including set s. */
    private int[] setBytes = new int[64];
    private int top;

    private int[] itemPos = new int[1024];
    private int[] itemOrigin = new int[1024];
    private int items;

    private int[] runTerm = new int[256];
    private int[] runOrigin = new int[256];
    private int[] runState = new int[256];
    private int runs;

    // per-construction de-duplication
    private int gen;
    private final int[] predictedGen;
    private final int[] termPredictedGen;
    private int[] itemTable = new int[256];
    private int[] itemTableGen = new int[256];
    private int[] runTable = new int[256];
    private int[] runTableGen = new int[256];
    private int setItemsAdded;
    private int setRunsAdded;

    SplitChart(SplitGrammar g, long maxItems) {
        this.g = g;
        this.maxItems = maxItems;
        this.predictedGen = new int[g.ntCount];
        this.termPredictedGen = new int[g.terminals.length];
        begin(0);
        if (!g.isEmptyLanguage()) {
            predict(g.startNt, 0);
        }
        close(0);
        top = 0;
    }

    private SplitChart(SplitChart o) {
        this.g = o.g;
        this.maxItems = o.maxItems;
        this.setItem = o.setItem.clone();
        this.setRun = o.setRun.clone();
        this.setAccept = o.setAccept.clone();
        this.setBytes = o.setBytes.clone();
        this.top = o.top;
        this.itemPos = Arrays.copyOf(o.itemPos, Math.max(1024, o.items + 64));
        this.itemOrigin = Arrays.copyOf(o.itemOrigin, itemPos.length);
        this.items = o.items;
        this.runTerm = Arrays.copyOf(o.runTerm, Math.max(256, o.runs + 64));
        this.runOrigin = Arrays.copyOf(o.runOrigin, runTerm.length);
        this.runState = Arrays.copyOf(o.runState, runTerm.length);
        this.runs = o.runs;
        this.predictedGen = new int[o.predictedGen.length];
        this.termPredictedGen = new int[o.termPredictedGen.length];
    }

    /** An independent copy. */
    @Override
    public SplitChart fork() {
        return new SplitChart(this);
    }

    /** The grammar. */
    public SplitGrammar grammar() {
        return g;
    }

    /** Number of sets above the first (bytes fed plus ends pushed): what {@link #undo(int)} counts. */
    @Override
    public int depth() {
        return top;
    }

    /** Number of bytes fed (not undone). */
    public int length() {
        return setBytes[top];
    }

    /** Whether the input so far is a string of the language. */
    @Override
    public boolean accepts() {
        return setAccept[top];
    }

    /** Whether some byte can follow. */
    @Override
    public boolean canContinue() {
        for (int r = setRun[top]; r < runs; r++) {
            if (g.terminals[runTerm[r]].canContinue(runState[r])) {
                return true;
            }
        }
        return false;
    }

    /** Number of runs in the top set. */
    public int runCount() {
        return runs - setRun[top];
    }

    /** Terminal of run {@code k} of the top set. */
    public int runTerminal(int k) {
        return runTerm[setRun[top] + k];
    }

    /** Origin set of run {@code k} of the top set. */
    public int runOrigin(int k) {
        return runOrigin[setRun[top] + k];
    }

    /** DFA state of run {@code k} of the top set. */
    public int runState(int k) {
        return runState[setRun[top] + k];
    }

    /** Writes the bytes that may follow into {@code out} (four words: bit b of word b >>> 6). */
    @Override
    public void expectedBytes(long[] out) {
        out[0] = out[1] = out[2] = out[3] = 0;
        for (int r = setRun[top]; r < runs; r++) {
            long[] live = g.liveBytes(runTerm[r]);
            int q = 4 * runState[r];
            out[0] |= live[q];
            out[1] |= live[q + 1];
            out[2] |= live[q + 2];
            out[3] |= live[q + 3];
        }
    }

    /**
     * Appends one byte if the input stays a viable prefix.
     *
     * @return whether it did; when not, the chart is unchanged
     * @throws EarleyLimitException when the item limit is reached (the chart is unchanged)
     */
    @Override
    public boolean feed(int b) {
        int s = top;
        int ns = s + 1;
        begin(ns);
        try {
            for (int r = setRun[s], end = setRun[ns]; r < end; r++) {
                int t = runTerm[r];
                ByteDfa d = g.terminals[t];
                int q = d.step(runState[r], b);
                if (q == ByteDfa.DEAD) {
                    continue;
                }
                addRun(t, runOrigin[r], q);
                if (d.accepts(q)) {
                    scan(t, runOrigin[r]);
                }
            }
            close(ns);
        } catch (EarleyLimitException e) {
            truncate(s);
            throw e;
        }
        if (runs == setRun[ns] && !setAccept[ns]) {
            truncate(s);
            return false;
        }
        setBytes[ns] = setBytes[s] + 1;
        top = ns;
        return true;
    }

    /**
     * Pushes a set in which terminal {@code terminal}, begun at set {@code origin}, has just ended
     * (no byte consumed). The caller must know that a run of that terminal from that origin is in an
     * accepting state for this to describe a real hypothesis.
     */
    public void pushEnd(int terminal, int origin) {
        int s = top;
        int ns = s + 1;
        begin(ns);
        try {
            scan(terminal, origin);
            close(ns);
        } catch (EarleyLimitException e) {
            truncate(s);
            throw e;
        }
        setBytes[ns] = setBytes[s];
        top = ns;
    }

    /**
     * As {@link #pushEnd(int, int)} for several origins at once: one set in which terminal
     * {@code terminal} has just ended after each of {@code origins[0..n)}. The set is the union of the
     * sets {@code pushEnd} would push for each origin alone, so a string is accepted after it exactly
     * when it is accepted after one of them.
     */
    public void pushEnds(int terminal, int[] origins, int n) {
        int s = top;
        int ns = s + 1;
        begin(ns);
        try {
            for (int i = 0; i < n; i++) {
                scan(terminal, origins[i]);
            }
            close(ns);
        } catch (EarleyLimitException e) {
            truncate(s);
            throw e;
        }
        setBytes[ns] = setBytes[s];
        top = ns;
    }

    /** Drops the last {@code n} sets (bytes fed or ends pushed), in constant time. */
    @Override
    public void undo(int n) {
        if (n < 0 || n > top) {
            throw new IllegalArgumentException("cannot undo " + n + " of " + top + " steps");
        }
        truncate(top - n);
    }

    // ---- internals ---------------------------------------------------------------------------

    private void truncate(int s) {
        top = s;
        items = setItem[s + 1];
        runs = setRun[s + 1];
    }

    private void begin(int s) {
        if (s + 2 >= setItem.length) {
            int n = setItem.length * 2;
            setItem = Arrays.copyOf(setItem, n);
            setRun = Arrays.copyOf(setRun, n);
            setAccept = Arrays.copyOf(setAccept, n);
            setBytes = Arrays.copyOf(setBytes, n);
        }
        setItem[s] = items;
        setRun[s] = runs;
        setAccept[s] = false;
        gen++;
        setItemsAdded = 0;
        setRunsAdded = 0;
    }

    /** Advances the items of set {@code origin} that wait on terminal {@code t}. */
    private void scan(int t, int origin) {
        int sym = -(t + 1);
        int[] rhs = g.rhs;
        for (int i = setItem[origin], end = setItem[origin + 1]; i < end; i++) {
            if (rhs[itemPos[i]] == sym) {
                addItem(itemPos[i] + 1, itemOrigin[i]);
            }
        }
    }

    private void predict(int nt, int s) {
        if (predictedGen[nt] == gen) {
            return;
        }
        predictedGen[nt] = gen;
        for (int p = g.ntProdStart[nt]; p < g.ntProdStart[nt + 1]; p++) {
            addItem(g.prodFirstPos[p], s);
        }
    }

    /** Completes the set: predictions, completions (Aycock–Horspool for nullable symbols), runs. */
    private void close(int s) {
        int[] rhs = g.rhs;
        for (int i = setItem[s]; i < items; i++) {
            int pos = itemPos[i];
            int origin = itemOrigin[i];
            int sym = rhs[pos];
            if (sym == SplitGrammar.END) {
                int lhs = g.prodLhs[g.posProd[pos]];
                if (pos == g.acceptPos && origin == 0) {
                    setAccept[s] = true;
                }
                if (origin != s) {
                    for (int j = setItem[origin], end = setItem[origin + 1]; j < end; j++) {
                        if (rhs[itemPos[j]] == lhs) {
                            addItem(itemPos[j] + 1, itemOrigin[j]);
                        }
                    }
                }
            } else if (sym >= 0) {
                predict(sym, s);
                if (g.nullable[sym]) {
                    addItem(pos + 1, origin);
                }
            } else {
                int t = -sym - 1;
                if (termPredictedGen[t] != gen) {
                    termPredictedGen[t] = gen;
                    addRun(t, s, g.terminals[t].start());
                }
            }
        }
        setItem[s + 1] = items;
        setRun[s + 1] = runs;
    }

    private void addItem(int pos, int origin) {
        if (setItemsAdded * 2 >= itemTable.length) {
            rehashItems();
        }
        int mask = itemTable.length - 1;
        int h = mix(pos * 31 + origin) & mask;
        while (itemTableGen[h] == gen) {
            int i = itemTable[h];
            if (itemPos[i] == pos && itemOrigin[i] == origin) {
                return;
            }
            h = (h + 1) & mask;
        }
        if (items == itemPos.length) {
            if (items >= maxItems) {
                throw new EarleyLimitException(maxItems, setBytes[top]);
            }
            itemPos = Arrays.copyOf(itemPos, items * 2);
            itemOrigin = Arrays.copyOf(itemOrigin, items * 2);
        } else if (items >= maxItems) {
            throw new EarleyLimitException(maxItems, setBytes[top]);
        }
        itemPos[items] = pos;
        itemOrigin[items] = origin;
        itemTable[h] = items;
        itemTableGen[h] = gen;
        items++;
        setItemsAdded++;
    }

    private void rehashItems() {
        int n = itemTable.length * 2;
        itemTable = new int[n];
        itemTableGen = new int[n];
        int mask = n - 1;
        int from = items - setItemsAdded;
        for (int i = from; i < items; i++) {
            int h = mix(itemPos[i] * 31 + itemOrigin[i]) & mask;
            while (itemTableGen[h] == gen) {
                h = (h + 1) & mask;
            }
            itemTable[h] = i;
            itemTableGen[h] = gen;
        }
    }

    private void addRun(int t, int origin, int state) {
        if (setRunsAdded * 2 >= runTable.length) {
            rehashRuns();
        }
        int mask = runTable.length - 1;
        int h = mix((t * 31 + origin) * 31 + state) & mask;
        while (runTableGen[h] == gen) {
            int r = runTable[h];
            if (runTerm[r] == t && runOrigin[r] == origin && runState[r] == state) {
                return;
            }
            h = (h + 1) & mask;
        }
        if (runs == runTerm.length) {
            runTerm = Arrays.copyOf(runTerm, runs * 2);
            runOrigin = Arrays.copyOf(runOrigin, runs * 2);
            runState = Arrays.copyOf(runState, runs * 2);
        }
        runTerm[runs] = t;
        runOrigin[runs] = origin;
        runState[runs] = state;
        runTable[h] = runs;
        runTableGen[h] = gen;
        runs++;
        setRunsAdded++;
    }

    private void rehashRuns() {
        int n = runTable.length * 2;
        runTable = new int[n];
        runTableGen = new int[n];
        int mask = n - 1;
        for (int r = runs - setRunsAdded; r < runs; r++) {
            int h = mix((runTerm[r] * 31 + runOrigin[r]) * 31 + runState[r]) & mask;
            while (runTableGen[h] == gen) {
                h = (h + 1) & mask;
            }
            runTable[h] = r;
            runTableGen[h] = gen;
        }
    }

    private static int mix(int x) {
        x *= 0x9E3779B9;
        return x ^ (x >>> 16);
    }
}
