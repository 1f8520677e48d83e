package dev.espalier.automaton;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * Builds a byte NFA straight from a grammar expression, one piece at a time: each task wires an
 * expression between two given nodes (Thompson's construction over UTF-8 bytes, with epsilon
 * moves). A referenced rule is wired once per continuation node and shared by every reference with
 * that continuation, so a right-linear system of rules (an automaton written as rules, as the schema
 * compiler writes large string languages) becomes an NFA of one node per rule instead of a copy per
 * path. Iterative: no Java recursion however deep the rules chain.
 */
final class ExprNfa {

    private final ByteDfa.ByteNfa nfa = new ByteDfa.ByteNfa();
    private final Function<String, Expr> rules;
    /** Per rule key, a number; the same by name as written (folded only when new); bodies by number. */
    private final Map<String, Integer> ruleNumbers = new HashMap<>();
    private final Map<String, Integer> numberByName = new HashMap<>();
    private final List<Expr> bodies = new ArrayList<>();
    /** Per (rule number, continuation node), the rule's entry node. */
    private final LongIntTable ruleEntries = new LongIntTable();
    private final Deque<Task> work = new ArrayDeque<>();

    /** Wire {@code expr} from node {@code from} to node {@code to}. */
    private record Task(Expr expr, int from, int to) {
    }

    private ExprNfa(Function<String, Expr> rules, int nodeLimit, int stateLimit) {
        this.rules = rules;
        nfa.limit(nodeLimit, stateLimit);
    }

    /**
     * The NFA of {@code root}: start node, one accepting node.
     *
     * @param rules     rule bodies by name (null for an undefined rule); may be null when the
     *                  expression refers to no rule
     * @param nodeLimit the most nodes the NFA may have
     * @param stateLimit the state limit reported when the node limit is crossed
     * @throws IllegalArgumentException for a reference to an undefined rule
     * @throws AutomatonTooLargeException when the NFA would cross {@code nodeLimit}
     */
    static ByteDfa.ByteNfa of(Expr root, Function<String, Expr> rules, int nodeLimit, int stateLimit) {
        ExprNfa b = new ExprNfa(rules, nodeLimit, stateLimit);
        int start = b.nfa.newNode();
        int end = b.nfa.newNode();
        b.nfa.start = start;
        b.nfa.accept[end] = true;
        b.work.push(new Task(root, start, end));
        while (!b.work.isEmpty()) {
            b.wire(b.work.pop());
        }
        return b.nfa;
    }

    private void wire(Task t) {
        Expr e = t.expr();
        int from = t.from();
        int to = t.to();
        if (e instanceof Expr.Chars c) {
            CodePointSet set = c.set();
            for (int i = 0; i < set.rangeCount(); i++) {
                nfa.addCodePoints(from, set.lo(i), set.hi(i), to);
            }
        } else if (e instanceof Expr.Text x) {
            text(x.text(), x.ignoreCase(), from, to);
        } else if (e instanceof Expr.Seq s) {
            List<Expr> items = s.items();
            int last = items.size() - 1;
            // a sequence that ends in a rule (a right-linear rule's step) leads straight into the
            // rule's entry for this continuation: no node and epsilon move in between
            int end = to;
            if (last > 0 && items.get(last) instanceof Expr.Ref r) {
                end = ruleEntry(r, to);
                last--;
            }
            int cur = from;
            for (int i = 0; i <= last; i++) {
                int next = i == last ? end : nfa.newNode();
                work.push(new Task(items.get(i), cur, next));
                cur = next;
            }
            if (items.isEmpty()) {
                nfa.addEpsilon(from, to);
            }
        } else if (e instanceof Expr.Choice c) {
            for (Expr o : c.options()) {
                work.push(new Task(o, from, to));
            }
        } else if (e instanceof Expr.Repeat r) {
            int cur = from;
            for (int i = 0; i < r.min(); i++) {
                int next = nfa.newNode();
                work.push(new Task(r.body(), cur, next));
                cur = next;
            }
            if (r.unbounded()) {
                int loop = nfa.newNode();
                nfa.addEpsilon(cur, loop);
                work.push(new Task(r.body(), loop, loop));
                nfa.addEpsilon(loop, to);
            } else {
                for (int i = r.min(); i < r.max(); i++) {
                    nfa.addEpsilon(cur, to);
                    int next = nfa.newNode();
                    work.push(new Task(r.body(), cur, next));
                    cur = next;
                }
                nfa.addEpsilon(cur, to);
            }
        } else if (e instanceof Expr.Ref r) {
            nfa.addEpsilon(from, ruleEntry(r, to));
        } else {
            throw new IllegalStateException("unknown expression " + e);
        }
    }

    /** The entry node of rule {@code r} wired to continue at {@code to}, made (and its body wired) on first use. */
    private int ruleEntry(Expr.Ref r, int to) {
        int number = ruleNumber(r.name());
        long key = (long) number << 32 | to;
        int entry = ruleEntries.get(key);
        if (entry == LongIntTable.MISSING) {
            Expr body = bodies.get(number);
            if (body == null) {
                throw new IllegalArgumentException("undefined rule " + r.name());
            }
            entry = nfa.newNode();
            ruleEntries.put(key, entry);
            work.push(new Task(body, entry, to));
        }
        return entry;
    }

    /** The number of the rule named {@code name}; rule names are looked up as written first, folded only when new. */
    private int ruleNumber(String name) {
        Integer number = numberByName.get(name);
        if (number == null) {
            String key = Grammar.key(name);
            number = ruleNumbers.get(key);
            if (number == null) {
                number = ruleNumbers.size();
                ruleNumbers.put(key, number);
                bodies.add(rules == null ? null : rules.apply(name));
            }
            numberByName.put(name, number);
        }
        return number;
    }

    /**
     * A literal: its code points in order; with {@code ignoreCase}, ASCII letters in either case
     * (RFC 5234 quoted strings). A lone surrogate matches nothing.
     */
    private void text(String s, boolean ignoreCase, int from, int to) {
        int n = s.codePointCount(0, s.length());
        if (n == 0) {
            nfa.addEpsilon(from, to);
            return;
        }
        int cur = from;
        int k = 0;
        for (int i = 0; i < s.length(); k++) {
            int cp = s.codePointAt(i);
            i += Character.charCount(cp);
            if (cp >= Character.MIN_SURROGATE && cp <= Character.MAX_SURROGATE) {
                return; // no edge: the empty language
            }
            int next = k == n - 1 ? to : nfa.newNode();
            if (ignoreCase && cp < 128 && Character.isLetter(cp)) {
                int lower = Character.toLowerCase(cp);
                int upper = Character.toUpperCase(cp);
                nfa.addEdge(cur, lower, lower, next);
                nfa.addEdge(cur, upper, upper, next);
            } else {
                nfa.addCodePoints(cur, cp, cp, next);
            }
            cur = next;
        }
    }
}
