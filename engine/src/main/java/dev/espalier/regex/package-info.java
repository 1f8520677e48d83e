/**
 * The regular-expression front end: {@link dev.espalier.regex.RegexSyntax#parse(String)} turns
 * pattern text in the standard (ECMA-262, Unicode mode) syntax into the grammar IR, or fails with a
 * {@link dev.espalier.regex.RegexSyntaxException} that carries the offset of the offending text.
 */
package dev.espalier.regex;
