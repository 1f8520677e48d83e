package dev.espalier.schema;

import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.CodePointSet;
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

/**
 * A string language cut to a length range in code points ({@code minLength}/{@code maxLength}), as a
 * minimal deterministic automaton over well-formed UTF-16.
 *
 * <p>The product of the language's automaton with a counter of code points is built breadth-first
 * over (state, count, inside a surrogate pair). With an upper bound every step of a code point raises
 * the count, so the product is acyclic and is minimised bottom-up in one pass, from the highest count
 * down, by merging states with equal acceptance and equal steps (Revuz's method for acyclic
 * automata); no general minimisation runs over the large product. Without an upper bound the count
 * stops at the lower bound and dk.brics minimises the (small) product. The slow twin,
 * {@link #byIntersection}, intersects with a repetition of any code point and minimises.
 */
final class StringLengths {

    private static final int DEAD = -1;

    /** Most product states visited before giving up, whatever the state limit. */
    static final long PRODUCT_LIMIT = 4_000_000;

    private StringLengths() {
    }

    /**
     * The strings of {@code language} with between {@code min} and {@code max} code points
     * ({@code max < 0}: no upper bound), minimal and deterministic; lone surrogates are dropped.
     *
     * @throws AutomatonTooLargeException when the result would have more than {@code stateLimit} states
     */
    static Automaton bounded(Automaton language, int min, int max, int stateLimit) {
        return units(language, min, max, stateLimit).toAutomaton();
    }

    /**
     * As {@link #bounded}, as arrays ({@link UnitDfa}): with an upper bound the product is made
     * as arrays and stays so; without one, dk.brics minimises it and it is read into arrays.
     */
    static UnitDfa units(Automaton language, int min, int max, int stateLimit) {
        Automaton a = language;
        if (!a.isDeterministic()) {
            a = a.clone();
            a.determinize();
        }
        List<State> states = new ArrayList<>();
        Map<State, Integer> index = new IdentityHashMap<>();
        ArrayDeque<State> work = new ArrayDeque<>();
        index.put(a.getInitialState(), 0);
        states.add(a.getInitialState());
        work.add(a.getInitialState());
        while (!work.isEmpty()) {
            for (Transition t : work.poll().getTransitions()) {
                if (index.putIfAbsent(t.getDest(), states.size()) == null) {
                    states.add(t.getDest());
                    work.add(t.getDest());
                }
            }
        }
        Transition[][] steps = new Transition[states.size()][];
        for (int q = 0; q < states.size(); q++) {
            steps[q] = states.get(q).getSortedTransitions(false).toArray(new Transition[0]);
        }
        if (max >= 0) {
            return acyclic(states, index, steps, min, max, stateLimit); // stops at stateLimit states itself
        }
        Automaton out = cyclic(states, index, steps, min, stateLimit);
        if (out.getNumberOfStates() > stateLimit) {
            throw new AutomatonTooLargeException(stateLimit);
        }
        return out.isEmpty() ? UnitDfa.EMPTY : UnitDfa.of(out);
    }

    /** The slow twin: intersection with {@code min..max} code points, minimised by dk.brics. */
    static Automaton byIntersection(Automaton language, int min, int max, int stateLimit) {
        Automaton lengths = CharAutomata.compile(Expr.repeat(Expr.chars(CodePointSet.ALL), min,
                max < 0 ? Expr.UNBOUNDED : max), null, stateLimit);
        Automaton a = lengths.intersection(language);
        a.minimize();
        return a;
    }

    /** The steps of one code unit range from a product state: a target product state per part. */
    private interface Steps {
        void step(int lo, int hi, int q, int count, boolean pending);
    }

    /**
     * Splits a transition's range by what it does to the count: outside a surrogate pair a BMP
     * character adds one and a high surrogate opens a pair; inside a pair only a low surrogate may
     * follow, and it adds one.
     */
    private static void split(Transition t, int q, int count, boolean pending, Steps out) {
        int lo = t.getMin();
        int hi = t.getMax();
        if (pending) {
            clip(lo, hi, 0xDC00, 0xDFFF, q, count + 1, false, out);
        } else {
            clip(lo, hi, 0, 0xD7FF, q, count + 1, false, out);
            clip(lo, hi, 0xD800, 0xDBFF, q, count, true, out);
            clip(lo, hi, 0xE000, 0xFFFF, q, count + 1, false, out);
        }
    }

