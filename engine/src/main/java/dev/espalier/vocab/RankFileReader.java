package dev.espalier.vocab;

import java.nio.charset.StandardCharsets;
import java.util.Base64;
import java.util.Map;

/** Reads rank files: one {@code base64 rank} pair per line, the rank being the token id. */
final class RankFileReader {

    private RankFileReader() {
    }

    static Vocabulary read(byte[] data, String name, Map<String, Integer> specialTokens, String endOfSequence) {
        TokenTable table = new TokenTable();
        Base64.Decoder base64 = Base64.getDecoder();
        int line = 0;
        int pos = 0;
        int n = data.length;
        if (n >= 3 && (data[0] & 0xFF) == 0xEF && (data[1] & 0xFF) == 0xBB && (data[2] & 0xFF) == 0xBF) {
            pos = 3;
        }
        while (pos < n) {
            line++;
            int end = pos;
            while (end < n && data[end] != '\n') {
                end++;
            }
            int next = end + 1;
            if (end > pos && data[end - 1] == '\r') {
                end--;
            }
            parseLine(data, pos, end, line, name, base64, table);
            pos = next;
        }
        int[] specialIds = new int[specialTokens.size()];
        int k = 0;
        int eos = -1;
        for (Map.Entry<String, Integer> e : specialTokens.entrySet()) {
            int id = e.getValue();
            if (id < 0 || id >= TokenTable.MAX_IDS) {
                throw new IllegalArgumentException("special token '" + e.getKey() + "' has an invalid id " + id);
            }
            byte[] b = e.getKey().getBytes(StandardCharsets.UTF_8);
            if (table.put(id, b, null) == TokenTable.Put.CONFLICT) {
                throw new VocabularyFormatException(name, table.origin(id),
                        "rank " + id + " is also the id of special token '" + TokenTable.snippet(e.getKey()) + "'");
            }
            specialIds[k++] = id;
        }
        if (endOfSequence != null) {
            Integer id = specialTokens.get(endOfSequence);
            if (id == null) {
                throw new IllegalArgumentException("end-of-sequence token '" + endOfSequence
                        + "' is not among the special tokens " + specialTokens.keySet());
            }
            eos = id;
        }
        if (table.size() == 0) {
            throw new VocabularyFormatException(name, null, "the file holds no tokens");
        }
        return Vocabulary.of(name, table.toArray(), specialIds, eos);
    }

    private static void parseLine(byte[] d, int from, int to, int line, String name, Base64.Decoder base64,
                                  TokenTable table) {
        int a = from;
        while (a < to && isBlank(d[a])) {
            a++;
        }
        if (a == to) {
            return; // blank line
        }
        int aEnd = a;
        while (aEnd < to && !isBlank(d[aEnd])) {
            aEnd++;
        }
        int r = aEnd;
        while (r < to && isBlank(d[r])) {
            r++;
        }
        int rEnd = r;
        while (rEnd < to && !isBlank(d[rEnd])) {
            rEnd++;
        }
        int rest = rEnd;
        while (rest < to && isBlank(d[rest])) {
            rest++;
        }
        String where = Integer.toString(line);
        if (r == to) {
            throw new VocabularyFormatException(name, where,
                    "expected '<base64 bytes> <rank>', found '" + text(d, a, to) + "'");
        }
        if (rest != to) {
            throw new VocabularyFormatException(name, where,
                    "expected '<base64 bytes> <rank>', found more fields: '" + text(d, a, to) + "'");
        }
        long rank = 0;
        boolean digits = true;
        boolean negative = d[r] == '-' && rEnd - r > 1;
        for (int i = negative ? r + 1 : r; i < rEnd; i++) {
            int c = d[i];
            if (c < '0' || c > '9') {
                digits = false;
                break;
            }
            rank = Math.min(rank * 10 + (c - '0'), Integer.MAX_VALUE + 1L);
        }
        if (!digits) {
            throw new VocabularyFormatException(name, where, "rank is not a number: '" + text(d, r, rEnd) + "'");
        }
        if (negative) {
            throw new VocabularyFormatException(name, where, "rank is negative: " + text(d, r, rEnd));
        }
        if (rank >= TokenTable.MAX_IDS) {
            throw new VocabularyFormatException(name, where,
                    "rank " + text(d, r, rEnd) + " exceeds the limit of " + TokenTable.MAX_IDS + " ids");
        }
        byte[] bytes;
        try {
            bytes = base64.decode(java.util.Arrays.copyOfRange(d, a, aEnd));
        } catch (IllegalArgumentException e) {
            throw new VocabularyFormatException(name, where, "token is not valid base64: '" + text(d, a, aEnd) + "'");
        }
        int id = (int) rank;
        if (table.put(id, bytes, where) == TokenTable.Put.CONFLICT) {
            throw new VocabularyFormatException(name, where,
                    "rank " + id + " was already given to different bytes on line " + table.origin(id));
        }
    }

    private static boolean isBlank(byte b) {
        return b == ' ' || b == '\t';
    }

    private static String text(byte[] d, int from, int to) {
        return TokenTable.snippet(new String(d, from, to - from, StandardCharsets.UTF_8));
    }
}
