package dev.espalier.mask;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.regex.RegexSyntax;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Token masks of regular expressions against an independent reference: java.util.regex. A token is
 * viable after a prefix when {@code matcher(prefix + token).matches() || hitEnd()} (the JDK reports
 * that more input could still lead to a match). Tokens that end inside a UTF-8 character are viable
 * when some completion of that character is; the candidate characters are one per interval of the
 * pattern's character-set boundaries (every character in such an interval behaves the same).
 */
class RegexMaskDifferentialTest {

    /** Our pattern and the same language in java.util.regex syntax. */
    static final String[][] PATTERNS = {
        {"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])", null},
        {"(Amberglow|Copperbell|Russet Vale)( on RS-[0-9]{1,2})?", null},
        {"[a-z ]{0,40}", null},
        {"\\d+(\\.\\d+)?([eE][+-]?\\d+)?", null},
        {"(ab|a)*c?", null},
        {"[a-zé€😀]{1,6}", null},
        {"\"([^\"\\\\]|\\\\[\"\\\\/bfnrt])*\"", null},
        {"(0|[1-9][0-9]*)", null},
        {"x{2,5}y*|z", null},
        {"[^a-z]{2}", null},
        {"\\p{Lu}\\p{Ll}+", null},
        {"[\\u00e0-\\u00ff]+\\u{1F34E}?", "[\\u00e0-\\u00ff]+\\x{1F34E}?"},
        {"tree-[0-9]{3}: (healthy|scab|canker|fire blight)", null},
    };

    /** {@code -Despalier.longTests=true} multiplies the prefixes per pattern. */
    static final int SCALE = Boolean.getBoolean("espalier.longTests") ? 10 : 1;

    @Test
    void cl100kMasksAgreeWithJavaUtilRegex() {
        run(TestVocabularies.builtin("cl100k"), 6 * SCALE, 101);
    }

    @Test
    void qwen3MasksAgreeWithJavaUtilRegex() {
        run(TestVocabularies.shared("qwen3"), 4 * SCALE, 202);
    }

    private void run(Vocabulary v, int prefixesPerPattern, long seed) {
        Random rnd = new Random(seed);
        long checks = 0;
        for (String[] p : PATTERNS) {
            String ours = p[0];
            Pattern java = Pattern.compile(p[1] == null ? p[0] : p[1]);
            Constraint c = Constraint.regex(ours, v);
            int[] boundaries = boundaries(RegexSyntax.parse(ours));
            for (byte[] prefix : prefixes(c, rnd, prefixesPerPattern)) {
                Oracle oracle = new Oracle(java, boundaries);
                Cursor cursor = c.start();
                boolean viable = oracle.viable(prefix);
                boolean fed = cursor.tryFeedBytes(prefix);
                assertEquals(viable, fed, () -> ours + " prefix " + show(prefix));
                checks++;
                if (!fed) {
                    continue;
                }
                long[] mask = new long[v.maskWords()];
                cursor.fillMask(mask);
                for (int id = 0; id < v.size(); id++) {
                    if (!v.has(id)) {
                        continue;
                    }
                    boolean expected;
                    if (id == v.endOfSequence()) {
                        expected = oracle.matches(prefix);
                    } else if (v.isSpecial(id) || v.length(id) == 0) {
                        expected = false;
                    } else {
                        byte[] t = v.bytes(id);
                        byte[] all = Arrays.copyOf(prefix, prefix.length + t.length);
                        System.arraycopy(t, 0, all, prefix.length, t.length);
                        expected = oracle.viable(all);
                    }
                    if (expected != TokenBits.get(mask, id)) {
                        fail(ours + " after " + show(prefix) + ": token " + id + " " + v.display(id)
                                + " expected " + expected);
                    }
                    checks++;
                }
            }
        }
        System.out.printf("regex masks vs java.util.regex on %s: %d (prefix, token) checks, 0 disagreements%n",
                v.name(), checks);
        assertTrue(checks > 100_000, "checks: " + checks);
    }

    /** Valid prefixes cut at random bytes of constrained outputs, and mutated (often invalid) ones. */
    static List<byte[]> prefixes(Constraint c, Random rnd, int n) {
        List<byte[]> out = new ArrayList<>();
        out.add(new byte[0]);
        for (int i = 0; i < n; i++) {
            byte[] s = MaskedSampler.sample(c, rnd, 64).bytes();
            byte[] cut = Arrays.copyOf(s, s.length == 0 ? 0 : rnd.nextInt(s.length + 1));
            out.add(cut);
            if (cut.length > 0 && i % 2 == 1) {
                byte[] bad = cut.clone();
                bad[rnd.nextInt(bad.length)] = (byte) rnd.nextInt(256);
                out.add(bad);
            }
        }
        return out;
    }

