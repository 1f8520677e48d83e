package dev.espalier.automaton;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.ExprFold;
import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.TreeMap;
import java.util.function.Function;

/**
 * Compiles regular parts of the grammar IR into dk.brics automata over Java {@code char}s, built
 * with the library's operations (never its own regular-expression syntax).
 *
 * <p>Code points above U+FFFF become UTF-16 surrogate pairs, so {@link Automaton#run(String)}
 * agrees with Java strings. Surrogate code points (U+D800..U+DFFF) in a {@link CodePointSet} are
 * dropped, and a {@link Expr.Text} holding an unpaired surrogate matches nothing, since neither can
 * be encoded in UTF-8.
 *
 * <p>Every intermediate result is determinised with a bounded subset construction and then
 * minimised (Hopcroft). The limits are: each deterministic intermediate automaton has at most
 * {@code stateLimit} states, and each nondeterministic automaton handed to determinisation (a
 * concatenation, union or repetition of deterministic ones) at most {@value #NFA_FACTOR} times
 * that. Crossing either raises {@link AutomatonTooLargeException} before the oversized structure is
 * built, so an exponential blow-up such as {@code (a|b)*a(a|b){25}} fails fast in bounded memory.
 * Counted repetition {@code {m,n}} is built as one chain of copies when that chain fits the
 * nondeterministic limit, and otherwise by repeated squaring (a logarithmic number of bounded
 * steps); the whole compiler works with an explicit stack, never recursion. A rule is compiled once
 * and copied at each reference; in {@link #compileUnminimized} a rule referenced more than once is
 * minimised before it is copied, so rules that share rules grow linearly, not exponentially.
 */
public final class CharAutomata {

    /** How many times {@code stateLimit} a nondeterministic intermediate automaton may reach. */
    public static final int NFA_FACTOR = 8;

    private static final int MIN_HIGH = 0xD800;
    private static final int MIN_LOW = 0xDC00;
    private static final int MAX_LOW = 0xDFFF;

    private final Function<String, Expr> rules;
    private final int limit;
    private final int nfaLimit;
    private final long subsetBudget;
    private final Map<String, Automaton> finished = new HashMap<>();
    /** How many references to each rule (by key) the compiled expression reaches, counted once per rule body. */
    private Map<String, Integer> referenceCounts = Map.of();
    private final Set<String> active = new HashSet<>();

    private final boolean minimizing;

    private CharAutomata(Function<String, Expr> rules, int limit, boolean minimizing) {
        this.minimizing = minimizing;
        this.rules = rules;
        this.limit = limit;
        this.nfaLimit = (int) Math.min(Integer.MAX_VALUE, (long) NFA_FACTOR * limit);
        this.subsetBudget = 64L * limit + 1_000_000L;
    }

    /**
     * Compiles {@code expr} into an automaton over Java chars accepting exactly the UTF-16 forms of
     * the strings the expression matches.
     *
     * @param expr       the expression; must be regular once references are resolved
     * @param rules      resolves {@link Expr.Ref} names to rule bodies; may be null when
     *                   {@code expr} has no references
     * @param stateLimit the largest number of states any deterministic intermediate automaton may
     *                   have (at least 1)
     * @return a deterministic, minimal automaton (it is always minimised: when the limit would not
     *         allow that, the call fails instead of returning a nondeterministic one)
     * @throws AutomatonTooLargeException if an intermediate automaton would cross the limits
     * @throws IllegalArgumentException   if a reference cannot be resolved ({@code rules} is null or
     *                                    returns null) or a rule refers to itself, directly or
     *                                    through others ({@code "rule X is recursive"})
     */
    public static Automaton compile(Expr expr, Function<String, Expr> rules, int stateLimit) {
        Objects.requireNonNull(expr, "expr");
        if (stateLimit < 1) {
            throw new IllegalArgumentException("the state limit must be positive: " + stateLimit);
        }
        Automaton a = new CharAutomata(rules, stateLimit, true).build(expr);
        a.expandSingleton();
        return a;
    }

