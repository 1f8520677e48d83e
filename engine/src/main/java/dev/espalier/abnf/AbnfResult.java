package dev.espalier.abnf;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Grammar;
import java.util.List;
import java.util.Objects;

/**
 * What reading an ABNF grammar yields: always a grammar (as much as could be recovered), the
 * findings of the front end, and every rule-name occurrence for editor features.
 *
 * @param grammar     the grammar IR; the first rule of the file is the start rule
 * @param diagnostics the front end's findings, ordered by position
 * @param sites       every occurrence of a rule name, ordered by file and position
 */
public record AbnfResult(Grammar grammar, List<Diagnostic> diagnostics, List<RuleSite> sites) {

    /** Copies the lists; checks that nothing is null. */
    public AbnfResult {
        Objects.requireNonNull(grammar);
        diagnostics = List.copyOf(diagnostics);
        sites = List.copyOf(sites);
    }

    /** Whether any diagnostic is an error. */
    public boolean hasErrors() {
        return diagnostics.stream().anyMatch(Diagnostic::isError);
    }
}
