package dev.espalier.cli;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.MaskSettings;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Option;

/** Which language to enforce: {@code --regex}, {@code --grammar} or {@code --schema}, plus limits. */
final class ConstraintOptions {

    /** Exactly one source. */
    static final class Source {
        @Option(names = "--regex", paramLabel = "PATTERN", description = "A regular expression the whole output must match.")
        String regex;

        @Option(names = "--grammar", paramLabel = "FILE", description = "An ABNF grammar file.")
        String grammar;

        @Option(names = "--schema", paramLabel = "FILE", description = "A JSON Schema file.")
        String schema;
    }

    @ArgGroup(exclusive = true, multiplicity = "1")
    Source source;

    @Option(names = "--start", paramLabel = "RULE", description = "Start rule of the grammar (default: its first rule).")
    String start;

    @Option(names = "--pretty", description = "With --schema: two-space indented layout (default: no white space).")
    boolean pretty;

    @Option(names = "--any-order", description = "With --schema: object members in any order (default: schema order).")
    boolean anyOrder;

    @Option(names = "--lenient", description = "With --schema: relax what cannot be enforced exactly, listing it on stderr.")
    boolean lenient;

    @Option(names = "--schema-document", paramLabel = "URI=FILE", description = "With --schema: "
            + SchemaFiles.DOCUMENT_HELP)
    java.util.List<String> documents = new java.util.ArrayList<>();

    @Option(names = "--state-limit", paramLabel = "N", defaultValue = "" + MaskSettings.DEFAULT_STATE_LIMIT,
            description = "Most states an automaton may have. Default: ${DEFAULT-VALUE}.")
    int stateLimit;

    @Option(names = "--cache-mb", paramLabel = "MB", defaultValue = "64",
            description = "Memory budget of the mask caches, in MiB. Default: ${DEFAULT-VALUE}.")
    long cacheMb;

    MaskSettings settings() {
        return MaskSettings.defaults().withStateLimit(stateLimit).withCacheBudget(cacheMb << 20);
    }

    Constraint compile(Vocabulary vocabulary, java.io.PrintWriter err) {
        if (source.grammar != null) {
            if (pretty || anyOrder || lenient || !documents.isEmpty()) {
                throw new UserInputException("--pretty, --any-order, --lenient and --schema-document apply to --schema only");
            }
            return Constraint.grammar(GrammarFiles.load(source.grammar, start, err), vocabulary, settings());
        }
        if (start != null) {
            throw new UserInputException("--start applies to --grammar only");
        }
        if (source.schema != null) {
            return Constraint.grammar(SchemaFiles.load(source.schema, SchemaFiles.options(pretty, anyOrder, lenient),
                    documents, err).grammar(), vocabulary, settings());
        }
        if (pretty || anyOrder || lenient || !documents.isEmpty()) {
            throw new UserInputException("--pretty, --any-order, --lenient and --schema-document apply to --schema only");
        }
        return Constraint.regex(source.regex, vocabulary, settings());
    }

    String label() {
        return source.regex != null ? "regex " + source.regex
                : source.grammar != null ? "grammar " + source.grammar : "schema " + source.schema;
    }
}
