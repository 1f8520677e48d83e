package dev.espalier.lsp.samples;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfCheck;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Grammar;
import dev.espalier.lsp.samples.SampleMap.Kind;
import dev.espalier.lsp.samples.SampleMap.VocabularySpec;
import dev.espalier.mask.Constraint;
import dev.espalier.regex.RegexSyntaxException;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaException;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.vocab.Vocabularies;
import dev.espalier.vocab.Vocabulary;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.Executor;
import java.util.concurrent.Executors;

/**
 * Compiled constraints per (constraint source, vocabulary) and loaded vocabularies per name or
 * file, prepared on a background thread of their own so that the server's analysis thread never
 * waits for a vocabulary to load or a grammar to compile.
 *
 * <p>Bounded: at most {@link #MAX_VOCABULARIES} vocabularies and {@link #MAX_CONSTRAINTS}
 * constraints are kept, the least recently used evicted first, each constraint's mask cache within
 * {@link #MASK_CACHE_BYTES}. A vocabulary file is known by its
 * path, size and modification time, so a replaced file is loaded again; a constraint source by its
 * full text (the grammar or schema as the editor holds it, or the pattern).
 *
 * <p>Thread-safe; one cache may serve several servers.
 */
public final class PreviewCache {

    /** Most vocabularies kept at once. */
    public static final int MAX_VOCABULARIES = 3;
    /** Most compiled constraints kept at once. */
    public static final int MAX_CONSTRAINTS = 8;
    /**
     * The mask-cache budget of each compiled constraint: a preview visits few states, and the
     * constraints kept together stay within {@code MAX_CONSTRAINTS} times this (128 MiB).
     */
    public static final long MASK_CACHE_BYTES = 16L << 20;

    private static final dev.espalier.mask.MaskSettings SETTINGS =
            dev.espalier.mask.MaskSettings.defaults().withCacheBudget(MASK_CACHE_BYTES);

    private final Executor worker;
    private final Map<Object, CompletableFuture<Vocabulary>> vocabularies = lru(MAX_VOCABULARIES);
    private final Map<Source, CompletableFuture<Constraint>> constraints = lru(MAX_CONSTRAINTS);

    /**
     * What a constraint is compiled from: the front end, the file (null for a regex), the text (the
     * file's content, or the pattern), the start rule, the schema layout, and the vocabulary.
     */
    public record Source(Kind kind, Path file, String text, String start, boolean pretty, VocabularySpec vocabulary,
                         Object vocabularyKey) {

        /** Compares all but the vocabulary's written form (its range in the workspace file may move). */
        @Override
        public boolean equals(Object o) {
            return o instanceof Source s && kind == s.kind && java.util.Objects.equals(file, s.file)
                    && text.equals(s.text) && java.util.Objects.equals(start, s.start) && pretty == s.pretty
                    && vocabularyKey.equals(s.vocabularyKey);
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(kind, file, text, start, pretty, vocabularyKey);
        }
    }

    /** A preview cannot be prepared: the message says why, for people. */
    public static final class PreviewException extends RuntimeException {
        /** With a message for people. */
        public PreviewException(String message) {
            super(message, null, false, false);
        }
    }

