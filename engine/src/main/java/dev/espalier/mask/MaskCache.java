package dev.espalier.mask;

import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReferenceArray;

/**
 * Values (masks, node lists) cached by a dense key, safe for concurrent use, within a memory budget.
 * When an insertion would cross the budget, a clock hand sweeps the slots and evicts entries until it
 * fits; evicted values are recomputed on demand. Accounting counts the cached arrays only.
 */
final class MaskCache {

    private final AtomicReferenceArray<Object> slots;
    private final long budget;
    private final AtomicLong bytes = new AtomicLong();
    private final AtomicInteger count = new AtomicInteger();
    private final AtomicInteger hand = new AtomicInteger();

    MaskCache(int keys, long budgetBytes) {
        this.slots = new AtomicReferenceArray<>(keys);
        this.budget = budgetBytes;
    }

    long[] get(int key) {
        return (long[]) slots.get(key);
    }

    Object getObject(int key) {
        return slots.get(key);
    }

    /** Caches a mask under {@code key} if the budget allows; returns the cached instance. */
    long[] put(int key, long[] mask) {
        return (long[]) putObject(key, mask);
    }

    /** Caches a {@code long[]} or {@code int[]} under {@code key} if the budget allows; returns the cached instance. */
    Object putObject(int key, Object value) {
        long size = sizeOf(value);
        if (size > budget) {
            return value;
        }
        int n = slots.length();
        for (int swept = 0; bytes.get() + size > budget && swept < 2 * n; swept++) {
            int k = Math.floorMod(hand.getAndIncrement(), n);
            Object old = slots.getAndSet(k, null);
            if (old != null) {
                bytes.addAndGet(-sizeOf(old));
                count.decrementAndGet();
            }
        }
        if (slots.compareAndSet(key, null, value)) {
            bytes.addAndGet(size);
            count.incrementAndGet();
            return value;
        }
        Object other = slots.get(key);
        return other != null ? other : value;
    }

    long bytes() {
        return bytes.get();
    }

    int count() {
        return count.get();
    }

    private static long sizeOf(Object value) {
        if (value instanceof long[] l) {
            return 16L + 8L * l.length;
        }
        return 16L + 4L * ((int[]) value).length;
    }
}
