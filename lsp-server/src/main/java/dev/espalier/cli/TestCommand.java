package dev.espalier.cli;

import dev.espalier.earley.EarleyGrammar;
import dev.espalier.grammar.Samples;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

/** {@code espalier test}: run sample files whose names state the expected verdict. */
@Command(name = "test", mixinStandardHelpOptions = true,
        description = "Run samples against a grammar. A sample's name states its verdict: a dot-separated part "
                + "'accept' or 'reject' (e.g. nested.accept.json); one final line break of the file is not "
                + "part of the sample. Folders are searched for such files. Exit 1 on any mismatch.")
final class TestCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "GRAMMAR", description = "An ABNF file.")
    String grammar;

    @Parameters(index = "1..*", arity = "1..*", paramLabel = "SAMPLE", description = "Sample files or folders.")
    List<Path> samples;

    @Option(names = "--start", paramLabel = "RULE", description = "Start rule (default: the file's first rule).")
    String start;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        EarleyGrammar g = EarleyGrammar.compile(GrammarFiles.load(grammar, start, spec.commandLine().getErr()));
        List<Path> files = new ArrayList<>();
        for (Path p : samples) {
            if (Files.isDirectory(p)) {
                try (Stream<Path> walk = Files.walk(p)) {
                    walk.filter(Files::isRegularFile)
                            .filter(f -> Samples.expectedVerdict(f.getFileName().toString()).isPresent())
                            .sorted().forEach(files::add);
                }
            } else if (Files.isRegularFile(p)) {
                files.add(p);
            } else {
                throw new UserInputException("no such sample: " + p);
            }
        }
        int passed = 0;
        int failed = 0;
        for (Path f : files) {
            Optional<Boolean> want = Samples.expectedVerdict(f.getFileName().toString());
            if (want.isEmpty()) {
                throw new UserInputException(f + ": the name states no verdict (add .accept. or .reject. to it)");
            }
            SampleRun run = SampleRun.of(g, Samples.text(Files.readAllBytes(f)));
            boolean ok = run.accepted() == want.get();
            if (ok) {
                passed++;
                out.println("pass  " + f + (run.accepted() ? "  (accepted)" : "  (" + run.message() + ")"));
            } else {
                failed++;
                out.println("FAIL  " + f + ": expected " + (want.get() ? "accept, " + run.message() : "reject, but it was accepted"));
            }
        }
        out.println(passed + " passed, " + failed + " failed");
        out.flush();
        return failed > 0 ? 1 : 0;
    }
}
