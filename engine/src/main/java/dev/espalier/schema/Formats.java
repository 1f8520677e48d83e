package dev.espalier.schema;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.abnf.ImportResolver;
import dev.espalier.automaton.CharAutomata;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.grammar.Span;
import dk.brics.automaton.Automaton;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The string formats of JSON Schema that are enforced, built from the grammar library.
 *
 * <p>The formats are ABNF: {@code formats.abnf} on the class path next to this class, which imports
 * copies of the library's {@code date-time.abnf} (RFC 3339), {@code ip-address.abnf} and
 * {@code uri.abnf} (RFC 3986) and adds RFC 3339 Appendix A durations, RFC 5321 mailboxes, RFC 1123
 * host names, RFC 9562 UUIDs, RFC 6901 JSON pointers, relative JSON pointers and RFC 6570 URI
 * templates. Each fragment is the <em>content</em> of a JSON string: the decoded characters between
 * the quotes, which the schema compiler escapes as JSON requires.
 *
 * <p>What the grammars do not check (each is also stated in {@link #gaps(String)}):
 * <ul>
 *   <li>date-time, time: a leap second ({@code :60}) is accepted only as 23:59:60 written with a
 *       zero offset ({@code Z}, {@code +00:00}, {@code -00:00}); other offsets that put it at 23:59
 *       UTC are refused (pairing each local minute with its offset takes a minimal automaton of
 *       about 11,000 states, against 33 for the whole time format), and whether a leap second was
 *       actually inserted that day is not known.</li>
 *   <li>email: general address literals (other than the IPv4 and IPv6 forms) are refused; the
 *       length limits of RFC 5321 section 4.5.3.1 are not enforced. Local parts are dot-strings or
 *       quoted strings, both as RFC 5321 section 4.1.2 defines them. Domain labels are refused as
 *       host-name labels are when they are R-LDH labels (see hostname).</li>
 *   <li>hostname: the total length limit of 253 characters is not counted by the grammar (as an
 *       automaton it needs about 24,000 states): the schema compiler enforces it through a
 *       {@code maxLength} of at most 253 and otherwise refuses the format ({@link #uncountedLength}).
 *       Labels whose third and fourth
 *       characters are both {@code -} (R-LDH labels, reserved by RFC 5890 section 2.3.1) are
 *       refused, A-labels ({@code xn--}) among them: a grammar cannot decode their Punycode, so a
 *       valid internationalised name in A-label form is refused rather than an invalid one
 *       accepted.</li>
 * </ul>
 * Stricter than the letter of the ABNF: duration designators ({@code P}, {@code Y}, {@code T}, ...) are
 * upper case only, as ISO 8601 writes them (RFC 5234 would read the quoted strings of RFC 3339
 * Appendix A case-insensitively); e-mail address literals take IPv4 octets without leading zeros,
 * and the IPv6 tag only as {@code IPv6:}, as RFC 5321 section 4.1.3 writes it; host names and
 * e-mail domains have no R-LDH labels.
 */
public final class Formats {

    private static final String RESOURCES = "formats/";
    private static final List<String> NAMES = List.of("date-time", "date", "time", "duration", "email", "hostname",
            "ipv4", "ipv6", "uuid", "uri", "uri-reference", "json-pointer", "relative-json-pointer", "uri-template");
    private static final Map<String, String> GAPS = Map.of(
            "date-time", "leap seconds only as 23:59:60 with a zero offset, on any date (no table of the leap seconds announced)",
            "time", "leap seconds only as 23:59:60 with a zero offset",
            "email", "no general address literals (only IPv4 and IPv6 ones); length limits not enforced; the Punycode"
                    + " of A-labels (xn--) in the domain, so domain labels with \"--\" as third and fourth characters"
                    + " are refused, valid A-labels included",
            "hostname", "the Punycode of A-labels (xn--), so labels with \"--\" as third and fourth characters are"
                    + " refused, valid A-labels included");

    /**
     * The most characters a host name may have in all (RFC 1123 section 2.1, after RFC 1034 section
     * 3.1: 255 octets on the wire, 253 characters written out; from memory). The format's grammar does
     * not count them: an automaton counting up to 253 characters of host name has about 24,000
     * states, so the schema compiler enforces the limit only through a {@code maxLength} of at most
     * this many characters.
     */
    public static final int HOSTNAME_MAX_LENGTH = 253;

    /** State limit when compiling a format to an automaton (the largest, uri-reference, needs far fewer). */
    private static final int AUTOMATON_LIMIT = 100_000;
    private static final Map<String, Automaton> AUTOMATA = new ConcurrentHashMap<>();

    private Formats() {
    }

    /** Names of the enforced formats (date-time, date, time, duration, email, hostname, ...). */
    public static Set<String> names() {
        return new LinkedHashSet<>(NAMES);
    }

    /**
     * The content of a string of the given format: decoded characters, before JSON escaping (the
     * caller escapes what JSON requires, such as the double quote and backslash of a quoted e-mail
     * local part; see the class documentation).
     *
     * @param prefix prefix of every helper rule name
     * @return empty when the format is not one of {@link #names()}
     */
    public static Optional<RegularFragment> content(String prefix, String format) {
        if (!NAMES.contains(format)) {
            return Optional.empty();
        }
        Grammar g = Library.GRAMMAR;
        String start = "format-" + format;
        // the rules reachable from the start rule, renamed with the prefix
        Map<String, Rule> reachable = new LinkedHashMap<>();
        Deque<String> work = new ArrayDeque<>();
        work.add(start);
        while (!work.isEmpty()) {
            String name = work.poll();
            String key = Grammar.key(name);
            if (reachable.containsKey(key)) {
                continue;
            }
            Rule r = g.rule(name).orElseThrow(() -> new IllegalStateException("format rule " + name + " is missing"));
            reachable.put(key, r);
            collectRefs(r.body(), work);
        }
        List<Rule> rules = new ArrayList<>();
        for (Rule r : reachable.values()) {
            rules.add(Rule.of(prefix + "-" + r.name(), renamed(prefix, r.body())));
        }
        return Optional.of(new RegularFragment(Expr.ref(prefix + "-" + g.rule(start).orElseThrow().name()), rules));
    }

    /**
     * The content of a string of the given format as a minimal dk.brics automaton over chars (the
     * language of {@link #content}), for callers that intersect it with other string constraints.
     * Built once per format.
     *
     * @return empty when the format is not one of {@link #names()}
     */
    public static Optional<Automaton> automaton(String format) {
        if (!NAMES.contains(format)) {
            return Optional.empty();
        }
        return Optional.of(AUTOMATA.computeIfAbsent(format, f -> {
            RegularFragment frag = content("format", f).orElseThrow();
            Map<String, Expr> bodies = new HashMap<>();
            frag.rules().forEach(r -> bodies.put(r.key(), r.body()));
            return CharAutomata.compile(frag.body(), n -> bodies.get(Grammar.key(n)), AUTOMATON_LIMIT);
        }).clone());
    }

    /**
     * The most characters a string of the format may have in all when its grammar does not count
     * them (hostname: {@value #HOSTNAME_MAX_LENGTH}), or empty: such a format is exact only together
     * with a {@code maxLength} of at most that many characters.
     */
    public static java.util.OptionalInt uncountedLength(String format) {
        return format.equals("hostname") ? java.util.OptionalInt.of(HOSTNAME_MAX_LENGTH) : java.util.OptionalInt.empty();
    }

    /**
     * What the grammar of a format does not check, in a phrase, or empty when it checks everything
     * the format's standard defines syntactically (apart from an {@link #uncountedLength}).
     */
    public static Optional<String> gaps(String format) {
        return Optional.ofNullable(GAPS.get(format));
    }

    // ------------------------------------------------------------------ loading

    /** The parsed format grammar, read once from the class path. */
    private static final class Library {
        static final Grammar GRAMMAR = load();

        private static Grammar load() {
            ImportResolver fromClassPath = (from, path) -> Optional.of(new ImportResolver.Source(path, read(path)));
            AbnfResult result = Abnf.parseWithImports(read("formats.abnf"), "formats.abnf", fromClassPath);
            List<Diagnostic> errors = result.diagnostics().stream().filter(Diagnostic::isError).toList();
            if (!errors.isEmpty()) {
                throw new IllegalStateException("the format grammars do not read cleanly: " + errors);
            }
            return result.grammar();
        }

        private static String read(String name) {
            try (InputStream in = Formats.class.getResourceAsStream(RESOURCES + name)) {
                if (in == null) {
                    throw new IllegalStateException("missing resource " + RESOURCES + name);
                }
                return new String(in.readAllBytes(), StandardCharsets.UTF_8);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    /** The parsed format grammar, with its own rule names (for tests). */
    static Grammar library() {
        return Library.GRAMMAR;
    }

    // ------------------------------------------------------------------ renaming

    private static void collectRefs(Expr e, Deque<String> into) {
        Deque<Expr> stack = new ArrayDeque<>();
        stack.push(e);
        while (!stack.isEmpty()) {
            Expr x = stack.pop();
            if (x instanceof Expr.Ref r) {
                into.add(r.name());
            } else if (x instanceof Expr.Seq s) {
                s.items().forEach(stack::push);
            } else if (x instanceof Expr.Choice c) {
                c.options().forEach(stack::push);
            } else if (x instanceof Expr.Repeat r) {
                stack.push(r.body());
            }
        }
    }

    /**
     * The expression with every reference prefixed and every span dropped (the spans point into
     * the format resources, not into the user's schema). The format grammars are fixed and shallow,
     * so recursion here is bounded by them.
     */
    private static Expr renamed(String prefix, Expr e) {
        if (e instanceof Expr.Seq s) {
            return new Expr.Seq(s.items().stream().map(x -> renamed(prefix, x)).toList(), Span.NONE);
        } else if (e instanceof Expr.Choice c) {
            return new Expr.Choice(c.options().stream().map(x -> renamed(prefix, x)).toList(), Span.NONE);
        } else if (e instanceof Expr.Repeat r) {
            return new Expr.Repeat(renamed(prefix, r.body()), r.min(), r.max(), Span.NONE);
        } else if (e instanceof Expr.Chars c) {
            return new Expr.Chars(c.set(), Span.NONE);
        } else if (e instanceof Expr.Text t) {
            return new Expr.Text(t.text(), t.ignoreCase(), Span.NONE);
        } else {
            return new Expr.Ref(prefix + "-" + ((Expr.Ref) e).name(), Span.NONE);
        }
    }
}
