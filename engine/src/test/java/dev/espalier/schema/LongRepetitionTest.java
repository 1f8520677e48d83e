package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Expr;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Counts above the single-repetition limit, written as nested blocks, keep their language. */
class LongRepetitionTest {

    @ParameterizedTest(name = "{0}..{1}")
    @CsvSource({"0, 2100", "1500, 2600", "2001, -1", "999, 1001", "0, 1000"})
    void sameCountsAsOneRepetition(int min, int max) {
        Expr e = SchemaCompiler.rep(Expr.text("a"), min, max < 0 ? Expr.UNBOUNDED : max);
        Automaton a = CharAutomata.compile(e, null, 20_000);
        // the minimal automaton is deterministic: step it one 'a' at a time
        State state = a.getInitialState();
        for (int k = 0; k <= 2_700; k++) {
            boolean expected = k >= min && (max < 0 || k <= max);
            assertEquals(expected, state != null && state.isAccept(), "length " + k);
            state = state == null ? null : state.step('a');
        }
    }
}
