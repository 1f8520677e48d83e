package dev.espalier.earley;

import static dev.espalier.earley.EarleyGrammar.END;

import java.util.Arrays;

/**
 * An Earley recognizer fed one byte at a time (Earley 1970), with the nullable-symbol handling of
 * Aycock and Horspool (2002: prediction advances over nullable nonterminals) and Leo's (1991)
 * right-recursion optimisation (completion jumps to the top of a deterministic reduction path, so
 * right-recursive rules take a constant number of items per byte).
 *
 * <p>All items live in one growable arena of int arrays, one Earley set after another; a checkpoint
 * is just the input length, and {@link #undo(int)} truncates the arena in constant time. Each closed
 * set keeps an index of its items by the nonterminal after the dot (for completion and Leo items) and
 * a list of its items before a terminal (for scanning). Feeding allocates nothing once the arrays have
 * grown to the input's needs.
 *
 * <p>The chart always holds a viable prefix: {@link #feed(int)} refuses (and ignores) a byte after
 * which no string of the language could follow. A chart is not thread-safe; use {@link #fork()}.
 */
public final class EarleyChart implements ByteChart {

    private final EarleyGrammar g;
    private final long maxItems;
    private final boolean leo;

    // items
    private int[] itemPos;
    private int[] itemOrigin;
    private int items;

    // per set (index 0..len)
    private int len;
    private byte[] input;
    private int[] setItemStart;
    private int[] setKeyStart;
    private int[] setKeyEnd;
    private int[] setWaitEnd;
    private int[] setScanStart;
    private int[] setScanEnd;
    private boolean[] setAccept;

    // keys: (set, nonterminal after the dot) with their waiting items and Leo item
    private int[] keyNt;
    private int[] keyWaitStart;
    private int[] keyWaitEnd;
    private int[] leoPos;
    private int[] leoOrigin;
    private int keys;
    private int[] wait;
    private int waits;
    private int[] scan;
    private int scans;

    // scratch for building one set
    private int gen;
    private int cur;
    private final int[] posStamp;
    private final int[] ntStamp;
    private long[] hashKey;
    private int[] hashStamp;
    private int hashCount;
    private final int[] ntCount;
    private final int[] touched;

    EarleyChart(EarleyGrammar g, long maxItems, boolean leo) {
        this.g = g;
        this.maxItems = Math.min(maxItems, Integer.MAX_VALUE - 16);
        this.leo = leo;
        int cap = 64;
        itemPos = new int[cap];
        itemOrigin = new int[cap];
        input = new byte[16];
        setItemStart = new int[17];
        setKeyStart = new int[17];
        setKeyEnd = new int[17];
        setWaitEnd = new int[17];
        setScanStart = new int[17];
        setScanEnd = new int[17];
        setAccept = new boolean[17];
        keyNt = new int[cap];
        keyWaitStart = new int[cap];
        keyWaitEnd = new int[cap];
        leoPos = new int[cap];
        leoOrigin = new int[cap];
        wait = new int[cap];
        scan = new int[cap];
        posStamp = new int[g.rhs.length];
        ntStamp = new int[g.ntCount];
        ntCount = new int[g.ntCount];
        touched = new int[g.ntCount];
        hashKey = new long[64];
        hashStamp = new int[64];
        buildInitialSet();
    }

