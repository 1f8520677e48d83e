package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.earley.SplitGrammar;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.regex.RegexSyntax;
import dev.espalier.vocab.Vocabulary;

/**
 * A language compiled against a vocabulary: the immutable, thread-safe source of token masks. One
 * constraint serves any number of sequences, each through its own {@link Cursor}.
 */
public interface Constraint {

    /** The vocabulary masks are over. */
    Vocabulary vocabulary();

    /** A cursor at the start of a new output. */
    Cursor start();

    /** Bytes currently held by mask caches. */
    long cacheBytes();

    /** Number of masks currently cached. */
    int cachedMasks();

    /** A short description of the compiled form, e.g. {@code byte DFA, 23 states, 7 byte classes}. */
    String describe();

    /**
     * A constraint over a byte automaton.
     *
     * @throws IllegalArgumentException when the automaton's language is empty
     */
    static Constraint of(ByteDfa dfa, Vocabulary vocabulary, MaskSettings settings) {
        return new DfaConstraint(dfa, vocabulary, settings);
    }

    /**
     * Compiles a regular expression (the syntax of JSON Schema's {@code pattern}, see
     * {@link RegexSyntax}) against a vocabulary with default settings. The whole output must match
     * the whole pattern.
     *
     * @throws dev.espalier.regex.RegexSyntaxException for an invalid or unsupported pattern
     * @throws dev.espalier.automaton.AutomatonTooLargeException when the automaton crosses its state limit
     * @throws IllegalArgumentException when no string matches the pattern
     */
    static Constraint regex(String pattern, Vocabulary vocabulary) {
        return regex(pattern, vocabulary, MaskSettings.defaults());
    }

    /** As {@link #regex(String, Vocabulary)}, with explicit settings. */
    static Constraint regex(String pattern, Vocabulary vocabulary, MaskSettings settings) {
        Expr expr = RegexSyntax.parse(pattern);
        ByteDfa dfa = ByteDfa.fromCharAutomaton(CharAutomata.compileUnminimized(expr, null, settings.stateLimit()),
                settings.stateLimit());
        if (dfa.isEmpty()) {
            throw new IllegalArgumentException("no string matches the pattern: its language is empty");
        }
        return of(dfa, vocabulary, settings);
    }

    /**
     * Compiles a grammar (from any front end) against a vocabulary with default settings. A grammar
     * whose start rule reaches no recursion compiles to a byte automaton (the fastest masks);
     * otherwise masks come from an Earley parser walked over the vocabulary trie. The language is
     * the same either way.
     *
     * @throws IllegalArgumentException when a rule is undefined or the language is empty
     */
    static Constraint grammar(Grammar grammar, Vocabulary vocabulary) {
        return grammar(grammar, vocabulary, MaskSettings.defaults());
    }

    /** As {@link #grammar(Grammar, Vocabulary)}, with explicit settings. */
    static Constraint grammar(Grammar grammar, Vocabulary vocabulary, MaskSettings settings) {
        if (grammar.rule(grammar.start()).isEmpty()) {
            throw new IllegalArgumentException("the start rule " + grammar.start() + " is not defined");
        }
        if (!GrammarShape.reachesRecursion(grammar)) {
            try {
                // subset construction makes hardly more states than the minimal automaton has (see
                // ByteDfa.fromExpr), so a grammar past twice the limit is given up early
                ByteDfa dfa = ByteDfa.fromExprUnminimized(Expr.ref(grammar.start()),
                        name -> grammar.rule(name).map(Rule::body).orElse(null), settings.stateLimit(),
                        (int) Math.min(Integer.MAX_VALUE, 2L * settings.stateLimit()));
                if (dfa.isEmpty()) {
                    throw new IllegalArgumentException("the grammar's language is empty: no output can satisfy it");
                }
                return of(dfa, vocabulary, settings);
            } catch (dev.espalier.automaton.AutomatonTooLargeException e) {
                // too large for an automaton: the parser handles it exactly, if more slowly
            }
        }
        try {
            return new SplitConstraint(SplitGrammar.compile(grammar, settings.stateLimit()), vocabulary, settings);
        } catch (dev.espalier.automaton.AutomatonTooLargeException e) {
            // a lexical part too large for an automaton: the byte-level parser handles it exactly, if more slowly
            return new EarleyConstraint(EarleyGrammar.compile(grammar), vocabulary, settings);
        }
    }
}
