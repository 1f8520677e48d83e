// Validates syntaxes/abnf.tmLanguage.json with the real TextMate engine on every grammar of the
// library (and the edge cases in test/fixtures): the class of every character under the grammar's
// scopes must equal the class the independent reference lexer gives it.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import vsctm from 'vscode-textmate';
import { lexLine, splitLines, CLASSES } from './reference-lexer.mjs';
import { corpus, textMateGrammar, classesFromTokens, firstDifference } from './scopes.mjs';

const files = corpus();

test('the corpus holds the grammar library', () => {
  assert.ok(files.filter((f) => f.path.includes('grammars')).length >= 10,
    'expected the .abnf files of grammars/');
});

for (const file of files) {
  test(`TextMate scopes agree with the reference lexer: ${file.path}`, async () => {
    const grammar = await textMateGrammar();
    let stack = vsctm.INITIAL;
    const problems = [];
    splitLines(file.text).forEach((line, index) => {
      const result = grammar.tokenizeLine(line, stack);
      stack = result.ruleStack;
      const problem = firstDifference(`${file.path}:${index + 1}`, line,
        lexLine(line), classesFromTokens(line, result.tokens), 'reference lexer', 'TextMate grammar');
      if (problem) problems.push(problem);
    });
    assert.deepEqual(problems, []);
  });
}

test('the corpus exercises every class', () => {
  const seen = new Set();
  for (const file of files) {
    for (const line of splitLines(file.text)) {
      for (const cls of lexLine(line)) seen.add(cls);
    }
  }
  assert.deepEqual(CLASSES.filter((c) => !seen.has(c)), []);
});

test('every scope name of the grammar is one the class mapping knows or deliberately ignores', async () => {
  const { readFileSync } = await import('node:fs');
  const { join } = await import('node:path');
  const { EXTENSION, classOf } = await import('./scopes.mjs');
  const raw = JSON.parse(readFileSync(join(EXTENSION, 'syntaxes', 'abnf.tmLanguage.json'), 'utf8'));
  const names = [];
  const walk = (node) => {
    if (Array.isArray(node)) node.forEach(walk);
    else if (node && typeof node === 'object') {
      if (typeof node.name === 'string') names.push(node.name);
      Object.values(node).forEach(walk);
    }
  };
  walk(raw.repository);
  // structural scopes that carry no class of their own (their parts do)
  const structural = ['meta.directive.import.abnf', 'storage.modifier.case.abnf', 'storage.type.numeric.abnf',
    'punctuation.definition.comment.abnf', 'punctuation.definition.string.begin.abnf',
    'punctuation.definition.string.end.abnf'];
  const unknown = names.filter((n) => !n.endsWith('.abnf')
    || (classOf([n]) === null && !structural.includes(n)));
  assert.deepEqual(unknown, []);
});
