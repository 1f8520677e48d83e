package dev.espalier.lsp;

import dev.espalier.abnf.AbnfCheck;
import dev.espalier.grammar.Grammar;
import dev.espalier.lsp.samples.PreviewCache;
import dev.espalier.lsp.samples.SampleMap;
import dev.espalier.lsp.samples.SamplePreviews;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import org.eclipse.lsp4j.CompletionItem;
import org.eclipse.lsp4j.CompletionList;
import org.eclipse.lsp4j.CompletionParams;
import org.eclipse.lsp4j.Diagnostic;
import org.eclipse.lsp4j.DiagnosticSeverity;
import org.eclipse.lsp4j.DidChangeWatchedFilesParams;
import org.eclipse.lsp4j.FileChangeType;
import org.eclipse.lsp4j.FileEvent;
import org.eclipse.lsp4j.Hover;
import org.eclipse.lsp4j.HoverParams;
import org.eclipse.lsp4j.Position;
import org.eclipse.lsp4j.PublishDiagnosticsParams;
import org.eclipse.lsp4j.Range;
import org.eclipse.lsp4j.TextDocumentIdentifier;
import org.eclipse.lsp4j.jsonrpc.ResponseErrorException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.TreeSet;
import java.util.concurrent.ExecutionException;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The allowed-token preview in sample files, through a real lsp4j client. Every count and token
 * set is checked against a slow twin computed here: a fresh cursor of an independently compiled
 * constraint fed the prefix and then each token's bytes ({@code tryFeedBytes}), never the mask.
 * Ranges are checked against offsets found with {@link String#indexOf} in the sample text.
 */
class SamplePreviewFeaturesTest {

    /** One cache for every server of this class: the vocabularies load once. */
    private static final PreviewCache CACHE = new PreviewCache();

    @TempDir
    static Path ws;
    static Vocabulary tiny;

    static final String MAP = """
            {
              "description": "orchard previews",
              "samples": [
                { "files": "orders/*.txt", "grammar": "work-order.abnf", "start": "order", "vocabulary": "cl100k" },
                { "files": ["tags/*.tag"], "regex": "[a-zé🍎]* [0-9]+", "vocabulary": "tiny.ranks" },
                { "files": "rows/*.txt", "grammar": "rows.abnf", "vocabulary": "tiny.ranks" }
              ]
            }
            """;

    static final String WORK_ORDER = """
            order    = command *( "; " command )
            command  = prune / graft
            prune    = %s"prune tree " tree-id [ %s" by " date ]
            graft    = %s"graft tree " tree-id %s" with " variety %s" on RS-" 1*2DIGIT
            tree-id  = %s"T-" 4DIGIT
            variety  = %s"Amberglow" / %s"Copperbell" / %s"Russet Vale"
            date     = 4DIGIT "-" 2DIGIT "-" 2DIGIT
            """;

    /** Nested rows of tree numbers: recursive, so masks come from the Earley parser. */
    static final String ROWS = """
            rows = "[" [ item *( "," item ) ] "]"
            item = rows / 1*DIGIT
            """;

    /** Tokens of the tiny vocabulary (a rank file, ids in this order), with partial UTF-8 characters. */
    static final List<byte[]> TINY_TOKENS = new ArrayList<>();

    @BeforeAll
    static void workspace() throws Exception {
        for (char c = 'a'; c <= 'z'; c++) {
            TINY_TOKENS.add(new byte[] {(byte) c});
        }
        for (char c = '0'; c <= '9'; c++) {
            TINY_TOKENS.add(new byte[] {(byte) c});
        }
        for (String s : List.of(" ", ",", "[", "]", "é", "🍎", "ab", " 1", "12", "[1", "],", "x", "\n")) {
            TINY_TOKENS.add(s.getBytes(StandardCharsets.UTF_8));
        }
        TINY_TOKENS.add(new byte[] {(byte) 0xC3});                        // first byte of é
        TINY_TOKENS.add(new byte[] {(byte) 0xA9});                        // last byte of é
        TINY_TOKENS.add(new byte[] {(byte) 0xF0, (byte) 0x9F});           // first half of 🍎
        TINY_TOKENS.add(new byte[] {(byte) 0x8D, (byte) 0x8E});           // second half of 🍎
        TINY_TOKENS.add(new byte[] {'a', (byte) 0xC3});                   // a, then half of é
        StringBuilder ranks = new StringBuilder();
        for (int i = 0; i < TINY_TOKENS.size(); i++) {
            ranks.append(Base64.getEncoder().encodeToString(TINY_TOKENS.get(i))).append(' ').append(i).append('\n');
        }
        Files.writeString(ws.resolve("tiny.ranks"), ranks);
        Files.writeString(ws.resolve("work-order.abnf"), WORK_ORDER);
        Files.writeString(ws.resolve("rows.abnf"), ROWS);
        Files.writeString(ws.resolve(SampleMap.FILE_NAME), MAP);
        Files.createDirectories(ws.resolve("orders"));
        Files.createDirectories(ws.resolve("tags"));
        Files.createDirectories(ws.resolve("rows"));
        tiny = Vocabularies.load(ws.resolve("tiny.ranks"));
    }

    static TestClient client;

    @BeforeAll
    static void server() throws Exception {
        client = TestClient.start(ServerOptions.defaults().withDebounce(Duration.ZERO)
                .withSamples(SamplePreviews.features(CACHE)), null);
    }

    @AfterAll
    static void stop() throws Exception {
        client.close();
    }

    // ------------------------------------------------------------------ helpers

    static String uri(String relative) {
        return ws.resolve(relative).toUri().toString();
    }

    /** Opens a document and waits for its diagnostics once the preview is ready. */
    static List<Diagnostic> openAndCheck(TestClient c, String uri, String text) throws Exception {
        c.open(uri, text);
        return settled(c, uri);
    }

    /** The diagnostics of the document's current version that are not a "being prepared" note. */
    static List<Diagnostic> settled(TestClient c, String uri) throws Exception {
        int v = c.version(uri);
        return c.awaitPublished(p -> p.getUri().equals(uri) && p.getVersion() != null && p.getVersion() == v
                && p.getDiagnostics().stream().noneMatch(d -> code(d).equals("preview-preparing"))).getDiagnostics();
    }

    static String code(Diagnostic d) {
        return d.getCode() == null ? "" : d.getCode().getLeft();
    }

    static AllowedTokensResult allowed(TestClient c, String uri, Position p, int limit) throws Exception {
        return TestClient.get(c.remote.allowedTokens(new AllowedTokensParams(uri, p, limit)));
    }

    /** The slow twin: the tokens a fresh cursor takes after the prefix, one at a time. */
    static TreeSet<Integer> twin(Constraint c, byte[] prefix) {
        Vocabulary v = c.vocabulary();
        TreeSet<Integer> out = new TreeSet<>();
        Cursor base = c.start();
        if (!base.tryFeedBytes(prefix)) {
            return out;
        }
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id)) {
                continue;
            }
            if (id == v.endOfSequence()) {
                if (base.isComplete()) {
                    out.add(id);
                }
                continue;
            }
            if (v.isSpecial(id) || v.length(id) == 0) {
                continue;
            }
            Cursor fresh = c.start();
            byte[] token = v.bytes(id);
            byte[] all = new byte[prefix.length + token.length];
            System.arraycopy(prefix, 0, all, 0, prefix.length);
            System.arraycopy(token, 0, all, prefix.length, token.length);
            if (fresh.tryFeedBytes(all)) {
                out.add(id);
            }
        }
        return out;
    }

    static void assertSameAsTwin(TestClient c, String uri, String text, int offset, Constraint twinConstraint)
            throws Exception {
        DocumentSnapshot doc = new DocumentSnapshot(uri, "", 0, text);
        byte[] prefix = text.substring(0, offset).getBytes(StandardCharsets.UTF_8);
        TreeSet<Integer> want = twin(twinConstraint, prefix);
        Vocabulary v = twinConstraint.vocabulary();
        AllowedTokensResult r = allowed(c, uri, doc.position(offset), v.size());
        TreeSet<Integer> got = new TreeSet<>();
        for (AllowedTokensResult.AllowedToken t : r.tokens()) {
            got.add(t.id());
            assertEquals(v.display(t.id()), t.text(), "display text of token " + t.id());
        }
        assertEquals(want, got, "allowed after " + TokenText.escape(prefix));
        assertEquals(want.size(), r.count(), "count after " + TokenText.escape(prefix));
        assertEquals(v.tokenCount(), r.vocabularySize());
        Cursor k = twinConstraint.start();
        boolean ok = k.tryFeedBytes(prefix);
        assertEquals(ok && k.isComplete(), r.endAllowed(), "end after " + TokenText.escape(prefix));
    }

    static Constraint workOrderOn(Vocabulary v) {
        Grammar g = AbnfCheck.check(WORK_ORDER, "work-order.abnf").grammar();
        return Constraint.grammar(g.withStart("order"), v);
    }

    // ------------------------------------------------------------------ diagnostics

    @Test
    void aByteThatLeavesTheLanguageIsAnErrorAtItsCharacter() throws Exception {
        String uri = uri("orders/bad.txt");
        String text = "prune tree T-00x2";
        List<Diagnostic> ds = openAndCheck(client, uri, text);
        assertEquals(1, ds.size(), ds.toString());
        Diagnostic d = ds.get(0);
        int at = text.indexOf('x');
        assertEquals(new Range(new Position(0, at), new Position(0, at + 1)), d.getRange());
        assertEquals(DiagnosticSeverity.Error, d.getSeverity());
        assertEquals("leaves-language", code(d));
        assertTrue(d.getMessage().contains("expected") && d.getMessage().contains("'0'"), d.getMessage());
    }

    @Test
    void rangesCountUtf16UnitsWhileTheLanguageIsOverBytes() throws Exception {
        // é is 2 UTF-8 bytes and 1 UTF-16 unit; 🍎 (U+1F34E) is 4 bytes and 2 units (RFC 3629, Unicode)
        String uri = uri("tags/apples.tag");
        String text = "café🍎🍎 12x";
        List<Diagnostic> ds = openAndCheck(client, uri, text);
        assertEquals(1, ds.size(), ds.toString());
        int at = text.indexOf('x');
        assertEquals(11, at);
        assertEquals(new Range(new Position(0, at), new Position(0, at + 1)), ds.get(0).getRange());

        String second = uri("tags/upper.tag");
        String bad = "🍎Q 1";
        ds = openAndCheck(client, second, bad);
        assertEquals(new Range(new Position(0, 2), new Position(0, 3)), ds.get(0).getRange());

        String third = uri("tags/second-line.tag");
        String multi = "🍎é\n1";
        ds = openAndCheck(client, third, multi);
        // the line break is not in the language: line 0, after 🍎é (3 UTF-16 units)
        assertEquals(new Range(new Position(0, 3), new Position(1, 0)), ds.get(0).getRange());
        assertTrue(ds.get(0).getMessage().startsWith("'\\n'"), ds.get(0).getMessage());
    }

    @Test
    void aValidButIncompleteTextGetsANoteAtTheEnd() throws Exception {
        String uri = uri("orders/incomplete.txt");
        String text = "graft tree T-0042 with Amberglow on RS-";
        List<Diagnostic> ds = openAndCheck(client, uri, text + "\n");
        assertEquals(1, ds.size(), ds.toString());
        Diagnostic d = ds.get(0);
        assertEquals(DiagnosticSeverity.Information, d.getSeverity());
        assertEquals("incomplete", code(d));
        assertEquals(new Range(new Position(0, text.length()), new Position(0, text.length())), d.getRange());
        assertTrue(d.getMessage().contains("'0'-'9'"), d.getMessage());
    }

    @Test
    void aCompleteTextHasNoFindingsAndOneFinalLineBreakIsNotPartOfIt() throws Exception {
        assertEquals(List.of(), openAndCheck(client, uri("orders/ok.txt"), "prune tree T-0042 by 2025-03-01\n"));
        assertEquals(List.of(), openAndCheck(client, uri("orders/ok-crlf.txt"), "prune tree T-0042\r\n"));
        List<Diagnostic> two = openAndCheck(client, uri("orders/two-breaks.txt"), "prune tree T-0042\n\n");
        assertEquals("leaves-language", code(two.get(0)));
        assertEquals(new Range(new Position(0, 17), new Position(1, 0)), two.get(0).getRange());
    }

    @Test
    void filesNoEntryMapsGetNothing() throws Exception {
        String uri = uri("notes/readme.txt");
        client.open(uri, "prune tree");
        assertEquals(List.of(), client.diagnostics(uri).getDiagnostics());
        ExecutionException e = assertThrows(ExecutionException.class,
                () -> allowed(client, uri, new Position(0, 3), 10));
        assertInstanceOf(ResponseErrorException.class, e.getCause());
    }

    // ------------------------------------------------------------------ the allowed tokens

    @Test
    void allowedTokensMatchTheSlowTwinOnCl100k() throws Exception {
        String uri = uri("orders/twin.txt");
        String text = "prune tree T-0042 by 2025-03-01; graft tree T-0107 with Russet Vale on RS-12";
        openAndCheck(client, uri, text);
        Constraint c = workOrderOn(CACHE.vocabulary(new SampleMap.VocabularySpec("cl100k", null, null)).get());
        for (int offset : new int[] {0, 5, 6, 13, 17, 20, 33, text.indexOf("Russet") + 3, text.length()}) {
            assertSameAsTwin(client, uri, text, offset, c);
        }
    }

    @Test
    void allowedTokensMatchTheSlowTwinOnARecursiveGrammarWithPartialUtf8Tokens() throws Exception {
        String uri = uri("rows/nested.txt");
        String text = "[[1,12],[],[[3]]]";
        assertEquals(List.of(), openAndCheck(client, uri, text));
        Constraint c = Constraint.grammar(AbnfCheck.check(ROWS, "rows.abnf").grammar(), tiny);
        for (int offset = 0; offset <= text.length(); offset++) {
            assertSameAsTwin(client, uri, text, offset, c);
        }
        String tags = uri("tags/twin.tag");
        String tag = "aé🍎b 4";
        openAndCheck(client, tags, tag);
        Constraint r = Constraint.regex("[a-zé🍎]* [0-9]+", tiny);
        for (int offset = 0; offset <= tag.length(); offset++) {
            if (offset > 0 && Character.isHighSurrogate(tag.charAt(offset - 1))) {
                // a position between the two halves of 🍎 means the character's start
                AllowedTokensResult inside = allowed(client, tags, new Position(0, offset), tiny.size());
                AllowedTokensResult before = allowed(client, tags, new Position(0, offset - 1), tiny.size());
                assertEquals(before, inside);
                continue;
            }
            assertSameAsTwin(client, tags, tag, offset, r);
        }
    }

    @Test
    void afterARejectedPrefixNothingIsAllowed() throws Exception {
        String uri = uri("orders/rejected.txt");
        String text = "prune tree X";
        openAndCheck(client, uri, text);
        AllowedTokensResult r = allowed(client, uri, new Position(0, text.length()), 10);
        assertEquals(0, r.count());
        assertFalse(r.endAllowed());
        assertEquals(List.of(), r.tokens());
    }

    @Test
    void theLimitCapsTheListButNotTheCount() throws Exception {
        String uri = uri("orders/limit.txt");
        openAndCheck(client, uri, "prune tree T-0042");
        AllowedTokensResult all = allowed(client, uri, new Position(0, 13), 1_000_000);
        AllowedTokensResult few = allowed(client, uri, new Position(0, 13), 3);
        assertEquals(all.count(), few.count());
        assertEquals(3, few.tokens().size());
        assertEquals(all.tokens().subList(0, 3), few.tokens());
        assertTrue(all.count() > 3, "digit tokens of cl100k after T-: " + all.count());
    }

    // ------------------------------------------------------------------ completion, resolve, hover

    @Test
    void completionListsTheAllowedTokensAndInsertsThem() throws Exception {
        String uri = uri("orders/complete-me.txt");
        String text = "prune tree T-0042\n";
        openAndCheck(client, uri, text);
        Position at = new Position(0, 10); // after "prune tree"
        CompletionList list = TestClient.get(client.remote.getTextDocumentService()
                .completion(new CompletionParams(new TextDocumentIdentifier(uri), at))).getRight();
        assertTrue(list.isIncomplete());
        Constraint c = workOrderOn(CACHE.vocabulary(new SampleMap.VocabularySpec("cl100k", null, null)).get());
        TreeSet<Integer> want = twin(c, "prune tree".getBytes(StandardCharsets.UTF_8));
        assertEquals(Math.min(want.size(), SamplePreviews.MAX_ITEMS), list.getItems().size());
        Vocabulary v = c.vocabulary();
        for (CompletionItem item : list.getItems()) {
            int id = item.getDetail().startsWith("token ") ? Integer.parseInt(item.getDetail().split(" ")[1]) : -1;
            assertTrue(want.contains(id), item.getLabel());
            assertEquals(v.display(id), item.getLabel());
            assertTrue(item.getDetail().contains(String.format("%,d of %,d tokens allowed", want.size(), v.tokenCount())),
                    item.getDetail());
            String edited = Edits.apply(text, List.of(item.getTextEdit().getLeft()));
            assertEquals("prune tree" + new String(v.bytes(id), StandardCharsets.UTF_8) + " T-0042\n", edited);
        }
        assertTrue(list.getItems().stream().anyMatch(i -> i.getLabel().equals("␣")), "a space token is listed");
    }

    @Test
    void completionShowsPartialUtf8WithEscapesAndInsertsOnlyWholeCharacters() throws Exception {
        String uri = uri("tags/partial.tag");
        openAndCheck(client, uri, "a");
        CompletionList list = TestClient.get(client.remote.getTextDocumentService()
                .completion(new CompletionParams(new TextDocumentIdentifier(uri), new Position(0, 1)))).getRight();
        CompletionItem half = list.getItems().stream().filter(i -> i.getLabel().equals("\\xF0\\x9F")).findFirst()
                .orElseThrow(() -> new AssertionError(list.getItems().toString()));
        assertEquals("", half.getTextEdit().getLeft().getNewText());
        assertTrue(half.getDetail().contains("ends inside a UTF-8 character"), half.getDetail());
        CompletionItem aHalf = list.getItems().stream().filter(i -> i.getLabel().equals("a\\xC3")).findFirst().orElseThrow();
        assertEquals("a", aHalf.getTextEdit().getLeft().getNewText());
        CompletionItem space = list.getItems().stream().filter(i -> i.getLabel().equals("␣1")).findFirst().orElseThrow();
        assertEquals(" 1", space.getTextEdit().getLeft().getNewText());
        assertEquals(new Range(new Position(0, 1), new Position(0, 1)), space.getTextEdit().getLeft().getRange());

        CompletionItem resolved = TestClient.get(client.remote.getTextDocumentService().resolveCompletionItem(half));
        String doc = resolved.getDocumentation().getRight().getValue();
        int id = TINY_TOKENS.indexOf(TINY_TOKENS.stream().filter(b -> b.length == 2 && (b[0] & 0xFF) == 0xF0)
                .findFirst().orElseThrow());
        assertTrue(doc.contains("token **" + id + "**"), doc);
        assertTrue(doc.contains("`F0 9F` (2 bytes)"), doc);
    }

    @Test
    void completionOffersTheEndOfOutputWhenTheTextIsComplete() throws Exception {
        String uri = uri("orders/at-end.txt");
        String text = "prune tree T-0042";
        openAndCheck(client, uri, text);
        CompletionList list = TestClient.get(client.remote.getTextDocumentService()
                .completion(new CompletionParams(new TextDocumentIdentifier(uri), new Position(0, text.length())))).getRight();
        CompletionItem end = list.getItems().stream().filter(i -> i.getLabel().startsWith("⟨end of output⟩"))
                .findFirst().orElseThrow();
        assertEquals("", end.getTextEdit().getLeft().getNewText());
        assertTrue(end.getLabel().contains("<|endoftext|>"), end.getLabel());
    }

    @Test
    void hoverShowsTheCountTheEndAndTheForcedContinuation() throws Exception {
        String uri = uri("orders/hover.txt");
        String text = "prune tree T-0042";
        openAndCheck(client, uri, text);
        Constraint c = workOrderOn(CACHE.vocabulary(new SampleMap.VocabularySpec("cl100k", null, null)).get());
        Hover h = TestClient.get(client.remote.getTextDocumentService()
                .hover(new HoverParams(new TextDocumentIdentifier(uri), new Position(0, 6))));
        String md = h.getContents().getRight().getValue();
        int n = twin(c, "prune ".getBytes(StandardCharsets.UTF_8)).size();
        assertTrue(md.contains(String.format("%,d of %,d tokens allowed", n, c.vocabulary().tokenCount())), md);
        assertTrue(md.contains("end of output: not allowed"), md);
        assertTrue(md.contains("forced continuation: `tree␣T-`"), md);

        Hover atEnd = TestClient.get(client.remote.getTextDocumentService()
                .hover(new HoverParams(new TextDocumentIdentifier(uri), new Position(0, text.length()))));
        String endMd = atEnd.getContents().getRight().getValue();
        assertTrue(endMd.contains("end of output: allowed"), endMd);
        assertFalse(endMd.contains("forced continuation"), endMd);

        AllowedTokensResult r = allowed(client, uri, new Position(0, 6), 5);
        assertEquals("tree␣T-", r.forced());
    }

    @Test
    void hoverAfterARejectedByteSaysWhere() throws Exception {
        String uri = uri("orders/hover-bad.txt");
        String text = "prune tree Q-0042";
        openAndCheck(client, uri, text);
        Hover h = TestClient.get(client.remote.getTextDocumentService()
                .hover(new HoverParams(new TextDocumentIdentifier(uri), new Position(0, text.length()))));
        String md = h.getContents().getRight().getValue();
        assertTrue(md.contains("line 1, column " + (text.indexOf('Q') + 1)), md);
    }

    @Test
    void aSampleOfSeveralMegabytesAndBinaryContentArePreviewed() throws Exception {
        String uri = uri("tags/huge.tag");
        String text = "ab".repeat(1_500_000) + " 12";
        assertEquals(List.of(), openAndCheck(client, uri, text));
        AllowedTokensResult end = allowed(client, uri, new Position(0, text.length()), 100);
        assertTrue(end.endAllowed());
        assertEquals(new TreeSet<>(twin(Constraint.regex("[a-zé🍎]* [0-9]+", tiny), " 12".getBytes(StandardCharsets.UTF_8))),
                new TreeSet<>(end.tokens().stream().map(AllowedTokensResult.AllowedToken::id).toList()),
                "the allowed tokens after a digit run do not depend on what came before it");

        String binary = uri("tags/binary.tag");
        String bytes = "abc\u0000\u0001 1";
        List<Diagnostic> ds = openAndCheck(client, binary, bytes);
        assertEquals(new Range(new Position(0, 3), new Position(0, 4)), ds.get(0).getRange());
        assertTrue(ds.get(0).getMessage().startsWith("'\\x00'"), ds.get(0).getMessage());
    }

    @Test
    void anIncompleteTextWithAForcedContinuationGetsAQuickFixThatAppendsIt() throws Exception {
        String uri = uri("orders/forced.txt");
        String text = "graft tree T-0042 with Russet";
        List<Diagnostic> ds = openAndCheck(client, uri, text + "\n");
        assertEquals("incomplete", code(ds.get(0)));
        org.eclipse.lsp4j.CodeActionParams params = new org.eclipse.lsp4j.CodeActionParams(new TextDocumentIdentifier(uri),
                ds.get(0).getRange(), new org.eclipse.lsp4j.CodeActionContext(ds));
        List<org.eclipse.lsp4j.CodeAction> actions = TestClient.get(client.remote.getTextDocumentService().codeAction(params))
                .stream().map(e -> e.getRight()).toList();
        assertEquals(1, actions.size(), actions.toString());
        // the grammar's only variety starting "Russet" is "Russet Vale", then " on RS-" follows
        Cursor k = workOrderOn(CACHE.vocabulary(new SampleMap.VocabularySpec("cl100k", null, null)).get()).start();
        k.feedText(text);
        String forced = new String(k.forcedBytes(), StandardCharsets.UTF_8);
        assertEquals(" Vale on RS-", forced);
        String fixed = Edits.apply(text + "\n", actions.get(0).getEdit().getChanges().get(uri));
        assertEquals(text + forced + "\n", fixed);
    }
}
