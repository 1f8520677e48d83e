package dev.espalier.grammar;

import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Comparator;
import java.util.HashMap;
import java.util.IdentityHashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.Set;
import java.util.function.Predicate;

/**
 * Facts about a grammar and the findings that follow from them, computed from the IR alone (any
 * front end). All fixed points are computed with work lists and explicit stacks, so grammars of many
 * rules or very deep expressions are analysed without deep recursion.
 *
 * <h2>Facts per rule ({@link RuleFacts})</h2>
 * <ul>
 *   <li><b>shortest length</b>, <b>productive</b> and <b>nullable</b>: one least fixed point over
 *       pairs (length in UTF-8 bytes, derivation height), ordered lexicographically. A rule is
 *       productive when its length is finite and nullable when it is 0. The height makes the choice
 *       of a shortest derivation well-founded, so a shortest string can always be spelled out.</li>
 *   <li><b>first bytes</b>: least fixed point of the bytes a non-empty string can start with
 *       (a sequence contributes its items' first bytes up to its first non-nullable item; parts that
 *       derive nothing contribute nothing).</li>
 *   <li><b>left-recursive</b>: the rule lies on a cycle of the graph whose edges go from a rule to the
 *       rules it refers to at a leftmost position, that is after nothing but nullable items.</li>
 *   <li><b>regular</b>: the graph of all references is split into strongly connected components.
 *       A component is <i>linear</i> when it is one rule that does not refer to itself, or when every
 *       reference from a member to a member is in tail position (right-linear), or every such
 *       reference is in head position (left-linear). Tail position means: the last item of every
 *       enclosing concatenation, inside alternations and inside repetitions of at most one
 *       ({@code [x]}); head position likewise with the first item. A rule is regular when every
 *       component reachable from it is linear. Such a language is regular (a right- or left-linear
 *       system of equations over regular coefficients); rules this test rejects may still have a
 *       regular language.</li>
 * </ul>
 *
 * <h2>Diagnostic codes</h2>
 * <ul>
 *   <li>{@code undefined-rule} (error) at each reference to a rule the grammar does not define. The
 *       ABNF front end adds the RFC 5234 core rules a file refers to, so for ABNF input this means
 *       "neither defined nor a core rule".</li>
 *   <li>{@code unused-rule} (warning) at the name of a rule the start rule does not reach.</li>
 *   <li>{@code non-productive} (error) at the name of a rule that derives no finite string because
 *       of recursion without an exit, such as {@code a = "x" a}. Parts that match nothing for a
 *       reason reported elsewhere (undefined rules, prose values, bad values) are given the benefit
 *       of the doubt here, so that one mistake is not reported at every rule using it.</li>
 *   <li>{@code empty-language} (error) at the start rule's name when it derives no string at all.</li>
 *   <li>{@code left-recursion} (information) at the name of each left-recursive rule.</li>
 * </ul>
 * Rules outside the caller's {@code reported} predicate (imported rules, core rules) are analysed
 * but carry no findings; rules without a known source position are never reported as unused.
 */
public final class GrammarAnalysis {

    /** Longest shortest string {@link RuleFacts#shortest()} spells out, in UTF-8 bytes. */
    public static final int MAX_SHORTEST_BYTES = 1 << 16;

    /** Longest example {@link #examples} produces, in chars; longer attempts are dropped. */
    public static final int MAX_EXAMPLE_CHARS = 1 << 16;

    /** Expansion steps of one example after which generation only takes shortest derivations. */
    static final int RANDOM_STEPS = 20_000;

    /** Expansion steps after which one string is abandoned. */
    static final long MAX_STEPS = 20_000_000L;

    static final long HUGE = 1L << 60;
    static final long NONE = Long.MAX_VALUE;
    private static final CodePointSet SURROGATES = CodePointSet.range(0xD800, 0xDFFF);

    /** Shortest length in UTF-8 bytes and the height of a derivation reaching it. */
    private record Cost(long len, int height) {
        static final Cost ZERO = new Cost(0, 0);
        static final Cost INFINITE = new Cost(NONE, Integer.MAX_VALUE);

