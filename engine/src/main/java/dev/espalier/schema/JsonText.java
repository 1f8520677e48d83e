package dev.espalier.schema;

import com.fasterxml.jackson.databind.JsonNode;
import java.math.BigDecimal;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashSet;
import java.util.Iterator;
import java.util.Map;
import java.util.Set;

/**
 * The canonical text of JSON values, which the compiled grammars accept and nothing else:
 * <ul>
 *   <li>strings: every character literal except {@code "} and {@code \} (written {@code \"} and
 *       {@code \\}), the short escapes {@code \b \f \n \r \t} for their control characters, and
 *       {@code \}{@code u00xx} with lowercase hexadecimal digits for the other characters below
 *       U+0020; so each string has exactly one text;</li>
 *   <li>numbers: no exponent, no {@code +}, no leading zeros, no trailing zeros in a fraction, no
 *       fraction at all for integral values, no {@code -0}: so {@code 1.0}, {@code 1e0} and
 *       {@code 10E-1} are all written {@code 1};</li>
 *   <li>white space per {@link SchemaOptions.Spacing}: none, or the two-space indented layout
 *       (one member or item per line, {@code ": "} after a name, {@code {}} and {@code []} for empty
 *       containers).</li>
 * </ul>
 */
final class JsonText {

    /** Deepest nesting a value may have to be written (deeper values have no text). */
    static final int MAX_DEPTH = 1_000;

    private JsonText() {
    }

    /** The canonical escaped form of one code point inside a string (without quotes). */
    static String encode(int cp) {
        switch (cp) {
            case '"':
                return "\\\"";
            case '\\':
                return "\\\\";
            case '\b':
                return "\\b";
            case '\f':
                return "\\f";
            case '\n':
                return "\\n";
            case '\r':
                return "\\r";
            case '\t':
                return "\\t";
            default:
                if (cp < 0x20) {
                    return String.format("\\u%04x", cp);
                }
                return new String(Character.toChars(cp));
        }
    }

    /** Whether a code point is written escaped. */
    static boolean escaped(int cp) {
        return cp < 0x20 || cp == '"' || cp == '\\';
    }

    /** The quoted canonical text of a string, or null when it holds an unpaired surrogate. */
    static String string(String s) {
        StringBuilder sb = new StringBuilder(s.length() + 2).append('"');
        for (int i = 0; i < s.length(); ) {
            int cp = s.codePointAt(i);
            if (cp >= 0xD800 && cp <= 0xDFFF) {
                return null;
            }
            sb.append(encode(cp));
            i += Character.charCount(cp);
        }
        return sb.append('"').toString();
    }

    /** The canonical text of a number value, or null for a non-finite one. */
    static String number(JsonNode n) {
        if ((n.isDouble() || n.isFloat()) && !Double.isFinite(n.doubleValue())) {
            return null;
        }
        return number(n.decimalValue());
    }

    static String number(BigDecimal d) {
        if (d.signum() == 0) {
            return "0";
        }
        BigDecimal s = d.stripTrailingZeros();
        return s.scale() <= 0 ? s.toBigIntegerExact().toString() : s.toPlainString();
    }

    /** Whether a number value is an integer (JSON Schema: a fraction of zero counts). */
    static boolean integral(JsonNode n) {
        if (n.isIntegralNumber()) {
            return true;
        }
        if ((n.isDouble() || n.isFloat()) && !Double.isFinite(n.doubleValue())) {
            return false;
        }
        BigDecimal d = n.decimalValue();
        return d.signum() == 0 || d.stripTrailingZeros().scale() <= 0;
    }

    /** Text of a scalar (null, boolean, number, string), or null when it has none. */
    static String scalar(JsonNode n) {
        if (n.isNull()) {
            return "null";
        }
        if (n.isBoolean()) {
            return n.booleanValue() ? "true" : "false";
        }
        if (n.isNumber()) {
            return number(n);
        }
        if (n.isTextual()) {
            return string(n.textValue());
        }
        return null;
    }

    /** The white space and punctuation of a layout at one nesting depth. */
    record Punct(String open, String sep, String close, String colon) {
    }

