package dev.espalier.mask;

import dev.espalier.earley.ByteChart;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;

/** A constraint whose cursors hold a parser chart; subclasses decide how a mask is filled. */
abstract class ChartConstraint implements Constraint {

    final Vocabulary vocabulary;
    final VocabularyTrie trie;

    ChartConstraint(Vocabulary vocabulary) {
        this.vocabulary = vocabulary;
        this.trie = vocabulary.trie();
    }

    @Override
    public final Vocabulary vocabulary() {
        return vocabulary;
    }

    @Override
    public final Cursor start() {
        return new ChartCursor(this, newChart());
    }

    private static final ThreadLocal<long[]> EXPECTED = ThreadLocal.withInitial(() -> new long[4]);

    /** A per-thread four-word byte set, so that filling a mask does not allocate. */
    static long[] expectedScratch() {
        return EXPECTED.get();
    }

    /** A chart at the start of the input. */
    abstract ByteChart newChart();

    /**
     * Sets in {@code mask} (already cleared) the bit of every ordinary token whose bytes the chart can
     * take from where it stands; end of sequence is the caller's. The chart is left as it was.
     */
    abstract void fill(ByteChart chart, long[] mask);

    /**
     * Walks the trie nodes {@code from+1 .. to-1} (a subtree below node {@code from}, or the whole
     * trie when {@code from} is 0) feeding each edge's byte to the chart and undoing on the way back,
     * pruning a subtree at its first refused byte; marks the tokens of every node reached.
     * {@code first} is the chart's expected byte set (see {@link ByteChart#expectedBytes}): bytes
     * right below {@code from} outside it are skipped without feeding.
     */
    final void walk(ByteChart chart, int from, int to, long[] first, long[] mask) {
        VocabularyTrie t = trie;
        int base = chart.depth();
        int baseDepth = t.depth(from);
        int i = from + 1;
        try {
            while (i < to) {
                int rel = t.depth(i) - baseDepth;
                int excess = chart.depth() - (base + rel - 1);
                if (excess > 0) {
                    chart.undo(excess);
                }
                int b = t.label(i) & 0xFF;
                // the first byte below the start is checked against the expected set without feeding
                if ((rel == 1 && (first[b >>> 6] & (1L << b)) == 0) || !chart.feed(b)) {
                    i = t.skip(i);
                    continue;
                }
                for (int k = t.tokensFrom(i), end = t.tokensTo(i); k < end; k++) {
                    int id = t.tokenAt(k);
                    mask[id >>> 6] |= 1L << id;
                }
                i++;
            }
        } finally {
            chart.undo(chart.depth() - base);
        }
    }
}