        boolean finite() {
            return len != NONE;
        }

        boolean less(Cost o) {
            return len < o.len || (len == o.len && height < o.height);
        }
    }

    private final Grammar grammar;
    private final Rule[] rules;
    private final Map<String, Integer> index = new HashMap<>();
    private final int start;
    private final int[][] refs;
    private final Cost[] cost;
    private final IdentityHashMap<Expr, Cost> nodeCost = new IdentityHashMap<>();
    private final List<Diagnostic> diagnostics;
    private final Map<String, RuleFacts> facts = new LinkedHashMap<>();

    private GrammarAnalysis(Grammar g, Predicate<Rule> reported) {
        this.grammar = g;
        this.rules = g.rules().toArray(new Rule[0]);
        int n = rules.length;
        for (int i = 0; i < n; i++) {
            index.put(rules[i].key(), i);
        }
        Integer s = index.get(Grammar.key(g.start()));
        this.start = s == null ? -1 : s;
        List<Diagnostic> found = new ArrayList<>();

        // references, undefined ones reported
        refs = new int[n][];
        List<Set<String>> refNames = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            LinkedHashSet<Integer> targets = new LinkedHashSet<>();
            LinkedHashSet<String> names = new LinkedHashSet<>();
            for (Expr e : ExprFold.nodes(rules[i].body())) {
                if (e instanceof Expr.Ref r) {
                    Integer t = index.get(Grammar.key(r.name()));
                    if (t == null) {
                        names.add(r.name());
                        if (reported.test(rules[i])) {
                            found.add(new Diagnostic("undefined-rule", Severity.ERROR,
                                    "rule '" + r.name() + "' is not defined", r.span()));
                        }
                    } else {
                        targets.add(t);
                        names.add(rules[t].name());
                    }
                }
            }
            refs[i] = targets.stream().mapToInt(Integer::intValue).toArray();
            refNames.add(names);
        }
        int[][] users = reverse(refs);

        cost = new Cost[n];
        Arrays.fill(cost, Cost.INFINITE);
        shortestCosts(users);
        for (Rule r : rules) {
            new CostFold().run(r.body(), nodeCost);
        }
        boolean[] hopeful = hopefulProductivity(users);
        long[][] first = firstBytes(users);
        boolean[] leftRecursive = leftRecursion();
        boolean[] regular = regularity();

        // findings
        boolean[] reached = new boolean[n];
        if (start >= 0) {
            ArrayDeque<Integer> q = new ArrayDeque<>();
            reached[start] = true;
            q.add(start);
            while (!q.isEmpty()) {
                for (int t : refs[q.poll()]) {
                    if (!reached[t]) {
                        reached[t] = true;
                        q.add(t);
                    }
                }
            }
        }
        for (int i = 0; i < n; i++) {
            Rule r = rules[i];
            if (!reported.test(r)) {
                continue;
            }
            if (start >= 0 && !reached[i] && r.nameSpan().isKnown()) {
                found.add(new Diagnostic("unused-rule", Severity.WARNING, "rule '" + r.name()
                        + "' is never used: the start rule '" + rules[start].name() + "' does not reach it", r.nameSpan()));
            }
            if (!hopeful[i]) {
                found.add(new Diagnostic("non-productive", Severity.ERROR, "rule '" + r.name()
                        + "' derives no finite string: every way through it recurses without end", r.nameSpan()));
            }
            if (leftRecursive[i]) {
                found.add(new Diagnostic("left-recursion", Severity.INFORMATION, "rule '" + r.name()
                        + "' is left-recursive; supported by the Earley parser", r.nameSpan()));
            }
        }
        if (start >= 0 && !cost[start].finite() && reported.test(rules[start])) {
            found.add(new Diagnostic("empty-language", Severity.ERROR, "the start rule '" + rules[start].name()
                    + "' derives no string, so no text can satisfy this grammar", rules[start].nameSpan()));
        } else if (start < 0 && n > 0) {
            found.add(new Diagnostic("empty-language", Severity.ERROR, "the start rule '" + g.start()
                    + "' is not defined", Span.NONE));
        }
        found.sort(Comparator.comparingInt((Diagnostic d) -> d.span().start()));
        diagnostics = List.copyOf(found);

