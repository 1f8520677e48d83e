package dev.espalier.cli;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.MaskedSampler;
import dev.espalier.vocab.Vocabulary;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

import java.io.ByteArrayOutputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.Callable;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * {@code espalier bench}: mask timings along real constrained generations, side by side with the
 * baseline a Java developer would write without Espalier (java.util.regex on prefix + token).
 */
@Command(name = "bench", mixinStandardHelpOptions = true,
        description = "Measure compile time, first mask of a new state, steady-state mask (median, p99) and cache "
                + "memory for patterns × vocabularies, beside a java.util.regex baseline that tests every token.")
final class BenchCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--regex", paramLabel = "PATTERN", description = "A pattern to measure (repeatable; default: the built-in set).")
    List<String> patterns;

    @Option(names = "--grammar", paramLabel = "FILE",
            description = "An ABNF grammar to measure instead of the patterns (repeatable).")
    List<String> grammars;

    @Option(names = "--schema", paramLabel = "FILE",
            description = "A JSON Schema to measure (repeatable; with --grammar, in the same table).")
    List<String> schemas;

    @Option(names = "--vocab", paramLabel = "NAME|PATH",
            description = "A vocabulary (repeatable; default: cl100k, o200k, then Qwen3 (patterns) or Llama 3 and Qwen3 (grammars) when ../shared/vocab has them).")
    List<String> vocabs;

    @Option(names = "--generations", paramLabel = "N", defaultValue = "4",
            description = "Constrained generations whose states are measured. Default: ${DEFAULT-VALUE}.")
    int generations;

    @Option(names = "--rounds", paramLabel = "N", defaultValue = "200",
            description = "Steady-state rounds over the states. Default: ${DEFAULT-VALUE}.")
    int rounds;

    @Option(names = "--baseline-masks", paramLabel = "N", defaultValue = "3",
            description = "Masks computed with the baseline per row. Default: ${DEFAULT-VALUE}.")
    int baselineMasks;

    @Option(names = "--min-steps", paramLabel = "N", defaultValue = "400",
            description = "With --grammar: generations continue until at least N masks are measured. "
                    + "Default: ${DEFAULT-VALUE}.")
    int minSteps;

    @Option(names = "--warm-up", paramLabel = "N", defaultValue = "3",
            description = "With --grammar: unreported passes over the grammars before measuring. Default: ${DEFAULT-VALUE}.")
    int warmUpPasses;

    @Option(names = "--seed", paramLabel = "S", defaultValue = "1", description = "Random seed. Default: ${DEFAULT-VALUE}.")
    long seed;

    /** The built-in pattern set, by label. Each is valid in both our syntax and java.util.regex. */
    static Map<String, String> defaultPatterns() {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("date", "[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])");
        m.put("rfc3339", "[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])[Tt]([01][0-9]|2[0-3]):[0-5][0-9]:"
                + "([0-5][0-9]|60)(\\.[0-9]+)?([Zz]|[+-]([01][0-9]|2[0-3]):[0-5][0-9])");
        m.put("email", "[a-z0-9._%+-]{1,64}@([a-z0-9-]{1,63}\\.){1,4}[a-z]{2,12}");
        m.put("uuid", "[0-9a-f]{8}-[0-9a-f]{4}-[1-5][0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}");
        m.put("phone", "\\+[1-9][0-9]{0,2} [0-9]{2,4} [0-9]{3,4} [0-9]{3,4}");
        m.put("varieties200", "(" + String.join("|", Orchard.varieties()) + ")");
        m.put("words200", "[a-z ]{0,200}");
        return m;
    }

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        Map<String, String> pats = new LinkedHashMap<>();
        if (patterns == null || patterns.isEmpty()) {
            pats.putAll(defaultPatterns());
        } else {
            for (int i = 0; i < patterns.size(); i++) {
                pats.put("p" + (i + 1), patterns.get(i));
            }
        }
        if ((grammars != null && !grammars.isEmpty()) || (schemas != null && !schemas.isEmpty())) {
            return grammarBench(out);
        }
        List<String> vs = vocabs;
        if (vs == null || vs.isEmpty()) {
            vs = new ArrayList<>(List.of("cl100k", "o200k"));
            Path qwen = Path.of("..", "shared", "vocab", "qwen3-tokenizer.json.gz");
            if (Files.isRegularFile(qwen)) {
                vs.add(qwen.toString());
            }
        }
        out.printf("%-13s %-26s %7s %9s %12s %12s %9s %9s %9s %12s %9s%n", "pattern", "vocabulary", "states",
                "compile", "first-med", "first-max", "steady", "p99", "cache", "baseline", "ratio");
        out.printf("%-13s %-26s %7s %9s %12s %12s %9s %9s %9s %12s %9s%n", "", "", "", "ms", "µs", "µs", "µs",
                "µs", "KiB", "ms/mask", "×");
        boolean warmedUp = false;
        for (String vn : vs) {
            long t0 = System.nanoTime();
            Vocabulary v = VocabOptions.load(vn, null);
            long t1 = System.nanoTime();
            v.trie();
            long t2 = System.nanoTime();
            Progress.note(String.format("%s: %d tokens, loaded in %.0f ms, trie of %d nodes built in %.0f ms",
                    v.name(), v.tokenCount(), (t1 - t0) / 1e6, v.trie().nodeCount(), (t2 - t1) / 1e6));
            if (!warmedUp) {
                // one unreported pass so that the JIT has compiled the hot paths before any figure is taken
                Progress.note("warming up on " + v.name());
                for (String p : pats.values()) {
                    row("warm-up", p, v);
                }
                warmedUp = true;
            }
            for (Map.Entry<String, String> p : pats.entrySet()) {
                out.println(row(p.getKey(), p.getValue(), v));
                out.flush();
            }
        }
        return 0;
    }

    private String row(String label, String pattern, Vocabulary v) {
        // compile: median of 5
        double[] compile = new double[5];
        Constraint c = null;
        for (int i = 0; i < compile.length; i++) {
            long a = System.nanoTime();
            c = Constraint.regex(pattern, v);
            compile[i] = (System.nanoTime() - a) / 1e6;
        }
        String states = c.describe().replaceAll("^byte DFA, (\\d+) states.*$", "$1");
        // the states met along real constrained generations
        Random rnd = new Random(seed);
        List<Cursor> cursors = new ArrayList<>();
        List<String> prefixes = new ArrayList<>();
        for (int g = 0; g < generations; g++) {
            MaskedSampler.Sample s = MaskedSampler.sample(c, rnd, 256);
            Cursor cur = c.start();
            ByteArrayOutputStream text = new ByteArrayOutputStream();
            for (int id : s.tokens()) {
                cursors.add(cur.fork());
                prefixes.add(text.toString(StandardCharsets.UTF_8));
                if (id == v.endOfSequence()) {
                    break;
                }
                cur.feed(id);
                text.writeBytes(v.bytes(id));
            }
        }
        // first mask of each new state, on a fresh constraint
        Constraint fresh = Constraint.regex(pattern, v);
        long[] mask = new long[v.maskWords()];
        List<Double> first = new ArrayList<>();
        List<Cursor> freshCursors = new ArrayList<>();
        for (int g = 0; g < cursors.size(); g++) {
            Cursor f = fresh.start();
            f.feedText(prefixes.get(g));
            freshCursors.add(f);
        }
        for (Cursor f : freshCursors) {
            int before = fresh.cachedMasks();
            long a = System.nanoTime();
            f.fillMask(mask);
            long b = System.nanoTime();
            if (fresh.cachedMasks() > before) {
                first.add((b - a) / 1e3);
            }
        }
        // steady state: cached masks along the same generations
        for (int warm = 0; warm < 20; warm++) {
            for (Cursor f : freshCursors) {
                f.fillMask(mask);
            }
        }
        double[] steady = new double[rounds * freshCursors.size()];
        int k = 0;
        for (int r = 0; r < rounds; r++) {
            for (Cursor f : freshCursors) {
                long a = System.nanoTime();
                f.fillMask(mask);
                steady[k++] = (System.nanoTime() - a) / 1e3;
            }
        }
        // baseline: java.util.regex on prefix + token for every token
        Pattern jp = Pattern.compile(pattern);
        double[] base = new double[Math.min(baselineMasks, prefixes.size())];
        for (int i = 0; i < base.length; i++) {
            String prefix = prefixes.get(i * prefixes.size() / base.length);
            long a = System.nanoTime();
            baselineMask(jp, prefix, v, mask);
            base[i] = (System.nanoTime() - a) / 1e6;
        }
        double steadyMed = percentile(steady, 50);
        double baseMed = percentile(base, 50);
        double[] firstArr = first.stream().mapToDouble(Double::doubleValue).toArray();
        return String.format("%-13s %-26s %7s %9.2f %12.1f %12.1f %9.2f %9.2f %9d %12.1f %9.0f", label,
                shorten(v.name()), states, percentile(compile, 50), percentile(firstArr, 50), max(firstArr),
                steadyMed, percentile(steady, 99), fresh.cacheBytes() / 1024, baseMed, baseMed * 1000 / steadyMed);
    }

    private List<String> vocabularies() {
        List<String> vs = vocabs;
        if (vs == null || vs.isEmpty()) {
            vs = new ArrayList<>(List.of("cl100k", "o200k"));
            for (String m : List.of("llama3", "qwen3")) {
                for (String dir : List.of("../shared/vocab", "../../shared/vocab")) {
                    Path p = Path.of(dir, m + "-tokenizer.json.gz");
                    if (Files.isRegularFile(p)) {
                        vs.add(p.toString());
                        break;
                    }
                }
            }
        }
        return vs;
    }

    private static final java.lang.management.ThreadMXBean THREADS =
            java.lang.management.ManagementFactory.getThreadMXBean();

    private int grammarBench(PrintWriter out) {
        // every file is read (and its problems reported) before any measurement
        Map<String, dev.espalier.grammar.Grammar> formats = new LinkedHashMap<>();
        for (String f : grammars == null ? List.<String>of() : grammars) {
            formats.put(Path.of(f).getFileName().toString(), GrammarFiles.load(f, null, spec.commandLine().getErr()));
        }
        List<String> schemaFiles = schemas == null ? List.of() : schemas;
        for (String f : schemaFiles) {
            dev.espalier.grammar.Grammar g = SchemaFiles.load(f, dev.espalier.schema.SchemaOptions.defaults(),
                    spec.commandLine().getErr()).grammar();
            formats.put(Path.of(f).getFileName().toString(), g);
        }
        if (!schemaFiles.isEmpty()) {
            schemaCompileTimes(schemaFiles, out);
        }
        String head = "%-22s %-20s %9s %9s %9s %8s %8s %8s %8s %8s %6s %8s %10s %8s%n";
        out.printf(head, "grammar", "vocabulary", "compile", "1st-mask", "1st-cpu", "median", "p99", "max", "cpu-med",
                "cpu-p99", "steps", "cache", "naive", "ratio");
        out.printf(head, "", "", "ms", "ms", "ms", "µs", "µs", "µs", "µs", "µs", "", "KiB", "µs/mask", "×");
        boolean warmedUp = false;
        for (String vn : vocabularies()) {
            long t0 = System.nanoTime();
            Vocabulary v = VocabOptions.load(vn, null);
            long t1 = System.nanoTime();
            v.trie();
            long t2 = System.nanoTime();
            Progress.note(String.format("%s: %d tokens, loaded in %.0f ms, trie of %d nodes built in %.0f ms",
                    v.name(), v.tokenCount(), (t1 - t0) / 1e6, v.trie().nodeCount(), (t2 - t1) / 1e6));
            if (!warmedUp) {
                // unreported passes so that the JIT has compiled compile and mask paths before any figure is taken
                Progress.note("warming up on " + v.name());
                for (int pass = 0; pass < warmUpPasses; pass++) {
                    for (Map.Entry<String, dev.espalier.grammar.Grammar> f : formats.entrySet()) {
                        grammarRow(f.getKey(), f.getValue(), v, true);
                    }
                }
                warmedUp = true;
            }
            for (Map.Entry<String, dev.espalier.grammar.Grammar> f : formats.entrySet()) {
                out.println(grammarRow(f.getKey(), f.getValue(), v, false));
                out.flush();
            }
        }
        return 0;
    }

    /**
     * Schema to grammar: every schema compiled in turn for about six seconds unreported (the JIT
     * warms up on all of them), then the median of 15 compiles per schema, and the median and
     * maximum of those medians.
     */
    private static void schemaCompileTimes(List<String> files, PrintWriter out) {
        // each text read once and compiled as its file's text, so that references to the files beside it
        // resolve; only those are read while timing
        List<String> texts = new ArrayList<>();
        for (String file : files) {
            try {
                texts.add(Files.readString(Path.of(file), StandardCharsets.UTF_8));
            } catch (java.io.IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        }
        dev.espalier.schema.SchemaOptions options = dev.espalier.schema.SchemaOptions.defaults();
        dev.espalier.schema.SchemaDocuments none = dev.espalier.schema.SchemaDocuments.empty();
        // the schema compiler's large methods take the JIT several seconds on two cores: measured
        // after 2 s, the e-mail schemas took twice their steady time
        long warmUntil = System.nanoTime() + 6_000_000_000L;
        for (int pass = 0; pass < 3 || System.nanoTime() < warmUntil; pass++) {
            for (int i = 0; i < texts.size(); i++) {
                dev.espalier.schema.JsonSchemas.compile(texts.get(i), Path.of(files.get(i)), none, options);
            }
        }
        double[][] t = new double[texts.size()][15];
        for (int round = 0; round < 15; round++) {
            for (int i = 0; i < texts.size(); i++) {
                Path file = Path.of(files.get(i));
                long a = System.nanoTime();
                dev.espalier.schema.JsonSchemas.compile(texts.get(i), file, none, options);
                t[i][round] = (System.nanoTime() - a) / 1e6;
            }
        }
        double[] medians = new double[texts.size()];
        for (int i = 0; i < texts.size(); i++) {
            medians[i] = percentile(t[i], 50);
            out.printf("schema %s: compiled to a grammar in %.2f ms (median of 15, max %.2f)%n",
                    Path.of(files.get(i)).getFileName(), medians[i], max(t[i]));
        }
        if (texts.size() > 1) {
            out.printf("schemas: compile to a grammar, median %.2f ms and max %.2f ms over the %d schemas' medians%n",
                    percentile(medians, 50), max(medians), texts.size());
        }
    }

    private String grammarRow(String file, dev.espalier.grammar.Grammar g, Vocabulary v, boolean warmUp) {
        long[] mask = new long[v.maskWords()];
        // compile and first mask of a fresh constraint (vocabulary trie built beforehand): median of 9
        double[] compileMs = new double[warmUp ? 40 : 9];
        double[] firstMs = new double[compileMs.length];
        Constraint c = null;
        double[] firstCpuMs = new double[compileMs.length];
        for (int i = 0; i < firstMs.length; i++) {
            long ca = THREADS.getCurrentThreadCpuTime();
            long a = System.nanoTime();
            c = Constraint.grammar(g, v);
            long b = System.nanoTime();
            c.start().fillMask(mask);
            compileMs[i] = (b - a) / 1e6;
            firstMs[i] = (System.nanoTime() - a) / 1e6;
            firstCpuMs[i] = (THREADS.getCurrentThreadCpuTime() - ca) / 1e6;
        }
        // masks along real constrained generations, caches filling as they go; wall and thread CPU time
        Random rnd = new Random(seed);
        List<Double> times = new ArrayList<>();
        List<Double> cpu = new ArrayList<>();
        List<byte[]> prefixes = new ArrayList<>();
        for (int gen = 0; gen < generations || times.size() < minSteps; gen++) {
            Cursor cur = c.start();
            ByteArrayOutputStream text = new ByteArrayOutputStream();
            for (int step = 0; step < 200 && !cur.isFinished(); step++) {
                long c0 = THREADS.getCurrentThreadCpuTime();
                long s0 = System.nanoTime();
                cur.fillMask(mask);
                long s1 = System.nanoTime();
                long c1 = THREADS.getCurrentThreadCpuTime();
                times.add((s1 - s0) / 1e3);
                cpu.add((c1 - c0) / 1e3);
                prefixes.add(text.toByteArray());
                int count = dev.espalier.mask.TokenBits.count(mask);
                if (count == 0) {
                    break;
                }
                int eos = v.endOfSequence();
                int pick = eos >= 0 && dev.espalier.mask.TokenBits.get(mask, eos) && rnd.nextDouble() < 0.05 ? eos
                        : dev.espalier.mask.TokenBits.nth(mask, rnd.nextInt(count));
                cur.feed(pick);
                if (pick != eos) {
                    text.writeBytes(v.bytes(pick));
                }
            }
        }
        double[] t = times.stream().mapToDouble(Double::doubleValue).toArray();
        double[] ct = cpu.stream().mapToDouble(Double::doubleValue).toArray();
        if (warmUp) {
            return "";
        }
        // the naive method: every token checked separately against a byte-level Earley chart
        dev.espalier.earley.EarleyGrammar eg = dev.espalier.earley.EarleyGrammar.compile(g);
        double[] naive = new double[Math.min(baselineMasks, prefixes.size())];
        for (int i = 0; i < naive.length; i++) {
            byte[] prefix = prefixes.get(i * prefixes.size() / naive.length);
            dev.espalier.earley.EarleyChart chart = eg.newChart();
            chart.feedAll(prefix);
            long n0 = System.nanoTime();
            for (int id = 0; id < v.size(); id++) {
                if (!v.has(id) || v.isSpecial(id)) {
                    continue;
                }
                byte[] tok = v.bytes(id);
                int fed = chart.feedAll(tok);
                chart.undo(fed);
            }
            naive[i] = (System.nanoTime() - n0) / 1e3;
        }
        double med = percentile(t, 50);
        double naiveMed = percentile(naive, 50);
        String name = Path.of(file).getFileName().toString();
        return String.format("%-22s %-20s %9.2f %9.2f %9.2f %8.1f %8.1f %8.0f %8.1f %8.1f %6d %8d %10.0f %8.0f",
                name, shortName(v.name()), percentile(compileMs, 50), percentile(firstMs, 50),
                percentile(firstCpuMs, 50), med, percentile(t, 99),
                max(t), percentile(ct, 50), percentile(ct, 99), t.length, c.cacheBytes() / 1024, naiveMed,
                naiveMed / med);
    }

    private static String shortName(String name) {
        String n = name.replaceAll("^.*/", "").replaceAll("-tokenizer\\.json(\\.gz)?$", "");
        return n.length() <= 20 ? n : n.substring(n.length() - 20);
    }

    /** What one would write without Espalier: test every token with the JDK's regex engine. */
    static void baselineMask(Pattern p, String prefix, Vocabulary v, long[] mask) {
        Arrays.fill(mask, 0L);
        Matcher m = p.matcher("");
        for (int id = 0; id < v.size(); id++) {
            if (!v.has(id) || v.isSpecial(id)) {
                continue;
            }
            m.reset(prefix + new String(v.bytes(id), StandardCharsets.UTF_8));
            if (m.matches() || m.hitEnd()) {
                mask[id >>> 6] |= 1L << id;
            }
        }
    }

    private static String shorten(String name) {
        return name.length() <= 26 ? name : name.substring(name.length() - 26);
    }

    static double percentile(double[] xs, double p) {
        if (xs.length == 0) {
            return Double.NaN;
        }
        double[] s = xs.clone();
        Arrays.sort(s);
        int i = (int) Math.ceil(p / 100.0 * s.length) - 1;
        return s[Math.max(0, Math.min(s.length - 1, i))];
    }

    private static double max(double[] xs) {
        return xs.length == 0 ? Double.NaN : Arrays.stream(xs).max().getAsDouble();
    }
}
