package dev.espalier.earley;

import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Deque;
import java.util.List;

/**
 * One derivation of an input, in terms of the grammar's named rules: every node is a rule with the
 * byte span it matched, and the text between nested rules appears as text leaves. Helper
 * nonterminals of the lowering (groups, repetitions, options) do not appear.
 */
public final class ParseTree {

    /**
     * A node of a parse tree: a rule (with {@link #rule()} non-null) or a text leaf.
     */
    public static final class Node {
        private final String rule;
        private final int start;
        private int end;
        private String text;
        final List<Node> children = new ArrayList<>();

        Node(String rule, int start, int end) {
            this.rule = rule;
            this.start = start;
            this.end = end;
        }

        /** The rule's name as written in the grammar, or null for a text leaf. */
        public String rule() {
            return rule;
        }

        /** Whether this is a text leaf. */
        public boolean isText() {
            return rule == null;
        }

        /** Byte offset where the match starts. */
        public int start() {
            return start;
        }

        /** Byte offset just past the match. */
        public int end() {
            return end;
        }

        /** The matched text (UTF-8 decoded; malformed bytes become U+FFFD). */
        public String text() {
            return text;
        }

        /** The nested rules and text leaves, in input order (empty for a leaf). */
        public List<Node> children() {
            return Collections.unmodifiableList(children);
        }

        void addByte(int at, List<Node> all) {
            if (!children.isEmpty()) {
                Node last = children.get(children.size() - 1);
                if (last.rule == null && last.end == at) {
                    last.end = at + 1;
                    return;
                }
            }
            Node leaf = new Node(null, at, at + 1);
            children.add(leaf);
            all.add(leaf);
        }

        void finish(byte[] input) {
            text = decode(input, start, end);
        }
    }

    private final Node root;

    ParseTree(Node root) {
        this.root = root;
    }

    /** The start rule's node. */
    public Node root() {
        return root;
    }

    /**
     * An indented rendering: one line per node, two spaces per level; rules as
     * {@code name [start,end)}, text leaves as JSON string literals.
     */
    public String toText() {
        StringBuilder sb = new StringBuilder();
        Deque<Object[]> stack = new ArrayDeque<>();
        stack.push(new Object[] {root, 0});
        while (!stack.isEmpty()) {
            Object[] fr = stack.pop();
            Node n = (Node) fr[0];
            int depth = (Integer) fr[1];
            sb.append("  ".repeat(depth));
            if (n.rule == null) {
                quote(n.text, sb);
            } else {
                sb.append(n.rule).append(" [").append(n.start).append(',').append(n.end).append(')');
            }
            sb.append('\n');
            for (int i = n.children.size() - 1; i >= 0; i--) {
                stack.push(new Object[] {n.children.get(i), depth + 1});
            }
        }
        return sb.toString();
    }

    /**
     * A JSON rendering: rules as {@code {"rule":name,"start":s,"end":e,"children":[...]}}, text
     * leaves as {@code {"text":t,"start":s,"end":e}}.
     */
    public String toJson() {
        StringBuilder sb = new StringBuilder();
        Deque<Object> stack = new ArrayDeque<>();
        stack.push(root);
        while (!stack.isEmpty()) {
            Object o = stack.pop();
            if (o instanceof String s) {
                sb.append(s);
                continue;
            }
            Node n = (Node) o;
            if (n.rule == null) {
                sb.append("{\"text\":");
                quote(n.text, sb);
                sb.append(",\"start\":").append(n.start).append(",\"end\":").append(n.end).append('}');
                continue;
            }
            sb.append("{\"rule\":");
            quote(n.rule, sb);
            sb.append(",\"start\":").append(n.start).append(",\"end\":").append(n.end).append(",\"children\":[");
            stack.push("]}");
            for (int i = n.children.size() - 1; i >= 0; i--) {
                stack.push(n.children.get(i));
                if (i > 0) {
                    stack.push(",");
                }
            }
        }
        return sb.toString();
    }

    @Override
    public String toString() {
        return toText();
    }

    static String decode(byte[] input, int start, int end) {
        try {
            return StandardCharsets.UTF_8.newDecoder()
                    .onMalformedInput(CodingErrorAction.REPLACE)
                    .onUnmappableCharacter(CodingErrorAction.REPLACE)
                    .decode(ByteBuffer.wrap(input, start, end - start)).toString();
        } catch (CharacterCodingException e) {
            throw new IllegalStateException(e); // cannot happen with REPLACE
        }
    }

    private static void quote(String s, StringBuilder sb) {
        sb.append(dev.espalier.vocab.TokenText.jsonLiteral(s.getBytes(StandardCharsets.UTF_8)));
    }
}
