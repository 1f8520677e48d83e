package dev.espalier.cli;

import dev.espalier.abnf.AbnfPrinter;
import dev.espalier.schema.SchemaResult;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code espalier schema}: the ABNF grammar a JSON Schema compiles to. */
@Command(name = "schema", mixinStandardHelpOptions = true,
        description = {"Compile a JSON Schema (draft 2020-12) and print the ABNF grammar it becomes: the JSON texts "
                + "the schema accepts, in the chosen layout. Keep it, edit it, use it with --grammar.",
            "References reach the files beside FILE (relative paths) and the documents given with --schema-document; "
                + "nothing is fetched.",
            "Relaxations (with --lenient) and warnings go to stderr as FILE: POINTER: KEYWORD: KIND: MESSAGE. "
                + "A keyword that cannot be enforced exactly is an error (exit 2) unless --lenient is given."})
final class SchemaCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FILE", description = "A JSON Schema file.")
    String file;

    @Option(names = "--pretty", description = "Two-space indented layout, one member or item per line (default: no white space).")
    boolean pretty;

    @Option(names = "--any-order", description = "Object members in any order (default: the order of the schema's properties).")
    boolean anyOrder;

    @Option(names = "--lenient", description = "Relax what cannot be enforced exactly, listing each relaxation on stderr.")
    boolean lenient;

    @Option(names = "--schema-document", paramLabel = "URI=FILE", description = SchemaFiles.DOCUMENT_HELP)
    List<String> documents = new ArrayList<>();

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        SchemaResult r = SchemaFiles.load(file, SchemaFiles.options(pretty, anyOrder, lenient), documents,
                spec.commandLine().getErr());
        out.print(AbnfPrinter.print(r.grammar()));
        out.flush();
        return 0;
    }
}
