package dev.espalier.lsp;

import dev.espalier.cli.CliAccess;
import org.eclipse.lsp4j.CodeAction;
import org.eclipse.lsp4j.CodeActionContext;
import org.eclipse.lsp4j.CodeActionParams;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.CompletionParams;
import org.eclipse.lsp4j.DefinitionParams;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.DocumentFormattingParams;
import org.eclipse.lsp4j.DocumentSymbol;
import org.eclipse.lsp4j.DocumentSymbolParams;
import org.eclipse.lsp4j.FoldingRange;
import org.eclipse.lsp4j.FoldingRangeKind;
import org.eclipse.lsp4j.FoldingRangeRequestParams;
import org.eclipse.lsp4j.FormattingOptions;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.HoverParams;
import org.eclipse.lsp4j.InsertTextFormat;
import org.eclipse.lsp4j.Location;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PrepareRenameParams;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.ReferenceContext;
import org.eclipse.lsp4j.ReferenceParams;
import org.eclipse.lsp4j.RenameParams;
import org.eclipse.lsp4j.SemanticTokens;
import org.eclipse.lsp4j.SemanticTokensParams;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.TextEdit;
import org.eclipse.lsp4j.WorkspaceEdit;
import org.eclipse.lsp4j.WorkspaceSymbol;
import org.eclipse.lsp4j.WorkspaceSymbolParams;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.eclipse.lsp4j.jsonrpc.messages.Either;
import org.eclipse.lsp4j.jsonrpc.messages.ResponseErrorCode;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ExecutionException;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;

import static dev.espalier.lsp.TestClient.get;
import static dev.espalier.lsp.TestClient.pos;
import static dev.espalier.lsp.TestClient.range;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Every grammar-file feature through an lsp4j client, on an orchard work-order grammar. */
class GrammarFeaturesTest {

    static final String ORDERS = """
            ; work orders for the orchard crew
            ;@use "stock/rootstocks.abnf"
            order    = command *( "; " command )
            command  = prune / graft
            prune    = %s"prune tree " tree-id [ %s" by " date ]
            graft    = %s"graft tree " Tree-ID %s" with " variety
                       %s" on " rootstock
            tree-id  = %s"T-" 4DIGIT
            variety  = %s"Amberglow" / %s"Copperbell" / %s"Russet Vale"
            date     = 4DIGIT "-" 2DIGIT "-" 2DIGIT
            """;

    static final String ROOTSTOCKS = """
            rootstock = %s"RS-" ( "7" / "9" / "12" / "26" )
            """;

    @TempDir
    Path ws;
    TestClient client;
    String ordersUri;
    String stockUri;

    @BeforeEach
    void start() throws Exception {
        Path orders = write("orders.abnf", ORDERS);
        Path stock = write("stock/rootstocks.abnf", ROOTSTOCKS);
        ordersUri = orders.toUri().toString();
        stockUri = stock.toUri().toString();
        client = TestClient.start(ws);
    }

    @AfterEach
    void stop() throws Exception {
        client.close();
    }

    Path write(String name, String text) throws IOException {
        Path p = ws.resolve(name).toAbsolutePath().normalize();
        Files.createDirectories(p.getParent());
        Files.writeString(p, text, StandardCharsets.UTF_8);
        return p;
    }

    /** The position of the n-th (0-based) occurrence of a string, plus an offset into it. */
    static Position at(String text, String what, int occurrence, int plus) {
        int i = -1;
        for (int k = 0; k <= occurrence; k++) {
            i = text.indexOf(what, i + 1);
            assertTrue(i >= 0, what);
        }
        return new DocumentSnapshot("file:///x", "", 0, text).position(i + plus);
    }

    TextDocumentIdentifier id(String uri) {
        return new TextDocumentIdentifier(uri);
    }

    static String code(Diagnostic d) {
        return d.getCode().getLeft();
    }

    // ------------------------------------------------------------ diagnostics

