package dev.espalier.lsp;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Rule;
import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.TokenBits;
import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * End to end with a real editor as the client: headless Neovim, set up with
 * {@code editor-samples/neovim}, runs {@code espalier serve} from the built classes, opens a grammar
 * with errors and a mapped sample file, and reports what it received (driver:
 * {@code neovim-driver.lua}). The figures are checked against the engine called in-process:
 * {@link AbnfCheck} for the grammar's diagnostics, a {@link Cursor} for the allowed tokens and the
 * first refused byte. Skipped when {@code nvim} is not on the path ({@code .ci/run} installs it).
 */
class NeovimEndToEndTest {

    private static final String GRAMMAR = """
            ; nursery tags: the rule tree-no is misspelt
            tag     = %s"Row " row-nr ", tree " tree-no
            row-nr  = 2DIGIT
            tree-nr = 2DIGIT
            """;
    /** Completion in the grammar: just after "row-nr  = ". */
    private static final int GRAMMAR_LINE = 2;
    private static final int GRAMMAR_CHARACTER = 10;

    private static final String SAMPLE_MAP = """
            { "samples": [ { "files": "orders/*.txt", "grammar": "work-order.abnf", "vocabulary": "cl100k" } ] }
            """;
    /** A month 13: the date leaves the language at its second digit. */
    private static final String SAMPLE = "prune tree T-0042 by 2025-13-01\n";
    /** The allowed-token completion: just after "prune tree T-00". */
    private static final int SAMPLE_CHARACTER = 15;

    private static final long TIMEOUT_MILLIS = 30_000;

