package dev.espalier.library;

import dev.espalier.automaton.CharAutomata;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import dk.brics.automaton.Automaton;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.Map;
import java.util.Optional;

/**
 * The one place where the library tests decide whether a grammar accepts an input.
 *
 * <p>{@link #accepts(Grammar, byte[])} asks the product: the Earley recognizer
 * ({@link EarleyGrammar}), fed byte by byte. {@link #referenceAccepts(Grammar, byte[])} is its
 * independent twin: a dk.brics automaton compiled with {@link CharAutomata} for regular grammars,
 * and the slow {@link ReferenceRecognizer} for recursive ones (which gives up on inputs nesting
 * deeper than {@link ReferenceRecognizer#MAX_DEPTH}, throwing {@link ReferenceRecognizer.TooDeep}).
 */
final class LibraryHarness {

    /** Generous: the largest library grammar (URI) needs a few hundred states. */
    static final int STATE_LIMIT = 200_000;

    private static final Map<Grammar, Optional<Automaton>> COMPILED = Collections.synchronizedMap(new IdentityHashMap<>());

    private LibraryHarness() {
    }

    /** Whether the grammar is regular: it compiles to an automaton (no rule is recursive). */
    static boolean isRegular(Grammar g) {
        return automaton(g).isPresent();
    }

    /**
     * Whether the bytes, read as UTF-8, are a sentence of the grammar's start rule. Malformed UTF-8
     * is never accepted: grammars describe Unicode text, matched as UTF-8.
     *
     */
    static boolean accepts(Grammar g, byte[] input) {
        EarleyChart chart = EARLEY.computeIfAbsent(g, EarleyGrammar::compile).newChart();
        return chart.feedAll(input) == input.length && chart.accepts();
    }

    private static final Map<Grammar, EarleyGrammar> EARLEY = Collections.synchronizedMap(new IdentityHashMap<>());

    /**
     * The independent reference's verdict (automaton or {@link ReferenceRecognizer}).
     *
     * @throws ReferenceRecognizer.TooDeep if a recursive grammar meets input nesting too deeply
     */
    static boolean referenceAccepts(Grammar g, byte[] input) {
        String text = utf8(input);
        if (text == null) {
            return false;
        }
        Optional<Automaton> a = automaton(g);
        return a.isPresent() ? a.get().run(text) : ReferenceRecognizer.accepts(g, text);
    }

    /** The automaton of a regular grammar's start rule. */
    static Optional<Automaton> automaton(Grammar g) {
        return COMPILED.computeIfAbsent(g, LibraryHarness::compile);
    }

    /** The strict UTF-8 decoding of the bytes, or null when they are not well-formed UTF-8. */
    static String utf8(byte[] input) {
        try {
            return StandardCharsets.UTF_8.newDecoder()
                    .onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT)
                    .decode(ByteBuffer.wrap(input)).toString();
        } catch (CharacterCodingException e) {
            return null;
        }
    }

    private static Optional<Automaton> compile(Grammar g) {
        try {
            return Optional.of(CharAutomata.compile(new Expr.Ref(g.start(), Span.NONE),
                    name -> g.rule(name).map(Rule::body).orElse(null), STATE_LIMIT));
        } catch (IllegalArgumentException e) { // "rule X is recursive"
            return Optional.empty();
        }
    }
}
