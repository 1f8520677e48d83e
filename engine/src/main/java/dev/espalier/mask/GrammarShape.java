package dev.espalier.mask;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;

/** Structural questions about a grammar that choose how it is compiled. */
final class GrammarShape {

    private GrammarShape() {
    }

    /** Whether some rule reachable from the start rule refers to itself, directly or not. */
    static boolean reachesRecursion(Grammar g) {
        // iterative depth-first search over rules with colours (on the path, done), each rule's
        // references listed when it is entered: only the reachable rules are read
        int rules = g.rules().size();
        Map<Rule, Boolean> onPath = new IdentityHashMap<>(rules);
        List<Expr> work = new ArrayList<>();
        Rule start = g.rule(g.start()).orElse(null);
        if (start == null) {
            return false;
        }
        // per depth of the path: its rule, the rule's references, and the next one to visit
        Rule[] path = new Rule[16];
        Rule[][] refs = new Rule[16][];
        int[] next = new int[16];
        Map<String, Rule> byName = new HashMap<>(2 * rules);
        path[0] = start;
        refs[0] = references(g, start.body(), work, byName);
        onPath.put(start, true);
        int depth = 0;
        while (depth >= 0) {
            if (next[depth] < refs[depth].length) {
                Rule child = refs[depth][next[depth]++];
                Boolean c = onPath.get(child);
                if (c == null) {
                    onPath.put(child, true);
                    if (++depth == path.length) {
                        path = Arrays.copyOf(path, 2 * depth);
                        refs = Arrays.copyOf(refs, 2 * depth);
                        next = Arrays.copyOf(next, 2 * depth);
                    }
                    path[depth] = child;
                    refs[depth] = references(g, child.body(), work, byName);
                    next[depth] = 0;
                } else if (c) {
                    return true;
                }
            } else {
                onPath.put(path[depth--], false);
            }
        }
        return false;
    }

    /**
     * The defined rules {@code body} refers to (undefined ones cannot recur); {@code byName} keeps
     * the rules met so far by name as written, so a name is case-folded once.
     */
    private static Rule[] references(Grammar g, Expr body, List<Expr> work, Map<String, Rule> byName) {
        List<Rule> out = new ArrayList<>();
        work.clear();
        work.add(body);
        while (!work.isEmpty()) {
            Expr e = work.remove(work.size() - 1);
            if (e instanceof Expr.Ref r) {
                Rule rule = byName.get(r.name());
                if (rule == null) {
                    rule = g.rule(r.name()).orElse(null);
                    if (rule == null) {
                        continue;
                    }
                    byName.put(r.name(), rule);
                }
                out.add(rule);
            } else if (e instanceof Expr.Seq q) {
                // one by one: addAll would copy each list to an array first
                for (Expr x : q.items()) {
                    work.add(x);
                }
            } else if (e instanceof Expr.Choice c) {
                for (Expr x : c.options()) {
                    work.add(x);
                }
            } else if (e instanceof Expr.Repeat r) {
                work.add(r.body());
            }
        }
        return out.toArray(new Rule[0]);
    }
}
