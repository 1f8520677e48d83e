package dev.espalier.schema;

import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.util.ArrayList;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;

/**
 * A deterministic automaton over UTF-16 code units as plain arrays: what {@link StringLengths}
 * makes and {@link RegularRules} reads, without dk.brics states in between.
 *
 * @param start  the start state, or -1 for the empty language (then there are no states)
 * @param steps  per state, its steps as (lo, hi, target) triples, ascending and disjoint
 * @param accept per state, whether it accepts
 */
record UnitDfa(int start, int[][] steps, boolean[] accept) {

    /** The empty language. */
    static final UnitDfa EMPTY = new UnitDfa(-1, new int[0][], new boolean[0]);

    /** Number of states. */
    int size() {
        return accept.length;
    }

    /** Whether no string is accepted (trimmed automata only: otherwise whether there is no state). */
    boolean isEmpty() {
        return start < 0;
    }

    /**
     * The arrays of a deterministic dk.brics automaton: states numbered breadth first from the
     * initial state, each state's steps in ascending order.
     */
    static UnitDfa of(Automaton deterministic) {
        if (!deterministic.isDeterministic()) {
            throw new IllegalArgumentException("the automaton is not deterministic");
        }
        Map<State, Integer> id = new IdentityHashMap<>();
        List<State> order = new ArrayList<>();
        id.put(deterministic.getInitialState(), 0);
        order.add(deterministic.getInitialState());
        List<int[]> steps = new ArrayList<>();
        for (int head = 0; head < order.size(); head++) {
            List<Transition> ts = order.get(head).getSortedTransitions(false);
            int[] st = new int[3 * ts.size()];
            int k = 0;
            for (Transition t : ts) {
                Integer to = id.get(t.getDest());
                if (to == null) {
                    to = order.size();
                    id.put(t.getDest(), to);
                    order.add(t.getDest());
                }
                st[k++] = t.getMin();
                st[k++] = t.getMax();
                st[k++] = to;
            }
            steps.add(st);
        }
        boolean[] accept = new boolean[order.size()];
        for (int i = 0; i < accept.length; i++) {
            accept[i] = order.get(i).isAccept();
        }
        return new UnitDfa(0, steps.toArray(int[][]::new), accept);
    }

    /** The same automaton as dk.brics states (marked deterministic). */
    Automaton toAutomaton() {
        if (isEmpty()) {
            return Automaton.makeEmpty();
        }
        State[] made = new State[size()];
        for (int k = 0; k < made.length; k++) {
            made[k] = new State();
            made[k].setAccept(accept[k]);
        }
        for (int k = 0; k < made.length; k++) {
            int[] st = steps[k];
            for (int i = 0; i < st.length; i += 3) {
                made[k].addTransition(new Transition((char) st[i], (char) st[i + 1], made[st[i + 2]]));
            }
        }
        Automaton out = new Automaton();
        out.setInitialState(made[start]);
        out.setDeterministic(true);
        return out;
    }
}