    @Test
    void aCleanGrammarWithItsImportHasNoProblems() throws Exception {
        client.open(ordersUri, ORDERS);
        List<Diagnostic> ds = client.diagnostics(ordersUri).getDiagnostics();
        // the plain "; " and "-" strings hold no letters: no case hints; every rule is used
        assertEquals(List.of(), ds, ds.toString());
    }

    @Test
    void findingsCarryRangesSeveritiesAndCodes() throws Exception {
        String text = """
                order = prune / prune-all
                prune = "prune " tre
                prune = "cut"
                spare = "x"
                """;
        client.open(ordersUri, text);
        List<Diagnostic> ds = client.diagnostics(ordersUri).getDiagnostics();
        Map<String, Diagnostic> byCode = ds.stream().collect(Collectors.toMap(GrammarFeaturesTest::code, d -> d, (a, b) -> a));
        // the start rule derives nothing while "tre" is undefined: empty-language too
        assertEquals(Set.of("undefined-rule", "duplicate-definition", "unused-rule", "case-insensitive-string",
                "empty-language"),
                byCode.keySet(), ds.toString());
        Diagnostic undefined = ds.stream().filter(d -> code(d).equals("undefined-rule")
                && d.getRange().getStart().getLine() == 1).findFirst().orElseThrow();
        assertEquals(range(1, 17, 1, 20), undefined.getRange()); // "tre"
        assertEquals(DiagnosticSeverity.Error, undefined.getSeverity());
        assertEquals(range(2, 0, 2, 5), byCode.get("duplicate-definition").getRange());
        assertEquals(range(1, 0, 1, 5), byCode.get("duplicate-definition").getRelatedInformation().get(0).getLocation()
                .getRange());
        assertEquals(range(3, 0, 3, 5), byCode.get("unused-rule").getRange());
        assertEquals(DiagnosticSeverity.Warning, byCode.get("unused-rule").getSeverity());
        assertEquals(DiagnosticSeverity.Hint, byCode.get("case-insensitive-string").getSeverity());
        assertEquals("espalier", undefined.getSource());
    }

    @Test
    void incrementalEditsAreAppliedInUtf16Columns() throws Exception {
        String text = "label = \"🍎\" tre\n";
        client.open(ordersUri, text);
        Diagnostic d = client.diagnostics(ordersUri).getDiagnostics().stream()
                .filter(x -> code(x).equals("undefined-rule")).findFirst().orElseThrow();
        // "🍎" is two UTF-16 units: "tre" starts at column 13 (Java String index, the LSP's default encoding)
        assertEquals(range(0, 13, 0, 16), d.getRange());
        client.edit(ordersUri, range(0, 16, 0, 16), "e\ntree = %x41");
        List<Diagnostic> after = client.diagnostics(ordersUri).getDiagnostics();
        assertTrue(after.stream().noneMatch(x -> code(x).equals("undefined-rule")), after.toString());
        client.edit(ordersUri, range(1, 7, 1, 12), "tre");
        List<Diagnostic> again = client.diagnostics(ordersUri).getDiagnostics();
        assertTrue(again.stream().anyMatch(x -> code(x).equals("undefined-rule")
                && x.getRange().equals(range(1, 7, 1, 10))), again.toString());
    }

    @Test
    void aMissingImportIsReportedAtItsDirective() throws Exception {
        String text = ";@use \"nursery/varieties.abnf\"\norder = variety\n";
        client.open(ordersUri, text);
        List<Diagnostic> ds = client.diagnostics(ordersUri).getDiagnostics();
        assertTrue(ds.stream().anyMatch(d -> code(d).equals("import") && d.getRange().getStart().getLine() == 0),
                ds.toString());
    }

