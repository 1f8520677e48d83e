package dev.espalier.lsp;

import org.eclipse.lsp4j.TextEdit;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/** Applies LSP text edits to a text, as an editor does (all ranges refer to the original text). */
final class Edits {

    private Edits() {
    }

    static String apply(String text, List<? extends TextEdit> edits) {
        DocumentSnapshot doc = new DocumentSnapshot("file:///edit", "", 0, text);
        List<int[]> spans = new ArrayList<>();
        List<String> replacements = new ArrayList<>();
        for (TextEdit e : edits) {
            spans.add(new int[] {doc.offset(e.getRange().getStart()), doc.offset(e.getRange().getEnd()), spans.size()});
            replacements.add(e.getNewText());
        }
        spans.sort(Comparator.comparingInt((int[] s) -> s[0]).reversed());
        StringBuilder sb = new StringBuilder(text);
        for (int[] s : spans) {
            sb.replace(s[0], s[1], replacements.get(s[2]));
        }
        return sb.toString();
    }
}