    @Test
    void neovimShowsDiagnosticsCompletionAndAllowedTokens(@TempDir Path workspace) throws Exception {
        String version = nvimVersion();
        assumeTrue(version != null, "nvim is not on the PATH (install the Debian package neovim to run this test)");

        Path repository = Path.of("..").toAbsolutePath().normalize();
        Path config = repository.resolve("editor-samples/neovim");
        assertTrue(Files.isRegularFile(config.resolve("lua/espalier/init.lua")), "editor set-up at " + config);
        Files.copy(repository.resolve("grammars/work-order.abnf"), workspace.resolve("work-order.abnf"));
        Path grammar = Files.writeString(workspace.resolve("tags.abnf"), GRAMMAR);
        Files.writeString(workspace.resolve("espalier-samples.json"), SAMPLE_MAP);
        Files.createDirectories(workspace.resolve("orders"));
        Path sample = Files.writeString(workspace.resolve("orders/order-17.txt"), SAMPLE);
        Path driver = workspace.resolve("driver.lua");
        try (InputStream in = Objects.requireNonNull(getClass().getResourceAsStream("neovim-driver.lua"))) {
            Files.copy(in, driver);
        }
        Path resultFile = workspace.resolve("result.json");
        Path log = workspace.resolve("nvim.log");

        JsonArray serverCommand = new JsonArray();
        for (String part : List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), "dev.espalier.cli.Main", "serve")) {
            serverCommand.add(part);
        }
        ProcessBuilder pb = new ProcessBuilder("nvim", "--headless", "--clean", "-n", "-c",
                "luafile " + driver.toString().replace(" ", "\\ "))
                .directory(workspace.toFile())
                .redirectErrorStream(true)
                .redirectOutput(log.toFile());
        Map<String, String> env = pb.environment();
        env.put("ESPALIER_NVIM_CONFIG", config.toString());
        env.put("ESPALIER_SERVER_CMD", serverCommand.toString());
        env.put("ESPALIER_GRAMMAR", grammar.toString());
        env.put("ESPALIER_GRAMMAR_POS", GRAMMAR_LINE + "," + GRAMMAR_CHARACTER);
        env.put("ESPALIER_SAMPLE", sample.toString());
        env.put("ESPALIER_SAMPLE_POS", "0," + SAMPLE_CHARACTER);
        env.put("ESPALIER_RESULT", resultFile.toString());
        env.put("ESPALIER_TIMEOUT_MS", Long.toString(TIMEOUT_MILLIS));
        Process nvim = pb.start();
        boolean ended = nvim.waitFor(TIMEOUT_MILLIS + 8_000, TimeUnit.MILLISECONDS);
        if (!ended) {
            nvim.descendants().forEach(ProcessHandle::destroyForcibly);
            nvim.destroyForcibly();
        }
        String nvimLog = Files.isRegularFile(log) ? Files.readString(log) : "";
        assertTrue(ended, "nvim did not finish in time; its output:\n" + nvimLog);
        assertTrue(Files.isRegularFile(resultFile), "nvim wrote no result (exit " + nvim.exitValue() + "):\n" + nvimLog);
        JsonObject result = JsonParser.parseString(Files.readString(resultFile)).getAsJsonObject();
        assertNull(result.get("error"), () -> "the driver failed: " + result.get("error") + "\n" + nvimLog);
        assertEquals(0, nvim.exitValue(), nvimLog);

        checkGrammar(result.getAsJsonObject("grammar"));
        checkSample(result.getAsJsonObject("sample"), workspace.resolve("work-order.abnf"));
    }

    /**
     * The Neovim set-up decides which files are samples from the globs of espalier-samples.json; it
     * must read them as the server does (java.nio's glob syntax, {@link java.nio.file.FileSystem#getPathMatcher}).
     */
    @Test
    void neovimReadsSampleGlobsLikeTheServer(@TempDir Path dir) throws Exception {
        assumeTrue(nvimVersion() != null, "nvim is not on the PATH (install the Debian package neovim to run this test)");
        JsonArray cases = SampleGlobCases.cases();
        List<Boolean> expected = SampleGlobCases.serverAnswers(cases);
        assertTrue(expected.contains(true) && expected.contains(false));
        Path casesFile = Files.writeString(dir.resolve("cases.json"), cases.toString());
        Path script = dir.resolve("globs.lua");
        try (InputStream in = Objects.requireNonNull(getClass().getResourceAsStream("neovim-globs.lua"))) {
            Files.copy(in, script);
        }
        Path resultFile = dir.resolve("result.json");
        ProcessBuilder pb = new ProcessBuilder("nvim", "--headless", "--clean", "-n", "-c",
                "luafile " + script.toString().replace(" ", "\\ "))
                .directory(dir.toFile()).redirectErrorStream(true).redirectOutput(dir.resolve("nvim.log").toFile());
        pb.environment().put("ESPALIER_NVIM_CONFIG", Path.of("..").toAbsolutePath().normalize()
                .resolve("editor-samples/neovim").toString());
        pb.environment().put("ESPALIER_GLOB_CASES", casesFile.toString());
        pb.environment().put("ESPALIER_RESULT", resultFile.toString());
        Process nvim = pb.start();
        if (!nvim.waitFor(20, TimeUnit.SECONDS)) {
            nvim.destroyForcibly();
        }
        String log = Files.readString(dir.resolve("nvim.log"));
        assertTrue(Files.isRegularFile(resultFile), "no result; nvim said:\n" + log);
        JsonElement answers = JsonParser.parseString(Files.readString(resultFile));
        assertTrue(answers.isJsonArray(), answers + "\n" + log);
        List<String> disagreements = new ArrayList<>();
        for (int i = 0; i < expected.size(); i++) {
            if (answers.getAsJsonArray().get(i).getAsBoolean() != expected.get(i)) {
                disagreements.add(cases.get(i) + ": the server says " + expected.get(i));
            }
        }
        assertEquals(List.of(), disagreements);
    }

    /** The diagnostics equal AbnfCheck's on the same text; completion offers the file's rules. */
    private static void checkGrammar(JsonObject got) {
        assertEquals("abnf", got.get("filetype").getAsString());
        AbnfResult direct = AbnfCheck.check(GRAMMAR, "tags.abnf");
        assertTrue(direct.diagnostics().stream().anyMatch(d -> d.code().equals("undefined-rule")),
                "the grammar holds an error");
        TreeSet<String> expected = new TreeSet<>();
        for (Diagnostic d : direct.diagnostics()) {
            int[] from = lineAndCharacter(GRAMMAR, d.span().start());
            int[] to = lineAndCharacter(GRAMMAR, d.span().end());
            expected.add(d.code() + " " + lspSeverity(d) + " " + from[0] + ":" + from[1] + "-" + to[0] + ":" + to[1]);
        }
        TreeSet<String> published = new TreeSet<>();
        for (JsonElement e : got.getAsJsonArray("diagnostics")) {
            JsonObject d = e.getAsJsonObject();
            JsonObject start = d.getAsJsonObject("range").getAsJsonObject("start");
            JsonObject end = d.getAsJsonObject("range").getAsJsonObject("end");
            published.add(d.get("code").getAsString() + " " + d.get("severity").getAsInt() + " "
                    + start.get("line").getAsInt() + ":" + start.get("character").getAsInt() + "-"
                    + end.get("line").getAsInt() + ":" + end.get("character").getAsInt());
        }
        assertEquals(expected, published);
        assertEquals(published.size(), got.get("shown").getAsInt(), "Neovim shows every diagnostic");

        List<String> labels = new ArrayList<>();
        got.getAsJsonArray("completion").forEach(e -> labels.add(e.getAsString()));
        for (Rule r : direct.grammar().rules()) {
            if (r.nameSpan().isKnown()) {
                assertTrue(labels.contains(r.name()), r.name() + " in " + labels);
            }
        }
        // RFC 5234 Appendix B core rules
        assertTrue(labels.containsAll(List.of("ALPHA", "DIGIT", "SP")), labels.toString());
    }

    /** The first refused byte and the allowed tokens at the cursor equal an in-process cursor's. */
    private static void checkSample(JsonObject got, Path grammarFile) {
        assertTrue(got.get("filetype").getAsString().contains("espaliersample"), got.get("filetype").toString());
        AbnfResult checked = AbnfCheck.checkFile(grammarFile);
        assertFalse(checked.hasErrors(), checked.diagnostics().toString());
        Vocabulary vocab = Vocabularies.builtin("cl100k");
        Constraint constraint = Constraint.grammar(checked.grammar(), vocab);

        // the first byte of the sample (without its final line break) that leaves the language
        byte[] bytes = SAMPLE.strip().getBytes(StandardCharsets.UTF_8);
        Cursor walk = constraint.start();
        int refused = -1;
        for (int i = 0; i < bytes.length && refused < 0; i++) {
            if (!walk.tryFeedBytes(new byte[] {bytes[i]})) {
                refused = i;
            }
        }
        assertTrue(refused > 0, "the sample leaves the language");
        int[] at = lineAndCharacter(SAMPLE, new String(bytes, 0, refused, StandardCharsets.UTF_8).length());
        JsonObject error = null;
        for (JsonElement e : got.getAsJsonArray("diagnostics")) {
            if (e.getAsJsonObject().get("severity").getAsInt() == 1) {
                error = e.getAsJsonObject();
            }
        }
        assertNotNull(error, "an error diagnostic in " + got.get("diagnostics"));
        JsonObject start = error.getAsJsonObject("range").getAsJsonObject("start");
        assertEquals(at[0], start.get("line").getAsInt(), error.toString());
        assertEquals(at[1], start.get("character").getAsInt(), error.toString());

        // the tokens allowed after the text before the cursor
        Cursor cursor = constraint.start();
        cursor.feedText(SAMPLE.substring(0, SAMPLE_CHARACTER));
        long[] mask = new long[vocab.maskWords()];
        cursor.fillMask(mask);
        List<Integer> allowed = new ArrayList<>();
        for (int id = TokenBits.next(mask, 0); id >= 0; id = TokenBits.next(mask, id + 1)) {
            allowed.add(id);
        }
        assertTrue(allowed.size() > 1, "a choice of tokens at the cursor");

        JsonObject request = got.getAsJsonObject("allowed");
        assertEquals(allowed.size(), request.get("count").getAsInt());
        assertEquals(vocab.tokenCount(), request.get("vocabularySize").getAsInt());
        assertEquals(cursor.isComplete(), request.get("endAllowed").getAsBoolean());
        List<Integer> requestIds = new ArrayList<>();
        request.getAsJsonArray("tokens").forEach(t -> requestIds.add(t.getAsJsonObject().get("id").getAsInt()));
        assertEquals(allowed, requestIds);

        List<Integer> completionIds = new ArrayList<>();
        for (JsonElement e : got.getAsJsonArray("completion")) {
            JsonObject item = e.getAsJsonObject();
            int id = tokenId(item.get("data"));
            completionIds.add(id);
            if (id != vocab.endOfSequence()) {
                assertEquals(new String(vocab.bytes(id), StandardCharsets.UTF_8), item.get("newText").getAsString(),
                        "choosing token " + id + " inserts its text");
            }
        }
        assertEquals(allowed.subList(0, Math.min(allowed.size(), completionIds.size())), completionIds);
        assertTrue(completionIds.size() == allowed.size() || completionIds.size() >= 100,
                "the completion lists every allowed token, or many of them");
    }

    /** The token id a completion item carries in its data (wherever the server nests it). */
    private static int tokenId(JsonElement data) {
        assertNotNull(data, "completion item without data");
        if (data.isJsonObject()) {
            JsonObject o = data.getAsJsonObject();
            if (o.has("id") && o.get("id").isJsonPrimitive()) {
                return o.get("id").getAsInt();
            }
            for (Map.Entry<String, JsonElement> e : o.entrySet()) {
                if (e.getValue().isJsonObject()) {
                    return tokenId(e.getValue());
                }
            }
        }
        throw new AssertionError("no token id in " + data);
    }

    /** LSP's DiagnosticSeverity numbers (LSP 3.17 specification). */
    private static int lspSeverity(Diagnostic d) {
        return switch (d.severity()) {
            case ERROR -> 1;
            case WARNING -> 2;
            case INFORMATION -> 3;
            case HINT -> 4;
        };
    }

    /** The 0-based line and UTF-16 character of a character offset; lines end at LF, CRLF or CR. */
    private static int[] lineAndCharacter(String text, int offset) {
        int line = 0;
        int lineStart = 0;
        for (int i = 0; i < offset; i++) {
            char c = text.charAt(i);
            if (c == '\n' || (c == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'))) {
                line++;
                lineStart = i + 1;
            }
        }
        return new int[] {line, offset - lineStart};
    }

    /** The first line of {@code nvim --version}, or null when nvim cannot be run. */
    private static String nvimVersion() {
        try {
            Process p = new ProcessBuilder("nvim", "--version").redirectErrorStream(true).start();
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
            return p.waitFor(10, TimeUnit.SECONDS) && p.exitValue() == 0 ? out.lines().findFirst().orElse("") : null;
        } catch (IOException e) {
            return null;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return null;
        }
    }
}