    @Test
    void anImportedDocumentOpenInTheEditorIsReadWithItsUnsavedText() throws Exception {
        client.open(stockUri, ROOTSTOCKS);
        client.diagnostics(stockUri);
        client.open(ordersUri, ORDERS);
        assertEquals(List.of(), client.diagnostics(ordersUri).getDiagnostics());
        // rename the rule in the imported document, unsaved: the importer's reference becomes undefined
        client.edit(stockUri, range(0, 0, 0, 9), "stock");
        PublishDiagnosticsParams p = client.awaitPublished(x -> x.getUri().equals(ordersUri)
                && x.getDiagnostics().stream().anyMatch(d -> code(d).equals("undefined-rule")));
        assertEquals(at(ORDERS, "rootstock", 1, 0).getLine(), p.getDiagnostics().get(0).getRange().getStart().getLine());
    }

    @Test
    void anImportChangedOnDiskRefreshesTheImporterWhenTheClientReportsIt() throws Exception {
        client.open(ordersUri, ORDERS);
        assertEquals(List.of(), client.diagnostics(ordersUri).getDiagnostics());
        write("stock/rootstocks.abnf", "stock = %s\"RS-7\"\n");
        client.remote.getWorkspaceService().didChangeWatchedFiles(new org.eclipse.lsp4j.DidChangeWatchedFilesParams(
                List.of(new org.eclipse.lsp4j.FileEvent(stockUri, org.eclipse.lsp4j.FileChangeType.Changed))));
        PublishDiagnosticsParams p = client.awaitPublished(x -> x.getUri().equals(ordersUri)
                && x.getDiagnostics().stream().anyMatch(d -> code(d).equals("undefined-rule")));
        assertTrue(p.getDiagnostics().get(0).getMessage().contains("rootstock"), p.toString());
    }

    // ------------------------------------------------------------ completion

    @Test
    void completionOffersRulesCoreRulesAndValueSnippets() throws Exception {
        String text = ORDERS + "extra    = \n";
        client.open(ordersUri, text);
        CompletionList list = get(client.remote.getTextDocumentService().completion(
                new CompletionParams(id(ordersUri), pos(11, 11)))).getRight();
        Map<String, CompletionItem> byLabel = list.getItems().stream()
                .collect(Collectors.toMap(CompletionItem::getLabel, i -> i, (a, b) -> a));
        assertTrue(byLabel.keySet().containsAll(List.of("order", "tree-id", "variety", "rootstock", "DIGIT", "ALPHA",
                "HEXDIG", "%x41", "%s\"…\"")), byLabel.keySet().toString());
        assertEquals("rule from rootstocks.abnf", byLabel.get("rootstock").getDetail());
        CompletionItem snippet = byLabel.get("%s\"…\"");
        assertEquals(InsertTextFormat.Snippet, snippet.getInsertTextFormat());
        assertEquals("%s\"${1:text}\"", snippet.getTextEdit().getLeft().getNewText());
        // the core rule's documentation is the RFC's definition (RFC 5234 Appendix B.1: DIGIT = %x30-39)
        assertTrue(byLabel.get("DIGIT").getDocumentation().getRight().getValue().contains("DIGIT = %x30-39"));
        // resolve adds the definition as written
        CompletionItem resolved = get(client.remote.getTextDocumentService().resolveCompletionItem(byLabel.get("tree-id")));
        assertTrue(resolved.getDocumentation().getRight().getValue().contains("tree-id  = %s\"T-\" 4DIGIT"),
                resolved.getDocumentation().getRight().getValue());
        CompletionItem graft = get(client.remote.getTextDocumentService().resolveCompletionItem(byLabel.get("graft")));
        // a definition over two lines is shown whole
        assertTrue(graft.getDocumentation().getRight().getValue().contains("%s\" on \" rootstock"));
    }

    @Test
    void completionAfterAPercentSignOffersOnlyValueSyntaxesAndNothingInComments() throws Exception {
        String text = "tag = %\n; a comment about tr\n";
        client.open(ordersUri, text);
        CompletionList values = get(client.remote.getTextDocumentService().completion(
                new CompletionParams(id(ordersUri), pos(0, 7)))).getRight();
        assertFalse(values.getItems().isEmpty());
        for (CompletionItem i : values.getItems()) {
            assertTrue(i.getLabel().startsWith("%"), i.getLabel());
            // the edit replaces the typed "%"
            assertEquals(range(0, 6, 0, 7), i.getTextEdit().getLeft().getRange());
        }
        CompletionList inComment = get(client.remote.getTextDocumentService().completion(
                new CompletionParams(id(ordersUri), pos(1, 22)))).getRight();
        assertEquals(List.of(), inComment.getItems());
    }

