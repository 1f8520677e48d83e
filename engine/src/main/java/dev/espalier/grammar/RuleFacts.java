package dev.espalier.grammar;

import java.util.Optional;
import java.util.Set;
import java.util.function.Supplier;

/**
 * What {@link GrammarAnalysis} found out about one rule. Immutable; {@link #shortest()} is worked out
 * on first use.
 */
public final class RuleFacts {

    private final String name;
    private final boolean nullable;
    private final boolean productive;
    private final boolean regular;
    private final boolean leftRecursive;
    private final long shortestLength;
    private final long[] firstBytes;
    private final Set<String> references;
    private final Supplier<Optional<String>> shortestMaker;
    private volatile Optional<String> shortest;

    RuleFacts(String name, boolean nullable, boolean productive, boolean regular, boolean leftRecursive,
              long shortestLength, long[] firstBytes, Set<String> references, Supplier<Optional<String>> shortestMaker) {
        this.name = name;
        this.nullable = nullable;
        this.productive = productive;
        this.regular = regular;
        this.leftRecursive = leftRecursive;
        this.shortestLength = shortestLength;
        this.firstBytes = firstBytes.clone();
        this.references = java.util.Collections.unmodifiableSet(new java.util.LinkedHashSet<>(references));
        this.shortestMaker = shortestMaker;
    }

    /** The rule's name as defined. */
    public String name() {
        return name;
    }

    /** Whether the rule derives the empty string. */
    public boolean nullable() {
        return nullable;
    }

    /** Whether the rule derives at least one (finite) string. */
    public boolean productive() {
        return productive;
    }

    /**
     * Whether the rule's language is regular by construction, as {@link GrammarAnalysis} detects it:
     * every group of mutually recursive rules reachable from it is either a single rule that does
     * not refer to itself, or right-linear (all references within the group in tail position), or
     * left-linear (all in head position).
     */
    public boolean regular() {
        return regular;
    }

    /** Whether the rule can reach itself at its leftmost position, directly or through nullable prefixes. */
    public boolean leftRecursive() {
        return leftRecursive;
    }

    /**
     * The length in UTF-8 bytes of a shortest string the rule derives, or -1 when it derives none.
     * Lengths of at least 2<sup>60</sup> are reported as 2<sup>60</sup>.
     */
    public long shortestLength() {
        return shortestLength;
    }

    /**
     * A shortest string the rule derives (shortest in UTF-8 bytes; among characters of equal length,
     * a letter or digit where the rule allows one). Empty when the rule derives nothing or when a
     * shortest string is longer than {@link GrammarAnalysis#MAX_SHORTEST_BYTES} bytes.
     */
    public Optional<String> shortest() {
        Optional<String> s = shortest;
        if (s == null) {
            s = shortestMaker.get();
            shortest = s;
        }
        return s;
    }

    /**
     * The bytes a non-empty string of the rule can start with, as a 256-bit set: bit {@code b} of
     * word {@code b >> 6}. For non-ASCII characters these are UTF-8 lead bytes. A copy.
     */
    public long[] firstBytes() {
        return firstBytes.clone();
    }

    /** Whether some non-empty string of the rule starts with byte {@code b} (0..255). */
    public boolean canStartWith(int b) {
        return b >= 0 && b < 256 && (firstBytes[b >> 6] & (1L << (b & 63))) != 0;
    }

    /**
     * The rules this rule's body refers to directly, in order of first mention: the defined name of
     * each, or the name as written for an undefined one.
     */
    public Set<String> references() {
        return references;
    }

    @Override
    public String toString() {
        return "RuleFacts[" + name + (nullable ? " nullable" : "") + (productive ? " productive" : "")
                + (regular ? " regular" : "") + (leftRecursive ? " left-recursive" : "") + "]";
    }
}
