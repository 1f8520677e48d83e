package dev.espalier.examples;

import dev.espalier.mask.Constraint;
import dev.espalier.mask.Cursor;
import dev.espalier.mask.TokenBits;
import dev.espalier.testing.TestVocabularies;
import dev.espalier.vocab.Vocabulary;
import org.junit.jupiter.api.Test;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The sampling loop shown in the README, kept compiling and correct here. The region between the
 * {@code README} markers is what the README shows.
 */
class SamplingLoopExample {

    static String generate(Vocabulary vocab, long seed) {
        // README begin
        Constraint tag = Constraint.regex(
                "Row [0-9]{2}, tree [0-9]{2}: (Amberglow|Copperbell) on RS-(7|9|12)", vocab);
        Cursor cursor = tag.start();                 // one per sequence; fork() for beams
        long[] mask = new long[vocab.maskWords()];
        float[] logits = new float[vocab.size()];
        Random model = new Random(seed);             // a stand-in for the forward pass
        ByteArrayOutputStream text = new ByteArrayOutputStream();
        while (!cursor.isFinished()) {
            byte[] forced = cursor.forcedBytes();    // the only way on: skip the model
            if (forced.length > 0) {
                cursor.feedBytes(forced);
                text.writeBytes(forced);
                continue;
            }
            for (int i = 0; i < logits.length; i++) {
                logits[i] = (float) model.nextGaussian();
            }
            // speculative decoding: a draft token is tried, then taken back when the verifier rejects it
            int draft = model.nextInt(vocab.size());
            if (cursor.tryFeed(draft)) {             // a refused draft leaves the cursor unchanged
                cursor.undo(1);                      // this stand-in verifier rejects every draft
            }
            cursor.fillMask(mask);                   // allocation-free once the state is cached
            int best = -1;
            for (int id = TokenBits.next(mask, 0); id >= 0; id = TokenBits.next(mask, id + 1)) {
                if (best < 0 || logits[id] > logits[best]) {
                    best = id;
                }
            }
            cursor.feed(best);                       // end of sequence only once the text is complete
            if (best != vocab.endOfSequence()) {
                text.writeBytes(vocab.bytes(best));
            }
        }
        return text.toString(StandardCharsets.UTF_8);
        // README end
    }

    @Test
    void everyOutputMatches() {
        Vocabulary vocab = TestVocabularies.builtin("cl100k");
        Pattern p = Pattern.compile("Row [0-9]{2}, tree [0-9]{2}: (Amberglow|Copperbell) on RS-(7|9|12)");
        for (long seed = 0; seed < 50; seed++) {
            String out = generate(vocab, seed);
            assertTrue(p.matcher(out).matches(), out); // reference: java.util.regex
        }
    }

    @Test
    void readmeShowsThisCode() throws Exception {
        Path readme = Path.of("..", "README.md");
        String code = Files.readString(Path.of("src/test/java/dev/espalier/examples/SamplingLoopExample.java"));
        String region = code.substring(code.indexOf("// README begin") + 15, code.indexOf("// README end"));
        String doc = Files.readString(readme);
        for (String line : region.strip().split("\n")) {
            assertTrue(doc.contains(line.strip()), "README lacks: " + line.strip());
        }
    }
}
