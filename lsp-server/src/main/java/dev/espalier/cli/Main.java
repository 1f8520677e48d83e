package dev.espalier.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

import java.io.PrintWriter;

/** Entry point of the {@code espalier} command line. */
@Command(name = "espalier",
        mixinStandardHelpOptions = true,
        versionProvider = Main.Version.class,
        description = "Exact token masks for language-model output: regular expressions, ABNF grammars, JSON Schemas.",
        subcommands = {
            DemoCommand.class,
            MaskCommand.class,
            SampleCommand.class,
            VocabCommand.class,
            BenchCommand.class,
            CheckCommand.class,
            TestCommand.class,
            ParseCommand.class,
            ExamplesCommand.class,
            FmtCommand.class,
            ServeCommand.class,
            SchemaCommand.class,
            CommandLine.HelpCommand.class,
        })
public final class Main implements Runnable {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    /** Exit code for a prefix that cannot be completed. */
    static final int EXIT_REJECTED = 1;
    /** Exit code for bad usage or bad input. */
    static final int EXIT_BAD_INPUT = 2;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /** Runs the command line and returns its exit code. */
    public static int run(String[] args, PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(out);
        cl.setErr(err);
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            commandLine.getErr().println("espalier: error: " + Errors.describe(ex));
            commandLine.getErr().flush();
            return EXIT_BAD_INPUT;
        });
        int code = cl.execute(args);
        out.flush();
        err.flush();
        return code;
    }

    public static void main(String[] args) {
        PrintWriter out = new PrintWriter(new java.io.OutputStreamWriter(System.out, java.nio.charset.StandardCharsets.UTF_8), true);
        PrintWriter err = new PrintWriter(new java.io.OutputStreamWriter(System.err, java.nio.charset.StandardCharsets.UTF_8), true);
        System.exit(run(args, out, err));
    }

    /** Reads the version from the jar manifest. */
    static final class Version implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            String v = Main.class.getPackage().getImplementationVersion();
            return new String[] {"espalier " + (v == null ? "development build" : v)};
        }
    }
}
