package dev.espalier.abnf;

import static dev.espalier.abnf.IrShapes.assertCovers;
import static dev.espalier.abnf.IrShapes.only;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Rule;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The ;@use extension: rules from other files, with the importing file's definitions winning. */
class AbnfImportTest {

    /** Files in memory; paths are taken as written (no directories in these samples). */
    private static ImportResolver files(Map<String, String> files) {
        return (from, path) -> Optional.ofNullable(files.get(path)).map(t -> new ImportResolver.Source(path, t));
    }

    @Test
    void importedRulesFollowTheFilesOwn() {
        String main = ";@use \"rootstock.abnf\"\nwork-order = tree-id SP rootstock\ntree-id = 4DIGIT\n";
        String stock = "rootstock = \"M9\" / \"MM106\" / seedling\nseedling = \"seedling\"\n";
        AbnfResult r = Abnf.parseWithImports(main, "main.abnf", files(Map.of("rootstock.abnf", stock)));
        assertEquals(List.of(), r.diagnostics());
        assertEquals(List.of("work-order", "tree-id", "rootstock", "seedling", "DIGIT", "SP"),
                r.grammar().rules().stream().map(Rule::name).toList());
        assertEquals("work-order", r.grammar().start());
        // sites of both files, each tagged with its file
        RuleSite def = r.sites().stream().filter(s -> s.key().equals("rootstock") && s.isDefinition()).findFirst().orElseThrow();
        assertEquals("rootstock.abnf", def.source());
        assertCovers(stock, "rootstock", 0, def.span());
        // plain parse does not follow the directive: rootstock stays unresolved (and is no error of ours)
        AbnfResult plain = Abnf.parse(main, "main.abnf");
        assertEquals(List.of(), plain.diagnostics());
        assertTrue(plain.grammar().rule("rootstock").isEmpty());
    }

    @Test
    void theImportingFilesDefinitionsWin() {
        String main = ";@use \"lib.abnf\"\norder = variety\nvariety = \"Gala\"\n";
        String lib = "variety = \"Cox\"\nspare = \"x\"\n";
        AbnfResult r = Abnf.parseWithImports(main, "main.abnf", files(Map.of("lib.abnf", lib)));
        assertEquals(List.of(), r.diagnostics());
        assertEquals("Gala", ((Expr.Text) r.grammar().rule("variety").orElseThrow().body()).text());
        assertTrue(r.grammar().rule("spare").isPresent());
    }

    @Test
    void cyclesAreFine() {
        String a = ";@use \"b.abnf\"\nstart = from-b\nfrom-a = \"a\"\n";
        String b = ";@use \"a.abnf\"\nfrom-b = from-a\n";
        AbnfResult r = Abnf.parseWithImports(a, "a.abnf", files(Map.of("a.abnf", a, "b.abnf", b)));
        assertEquals(List.of(), r.diagnostics());
        assertEquals(List.of("start", "from-a", "from-b"), r.grammar().rules().stream().map(Rule::name).toList());
    }

    @Test
    void missingFileIsAnErrorAtTheDirective() {
        String main = "order = tree\n  ;@use \"nowhere.abnf\" ; planned\ntree = \"t\"\n";
        AbnfResult r = Abnf.parseWithImports(main, "main.abnf", files(Map.of()));
        Diagnostic d = only(r, "import");
        assertCovers(main, ";@use \"nowhere.abnf\" ; planned", 0, d.span());
        assertTrue(d.message().contains("nowhere.abnf"), d.message());
        assertEquals(2, r.grammar().rules().size());
    }

    @Test
    void errorsInsideAnImportedFileAreSummarisedAtTheDirective() {
        String main = ";@use \"broken.abnf\"\norder = tree\n";
        String broken = "tree = \"t\" <prose>\n";
        AbnfResult r = Abnf.parseWithImports(main, "main.abnf", files(Map.of("broken.abnf", broken)));
        Diagnostic d = only(r, "import");
        assertCovers(main, ";@use \"broken.abnf\"", 0, d.span());
        assertTrue(d.message().contains("broken.abnf") && d.message().contains("prose"), d.message());
    }

    @Test
    void filesOnDiskResolveRelativeToTheImportingFile(@TempDir Path dir) throws IOException {
        Files.createDirectories(dir.resolve("lib"));
        Files.writeString(dir.resolve("orchard.abnf"), ";@use \"lib/trees.abnf\"\nrow = 1*tree\n");
        Files.writeString(dir.resolve("lib/trees.abnf"), ";@use \"dates.abnf\"\ntree = variety SP graft-date\nvariety = \"Gala\"\n");
        Files.writeString(dir.resolve("lib/dates.abnf"), "graft-date = 4DIGIT \"-\" 2DIGIT \"-\" 2DIGIT\n");
        AbnfResult r = Abnf.parseWithImports(dir.resolve("orchard.abnf"));
        assertEquals(List.of(), r.diagnostics());
        assertEquals(List.of("row", "tree", "variety", "graft-date", "DIGIT", "SP"),
                r.grammar().rules().stream().map(Rule::name).toList());
        assertTrue(r.sites().stream().anyMatch(s -> s.source().endsWith("dates.abnf") && s.isDefinition()));
        AbnfResult missing = Abnf.parseWithImports(dir.resolve("no-such.abnf"));
        assertEquals("import", missing.diagnostics().get(0).code());
    }
}