    private static void clip(int lo, int hi, int from, int to, int q, int count, boolean pending, Steps out) {
        int l = Math.max(lo, from);
        int h = Math.min(hi, to);
        if (l <= h) {
            out.step(l, h, q, count, pending);
        }
    }

    private static UnitDfa acyclic(List<State> states, Map<State, Integer> index, Transition[][] steps,
            int min, int max, int stateLimit) {
        int n = states.size();
        long size = (long) n * ((long) max + 1) * 2;
        if (size > PRODUCT_LIMIT) {
            throw new AutomatonTooLargeException(stateLimit,
                    "a string length bound of " + max + " over an automaton of " + n + " states exceeds the product limit");
        }
        // each step's target numbered once
        int[][] dests = new int[n][];
        for (int q = 0; q < n; q++) {
            dests[q] = new int[steps[q].length];
            for (int k = 0; k < steps[q].length; k++) {
                dests[q][k] = index.get(steps[q][k].getDest());
            }
        }
        // product state (q, c, p) is ((c * 2) + p) * n + q; breadth first
        Reach reach = new Reach(n, max, (int) size);
        reach.add(0);
        for (int head = 0; head < reach.tail; head++) {
            int id = reach.queue[head];
            int q = id % n;
            int c = id / n / 2;
            boolean p = (id / n) % 2 == 1;
            for (int k = 0; k < steps[q].length; k++) {
                split(steps[q][k], dests[q][k], c, p, reach);
            }
        }
        boolean[] reached = reach.reached;
        int[] cls = new int[(int) size];
        Classes classes = new Classes();
        Row row = new Row(cls, n, max);
        for (int c = max; c >= 0; c--) {
            for (int p = 1; p >= 0; p--) {
                for (int q = 0; q < n; q++) {
                    int id = (c * 2 + p) * n + q;
                    if (!reached[id]) {
                        continue;
                    }
                    row.len = 0;
                    for (int j = 0; j < steps[q].length; j++) {
                        split(steps[q][j], dests[q][j], c, p == 1, row);
                    }
                    boolean accept = p == 0 && c >= min && states.get(q).isAccept();
                    if (row.len == 0 && !accept) {
                        cls[id] = DEAD;
                        continue;
                    }
                    int known = classes.find(accept, row.buf, row.len);
                    if (known < 0) {
                        if (classes.count >= stateLimit) {
                            throw new AutomatonTooLargeException(stateLimit);
                        }
                        known = classes.add(accept, Arrays.copyOf(row.buf, row.len));
                    }
                    cls[id] = known;
                }
            }
        }
        if (cls[0] == DEAD) {
            return UnitDfa.EMPTY;
        }
        boolean[] accept = Arrays.copyOf(classes.accept, classes.count);
        return new UnitDfa(cls[0], Arrays.copyOf(classes.steps, classes.count), accept);
    }

    private static Automaton cyclic(List<State> states, Map<State, Integer> index, Transition[][] steps,
            int min, int stateLimit) {
        int n = states.size();
        Map<Integer, State> made = new HashMap<>();
        ArrayDeque<Integer> work = new ArrayDeque<>();
        made.put(0, new State());
        work.add(0);
        while (!work.isEmpty()) {
            int id = work.poll();
            int q = id % n;
            int c = id / n / 2;
            boolean p = (id / n) % 2 == 1;
            State s = made.get(id);
            s.setAccept(!p && c >= min && states.get(q).isAccept());
            for (Transition t : steps[q]) {
                int dest = index.get(t.getDest());
                split(t, dest, c, p, (lo, hi, tq, tc, tp) -> {
                    int tid = (Math.min(tc, min) * 2 + (tp ? 1 : 0)) * n + tq;
                    State target = made.get(tid);
                    if (target == null) {
                        if (made.size() >= (long) stateLimit * CharAutomata.NFA_FACTOR) {
                            throw new AutomatonTooLargeException(stateLimit);
                        }
                        target = new State();
                        made.put(tid, target);
                        work.add(tid);
                    }
                    s.addTransition(new Transition((char) lo, (char) hi, target));
                });
            }
        }
        Automaton out = new Automaton();
        out.setInitialState(made.get(0));
        out.setDeterministic(true);
        out.minimize();
        return out;
    }

