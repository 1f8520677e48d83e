package dev.espalier.grammar;

import java.util.ArrayList;
import java.util.Arrays;
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
    @SuppressWarnings("unchecked")
    public final V run(Expr root, IdentityHashMap<Expr, V> record) {
        // the path from the root (with the next child to visit of each) and the values of finished
        // children waiting for their parent, as arrays: this runs over every node of large grammars
        Expr[] nodes = new Expr[16];
        int[] next = new int[16];
        Object[] values = new Object[16];
        int depth = 0;
        int valueCount = 0;
        nodes[0] = root;
        while (true) {
            Expr e = nodes[depth];
            List<Expr> kids = children(e);
            int i = next[depth];
            if (i < kids.size()) {
                next[depth] = i + 1;
                if (++depth == nodes.length) {
                    nodes = Arrays.copyOf(nodes, depth * 2);
                    next = Arrays.copyOf(next, depth * 2);
                }
                nodes[depth] = kids.get(i);
                next[depth] = 0;
                continue;
            }
            V v;
            if (kids.isEmpty() && !(e instanceof Expr.Seq) && !(e instanceof Expr.Choice)) {
                v = leaf(e);
            } else {
                int from = valueCount - kids.size();
                List<V> args = (List<V>) Arrays.asList(Arrays.copyOfRange(values, from, valueCount));
                Arrays.fill(values, from, valueCount, null);
                valueCount = from;
                if (e instanceof Expr.Seq s) {
                    v = seq(s, args);
                } else if (e instanceof Expr.Choice c) {
                    v = choice(c, args);
                } else {
                    v = repeat((Expr.Repeat) e, args.get(0));
                }
            }
            if (record != null) {
                record.put(e, v);
            }
            nodes[depth] = null;
            if (depth-- == 0) {
                return v;
            }
            if (valueCount == values.length) {
                values = Arrays.copyOf(values, valueCount * 2);
            }
            values[valueCount++] = v;
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