    // ------------------------------------------------------------ hover

    String hover(String text, Position p) throws Exception {
        Hover h = get(client.remote.getTextDocumentService().hover(new HoverParams(id(ordersUri), p)));
        assertNotNull(h, "no hover at " + p);
        return h.getContents().getRight().getValue();
    }

    @Test
    void hoverOnARegularRuleShowsItsAutomatonShortestStringAndExamples() throws Exception {
        client.open(ordersUri, ORDERS);
        String md = hover(ORDERS, at(ORDERS, "tree-id", 0, 2));
        assertTrue(md.contains("tree-id  = %s\"T-\" 4DIGIT"), md);
        assertTrue(md.contains("nullable: no"), md);
        // the minimal DFA of T-[0-9]{4} has a state before each of its 6 characters and an accepting one
        // (common practice: a trimmed minimal DFA of a fixed-length pattern has length + 1 states)
        assertTrue(md.contains("byte automaton of 7 states"), md);
        Pattern tree = Pattern.compile("T-[0-9]{4}"); // java.util.regex as the oracle of the rule's language
        Matcher shortest = Pattern.compile("shortest string: `\"([^\"]*)\"` \\(6 bytes\\)").matcher(md);
        assertTrue(shortest.find(), md);
        assertTrue(tree.matcher(shortest.group(1)).matches(), shortest.group(1));
        Matcher examples = Pattern.compile("examples: (.*)").matcher(md);
        assertTrue(examples.find(), md);
        Matcher each = Pattern.compile("`\"([^\"]*)\"`").matcher(examples.group(1));
        int n = 0;
        while (each.find()) {
            assertTrue(tree.matcher(each.group(1)).matches(), each.group(1));
            n++;
        }
        assertTrue(n >= 2, md);
    }

    @Test
    void hoverTellsNullableAndContextFreeRules() throws Exception {
        String text = """
                list  = "[" [ items ] "]"
                items = list *( "," list )
                gap   = *" "
                """;
        client.open(ordersUri, text);
        String list = hover(text, at(text, "list", 0, 1));
        assertTrue(list.contains("context-free"), list);
        assertTrue(list.contains("shortest string: `\"[]\"`"), list);
        String gap = hover(text, at(text, "gap", 0, 1));
        assertTrue(gap.contains("nullable: yes"), gap);
        assertTrue(gap.contains("shortest string: `\"\"` (0 bytes)"), gap);
        String core = hover(text, pos(0, 0));
        assertTrue(core.contains("defined in this file, line 1"), core);
    }

    @Test
    void hoverOnACoreRuleShowsTheRfcDefinition() throws Exception {
        client.open(ordersUri, ORDERS);
        String md = hover(ORDERS, at(ORDERS, "4DIGIT", 0, 2));
        assertTrue(md.contains("RFC 5234 core rule"), md);
        assertTrue(md.contains("DIGIT = %x30-39"), md); // RFC 5234 Appendix B.1
        // [0-9]: a start state and an accepting state
        assertTrue(md.contains("byte automaton of 2 states"), md);
    }

    // ------------------------------------------------------------ navigation

    @Test
    void definitionFindsRulesHereAndInImportedFilesAndTheImportedFileItself() throws Exception {
        client.open(ordersUri, ORDERS);
        List<? extends Location> here = get(client.remote.getTextDocumentService().definition(
                new DefinitionParams(id(ordersUri), at(ORDERS, "Tree-ID", 0, 3)))).getLeft();
        assertEquals(List.of(new Location(ordersUri, range(7, 0, 7, 7))), here);
        List<? extends Location> there = get(client.remote.getTextDocumentService().definition(
                new DefinitionParams(id(ordersUri), at(ORDERS, "rootstock", 1, 1)))).getLeft();
        assertEquals(List.of(new Location(stockUri, range(0, 0, 0, 9))), there);
        List<? extends Location> file = get(client.remote.getTextDocumentService().definition(
                new DefinitionParams(id(ordersUri), at(ORDERS, "rootstocks.abnf", 0, 2)))).getLeft();
        assertEquals(stockUri, file.get(0).getUri());
    }

