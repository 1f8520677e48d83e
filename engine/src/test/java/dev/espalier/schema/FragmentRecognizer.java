package dev.espalier.schema;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dk.brics.automaton.Automaton;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Predicate;

/**
 * Membership in the language of a {@link RegularFragment}, decided through the engine: a fragment
 * without recursion is compiled by {@link CharAutomata}; one with right-linear rules is recognised
 * by the Earley chart over its UTF-8 bytes. Both are independent of how the fragment was built.
 */
final class FragmentRecognizer implements Predicate<String> {

    static final String START = "fragment-start";

    private final Automaton automaton;
    private final EarleyChart chart;

    private FragmentRecognizer(Automaton automaton, EarleyChart chart) {
        this.automaton = automaton;
        this.chart = chart;
    }

    /** The fragment as a grammar whose start rule {@value #START} is the fragment's body. */
    static Grammar grammar(RegularFragment f) {
        List<Rule> rules = new ArrayList<>();
        rules.add(Rule.of(START, f.body()));
        rules.addAll(f.rules());
        return Grammar.of(rules, START);
    }

    /**
     * The automaton recognizer when the fragment is one expression, else the Earley one (helper
     * rules are copied at every reference by CharAutomata, which is slow for the shared states of
     * large automata).
     */
    static FragmentRecognizer of(RegularFragment f) {
        if (!f.rules().isEmpty()) {
            return earley(f);
        }
        return new FragmentRecognizer(CharAutomata.compile(f.body(), null, 1_000_000), null);
    }

    /** The Earley recognizer, whatever the fragment's shape. */
    static FragmentRecognizer earley(RegularFragment f) {
        return new FragmentRecognizer(null, EarleyGrammar.compile(grammar(f)).newChart());
    }

    boolean usesAutomaton() {
        return automaton != null;
    }

    @Override
    public boolean test(String s) {
        if (automaton != null) {
            return automaton.run(s);
        }
        byte[] bytes = s.getBytes(StandardCharsets.UTF_8);
        chart.undo(chart.length());
        return chart.feedAll(bytes) == bytes.length && chart.accepts();
    }
}
