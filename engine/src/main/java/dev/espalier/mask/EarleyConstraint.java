package dev.espalier.mask;

import dev.espalier.earley.EarleyGrammar;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;

/**
 * A constraint whose language is context-free: masks by walking the vocabulary trie alongside an
 * Earley chart, feeding one byte per trie edge and undoing it on the way back, pruning a whole
 * subtree at its first refused byte. Exact by construction; nothing is cached between steps.
 */
final class EarleyConstraint implements Constraint {

    final EarleyGrammar grammar;
    final Vocabulary vocabulary;
    final VocabularyTrie trie;
    final long maxItems;

    EarleyConstraint(EarleyGrammar grammar, Vocabulary vocabulary, MaskSettings settings) {
        if (grammar.isEmptyLanguage()) {
            throw new IllegalArgumentException("the grammar's language is empty: no output can satisfy it");
        }
        this.grammar = grammar;
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
        this.maxItems = settings.parserItemLimit();
    }

    @Override
    public Vocabulary vocabulary() {
        return vocabulary;
    }

    @Override
    public Cursor start() {
        return new EarleyCursor(this, grammar.newChart(maxItems, true));
    }

    @Override
    public long cacheBytes() {
        return 0;
    }

    @Override
    public int cachedMasks() {
        return 0;
    }

    @Override
    public String describe() {
        return "Earley parser, " + grammar.nonterminalCount() + " nonterminals, " + grammar.productionCount()
                + " productions, " + grammar.byteClassCount() + " byte classes";
    }
}