    private EarleyChart(EarleyChart o) {
        this.g = o.g;
        this.maxItems = o.maxItems;
        this.leo = o.leo;
        itemPos = Arrays.copyOf(o.itemPos, Math.max(64, o.items + 16));
        itemOrigin = Arrays.copyOf(o.itemOrigin, itemPos.length);
        items = o.items;
        len = o.len;
        input = Arrays.copyOf(o.input, o.input.length);
        setItemStart = o.setItemStart.clone();
        setKeyStart = o.setKeyStart.clone();
        setKeyEnd = o.setKeyEnd.clone();
        setWaitEnd = o.setWaitEnd.clone();
        setScanStart = o.setScanStart.clone();
        setScanEnd = o.setScanEnd.clone();
        setAccept = o.setAccept.clone();
        int kc = Math.max(64, o.keys + 16);
        keyNt = Arrays.copyOf(o.keyNt, kc);
        keyWaitStart = Arrays.copyOf(o.keyWaitStart, kc);
        keyWaitEnd = Arrays.copyOf(o.keyWaitEnd, kc);
        leoPos = Arrays.copyOf(o.leoPos, kc);
        leoOrigin = Arrays.copyOf(o.leoOrigin, kc);
        keys = o.keys;
        wait = Arrays.copyOf(o.wait, Math.max(64, o.waits + 16));
        waits = o.waits;
        scan = Arrays.copyOf(o.scan, Math.max(64, o.scans + 16));
        scans = o.scans;
        posStamp = new int[o.posStamp.length];
        ntStamp = new int[o.ntStamp.length];
        ntCount = new int[o.ntCount.length];
        touched = new int[o.touched.length];
        hashKey = new long[64];
        hashStamp = new int[64];
    }

    /** The grammar this chart recognizes. */
    public EarleyGrammar grammar() {
        return g;
    }

    /** An independent copy of this chart (costs time and memory proportional to its items). */
    @Override
    public EarleyChart fork() {
        return new EarleyChart(this);
    }

    /** Number of bytes fed (and not undone). */
    public int length() {
        return len;
    }

    /** Same as {@link #length()}: one undoable step per byte. */
    @Override
    public int depth() {
        return len;
    }

    /** Number of items the chart holds now (all sets). */
    public long itemCount() {
        return items;
    }

    /** Input byte {@code i} (0 <= i < length()) as 0..255. */
    public int byteAt(int i) {
        if (i < 0 || i >= len) {
            throw new IndexOutOfBoundsException(i);
        }
        return input[i] & 0xFF;
    }

    /** The input fed so far. */
    public byte[] input() {
        return Arrays.copyOf(input, len);
    }

    /** Whether the input so far is a string of the language. */
    @Override
    public boolean accepts() {
        return setAccept[len];
    }

    /** Whether some byte can follow the input so far. */
    @Override
    public boolean canContinue() {
        return setScanEnd[len] > setScanStart[len];
    }

    /** Whether byte {@code b} can follow the input so far (what {@link #feed(int)} would return). */
    public boolean allows(int b) {
        checkByte(b);
        for (int s = setScanStart[len], e = setScanEnd[len]; s < e; s++) {
            if (g.hasByte(-g.rhs[itemPos[scan[s]]] - 1, b)) {
                return true;
            }
        }
        return false;
    }

    /**
     * Writes the set of bytes that may follow the input so far into {@code out} (four words, bit
     * {@code b & 63} of word {@code b >>> 6} for byte b).
     */
    @Override
    public void expectedBytes(long[] out) {
        out[0] = out[1] = out[2] = out[3] = 0;
        long[] bits = g.termBits;
        int[] rhs = g.rhs;
        for (int s = setScanStart[len], e = setScanEnd[len]; s < e; s++) {
            int t = 4 * (-rhs[itemPos[scan[s]]] - 1);
            out[0] |= bits[t];
            out[1] |= bits[t + 1];
            out[2] |= bits[t + 2];
            out[3] |= bits[t + 3];
        }
    }

    /** The set of bytes that may follow the input so far, as four words (see {@link #expectedBytes(long[])}). */
    public long[] expectedByteSet() {
        long[] out = new long[4];
        expectedBytes(out);
        return out;
    }

