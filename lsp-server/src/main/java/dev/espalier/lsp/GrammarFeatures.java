package dev.espalier.lsp;

import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.Severity;
import dev.espalier.grammar.Span;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.jsonrpc.messages.Either;

import java.util.ArrayList;
import java.util.List;

/** The features of ABNF grammar files ({@code .abnf}): diagnostics from {@link AbnfCheck}. */
public final class GrammarFeatures implements DocumentFeatures {

    private final ServerContext context;

    /** Features for the documents of a server. */
    public GrammarFeatures(ServerContext context) {
        this.context = context;
    }

    @Override
    public List<String> watchedGlobs() {
        return List.of("**/*.abnf");
    }

    @Override
    public List<Diagnostic> diagnostics(DocumentSnapshot doc) {
        AbnfResult r = AbnfCheck.check(doc.text(), doc.uri());
        List<Diagnostic> out = new ArrayList<>();
        for (dev.espalier.grammar.Diagnostic d : r.diagnostics()) {
            out.add(toLsp(doc, d));
        }
        return out;
    }

    static Diagnostic toLsp(DocumentSnapshot doc, dev.espalier.grammar.Diagnostic d) {
        Span s = d.span();
        Range range = s.isKnown() ? doc.range(s.start(), s.end()) : doc.range(0, 0);
        Diagnostic out = new Diagnostic(range, d.message(), severity(d.severity()), "espalier");
        out.setCode(Either.forLeft(d.code()));
        return out;
    }

    static DiagnosticSeverity severity(Severity s) {
        return switch (s) {
            case ERROR -> DiagnosticSeverity.Error;
            case WARNING -> DiagnosticSeverity.Warning;
            case INFORMATION -> DiagnosticSeverity.Information;
            case HINT -> DiagnosticSeverity.Hint;
        };
    }
}
