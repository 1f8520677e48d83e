package dev.espalier.mask;

import dev.espalier.earley.ByteChart;
import dev.espalier.earley.EarleyGrammar;
import dev.espalier.vocab.Vocabulary;

/**
 * A context-free constraint by the plain method: masks by walking the whole vocabulary trie alongside
 * a byte-level Earley chart, feeding one byte per trie edge and undoing it on the way back, pruning a
 * subtree at its first refused byte. Exact by construction and cache-free; the slow twin of
 * {@link SplitConstraint}, used when a grammar cannot be split.
 */
final class EarleyConstraint extends ChartConstraint {

    final EarleyGrammar grammar;
    final long maxItems;

    EarleyConstraint(EarleyGrammar grammar, Vocabulary vocabulary, MaskSettings settings) {
        super(vocabulary);
        if (grammar.isEmptyLanguage()) {
            throw new IllegalArgumentException("the grammar's language is empty: no output can satisfy it");
        }
        this.grammar = grammar;
        this.maxItems = settings.parserItemLimit();
    }

    @Override
    ByteChart newChart() {
        return grammar.newChart(maxItems, true);
    }

    @Override
    void fill(ByteChart chart, long[] mask) {
        long[] first = expectedScratch();
        chart.expectedBytes(first);
        walk(chart, 0, trie.nodeCount(), first, mask);
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
        return "Earley parser over bytes, " + grammar.nonterminalCount() + " nonterminals, "
                + grammar.productionCount() + " productions";
    }
}