    /**
     * As {@link #compile}, but without minimising: intermediate automata are determinised (bounded)
     * only when large, and the result may be nondeterministic. For callers that determinise and
     * minimise the result themselves, such as {@link ByteDfa#fromCharAutomaton}, which minimises over
     * byte classes far faster than minimisation over Java's 65,536 chars.
     */
    public static Automaton compileUnminimized(Expr expr, Function<String, Expr> rules, int stateLimit) {
        Objects.requireNonNull(expr, "expr");
        if (stateLimit < 1) {
            throw new IllegalArgumentException("the state limit must be positive: " + stateLimit);
        }
        Automaton a = new CharAutomata(rules, stateLimit, false).build(expr);
        a.expandSingleton();
        return a;
    }

    /** Combine the top {@code arity} results for {@code expr}. */
    private record Join(Expr expr, int arity) {
    }

    /** A referenced rule's body has been compiled: remember it and leave the rule. */
    private record Leave(String key) {
    }

    private Automaton build(Expr root) {
        if (!minimizing) {
            referenceCounts = countReferences(root);
        }
        Deque<Object> work = new ArrayDeque<>();
        List<Automaton> values = new ArrayList<>();
        work.push(root);
        while (!work.isEmpty()) {
            Object task = work.pop();
            if (task instanceof Join j) {
                List<Automaton> args = new ArrayList<>(values.subList(values.size() - j.arity(), values.size()));
                values.subList(values.size() - j.arity(), values.size()).clear();
                values.add(combine(j.expr(), args));
            } else if (task instanceof Leave l) {
                active.remove(l.key());
                Automaton done = values.get(values.size() - 1);
                if (!minimizing && referenceCounts.getOrDefault(l.key(), 0) > 1) {
                    // A rule used in several places is copied into each: minimal copies keep rules
                    // that share rules (an acyclic automaton written as rules, say) from growing
                    // exponentially.
                    done = settleFully(done);
                    values.set(values.size() - 1, done);
                }
                finished.put(l.key(), done);
            } else if (task instanceof Expr.Chars c) {
                values.add(settle(codePoints(c.set())));
            } else if (task instanceof Expr.Text t) {
                values.add(settle(text(t.text(), t.ignoreCase())));
            } else if (task instanceof Expr.Seq s) {
                pushAll(work, s, s.items(), values, Automaton.makeEmptyString());
            } else if (task instanceof Expr.Choice c) {
                pushAll(work, c, c.options(), values, Automaton.makeEmpty());
            } else if (task instanceof Expr.Repeat r) {
                work.push(new Join(r, 1));
                work.push(r.body());
            } else if (task instanceof Expr.Ref r) {
                enterRule(r.name(), work, values);
            } else {
                throw new IllegalStateException("unknown task " + task);
            }
        }
        return values.get(0);
    }

    private static void pushAll(Deque<Object> work, Expr parent, List<Expr> children, List<Automaton> values,
            Automaton ifNone) {
        if (children.isEmpty()) {
            values.add(ifNone);
            return;
        }
        work.push(new Join(parent, children.size()));
        for (int i = children.size() - 1; i >= 0; i--) {
            work.push(children.get(i));
        }
    }

    private void enterRule(String name, Deque<Object> work, List<Automaton> values) {
        String key = name.toLowerCase(Locale.ROOT);
        Automaton done = finished.get(key);
        if (done != null) {
            values.add(done.clone());
            return;
        }
        if (active.contains(key)) {
            throw new IllegalArgumentException("rule " + name + " is recursive");
        }
        if (rules == null) {
            throw new IllegalArgumentException("rule " + name + " cannot be resolved: no rules were given");
        }
        Expr body = rules.apply(name);
        if (body == null) {
            throw new IllegalArgumentException("rule " + name + " is not defined");
        }
        active.add(key);
        work.push(new Leave(key));
        work.push(body);
    }

    private Automaton combine(Expr expr, List<Automaton> args) {
        if (expr instanceof Expr.Seq) {
            return args.size() == 1 ? args.get(0) : fold(args, true);
        }
        if (expr instanceof Expr.Choice) {
            return args.size() == 1 ? args.get(0) : fold(args, false);
        }
        Expr.Repeat r = (Expr.Repeat) expr;
        return repeat(args.get(0), r.min(), r.max());
    }

