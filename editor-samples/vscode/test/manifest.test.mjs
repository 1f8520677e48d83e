// The extension manifest points at files that exist and agree with each other.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { EXTENSION } from './scopes.mjs';

const manifest = JSON.parse(readFileSync(join(EXTENSION, 'package.json'), 'utf8'));

test('the language, its configuration and its grammar fit together', () => {
  const [language] = manifest.contributes.languages;
  assert.ok(language.extensions.includes('.abnf'));
  const config = JSON.parse(readFileSync(join(EXTENSION, language.configuration), 'utf8'));
  assert.equal(config.comments.lineComment, ';');
  const [grammar] = manifest.contributes.grammars;
  assert.equal(grammar.language, language.id);
  const tm = JSON.parse(readFileSync(join(EXTENSION, grammar.path), 'utf8'));
  assert.equal(tm.scopeName, grammar.scopeName);
  assert.ok(tm.fileTypes.every((t) => language.extensions.includes(`.${t}`)));
  for (const [open, close] of config.brackets) {
    assert.ok(config.autoClosingPairs.some((p) => p.open === open && p.close === close), `${open} closes`);
  }
});

test('every command the extension registers is contributed, and the reverse', () => {
  const source = readFileSync(join(EXTENSION, 'src', 'extension.ts'), 'utf8');
  const registered = [...source.matchAll(/registerCommand\('([^']+)'/g)].map((m) => m[1]).sort();
  const contributed = manifest.contributes.commands.map((c) => c.command).sort();
  assert.deepEqual(registered, contributed);
});

test('every setting the extension reads is contributed', () => {
  const source = readFileSync(join(EXTENSION, 'src', 'extension.ts'), 'utf8');
  const read = [...source.matchAll(/config\.get<[^>]+>\('([^']+)'/g)].map((m) => `espalier.${m[1]}`);
  assert.ok(read.length >= 2);
  const contributed = Object.keys(manifest.contributes.configuration.properties);
  assert.deepEqual(read.filter((k) => !contributed.includes(k)), []);
});

test('the compiled entry point exists after npm run build', () => {
  assert.ok(existsSync(join(EXTENSION, manifest.main)), `${manifest.main}: run npm run build first`);
});
