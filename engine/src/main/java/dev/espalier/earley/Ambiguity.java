package dev.espalier.earley;

import java.util.Objects;

/**
 * A string with two different derivations, found by
 * {@link ParseForest#findAmbiguity(EarleyGrammar, int, java.time.Duration)}.
 *
 * @param text   the ambiguous input (UTF-8 decoded; malformed bytes become U+FFFD)
 * @param first  one derivation
 * @param second another derivation (its rendering may look the same when the two differ only in
 *               which of two identical alternatives was taken)
 */
public record Ambiguity(String text, ParseTree first, ParseTree second) {
    /** Checks that nothing is null. */
    public Ambiguity {
        Objects.requireNonNull(text);
        Objects.requireNonNull(first);
        Objects.requireNonNull(second);
    }
}
