package dev.espalier.automaton;

import org.junit.jupiter.api.Test;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** {@link LongIntTable} against {@link HashMap} on packed keys of the shapes the NFA builder uses. */
class LongIntTableTest {

    @Test
    void agreesWithHashMap() {
        Random rnd = new Random(20261204);
        for (int trial = 0; trial < 20; trial++) {
            LongIntTable t = new LongIntTable();
            Map<Long, Integer> ref = new HashMap<>();
            int ops = 1 + rnd.nextInt(20_000);
            for (int i = 0; i < ops; i++) {
                // packed (number, node) pairs with small halves, and now and then any long
                long key = rnd.nextInt(8) == 0 ? rnd.nextLong() : (long) rnd.nextInt(64) << 32 | rnd.nextInt(3_000);
                if (rnd.nextBoolean()) {
                    int v = rnd.nextInt(1_000_000);
                    t.put(key, v);
                    ref.put(key, v);
                } else {
                    assertEquals(ref.getOrDefault(key, LongIntTable.MISSING), t.get(key), () -> "key " + key);
                }
            }
            assertEquals(ref.size(), t.size());
            for (Map.Entry<Long, Integer> e : ref.entrySet()) {
                assertEquals(e.getValue(), t.get(e.getKey()));
            }
        }
        assertThrows(IllegalArgumentException.class, () -> new LongIntTable().put(1, -1));
    }
}