    /**
     * Appends one byte if the input stays a viable prefix.
     *
     * @param b a byte value 0..255
     * @return whether the byte was accepted; when not, the chart is unchanged
     * @throws EarleyLimitException when the item limit is reached (the chart is unchanged)
     */
    @Override
    public boolean feed(int b) {
        checkByte(b);
        int prev = len;
        int[] rhs = g.rhs;
        long[] bits = g.termBits;
        int word = b >>> 6;
        long mask = 1L << (b & 63);
        int start = items;
        newSet(prev + 1);
        try {
            for (int s = setScanStart[prev], e = setScanEnd[prev]; s < e; s++) {
                int idx = scan[s];
                int pos = itemPos[idx];
                if ((bits[4 * (-rhs[pos] - 1) + word] & mask) != 0) {
                    addHashed(pos + 1, itemOrigin[idx]);
                }
            }
            if (items == start) {
                return false;
            }
            ensureSetCapacity(prev + 2);
            input[prev] = (byte) b;
            len = prev + 1;
            setItemStart[len] = start;
            closeAndIndex(start);
            return true;
        } catch (EarleyLimitException e) {
            truncate(prev, start);
            throw e;
        }
    }

    /**
     * Feeds bytes one by one until one is refused.
     *
     * @return the number of bytes accepted (all of them if equal to {@code bytes.length})
     */
    public int feedAll(byte[] bytes) {
        for (int i = 0; i < bytes.length; i++) {
            if (!feed(bytes[i] & 0xFF)) {
                return i;
            }
        }
        return bytes.length;
    }

    /**
     * Drops the last {@code n} bytes, in constant time.
     *
     * @throws IllegalArgumentException when {@code n} is negative or more than {@link #length()}
     */
    @Override
    public void undo(int n) {
        if (n < 0 || n > len) {
            throw new IllegalArgumentException("cannot undo " + n + " of " + len + " bytes");
        }
        truncate(len - n);
    }

    /** A parse forest of the input; the chart must accept it. */
    public ParseForest forest() {
        if (!accepts()) {
            throw new IllegalStateException("the input is not (yet) a string of the language");
        }
        return ParseForest.build(g, input(), maxItems);
    }

    // ---- internals ---------------------------------------------------------------------------

    private static void checkByte(int b) {
        if (b < 0 || b > 255) {
            throw new IllegalArgumentException("not a byte: " + b);
        }
    }

    private void truncate(int newLen) {
        truncate(newLen, newLen < len ? setItemStart[newLen + 1] : items);
    }

    private void truncate(int newLen, int itemEnd) {
        len = newLen;
        items = itemEnd;
        keys = setKeyEnd[newLen];
        waits = setWaitEnd[newLen];
        scans = setScanEnd[newLen];
    }

    private void newSet(int index) {
        cur = index;
        if (++gen == Integer.MAX_VALUE) {
            Arrays.fill(posStamp, 0);
            Arrays.fill(ntStamp, 0);
            Arrays.fill(hashStamp, 0);
            gen = 1;
        }
        hashCount = 0;
    }

    private void buildInitialSet() {
        newSet(0);
        setItemStart[0] = 0;
        if (!g.isEmptyLanguage()) {
            predict(g.startNt);
        }
        closeAndIndex(0);
    }

    /** Completes the closure of set {@code cur} (whose items start at {@code start}) and indexes it. */
    private void closeAndIndex(int start) {
        int[] rhs = g.rhs;
        boolean[] nullable = g.nullable;
        for (int j = start; j < items; j++) {
            int pos = itemPos[j];
            int sym = rhs[pos];
            if (sym >= 0) {
                predict(sym);
                if (nullable[sym]) {
                    int o = itemOrigin[j];
                    if (o == cur) {
                        addPredicted(pos + 1);
                    } else {
                        addHashed(pos + 1, o);
                    }
                }
            } else if (sym == END) {
                int o = itemOrigin[j];
                if (o != cur) { // empty completions were done at prediction (Aycock-Horspool)
                    complete(g.prodLhs[g.posProd[pos]], o);
                }
            }
        }
        index(start);
    }

    private void predict(int nt) {
        if (ntStamp[nt] == gen) {
            return;
        }
        int cs = g.closurePosStart[nt];
        if (cs >= 0) {
            int[] cn = g.closureNts;
            for (int k = g.closureNtStart[nt], e = g.closureEndNt[nt]; k < e; k++) {
                ntStamp[cn[k]] = gen;
            }
            int[] cp = g.closurePos;
            for (int k = cs, e = g.closureEndPos[nt]; k < e; k++) {
                addPredicted(cp[k]);
            }
        } else {
            ntStamp[nt] = gen;
            for (int p = g.ntProdStart[nt], e = g.ntProdStart[nt + 1]; p < e; p++) {
                addPredicted(g.prodFirstPos[p]);
            }
        }
    }