    /** Punctuation for the members or items of a container at {@code depth} (the container's own depth). */
    static Punct punct(SchemaOptions.Spacing spacing, int depth) {
        if (spacing == SchemaOptions.Spacing.COMPACT) {
            return new Punct("", ",", "", ":");
        }
        String inner = "\n" + "  ".repeat(depth + 1);
        return new Punct(inner, "," + inner, "\n" + "  ".repeat(depth), ": ");
    }

    /**
     * A value in its canonical text at {@code depth}, members in the value's own order; null when
     * the value has no text (unpaired surrogate, non-finite number, nesting past {@link #MAX_DEPTH}).
     */
    static String value(JsonNode root, SchemaOptions.Spacing spacing, int depth) {
        StringBuilder out = new StringBuilder();
        // explicit stack: items are JsonNode (with depth) or literal strings
        Deque<Object[]> stack = new ArrayDeque<>();
        stack.push(new Object[] {root, depth});
        while (!stack.isEmpty()) {
            Object[] top = stack.pop();
            if (top[0] instanceof String s) {
                out.append(s);
                continue;
            }
            JsonNode n = (JsonNode) top[0];
            int d = (Integer) top[1];
            if (d - depth > MAX_DEPTH) {
                return null;
            }
            if (n.isObject() || n.isArray()) {
                if (n.isEmpty()) {
                    out.append(n.isObject() ? "{}" : "[]");
                    continue;
                }
                Punct p = punct(spacing, d);
                Deque<Object[]> parts = new ArrayDeque<>();
                parts.add(new Object[] {(n.isObject() ? "{" : "[") + p.open()});
                boolean first = true;
                if (n.isObject()) {
                    for (Iterator<Map.Entry<String, JsonNode>> it = n.fields(); it.hasNext(); ) {
                        Map.Entry<String, JsonNode> e = it.next();
                        String key = string(e.getKey());
                        if (key == null) {
                            return null;
                        }
                        parts.add(new Object[] {(first ? "" : p.sep()) + key + p.colon()});
                        parts.add(new Object[] {e.getValue(), d + 1});
                        first = false;
                    }
                } else {
                    for (JsonNode item : n) {
                        if (!first) {
                            parts.add(new Object[] {p.sep()});
                        }
                        parts.add(new Object[] {item, d + 1});
                        first = false;
                    }
                }
                parts.add(new Object[] {p.close() + (n.isObject() ? "}" : "]")});
                for (Iterator<Object[]> it = parts.descendingIterator(); it.hasNext(); ) {
                    stack.push(it.next());
                }
                continue;
            }
            String s = scalar(n);
            if (s == null) {
                return null;
            }
            out.append(s);
        }
        return out.toString();
    }

    /**
     * JSON Schema equality of instances: numbers by value, objects regardless of member order,
     * arrays item by item.
     */
    static boolean same(JsonNode a, JsonNode b) {
        Deque<JsonNode[]> work = new ArrayDeque<>();
        work.push(new JsonNode[] {a, b});
        while (!work.isEmpty()) {
            JsonNode[] p = work.pop();
            JsonNode x = p[0];
            JsonNode y = p[1];
            if (x.isNumber() && y.isNumber()) {
                String sx = number(x);
                if (sx == null || !sx.equals(number(y))) {
                    return false;
                }
            } else if (x.isObject() && y.isObject()) {
                if (x.size() != y.size()) {
                    return false;
                }
                Set<String> names = new HashSet<>();
                x.fieldNames().forEachRemaining(names::add);
                for (String k : names) {
                    if (!y.has(k)) {
                        return false;
                    }
                    work.push(new JsonNode[] {x.get(k), y.get(k)});
                }
            } else if (x.isArray() && y.isArray()) {
                if (x.size() != y.size()) {
                    return false;
                }
                for (int i = 0; i < x.size(); i++) {
                    work.push(new JsonNode[] {x.get(i), y.get(i)});
                }
            } else if (x.isNumber() || y.isNumber() || x.isContainerNode() || y.isContainerNode()) {
                return false;
            } else if (!x.equals(y)) {
                return false;
            }
        }
        return true;
    }
}
