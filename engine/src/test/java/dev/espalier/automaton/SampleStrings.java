package dev.espalier.automaton;

import dk.brics.automaton.Automaton;
import dk.brics.automaton.State;
import dk.brics.automaton.Transition;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Test strings for differential checks: random walks through an automaton (mostly members of its
 * language), random mutations of those (mostly near misses), and random strings over an alphabet.
 * Only well-formed UTF-16 is produced (no lone surrogates), since the reference engine and the
 * automata deliberately differ on lone surrogates.
 */
public final class SampleStrings {

    private final Random random;
    private final int[] alphabet;

    /**
     * @param seed     fixed seed, so every run tests the same strings
     * @param alphabet code points to draw from (surrogates are skipped)
     */
    public SampleStrings(long seed, int[] alphabet) {
        this.random = new Random(seed);
        this.alphabet = java.util.Arrays.stream(alphabet)
                .filter(cp -> cp < Character.MIN_SURROGATE || cp > Character.MAX_SURROGATE).distinct().toArray();
    }

    /** Code points of {@code text} plus a fixed set of awkward extras (line terminators, NBSP, BOM, emoji). */
    public static int[] alphabetOf(String text) {
        String extras = "aZz09_ -.\n\r\t\u000B\f\u00A0\u0085\u2028\u2029\uFEFF\u3000\u00E9\u0416\u4E2D"
                + "\uD83D\uDE00\uD83D\uDE4F\uD83C\uDF4E\uD835\uDC9C\uD840\uDC00";
        return (text + extras).codePoints().toArray();
    }

    /** A random string: a walk, a mutated walk, or alphabet noise, in equal shares. */
    public String next(Automaton automaton) {
        int kind = random.nextInt(3);
        if (kind == 0) {
            return walk(automaton, 24);
        }
        if (kind == 1) {
            return mutate(walk(automaton, 24));
        }
        return noise(random.nextInt(12));
    }

    /** A random walk from the initial state, stopping at accepting states with some probability. */
    public String walk(Automaton automaton, int maxChars) {
        StringBuilder sb = new StringBuilder();
        State s = automaton.getInitialState();
        while (sb.length() < maxChars) {
            if (s.isAccept() && random.nextInt(4) == 0) {
                break;
            }
            List<Transition> ts = s.getSortedTransitions(false);
            if (ts.isEmpty()) {
                break;
            }
            Transition t = ts.get(random.nextInt(ts.size()));
            sb.append(pick(t.getMin(), t.getMax()));
            s = t.getDest();
        }
        if (sb.length() > 0 && Character.isHighSurrogate(sb.charAt(sb.length() - 1))) {
            sb.setLength(sb.length() - 1);
        }
        return sb.toString();
    }

    private char pick(char lo, char hi) {
        int span = hi - lo + 1;
        switch (random.nextInt(6)) {
            case 0:
                return lo;
            case 1:
                return hi;
            default:
                return (char) (lo + random.nextInt(span));
        }
    }

    /** One to three random edits on code points: insert, delete, replace, duplicate a slice. */
    public String mutate(String s) {
        List<Integer> cps = new ArrayList<>();
        s.codePoints().forEach(cps::add);
        int edits = 1 + random.nextInt(3);
        for (int e = 0; e < edits; e++) {
            int op = random.nextInt(4);
            int at = random.nextInt(cps.size() + 1);
            if (op == 0 || cps.isEmpty()) {
                cps.add(at, letter());
            } else if (op == 1) {
                cps.remove(Math.min(at, cps.size() - 1));
            } else if (op == 2) {
                cps.set(Math.min(at, cps.size() - 1), letter());
            } else {
                int from = random.nextInt(cps.size());
                int to = from + random.nextInt(cps.size() - from) + 1;
                cps.addAll(to, new ArrayList<>(cps.subList(from, to)));
            }
        }
        StringBuilder sb = new StringBuilder();
        cps.forEach(sb::appendCodePoint);
        return sb.toString();
    }

    /** {@code length} code points from the alphabet. */
    public String noise(int length) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < length; i++) {
            sb.appendCodePoint(letter());
        }
        return sb.toString();
    }

    private int letter() {
        return alphabet[random.nextInt(alphabet.length)];
    }
}
