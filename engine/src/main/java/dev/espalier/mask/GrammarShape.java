package dev.espalier.mask;

import dev.espalier.grammar.Expr;
import dev.espalier.grammar.ExprFold;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** Structural questions about a grammar that choose how it is compiled. */
final class GrammarShape {

    private GrammarShape() {
    }

    /** Whether some rule reachable from the start rule refers to itself, directly or not. */
    static boolean reachesRecursion(Grammar g) {
        Map<String, List<String>> refs = new HashMap<>();
        for (Rule r : g.rules()) {
            refs.put(r.key(), references(r.body()));
        }
        // iterative depth-first search with colours: 1 = on the path, 2 = done
        Map<String, Integer> colour = new HashMap<>();
        Deque<String[]> stack = new ArrayDeque<>();
        Deque<Integer> next = new ArrayDeque<>();
        String start = Grammar.key(g.start());
        stack.push(new String[] {start});
        next.push(0);
        colour.put(start, 1);
        while (!stack.isEmpty()) {
            String node = stack.peek()[0];
            List<String> out = refs.getOrDefault(node, List.of());
            int i = next.pop();
            if (i < out.size()) {
                next.push(i + 1);
                String child = out.get(i);
                Integer c = colour.get(child);
                if (c == null) {
                    colour.put(child, 1);
                    stack.push(new String[] {child});
                    next.push(0);
                } else if (c == 1) {
                    return true;
                }
            } else {
                colour.put(node, 2);
                stack.pop();
            }
        }
        return false;
    }

    private static List<String> references(Expr body) {
        List<String> out = new ArrayList<>();
        Deque<Expr> work = new ArrayDeque<>();
        work.push(body);
        while (!work.isEmpty()) {
            Expr e = work.pop();
            ExprFold.children(e).forEach(work::push);
            if (e instanceof Expr.Ref r) {
                out.add(Grammar.key(r.name()));
            }
        }
        return out;
    }
}
