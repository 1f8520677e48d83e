package dev.espalier.mask;

import dev.espalier.abnf.Abnf;
import dev.espalier.abnf.AbnfResult;
import dev.espalier.automaton.ByteDfa;
import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import dev.espalier.schema.JsonSchemas;
import dev.espalier.schema.SchemaOptions;
import dev.espalier.vocab.Vocabulary;
import dev.espalier.vocab.VocabularyTrie;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;

/**
 * The context-free test grammars of {@code src/test/resources/cfmask/}, read with the ABNF front end;
 * the corpus schemas' grammars and automata; a count of the nodes a trie walk steps to.
 */
final class TestGrammars {

    /** Every test grammar by file name (without {@code .abnf}). */
    static final List<String> ALL = List.of("json", "arithmetic", "csv", "orchard-query", "ambiguous", "nullable",
            "high-values", "orchard-record");

    private TestGrammars() {
    }

    /** The grammar of {@code cfmask/<name>.abnf}; fails the test when the file has errors. */
    static Grammar load(String name) {
        String file = "/cfmask/" + name + ".abnf";
        try (InputStream in = TestGrammars.class.getResourceAsStream(file)) {
            assertNotNull(in, file);
            AbnfResult r = Abnf.parse(new String(in.readAllBytes(), StandardCharsets.UTF_8), name + ".abnf");
            assertFalse(r.hasErrors(), () -> file + ": " + r.diagnostics());
            return r.grammar();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The grammar of the corpus schema {@code grammars/schemas/<name>.schema.json}, default options. */
    static Grammar schema(String name) {
        try {
            return JsonSchemas.compile(Files.readString(Path.of("..", "grammars", "schemas", name + ".schema.json"),
                    StandardCharsets.UTF_8), SchemaOptions.defaults()).grammar();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The byte automaton of a grammar without recursion. */
    static ByteDfa automaton(Grammar g) {
        return ByteDfa.fromExpr(Expr.ref(g.start()), n -> g.rule(n).map(Rule::body).orElse(null), 10_000);
    }

    /** The nodes a walk of {@code v}'s trie from {@code state} steps to with {@code coverage}. */
    static long stepped(Vocabulary v, ByteDfa dfa, VocabularyTrie.Coverage coverage, int state) {
        long[] count = new long[1];
        v.trie().collect(dfa::step, coverage, state, new long[v.maskWords()], v.trie().maxDepth(), (node, at) -> count[0]++);
        return count[0];
    }

    /**
     * The same language, but with a recursive rule reachable from the start, so that
     * {@link Constraint#grammar} cannot take the byte-automaton route and masks come from the parser.
     * The added alternative derives no string at all ({@code dead = %x01 dead}).
     */
    static Grammar throughParser(Grammar g) {
        List<Rule> rules = new ArrayList<>(g.rules());
        String start = "via-parser";
        String dead = "never-ends";
        rules.add(0, Rule.of(start, Expr.choice(Expr.ref(g.start()), Expr.ref(dead))));
        rules.add(Rule.of(dead, Expr.seq(Expr.chars(CodePointSet.of(1)), Expr.ref(dead))));
        return Grammar.of(rules, start);
    }
}
