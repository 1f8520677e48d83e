package dev.espalier.mask;

import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Executor;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@link Batch#fillMasks}: the rows of per-cursor fillMask, in the caller's thread or on an executor. */
class BatchTest {

    private static final Vocabulary CL100K = TestVocabularies.builtin("cl100k");

    /** Cursors of several grammars and a regular expression, at random points of random outputs. */
    private static List<Cursor> cursors(int n, long seed) {
        List<Constraint> constraints = new ArrayList<>();
        for (String name : List.of("json", "arithmetic", "orchard-record", "high-values", "nullable")) {
            constraints.add(Constraint.grammar(TestGrammars.load(name), CL100K));
        }
        constraints.add(Constraint.regex("tree-[0-9]{3}: (healthy|scab|canker)", CL100K));
        Random rnd = new Random(seed);
        List<Cursor> out = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            Constraint c = constraints.get(i % constraints.size());
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 1 + rnd.nextInt(8), 0.1);
            Cursor cursor = c.start();
            int upTo = rnd.nextInt(s.tokens().length + 1);
            for (int k = 0; k < upTo; k++) {
                cursor.feed(s.tokens()[k]);
            }
            out.add(cursor);
        }
        return out;
    }

    private static long[][] expected(List<Cursor> cursors) {
        long[][] want = new long[cursors.size()][];
        for (int i = 0; i < want.length; i++) {
            want[i] = new long[CL100K.maskWords()];
            cursors.get(i).fillMask(want[i]);
        }
        return want;
    }

    /** Rows pre-filled with set bits, so that a row left unwritten shows. */
    private static long[][] dirtyRows(int n) {
        long[][] rows = new long[n][CL100K.maskWords()];
        for (long[] r : rows) {
            Arrays.fill(r, -1L);
        }
        return rows;
    }

    private static void assertRows(long[][] want, long[][] got) {
        for (int i = 0; i < want.length; i++) {
            assertArrayEquals(want[i], got[i], "row " + i);
        }
    }

    @Test
    void callerThreadGivesThePerCursorRows() {
        List<Cursor> cursors = cursors(18, 1);
        long[][] want = expected(cursors);
        long[][] got = dirtyRows(18);
        Set<Thread> threads = ConcurrentHashMap.newKeySet();
        List<Cursor> watched = cursors.stream().map(c -> (Cursor) new Watched(c, threads, null)).toList();
        Batch.fillMasks(watched, got, null);
        assertRows(want, got);
        assertEquals(Set.of(Thread.currentThread()), threads, "a null executor keeps the work in the caller's thread");
    }

    @Test
    void executorGivesThePerCursorRows() throws Exception {
        List<Cursor> cursors = cursors(40, 2);
        long[][] want = expected(cursors);
        ExecutorService pool = Executors.newFixedThreadPool(3);
        try {
            for (int round = 0; round < 3; round++) {
                long[][] got = dirtyRows(40);
                Batch.fillMasks(cursors, got, pool);
                assertRows(want, got);
            }
            long[][] got = dirtyRows(40);
            Batch.fillMasks(cursors, got, ForkJoinPool.commonPool());
            assertRows(want, got);
            got = dirtyRows(40);
            Batch.fillMasks(cursors, got, Runnable::run);
            assertRows(want, got);
        } finally {
            pool.shutdownNow();
        }
        // the cursors themselves are not moved by filling masks
        assertRows(want, expected(cursors));
    }

    @Test
    void tasksGoToTheGivenExecutorOnly() {
        List<Cursor> cursors = cursors(24, 3);
        long[][] want = expected(cursors);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            AtomicInteger submitted = new AtomicInteger();
            Executor counting = r -> {
                submitted.incrementAndGet();
                pool.execute(r);
            };
            Set<Thread> threads = ConcurrentHashMap.newKeySet();
            Set<Thread> allowed = ConcurrentHashMap.newKeySet();
            allowed.add(Thread.currentThread());
            Executor recording = r -> counting.execute(() -> {
                allowed.add(Thread.currentThread());
                r.run();
            });
            List<Cursor> watched = cursors.stream().map(c -> (Cursor) new Watched(c, threads, null)).toList();
            long[][] got = dirtyRows(24);
            Batch.fillMasks(watched, got, recording);
            assertRows(want, got);
            assertTrue(submitted.get() >= 1 && submitted.get() < 24, "a few tasks, not one per row: " + submitted);
            assertTrue(allowed.containsAll(threads), "rows are filled by the caller or the executor's threads");
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void aRefusingExecutorLeavesTheWorkToTheCaller() {
        List<Cursor> cursors = cursors(10, 4);
        long[][] want = expected(cursors);
        long[][] got = dirtyRows(10);
        Batch.fillMasks(cursors, got, r -> {
            throw new RejectedExecutionException("full");
        });
        assertRows(want, got);
    }

    @Test
    void exceptionsFromTasksReachTheCaller() {
        List<Cursor> cursors = new ArrayList<>(cursors(12, 5));
        IllegalStateException boom = new IllegalStateException("row 7 fails");
        cursors.set(7, new Watched(cursors.get(7), ConcurrentHashMap.newKeySet(), boom));
        ExecutorService pool = Executors.newFixedThreadPool(3);
        try {
            IllegalStateException e = assertThrows(IllegalStateException.class,
                    () -> Batch.fillMasks(cursors, dirtyRows(12), pool));
            assertSame(boom, e);
            assertSame(boom, assertThrows(IllegalStateException.class,
                    () -> Batch.fillMasks(cursors, dirtyRows(12), null)));
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void badArgumentsAreRefusedBeforeAnyWork() {
        List<Cursor> cursors = cursors(4, 6);
        assertThrows(IllegalArgumentException.class, () -> Batch.fillMasks(cursors, dirtyRows(3), null));
        long[][] shortRow = dirtyRows(4);
        shortRow[2] = new long[CL100K.maskWords() - 1];
        assertThrows(IllegalArgumentException.class, () -> Batch.fillMasks(cursors, shortRow, null));
        List<Cursor> twice = List.of(cursors.get(0), cursors.get(1), cursors.get(0));
        long[][] rows = dirtyRows(3);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Batch.fillMasks(twice, rows, Runnable::run));
        assertTrue(e.getMessage().contains("0 and 2"), e.getMessage());
        assertEquals(-1L, rows[0][0], "nothing was filled");
        Batch.fillMasks(List.of(), new long[0][], null);
    }

    /** A cursor that records the threads filling its mask, and can fail instead. */
    private static final class Watched implements Cursor {
        private final Cursor inner;
        private final Set<Thread> threads;
        private final RuntimeException failure;

        Watched(Cursor inner, Set<Thread> threads, RuntimeException failure) {
            this.inner = inner;
            this.threads = threads;
            this.failure = failure;
        }

        @Override
        public void fillMask(long[] mask) {
            threads.add(Thread.currentThread());
            if (failure != null) {
                throw failure;
            }
            inner.fillMask(mask);
        }

        @Override public Constraint constraint() { return inner.constraint(); }
        @Override public boolean allows(int id) { return inner.allows(id); }
        @Override public void feed(int id) { inner.feed(id); }
        @Override public boolean tryFeed(int id) { return inner.tryFeed(id); }
        @Override public void feedBytes(byte[] bytes) { inner.feedBytes(bytes); }
        @Override public boolean tryFeedBytes(byte[] bytes) { return inner.tryFeedBytes(bytes); }
        @Override public void feedText(String text) { inner.feedText(text); }
        @Override public void undo(int steps) { inner.undo(steps); }
        @Override public int steps() { return inner.steps(); }
        @Override public Cursor fork() { return inner.fork(); }
        @Override public boolean isComplete() { return inner.isComplete(); }
        @Override public boolean isFinished() { return inner.isFinished(); }
        @Override public boolean canContinue() { return inner.canContinue(); }
        @Override public byte[] forcedBytes() { return inner.forcedBytes(); }
        @Override public String expected() { return inner.expected(); }
    }
}
