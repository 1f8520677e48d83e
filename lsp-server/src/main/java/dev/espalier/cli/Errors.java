package dev.espalier.cli;

import dev.espalier.automaton.AutomatonTooLargeException;
import dev.espalier.regex.RegexSyntaxException;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.NoSuchFileException;

/** Turns exceptions into one-line messages for people. */
final class Errors {

    private Errors() {
    }

    static String describe(Throwable ex) {
        if (ex instanceof RegexSyntaxException r) {
            return "invalid regular expression: " + r.getMessage();
        }
        if (ex instanceof AutomatonTooLargeException a) {
            return a.getMessage() + " (raise it with --state-limit)";
        }
        if (ex instanceof UncheckedIOException u) {
            return describe(u.getCause());
        }
        if (ex instanceof NoSuchFileException n) {
            return "no such file: " + n.getFile();
        }
        if (ex instanceof IOException io) {
            return io.getClass().getSimpleName() + ": " + io.getMessage();
        }
        String m = ex.getMessage();
        return m == null ? ex.getClass().getSimpleName() : m;
    }
}
