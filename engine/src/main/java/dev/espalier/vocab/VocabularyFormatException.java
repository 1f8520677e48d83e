package dev.espalier.vocab;

/**
 * A vocabulary file that cannot be read: bad syntax, a missing part, or contradictory token ids.
 * The message names the file and the place in it: a line number for rank files, a JSON path
 * (such as {@code $.model.vocab["abc"]}) for tokenizer.json files, e.g.
 * {@code cl100k.tiktoken:17: rank is not a number: 'x1'}.
 */
public class VocabularyFormatException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    private final String source;
    private final String location;
    private final String problem;

    /**
     * Creates an exception.
     *
     * @param source   the file (or stream) name
     * @param location a line number or JSON path, or {@code null} when the problem concerns the
     *                 whole file
     * @param problem  what is wrong
     */
    public VocabularyFormatException(String source, String location, String problem) {
        this(source, location, problem, null);
    }

    /**
     * Creates an exception with an underlying cause.
     *
     * @param source   the file (or stream) name
     * @param location a line number or JSON path, or {@code null}
     * @param problem  what is wrong
     * @param cause    the low-level failure, or {@code null}
     */
    public VocabularyFormatException(String source, String location, String problem, Throwable cause) {
        super(source + (location == null ? "" : ":" + location) + ": " + problem, cause);
        this.source = source;
        this.location = location;
        this.problem = problem;
    }

    /** The file (or stream) name. */
    public String source() {
        return source;
    }

    /** The line number (as text) or JSON path of the problem, or {@code null} for the whole file. */
    public String location() {
        return location;
    }

    /** What is wrong, without the file name and location. */
    public String problem() {
        return problem;
    }
}
