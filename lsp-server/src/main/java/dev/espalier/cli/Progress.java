package dev.espalier.cli;

/** Progress notes on stderr for work that takes over a second. */
final class Progress {

    private Progress() {
    }

    /** Notes on stderr that {@code what} finished, when it took at least a second since {@code startNanos}. */
    static void done(String what, long startNanos) {
        long ms = (System.nanoTime() - startNanos) / 1_000_000;
        if (ms >= 1000) {
            System.err.printf("espalier: %s in %.1f s%n", what, ms / 1000.0);
        }
    }

    /** Always notes a step on stderr. */
    static void note(String what) {
        System.err.println("espalier: " + what);
    }
}