    private void complete(int nt, int origin) {
        int k = findKey(origin, nt);
        if (k < 0) {
            return;
        }
        if (leo && leoPos[k] >= 0) {
            addHashed(leoPos[k], leoOrigin[k]);
            return;
        }
        for (int w = keyWaitStart[k], e = keyWaitEnd[k]; w < e; w++) {
            int idx = wait[w];
            addHashed(itemPos[idx] + 1, itemOrigin[idx]);
        }
    }

    private int findKey(int set, int nt) {
        int lo = setKeyStart[set];
        int hi = setKeyEnd[set] - 1;
        while (lo <= hi) {
            int mid = (lo + hi) >>> 1;
            int v = keyNt[mid];
            if (v < nt) {
                lo = mid + 1;
            } else if (v > nt) {
                hi = mid - 1;
            } else {
                return mid;
            }
        }
        return -1;
    }

    private void addPredicted(int pos) {
        if (posStamp[pos] != gen) {
            posStamp[pos] = gen;
            append(pos, cur);
        }
    }

    private void addHashed(int pos, int origin) {
        long key = ((long) pos << 32) | origin;
        int m = hashKey.length - 1;
        int h = mix(key) & m;
        while (hashStamp[h] == gen) {
            if (hashKey[h] == key) {
                return;
            }
            h = (h + 1) & m;
        }
        hashStamp[h] = gen;
        hashKey[h] = key;
        append(pos, origin);
        if (++hashCount * 2 > hashKey.length) {
            growHash();
        }
    }

    private boolean containsHashed(int pos, int origin) {
        long key = ((long) pos << 32) | origin;
        int m = hashKey.length - 1;
        int h = mix(key) & m;
        while (hashStamp[h] == gen) {
            if (hashKey[h] == key) {
                return true;
            }
            h = (h + 1) & m;
        }
        return false;
    }

    private static int mix(long key) {
        long h = key * 0x9E3779B97F4A7C15L;
        return (int) (h ^ (h >>> 29));
    }

    private void growHash() {
        long[] oldKey = hashKey;
        int[] oldStamp = hashStamp;
        hashKey = new long[oldKey.length * 2];
        hashStamp = new int[oldKey.length * 2];
        int m = hashKey.length - 1;
        for (int i = 0; i < oldKey.length; i++) {
            if (oldStamp[i] == gen) {
                int h = mix(oldKey[i]) & m;
                while (hashStamp[h] == gen) {
                    h = (h + 1) & m;
                }
                hashStamp[h] = gen;
                hashKey[h] = oldKey[i];
            }
        }
    }

    private void append(int pos, int origin) {
        if (items == itemPos.length) {
            if (items >= maxItems) {
                throw new EarleyLimitException(maxItems, Math.max(0, cur - 1));
            }
            int cap = (int) Math.min(maxItems, (long) items * 2);
            itemPos = Arrays.copyOf(itemPos, cap);
            itemOrigin = Arrays.copyOf(itemOrigin, cap);
        }
        itemPos[items] = pos;
        itemOrigin[items] = origin;
        items++;
    }

    private void ensureSetCapacity(int n) {
        if (n >= setItemStart.length) {
            int cap = Math.max(n + 1, setItemStart.length * 2);
            input = Arrays.copyOf(input, cap);
            setItemStart = Arrays.copyOf(setItemStart, cap + 1);
            setKeyStart = Arrays.copyOf(setKeyStart, cap + 1);
            setKeyEnd = Arrays.copyOf(setKeyEnd, cap + 1);
            setWaitEnd = Arrays.copyOf(setWaitEnd, cap + 1);
            setScanStart = Arrays.copyOf(setScanStart, cap + 1);
            setScanEnd = Arrays.copyOf(setScanEnd, cap + 1);
            setAccept = Arrays.copyOf(setAccept, cap + 1);
        }
    }

