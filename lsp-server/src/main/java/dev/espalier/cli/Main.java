package dev.espalier.cli;

/** Entry point of the espalier command line. */
public final class Main {
    private Main() {
    }

    public static void main(String[] args) {
        System.exit(0);
    }
}