    /**
     * Concatenation or union of many deterministic automata, in batches whose combined size stays
     * within the nondeterministic limit: each batch is determinised and minimised and its result
     * starts the next batch, so a long sequence or a large alternation never needs one huge NFA.
     */
    private Automaton fold(List<Automaton> parts, boolean concatenate) {
        List<Automaton> batch = new ArrayList<>();
        long size = 0;
        for (Automaton part : parts) {
            // Parts are minimal, so these checks are exact and cheap.
            if (part.isEmpty()) {
                if (concatenate) {
                    return Automaton.makeEmpty();
                }
                continue;
            }
            if (concatenate && part.isEmptyString()) {
                continue;
            }
            int n = part.getNumberOfStates();
            if (!batch.isEmpty() && size + n > nfaLimit) {
                Automaton done = settle(guarded(batch, concatenate));
                batch = new ArrayList<>();
                batch.add(done);
                size = done.getNumberOfStates();
            }
            batch.add(part);
            size += n;
        }
        if (batch.isEmpty()) {
            return concatenate ? Automaton.makeEmptyString() : Automaton.makeEmpty();
        }
        return batch.size() == 1 ? batch.get(0) : settle(guarded(batch, concatenate));
    }

    /** Concatenation or union of deterministic automata, refusing oversized inputs first. */
    private Automaton guarded(List<Automaton> parts, boolean concatenate) {
        long total = 0;
        for (Automaton a : parts) {
            total += a.getNumberOfStates();
        }
        if (total > nfaLimit) {
            throw new AutomatonTooLargeException(limit);
        }
        return concatenate ? Automaton.concatenate(parts) : Automaton.union(parts);
    }

    private Automaton repeat(Automaton body, int min, int max) {
        if (body.isEmpty()) {
            return min == 0 ? Automaton.makeEmptyString() : Automaton.makeEmpty();
        }
        if (max == 0 || body.isEmptyString()) {
            return Automaton.makeEmptyString();
        }
        long k = body.getNumberOfStates();
        long chain = k * (max == Expr.UNBOUNDED ? min + 1L : max) + 1;
        if (chain <= nfaLimit) {
            // The library's own chain of copies: each copy's accepting states continue into the
            // next, which determinises in time linear in the chain for the usual bodies.
            return settle(max == Expr.UNBOUNDED ? body.repeat(min) : body.repeat(min, max));
        }
        // Too long for one chain: build by repeated squaring with a bounded automaton per step.
        Automaton head = min > 0 ? power(body, min) : null;
        Automaton tail;
        if (max == Expr.UNBOUNDED) {
            tail = settle(body.repeat());
        } else if (max > min) {
            tail = power(settle(body.optional()), max - min);
        } else {
            return head;
        }
        return head == null ? tail : settle(guarded(List.of(head, tail), true));
    }

    /** {@code a} concatenated {@code n >= 1} times, by repeated squaring. */
    private Automaton power(Automaton a, int n) {
        Automaton result = null;
        Automaton base = a;
        while (true) {
            if ((n & 1) != 0) {
                result = result == null ? base : settle(guarded(List.of(result, base), true));
            }
            n >>>= 1;
            if (n == 0) {
                return result;
            }
            base = settle(guarded(List.of(base, base), true));
        }
    }

    /**
     * References per rule key reachable from {@code root}, each rule body visited once; names that
     * do not resolve are skipped (the build reports them).
     */
    private Map<String, Integer> countReferences(Expr root) {
        Map<String, Integer> counts = new HashMap<>();
        Deque<Expr> work = new ArrayDeque<>();
        work.push(root);
        while (!work.isEmpty()) {
            Expr e = work.pop();
            ExprFold.children(e).forEach(work::push);
            if (e instanceof Expr.Ref r) {
                String key = r.name().toLowerCase(Locale.ROOT);
                if (counts.merge(key, 1, Integer::sum) == 1 && rules != null) {
                    Expr body = rules.apply(r.name());
                    if (body != null) {
                        work.push(body);
                    }
                }
            }
        }
        return counts;
    }

    /** Determinise (bounded) and minimise a freshly built automaton. */
    private Automaton settle(Automaton a) {
        if (!minimizing && a.getNumberOfStates() <= limit) {
            return a; // the caller determinises and minimises the whole automaton once
        }
        return settleFully(a);
    }