    /** Builds the per-set index: items by nonterminal after the dot, Leo items, scan list, acceptance. */
    private void index(int start) {
        int[] rhs = g.rhs;
        int end = items;
        int nTouched = 0;
        int nScan = 0;
        for (int j = start; j < end; j++) {
            int sym = rhs[itemPos[j]];
            if (sym >= 0) {
                if (ntCount[sym]++ == 0) {
                    touched[nTouched++] = sym;
                }
            } else if (sym != END) {
                nScan++;
            }
        }
        Arrays.sort(touched, 0, nTouched);
        int needWait = waits + (end - start - nScan);
        if (needWait > wait.length) {
            wait = Arrays.copyOf(wait, Math.max(needWait, wait.length * 2));
        }
        if (scans + nScan > scan.length) {
            scan = Arrays.copyOf(scan, Math.max(scans + nScan, scan.length * 2));
        }
        if (keys + nTouched > keyNt.length) {
            int cap = Math.max(keys + nTouched, keyNt.length * 2);
            keyNt = Arrays.copyOf(keyNt, cap);
            keyWaitStart = Arrays.copyOf(keyWaitStart, cap);
            keyWaitEnd = Arrays.copyOf(keyWaitEnd, cap);
            leoPos = Arrays.copyOf(leoPos, cap);
            leoOrigin = Arrays.copyOf(leoOrigin, cap);
        }
        int set = cur;
        setKeyStart[set] = keys;
        int at = waits;
        for (int i = 0; i < nTouched; i++) {
            int nt = touched[i];
            int k = keys + i;
            keyNt[k] = nt;
            keyWaitStart[k] = at;
            keyWaitEnd[k] = at; // filled below
            at += ntCount[nt];
            ntCount[nt] = k; // reuse: nonterminal -> key while filling
        }
        setScanStart[set] = scans;
        for (int j = start; j < end; j++) {
            int sym = rhs[itemPos[j]];
            if (sym >= 0) {
                int k = ntCount[sym];
                wait[keyWaitEnd[k]++] = j;
            } else if (sym != END) {
                scan[scans++] = j;
            }
        }
        for (int i = 0; i < nTouched; i++) {
            ntCount[touched[i]] = 0;
        }
        keys += nTouched;
        waits = at;
        setKeyEnd[set] = keys;
        setWaitEnd[set] = waits;
        setScanEnd[set] = scans;
        // Leo items: a key with exactly one waiting item, whose nonterminal is the last symbol
        for (int k = setKeyStart[set]; k < keys; k++) {
            leoPos[k] = -1;
            if (keyWaitEnd[k] - keyWaitStart[k] != 1) {
                continue;
            }
            int idx = wait[keyWaitStart[k]];
            int pos = itemPos[idx];
            int o = itemOrigin[idx];
            if (rhs[pos + 1] != END || o == set) {
                continue;
            }
            int k2 = findKey(o, g.prodLhs[g.posProd[pos]]);
            if (k2 >= 0 && leoPos[k2] >= 0) {
                leoPos[k] = leoPos[k2];
                leoOrigin[k] = leoOrigin[k2];
            } else {
                leoPos[k] = pos + 1;
                leoOrigin[k] = o;
            }
        }
        boolean acc;
        if (g.acceptPos < 0) {
            acc = false;
        } else if (set == 0) {
            acc = posStamp[g.acceptPos] == gen;
        } else {
            acc = containsHashed(g.acceptPos, 0);
        }
        setAccept[set] = acc;
    }

    // ---- access for the forest builder (same package) ----

    int setStart(int set) {
        return setItemStart[set];
    }

    int setEnd(int set) {
        return set == len ? items : setItemStart[set + 1];
    }

    int pos(int item) {
        return itemPos[item];
    }

    int origin(int item) {
        return itemOrigin[item];
    }
}
