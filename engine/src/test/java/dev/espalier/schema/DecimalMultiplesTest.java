package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dk.brics.automaton.Automaton;
import java.math.BigDecimal;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The automaton of multiples of a decimal step, exhaustively against BigDecimal arithmetic. */
class DecimalMultiplesTest {

    @ParameterizedTest
    @ValueSource(strings = {"0.25", "1.5", "0.3", "2.5", "0.07", "0.125", "12.5"})
    void agreesWithRemainderOnEveryValueOfARange(String stepText) {
        BigDecimal step = new BigDecimal(stepText);
        Automaton a = SchemaCompiler.multiples(step);
        int agreed = 0;
        // every value k / 1000 in [-10, 10], in canonical text (JsonText.number)
        for (int k = -10_000; k <= 10_000; k++) {
            BigDecimal v = BigDecimal.valueOf(k, 3);
            String text = JsonText.number(v);
            boolean expected = v.remainder(step).signum() == 0;
            assertEquals(expected, a.run(text), text + " multiple of " + step);
            agreed++;
        }
        assertEquals(20_001, agreed);
        // non-canonical spellings of multiples are in the language too (the compiler intersects it with the canonical form)
        assertEquals(true, a.run(JsonText.number(step.multiply(BigDecimal.valueOf(7)))));
    }
}
