// Helpers shared by the grammar tests: the corpus of ABNF files, the real TextMate engine
// (vscode-textmate over the Oniguruma WebAssembly build of vscode-oniguruma), and the mapping from
// scopes to the reference lexer's classes.
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import vsctm from 'vscode-textmate';
import oniguruma from 'vscode-oniguruma';

const require = createRequire(import.meta.url);
export const HERE = dirname(fileURLToPath(import.meta.url));
export const EXTENSION = join(HERE, '..');
export const REPOSITORY = join(EXTENSION, '..', '..');

/** The grammar library (grammars/*.abnf) plus the edge cases of test/fixtures. */
export function corpus() {
  const files = [];
  for (const dir of [join(REPOSITORY, 'grammars'), join(HERE, 'fixtures')]) {
    for (const name of readdirSync(dir).sort()) {
      if (name.endsWith('.abnf')) {
        files.push({ path: join(dir, name), text: readFileSync(join(dir, name), 'utf8') });
      }
    }
  }
  return files;
}

let onigLoaded;

/** The Oniguruma library, loaded once. */
export async function onigLib() {
  if (!onigLoaded) {
    const wasm = readFileSync(require.resolve('vscode-oniguruma/release/onig.wasm'));
    onigLoaded = oniguruma.loadWASM(wasm.buffer.slice(wasm.byteOffset, wasm.byteOffset + wasm.byteLength))
      .then(() => ({
        createOnigScanner: (patterns) => new oniguruma.OnigScanner(patterns),
        createOnigString: (s) => new oniguruma.OnigString(s),
      }));
  }
  return onigLoaded;
}

/** The extension's TextMate grammar, loaded into vscode-textmate. */
export async function textMateGrammar() {
  const registry = new vsctm.Registry({
    onigLib: onigLib(),
    loadGrammar: async (scopeName) => {
      if (scopeName !== 'source.abnf') return null;
      const path = join(EXTENSION, 'syntaxes', 'abnf.tmLanguage.json');
      return vsctm.parseRawGrammar(readFileSync(path, 'utf8'), path);
    },
  });
  return registry.loadGrammar('source.abnf');
}

// innermost scope first; the first prefix that matches decides
const SCOPE_CLASSES = [
  ['keyword.control.import', 'import'],
  ['punctuation.definition.directive', 'import'],
  ['string.quoted.double.path', 'path'],
  ['comment', 'comment'],
  ['entity.name.function.rule', 'def-name'],
  ['keyword.operator.definition', 'def-op'],
  ['string.unquoted.prose', 'prose'],
  ['string.quoted.double', 'string'],
  ['constant.numeric', 'numeric'],
  ['keyword.operator.repetition', 'repeat'],
  ['support.constant.core-rule', 'core'],
  ['variable.other.rule', 'ref'],
  ['keyword.operator.alternation', 'alt'],
  ['punctuation.section', 'bracket'],
  ['invalid', 'invalid'],
];

/** The class of a character with these scopes (outermost first), or null. */
export function classOf(scopes) {
  for (let k = scopes.length - 1; k >= 0; k--) {
    for (const [prefix, cls] of SCOPE_CLASSES) {
      if (scopes[k] === prefix || scopes[k].startsWith(prefix + '.')) return cls;
    }
  }
  return null;
}

/** The classes of a line's characters under a tokenizer that gives [{startIndex, endIndex, scopes}]. */
export function classesFromTokens(line, tokens) {
  const out = new Array(line.length).fill(null);
  for (const t of tokens) {
    const cls = classOf(t.scopes);
    for (let k = t.startIndex; k < Math.min(t.endIndex, line.length); k++) out[k] = cls;
  }
  return out;
}

/** The first difference between two class arrays of a line, as a readable message, or null. */
export function firstDifference(where, line, expected, actual, expectedName, actualName) {
  for (let k = 0; k < line.length; k++) {
    if (expected[k] !== actual[k]) {
      return `${where}:${k + 1}: ${expectedName} says ${expected[k]}, ${actualName} says ${actual[k]}\n`
        + `  ${line}\n  ${' '.repeat(k)}^`;
    }
  }
  return null;
}
