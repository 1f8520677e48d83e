// An independent reference lexer for ABNF highlighting: a hand-written character scanner (no regular
// expressions) that follows RFC 5234 section 4 and RFC 7405 for the token shapes, and the rules the
// espalier front end applies on top (a definition is a rule name that is the first token of its line
// followed by "=" or "=/"; values after %b/%d/%x are read up to the end of the run of letters, digits,
// "." and "-" and are valid only in the shapes of RFC 5234; ";@use" comments are import directives).
// It labels every UTF-16 code unit of a line with a class; the tests compare these labels with the
// scopes the TextMate grammar produces.

/** The classes a character can get (null: white space or a character with no class). */
export const CLASSES = [
  'comment', 'import', 'path', 'def-name', 'def-op', 'string', 'numeric', 'prose', 'repeat',
  'core', 'ref', 'alt', 'bracket', 'invalid',
];

// RFC 5234 Appendix B.1
const CORE_RULES = new Set([
  'ALPHA', 'BIT', 'CHAR', 'CR', 'CRLF', 'CTL', 'DIGIT', 'DQUOTE', 'HEXDIG', 'HTAB', 'LF', 'LWSP',
  'OCTET', 'SP', 'VCHAR', 'WSP',
]);

const isAlpha = (c) => (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z');
const isDigit = (c) => c >= '0' && c <= '9';
const isNameChar = (c) => isAlpha(c) || isDigit(c) || c === '-';
const isBlank = (c) => c === ' ' || c === '\t';

const BASE_DIGITS = { b: '01', d: '0123456789', x: '0123456789abcdefABCDEF' };

/** Whether the text after "%b", "%d" or "%x" is one value, a range or a dotted concatenation. */
function validValue(base, body) {
  const digits = BASE_DIGITS[base.toLowerCase()];
  const groups = [];
  let current = '';
  let separators = '';
  for (const c of body) {
    if (c === '.' || c === '-') {
      groups.push(current);
      separators += c;
      current = '';
    } else {
      current += c;
    }
  }
  groups.push(current);
  for (const g of groups) {
    if (g.length === 0) return false;
    for (const c of g) {
      if (!digits.includes(c)) return false;
    }
  }
  if (separators.includes('-')) {
    return separators === '-'; // a range has exactly two bounds and no dots
  }
  return true;
}

/** Labels each code unit of one line (without its line end). */
export function lexLine(line) {
  const out = new Array(line.length).fill(null);
  const mark = (from, to, cls) => {
    for (let k = from; k < to; k++) out[k] = cls;
  };
  const n = line.length;
  let i = 0;
  let first = true;
  while (i < n) {
    const c = line[i];
    if (isBlank(c)) {
      i++;
      continue;
    }
    const wasFirst = first;
    first = false;
    if (c === ';') {
      if (line.startsWith(';@use', i)) {
        mark(i, i + 5, 'import');
        let j = i + 5;
        let k = j;
        while (k < n && isBlank(line[k])) k++;
        if (k > j && line[k] === '"') {
          const close = line.indexOf('"', k + 1);
          if (close >= 0) {
            mark(k, close + 1, 'path');
            j = close + 1;
          }
        }
        mark(j, n, 'comment');
      } else {
        mark(i, n, 'comment');
      }
      break;
    }
    if (isAlpha(c)) {
      let j = i;
      while (j < n && isNameChar(line[j])) j++;
      if (wasFirst) {
        let k = j;
        while (k < n && isBlank(line[k])) k++;
        if (line[k] === '=') {
          mark(i, j, 'def-name');
          const opEnd = line[k + 1] === '/' ? k + 2 : k + 1;
          mark(k, opEnd, 'def-op');
          i = opEnd;
          continue;
        }
      }
      mark(i, j, CORE_RULES.has(line.slice(i, j).toUpperCase()) ? 'core' : 'ref');
      i = j;
      continue;
    }
    const caseString = c === '%' && 'sSiI'.includes(line[i + 1] ?? '') && line[i + 2] === '"';
    if (c === '"' || caseString) {
      const open = caseString ? i + 2 : i;
      const close = line.indexOf('"', open + 1);
      if (close >= 0) {
        mark(i, close + 1, 'string');
        i = close + 1;
      } else {
        mark(i, n, 'invalid');
        i = n;
      }
      continue;
    }
    if (c === '%') {
      const base = line[i + 1] ?? '';
      if ('bBdDxX'.includes(base) && base !== '') {
        let j = i + 2;
        while (j < n && (isAlpha(line[j]) || isDigit(line[j]) || line[j] === '.' || line[j] === '-')) j++;
        mark(i, j, validValue(base, line.slice(i + 2, j)) ? 'numeric' : 'invalid');
        i = j;
      } else {
        mark(i, i + 1, 'invalid');
        i++;
      }
      continue;
    }
    if (c === '<') {
      const close = line.indexOf('>', i + 1);
      const end = close >= 0 ? close + 1 : n;
      mark(i, end, close >= 0 ? 'prose' : 'invalid');
      i = end;
      continue;
    }
    if (isDigit(c) || c === '*') {
      let j = i;
      while (j < n && isDigit(line[j])) j++;
      if (line[j] === '*') {
        j++;
        while (j < n && isDigit(line[j])) j++;
      }
      mark(i, j, 'repeat');
      i = j;
      continue;
    }
    if (c === '=') {
      const end = line[i + 1] === '/' ? i + 2 : i + 1;
      mark(i, end, 'invalid');
      i = end;
      continue;
    }
    if (c === '/') {
      mark(i, i + 1, 'alt');
    } else if ('()[]'.includes(c)) {
      mark(i, i + 1, 'bracket');
    }
    i++;
  }
  return out;
}

/** Splits a text into lines at LF, CRLF or CR, as the ABNF front end does. */
export function splitLines(text) {
  return text.split(/\r\n|\n|\r/);
}
