package dev.espalier.grammar;

import java.util.Optional;

/**
 * Our convention for sample files that state whether a grammar should accept them: the expected
 * verdict is the dot-separated part {@code accept} or {@code reject} of the file name (the last one
 * if several), e.g. {@code nested-arrays.accept.json} or {@code trailing-comma.reject.json}; the
 * sample is the file's bytes with one final line break (LF or CRLF) removed if present, so that
 * editors' final newlines do not count (write an extra line break to keep one).
 */
public final class Samples {

    private Samples() {
    }

    /** The verdict a file name states: true for accept, false for reject, empty when it states none. */
    public static Optional<Boolean> expectedVerdict(String fileName) {
        String[] parts = fileName.split("\\.");
        for (int i = parts.length - 1; i >= 0; i--) {
            if (parts[i].equals("accept")) {
                return Optional.of(true);
            }
            if (parts[i].equals("reject")) {
                return Optional.of(false);
            }
        }
        return Optional.empty();
    }

    /** The sample text of a file's bytes: one final LF or CRLF removed. */
    public static byte[] text(byte[] file) {
        int n = file.length;
        if (n > 0 && file[n - 1] == '\n') {
            n--;
            if (n > 0 && file[n - 1] == '\r') {
                n--;
            }
        }
        return n == file.length ? file : java.util.Arrays.copyOf(file, n);
    }
}
