package dev.espalier.cli;

import dev.espalier.mask.Cursor;
import dev.espalier.mask.TokenBits;
import dev.espalier.vocab.TokenText;
import dev.espalier.vocab.Vocabulary;

import java.io.PrintWriter;

/** Prints allowed-token listings. */
final class Listing {

    private Listing() {
    }

    /** Prints the count, end-of-sequence verdict, forced continuation and up to {@code limit} tokens. */
    static void print(PrintWriter out, Cursor cursor, int limit) {
        Vocabulary v = cursor.constraint().vocabulary();
        long[] mask = new long[v.maskWords()];
        cursor.fillMask(mask);
        int count = TokenBits.count(mask);
        int eos = v.endOfSequence();
        boolean eosAllowed = eos >= 0 && TokenBits.get(mask, eos);
        out.printf("allowed: %d of %d tokens; end of sequence %s%n", count, v.tokenCount(),
                eosAllowed ? "allowed (the text is complete)" : "not allowed");
        byte[] forced = cursor.forcedBytes();
        if (forced.length > 0) {
            out.println("forced continuation: " + TokenText.escape(forced));
        }
        int shown = 0;
        for (int id = TokenBits.next(mask, 0); id >= 0 && shown < limit; id = TokenBits.next(mask, id + 1)) {
            out.printf("%9d  %s%s%n", id, v.display(id), id == eos ? "  (end of sequence)" : "");
            shown++;
        }
        if (count > shown) {
            out.printf("      ...  and %d more (--limit N shows more, --ids lists all ids)%n", count - shown);
        }
    }
}