    /** Determinise (bounded) and minimise, whatever the mode. */
    private Automaton settleFully(Automaton a) {
        int n = a.getNumberOfStates();
        if (a.isDeterministic()) {
            if (n > limit) {
                throw new AutomatonTooLargeException(limit);
            }
        } else {
            if (n > nfaLimit) {
                throw new AutomatonTooLargeException(limit);
            }
            a = determinize(a);
        }
        a.minimize();
        return a;
    }

    // ---- bounded subset construction ----

    /** A set of NFA state numbers, sorted. */
    private static final class Subset {
        final int[] members;
        final int hash;

        Subset(int[] members) {
            this.members = members;
            this.hash = Arrays.hashCode(members);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Subset s && Arrays.equals(members, s.members);
        }

        @Override
        public int hashCode() {
            return hash;
        }
    }

    private Automaton determinize(Automaton nfa) {
        nfa.expandSingleton();
        Set<State> all = nfa.getStates();
        Map<State, Integer> number = new IdentityHashMap<>();
        State[] byNumber = all.toArray(new State[0]);
        for (int i = 0; i < byNumber.length; i++) {
            number.put(byNumber[i], i);
        }
        int n = byNumber.length;
        int[][] lows = new int[n][];
        int[][] highs = new int[n][];
        int[][] dests = new int[n][];
        boolean[] accept = new boolean[n];
        for (int i = 0; i < n; i++) {
            Set<Transition> ts = byNumber[i].getTransitions();
            lows[i] = new int[ts.size()];
            highs[i] = new int[ts.size()];
            dests[i] = new int[ts.size()];
            int k = 0;
            for (Transition t : ts) {
                lows[i][k] = t.getMin();
                highs[i][k] = t.getMax();
                dests[i][k] = number.get(t.getDest());
                k++;
            }
            accept[i] = byNumber[i].isAccept();
        }

        Map<Subset, State> seen = new HashMap<>();
        Deque<Subset> queue = new ArrayDeque<>();
        Subset start = new Subset(new int[] {number.get(nfa.getInitialState())});
        State dfaStart = new State();
        seen.put(start, dfaStart);
        queue.add(start);
        long budget = 1;
        int[] count = new int[n];
        int[] activeList = new int[n];
        int[] activeAt = new int[n];
        int activeSize = 0;

        while (!queue.isEmpty()) {
            Subset s = queue.poll();
            State from = seen.get(s);
            int events = 0;
            for (int m : s.members) {
                events += 2 * lows[m].length;
                if (accept[m]) {
                    from.setAccept(true);
                }
            }
            long[] ev = new long[events];
            int e = 0;
            for (int m : s.members) {
                for (int k = 0; k < lows[m].length; k++) {
                    ev[e++] = ((long) lows[m][k] << 32) | (1L << 31) | dests[m][k];
                    ev[e++] = ((long) (highs[m][k] + 1) << 32) | dests[m][k];
                }
            }
            Arrays.sort(ev);
            int i = 0;
            while (i < ev.length) {
                int point = (int) (ev[i] >>> 32);
                while (i < ev.length && (int) (ev[i] >>> 32) == point) {
                    int d = (int) (ev[i] & 0x7FFFFFFFL);
                    if ((ev[i] & (1L << 31)) != 0) {
                        if (count[d]++ == 0) {
                            activeAt[d] = activeSize;
                            activeList[activeSize++] = d;
                        }
                    } else if (--count[d] == 0) {
                        int last = activeList[--activeSize];
                        activeList[activeAt[d]] = last;
                        activeAt[last] = activeAt[d];
                    }
                    i++;
                }
                if (activeSize > 0 && point <= Character.MAX_VALUE) {
                    int next = (int) (ev[i] >>> 32); // a removal always follows while something is active
                    int[] target = Arrays.copyOf(activeList, activeSize);
                    Arrays.sort(target);
                    Subset key = new Subset(target);
                    State to = seen.get(key);
                    if (to == null) {
                        if (seen.size() >= limit) {
                            throw new AutomatonTooLargeException(limit);
                        }
                        budget += target.length;
                        if (budget > subsetBudget) {
                            throw new AutomatonTooLargeException(limit,
                                    "determinising an intermediate automaton exceeds the work budget for a limit of "
                                            + limit + " states");
                        }
                        to = new State();
                        seen.put(key, to);
                        queue.add(key);
                    }
                    from.addTransition(new Transition((char) point, (char) (next - 1), to));
                }
            }
        }
        Automaton dfa = new Automaton();
        dfa.setInitialState(dfaStart);
        dfa.setDeterministic(true);
        return dfa;
    }

