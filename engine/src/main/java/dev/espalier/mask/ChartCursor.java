package dev.espalier.mask;

import dev.espalier.earley.ByteChart;
import dev.espalier.vocab.Vocabulary;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/** A cursor over a {@link ChartConstraint}: a parser chart plus the chart depth before each step. */
final class ChartCursor implements Cursor {

    /** Longest forced continuation reported, a guard against pathological grammars. */
    private static final int MAX_FORCED = 4096;

    private final ChartConstraint c;
    private final ByteChart chart;
    private int[] lengths;
    private int depth;
    private boolean finished;
    /** Step index at which end of sequence was fed, or -1. */
    private int finishedAt = -1;

    ChartCursor(ChartConstraint c, ByteChart chart) {
        this.c = c;
        this.chart = chart;
        this.lengths = new int[64];
    }

    private ChartCursor(ChartCursor o) {
        this.c = o.c;
        this.chart = o.chart.fork();
        this.lengths = o.lengths.clone();
        this.depth = o.depth;
        this.finished = o.finished;
        this.finishedAt = o.finishedAt;
    }

    @Override
    public Constraint constraint() {
        return c;
    }

    @Override
    public void fillMask(long[] mask) {
        Vocabulary v = c.vocabulary();
        Arrays.fill(mask, 0, v.maskWords(), 0L);
        if (finished) {
            return;
        }
        c.fill(chart, mask);
        int eos = v.endOfSequence();
        if (eos >= 0 && chart.accepts()) {
            mask[eos >>> 6] |= 1L << eos;
        }
    }

    @Override
    public boolean allows(int id) {
        Vocabulary v = c.vocabulary();
        if (finished || !v.has(id)) {
            return false;
        }
        if (id == v.endOfSequence()) {
            return chart.accepts();
        }
        if (v.isSpecial(id) || v.length(id) == 0) {
            return false;
        }
        int fed = 0;
        int len = v.length(id);
        try {
            while (fed < len && chart.feed(v.byteAt(id, fed) & 0xFF)) {
                fed++;
            }
            return fed == len;
        } finally {
            chart.undo(fed);
        }
    }

    @Override
    public void feed(int id) {
        if (!tryFeed(id)) {
            Vocabulary v = c.vocabulary();
            String what = v.has(id) ? "token " + id + " (" + v.display(id) + ")" : "token id " + id;
            throw new RejectedInputException(what + " is not allowed here; expected " + expected(), 0, expected());
        }
    }

    @Override
    public boolean tryFeed(int id) {
        if (!allows(id)) {
            return false;
        }
        Vocabulary v = c.vocabulary();
        push();
        if (id == v.endOfSequence()) {
            finished = true;
            finishedAt = depth - 1;
            return true;
        }
        for (int i = 0, len = v.length(id); i < len; i++) {
            chart.feed(v.byteAt(id, i) & 0xFF);
        }
        return true;
    }

    @Override
    public void feedBytes(byte[] bytes) {
        if (finished) {
            throw new RejectedInputException("the output has ended; nothing may follow", 0, "nothing");
        }
        int fed = 0;
        try {
            while (fed < bytes.length && chart.feed(bytes[fed] & 0xFF)) {
                fed++;
            }
        } catch (RuntimeException e) {
            // the parser's item limit: the cursor stays where it was
            chart.undo(fed);
            throw e;
        }
        if (fed < bytes.length) {
            String exp = expected();
            chart.undo(fed);
            throw new RejectedInputException(String.format("byte %d (%s) leaves the language; expected %s",
                    fed, ByteSets.show(bytes[fed] & 0xFF), exp), fed, exp);
        }
        chart.undo(fed);
        push();
        for (byte b : bytes) {
            chart.feed(b & 0xFF);
        }
    }

    @Override
    public boolean tryFeedBytes(byte[] bytes) {
        try {
            feedBytes(bytes);
            return true;
        } catch (RejectedInputException e) {
            return false;
        }
    }

    @Override
    public void feedText(String text) {
        feedBytes(text.getBytes(StandardCharsets.UTF_8));
    }

    private void push() {
        if (depth == lengths.length) {
            lengths = Arrays.copyOf(lengths, depth * 2);
        }
        lengths[depth++] = chart.depth();
    }

    @Override
    public void undo(int steps) {
        if (steps < 0 || steps > depth) {
            throw new IllegalArgumentException("cannot undo " + steps + " steps; " + depth + " were taken");
        }
        if (steps == 0) {
            return;
        }
        depth -= steps;
        chart.undo(chart.depth() - lengths[depth]);
        if (finished && finishedAt >= depth) {
            finished = false;
            finishedAt = -1;
        }
    }

    @Override
    public int steps() {
        return depth;
    }

    @Override
    public Cursor fork() {
        return new ChartCursor(this);
    }

    @Override
    public boolean isComplete() {
        return !finished && chart.accepts();
    }

    @Override
    public boolean isFinished() {
        return finished;
    }

    @Override
    public boolean canContinue() {
        return !finished && chart.canContinue();
    }

    @Override
    public byte[] forcedBytes() {
        if (finished) {
            return new byte[0];
        }
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        long[] set = new long[4];
        int fed = 0;
        try {
            while (fed < MAX_FORCED && !chart.accepts()) {
                chart.expectedBytes(set);
                int only = onlyByte(set);
                if (only < 0 || !chart.feed(only)) {
                    break;
                }
                out.write(only);
                fed++;
            }
        } finally {
            chart.undo(fed);
        }
        return out.toByteArray();
    }

    private static int onlyByte(long[] set) {
        int count = 0;
        int only = -1;
        for (int w = 0; w < 4; w++) {
            count += Long.bitCount(set[w]);
            if (set[w] != 0) {
                only = (w << 6) + Long.numberOfTrailingZeros(set[w]);
            }
        }
        return count == 1 ? only : -1;
    }

    @Override
    public String expected() {
        if (finished) {
            return "nothing (the output has ended)";
        }
        long[] set = new long[4];
        chart.expectedBytes(set);
        return ByteSets.describe(set, chart.accepts());
    }
}
