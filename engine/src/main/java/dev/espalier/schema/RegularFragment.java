package dev.espalier.schema;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import java.util.List;

/**
 * A regular language as a grammar piece: a body expression that may refer to helper rules (for
 * instance right-linear rules of an automaton). Helper rule names all start with the prefix the
 * fragment was made with, so fragments with distinct prefixes never collide.
 *
 * @param body  the language
 * @param rules helper rules the body refers to (possibly none)
 */
public record RegularFragment(Expr body, List<Rule> rules) {
    public RegularFragment {
        rules = List.copyOf(rules);
    }
}