    @Test
    void referencesIgnoreCase() throws Exception {
        client.open(ordersUri, ORDERS);
        List<? extends Location> refs = get(client.remote.getTextDocumentService().references(
                new ReferenceParams(id(ordersUri), at(ORDERS, "tree-id", 0, 1), new ReferenceContext(false))));
        // tree-id in prune, Tree-ID in graft
        assertEquals(2, refs.size(), refs.toString());
        List<? extends Location> withDecl = get(client.remote.getTextDocumentService().references(
                new ReferenceParams(id(ordersUri), at(ORDERS, "tree-id", 0, 1), new ReferenceContext(true))));
        assertEquals(3, withDecl.size());
    }

    @Test
    void renameChangesEveryOccurrenceInAnyCaseAcrossImports() throws Exception {
        client.open(ordersUri, ORDERS);
        var prepared = get(client.remote.getTextDocumentService().prepareRename(
                new PrepareRenameParams(id(ordersUri), at(ORDERS, "Tree-ID", 0, 1))));
        assertEquals(new Range(at(ORDERS, "Tree-ID", 0, 0), at(ORDERS, "Tree-ID", 0, 7)), prepared.getFirst());
        WorkspaceEdit edit = get(client.remote.getTextDocumentService().rename(
                new RenameParams(id(ordersUri), at(ORDERS, "Tree-ID", 0, 1), "tag-id")));
        String renamed = Edits.apply(ORDERS, edit.getChanges().get(ordersUri));
        assertFalse(renamed.toLowerCase().contains("tree-id"), renamed);
        assertEquals(3, renamed.split("tag-id", -1).length - 1);

        WorkspaceEdit stock = get(client.remote.getTextDocumentService().rename(
                new RenameParams(id(ordersUri), at(ORDERS, "rootstock", 1, 1), "stock")));
        assertEquals(Set.of(ordersUri, stockUri), stock.getChanges().keySet());
        assertEquals("stock = %s\"RS-\" ( \"7\" / \"9\" / \"12\" / \"26\" )\n",
                Edits.apply(ROOTSTOCKS, stock.getChanges().get(stockUri)));
    }

    @Test
    void renameRefusesBadNamesCollisionsAndCoreRules() throws Exception {
        client.open(ordersUri, ORDERS);
        for (String bad : List.of("2trees", "tree id", "variety", "DIGIT")) {
            ExecutionException e = assertThrows(ExecutionException.class, () -> get(client.remote.getTextDocumentService()
                    .rename(new RenameParams(id(ordersUri), at(ORDERS, "tree-id", 0, 1), bad))));
            ResponseErrorException r = assertInstanceOf(ResponseErrorException.class, e.getCause());
            assertEquals(ResponseErrorCode.InvalidParams.getValue(), r.getResponseError().getCode(), bad);
        }
        ExecutionException core = assertThrows(ExecutionException.class, () -> get(client.remote.getTextDocumentService()
                .prepareRename(new PrepareRenameParams(id(ordersUri), at(ORDERS, "4DIGIT", 0, 2)))));
        assertTrue(core.getCause().getMessage().contains("core rule"), core.getCause().getMessage());
    }

    // ------------------------------------------------------------ symbols