    /** Start points of the intervals on which every character set of the pattern is constant. */
    static int[] boundaries(Expr e) {
        TreeSet<Integer> points = new TreeSet<>(List.of(0, 0x80, 0x800, 0x10000));
        ArrayDeque<Expr> work = new ArrayDeque<>(List.of(e));
        while (!work.isEmpty()) {
            Expr x = work.pop();
            if (x instanceof Expr.Seq s) {
                work.addAll(s.items());
            } else if (x instanceof Expr.Choice ch) {
                work.addAll(ch.options());
            } else if (x instanceof Expr.Repeat r) {
                work.add(r.body());
            } else if (x instanceof Expr.Chars cs) {
                CodePointSet set = cs.set();
                for (int i = 0; i < set.rangeCount(); i++) {
                    points.add(set.lo(i));
                    points.add(Math.min(set.hi(i) + 1, CodePointSet.MAX));
                }
            } else if (x instanceof Expr.Text t) {
                t.text().codePoints().forEach(cp -> {
                    points.add(cp);
                    points.add(cp + 1);
                });
            }
        }
        return points.stream().mapToInt(Integer::intValue).toArray();
    }

    /** Viability of byte strings by java.util.regex. */
    static final class Oracle {
        private final Matcher m;
        private final int[] boundaries;
        private final Map<String, Boolean> memo = new HashMap<>();

        Oracle(Pattern p, int[] boundaries) {
            this.m = p.matcher("");
            this.boundaries = boundaries;
        }

        boolean matches(byte[] bytes) {
            String s = decode(bytes, bytes.length);
            return s != null && m.reset(s).matches();
        }

        boolean viable(byte[] bytes) {
            int tail = incompleteTail(bytes);
            if (tail < 0) {
                return false;
            }
            String s = decode(bytes, bytes.length - tail);
            if (s == null) {
                return false;
            }
            if (tail == 0) {
                return viableText(s);
            }
            // the code points whose encoding starts with the tail form one interval
            int[] range = completions(Arrays.copyOfRange(bytes, bytes.length - tail, bytes.length));
            String key = s + "\u0000" + range[0] + "-" + range[1];
            Boolean known = memo.get(key);
            if (known != null) {
                return known;
            }
            boolean any = false;
            for (int cp : candidates(range[0], range[1])) {
                if (viableText(s + new String(Character.toChars(cp)))) {
                    any = true;
                    break;
                }
            }
            memo.put(key, any);
            return any;
        }

        private boolean viableText(String s) {
            m.reset(s);
            return m.matches() || m.hitEnd();
        }

        private List<Integer> candidates(int lo, int hi) {
            List<Integer> out = new ArrayList<>();
            out.add(lo);
            for (int b : boundaries) {
                if (b > lo && b <= hi) {
                    out.add(b);
                }
            }
            out.removeIf(cp -> cp >= 0xD800 && cp <= 0xDFFF);
            if (lo <= 0xDFFF && hi > 0xDFFF) {
                out.add(0xE000);
            }
            return out;
        }
    }

    /** Length of an incomplete but well-begun UTF-8 character at the end, 0 if none, -1 if malformed. */
    static int incompleteTail(byte[] b) {
        for (int back = 1; back <= Math.min(3, b.length); back++) {
            int x = b[b.length - back] & 0xFF;
            if (x >= 0x80 && x < 0xC0) {
                continue;
            }
            int need = x < 0x80 ? 1 : x >= 0xC2 && x <= 0xDF ? 2 : x >= 0xE0 && x <= 0xEF ? 3 : x >= 0xF0 && x <= 0xF4 ? 4 : -1;
            if (need < 0) {
                return -1;
            }
            if (need > back) {
                // check the tail's continuation bytes are allowed for this lead (Unicode Table 3-7)
                int[] r = completions(Arrays.copyOfRange(b, b.length - back, b.length));
                return r.length == 0 ? -1 : back;
            }
            return 0;
        }
        return 0;
    }

    /** The code points whose UTF-8 encoding starts with {@code tail}, as [lo, hi]; null if none. */
    static int[] completions(byte[] tail) {
        return COMPLETIONS.computeIfAbsent(Arrays.toString(tail), k -> scanCompletions(tail)).clone();
    }

    private static final Map<String, int[]> COMPLETIONS = new java.util.concurrent.ConcurrentHashMap<>();

    private static int[] scanCompletions(byte[] tail) {
        int lo = Integer.MAX_VALUE;
        int hi = -1;
        int lead = tail[0] & 0xFF;
        int from = lead < 0xE0 ? 0x80 : lead < 0xF0 ? 0x800 : 0x10000;
        int to = lead < 0xE0 ? 0x7FF : lead < 0xF0 ? 0xFFFF : 0x10FFFF;
        // intervals are contiguous; find the ends by encoding the range's extreme completions
        for (int cp = from; cp <= to; cp++) {
            if (cp >= 0xD800 && cp <= 0xDFFF) {
                cp = 0xDFFF;
                continue;
            }
            byte[] e = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
            boolean starts = true;
            for (int i = 0; i < tail.length; i++) {
                if (e[i] != tail[i]) {
                    starts = false;
                    break;
                }
            }
            if (starts) {
                lo = Math.min(lo, cp);
                hi = cp;
            } else if (hi >= 0) {
                break;
            } else if ((e[0] & 0xFF) > lead) {
                break;
            }
        }
        return hi < 0 ? new int[0] : new int[] {lo, hi};
    }

    private static String decode(byte[] b, int len) {
        try {
            return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(b, 0, len)).toString();
        } catch (CharacterCodingException e) {
            return null;
        }
    }

    static String show(byte[] b) {
        return dev.espalier.vocab.TokenText.jsonLiteral(b) + " " + Arrays.toString(b);
    }
}
