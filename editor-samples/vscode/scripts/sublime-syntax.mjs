// Generates editor-samples/sublime/ABNF.sublime-syntax from syntaxes/abnf.tmLanguage.json, so that
// the two highlighters cannot drift apart (test/sublime-syntax.test.mjs checks the committed file).
//   node scripts/sublime-syntax.mjs          prints the syntax
//   node scripts/sublime-syntax.mjs --write  writes it to editor-samples/sublime/
// The TextMate grammar uses only single-line "match" rules, "patterns" lists and "#name" includes;
// anything else is refused rather than translated approximately.
import { readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const EXTENSION = join(dirname(fileURLToPath(import.meta.url)), '..');
export const TEXTMATE_PATH = join(EXTENSION, 'syntaxes', 'abnf.tmLanguage.json');
export const SUBLIME_PATH = join(EXTENSION, '..', 'sublime', 'ABNF.sublime-syntax');

const quote = (s) => `'${s.replace(/'/g, "''")}'`;

function include(ref, where) {
  if (typeof ref !== 'string' || !ref.startsWith('#')) {
    throw new Error(`${where}: only "#name" includes can be translated, not ${JSON.stringify(ref)}`);
  }
  return ref.slice(1);
}

function matchRule(rule, where, indent) {
  const allowed = new Set(['match', 'name', 'captures', 'comment']);
  for (const key of Object.keys(rule)) {
    if (!allowed.has(key)) throw new Error(`${where}: cannot translate "${key}"`);
  }
  const lines = [];
  if (rule.comment) lines.push(`${indent}# ${rule.comment}`);
  lines.push(`${indent}- match: ${quote(rule.match)}`);
  if (rule.name) lines.push(`${indent}  scope: ${rule.name}`);
  if (rule.captures) {
    lines.push(`${indent}  captures:`);
    for (const group of Object.keys(rule.captures).sort((a, b) => Number(a) - Number(b))) {
      lines.push(`${indent}    ${group}: ${rule.captures[group].name}`);
    }
  }
  return lines;
}

function contextBody(entry, where) {
  const lines = [];
  if (entry.patterns) {
    if (entry.comment) lines.push(`    # ${entry.comment}`);
    entry.patterns.forEach((p, i) => {
      if (p.include) lines.push(`    - include: ${include(p.include, `${where}[${i}]`)}`);
      else lines.push(...matchRule(p, `${where}[${i}]`, '    '));
    });
  } else if (entry.match) {
    lines.push(...matchRule(entry, where, '    '));
  } else {
    throw new Error(`${where}: neither "match" nor "patterns"`);
  }
  return lines;
}

/** The sublime-syntax text for a TextMate grammar object. */
export function toSublimeSyntax(tm) {
  const lines = [
    '%YAML 1.2',
    '---',
    '# Generated from editor-samples/vscode/syntaxes/abnf.tmLanguage.json by',
    '# editor-samples/vscode/scripts/sublime-syntax.mjs; edit the TextMate grammar and regenerate.',
    `name: ${tm.name}`,
    'version: 2',
    `file_extensions: [${tm.fileTypes.join(', ')}]`,
    `scope: ${tm.scopeName}`,
    'contexts:',
    '  main:',
  ];
  tm.patterns.forEach((p, i) => {
    lines.push(`    - include: ${include(p.include, `patterns[${i}]`)}`);
  });
  for (const name of Object.keys(tm.repository)) {
    lines.push(`  ${name}:`);
    lines.push(...contextBody(tm.repository[name], `repository.${name}`));
  }
  return lines.join('\n') + '\n';
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const text = toSublimeSyntax(JSON.parse(readFileSync(TEXTMATE_PATH, 'utf8')));
  if (process.argv.includes('--write')) {
    writeFileSync(SUBLIME_PATH, text);
    console.log(`wrote ${SUBLIME_PATH}`);
  } else {
    process.stdout.write(text);
  }
}