    @Test
    void documentSymbolsListEveryDefinitionWithItsWholeExtent() throws Exception {
        client.open(ordersUri, ORDERS);
        List<DocumentSymbol> symbols = get(client.remote.getTextDocumentService().documentSymbol(
                new DocumentSymbolParams(id(ordersUri)))).stream().map(Either::getRight).toList();
        assertEquals(List.of("order", "command", "prune", "graft", "tree-id", "variety", "date"),
                symbols.stream().map(DocumentSymbol::getName).toList());
        DocumentSymbol graft = symbols.get(3);
        assertEquals(range(5, 0, 6, 29), graft.getRange());
        assertEquals(range(5, 0, 5, 5), graft.getSelectionRange());
    }

    @Test
    void workspaceSymbolsCoverOpenDocumentsAndFilesOnDisk() throws Exception {
        client.open(ordersUri, ORDERS);
        List<? extends WorkspaceSymbol> all = get(client.remote.getWorkspaceService().symbol(
                new WorkspaceSymbolParams(""))).getRight();
        Set<String> names = all.stream().map(WorkspaceSymbol::getName).collect(Collectors.toSet());
        assertTrue(names.containsAll(List.of("order", "graft", "rootstock")), names.toString());
        List<? extends WorkspaceSymbol> stock = get(client.remote.getWorkspaceService().symbol(
                new WorkspaceSymbolParams("rtstk"))).getRight();
        assertEquals(List.of("rootstock"), stock.stream().map(WorkspaceSymbol::getName).toList());
        assertEquals(stockUri, stock.get(0).getLocation().getLeft().getUri());
    }

    // ------------------------------------------------------------ presentation

    @Test
    void semanticTokensMarkNamesDefinitionsCoreRulesStringsAndComments() throws Exception {
        client.open(ordersUri, ORDERS);
        SemanticTokens t = get(client.remote.getTextDocumentService().semanticTokensFull(
                new SemanticTokensParams(id(ordersUri))));
        List<int[]> decoded = decode(t.getData());
        DocumentSnapshot doc = new DocumentSnapshot(ordersUri, "", 0, ORDERS);
        Map<String, int[]> first = new java.util.LinkedHashMap<>();
        for (int[] tok : decoded) {
            int start = doc.offset(pos(tok[0], tok[1]));
            first.putIfAbsent(ORDERS.substring(start, start + tok[2]), tok);
        }
        assertEquals(SemanticLegend.COMMENT, first.get("; work orders for the orchard crew")[3]);
        assertEquals(SemanticLegend.KEYWORD, first.get(";@use")[3]);
        assertEquals(SemanticLegend.STRING, first.get("\"stock/rootstocks.abnf\"")[3]);
        assertEquals(SemanticLegend.FUNCTION, first.get("order")[3]);
        assertEquals(SemanticLegend.DECLARATION, first.get("order")[4]);
        assertEquals(SemanticLegend.DEFAULT_LIBRARY, first.get("DIGIT")[4]);
        assertEquals(SemanticLegend.STRING, first.get("%s\"prune tree \"")[3]);
        assertEquals(SemanticLegend.OPERATOR, first.get("=")[3]);
        assertEquals(SemanticLegend.NUMBER, first.get("4")[3]);
    }

    static List<int[]> decode(List<Integer> data) {
        List<int[]> out = new ArrayList<>();
        int line = 0;
        int ch = 0;
        for (int i = 0; i + 4 < data.size(); i += 5) {
            line += data.get(i);
            ch = data.get(i) == 0 ? ch + data.get(i + 1) : data.get(i + 1);
            out.add(new int[] {line, ch, data.get(i + 2), data.get(i + 3), data.get(i + 4)});
        }
        return out;
    }

    @Test
    void foldingRangesCoverLongRulesAndCommentBlocks() throws Exception {
        String text = "; orchard\n; work orders\norder = a\n  / b\n\na = \"x\"\nb = \"y\"\n";
        client.open(ordersUri, text);
        List<FoldingRange> folds = get(client.remote.getTextDocumentService().foldingRange(
                new FoldingRangeRequestParams(id(ordersUri))));
        assertEquals(2, folds.size(), folds.toString());
        assertEquals(List.of(0, 1, FoldingRangeKind.Comment), List.of(folds.get(0).getStartLine(),
                folds.get(0).getEndLine(), folds.get(0).getKind()));
        assertEquals(List.of(2, 3, FoldingRangeKind.Region), List.of(folds.get(1).getStartLine(),
                folds.get(1).getEndLine(), folds.get(1).getKind()));
    }

