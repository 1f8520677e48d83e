package dev.espalier.earley;

import dev.espalier.grammar.CodePointSet;
import dev.espalier.grammar.Expr;
import dev.espalier.grammar.Grammar;
import dev.espalier.grammar.Rule;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The reference for recognition: the strings of a grammar up to a length, computed straight from
 * the IR by the textbook least-fixpoint reading of the rules (each rule's language grows until
 * nothing changes). Strings hold one char per byte (ISO-8859-1), so bytes compare exactly.
 * Deliberately simple and slow; meant for small test grammars only.
 */
final class NaiveLanguage {

    private final Grammar g;
    private final int maxLen;
    private final Map<String, Set<String>> lang = new HashMap<>();

    private NaiveLanguage(Grammar g, int maxLen) {
        this.g = g;
        this.maxLen = maxLen;
    }

    /** All strings of the start rule with at most {@code maxLen} bytes. */
    static Set<String> of(Grammar g, int maxLen) {
        NaiveLanguage n = new NaiveLanguage(g, maxLen);
        for (Rule r : g.rules()) {
            n.lang.put(r.key(), new HashSet<>());
        }
        boolean changed = true;
        while (changed) {
            changed = false;
            for (Rule r : g.rules()) {
                Set<String> s = n.eval(r.body());
                if (!s.equals(n.lang.get(r.key()))) {
                    n.lang.put(r.key(), s);
                    changed = true;
                }
            }
        }
        return n.lang.get(Grammar.key(g.start()));
    }

    /** Every prefix of every string in {@code words}. */
    static Set<String> prefixes(Set<String> words) {
        Set<String> out = new HashSet<>();
        for (String w : words) {
            for (int i = 0; i <= w.length(); i++) {
                out.add(w.substring(0, i));
            }
        }
        return out;
    }

    /** A byte string (one char per byte) of UTF-8 text. */
    static String bytes(String text) {
        return new String(text.getBytes(StandardCharsets.UTF_8), StandardCharsets.ISO_8859_1);
    }

    private Set<String> eval(Expr e) {
        if (e instanceof Expr.Seq s) {
            Set<String> acc = Set.of("");
            for (Expr x : s.items()) {
                acc = concat(acc, eval(x));
            }
            return acc;
        } else if (e instanceof Expr.Choice c) {
            Set<String> out = new HashSet<>();
            for (Expr x : c.options()) {
                out.addAll(eval(x));
            }
            return out;
        } else if (e instanceof Expr.Repeat r) {
            Set<String> body = eval(r.body());
            Set<String> out = new HashSet<>();
            Set<String> acc = Set.of("");
            int limit = r.unbounded() ? r.min() + maxLen + 1 : r.max();
            for (int k = 0; k <= limit; k++) {
                if (k >= r.min()) {
                    if (k > r.min() && out.containsAll(acc)) {
                        break; // later rounds only repeat what is there
                    }
                    out.addAll(acc);
                }
                acc = concat(acc, body);
            }
            return out;
        } else if (e instanceof Expr.Chars c) {
            Set<String> out = new HashSet<>();
            CodePointSet set = c.set();
            for (int i = 0; i < set.rangeCount(); i++) {
                for (int cp = set.lo(i); cp <= set.hi(i); cp++) {
                    if (cp >= 0xD800 && cp <= 0xDFFF) {
                        continue;
                    }
                    String b = bytes(new String(Character.toChars(cp)));
                    if (b.length() <= maxLen) {
                        out.add(b);
                    }
                }
            }
            return out;
        } else if (e instanceof Expr.Text t) {
            Set<String> acc = Set.of("");
            String s = t.text();
            for (int i = 0; i < s.length(); ) {
                int cp = s.codePointAt(i);
                i += Character.charCount(cp);
                Set<String> one = new HashSet<>();
                one.add(bytes(new String(Character.toChars(cp))));
                if (t.ignoreCase() && cp < 0x80 && Character.isLetter(cp)) {
                    one.add(String.valueOf((char) Character.toLowerCase(cp)));
                    one.add(String.valueOf((char) Character.toUpperCase(cp)));
                }
                acc = concat(acc, one);
            }
            return acc;
        } else if (e instanceof Expr.Ref r) {
            return lang.get(Grammar.key(r.name()));
        }
        throw new AssertionError(e);
    }

    private Set<String> concat(Set<String> a, Set<String> b) {
        // b grouped by length, so only pairs that fit are formed
        List<List<String>> byLen = new ArrayList<>();
        for (int i = 0; i <= maxLen; i++) {
            byLen.add(new ArrayList<>());
        }
        for (String y : b) {
            byLen.get(y.length()).add(y);
        }
        Set<String> out = new HashSet<>();
        for (String x : a) {
            for (int n = 0; x.length() + n <= maxLen; n++) {
                for (String y : byLen.get(n)) {
                    out.add(x + y);
                }
            }
        }
        return out;
    }
}
