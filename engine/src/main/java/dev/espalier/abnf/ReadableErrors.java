package dev.espalier.abnf;

import java.util.ArrayList;
import java.util.List;
import org.antlr.v4.runtime.DefaultErrorStrategy;
import org.antlr.v4.runtime.InputMismatchException;
import org.antlr.v4.runtime.NoViableAltException;
import org.antlr.v4.runtime.Parser;
import org.antlr.v4.runtime.Token;
import org.antlr.v4.runtime.misc.IntervalSet;

/**
 * ANTLR's standard recovery (single-token deletion and insertion, then resynchronising on the
 * follow sets, which always contain the start of the next rule) with messages written for people:
 * token kinds are described in ABNF's words and the many tokens that can start an element are
 * summarised as one.
 */
final class ReadableErrors extends DefaultErrorStrategy {

    private static final IntervalSet ELEMENT_START = new IntervalSet(
            AbnfSyntaxParser.NAME, AbnfSyntaxParser.LPAREN, AbnfSyntaxParser.LBRACKET,
            AbnfSyntaxParser.CHAR_VAL, AbnfSyntaxParser.CASE_CHAR_VAL, AbnfSyntaxParser.NUM_VAL,
            AbnfSyntaxParser.PROSE_VAL, AbnfSyntaxParser.DIGITS, AbnfSyntaxParser.STAR);

    @Override
    protected void reportNoViableAlternative(Parser recognizer, NoViableAltException e) {
        Token t = e.getOffendingToken();
        recognizer.notifyErrorListeners(t, "unexpected " + describe(t) + expecting(getExpectedTokens(recognizer)), e);
    }

    @Override
    protected void reportInputMismatch(Parser recognizer, InputMismatchException e) {
        Token t = e.getOffendingToken();
        recognizer.notifyErrorListeners(t, "unexpected " + describe(t) + expecting(e.getExpectedTokens()), e);
    }

    @Override
    protected void reportUnwantedToken(Parser recognizer) {
        if (inErrorRecoveryMode(recognizer)) {
            return;
        }
        beginErrorCondition(recognizer);
        Token t = recognizer.getCurrentToken();
        recognizer.notifyErrorListeners(t, "unexpected " + describe(t) + expecting(getExpectedTokens(recognizer)), null);
    }

    @Override
    protected void reportMissingToken(Parser recognizer) {
        if (inErrorRecoveryMode(recognizer)) {
            return;
        }
        beginErrorCondition(recognizer);
        Token t = recognizer.getCurrentToken();
        recognizer.notifyErrorListeners(t, "missing " + describeSet(getExpectedTokens(recognizer)) + " before " + describe(t), null);
    }

    private static String expecting(IntervalSet expected) {
        if (expected == null || expected.isNil()) {
            return "";
        }
        return "; expected " + describeSet(expected);
    }

    /** A token in words, e.g. {@code rule name 'date'} or {@code ')'}. */
    static String describe(Token t) {
        if (t == null || t.getType() == Token.EOF) {
            return "end of file";
        }
        String text = t.getText() == null ? "" : t.getText();
        if (text.length() > 40) {
            text = text.substring(0, 37) + "...";
        }
        return switch (t.getType()) {
            case AbnfSyntaxParser.DEF_NAME -> "start of rule '" + text + "'";
            case AbnfSyntaxParser.NAME -> "rule name '" + text + "'";
            case AbnfSyntaxParser.DIGITS -> "number '" + text + "'";
            case AbnfSyntaxParser.CHAR_VAL, AbnfSyntaxParser.CASE_CHAR_VAL -> "string " + text;
            case AbnfSyntaxParser.NUM_VAL -> "value " + text;
            case AbnfSyntaxParser.PROSE_VAL -> "prose " + text;
            default -> "'" + text + "'";
        };
    }

    /** A set of expected token kinds in words. */
    static String describeSet(IntervalSet set) {
        List<String> parts = new ArrayList<>();
        if (!set.and(ELEMENT_START).isNil()) {
            parts.add("an element (rule name, \"string\", %x value, group or option)");
        }
        for (int type : set.toArray()) {
            if (ELEMENT_START.contains(type)) {
                continue;
            }
            parts.add(switch (type) {
                case Token.EOF -> "end of file";
                case AbnfSyntaxParser.DEF_NAME -> "a rule definition (name = ...)";
                case AbnfSyntaxParser.EQUALS -> "'='";
                case AbnfSyntaxParser.EQUALS_SLASH -> "'=/'";
                case AbnfSyntaxParser.SLASH -> "'/'";
                case AbnfSyntaxParser.RPAREN -> "')'";
                case AbnfSyntaxParser.RBRACKET -> "']'";
                default -> AbnfSyntaxParser.VOCABULARY.getDisplayName(type);
            });
        }
        if (parts.size() <= 1) {
            return parts.isEmpty() ? "something else" : parts.get(0);
        }
        return String.join(", ", parts.subList(0, parts.size() - 1)) + " or " + parts.get(parts.size() - 1);
    }
}