    @Test
    void formattingGivesTheLayoutOfEspalierFmt() throws Exception {
        String text = "; orchard\norder=command  *(\";\"   command)\ncommand   = \"prune\"/\"graft\"\n";
        Path file = write("messy.abnf", text);
        String uri = file.toUri().toString();
        client.open(uri, text);
        List<? extends TextEdit> edits = get(client.remote.getTextDocumentService().formatting(
                new DocumentFormattingParams(id(uri), new FormattingOptions(4, true))));
        String formatted = Edits.apply(text, edits);
        assertEquals(CliAccess.run("fmt", file.toString()), formatted); // the command line's output
        assertTrue(formatted.contains("order   = command *(\";\" command)"), formatted);
        client.replaceAll(uri, formatted);
        assertEquals(List.of(), get(client.remote.getTextDocumentService().formatting(
                new DocumentFormattingParams(id(uri), new FormattingOptions(4, true)))));
    }

    // ------------------------------------------------------------ code actions

    /** Applies the only quick fix titled as given to the text, and returns the diagnostics after it. */
    List<Diagnostic> applyFix(String text, Position where, String titleStart) throws Exception {
        client.replaceAll(ordersUri, text);
        List<Diagnostic> before = client.diagnostics(ordersUri).getDiagnostics();
        List<CodeAction> actions = get(client.remote.getTextDocumentService().codeAction(new CodeActionParams(
                id(ordersUri), new Range(where, where), new CodeActionContext(before)))).stream()
                .map(Either::getRight).filter(a -> a.getTitle().startsWith(titleStart)).toList();
        assertEquals(1, actions.size(), "actions titled " + titleStart);
        String fixed = Edits.apply(text, actions.get(0).getEdit().getChanges().get(ordersUri));
        client.replaceAll(ordersUri, fixed);
        lastFixed = fixed;
        return client.diagnostics(ordersUri).getDiagnostics();
    }

    String lastFixed;

    @Test
    void quickFixesRemoveTheirFindings() throws Exception {
        client.open(ordersUri, "");
        String undefined = "order = prune\n";
        List<Diagnostic> after = applyFix(undefined, pos(0, 9), "Define rule 'prune'");
        assertEquals(List.of(), after, lastFixed);
        assertEquals("order = prune\nprune = \"\"\n", lastFixed);

        String caseless = "order = \"Amberglow\"\n";
        after = applyFix(caseless, pos(0, 10), "Make the string case-sensitive");
        assertEquals(List.of(), after, lastFixed);
        assertEquals("order = %s\"Amberglow\"\n", lastFixed);

        String unused = "order = %s\"x\"\nspare = %s\"y\"\n  / %s\"z\"\nlast = order\n";
        after = applyFix(unused, pos(1, 2), "Remove unused rule 'spare'");
        assertEquals("order = %s\"x\"\nlast = order\n", lastFixed);
        assertTrue(after.stream().noneMatch(d -> d.getMessage().contains("spare")), after.toString());

        String twice = "variety = %s\"Amberglow\"\nvariety = %s\"Copperbell\"\n";
        after = applyFix(twice, pos(1, 3), "Turn the second '='");
        assertEquals(List.of(), after, lastFixed);
        assertEquals("variety = %s\"Amberglow\"\nvariety =/ %s\"Copperbell\"\n", lastFixed);
    }

    @Test
    void aMisspelledRuleGetsASuggestion() throws Exception {
        client.open(ordersUri, "");
        List<Diagnostic> after = applyFix("order = DIGTI variety\nvariety = %s\"Amberglow\"\n", pos(0, 9), "Change to 'DIGIT'");
        assertEquals(List.of(), after, lastFixed);
    }
}
