package dev.espalier.lsp;

import com.google.gson.JsonArray;

import java.nio.file.FileSystems;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * Glob and path pairs for checking that an editor set-up reads the {@code files} globs of
 * espalier-samples.json as the server does: with java.nio's glob syntax
 * ({@link java.nio.file.FileSystem#getPathMatcher}).
 */
final class SampleGlobCases {

    private static final List<String> GLOBS = List.of("orders/*.txt", "**/*.txt", "orders/**", "*.txt",
            "{orders,tags}/*.{txt,tag}", "row-??.tag", "[a-c]*.json", "[!a-c]*.json", "reports/tree-[0-9]*.json",
            "a.b+c(1).txt");
    private static final List<String> PATHS = List.of("orders/a.txt", "a.txt", "orders/sub/a.txt", "tags/row-04.tag",
            "row-04.tag", "row-4.tag", "b.json", "d.json", "orders/x.tag", "reports/tree-0042.json",
            "reports/tree-x.json", "a.b+c(1).txt", "aXb+c(1).txt", "orders/deep/er/x.txt");

    private SampleGlobCases() {
    }

    /** Every glob with every path, as a JSON list of [glob, path] pairs. */
    static JsonArray cases() {
        JsonArray cases = new JsonArray();
        for (String glob : GLOBS) {
            for (String path : PATHS) {
                JsonArray c = new JsonArray();
                c.add(glob);
                c.add(path);
                cases.add(c);
            }
        }
        return cases;
    }

    /** Whether the server's matcher takes each pair's path for a match of its glob. */
    static List<Boolean> serverAnswers(JsonArray cases) {
        List<Boolean> out = new ArrayList<>();
        cases.forEach(c -> out.add(FileSystems.getDefault()
                .getPathMatcher("glob:" + c.getAsJsonArray().get(0).getAsString())
                .matches(Path.of(c.getAsJsonArray().get(1).getAsString()))));
        return out;
    }
}