    /** A cache preparing on a daemon thread of its own. */
    public PreviewCache() {
        this(Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "espalier-preview-compile");
            t.setDaemon(true);
            return t;
        }));
    }

    /** A cache preparing on the given executor (a host's own threads). */
    public PreviewCache(Executor worker) {
        this.worker = java.util.Objects.requireNonNull(worker);
    }

    /** The key a vocabulary is cached under: its built-in name, or its file with size and time. */
    public static Object vocabularyKey(VocabularySpec spec) {
        if (spec.builtin() != null) {
            return spec.builtin();
        }
        try {
            BasicFileAttributes a = Files.readAttributes(spec.file(), BasicFileAttributes.class);
            return spec.file() + "|" + a.size() + "|" + a.lastModifiedTime().toMillis();
        } catch (java.io.IOException e) {
            return spec.file() + "|missing";
        }
    }

    /** The vocabulary, loading it in the background when it is not cached. */
    public CompletableFuture<Vocabulary> vocabulary(VocabularySpec spec) {
        Object key = vocabularyKey(spec);
        synchronized (vocabularies) {
            return vocabularies.computeIfAbsent(key, k -> CompletableFuture.supplyAsync(() -> load(spec), worker));
        }
    }

    /** The compiled constraint, compiling it in the background when it is not cached. */
    public CompletableFuture<Constraint> constraint(Source source) {
        synchronized (constraints) {
            CompletableFuture<Constraint> f = constraints.get(source);
            if (f == null) {
                f = vocabulary(source.vocabulary())
                        .thenApplyAsync(v -> compile(source, v), worker);
                constraints.put(source, f);
            }
            return f;
        }
    }

    /** The constraint's preparation if it was started and is still cached, else null; starts nothing. */
    public CompletableFuture<Constraint> peek(Source source) {
        synchronized (constraints) {
            return constraints.get(source);
        }
    }

    /**
     * Checks what can be checked of a source without a vocabulary: the grammar's errors and start
     * rule, the pattern's syntax, the schema's compilation.
     *
     * @throws PreviewException saying what is wrong
     */
    public static void checkWithoutVocabulary(Source s) {
        try {
            switch (s.kind()) {
                case REGEX -> dev.espalier.regex.RegexSyntax.parse(s.text());
                case GRAMMAR -> grammar(s);
                case SCHEMA -> schema(s);
            }
        } catch (PreviewException e) {
            throw e;
        } catch (RegexSyntaxException e) {
            throw new PreviewException("the regular expression is not valid: " + e.getMessage());
        } catch (RuntimeException | StackOverflowError e) {
            throw new PreviewException("cannot read the constraint: " + failure(e));
        }
    }

    /** Forgets every compiled constraint (after files a grammar may import changed on disk). */
    public void forgetConstraints() {
        synchronized (constraints) {
            constraints.clear();
        }
    }

    /** The cause of a failed preparation, as a message for people. */
    public static String failure(Throwable t) {
        Throwable c = t;
        while ((c instanceof CompletionException || c instanceof java.util.concurrent.ExecutionException)
                && c.getCause() != null) {
            c = c.getCause();
        }
        if (c instanceof PreviewException) {
            return c.getMessage();
        }
        String m = c.getMessage();
        return m == null ? c.getClass().getSimpleName() : m;
    }

    private static Vocabulary load(VocabularySpec spec) {
        try {
            return spec.builtin() != null ? Vocabularies.builtin(spec.builtin()) : Vocabularies.load(spec.file());
        } catch (RuntimeException e) {
            throw new PreviewException("cannot load the vocabulary " + spec.label() + ": " + failure(e));
        }
    }

    private static Constraint compile(Source s, Vocabulary v) {
        try {
            return switch (s.kind()) {
                case REGEX -> Constraint.regex(s.text(), v, SETTINGS);
                case GRAMMAR -> Constraint.grammar(grammar(s), v, SETTINGS);
                case SCHEMA -> Constraint.grammar(schema(s), v, SETTINGS);
            };
        } catch (PreviewException e) {
            throw e;
        } catch (RegexSyntaxException e) {
            throw new PreviewException("the regular expression is not valid: " + e.getMessage());
        } catch (dev.espalier.automaton.AutomatonTooLargeException e) {
            throw new PreviewException("the constraint is too large to compile: " + e.getMessage());
        } catch (RuntimeException | StackOverflowError e) {
            throw new PreviewException("cannot compile the constraint: " + failure(e));
        }
    }

    private static Grammar grammar(Source s) {
        String name = s.file().getFileName().toString();
        AbnfResult r = AbnfCheck.checkWithImports(s.text(), s.file().toString(), Abnf.fileResolver());
        long errors = r.diagnostics().stream().filter(Diagnostic::isError).count();
        if (errors > 0) {
            Diagnostic first = r.diagnostics().stream().filter(Diagnostic::isError).findFirst().orElseThrow();
            throw new PreviewException("the grammar " + name + " has " + errors + (errors == 1 ? " error" : " errors")
                    + "; the first: " + first.format(name));
        }
        Grammar g = r.grammar();
        if (s.start() != null) {
            if (g.rule(s.start()).isEmpty()) {
                throw new PreviewException("the grammar " + name + " has no rule \"" + s.start() + "\"");
            }
            g = g.withStart(g.rule(s.start()).get().name());
        }
        return g;
    }

    private static Grammar schema(Source s) {
        SchemaOptions o = SchemaOptions.defaults().withSpacing(s.pretty() ? SchemaOptions.Spacing.PRETTY
                : SchemaOptions.Spacing.COMPACT);
        try {
            // as the file's text, so that references reach the files beside it, as on the command line
            return JsonSchemas.compile(s.text(), s.file(), dev.espalier.schema.SchemaDocuments.empty(), o).grammar();
        } catch (UnsupportedOperationException e) {
            throw new PreviewException("JSON Schema constraints are not available in this build");
        } catch (SchemaException e) {
            throw new PreviewException("the schema " + s.file().getFileName() + " cannot be compiled: " + e.getMessage());
        }
    }

    private static <K, V> Map<K, V> lru(int max) {
        return new LinkedHashMap<>(16, 0.75f, true) {
            @Override
            protected boolean removeEldestEntry(Map.Entry<K, V> eldest) {
                return size() > max;
            }
        };
    }
}
