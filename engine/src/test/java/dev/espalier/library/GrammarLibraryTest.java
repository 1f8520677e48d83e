package dev.espalier.library;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.DynamicTest.dynamicTest;

import dev.espalier.abnf.AbnfResult;
import dev.espalier.abnf.RuleSite;
import dev.espalier.grammar.Diagnostic;
import dev.espalier.grammar.Grammar;
import dk.brics.automaton.Automaton;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * The grammar library of {@code grammars/}: every grammar reads without error, follows the
 * library's conventions, and gives every sample the verdict its file name announces. The samples
 * taken from standards (RFC 8259, 3339, 3986, 4180, 5322, Semantic Versioning 2.0.0) are listed in
 * {@code grammars/README.md}.
 */
class GrammarLibraryTest {

    @TestFactory
    Stream<DynamicTest> everyGrammarReadsWithoutErrors() {
        return GrammarLibrary.names().stream().map(name -> dynamicTest(name, () -> {
            AbnfResult r = GrammarLibrary.load(name);
            List<Diagnostic> errors = r.diagnostics().stream().filter(Diagnostic::isError).toList();
            assertEquals(List.of(), errors, name + ".abnf");
            String first = r.grammar().rules().iterator().next().name();
            assertEquals(first, r.grammar().start(), "the first rule is the start rule");
            String text = Files.readString(GrammarLibrary.folder().resolve(name + ".abnf"));
            assertTrue(text.startsWith(";"), name + ".abnf starts with a comment naming its source");
        }));
    }

    @TestFactory
    Stream<DynamicTest> everyGrammarHasFiveAcceptAndFiveRejectSamples() {
        return GrammarLibrary.names().stream().map(name -> dynamicTest(name, () -> {
            List<GrammarLibrary.Sample> samples = GrammarLibrary.samples(name);
            long accept = samples.stream().filter(GrammarLibrary.Sample::accept).count();
            assertTrue(accept >= 5, name + ": " + accept + " accept samples");
            assertTrue(samples.size() - accept >= 5, name + ": " + (samples.size() - accept) + " reject samples");
        }));
    }

    @Test
    void everySampleFolderBelongsToAGrammar() throws IOException {
        try (Stream<Path> dirs = Files.list(GrammarLibrary.folder().resolve("samples"))) {
            for (Path d : dirs.toList()) {
                assertTrue(GrammarLibrary.names().contains(d.getFileName().toString()), d + " has no grammar");
            }
        }
    }

    @Test
    void theSampleConventionStripsOneFinalLineBreak() {
        // the convention of grammars/README.md, checked on its own
        assertEquals("a", new String(GrammarLibrary.text("a\n".getBytes(StandardCharsets.US_ASCII)), StandardCharsets.US_ASCII));
        assertEquals("a", new String(GrammarLibrary.text("a\r\n".getBytes(StandardCharsets.US_ASCII)), StandardCharsets.US_ASCII));
        assertEquals("a\n", new String(GrammarLibrary.text("a\n\n".getBytes(StandardCharsets.US_ASCII)), StandardCharsets.US_ASCII));
        assertEquals("a\r", new String(GrammarLibrary.text("a\r".getBytes(StandardCharsets.US_ASCII)), StandardCharsets.US_ASCII));
        assertEquals("", new String(GrammarLibrary.text(new byte[0]), StandardCharsets.US_ASCII));
    }

    /** The README's table gives each grammar's start rule and number of rules; both must be true. */
    @TestFactory
    Stream<DynamicTest> theReadmeTableMatchesTheFiles() throws IOException {
        String readme = Files.readString(GrammarLibrary.folder().resolve("README.md"));
        return GrammarLibrary.names().stream().map(name -> dynamicTest(name, () -> {
            Matcher m = Pattern.compile("(?m)^\\| \\[`" + Pattern.quote(name) + ".abnf`\\][^|]*\\|[^|]*\\| `([^`]+)` \\| (\\d+) \\|")
                    .matcher(readme);
            assertTrue(m.find(), "grammars/README.md has a row for " + name);
            Grammar g = GrammarLibrary.load(name).grammar();
            assertEquals(g.start(), m.group(1), "start rule of " + name);
            assertEquals(ownRules(name), Integer.parseInt(m.group(2)), "number of rules of " + name);
        }));
    }

    /** The number of rules defined in the grammar's own file (not in files it imports). */
    static int ownRules(String name) {
        String file = GrammarLibrary.folder().resolve(name + ".abnf").toAbsolutePath().normalize().toString();
        return (int) GrammarLibrary.load(name).sites().stream()
                .filter(s -> s.isDefinition() && s.source().equals(file))
                .map(RuleSite::key).distinct().count();
    }

