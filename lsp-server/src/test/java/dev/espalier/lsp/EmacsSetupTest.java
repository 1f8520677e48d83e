package dev.espalier.lsp;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonParser;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * The Emacs set-up ({@code editor-samples/emacs}) in {@code emacs --batch}: it loads, gives
 * {@code .abnf} files {@code abnf-mode}, turns {@code espalier-sample-mode} on in mapped sample files
 * only, and reads sample globs as the server does. Skipped when {@code emacs} is not on the path.
 */
class EmacsSetupTest {

    @Test
    void emacsSetUpFindsGrammarsAndSamplesLikeTheServer(@TempDir Path dir) throws Exception {
        assumeTrue(runs("emacs", "--version"), "emacs is not on the PATH");
        Path setup = Path.of("..").toAbsolutePath().normalize().resolve("editor-samples/emacs");
        Files.writeString(dir.resolve("espalier-samples.json"),
                "{ \"samples\": [ { \"files\": \"orders/*.txt\", \"grammar\": \"order.abnf\" } ] }");
        Files.writeString(dir.resolve("order.abnf"), "order = \"prune\"\n");
        Files.createDirectories(dir.resolve("orders/old"));
        Files.writeString(dir.resolve("orders/a.txt"), "prune");
        Files.writeString(dir.resolve("orders/old/b.txt"), "prune");
        JsonArray cases = SampleGlobCases.cases();
        Path casesFile = Files.writeString(dir.resolve("cases.json"), cases.toString());
        Path out = dir.resolve("out.json");
        String program = """
                (progn
                  (require 'espalier-eglot)
                  (require 'json)
                  (let* ((cases (let ((json-array-type 'list)) (json-read-file "%s")))
                         (answers (mapcar (lambda (c) (if (string-match-p (espalier--glob-regexp (car c)) (cadr c)) t :json-false))
                                          cases))
                         (modes (mapcar (lambda (f)
                                          (with-current-buffer (find-file-noselect (expand-file-name f "%s"))
                                            (vector (symbol-name major-mode) (if espalier-sample-mode t :json-false))))
                                        '("order.abnf" "orders/a.txt" "orders/old/b.txt"))))
                    (with-temp-file "%s"
                      (insert (json-encode (list (cons 'globs (vconcat answers)) (cons 'modes (vconcat modes))))))))
                """.formatted(casesFile, dir, out);
        Process emacs = new ProcessBuilder("emacs", "--batch", "-Q", "-L", setup.toString(), "--eval", program)
                .directory(dir.toFile()).redirectErrorStream(true).redirectOutput(dir.resolve("emacs.log").toFile())
                .start();
        assertTrue(emacs.waitFor(30, TimeUnit.SECONDS), "emacs did not finish");
        String log = Files.readString(dir.resolve("emacs.log"));
        assertEquals(0, emacs.exitValue(), log);
        var result = JsonParser.parseString(Files.readString(out)).getAsJsonObject();

        List<Boolean> expected = SampleGlobCases.serverAnswers(cases);
        List<String> disagreements = new ArrayList<>();
        JsonArray answers = result.getAsJsonArray("globs");
        for (int i = 0; i < expected.size(); i++) {
            if (answers.get(i).getAsBoolean() != expected.get(i)) {
                disagreements.add(cases.get(i) + ": the server says " + expected.get(i));
            }
        }
        assertEquals(List.of(), disagreements);

        List<String> modes = new ArrayList<>();
        for (JsonElement m : result.getAsJsonArray("modes")) {
            modes.add(m.getAsJsonArray().get(0).getAsString() + " " + m.getAsJsonArray().get(1).getAsBoolean());
        }
        assertEquals("abnf-mode false", modes.get(0));
        assertTrue(modes.get(1).endsWith(" true"), modes.toString());
        assertTrue(modes.get(2).endsWith(" false"), "orders/*.txt does not reach into folders: " + modes);
    }

    private static boolean runs(String... command) {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
            p.getInputStream().readAllBytes();
            return p.waitFor(20, TimeUnit.SECONDS) && p.exitValue() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }
}
