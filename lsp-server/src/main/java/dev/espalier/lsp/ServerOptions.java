package dev.espalier.lsp;

import java.time.Duration;
import java.util.Objects;

/**
 * How a server is set up.
 *
 * @param debounce       how long after the last change of a document its diagnostics are computed
 *                       (a newer change within this time supersedes the older one)
 * @param maxDiagnostics the most diagnostics published for one document; past it, one information
 *                       note says how many more there are
 * @param samples        makes the features of every document that is not a grammar file
 *                       ({@code .abnf}); by default such documents get none
 */
public record ServerOptions(Duration debounce, int maxDiagnostics, SampleFeatures samples) {

    /** The debounce of {@link #defaults()}. */
    public static final Duration DEFAULT_DEBOUNCE = Duration.ofMillis(200);

    /** The diagnostic cap of {@link #defaults()}. */
    public static final int DEFAULT_MAX_DIAGNOSTICS = 500;

    /**
     * Makes the features of documents that are not grammar files (sample outputs, their workspace
     * mapping file). Called once per server; the returned features decide per URI what they offer,
     * answering with the empty defaults of {@link DocumentFeatures} for documents they do not know.
     */
    @FunctionalInterface
    public interface SampleFeatures {
        /** Sample features that offer nothing. */
        SampleFeatures NONE = context -> DocumentFeatures.NONE;

        /** Creates the features for a server. */
        DocumentFeatures create(ServerContext context);
    }

    /** Checks the values. */
    public ServerOptions {
        Objects.requireNonNull(debounce);
        Objects.requireNonNull(samples);
        if (debounce.isNegative()) {
            throw new IllegalArgumentException("debounce must not be negative: " + debounce);
        }
        if (maxDiagnostics < 1) {
            throw new IllegalArgumentException("maxDiagnostics must be at least 1: " + maxDiagnostics);
        }
    }

    /** 200 ms debounce, at most 500 diagnostics per document, no sample features. */
    public static ServerOptions defaults() {
        return new ServerOptions(DEFAULT_DEBOUNCE, DEFAULT_MAX_DIAGNOSTICS, SampleFeatures.NONE);
    }

    /** These options with another debounce. */
    public ServerOptions withDebounce(Duration d) {
        return new ServerOptions(d, maxDiagnostics, samples);
    }

    /** These options with another diagnostic cap. */
    public ServerOptions withMaxDiagnostics(int max) {
        return new ServerOptions(debounce, max, samples);
    }

    /** These options with other sample features. */
    public ServerOptions withSamples(SampleFeatures s) {
        return new ServerOptions(debounce, maxDiagnostics, s);
    }
}
