package dev.espalier.vocab;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.util.zip.GZIPInputStream;

/** Stream helpers: gzip detection by magic bytes. */
final class Inputs {

    private Inputs() {
    }

    /** {@code in}, decompressed if it starts with the gzip magic bytes 1F 8B (RFC 1952). */
    static BufferedInputStream gunzipIfNeeded(InputStream in) throws IOException {
        BufferedInputStream b = in instanceof BufferedInputStream bi ? bi : new BufferedInputStream(in, 1 << 16);
        b.mark(2);
        int m0 = b.read();
        int m1 = b.read();
        b.reset();
        if (m0 == 0x1F && m1 == 0x8B) {
            return new BufferedInputStream(new GZIPInputStream(b, 1 << 16), 1 << 16);
        }
        return b;
    }

    /** Whether the stream's first byte other than white space and a byte-order mark is '{'. */
    static boolean looksLikeJsonObject(BufferedInputStream in) throws IOException {
        in.mark(4096);
        try {
            for (int i = 0; i < 4096; i++) {
                int c = in.read();
                if (c == ' ' || c == '\t' || c == '\r' || c == '\n' || c == 0xEF || c == 0xBB || c == 0xBF) {
                    continue;
                }
                return c == '{';
            }
            return false;
        } finally {
            in.reset();
        }
    }
}