    // ---- leaves ----

    /** One code point of {@code set} as UTF-16: BMP ranges directly, the rest as surrogate pairs. */
    static Automaton codePoints(CodePointSet set) {
        State init = new State();
        State fin = new State();
        fin.setAccept(true);
        boolean any = false;
        TreeMap<Integer, List<Integer>> partial = new TreeMap<>();
        List<int[]> fullHigh = new ArrayList<>();
        for (int r = 0; r < set.rangeCount(); r++) {
            int lo = set.lo(r);
            int hi = set.hi(r);
            any |= bmp(init, fin, lo, Math.min(hi, MIN_HIGH - 1));
            any |= bmp(init, fin, Math.max(lo, MAX_LOW + 1), Math.min(hi, Character.MAX_VALUE));
            int a = Math.max(lo, Character.MIN_SUPPLEMENTARY_CODE_POINT);
            if (a > hi) {
                continue;
            }
            any = true;
            int ha = Character.highSurrogate(a);
            int la = Character.lowSurrogate(a);
            int hb = Character.highSurrogate(hi);
            int lb = Character.lowSurrogate(hi);
            if (ha == hb) {
                partial.computeIfAbsent(ha, k -> new ArrayList<>()).addAll(List.of(la, lb));
                continue;
            }
            int fullFrom = ha;
            if (la != MIN_LOW) {
                partial.computeIfAbsent(ha, k -> new ArrayList<>()).addAll(List.of(la, MAX_LOW));
                fullFrom = ha + 1;
            }
            int fullTo = hb;
            if (lb != MAX_LOW) {
                partial.computeIfAbsent(hb, k -> new ArrayList<>()).addAll(List.of(MIN_LOW, lb));
                fullTo = hb - 1;
            }
            if (fullFrom <= fullTo) {
                fullHigh.add(new int[] {fullFrom, fullTo});
            }
        }
        if (!any) {
            return Automaton.makeEmpty();
        }
        if (!fullHigh.isEmpty()) {
            State full = new State();
            full.addTransition(new Transition((char) MIN_LOW, (char) MAX_LOW, fin));
            for (int[] h : fullHigh) {
                init.addTransition(new Transition((char) h[0], (char) h[1], full));
            }
        }
        Map<List<Integer>, State> byLows = new HashMap<>();
        for (Map.Entry<Integer, List<Integer>> en : partial.entrySet()) {
            State mid = byLows.computeIfAbsent(en.getValue(), lowsList -> {
                State st = new State();
                for (int k = 0; k < lowsList.size(); k += 2) {
                    st.addTransition(new Transition((char) (int) lowsList.get(k), (char) (int) lowsList.get(k + 1), fin));
                }
                return st;
            });
            char h = (char) (int) en.getKey();
            init.addTransition(new Transition(h, h, mid));
        }
        Automaton a = new Automaton();
        a.setInitialState(init);
        a.setDeterministic(true);
        return a;
    }

    private static boolean bmp(State init, State fin, int lo, int hi) {
        if (lo > hi) {
            return false;
        }
        init.addTransition(new Transition((char) lo, (char) hi, fin));
        return true;
    }

    /** A literal; with {@code ignoreCase} each ASCII letter matches both cases. */
    static Automaton text(String s, boolean ignoreCase) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
                i++;
            } else if (Character.isSurrogate(c)) {
                return Automaton.makeEmpty();
            }
        }
        if (!ignoreCase) {
            return Automaton.makeString(s);
        }
        State init = new State();
        State cur = init;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            State next = new State();
            if (c < 128 && Character.isLetter(c)) {
                char lower = Character.toLowerCase(c);
                char upper = Character.toUpperCase(c);
                cur.addTransition(new Transition(lower, next));
                cur.addTransition(new Transition(upper, next));
            } else {
                cur.addTransition(new Transition(c, next));
            }
            cur = next;
        }
        cur.setAccept(true);
        Automaton a = new Automaton();
        a.setInitialState(init);
        a.setDeterministic(true);
        return a;
    }
}
