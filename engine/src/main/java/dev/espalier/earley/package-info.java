/**
 * The syntactic layer of the mask engine: the grammar IR lowered to byte productions
 * ({@link dev.espalier.earley.EarleyGrammar}), an Earley recognizer fed one byte at a time with
 * constant-time undo ({@link dev.espalier.earley.EarleyChart}), and shared packed parse forests for
 * parse counts, parse trees and ambiguity reports ({@link dev.espalier.earley.ParseForest}).
 *
 * <p>Methods: Earley (1970); nullable symbols as Aycock and Horspool (2002); right recursion as Leo
 * (1991); forests after Scott (2008). Limits: repetition bounds up to
 * {@value dev.espalier.earley.EarleyGrammar#MAX_REPEAT}; at most
 * {@value dev.espalier.earley.EarleyGrammar#DEFAULT_MAX_ITEMS} items per chart by default
 * ({@link dev.espalier.earley.EarleyLimitException} beyond). Nothing here recurses in proportion to
 * the grammar or the input.
 */
package dev.espalier.earley;