    /** The product states reached, breadth first: each step's target queued on first sight. */
    private static final class Reach implements Steps {
        final boolean[] reached;
        int[] queue = new int[64];
        int tail;
        private final int n;
        private final int max;

        Reach(int n, int max, int size) {
            this.n = n;
            this.max = max;
            this.reached = new boolean[size];
        }

        void add(int id) {
            reached[id] = true;
            if (tail == queue.length) {
                queue = Arrays.copyOf(queue, 2 * tail);
            }
            queue[tail++] = id;
        }

        @Override
        public void step(int lo, int hi, int q, int count, boolean pending) {
            if (count <= max) {
                int id = (count * 2 + (pending ? 1 : 0)) * n + q;
                if (!reached[id]) {
                    add(id);
                }
            }
        }
    }

    /** The steps of one product state as (lo, hi, target class) triples, adjacent ranges to one class merged. */
    private static final class Row implements Steps {
        private final int[] cls;
        private final int n;
        private final int max;
        int[] buf = new int[64];
        int len;

        Row(int[] cls, int n, int max) {
            this.cls = cls;
            this.n = n;
            this.max = max;
        }

        @Override
        public void step(int lo, int hi, int q, int count, boolean pending) {
            if (count > max) {
                return;
            }
            int target = cls[(count * 2 + (pending ? 1 : 0)) * n + q];
            if (target == DEAD) {
                return;
            }
            if (len >= 3 && buf[len - 1] == target && buf[len - 2] + 1 == lo) {
                buf[len - 2] = hi; // adjacent range to the same class: merged
                return;
            }
            if (len + 3 > buf.length) {
                buf = Arrays.copyOf(buf, buf.length * 2);
            }
            buf[len] = lo;
            buf[len + 1] = hi;
            buf[len + 2] = target;
            len += 3;
        }
    }

    /**
     * The classes of equal product states found so far (acceptance and steps: lo, hi, target class
     * triples, ascending), in an open-addressing table keyed by their content: a product state's
     * row is looked up without being copied, and copied only when it is new.
     */
    private static final class Classes {
        int[][] steps = new int[64][];
        boolean[] accept = new boolean[64];
        int[] hashes = new int[64];
        int count;
        private int[] table = filled(128);

        private static int[] filled(int size) {
            int[] t = new int[size];
            Arrays.fill(t, -1);
            return t;
        }

        private static int hash(boolean accept, int[] buf, int len) {
            int h = accept ? 0x9E3779B9 : 0x7F4A7C15;
            for (int i = 0; i < len; i++) {
                h = Integer.rotateLeft((h ^ buf[i]) * 0x85EBCA6B, 13);
            }
            return h ^ (h >>> 16);
        }

        /** The class of a row, or -1. */
        int find(boolean acc, int[] buf, int len) {
            int h = hash(acc, buf, len);
            int mask = table.length - 1;
            for (int i = h & mask; ; i = (i + 1) & mask) {
                int k = table[i];
                if (k < 0) {
                    return -1;
                }
                if (hashes[k] == h && accept[k] == acc && Arrays.equals(steps[k], 0, steps[k].length, buf, 0, len)) {
                    return k;
                }
            }
        }

        /** Adds a new class (not found before); returns its number. */
        int add(boolean acc, int[] row) {
            if (count == steps.length) {
                steps = Arrays.copyOf(steps, 2 * count);
                accept = Arrays.copyOf(accept, 2 * count);
                hashes = Arrays.copyOf(hashes, 2 * count);
            }
            int k = count++;
            steps[k] = row;
            accept[k] = acc;
            hashes[k] = hash(acc, row, row.length);
            if (2 * count > table.length) {
                table = filled(2 * table.length);
                for (int j = 0; j < count; j++) {
                    place(j);
                }
            } else {
                place(k);
            }
            return k;
        }

        private void place(int k) {
            int mask = table.length - 1;
            int i = hashes[k] & mask;
            while (table[i] >= 0) {
                i = (i + 1) & mask;
            }
            table[i] = k;
        }
    }
}
