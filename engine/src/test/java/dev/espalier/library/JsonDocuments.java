package dev.espalier.library;

import java.util.Random;

/** Random JSON documents of the orchard scenario (nested, with escapes, Unicode and numbers), and mutations. */
final class JsonDocuments {

    private static final String[] WORDS = {"tree", "variety", "rootstock", "row", "Amberglow", "Copperbell",
        "Frostkeeper", "Russet Vale", "Cinder Crest", "RS-9", "T-0042", "graft", "été", "果树", "🌳", ""};
    private static final String[] ESCAPES = {"\\\"", "\\\\", "\\/", "\\b", "\\f", "\\n", "\\r", "\\t", "\\u00e9",
        "\\uD83C\\uDF33", "\\u0000", "\\uFFFF"};
    private static final String[] WHITE = {"", "", "", " ", "\n", "\t", "\r\n", "  "};
    /** What mutations insert: structure, number parts, bad characters and near-miss literals. */
    private static final String[] PIECES = {"{", "}", "[", "]", ",", ":", "\"", "\\", "0", "01", "-", "+", ".", "e",
        "E", "true", "True", "nul", "NaN", "'", " ", "\t", "\u0001", "\u00a0", "\\x", "\\u12", "//", "é"};

    private JsonDocuments() {
    }

    /** A random JSON text (valid by construction). */
    static String document(Random rnd) {
        StringBuilder out = new StringBuilder();
        out.append(ws(rnd));
        value(out, rnd, 0);
        out.append(ws(rnd));
        return out.toString();
    }

    private static void value(StringBuilder out, Random rnd, int depth) {
        int kind = rnd.nextInt(depth > 4 ? 5 : 7);
        switch (kind) {
            case 0 -> out.append(new String[] {"true", "false", "null"}[rnd.nextInt(3)]);
            case 1, 2 -> number(out, rnd);
            case 3, 4 -> string(out, rnd);
            case 5 -> {
                out.append('[').append(ws(rnd));
                int n = rnd.nextInt(4);
                for (int i = 0; i < n; i++) {
                    if (i > 0) {
                        out.append(ws(rnd)).append(',').append(ws(rnd));
                    }
                    value(out, rnd, depth + 1);
                }
                out.append(ws(rnd)).append(']');
            }
            default -> {
                out.append('{').append(ws(rnd));
                int n = rnd.nextInt(4);
                for (int i = 0; i < n; i++) {
                    if (i > 0) {
                        out.append(ws(rnd)).append(',').append(ws(rnd));
                    }
                    string(out, rnd);
                    out.append(ws(rnd)).append(':').append(ws(rnd));
                    value(out, rnd, depth + 1);
                }
                out.append(ws(rnd)).append('}');
            }
        }
    }

    private static void number(StringBuilder out, Random rnd) {
        if (rnd.nextBoolean()) {
            out.append('-');
        }
        out.append(rnd.nextInt(4) == 0 ? "0" : String.valueOf(1 + rnd.nextInt(99999)));
        if (rnd.nextBoolean()) {
            out.append('.').append(rnd.nextInt(1000));
        }
        if (rnd.nextInt(3) == 0) {
            out.append(rnd.nextBoolean() ? 'e' : 'E').append(new String[] {"", "+", "-"}[rnd.nextInt(3)]).append(rnd.nextInt(40));
        }
    }

    private static void string(StringBuilder out, Random rnd) {
        out.append('"');
        int n = rnd.nextInt(4);
        for (int i = 0; i < n; i++) {
            out.append(rnd.nextInt(3) == 0 ? ESCAPES[rnd.nextInt(ESCAPES.length)] : WORDS[rnd.nextInt(WORDS.length)]);
        }
        out.append('"');
    }

    private static String ws(Random rnd) {
        return WHITE[rnd.nextInt(WHITE.length)];
    }

    /** One random edit of a document, at a code-point boundary: delete, insert or replace. */
    static String mutate(String doc, Random rnd) {
        int[] cps = doc.codePoints().toArray();
        int at = rnd.nextInt(cps.length + 1);
        String before = new String(cps, 0, at);
        int op = cps.length == 0 ? 1 : rnd.nextInt(3);
        int keep = op == 1 || at == cps.length ? at : at + 1;
        String after = new String(cps, keep, cps.length - keep);
        String piece = op == 0 ? "" : PIECES[rnd.nextInt(PIECES.length)];
        return before + piece + after;
    }
}
