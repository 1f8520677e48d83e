package dev.espalier.regex;

import dev.espalier.grammar.CodePointSet;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.function.IntPredicate;

/**
 * The code-point sets behind {@code \p{...}}, {@code \d}, {@code \w}, {@code \s} and {@code .},
 * computed from the JVM's own Unicode tables ({@link Character#getType(int)},
 * {@link Character.UnicodeScript}) by one scan over all code points and cached per property.
 */
final class PropertySets {

    /** ECMA-262 DecimalDigit. */
    static final CodePointSet DIGIT = CodePointSet.range('0', '9');

    /** ECMA-262 WordCharacters without the ignore-case extension: {@code [A-Za-z0-9_]}. */
    static final CodePointSet WORD = CodePointSet.ofRanges('0', '9', 'A', 'Z', '_', '_', 'a', 'z');

    /** ECMA-262 LineTerminator: LF, CR, LINE SEPARATOR, PARAGRAPH SEPARATOR. */
    static final CodePointSet LINE_TERMINATOR = CodePointSet.ofRanges('\n', '\n', '\r', '\r', 0x2028, 0x2029);

    /** What {@code .} matches without the s flag: every code point except line terminators. */
    static final CodePointSet DOT = LINE_TERMINATOR.complement();

    private static final Map<String, Long> CATEGORIES = new HashMap<>();
    private static final Map<String, CodePointSet> CACHE = new ConcurrentHashMap<>();
    private static volatile CodePointSet space;

    static {
        category(bit(Character.UPPERCASE_LETTER), "Lu", "Uppercase_Letter");
        category(bit(Character.LOWERCASE_LETTER), "Ll", "Lowercase_Letter");
        category(bit(Character.TITLECASE_LETTER), "Lt", "Titlecase_Letter");
        category(bit(Character.UPPERCASE_LETTER) | bit(Character.LOWERCASE_LETTER) | bit(Character.TITLECASE_LETTER),
                "LC", "Cased_Letter");
        category(bit(Character.MODIFIER_LETTER), "Lm", "Modifier_Letter");
        category(bit(Character.OTHER_LETTER), "Lo", "Other_Letter");
        category(bit(Character.UPPERCASE_LETTER) | bit(Character.LOWERCASE_LETTER) | bit(Character.TITLECASE_LETTER)
                | bit(Character.MODIFIER_LETTER) | bit(Character.OTHER_LETTER), "L", "Letter");
        category(bit(Character.NON_SPACING_MARK), "Mn", "Nonspacing_Mark");
        category(bit(Character.COMBINING_SPACING_MARK), "Mc", "Spacing_Mark");
        category(bit(Character.ENCLOSING_MARK), "Me", "Enclosing_Mark");
        category(bit(Character.NON_SPACING_MARK) | bit(Character.COMBINING_SPACING_MARK) | bit(Character.ENCLOSING_MARK),
                "M", "Mark", "Combining_Mark");
        category(bit(Character.DECIMAL_DIGIT_NUMBER), "Nd", "Decimal_Number", "digit");
        category(bit(Character.LETTER_NUMBER), "Nl", "Letter_Number");
        category(bit(Character.OTHER_NUMBER), "No", "Other_Number");
        category(bit(Character.DECIMAL_DIGIT_NUMBER) | bit(Character.LETTER_NUMBER) | bit(Character.OTHER_NUMBER),
                "N", "Number");
        category(bit(Character.CONNECTOR_PUNCTUATION), "Pc", "Connector_Punctuation");
        category(bit(Character.DASH_PUNCTUATION), "Pd", "Dash_Punctuation");
        category(bit(Character.START_PUNCTUATION), "Ps", "Open_Punctuation");
        category(bit(Character.END_PUNCTUATION), "Pe", "Close_Punctuation");
        category(bit(Character.INITIAL_QUOTE_PUNCTUATION), "Pi", "Initial_Punctuation");
        category(bit(Character.FINAL_QUOTE_PUNCTUATION), "Pf", "Final_Punctuation");
        category(bit(Character.OTHER_PUNCTUATION), "Po", "Other_Punctuation");
        category(bit(Character.CONNECTOR_PUNCTUATION) | bit(Character.DASH_PUNCTUATION)
                | bit(Character.START_PUNCTUATION) | bit(Character.END_PUNCTUATION)
                | bit(Character.INITIAL_QUOTE_PUNCTUATION) | bit(Character.FINAL_QUOTE_PUNCTUATION)
                | bit(Character.OTHER_PUNCTUATION), "P", "Punctuation", "punct");
        category(bit(Character.MATH_SYMBOL), "Sm", "Math_Symbol");
        category(bit(Character.CURRENCY_SYMBOL), "Sc", "Currency_Symbol");
        category(bit(Character.MODIFIER_SYMBOL), "Sk", "Modifier_Symbol");
        category(bit(Character.OTHER_SYMBOL), "So", "Other_Symbol");
        category(bit(Character.MATH_SYMBOL) | bit(Character.CURRENCY_SYMBOL) | bit(Character.MODIFIER_SYMBOL)
                | bit(Character.OTHER_SYMBOL), "S", "Symbol");
        category(bit(Character.SPACE_SEPARATOR), "Zs", "Space_Separator");
        category(bit(Character.LINE_SEPARATOR), "Zl", "Line_Separator");
        category(bit(Character.PARAGRAPH_SEPARATOR), "Zp", "Paragraph_Separator");
        category(bit(Character.SPACE_SEPARATOR) | bit(Character.LINE_SEPARATOR) | bit(Character.PARAGRAPH_SEPARATOR),
                "Z", "Separator");
        category(bit(Character.CONTROL), "Cc", "Control", "cntrl");
        category(bit(Character.FORMAT), "Cf", "Format");
        category(bit(Character.SURROGATE), "Cs", "Surrogate");
        category(bit(Character.PRIVATE_USE), "Co", "Private_Use");
        category(bit(Character.UNASSIGNED), "Cn", "Unassigned");
        category(bit(Character.CONTROL) | bit(Character.FORMAT) | bit(Character.SURROGATE)
                | bit(Character.PRIVATE_USE) | bit(Character.UNASSIGNED), "C", "Other");
    }

