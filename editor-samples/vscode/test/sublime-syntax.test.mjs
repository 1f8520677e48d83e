// The Sublime Text syntax is generated from the TextMate grammar. These tests check that the
// committed file is what the generator makes now (no drift), and that it highlights like the
// TextMate grammar: the file is read back as YAML (js-yaml), run by a small interpreter of the
// sublime-syntax subset it uses (leftmost match wins, ties go to the earlier rule, as in Sublime
// Text and TextMate) over Oniguruma, and compared class by class with vscode-textmate.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import yaml from 'js-yaml';
import vsctm from 'vscode-textmate';
import { toSublimeSyntax, TEXTMATE_PATH, SUBLIME_PATH } from '../scripts/sublime-syntax.mjs';
import { splitLines } from './reference-lexer.mjs';
import { corpus, onigLib, textMateGrammar, classesFromTokens, firstDifference } from './scopes.mjs';

test('the committed sublime-syntax is the generated one (run npm run sublime-syntax after editing the grammar)', () => {
  const expected = toSublimeSyntax(JSON.parse(readFileSync(TEXTMATE_PATH, 'utf8')));
  assert.equal(readFileSync(SUBLIME_PATH, 'utf8'), expected);
});

/** Tokenizes lines with a sublime-syntax whose contexts hold only match rules and includes. */
async function sublimeTokenizer(syntax) {
  const lib = await onigLib();
  const rules = [];
  const flatten = (name, seen) => {
    if (seen.has(name)) throw new Error(`include cycle at ${name}`);
    const context = syntax.contexts[name];
    assert.ok(Array.isArray(context), `context ${name} exists`);
    for (const item of context) {
      if (item.include) flatten(item.include, new Set([...seen, name]));
      else {
        assert.deepEqual(Object.keys(item).filter((k) => !['match', 'scope', 'captures'].includes(k)), [],
          'only match, scope and captures are interpreted');
        rules.push(item);
      }
    }
  };
  flatten('main', new Set());
  const scanner = lib.createOnigScanner(rules.map((r) => r.match));
  return (line) => {
    const tokens = [];
    const str = lib.createOnigString(line);
    let pos = 0;
    while (pos <= line.length) {
      const m = scanner.findNextMatchSync(str, pos);
      if (!m) break;
      const rule = rules[m.index];
      const whole = m.captureIndices[0];
      const outer = [syntax.scope, ...(rule.scope ? [rule.scope] : [])];
      tokens.push({ startIndex: whole.start, endIndex: whole.end, scopes: outer });
      for (const [group, scope] of Object.entries(rule.captures ?? {})) {
        const c = m.captureIndices[Number(group)];
        if (c && c.start >= 0 && c.end > c.start) {
          tokens.push({ startIndex: c.start, endIndex: c.end, scopes: [...outer, scope] });
        }
      }
      pos = whole.end > pos ? whole.end : pos + 1;
    }
    return tokens;
  };
}

test('Sublime Text and TextMate highlight the corpus alike', async () => {
  const syntax = yaml.load(readFileSync(SUBLIME_PATH, 'utf8'));
  assert.equal(syntax.scope, 'source.abnf');
  const sublime = await sublimeTokenizer(syntax);
  const grammar = await textMateGrammar();
  const problems = [];
  let lines = 0;
  for (const file of corpus()) {
    let stack = vsctm.INITIAL;
    splitLines(file.text).forEach((line, index) => {
      const result = grammar.tokenizeLine(line, stack);
      stack = result.ruleStack;
      const problem = firstDifference(`${file.path}:${index + 1}`, line,
        classesFromTokens(line, result.tokens), classesFromTokens(line, sublime(line)),
        'TextMate grammar', 'sublime-syntax');
      if (problem) problems.push(problem);
      lines++;
    });
  }
  assert.deepEqual(problems, []);
  assert.ok(lines > 500, `compared ${lines} lines`);
});
