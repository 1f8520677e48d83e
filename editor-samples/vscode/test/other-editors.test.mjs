// The configuration files of the other editors parse, and name the same server, language and
// scope as the rest: Helix's languages.toml (read with smol-toml), Sublime Text's LSP client
// settings (JSON with comments) and its syntax.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseToml } from 'smol-toml';
import yaml from 'js-yaml';
import { EXTENSION, REPOSITORY } from './scopes.mjs';

const SAMPLES = join(EXTENSION, '..');

test('Helix: the abnf language and a sample language use the espalier server', () => {
  const config = parseToml(readFileSync(join(SAMPLES, 'helix', 'languages.toml'), 'utf8'));
  const server = config['language-server'].espalier;
  assert.ok(server.args.includes('serve'), 'the server is started with serve');
  const abnf = config.language.find((l) => l.name === 'abnf');
  assert.deepEqual(abnf['file-types'], ['abnf']);
  assert.equal(abnf['comment-token'], ';');
  assert.ok(abnf['language-servers'].includes('espalier'));
  const sample = config.language.find((l) => l.name === 'espalier-sample');
  assert.ok(sample['language-servers'].includes('espalier'));
  // the example's glob is one of the demo workspace's
  const workspace = JSON.parse(readFileSync(join(REPOSITORY, 'grammars', 'samples-workspace', 'espalier-samples.json'), 'utf8'));
  const globs = workspace.samples.flatMap((e) => (typeof e.files === 'string' ? [e.files] : e.files));
  for (const fileType of sample['file-types']) {
    assert.ok(globs.includes(fileType.glob), `${fileType.glob} in ${globs}`);
  }
});

test('Sublime Text: the LSP client selects the scope of the generated syntax', () => {
  const text = readFileSync(join(SAMPLES, 'sublime', 'LSP-espalier.sublime-settings'), 'utf8');
  // Sublime settings allow // comments on their own lines
  const settings = JSON.parse(text.split('\n').filter((l) => !l.trim().startsWith('//')).join('\n'));
  const client = settings.clients.espalier;
  assert.ok(client.command.includes('serve'));
  const syntax = yaml.load(readFileSync(join(SAMPLES, 'sublime', 'ABNF.sublime-syntax'), 'utf8'));
  assert.ok(client.selector.split('|').map((s) => s.trim()).includes(syntax.scope));
  const comments = readFileSync(join(SAMPLES, 'sublime', 'ABNF Comments.tmPreferences'), 'utf8');
  assert.match(comments, new RegExp(`<string>${syntax.scope.replaceAll('.', '\\.')}</string>`));
});

test('Neovim and Emacs set-ups are where their READMEs say', () => {
  for (const file of ['neovim/lua/espalier/init.lua', 'neovim/syntax/abnf.vim', 'neovim/ftplugin/abnf.vim',
    'emacs/abnf-mode.el', 'emacs/espalier-eglot.el']) {
    assert.ok(existsSync(join(SAMPLES, file)), file);
  }
});
