package dev.espalier.schema;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import dev.espalier.earley.EarleyChart;
import dev.espalier.earley.EarleyGrammar;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.Iterator;
import java.util.Set;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * Conformance with the official JSON Schema Test Suite, draft 2020-12 (MIT; copied unchanged into
 * {@code src/test/resources/json-schema-test-suite} with its LICENSE and SOURCE commit): the required
 * keyword files, {@code optional/} and {@code optional/format/}.
 *
 * <p>For every test group the schema is compiled with default options, and again with the pretty
 * spacing and with any member order. A refusal ({@link SchemaException}) is recorded with its keyword
 * and reason. When the schema compiles, every test case is rendered under the layout
 * ({@link SchemaResult#render}) and given to a fresh byte-level Earley recognizer of the grammar: a
 * {@code valid: true} instance must render and be accepted, a {@code valid: false} instance must not
 * render or be rejected. Independently of the verdict, any rendered text must parse (Jackson, strict)
 * to the same JSON value as the instance, so that the verdict is about the instance and not about
 * something else the renderer wrote.
 *
 * <p>Agreement on every case of every compiled group is the bar. The exceptions are explicit: the
 * known differences, each with its reason, listed in {@value #KNOWN_DIFFERENCES} (the test fails on
 * a disagreement not listed there, and on a listed one that no longer occurs). A group whose schema
 * compiles with a warning that a {@code format} is not enforced is counted as not compiled ("not
 * enforced"). The suite's {@code format.json} expects {@code format} to be an annotation only (its
 * invalid strings are {@code valid: true}); the compiler asserts formats, as
 * {@code optional/format/*.json} (which expects assertion) checks, so {@code format.json} is reported
 * apart and not counted.
 *
 * <p>The report table (per keyword file: groups compiled / total, cases agreeing / total, refused
 * groups and why) is written to {@code target/schema-conformance.md}.
 */
class SchemaConformanceTest {

    static final Path SUITE = resource("json-schema-test-suite/draft2020-12");

    /** The suite's remote documents, served under {@link #REMOTES_BASE} as the suite's README describes. */
    static final Path REMOTES = resource("json-schema-test-suite/remotes");
    static final String REMOTES_BASE = "http://localhost:1234/";
    /** Every file of {@code remotes/} under {@code http://localhost:1234/} and its path there: nothing is fetched. */
    static final SchemaDocuments REMOTE_DOCUMENTS = remoteDocuments();

    /** The file of the suite whose format expectations are annotation-only (see class comment). */
    static final String ANNOTATION_ONLY_FORMATS = "format.json";

    /** The differences that are known, with their reasons (a test resource). */
    static final String KNOWN_DIFFERENCES = "dev/espalier/schema/suite-known-differences.txt";

    /** A compile that takes longer than this is reported as a problem (no schema of the suite is large). */
    static final long COMPILE_TIMEOUT_MS = 10_000;

    private static final ObjectMapper SUITE_READER = JsonMapper.builder()
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS).build();

    /** Jackson, strict: nothing after the value; numbers kept exactly. */
    private static final ObjectMapper STRICT = JsonMapper.builder()
            .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS).build();

    private static ExecutorService compiler;


    @BeforeAll
    static void startCompilerThread() {
        compiler = Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "schema-conformance-compile");
            t.setDaemon(true);
            return t;
        });
    }

    @AfterAll
    static void stopCompilerThread() {
        compiler.shutdownNow();
    }

    /** The three layouts every group is checked under. */
    enum Layout {
        DEFAULT(SchemaOptions.defaults()),
        PRETTY(SchemaOptions.defaults().withSpacing(SchemaOptions.Spacing.PRETTY)),
        ANY_ORDER(SchemaOptions.defaults().withOrder(SchemaOptions.Order.ANY));

        final SchemaOptions options;

        Layout(SchemaOptions options) {
            this.options = options;
        }
    }

    /** What happened to one group under one layout. */
    record GroupOutcome(String file, String group, Layout layout, boolean compiled, String refusal, int cases,
                        int agreeing, List<Disagreement> disagreements, long compileNanos, long checkNanos) {
    }

    /** One case whose verdict differs from the suite's. */
    record Disagreement(String testCase, String why) {
    }

    @Test
    void everyCompiledGroupAgreesWithTheSuite() throws IOException {
        List<Path> files = suiteFiles();
        assertTrue(files.size() >= 70, "the suite's files are present: " + files.size());
        List<GroupOutcome> outcomes = new ArrayList<>();
        for (Path f : files) {
            String name = SUITE.relativize(f).toString().replace('\\', '/');
            JsonNode groups = SUITE_READER.readTree(f.toFile());
            for (JsonNode group : groups) {
                for (Layout layout : Layout.values()) {
                    outcomes.add(run(name, group, layout));
                }
            }
        }
        Map<String, String> known = knownDifferences();
        String report = report(outcomes, known);
        Path out = Path.of("target", "schema-conformance.md");
        Files.createDirectories(out.getParent());
        Files.writeString(out, report, StandardCharsets.UTF_8);
        System.out.printf("%s (compiles %d ms, checks %d ms; table in %s)%n", summary(outcomes),
                outcomes.stream().mapToLong(GroupOutcome::compileNanos).sum() / 1_000_000,
                outcomes.stream().mapToLong(GroupOutcome::checkNanos).sum() / 1_000_000, out.toAbsolutePath());

        List<String> unexpected = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (GroupOutcome o : outcomes) {
            if (o.file.equals(ANNOTATION_ONLY_FORMATS)) {
                continue;
            }
            for (Disagreement d : o.disagreements) {
                String key = key(o.file, o.group, d.testCase);
                seen.add(key);
                if (!known.containsKey(key)) {
                    unexpected.add(key + " [" + o.layout + "]: " + d.why);
                }
            }
        }
        List<String> stale = known.keySet().stream().filter(k -> !seen.contains(k)).toList();
        assertTrue(outcomes.stream().anyMatch(o -> o.layout == Layout.DEFAULT && o.compiled), "some group compiles");
        if (!unexpected.isEmpty() || !stale.isEmpty()) {
            fail(unexpected.size() + " disagreements with the JSON Schema Test Suite on compiled groups:\n"
                    + String.join("\n", unexpected.subList(0, Math.min(60, unexpected.size())))
                    + (stale.isEmpty() ? "" : "\n" + stale.size() + " known differences no longer occur; remove them from "
                    + KNOWN_DIFFERENCES + ":\n" + String.join("\n", stale)));
        }
    }

    /** The key of a known difference: {@code file | group | case}. */
    static String key(String file, String group, String testCase) {
        return file + " | " + group + " | " + testCase;
    }

    /**
     * The known differences, each with its reason: lines {@code file | group | case | reason};
     * {@code #} starts a comment.
     */
    static Map<String, String> knownDifferences() throws IOException {
        Map<String, String> known = new LinkedHashMap<>();
        for (String line : Files.readAllLines(resource(KNOWN_DIFFERENCES), StandardCharsets.UTF_8)) {
            if (line.isBlank() || line.startsWith("#")) {
                continue;
            }
            int last = line.lastIndexOf(" | ");
            if (last < 0) {
                throw new IllegalStateException(KNOWN_DIFFERENCES + ": not file | group | case | reason: " + line);
            }
            known.put(line.substring(0, last), line.substring(last + 3));
        }
        return known;
    }

    private static GroupOutcome run(String file, JsonNode group, Layout layout) {
        String description = group.path("description").asText();
        JsonNode schema = group.get("schema");
        SchemaResult result;
        long t0 = System.nanoTime();
        try {
            result = compileBounded(schema, layout.options);
        } catch (SchemaException e) {
            return new GroupOutcome(file, description, layout, false, refusal(e), 0, 0, List.of(),
                    System.nanoTime() - t0, 0);
        } catch (RuntimeException e) {
            // not a clear refusal: a defect of the compiler, shown as a disagreement
            return new GroupOutcome(file, description, layout, false, "fails: " + e, 0, 0,
                    List.of(new Disagreement("", "compile fails with " + e)), System.nanoTime() - t0, 0);
        }
        long t1 = System.nanoTime();
        for (SchemaNote w : result.warnings()) {
            if (w.keyword().equals("format") && w.message().endsWith("is not enforced (an annotation only)")) {
                // compiled, but the format is an annotation only: the group is not enforced (a format
                // enforced with documented gaps is compiled; its gaps are known differences)
                return new GroupOutcome(file, description, layout, false, "not enforced: " + w.message(), 0, 0,
                        List.of(), t1 - t0, 0);
            }
        }
        EarleyGrammar recognizer = EarleyGrammar.compile(result.grammar());
        int cases = 0;
        int agreeing = 0;
        List<Disagreement> disagreements = new ArrayList<>();
        for (JsonNode test : group.get("tests")) {
            cases++;
            String why = disagreement(result, recognizer, test.get("data"), test.get("valid").asBoolean());
            if (why == null) {
                agreeing++;
            } else {
                disagreements.add(new Disagreement(test.path("description").asText(), why));
            }
        }
        return new GroupOutcome(file, description, layout, true, null, cases, agreeing, disagreements, t1 - t0,
                System.nanoTime() - t1);
    }

    /** Null when the grammar's verdict on the instance is the suite's; otherwise what went wrong. */
    static String disagreement(SchemaResult result, EarleyGrammar recognizer, JsonNode instance, boolean valid) {
        Optional<String> text;
        try {
            text = result.render(instance);
        } catch (RuntimeException e) {
            return "render fails with " + e;
        }
        if (text.isEmpty()) {
            return valid ? "a valid instance does not render: " + instance : null;
        }
        JsonNode reparsed;
        try {
            reparsed = STRICT.readTree(text.get());
        } catch (IOException e) {
            return "the rendered text is not JSON (Jackson, strict): " + text.get();
        }
        if (!sameValue(instance, reparsed)) {
            return "the rendered text " + text.get() + " is not the instance " + instance;
        }
        byte[] bytes = text.get().getBytes(StandardCharsets.UTF_8);
        EarleyChart chart = recognizer.newChart();
        boolean accepted = chart.feedAll(bytes) == bytes.length && chart.accepts();
        if (accepted == valid) {
            return null;
        }
        return (valid ? "valid, but the grammar rejects " : "invalid, but the grammar accepts ") + text.get();
    }

    /** JSON value equality (RFC 8259 §4, §5: members unordered, numbers by value), as the suite compares. */
    static boolean sameValue(JsonNode a, JsonNode b) {
        if (a.isNumber() && b.isNumber()) {
            return a.decimalValue().compareTo(b.decimalValue()) == 0;
        }
        if (a.getNodeType() != b.getNodeType()) {
            return false;
        }
        if (a.isArray()) {
            if (a.size() != b.size()) {
                return false;
            }
            for (int i = 0; i < a.size(); i++) {
                if (!sameValue(a.get(i), b.get(i))) {
                    return false;
                }
            }
            return true;
        }
        if (a.isObject()) {
            if (a.size() != b.size()) {
                return false;
            }
            for (Iterator<Map.Entry<String, JsonNode>> it = a.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                JsonNode other = b.get(e.getKey());
                if (other == null || !sameValue(e.getValue(), other)) {
                    return false;
                }
            }
            return true;
        }
        return a.equals(b);
    }

    private static SchemaResult compileBounded(JsonNode schema, SchemaOptions options) {
        Future<SchemaResult> f = compiler.submit(() -> JsonSchemas.compile(schema, SchemaIndex.DEFAULT_BASE,
                REMOTE_DOCUMENTS, options));
        try {
            return f.get(COMPILE_TIMEOUT_MS, TimeUnit.MILLISECONDS);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException r) {
                throw r;
            }
            throw new IllegalStateException(e.getCause());
        } catch (TimeoutException e) {
            f.cancel(true);
            startCompilerThread(); // the stuck thread is a daemon; later groups get a fresh one
            throw new IllegalStateException("compile took more than " + COMPILE_TIMEOUT_MS + " ms");
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        }
    }

    /** The refusal's keyword and reason, short enough for a table. */
    static String refusal(SchemaException e) {
        String m = e.getMessage();
        int colon = m.indexOf(": ");
        String reason = colon >= 0 ? m.substring(colon + 2) : m;
        if (reason.length() > 110) {
            reason = reason.substring(0, 107) + "...";
        }
        return (e.keyword().isEmpty() ? "" : "`" + e.keyword() + "`: ") + reason.replace("|", "\\|");
    }

    // ---------------------------------------------------------------------------------------------- report

    static String summary(List<GroupOutcome> outcomes) {
        StringBuilder sb = new StringBuilder("JSON Schema Test Suite draft 2020-12:");
        for (Layout l : Layout.values()) {
            Totals t = totals(outcomes, l, null);
            sb.append(String.format(" %s %d/%d groups compiled, %d/%d cases agree;", l, t.compiled, t.groups,
                    t.agreeing, t.cases));
        }
        return sb.substring(0, sb.length() - 1);
    }

    record Totals(int groups, int compiled, int cases, int agreeing) {
    }

    static Totals totals(List<GroupOutcome> outcomes, Layout layout, String file) {
        int groups = 0;
        int compiled = 0;
        int cases = 0;
        int agreeing = 0;
        for (GroupOutcome o : outcomes) {
            if (o.layout != layout || (file != null && !o.file.equals(file))
                    || (file == null && o.file.equals(ANNOTATION_ONLY_FORMATS))) {
                continue;
            }
            groups++;
            if (o.compiled) {
                compiled++;
                cases += o.cases;
                agreeing += o.agreeing;
            }
        }
        return new Totals(groups, compiled, cases, agreeing);
    }

    static String report(List<GroupOutcome> outcomes, Map<String, String> known) {
        StringBuilder sb = new StringBuilder();
        sb.append("# JSON Schema Test Suite, draft 2020-12\n\n");
        sb.append("Source: the official JSON Schema Test Suite (MIT), commit in "
                + "`engine/src/test/resources/json-schema-test-suite/SOURCE`. Written by `SchemaConformanceTest`.\n\n");
        sb.append("A group is compiled when its schema compiles with the options of the layout and every keyword "
                + "is enforced (a group whose `format` compiles to a warning, an annotation only, is listed as not "
                + "enforced); a case agrees when a fresh Earley recognizer of the grammar accepts the rendered "
                + "instance iff the suite says `valid: true` (an instance that does not render counts as rejected). "
                + "Every case that does not agree is a known difference, listed below with its reason. "
                + "`format.json` expects formats as annotations only and is listed apart, not counted in the totals; "
                + "the compiler asserts formats, which `optional/format/` checks.\n\n");
        sb.append("| layout | groups compiled / total | cases agreeing / total |\n| --- | ---: | ---: |\n");
        for (Layout l : Layout.values()) {
            Totals t = totals(outcomes, l, null);
            sb.append(String.format("| %s | %d / %d | %d / %d |%n", l.name().toLowerCase().replace('_', ' '),
                    t.compiled, t.groups, t.agreeing, t.cases));
        }
        Map<String, List<GroupOutcome>> byFile = new LinkedHashMap<>();
        for (GroupOutcome o : outcomes) {
            if (o.layout == Layout.DEFAULT) {
                byFile.computeIfAbsent(o.file, k -> new ArrayList<>()).add(o);
            }
        }
        sb.append("\n## Per keyword file (default options)\n\n");
        sb.append("| file | groups compiled / total | cases agreeing / total | pretty: agreeing / total "
                + "| any order: agreeing / total | groups not compiled: why |\n");
        sb.append("| --- | ---: | ---: | ---: | ---: | --- |\n");
        for (Map.Entry<String, List<GroupOutcome>> e : byFile.entrySet()) {
            Totals d = totals(outcomes, Layout.DEFAULT, e.getKey());
            Totals p = totals(outcomes, Layout.PRETTY, e.getKey());
            Totals a = totals(outcomes, Layout.ANY_ORDER, e.getKey());
            List<String> refused = new ArrayList<>();
            for (GroupOutcome o : e.getValue()) {
                if (!o.compiled) {
                    refused.add("*" + o.group.replace("|", "\\|") + "*: " + o.refusal);
                }
            }
            sb.append(String.format("| %s%s | %d / %d | %d / %d | %d / %d | %d / %d | %s |%n", e.getKey(),
                    e.getKey().equals(ANNOTATION_ONLY_FORMATS) ? " (annotation-only, not counted)" : "",
                    d.compiled, d.groups, d.agreeing, d.cases, p.agreeing, p.cases, a.agreeing, a.cases,
                    String.join("; ", refused)));
        }
        Map<String, Integer> reasons = new TreeMap<>();
        for (GroupOutcome o : outcomes) {
            if (o.layout == Layout.DEFAULT && !o.compiled && !o.file.equals(ANNOTATION_ONLY_FORMATS)) {
                reasons.merge(o.refusal.startsWith("`") ? o.refusal.substring(0, o.refusal.indexOf('`', 1) + 1)
                        : o.refusal.startsWith("not enforced: format") ? "`format` not enforced (warning)"
                        : "(none) " + o.refusal, 1, Integer::sum);
            }
        }
        sb.append("\n## Groups not compiled, by keyword (default options)\n\n| keyword | groups |\n| --- | ---: |\n");
        reasons.entrySet().stream().sorted(Map.Entry.<String, Integer>comparingByValue().reversed())
                .forEach(e -> sb.append("| ").append(e.getKey()).append(" | ").append(e.getValue()).append(" |\n"));
        List<String> knownSeen = new ArrayList<>();
        List<String> unexpected = new ArrayList<>();
        for (GroupOutcome o : outcomes) {
            for (Disagreement d : o.disagreements) {
                String k = key(o.file, o.group, d.testCase);
                if (o.file.equals(ANNOTATION_ONLY_FORMATS)) {
                    continue;
                }
                if (known.containsKey(k)) {
                    if (o.layout == Layout.DEFAULT) {
                        knownSeen.add("- " + k.replace(" | ", " / ") + ": " + known.get(k));
                    }
                } else {
                    unexpected.add("- " + k.replace(" | ", " / ") + " [" + o.layout + "]: " + d.why);
                }
            }
        }
        sb.append("\n## Known differences (default options; the same under the other layouts)\n\n");
        sb.append(knownSeen.isEmpty() ? "None.\n" : String.join("\n", knownSeen) + "\n");
        sb.append("\n## Unexpected disagreements\n\n");
        sb.append(unexpected.isEmpty() ? "None.\n" : String.join("\n", unexpected) + "\n");
        return sb.toString();
    }

    // ---------------------------------------------------------------------------------------------- files

    private static SchemaDocuments remoteDocuments() {
        SchemaDocuments set = SchemaDocuments.empty();
        ObjectMapper reader = JsonMapper.builder().enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS).build();
        try (Stream<Path> s = Files.walk(REMOTES)) {
            for (Path p : s.filter(p -> p.toString().endsWith(".json")).sorted().toList()) {
                String rel = REMOTES.relativize(p).toString().replace('\\', '/');
                set = set.with(java.net.URI.create(REMOTES_BASE + rel), reader.readTree(p.toFile()));
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return set;
    }

    static List<Path> suiteFiles() throws IOException {
        try (Stream<Path> s = Files.walk(SUITE)) {
            return s.filter(p -> p.toString().endsWith(".json")).sorted((a, b) -> {
                // the required keyword files first, then optional/, then optional/format/
                int da = SUITE.relativize(a).getNameCount();
                int db = SUITE.relativize(b).getNameCount();
                return da != db ? Integer.compare(da, db) : a.compareTo(b);
            }).toList();
        }
    }

    private static Path resource(String name) {
        try {
            return Path.of(SchemaConformanceTest.class.getClassLoader().getResource(name).toURI());
        } catch (URISyntaxException e) {
            throw new UncheckedIOException(new IOException(e));
        }
    }
}
