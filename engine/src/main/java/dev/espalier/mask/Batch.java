package dev.espalier.mask;

import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.Executor;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;

/**
 * Masks for a batch of sequences in one call: one row per cursor, as a serving loop needs them
 * before each decoding step of a batch.
 */
public final class Batch {

    private Batch() {
    }

    /**
     * Fills {@code masks[i]} as {@code cursors.get(i).fillMask(masks[i])} would, for every cursor.
     *
     * <p>With a null executor the rows are filled one after another in the caller's thread. With an
     * executor, the rows are shared out among a few tasks submitted to it (about as many as it has
     * threads; each task takes the next unfilled row until none is left), the caller's thread takes
     * rows too, and the call returns once every row is filled. No thread is created here. Should the
     * executor refuse a task, the remaining rows are filled by the caller; a task that starts after
     * every row was taken returns at once, so the call never waits for an executor that is busy
     * elsewhere.
     *
     * <p>The cursors must be distinct objects (a cursor is not thread-safe); they may follow different
     * constraints. Cursors are only read during the call, but must not be used by other threads
     * while it runs.
     *
     * @param cursors        the sequences' cursors
     * @param masks          one row per cursor, each at least the
     *                       {@link dev.espalier.vocab.Vocabulary#maskWords()} of its cursor's
     *                       vocabulary; rows beyond {@code cursors.size()} are left alone
     * @param executorOrNull where to run the tasks, or null for the caller's thread only
     * @throws IllegalArgumentException when there are fewer rows than cursors, a row is too short, or
     *         a cursor appears twice (checked before any row is filled)
     * @throws NullPointerException     when a cursor or row is null
     * @throws RuntimeException         the first exception a row's {@code fillMask} threw (others are
     *         attached as suppressed); which rows were filled is then unspecified
     */
    public static void fillMasks(List<Cursor> cursors, long[][] masks, Executor executorOrNull) {
        int n = cursors.size();
        if (masks.length < n) {
            throw new IllegalArgumentException(n + " cursors but only " + masks.length + " mask rows");
        }
        Map<Cursor, Integer> seen = new IdentityHashMap<>();
        for (int i = 0; i < n; i++) {
            Cursor c = cursors.get(i);
            if (c == null) {
                throw new NullPointerException("cursor " + i + " is null");
            }
            if (masks[i] == null) {
                throw new NullPointerException("mask row " + i + " is null");
            }
            int words = c.constraint().vocabulary().maskWords();
            if (masks[i].length < words) {
                throw new IllegalArgumentException("mask row " + i + " has " + masks[i].length
                        + " words; its vocabulary needs " + words);
            }
            Integer earlier = seen.put(c, i);
            if (earlier != null) {
                throw new IllegalArgumentException("cursors " + earlier + " and " + i
                        + " are the same object; each row needs its own cursor");
            }
        }
        if (executorOrNull == null || n <= 1) {
            for (int i = 0; i < n; i++) {
                cursors.get(i).fillMask(masks[i]);
            }
            return;
        }
        Rows rows = new Rows(cursors.toArray(new Cursor[0]), masks);
        int tasks = Math.min(n - 1, threadsOf(executorOrNull));
        for (int t = 0; t < tasks; t++) {
            try {
                executorOrNull.execute(rows::work);
            } catch (RejectedExecutionException e) {
                break; // the caller fills what is left
            }
        }
        rows.work();
        rows.awaitAll();
        Throwable failure = rows.failure.get();
        if (failure instanceof RuntimeException r) {
            throw r;
        }
        if (failure instanceof Error err) {
            throw err;
        }
        if (failure != null) {
            throw new IllegalStateException("filling a mask failed", failure);
        }
    }

    /** How many threads an executor is likely to run at once (a hint for the number of tasks). */
    private static int threadsOf(Executor e) {
        if (e instanceof ForkJoinPool p) {
            return Math.max(1, p.getParallelism());
        }
        if (e instanceof ThreadPoolExecutor p) {
            return Math.max(1, Math.min(p.getMaximumPoolSize(), Runtime.getRuntime().availableProcessors() * 4));
        }
        return Math.max(1, Runtime.getRuntime().availableProcessors());
    }

    /** The shared work of one call: rows are claimed by index and counted down when filled. */
    private static final class Rows {
        final Cursor[] cursors;
        final long[][] masks;
        final AtomicInteger next = new AtomicInteger();
        final CountDownLatch done;
        final AtomicReference<Throwable> failure = new AtomicReference<>();

        Rows(Cursor[] cursors, long[][] masks) {
            this.cursors = cursors;
            this.masks = masks;
            this.done = new CountDownLatch(cursors.length);
        }

        void work() {
            for (int i = next.getAndIncrement(); i < cursors.length; i = next.getAndIncrement()) {
                try {
                    if (failure.get() == null) {
                        cursors[i].fillMask(masks[i]);
                    }
                } catch (Throwable t) {
                    if (!failure.compareAndSet(null, t) && failure.get() != t) {
                        failure.get().addSuppressed(t);
                    }
                } finally {
                    done.countDown();
                }
            }
        }

        /** Waits for every claimed row; an interrupt is kept for the caller, not acted on mid-batch. */
        void awaitAll() {
            boolean interrupted = false;
            while (true) {
                try {
                    done.await();
                    break;
                } catch (InterruptedException e) {
                    interrupted = true;
                }
            }
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
