package dev.espalier.schema;

import dk.brics.automaton.Automaton;

/** Regular languages given as automata, written back as grammar rules. */
public final class RegularRules {
    private RegularRules() {
    }

    /**
     * Right-linear rules (one per state) for the language of an automaton over code points as built
     * by {@link dev.espalier.automaton.CharAutomata} (UTF-16 code units, surrogate pairs for
     * supplementary characters).
     *
     * @param prefix prefix of every helper rule name
     */
    public static RegularFragment of(String prefix, Automaton automaton) {
        throw new UnsupportedOperationException("not yet written");
    }
}