        for (int i = 0; i < n; i++) {
            int rule = i;
            Cost c = cost[i];
            facts.put(rules[i].key(), new RuleFacts(rules[i].name(), c.len == 0, c.finite(), regular[i], leftRecursive[i],
                    c.finite() ? c.len : -1, first[i], refNames.get(i), () -> shortestOf(rule)));
        }
    }

    /** Analyses {@code g}, reporting findings about every rule. */
    public static GrammarAnalysis of(Grammar g) {
        return of(g, r -> true);
    }

    /**
     * Analyses {@code g}; findings are reported only for rules that {@code reported} accepts (for
     * example the rules of the file being checked, not those it imports). Facts cover every rule.
     */
    public static GrammarAnalysis of(Grammar g, Predicate<Rule> reported) {
        return new GrammarAnalysis(g, reported);
    }

    /** The analysed grammar. */
    public Grammar grammar() {
        return grammar;
    }

    /** The findings, ordered by source position. */
    public List<Diagnostic> diagnostics() {
        return diagnostics;
    }

    /**
     * The facts about rule {@code name} (case-insensitive).
     *
     * @throws IllegalArgumentException if the grammar has no such rule
     */
    public RuleFacts facts(String name) {
        RuleFacts f = facts.get(Grammar.key(name));
        if (f == null) {
            throw new IllegalArgumentException("no rule named '" + name + "'");
        }
        return f;
    }

    /** The facts of every rule, by rule name in definition order. */
    public Map<String, RuleFacts> allFacts() {
        Map<String, RuleFacts> m = new LinkedHashMap<>();
        for (RuleFacts f : facts.values()) {
            m.put(f.name(), f);
        }
        return Collections.unmodifiableMap(m);
    }

    /**
     * Random strings derived from the grammar's start rule. Each derivation makes random choices
     * (alternatives, repetition counts up to three above the minimum, characters of a class, mostly
     * printable ASCII where the class allows) until rule references nest {@code maxDepth} deep or
     * the derivation grows long; from there on it takes shortest derivations, so generation always
     * ends.
     *
     * @param g        the grammar
     * @param n        how many strings are wanted
     * @param seed     the seed of the random choices (equal arguments give equal results)
     * @param maxDepth how deep rule references nest before only shortest derivations are taken
     * @return at most {@code n} distinct strings of the start rule's language; none when it is
     *         empty. Fewer when the language has fewer strings or attempts run past
     *         {@link #MAX_EXAMPLE_CHARS}
     */
    public static List<String> randomExamples(Grammar g, int n, long seed, int maxDepth) {
        return of(g).examples(n, seed, maxDepth);
    }

    /** As {@link #randomExamples(Grammar, int, long, int)}, on the analysed grammar. */
    public List<String> examples(int n, long seed, int maxDepth) {
        return examples(grammar.start(), n, seed, maxDepth);
    }

    /** As {@link #randomExamples(Grammar, int, long, int)}, for the rule {@code rule} instead of the start rule. */
    public List<String> examples(String rule, int n, long seed, int maxDepth) {
        Integer r = index.get(Grammar.key(rule));
        if (r == null || !cost[r].finite() || n <= 0) {
            return List.of();
        }
        Random rnd = new Random(seed);
        LinkedHashSet<String> out = new LinkedHashSet<>();
        int attempts = 4 * n + 16;
        for (int a = 0; a < attempts && out.size() < n; a++) {
            String s = spell(rules[r].body(), rnd, Math.max(0, maxDepth), MAX_EXAMPLE_CHARS);
            if (s != null) {
                out.add(s);
            }
        }
        return List.copyOf(out);
    }

    // ------------------------------------------------------------------ shortest lengths

    /** Cost of a node given the current rule costs. */
    private final class CostFold extends ExprFold<Cost> {
        @Override
        protected Cost leaf(Expr e) {
            if (e instanceof Expr.Chars c) {
                CodePointSet s = c.set().minus(SURROGATES);
                return s.isEmpty() ? Cost.INFINITE : new Cost(utf8Length(s.lo(0)), 0);
            } else if (e instanceof Expr.Text t) {
                return encodable(t.text()) ? new Cost(t.text().getBytes(StandardCharsets.UTF_8).length, 0) : Cost.INFINITE;
            }
            Integer t = index.get(Grammar.key(((Expr.Ref) e).name()));
            if (t == null || !cost[t].finite()) {
                return Cost.INFINITE;
            }
            return new Cost(cost[t].len, cost[t].height + 1);
        }

        @Override
        protected Cost seq(Expr.Seq s, List<Cost> items) {
            long len = 0;
            int h = 0;
            for (Cost c : items) {
                if (!c.finite()) {
                    return Cost.INFINITE;
                }
                len = Math.min(HUGE, len + c.len);
                h = Math.max(h, c.height);
            }
            return new Cost(len, h);
        }

        @Override
        protected Cost choice(Expr.Choice c, List<Cost> options) {
            Cost best = Cost.INFINITE;
            for (Cost o : options) {
                if (o.less(best)) {
                    best = o;
                }
            }
            return best;
        }

        @Override
        protected Cost repeat(Expr.Repeat r, Cost body) {
            if (r.min() == 0 || r.max() == 0) {
                return Cost.ZERO;
            }
            if (!body.finite()) {
                return Cost.INFINITE;
            }
            long len = body.len == 0 ? 0 : body.len > HUGE / r.min() ? HUGE : Math.min(HUGE, body.len * r.min());
            return new Cost(len, body.height);
        }
    }

    /** Lowers {@link #cost} (all infinite at first) to its least fixed point. */
    private void shortestCosts(int[][] users) {
        CostFold fold = new CostFold();
        workList(users, i -> {
            Cost v = fold.run(rules[i].body(), null);
            if (v.less(cost[i])) {
                cost[i] = v;
                return true;
            }
            return false;
        });
    }

    /** Productivity when undefined rules and empty parts (reported elsewhere) are assumed to match something. */
    private boolean[] hopefulProductivity(int[][] users) {
        boolean[] p = new boolean[rules.length];
        ExprFold<Boolean> fold = new ExprFold<>() {
            @Override
            protected Boolean leaf(Expr e) {
                if (e instanceof Expr.Ref r) {
                    Integer t = index.get(Grammar.key(r.name()));
                    return t == null || p[t];
                }
                return true;
            }

            @Override
            protected Boolean seq(Expr.Seq s, List<Boolean> items) {
                return !items.contains(Boolean.FALSE);
            }

            @Override
            protected Boolean choice(Expr.Choice c, List<Boolean> options) {
                return options.isEmpty() || options.contains(Boolean.TRUE);
            }

            @Override
            protected Boolean repeat(Expr.Repeat r, Boolean body) {
                return r.min() == 0 || r.max() == 0 || body;
            }
        };
        workList(users, i -> {
            if (!p[i] && fold.run(rules[i].body(), null)) {
                p[i] = true;
                return true;
            }
            return false;
        });
        return p;
    }

    // ------------------------------------------------------------------ first bytes

    private long[][] firstBytes(int[][] users) {
        long[][] first = new long[rules.length][4];
        ExprFold<long[]> fold = new ExprFold<>() {
            @Override
            protected long[] leaf(Expr e) {
                if (!nodeCost.get(e).finite()) {
                    return new long[4];
                }
                if (e instanceof Expr.Chars c) {
                    return leadBytes(c.set());
                } else if (e instanceof Expr.Text t) {
                    long[] b = new long[4];
                    if (!t.text().isEmpty()) {
                        int cp = t.text().codePointAt(0);
                        addLead(b, cp);
                        if (t.ignoreCase() && cp < 0x80 && Character.isLetter(cp)) {
                            addLead(b, cp ^ 0x20);
                        }
                    }
                    return b;
                }
                Integer t = index.get(Grammar.key(((Expr.Ref) e).name()));
                return t == null ? new long[4] : first[t].clone();
            }

            @Override
            protected long[] seq(Expr.Seq s, List<long[]> items) {
                long[] b = new long[4];
                if (!nodeCost.get(s).finite()) {
                    return b;
                }
                for (int i = 0; i < items.size(); i++) {
                    or(b, items.get(i));
                    if (nodeCost.get(s.items().get(i)).len != 0) {
                        break;
                    }
                }
                return b;
            }

            @Override
            protected long[] choice(Expr.Choice c, List<long[]> options) {
                long[] b = new long[4];
                for (long[] o : options) {
                    or(b, o);
                }
                return b;
            }

            @Override
            protected long[] repeat(Expr.Repeat r, long[] body) {
                return r.max() == 0 || !nodeCost.get(r).finite() ? new long[4] : body;
            }
        };
        workList(users, i -> {
            long[] v = fold.run(rules[i].body(), null);
            boolean grew = false;
            for (int w = 0; w < 4; w++) {
                if ((v[w] & ~first[i][w]) != 0) {
                    first[i][w] |= v[w];
                    grew = true;
                }
            }
            return grew;
        });
        return first;
    }

    private static void or(long[] into, long[] b) {
        for (int w = 0; w < 4; w++) {
            into[w] |= b[w];
        }
    }

    private static void addLead(long[] b, int cp) {
        int lead = cp < 0x80 ? cp : cp < 0x800 ? 0xC0 | (cp >> 6) : cp < 0x10000 ? 0xE0 | (cp >> 12) : 0xF0 | (cp >> 18);
        b[lead >> 6] |= 1L << (lead & 63);
    }

    /** UTF-8 lead bytes of the members of {@code set} (surrogates have none). */
    static long[] leadBytes(CodePointSet set) {
        long[] b = new long[4];
        CodePointSet s = set.minus(SURROGATES);
        int[][] classes = {{0, 0x7F, 0}, {0x80, 0x7FF, 6}, {0x800, 0xFFFF, 12}, {0x10000, CodePointSet.MAX, 18}};
        int[] marks = {0, 0xC0, 0xE0, 0xF0};
        for (int i = 0; i < s.rangeCount(); i++) {
            for (int k = 0; k < 4; k++) {
                int lo = Math.max(s.lo(i), classes[k][0]);
                int hi = Math.min(s.hi(i), classes[k][1]);
                for (int lead = lo >> classes[k][2]; lo <= hi && lead <= hi >> classes[k][2]; lead++) {
                    int byteValue = marks[k] | lead;
                    b[byteValue >> 6] |= 1L << (byteValue & 63);
                }
            }
        }
        return b;
    }

    // ------------------------------------------------------------------ left recursion, regularity

    private boolean[] leftRecursion() {
        int n = rules.length;
        int[][] left = new int[n][];
        for (int i = 0; i < n; i++) {
            LinkedHashSet<Integer> out = new LinkedHashSet<>();
            List<Expr> stack = new ArrayList<>();
            stack.add(rules[i].body());
            while (!stack.isEmpty()) {
                Expr e = stack.remove(stack.size() - 1);
                if (e instanceof Expr.Ref r) {
                    Integer t = index.get(Grammar.key(r.name()));
                    if (t != null) {
                        out.add(t);
                    }
                } else if (e instanceof Expr.Seq s) {
                    for (Expr item : s.items()) {
                        stack.add(item);
                        if (nodeCost.get(item).len != 0) {
                            break;
                        }
                    }
                } else if (e instanceof Expr.Choice c) {
                    stack.addAll(c.options());
                } else if (e instanceof Expr.Repeat r && r.max() != 0) {
                    stack.add(r.body());
                }
            }
            left[i] = out.stream().mapToInt(Integer::intValue).toArray();
        }
        int[] comp = components(left);
        return onCycle(left, comp);
    }

    private static boolean[] onCycle(int[][] graph, int[] comp) {
        int n = graph.length;
        int[] size = new int[n];
        for (int c : comp) {
            size[c]++;
        }
        boolean[] out = new boolean[n];
        for (int i = 0; i < n; i++) {
            out[i] = size[comp[i]] > 1;
            for (int t : graph[i]) {
                out[i] |= t == i;
            }
        }
        return out;
    }

    private boolean[] regularity() {
        int n = rules.length;
        int[] comp = components(refs);
        boolean[] cyclic = onCycle(refs, comp);
        int count = 0;
        for (int c : comp) {
            count = Math.max(count, c + 1);
        }
        List<List<Integer>> members = new ArrayList<>();
        for (int c = 0; c < count; c++) {
            members.add(new ArrayList<>());
        }
        for (int i = 0; i < n; i++) {
            members.get(comp[i]).add(i);
        }
        boolean[] regularComp = new boolean[count];
        // components are numbered in the order Tarjan's algorithm completes them: callees first
        for (int c = 0; c < count; c++) {
            boolean ok = !cyclic[members.get(c).get(0)] || linear(members.get(c), comp, c);
            for (int m : members.get(c)) {
                for (int t : refs[m]) {
                    if (comp[t] != c) {
                        ok &= regularComp[comp[t]];
                    }
                }
            }
            regularComp[c] = ok;
        }
        boolean[] out = new boolean[n];
        for (int i = 0; i < n; i++) {
            out[i] = regularComp[comp[i]];
        }
        return out;
    }

    private record Place(Expr e, boolean tail, boolean head) { }

    /** Whether every reference within component {@code c} is in tail position, or every one in head position. */
    private boolean linear(List<Integer> member, int[] comp, int c) {
        boolean allTail = true;
        boolean allHead = true;
        for (int m : member) {
            List<Place> stack = new ArrayList<>();
            stack.add(new Place(rules[m].body(), true, true));
            while (!stack.isEmpty()) {
                Place p = stack.remove(stack.size() - 1);
                Expr e = p.e();
                if (e instanceof Expr.Ref r) {
                    Integer t = index.get(Grammar.key(r.name()));
                    if (t != null && comp[t] == c) {
                        allTail &= p.tail();
                        allHead &= p.head();
                    }
                } else if (e instanceof Expr.Seq s) {
                    int last = s.items().size() - 1;
                    for (int i = 0; i <= last; i++) {
                        stack.add(new Place(s.items().get(i), p.tail() && i == last, p.head() && i == 0));
                    }
                } else if (e instanceof Expr.Choice ch) {
                    for (Expr o : ch.options()) {
                        stack.add(new Place(o, p.tail(), p.head()));
                    }
                } else if (e instanceof Expr.Repeat r && r.max() != 0) {
                    boolean once = r.max() == 1;
                    stack.add(new Place(r.body(), once && p.tail(), once && p.head()));
                }
            }
        }
        return allTail || allHead;
    }

    /**
     * Strongly connected components (Tarjan, with an explicit stack). Components are numbered in
     * completion order, so every edge leads to a component with a number no larger than its own.
     */
    static int[] components(int[][] graph) {
        int n = graph.length;
        int[] idx = new int[n];
        int[] low = new int[n];
        int[] comp = new int[n];
        boolean[] onStack = new boolean[n];
        Arrays.fill(idx, -1);
        int[] sccStack = new int[n];
        int sp = 0;
        int[] callNode = new int[n];
        int[] callEdge = new int[n];
        int counter = 0;
        int comps = 0;
        for (int root = 0; root < n; root++) {
            if (idx[root] >= 0) {
                continue;
            }
            int cp = 0;
            callNode[cp] = root;
            callEdge[cp] = 0;
            cp++;
            idx[root] = low[root] = counter++;
            sccStack[sp++] = root;
            onStack[root] = true;
            while (cp > 0) {
                int v = callNode[cp - 1];
                if (callEdge[cp - 1] < graph[v].length) {
                    int w = graph[v][callEdge[cp - 1]++];
                    if (idx[w] < 0) {
                        idx[w] = low[w] = counter++;
                        sccStack[sp++] = w;
                        onStack[w] = true;
                        callNode[cp] = w;
                        callEdge[cp] = 0;
                        cp++;
                    } else if (onStack[w]) {
                        low[v] = Math.min(low[v], idx[w]);
                    }
                    continue;
                }
                if (low[v] == idx[v]) {
                    int w;
                    do {
                        w = sccStack[--sp];
                        onStack[w] = false;
                        comp[w] = comps;
                    } while (w != v);
                    comps++;
                }
                cp--;
                if (cp > 0) {
                    int u = callNode[cp - 1];
                    low[u] = Math.min(low[u], low[v]);
                }
            }
        }
        return comp;
    }

    // ------------------------------------------------------------------ helpers

    private interface Step {
        boolean update(int rule);
    }

    /** Re-evaluates rules until nothing changes; a change re-queues the rules that use the rule. */
    private void workList(int[][] users, Step step) {
        int n = rules.length;
        ArrayDeque<Integer> queue = new ArrayDeque<>();
        boolean[] queued = new boolean[n];
        for (int i = n - 1; i >= 0; i--) {
            queue.add(i);
            queued[i] = true;
        }
        while (!queue.isEmpty()) {
            int i = queue.poll();
            queued[i] = false;
            if (step.update(i)) {
                for (int u : users[i]) {
                    if (!queued[u]) {
                        queued[u] = true;
                        queue.add(u);
                    }
                }
            }
        }
    }

    private static int[][] reverse(int[][] graph) {
        int n = graph.length;
        int[] deg = new int[n];
        for (int[] out : graph) {
            for (int t : out) {
                deg[t]++;
            }
        }
        int[][] rev = new int[n][];
        for (int i = 0; i < n; i++) {
            rev[i] = new int[deg[i]];
        }
        int[] fill = new int[n];
        for (int i = 0; i < n; i++) {
            for (int t : graph[i]) {
                rev[t][fill[t]++] = i;
            }
        }
        return rev;
    }

    static int utf8Length(int cp) {
        return cp < 0x80 ? 1 : cp < 0x800 ? 2 : cp < 0x10000 ? 3 : 4;
    }

    /** Whether a string has no unpaired surrogate (and so has a UTF-8 form). */
    static boolean encodable(String s) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
                i++;
            } else if (Character.isSurrogate(c)) {
                return false;
            }
        }
        return true;
    }

    // ------------------------------------------------------------------ spelling out strings

    private Optional<String> shortestOf(int rule) {
        Cost c = cost[rule];
        if (!c.finite() || c.len > MAX_SHORTEST_BYTES) {
            return Optional.empty();
        }
        return Optional.ofNullable(spell(rules[rule].body(), null, 0, MAX_SHORTEST_BYTES));
    }

    private record Node(Expr e, int depth, boolean shortest) { }

    private record Again(Expr body, long remaining, int depth, boolean shortest) { }

    /**
     * Spells out one string of {@code root}: with {@code rnd == null} a shortest one, else random
     * choices down to {@code maxDepth} nested references. Null when it grows past {@code limit} chars.
     */
    private String spell(Expr root, Random rnd, int maxDepth, int limit) {
        StringBuilder sb = new StringBuilder();
        ArrayDeque<Object> stack = new ArrayDeque<>();
        stack.push(new Node(root, 0, rnd == null));
        long steps = 0;
        while (!stack.isEmpty()) {
            if (++steps > MAX_STEPS || sb.length() > limit) {
                return null;
            }
            Object top = stack.pop();
            if (top instanceof Again a) {
                if (a.remaining() > 0) {
                    stack.push(new Again(a.body(), a.remaining() - 1, a.depth(), a.shortest()));
                    stack.push(new Node(a.body(), a.depth(), a.shortest()));
                }
                continue;
            }
            Node f = (Node) top;
            Expr e = f.e();
            Cost c = nodeCost.get(e);
            if (c == null || !c.finite()) {
                return null; // not reached: only productive parts are entered
            }
            boolean shortest = f.shortest() || steps > RANDOM_STEPS;
            if (shortest && c.len == 0) {
                continue;
            }
            if (e instanceof Expr.Chars ch) {
                sb.appendCodePoint(shortest ? preferred(ch.set()) : randomMember(ch.set(), rnd));
            } else if (e instanceof Expr.Text t) {
                sb.append(t.text());
            } else if (e instanceof Expr.Seq s) {
                for (int i = s.items().size() - 1; i >= 0; i--) {
                    stack.push(new Node(s.items().get(i), f.depth(), shortest));
                }
            } else if (e instanceof Expr.Choice ch) {
                Expr pick = null;
                if (shortest) {
                    Cost best = Cost.INFINITE;
                    for (Expr o : ch.options()) {
                        if (nodeCost.get(o).less(best)) {
                            best = nodeCost.get(o);
                            pick = o;
                        }
                    }
                } else {
                    List<Expr> live = new ArrayList<>();
                    for (Expr o : ch.options()) {
                        if (nodeCost.get(o).finite()) {
                            live.add(o);
                        }
                    }
                    pick = live.get(rnd.nextInt(live.size()));
                }
                stack.push(new Node(pick, f.depth(), shortest));
            } else if (e instanceof Expr.Repeat r) {
                Cost body = nodeCost.get(r.body());
                long k;
                if (!body.finite() || r.max() == 0) {
                    k = 0;
                } else if (shortest) {
                    k = body.len == 0 ? 0 : r.min();
                } else {
                    long hi = r.unbounded() ? r.min() + 3L : Math.min(r.max(), r.min() + 3L);
                    k = r.min() + rnd.nextInt((int) (hi - r.min() + 1));
                    if (body.len == 0) {
                        k = Math.min(k, 4); // the remaining copies derive the empty string
                    }
                }
                stack.push(new Again(r.body(), k, f.depth(), shortest));
            } else {
                int t = index.get(Grammar.key(((Expr.Ref) e).name()));
                int depth = f.depth() + 1;
                stack.push(new Node(rules[t].body(), depth, shortest || depth > maxDepth));
            }
        }
        return sb.length() > limit ? null : sb.toString();
    }

    /** The member of a shortest UTF-8 length, a lower-case letter, digit or capital where there is one. */
    static int preferred(CodePointSet set) {
        CodePointSet s = set.minus(SURROGATES);
        int[][] likes = {{'a', 'z'}, {'0', '9'}, {'A', 'Z'}, {0x21, 0x7E}, {0x20, 0x20}};
        for (int[] like : likes) {
            for (int i = 0; i < s.rangeCount(); i++) {
                int lo = Math.max(s.lo(i), like[0]);
                if (lo <= Math.min(s.hi(i), like[1])) {
                    return lo;
                }
            }
        }
        return s.lo(0);
    }

    /** A random member; three times in four printable ASCII when the set has some. */
    private static int randomMember(CodePointSet set, Random rnd) {
        CodePointSet s = set.minus(SURROGATES);
        CodePointSet printable = s.intersect(CodePointSet.range(0x21, 0x7E));
        if (!printable.isEmpty() && rnd.nextInt(4) != 0) {
            s = printable;
        }
        long k = (long) (rnd.nextDouble() * s.size());
        for (int i = 0; i < s.rangeCount(); i++) {
            long width = s.hi(i) - s.lo(i) + 1L;
            if (k < width) {
                return (int) (s.lo(i) + k);
            }
            k -= width;
        }
        return s.hi(s.rangeCount() - 1);
    }
}
