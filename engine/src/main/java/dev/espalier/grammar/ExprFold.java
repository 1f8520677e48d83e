package dev.espalier.grammar;

import java.util.ArrayList;
import java.util.IdentityHashMap;
import java.util.List;

/**
 * A bottom-up evaluation of an expression tree with an explicit stack (expressions may nest far
 * deeper than a thread's stack allows for recursion). The analysis's workhorse, also used by the Earley lowering.
 *
 * @param <V> the value computed for each node
 */
public abstract class ExprFold<V> {

    /** The value of a {@link Expr.Chars}, {@link Expr.Text} or {@link Expr.Ref}. */
    protected abstract V leaf(Expr e);

    /** The value of a concatenation from its items' values. */
    protected abstract V seq(Expr.Seq s, List<V> items);

    /** The value of an alternation from its options' values. */
    protected abstract V choice(Expr.Choice c, List<V> options);

    /** The value of a repetition from its body's value. */
    protected abstract V repeat(Expr.Repeat r, V body);

    /** The children of a node, in order. */
    public static List<Expr> children(Expr e) {
        if (e instanceof Expr.Seq s) {
            return s.items();
        } else if (e instanceof Expr.Choice c) {
            return c.options();
        } else if (e instanceof Expr.Repeat r) {
            return List.of(r.body());
        }
        return List.of();
    }

    /**
     * Evaluates {@code root}.
     *
     * @param record when not null, receives every node's value (keyed by identity)
     */
    public final V run(Expr root, IdentityHashMap<Expr, V> record) {
        List<Expr> nodes = new ArrayList<>();
        List<Integer> next = new ArrayList<>();
        List<V> values = new ArrayList<>();
        nodes.add(root);
        next.add(0);
        while (true) {
            int top = nodes.size() - 1;
            Expr e = nodes.get(top);
            List<Expr> kids = children(e);
            int i = next.get(top);
            if (i < kids.size()) {
                next.set(top, i + 1);
                nodes.add(kids.get(i));
                next.add(0);
                continue;
            }
            V v;
            if (kids.isEmpty() && !(e instanceof Expr.Seq) && !(e instanceof Expr.Choice)) {
                v = leaf(e);
            } else {
                List<V> args = values.subList(values.size() - kids.size(), values.size());
                List<V> copy = new ArrayList<>(args);
                args.clear();
                if (e instanceof Expr.Seq s) {
                    v = seq(s, copy);
                } else if (e instanceof Expr.Choice c) {
                    v = choice(c, copy);
                } else {
                    v = repeat((Expr.Repeat) e, copy.get(0));
                }
            }
            if (record != null) {
                record.put(e, v);
            }
            nodes.remove(top);
            next.remove(top);
            if (nodes.isEmpty()) {
                return v;
            }
            values.add(v);
        }
    }

    /** Every node of {@code root} in pre-order, without recursion. */
    static List<Expr> nodes(Expr root) {
        List<Expr> out = new ArrayList<>();
        List<Expr> stack = new ArrayList<>();
        stack.add(root);
        while (!stack.isEmpty()) {
            Expr e = stack.remove(stack.size() - 1);
            out.add(e);
            List<Expr> kids = children(e);
            for (int i = kids.size() - 1; i >= 0; i--) {
                stack.add(kids.get(i));
            }
        }
        return out;
    }
}
