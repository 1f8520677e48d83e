package dev.espalier.lsp;

import org.eclipse.lsp4j.CodeActionContext;
import org.eclipse.lsp4j.CodeActionParams;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.FormattingOptions;
import org.eclipse.lsp4j.MessageType;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.TextEdit;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.Random;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Every grammar feature on damaged text never fails: the grammar library's files, cut and spliced
 * at random, asked for everything at random positions. Ranges returned stay inside the text, and
 * semantic tokens decode to ranges inside their lines.
 */
class GrammarFeaturesFuzzTest {

    private static final String NOISE = "=/ ()[]*%xsdib\"<>;-0123456789abcXYZ\n\r\t🍎";

    @Test
    void featuresNeverFailOnDamagedGrammars() throws Exception {
        List<String> library = new ArrayList<>();
        try (Stream<Path> files = Files.list(Path.of("..", "grammars"))) {
            for (Path p : files.filter(f -> f.toString().endsWith(".abnf")).sorted().toList()) {
                library.add(Files.readString(p, StandardCharsets.UTF_8));
            }
        }
        assertTrue(library.size() >= 5, "the grammar library is missing");
        List<String> logs = new ArrayList<>();
        ServerContext context = new ServerContext() {
            @Override
            public List<Path> workspaceFolders() {
                return List.of();
            }

            @Override
            public Optional<DocumentSnapshot> openDocument(String uri) {
                return Optional.empty();
            }

            @Override
            public List<DocumentSnapshot> openDocuments() {
                return List.of();
            }

            @Override
            public void log(MessageType type, String message) {
                logs.add(message);
            }

            @Override
            public void refreshDiagnostics() {
            }

            @Override
            public void refreshDiagnostics(String uri) {
            }
        };
        GrammarFeatures f = new GrammarFeatures(context);
        Random rnd = new Random(2024);
        for (int round = 0; round < 40; round++) {
            String base = library.get(rnd.nextInt(library.size()));
            StringBuilder sb = new StringBuilder(base);
            for (int k = 1 + rnd.nextInt(4); k > 0; k--) {
                int a = rnd.nextInt(sb.length() + 1);
                int b = Math.min(sb.length(), a + rnd.nextInt(40));
                if (rnd.nextBoolean()) {
                    sb.delete(a, b);
                } else {
                    StringBuilder ins = new StringBuilder();
                    for (int n = rnd.nextInt(6); n > 0; n--) {
                        ins.appendCodePoint(NOISE.codePoints().toArray()[rnd.nextInt((int) NOISE.codePoints().count())]);
                    }
                    sb.insert(a, ins);
                }
            }
            DocumentSnapshot doc = new DocumentSnapshot("file:///tmp/fuzz-" + round + ".abnf", "abnf", round, sb.toString());
            f.diagnostics(doc).forEach(d -> inside(doc, d.getRange()));
            f.documentSymbols(doc).forEach(s -> inside(doc, s.getRange()));
            f.foldingRanges(doc).forEach(r -> assertTrue(r.getEndLine() < doc.lineCount() && r.getStartLine() <= r.getEndLine()));
            List<TextEdit> format = f.formatting(doc, new FormattingOptions(2, true));
            format.forEach(e -> inside(doc, e.getRange()));
            tokensInsideLines(doc, f.semanticTokens(doc));
            for (int q = 0; q < 4; q++) {
                Position p = doc.position(rnd.nextInt(doc.text().length() + 1));
                for (CompletionItem item : f.completion(doc, p).getItems()) {
                    inside(doc, item.getTextEdit().getLeft().getRange());
                }
                f.hover(doc, p);
                f.definition(doc, p);
                f.references(doc, p, true).forEach(l -> inside(doc, l.getRange()));
                try {
                    Range r = f.prepareRename(doc, p);
                    if (r != null) {
                        inside(doc, r);
                        f.rename(doc, p, "renamed-rule");
                    }
                } catch (IllegalArgumentException e) { // a core rule or a name collision: refused with a message
                    assertTrue(e.getMessage() != null && !e.getMessage().isEmpty());
                }
                f.codeActions(doc, new CodeActionParams(new TextDocumentIdentifier(doc.uri()), new Range(p, p),
                        new CodeActionContext(List.of()))).forEach(a -> a.getEdit().getChanges().values()
                        .forEach(edits -> edits.forEach(e -> inside(doc, e.getRange()))));
            }
        }
    }

    private static void inside(DocumentSnapshot doc, Range r) {
        int a = doc.offset(r.getStart());
        int b = doc.offset(r.getEnd());
        assertTrue(a <= b, r.toString());
        assertEquals(r.getStart(), doc.position(a), "start of " + r);
        assertEquals(r.getEnd(), doc.position(b), "end of " + r);
    }

    private static void tokensInsideLines(DocumentSnapshot doc, List<Integer> data) {
        assertEquals(0, data.size() % 5);
        int line = 0;
        int ch = 0;
        for (int i = 0; i < data.size(); i += 5) {
            line += data.get(i);
            ch = data.get(i) == 0 ? ch + data.get(i + 1) : data.get(i + 1);
            assertTrue(data.get(i + 2) > 0);
            int start = doc.lineStart(line) + ch;
            assertTrue(start + data.get(i + 2) <= doc.lineEnd(line), "token past its line at " + line + ":" + ch);
        }
    }
}