    /**
     * The core rules of RFC 5234 Appendix B.1 are built in; a grammar that defines one changes it
     * for the whole grammar (rule names ignore case: a rule "sp" is SP). The library does so only
     * where its standard does, harmlessly: RFC 4180 section 2 defines CR, DQUOTE, LF and CRLF as the
     * core rules are; RFC 8259 section 7 names a string character "char" (its grammars use no core
     * CHAR); the <digit> of the Semantic Versioning BNF matches what DIGIT matches.
     */
    @TestFactory
    Stream<DynamicTest> noGrammarRedefinesACoreRuleByAccident() {
        Set<String> core = Set.of("alpha", "bit", "char", "cr", "crlf", "ctl", "digit", "dquote", "hexdig",
                "htab", "lf", "lwsp", "octet", "sp", "vchar", "wsp");
        Map<String, Set<String>> known = Map.of("csv", Set.of("cr", "crlf", "dquote", "lf"),
                "json", Set.of("char"), "inspection-report", Set.of("char"), "semver", Set.of("digit"));
        return GrammarLibrary.names().stream().map(name -> dynamicTest(name, () -> {
            String file = GrammarLibrary.folder().resolve(name + ".abnf").toAbsolutePath().normalize().toString();
            Set<String> redefined = new TreeSet<>();
            GrammarLibrary.load(name).sites().stream()
                    .filter(s -> s.isDefinition() && s.source().equals(file) && core.contains(s.key()))
                    .forEach(s -> redefined.add(s.key()));
            assertEquals(known.getOrDefault(name, Set.of()), redefined);
        }));
    }

    /** Every grammar gives every sample the verdict its file name announces. */
    @TestFactory
    Stream<DynamicTest> everyGrammarGivesEverySampleItsVerdict() {
        List<DynamicTest> tests = new ArrayList<>();
        for (String name : GrammarLibrary.names()) {
            Grammar g = GrammarLibrary.load(name).grammar();
            for (GrammarLibrary.Sample s : GrammarLibrary.samples(name)) {
                tests.add(dynamicTest(name + "/" + s.name(),
                        () -> assertEquals(s.accept(), LibraryHarness.accepts(g, s.text()), s.file().toString())));
            }
        }
        return tests.stream();
    }

    /**
     * The reference recognizer, which decides the recursive grammars for now, agrees with the
     * automata (dk.brics) on every sample of every regular grammar: its twin check.
     */
    @TestFactory
    Stream<DynamicTest> theReferenceRecognizerAgreesWithTheAutomataOnRegularGrammars() {
        List<DynamicTest> tests = new ArrayList<>();
        for (String name : GrammarLibrary.names()) {
            Grammar g = GrammarLibrary.load(name).grammar();
            Optional<Automaton> a = LibraryHarness.automaton(g);
            if (a.isEmpty()) {
                continue;
            }
            tests.add(dynamicTest(name, () -> {
                for (GrammarLibrary.Sample s : GrammarLibrary.samples(name)) {
                    String text = LibraryHarness.utf8(s.text());
                    if (text != null) {
                        assertEquals(a.get().run(text), ReferenceRecognizer.accepts(g, text), s.file().toString());
                    }
                }
            }));
        }
        return tests.stream();
    }

    /** The Earley recognizer agrees with the independent references on every sample of every grammar. */
    @TestFactory
    Stream<DynamicTest> theEarleyRecognizerAgreesWithTheReferencesOnEverySample() {
        List<DynamicTest> tests = new ArrayList<>();
        for (String name : GrammarLibrary.names()) {
            Grammar g = GrammarLibrary.load(name).grammar();
            tests.add(dynamicTest(name, () -> {
                for (GrammarLibrary.Sample s : GrammarLibrary.samples(name)) {
                    assertEquals(LibraryHarness.referenceAccepts(g, s.text()), LibraryHarness.accepts(g, s.text()),
                            s.file().toString());
                }
            }));
        }
        return tests.stream();
    }

    @Test
    void theRecursiveGrammarsAreExactlyTheOnesExpected() {
        // json, email (nested comments), arithmetic and tree-query (parentheses) are recursive; the
        // other grammars compile to automata
        List<String> recursive = GrammarLibrary.names().stream()
                .filter(n -> !LibraryHarness.isRegular(GrammarLibrary.load(n).grammar())).toList();
        assertEquals(List.of("arithmetic", "email", "json", "tree-query"), recursive);
        assertFalse(recursive.contains("uri-reference"));
    }
}
