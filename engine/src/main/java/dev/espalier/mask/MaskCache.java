package dev.espalier.mask;

import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReferenceArray;

/**
 * Masks cached by a dense key (an automaton state), safe for concurrent use, within a memory
 * budget. When an insertion would cross the budget, a clock hand sweeps the slots and evicts entries
 * until it fits; evicted masks are recomputed on demand. Accounting counts the mask arrays only.
 */
final class MaskCache {

    private final AtomicReferenceArray<long[]> slots;
    private final long budget;
    private final AtomicLong bytes = new AtomicLong();
    private final AtomicInteger count = new AtomicInteger();
    private final AtomicInteger hand = new AtomicInteger();

    MaskCache(int keys, long budgetBytes) {
        this.slots = new AtomicReferenceArray<>(keys);
        this.budget = budgetBytes;
    }

    long[] get(int key) {
        return slots.get(key);
    }

    /** Caches {@code mask} under {@code key} if the budget allows; returns the cached instance. */
    long[] put(int key, long[] mask) {
        long size = sizeOf(mask);
        if (size > budget) {
            return mask;
        }
        int n = slots.length();
        for (int swept = 0; bytes.get() + size > budget && swept < 2 * n; swept++) {
            int k = Math.floorMod(hand.getAndIncrement(), n);
            long[] old = slots.getAndSet(k, null);
            if (old != null) {
                bytes.addAndGet(-sizeOf(old));
                count.decrementAndGet();
            }
        }
        if (slots.compareAndSet(key, null, mask)) {
            bytes.addAndGet(size);
            count.incrementAndGet();
            return mask;
        }
        long[] other = slots.get(key);
        return other != null ? other : mask;
    }

    long bytes() {
        return bytes.get();
    }

    int count() {
        return count.get();
    }

    private static long sizeOf(long[] mask) {
        return 16L + 8L * mask.length;
    }
}
