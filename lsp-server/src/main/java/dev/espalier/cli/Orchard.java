package dev.espalier.cli;

import java.util.ArrayList;
import java.util.List;

/** Demo data of our orchard scenario (invented names only). */
final class Orchard {

    private Orchard() {
    }

    /** Invented apple and pear variety names: 20 first parts × 10 second parts = 200 names. */
    static List<String> varieties() {
        String[] first = {"Amber", "Copper", "Frost", "Russet", "Gilded", "Crimson", "Silver", "Morning", "Hollow",
            "Winter", "Meadow", "Cinder", "Briar", "Ember", "Willow", "Harvest", "Lantern", "Pebble", "Thistle", "Marrow"};
        String[] second = {"glow", "bell", "keeper", "crest", "vale", "spire", "drop", "heart", "field", "moon"};
        List<String> out = new ArrayList<>();
        for (String f : first) {
            for (String s : second) {
                out.add(f + s);
            }
        }
        return out;
    }

    /** A nursery tag line: row, tree, variety, rootstock and graft date. */
    static final String TAG_PATTERN = "Row (0[1-9]|1[0-9]|20), tree (0[1-9]|[1-4][0-9]): "
            + "(Amberglow|Copperbell|Frostkeeper|Russet Vale|Cinder Crest) on RS-(7|9|12|26), "
            + "grafted 20(1[5-9]|2[0-6])-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])";
}
