package dev.espalier.mask;

import dev.espalier.automaton.ByteDfa;
import dev.espalier.vocab.Vocabulary;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/** A cursor over a {@link DfaConstraint}: the automaton state plus a history for undo. */
final class DfaCursor implements Cursor {

    /** State value after end of sequence was fed. */
    private static final int FINISHED = -2;

    private final DfaConstraint c;
    private int state;
    private int[] history;
    private int depth;

    DfaCursor(DfaConstraint c) {
        this.c = c;
        this.state = c.dfa.start();
        this.history = new int[64];
    }

    private DfaCursor(DfaCursor other) {
        this.c = other.c;
        this.state = other.state;
        this.history = other.history.clone();
        this.depth = other.depth;
    }

    @Override
    public Constraint constraint() {
        return c;
    }

    @Override
    public void fillMask(long[] mask) {
        int words = c.vocabulary.maskWords();
        if (state == FINISHED) {
            Arrays.fill(mask, 0, words, 0L);
            return;
        }
        c.fill(state, mask);
    }

    @Override
    public boolean allows(int id) {
        return next(id) != -1;
    }

    /** The state after token {@code id}, or -1 when refused. */
    private int next(int id) {
        Vocabulary v = c.vocabulary;
        if (state == FINISHED || !v.has(id)) {
            return -1;
        }
        if (id == v.endOfSequence()) {
            return c.dfa.accepts(state) ? FINISHED : -1;
        }
        int len = v.length(id);
        if (v.isSpecial(id) || len == 0) {
            return -1;
        }
        int s = state;
        for (int i = 0; i < len; i++) {
            s = c.dfa.step(s, v.byteAt(id, i));
            if (s == ByteDfa.DEAD) {
                return -1;
            }
        }
        return s;
    }

    @Override
    public void feed(int id) {
        if (!tryFeed(id)) {
            Vocabulary v = c.vocabulary;
            String what = v.has(id) ? "token " + id + " (" + v.display(id) + ")" : "token id " + id;
            throw new RejectedInputException(what + " is not allowed here; expected " + expected(), 0, expected());
        }
    }

    @Override
    public boolean tryFeed(int id) {
        int s = next(id);
        if (s == -1) {
            return false;
        }
        push(s);
        return true;
    }

    @Override
    public void feedBytes(byte[] bytes) {
        if (state == FINISHED) {
            throw new RejectedInputException("the output has ended; nothing may follow", 0, "nothing");
        }
        int s = state;
        for (int i = 0; i < bytes.length; i++) {
            int n = c.dfa.step(s, bytes[i]);
            if (n == ByteDfa.DEAD) {
                String exp = describe(s);
                throw new RejectedInputException(String.format("byte %d (%s) leaves the language; expected %s",
                        i, show(bytes[i] & 0xFF), exp), i, exp);
            }
            s = n;
        }
        push(s);
    }

    @Override
    public boolean tryFeedBytes(byte[] bytes) {
        if (state == FINISHED) {
            return false;
        }
        int s = c.dfa.run(state, bytes);
        if (s == ByteDfa.DEAD) {
            return false;
        }
        push(s);
        return true;
    }

    @Override
    public void feedText(String text) {
        feedBytes(text.getBytes(StandardCharsets.UTF_8));
    }

    private void push(int s) {
        if (depth == history.length) {
            history = Arrays.copyOf(history, depth * 2);
        }
        history[depth++] = state;
        state = s;
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
        state = history[depth];
    }

    @Override
    public int steps() {
        return depth;
    }

    @Override
    public Cursor fork() {
        return new DfaCursor(this);
    }

    @Override
    public boolean isComplete() {
        return state != FINISHED && c.dfa.accepts(state);
    }

    @Override
    public boolean isFinished() {
        return state == FINISHED;
    }

    @Override
    public boolean canContinue() {
        if (state == FINISHED) {
            return false;
        }
        return c.dfa.canContinue(state);
    }

    @Override
    public byte[] forcedBytes() {
        if (state == FINISHED) {
            return new byte[0];
        }
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int s = state;
        while (!c.dfa.accepts(s) && c.dfa.forcedByte(s) >= 0) {
            int b = c.dfa.forcedByte(s);
            out.write(b);
            s = c.dfa.step(s, b);
        }
        return out.toByteArray();
    }

    @Override
    public String expected() {
        return state == FINISHED ? "nothing (the output has ended)" : describe(state);
    }

    private String describe(int s) {
        return ByteSets.describe(c.dfa.liveBytes(s), c.dfa.accepts(s));
    }

    private static String show(int b) {
        return ByteSets.show(b);
    }
}
