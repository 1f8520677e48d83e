/*
 * ABNF as defined by RFC 5234 section 4 ("ABNF Definition of ABNF"), with the case-sensitive and
 * case-insensitive string forms of RFC 7405 (%s"..." and %i"...").
 *
 * The syntax is read liberally:
 *  - line ends may be LF, CRLF or CR; tabs count as white space; the last line needs no line end;
 *  - white space, line ends and comments are hidden tokens, so a rule's elements may continue on
 *    any later line. The front end (Abnf) restores the RFC's line structure itself: a rule name that
 *    is the first token of its line and is followed by "=" or "=/" is re-typed to DEF_NAME before
 *    parsing, and a continuation line that is not indented is reported;
 *  - num-vals, quoted strings and prose are lexed generously (any letters or digits after %b, %d,
 *    %x; strings and prose running to the end of the line when unterminated) so that the front end
 *    can report bad values with their exact range instead of a bare syntax error.
 */
grammar AbnfSyntax;

tokens { DEF_NAME }

// ---- parser (RFC 5234 section 4 rule names in comments) ----

// rulelist = 1*( rule / (*c-wsp c-nl) )
rulelist : ruleDefinition* EOF ;

// rule = rulename defined-as elements c-nl
ruleDefinition : DEF_NAME definedAs alternation ;

// defined-as = *c-wsp ("=" / "=/") *c-wsp
definedAs : EQUALS | EQUALS_SLASH ;

// alternation = concatenation *(*c-wsp "/" *c-wsp concatenation)
alternation : concatenation (SLASH concatenation)* ;

// concatenation = repetition *(1*c-wsp repetition)
concatenation : repetition+ ;

// repetition = [repeat] element
// element = rulename / group / option / char-val / num-val / prose-val
// (element is folded into repetition to keep the parser's call depth per nesting level small)
repetition
    : repeat? NAME                              # refElement
    | repeat? LPAREN alternation RPAREN         # groupElement
    | repeat? LBRACKET alternation RBRACKET     # optionElement
    | repeat? (CHAR_VAL | CASE_CHAR_VAL)        # charValElement
    | repeat? NUM_VAL                           # numValElement
    | repeat? PROSE_VAL                         # proseValElement
    ;

// repeat = 1*DIGIT / (*DIGIT "*" *DIGIT)
repeat : DIGITS | DIGITS? STAR DIGITS? ;

// ---- lexer ----

// rulename = ALPHA *(ALPHA / DIGIT / "-")
NAME : [A-Za-z] [A-Za-z0-9-]* ;

EQUALS_SLASH : '=/' ;
EQUALS : '=' ;
SLASH : '/' ;
STAR : '*' ;
DIGITS : [0-9]+ ;
LPAREN : '(' ;
RPAREN : ')' ;
LBRACKET : '[' ;
RBRACKET : ']' ;

// char-val = DQUOTE *(%x20-21 / %x23-7E) DQUOTE  (read liberally: anything but a quote or line end)
CHAR_VAL : '"' ~["\r\n]* '"' ;
// RFC 7405: case-sensitive-string = "%s" quoted-string; case-insensitive-string = [ "%i" ] quoted-string
CASE_CHAR_VAL : '%' [sSiI] '"' ~["\r\n]* '"' ;
// a string missing its closing quote: the front end reports it and reads it to the line end
UNTERMINATED_CHAR_VAL : '%' [sSiI] '"' ~["\r\n]* | '"' ~["\r\n]* ;

// num-val = "%" (bin-val / dec-val / hex-val), e.g. %x41, %d13.10, %b0-1
// read generously; the front end checks digits, ranges and values
NUM_VAL : '%' [bBdDxX] [0-9A-Za-z]* ([.-] [0-9A-Za-z]*)* ;

// prose-val = "<" *(%x20-3D / %x3F-7E) ">"
PROSE_VAL : '<' ~[>\r\n]* '>' ;
UNTERMINATED_PROSE_VAL : '<' ~[>\r\n]* ;

// comment = ";" *(WSP / VCHAR) CRLF  (also carries the ;@use directive of Espalier's import extension)
COMMENT : ';' ~[\r\n]* -> channel(HIDDEN) ;
NEWLINE : ('\r\n' | '\n' | '\r') -> channel(HIDDEN) ;
WS : [ \t]+ -> channel(HIDDEN) ;

// any other character: reported by the front end, never seen by the parser
UNEXPECTED : . ;
