package dev.espalier.earley;

import static dev.espalier.earley.EarleyGrammar.END;

import java.math.BigInteger;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * A shared packed parse forest of one input (after Scott 2008, "SPPF-style parsing from Earley
 * recognisers"): symbol nodes (nonterminal, start, end), intermediate nodes (a dotted production's
 * prefix over a span), terminal nodes (one input byte), and packed nodes that record each way a
 * node is derived. Built from a chart without Leo's optimisation by a work list from the root, so
 * neither building nor counting recurses.
 *
 * <p>Derivations are counted in terms of the grammar's rules: the helper nonterminals of the
 * lowering ({@link EarleyGrammar}) are unambiguous, so they do not multiply counts. A repetition
 * whose body matches the empty string, or a rule that derives itself ({@code A = A / "a"}), gives
 * infinitely many derivations: {@link #hasInfinitelyManyParses()} says so.
 *
 * <p>Building a forest costs time and memory above the recognizer's (a hash entry per item); it is
 * meant for diagnostics, the {@code parse} command and tests, not for the decoding hot path.
 */
public final class ParseForest {

    private static final int SYM = 0;
    private static final int ITEM = 1;
    private static final int TERM = 2;

    /** A forest node; packed entries are {left, right} pairs, either possibly null (empty). */
    private static final class Node {
        final int kind;
        final int a;
        final int i;
        final int j;
        final List<Node[]> packed = new ArrayList<>(1);
        int state;
        int cursor;
        BigInteger count;
        int choice = -1;

        Node(int kind, int a, int i, int j) {
            this.kind = kind;
            this.a = a;
            this.i = i;
            this.j = j;
        }
    }

    private record Key(int kind, int a, int i, int j) {
    }

    private final EarleyGrammar g;
    private final byte[] input;
    private final Node root;
    private final boolean infinite;
    private final BigInteger count;
    private final int nodeCount;

    private ParseForest(EarleyGrammar g, byte[] input, Node root, boolean infinite, BigInteger count, int nodeCount) {
        this.g = g;
        this.input = input;
        this.root = root;
        this.infinite = infinite;
        this.count = count;
        this.nodeCount = nodeCount;
    }

    static ParseForest build(EarleyGrammar g, byte[] input, long maxItems) {
        EarleyChart c = g.newChart(maxItems, false);
        for (byte b : input) {
            if (!c.feed(b & 0xFF)) {
                throw new IllegalStateException("input rejected while rebuilding the chart");
            }
        }
        int n = input.length;
        List<Set<Long>> itemSets = new ArrayList<>(n + 1);
        List<Map<Integer, List<Integer>>> completed = new ArrayList<>(n + 1);
        for (int s = 0; s <= n; s++) {
            Set<Long> set = new HashSet<>();
            Map<Integer, List<Integer>> comp = new HashMap<>();
            for (int it = c.setStart(s), e = c.setEnd(s); it < e; it++) {
                int pos = c.pos(it);
                int o = c.origin(it);
                set.add(((long) pos << 32) | o);
                if (g.rhs[pos] == END) {
                    comp.computeIfAbsent(g.prodLhs[g.posProd[pos]], k -> new ArrayList<>()).add(o);
                }
            }
            itemSets.add(set);
            completed.add(comp);
        }
        Map<Key, Node> nodes = new HashMap<>();
        Deque<Node> work = new ArrayDeque<>();
        Node root = node(nodes, work, SYM, g.startNt, 0, n);
        while (!work.isEmpty()) {
            Node x = work.pop();
            if (x.kind == SYM) {
                for (int p = g.ntProdStart[x.a]; p < g.ntProdStart[x.a + 1]; p++) {
                    int endPos = g.prodFirstPos[p] + g.prodLength[p];
                    if (!itemSets.get(x.j).contains(((long) endPos << 32) | x.i)) {
                        continue;
                    }
                    Node right = g.prodLength[p] == 0 ? null : node(nodes, work, ITEM, endPos, x.i, x.j);
                    x.packed.add(new Node[] {null, right});
                }
            } else if (x.kind == ITEM) {
                int pos = x.a;
                int sym = g.rhs[pos - 1];
                boolean first = pos - 1 == g.prodFirstPos[g.posProd[pos]];
                if (sym < 0) {
                    int k = x.j - 1;
                    if (k >= x.i && g.hasByte(-sym - 1, input[k] & 0xFF)
                            && itemSets.get(k).contains(((long) (pos - 1) << 32) | x.i)) {
                        Node left = first ? null : node(nodes, work, ITEM, pos - 1, x.i, k);
                        x.packed.add(new Node[] {left, node(nodes, work, TERM, -1, k, k + 1)});
                    }
                } else {
                    List<Integer> origins = completed.get(x.j).getOrDefault(sym, List.of());
                    Set<Integer> seen = new HashSet<>();
                    for (int k : origins) {
                        if (k < x.i || !seen.add(k)) {
                            continue;
                        }
                        if (itemSets.get(k).contains(((long) (pos - 1) << 32) | x.i)) {
                            Node left = first ? null : node(nodes, work, ITEM, pos - 1, x.i, k);
                            x.packed.add(new Node[] {left, node(nodes, work, SYM, sym, k, x.j)});
                        }
                    }
                }
            }
        }
        // count derivations; a cycle reachable from the root means infinitely many
        boolean cyclic = false;
        List<Node> post = new ArrayList<>(nodes.size());
        Deque<Node> stack = new ArrayDeque<>();
        root.state = 1;
        stack.push(root);
        while (!stack.isEmpty()) {
            Node x = stack.peek();
            if (x.cursor < 2 * x.packed.size()) {
                Node ch = x.packed.get(x.cursor / 2)[x.cursor % 2];
                x.cursor++;
                if (ch == null) {
                    continue;
                }
                if (ch.state == 0) {
                    ch.state = 1;
                    stack.push(ch);
                } else if (ch.state == 1) {
                    cyclic = true;
                }
                continue;
            }
            stack.pop();
            x.state = 2;
            post.add(x);
            if (x.kind == TERM) {
                x.count = BigInteger.ONE;
            } else {
                BigInteger sum = BigInteger.ZERO;
                for (Node[] pk : x.packed) {
                    sum = sum.add(countOf(pk[0]).multiply(countOf(pk[1])));
                }
                x.count = sum;
            }
        }
        // ground every node: choose a packed entry whose children were grounded before it
        boolean changed = true;
        while (changed) {
            changed = false;
            for (Node x : post) {
                if (x.choice >= 0 || x.kind == TERM) {
                    continue;
                }
                for (int e = 0; e < x.packed.size(); e++) {
                    Node[] pk = x.packed.get(e);
                    if (grounded(pk[0]) && grounded(pk[1])) {
                        x.choice = e;
                        changed = true;
                        break;
                    }
                }
            }
        }
        return new ParseForest(g, input, root, cyclic, cyclic ? null : root.count, nodes.size());
    }

    private static BigInteger countOf(Node n) {
        return n == null || n.count == null ? BigInteger.ONE : n.count;
    }

    private static boolean grounded(Node n) {
        return n == null || n.kind == TERM || n.choice >= 0;
    }

    private static Node node(Map<Key, Node> nodes, Deque<Node> work, int kind, int a, int i, int j) {
        Key k = new Key(kind, a, i, j);
        Node n = nodes.get(k);
        if (n == null) {
            n = new Node(kind, a, i, j);
            nodes.put(k, n);
            if (kind != TERM) {
                work.push(n);
            }
        }
        return n;
    }

    /** The input this forest derives. */
    public byte[] input() {
        return input.clone();
    }

    /** Number of symbol, intermediate and terminal nodes. */
    public int nodeCount() {
        return nodeCount;
    }

    /** Whether the input has infinitely many derivations (a rule derives itself over some span). */
    public boolean hasInfinitelyManyParses() {
        return infinite;
    }

    /**
     * Number of distinct derivations of the start rule over the input.
     *
     * @throws IllegalStateException when there are infinitely many ({@link #hasInfinitelyManyParses()})
     */
    public BigInteger parseCount() {
        if (infinite) {
            throw new IllegalStateException("the input has infinitely many derivations");
        }
        return count;
    }

    /** Whether the input has more than one derivation. */
    public boolean isAmbiguous() {
        return infinite || count.compareTo(BigInteger.ONE) > 0;
    }

    /** One derivation as a tree of the grammar's named rules (cycle-free: the smallest found first). */
    public ParseTree tree() {
        return buildTree(null, -1);
    }

    /**
     * Searches for a shortest ambiguous string: iterative deepening over byte strings that keep the
     * chart viable, trying one byte per byte class of the grammar (bytes in one class are
     * interchangeable), checking each accepted string's forest.
     *
     * @param g         the grammar
     * @param maxLength longest string tried, in bytes
     * @param budget    time after which the search gives up
     * @return a shortest ambiguous string with two of its derivations, or empty when none was found
     *         within the bounds
     */
    public static Optional<Ambiguity> findAmbiguity(EarleyGrammar g, int maxLength, Duration budget) {
        Objects.requireNonNull(budget);
        long deadline = System.nanoTime() + budget.toNanos();
        int[] reps = g.classRepresentative;
        EarleyChart c = g.newChart();
        for (int target = 0; target <= maxLength; target++) {
            int[] next = new int[target + 1];
            int depth = 0;
            while (true) {
                if (System.nanoTime() > deadline) {
                    return Optional.empty();
                }
                if (depth == target) {
                    if (c.accepts()) {
                        try {
                            ParseForest f = c.forest();
                            if (f.isAmbiguous()) {
                                return Optional.of(f.ambiguity());
                            }
                        } catch (EarleyLimitException e) {
                            // too large to decide here; keep looking
                        }
                    }
                    if (depth == 0) {
                        break;
                    }
                    c.undo(1);
                    depth--;
                    continue;
                }
                boolean advanced = false;
                while (next[depth] < reps.length) {
                    int b = reps[next[depth]++];
                    boolean ok;
                    try {
                        ok = c.feed(b);
                    } catch (EarleyLimitException e) {
                        ok = false;
                    }
                    if (ok) {
                        depth++;
                        next[depth] = 0;
                        advanced = true;
                        break;
                    }
                }
                if (!advanced) {
                    if (depth == 0) {
                        break;
                    }
                    c.undo(1);
                    depth--;
                }
            }
        }
        return Optional.empty();
    }

    private Ambiguity ambiguity() {
        // walk the default derivation to its first node with two ways
        Node found = null;
        Deque<Node> stack = new ArrayDeque<>();
        Set<Node> visited = new HashSet<>();
        stack.push(root);
        while (!stack.isEmpty() && found == null) {
            Node x = stack.pop();
            if (x.kind == TERM || !visited.add(x)) {
                continue;
            }
            if (x.packed.size() > 1) {
                found = x;
                break;
            }
            Node[] pk = x.packed.get(x.choice);
            if (pk[1] != null) {
                stack.push(pk[1]);
            }
            if (pk[0] != null) {
                stack.push(pk[0]);
            }
        }
        ParseTree first = tree();
        ParseTree second = first;
        if (found != null) {
            for (int e = 0; e < found.packed.size(); e++) {
                Node[] pk = found.packed.get(e);
                if (e != found.choice && grounded(pk[0]) && grounded(pk[1])) {
                    second = buildTree(found, e);
                    break;
                }
            }
        }
        return new Ambiguity(ParseTree.decode(input, 0, input.length), first, second);
    }

    /** Builds the tree of the default choices, taking {@code overrideChoice} at the first visit of {@code override}. */
    private ParseTree buildTree(Node override, int overrideChoice) {
        ParseTree.Node top = new ParseTree.Node(null, 0, input.length);
        Deque<Object[]> stack = new ArrayDeque<>();
        stack.push(new Object[] {root, top});
        boolean overridden = false;
        List<ParseTree.Node> all = new ArrayList<>();
        while (!stack.isEmpty()) {
            Object[] fr = stack.pop();
            Node x = (Node) fr[0];
            ParseTree.Node parent = (ParseTree.Node) fr[1];
            if (x.kind == TERM) {
                parent.addByte(x.i, all);
                continue;
            }
            ParseTree.Node into = parent;
            if (x.kind == SYM && g.ntName[x.a] != null) {
                into = new ParseTree.Node(g.ntName[x.a], x.i, x.j);
                parent.children.add(into);
                all.add(into);
            }
            int ch = x.choice;
            if (x == override && !overridden) {
                ch = overrideChoice;
                overridden = true;
            }
            Node[] pk = x.packed.get(ch);
            if (pk[1] != null) {
                stack.push(new Object[] {pk[1], into});
            }
            if (pk[0] != null) {
                stack.push(new Object[] {pk[0], into});
            }
        }
        for (ParseTree.Node n : all) {
            n.finish(input);
        }
        ParseTree.Node r = top.children.size() == 1 ? top.children.get(0) : top;
        return new ParseTree(r);
    }
}
