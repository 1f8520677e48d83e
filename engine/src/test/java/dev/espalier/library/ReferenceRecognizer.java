package dev.espalier.library;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.util.BitSet;
import java.util.HashMap;
import java.util.HashSet;
import java.util.Map;
import java.util.Set;

/**
 * A slow, obviously correct recognizer for grammars that are recursive but not left-recursive:
 * the test twin that decides the library's recursive grammars until the Earley parser is used.
 *
 * <p>It computes, for an expression and a start position, the set of positions where a match can
 * end (memoised per rule and position), directly from the meaning of each IR node: a sequence
 * chains end sets, a choice unites them, a repetition iterates them, a reference looks the rule up.
 * A rule met again at the same position before its first visit there returns is left recursion,
 * which this recognizer does not support (it fails loudly instead of answering). Recursion depth
 * follows the nesting of the input; inputs nesting deeper than a limit raise {@link TooDeep}.
 */
final class ReferenceRecognizer {

    /** The input nests deeper than the recognizer's limit; the question stays open. */
    static final class TooDeep extends RuntimeException {
        TooDeep() {
            super("input nests too deeply for the reference recognizer", null, false, false);
        }
    }

    /** Rule references followed at once, at most (well within an 8 MB test stack). */
    static final int MAX_DEPTH = 4_000;

    private final Grammar grammar;
    private final int[] input;
    private final Map<String, Integer> ruleIds = new HashMap<>();
    private final Map<Long, BitSet> memo = new HashMap<>();
    private final Set<Long> active = new HashSet<>();
    private int depth;

    private ReferenceRecognizer(Grammar grammar, int[] input) {
        this.grammar = grammar;
        this.input = input;
    }

    /**
     * Whether the text is a sentence of the grammar's start rule.
     *
     * @throws TooDeep               if the input nests deeper than {@link #MAX_DEPTH} references
     * @throws IllegalStateException if the grammar is left-recursive or a rule is undefined
     */
    static boolean accepts(Grammar g, String text) {
        int[] cps = text.codePoints().toArray();
        ReferenceRecognizer r = new ReferenceRecognizer(g, cps);
        return r.rule(g.start(), 0).get(cps.length);
    }

    private BitSet ends(Expr e, int i) {
        if (e instanceof Expr.Ref r) {
            return rule(r.name(), i);
        } else if (e instanceof Expr.Chars c) {
            BitSet out = new BitSet();
            if (i < input.length && c.set().contains(input[i])) {
                out.set(i + 1);
            }
            return out;
        } else if (e instanceof Expr.Text t) {
            return text(t, i);
        } else if (e instanceof Expr.Seq s) {
            BitSet cur = single(i);
            for (Expr item : s.items()) {
                cur = step(item, cur);
                if (cur.isEmpty()) {
                    break;
                }
            }
            return cur;
        } else if (e instanceof Expr.Choice c) {
            BitSet out = new BitSet();
            for (Expr option : c.options()) {
                out.or(ends(option, i));
            }
            return out;
        } else if (e instanceof Expr.Repeat r) {
            return repeat(r, i);
        }
        throw new IllegalStateException("unknown expression " + e);
    }

    /** The end positions of {@code e} started at any position of {@code from}. */
    private BitSet step(Expr e, BitSet from) {
        BitSet out = new BitSet();
        for (int p = from.nextSetBit(0); p >= 0; p = from.nextSetBit(p + 1)) {
            out.or(ends(e, p));
        }
        return out;
    }

    private BitSet repeat(Expr.Repeat r, int i) {
        BitSet cur = single(i);
        for (int k = 0; k < r.min() && !cur.isEmpty(); k++) {
            cur = step(r.body(), cur);
        }
        BitSet all = (BitSet) cur.clone();
        BitSet frontier = cur;
        // further repetitions only add positions; stop at a fixpoint or at the upper bound
        for (int k = r.min(); (r.unbounded() || k < r.max()) && !frontier.isEmpty(); k++) {
            BitSet next = step(r.body(), frontier);
            if (r.unbounded()) {
                next.andNot(all); // positions already reached have been expanded
            }
            if (!r.unbounded() && next.equals(frontier)) {
                break;
            }
            all.or(next);
            frontier = next;
        }
        return all;
    }

    private BitSet text(Expr.Text t, int i) {
        int[] want = t.text().codePoints().toArray();
        if (i + want.length > input.length) {
            return new BitSet();
        }
        for (int k = 0; k < want.length; k++) {
            int a = input[i + k];
            int b = want[k];
            // RFC 5234 section 2.3: quoted strings are case-insensitive for the US-ASCII letters
            if (a != b && !(t.ignoreCase() && a < 128 && b < 128 && Character.isLetter(a)
                    && Character.toLowerCase(a) == Character.toLowerCase(b))) {
                return new BitSet();
            }
        }
        return single(i + want.length);
    }

    private BitSet rule(String name, int i) {
        String key = Grammar.key(name);
        Rule rule = grammar.rule(name).orElseThrow(() -> new IllegalStateException("undefined rule " + name));
        int id = ruleIds.computeIfAbsent(key, k -> ruleIds.size());
        long slot = (long) id * (input.length + 1L) + i;
        BitSet known = memo.get(slot);
        if (known != null) {
            return known;
        }
        if (!active.add(slot)) {
            throw new IllegalStateException("rule " + name + " is left-recursive");
        }
        if (++depth > MAX_DEPTH) {
            throw new TooDeep();
        }
        try {
            BitSet out = ends(rule.body(), i);
            memo.put(slot, out);
            return out;
        } finally {
            depth--;
            active.remove(slot);
        }
    }

    private static BitSet single(int i) {
        BitSet b = new BitSet();
        b.set(i);
        return b;
    }
}
