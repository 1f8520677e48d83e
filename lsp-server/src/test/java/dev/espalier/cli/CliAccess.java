package dev.espalier.cli;

import java.io.PrintWriter;
import java.io.StringWriter;

/** Runs the command line from tests in other packages. */
public final class CliAccess {

    private CliAccess() {
    }

    /** Runs {@code espalier ARGS…} and returns its standard output; fails on a non-zero exit. */
    public static String run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(args, new PrintWriter(out), new PrintWriter(err));
        if (code != 0) {
            throw new AssertionError("espalier exited " + code + ": " + err);
        }
        return out.toString();
    }
}