    private PropertySets() {
    }

    private static long bit(int type) {
        return 1L << type;
    }

    private static void category(long mask, String... names) {
        for (String n : names) {
            CATEGORIES.put(n, mask);
        }
    }

    /**
     * ECMA-262 WhiteSpace plus LineTerminator, the set of {@code \s}: TAB, VT, FF, ZWNBSP (U+FEFF),
     * every Zs code point (which includes SPACE and NBSP), LF, CR, U+2028, U+2029.
     */
    static CodePointSet space() {
        CodePointSet s = space;
        if (s == null) {
            s = generalCategory("Zs")
                    .union(CodePointSet.ofRanges('\t', '\t', 0x0B, 0x0C, 0xFEFF, 0xFEFF))
                    .union(LINE_TERMINATOR);
            space = s;
        }
        return s;
    }

    /** The set of a general category given by short or long name, or null when unknown. */
    static CodePointSet generalCategory(String name) {
        Long mask = CATEGORIES.get(name);
        if (mask == null) {
            return null;
        }
        long m = mask;
        return CACHE.computeIfAbsent("gc=" + name, k -> scan(cp -> (m & bit(Character.getType(cp))) != 0));
    }

    /** The set of a script (long name or ISO 15924 code, case-insensitive), or null when unknown. */
    static CodePointSet script(String name) {
        Character.UnicodeScript script;
        try {
            script = Character.UnicodeScript.forName(name);
        } catch (IllegalArgumentException e) {
            return null;
        }
        return CACHE.computeIfAbsent("sc=" + script.name(), k -> scan(cp -> Character.UnicodeScript.of(cp) == script));
    }

    /** A supported binary property by its exact Unicode name, or null when unknown or unsupported. */
    static CodePointSet binary(String name) {
        switch (name) {
            case "Any":
                return CodePointSet.ALL;
            case "ASCII":
                return CodePointSet.range(0, 0x7F);
            case "Assigned":
                return CACHE.computeIfAbsent("Assigned", k -> scan(cp -> Character.getType(cp) != Character.UNASSIGNED));
            case "Alphabetic":
                return CACHE.computeIfAbsent(name, k -> scan(Character::isAlphabetic));
            case "Lowercase":
                return CACHE.computeIfAbsent(name, k -> scan(Character::isLowerCase));
            case "Uppercase":
                return CACHE.computeIfAbsent(name, k -> scan(Character::isUpperCase));
            case "Ideographic":
                return CACHE.computeIfAbsent(name, k -> scan(Character::isIdeographic));
            case "White_Space":
                // Unicode PropList.txt White_Space (Unicode 13, from memory): the ECMA \s set minus
                // U+FEFF, plus NEL U+0085.
                CodePointSet ecmaSpace = space(); // outside computeIfAbsent: no nested map updates
                return CACHE.computeIfAbsent(name, k -> ecmaSpace
                        .minus(CodePointSet.of(0xFEFF)).union(CodePointSet.of(0x85)));
            default:
                return null;
        }
    }

    private static CodePointSet scan(IntPredicate member) {
        int[] pairs = new int[64];
        int n = 0;
        int start = -1;
        for (int cp = 0; cp <= CodePointSet.MAX + 1; cp++) {
            boolean in = cp <= CodePointSet.MAX && member.test(cp);
            if (in && start < 0) {
                start = cp;
            } else if (!in && start >= 0) {
                if (n + 2 > pairs.length) {
                    pairs = java.util.Arrays.copyOf(pairs, pairs.length * 2);
                }
                pairs[n++] = start;
                pairs[n++] = cp - 1;
                start = -1;
            }
        }
        return CodePointSet.ofRanges(java.util.Arrays.copyOf(pairs, n));
    }
}
