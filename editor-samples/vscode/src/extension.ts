// The VS Code client of the espalier language server: starts `espalier serve` (or the configured
// command), hands it .abnf files, the workspace files espalier-samples.json and the sample files
// they map, and adds a command that shows the allowed tokens at the cursor (espalier/allowedTokens).
import * as path from 'node:path';
import * as vscode from 'vscode';
import {
  DocumentFilter,
  LanguageClient,
  LanguageClientOptions,
  ServerOptions,
  TransportKind,
} from 'vscode-languageclient/node';

const SAMPLE_MAP = 'espalier-samples.json';

let client: LanguageClient | undefined;
let output: vscode.LogOutputChannel | undefined;

/** The result of the server's espalier/allowedTokens request. */
interface AllowedTokens {
  count: number;
  vocabularySize: number;
  endAllowed: boolean;
  forced: string;
  tokens: { id: number; text: string }[];
}

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  output = vscode.window.createOutputChannel('Espalier', { log: true });
  context.subscriptions.push(output);
  context.subscriptions.push(
    vscode.commands.registerCommand('espalier.restartServer', () => restart()),
    vscode.commands.registerCommand('espalier.showAllowedTokens', () => showAllowedTokens()),
    vscode.workspace.onDidChangeConfiguration((e) => {
      if (e.affectsConfiguration('espalier.server')) {
        void restart();
      }
    }),
  );
  // which files are samples is read from the workspace files: follow their changes
  const watcher = vscode.workspace.createFileSystemWatcher(`**/${SAMPLE_MAP}`);
  watcher.onDidCreate(() => void restart());
  watcher.onDidDelete(() => void restart());
  watcher.onDidChange(async () => {
    const now = JSON.stringify(await sampleFilters());
    if (now !== JSON.stringify(currentFilters)) {
      await restart();
    }
  });
  context.subscriptions.push(watcher);
  await start();
}

export async function deactivate(): Promise<void> {
  await client?.stop();
  client = undefined;
}

let currentFilters: DocumentFilter[] = [];

async function start(): Promise<void> {
  const config = vscode.workspace.getConfiguration('espalier');
  const command = config.get<string[]>('server.command', ['espalier', 'serve']);
  const debounce = config.get<number>('server.debounce', 200);
  if (command.length === 0) {
    void vscode.window.showErrorMessage('espalier.server.command is empty: give the program that runs `espalier serve`.');
    return;
  }
  const folder = vscode.workspace.workspaceFolders?.[0]?.uri.fsPath;
  let program = command[0];
  if (folder && !path.isAbsolute(program) && program.includes(path.sep)) {
    program = path.resolve(folder, program);
  }
  const args = [...command.slice(1), '--debounce', String(debounce)];
  const serverOptions: ServerOptions = {
    run: { command: program, args, transport: TransportKind.stdio, options: { cwd: folder } },
    debug: { command: program, args, transport: TransportKind.stdio, options: { cwd: folder } },
  };
  currentFilters = await sampleFilters();
  const clientOptions: LanguageClientOptions = {
    documentSelector: [
      { language: 'abnf' },
      { scheme: 'file', pattern: `**/${SAMPLE_MAP}` },
      ...currentFilters,
    ],
    outputChannel: output,
    synchronize: {
      fileEvents: vscode.workspace.createFileSystemWatcher('**/{*.abnf,*.json}'),
    },
  };
  client = new LanguageClient('espalier', 'Espalier', serverOptions, clientOptions);
  try {
    await client.start();
  } catch (e) {
    void vscode.window.showErrorMessage(
      `Could not start the espalier language server (${program} ${args.join(' ')}): ${String(e)}. `
        + 'Set espalier.server.command to the launcher ./espalier or to java -jar espalier.jar.');
  }
}

async function restart(): Promise<void> {
  await client?.stop();
  client = undefined;
  await start();
}

/**
 * One document filter per glob of every espalier-samples.json in the workspace, relative to the
 * folder of its file (the server decides per document; this only says which documents to send).
 */
async function sampleFilters(): Promise<DocumentFilter[]> {
  const filters: DocumentFilter[] = [];
  for (const uri of await vscode.workspace.findFiles(`**/${SAMPLE_MAP}`, '**/node_modules/**', 50)) {
    try {
      const text = new TextDecoder().decode(await vscode.workspace.fs.readFile(uri));
      const map = JSON.parse(text) as { samples?: { files?: string | string[] }[] };
      const base = vscode.Uri.joinPath(uri, '..');
      for (const entry of map.samples ?? []) {
        const globs = typeof entry.files === 'string' ? [entry.files] : entry.files ?? [];
        for (const glob of globs) {
          if (typeof glob === 'string' && glob.length > 0) {
            filters.push({ scheme: 'file', pattern: { baseUri: base.toString(), pattern: glob } });
          }
        }
      }
    } catch (e) {
      // the server reports the problems of the file itself as diagnostics on it
      output?.warn(`${uri.fsPath}: not read (${String(e)})`);
    }
  }
  return filters;
}

async function showAllowedTokens(): Promise<void> {
  const editor = vscode.window.activeTextEditor;
  if (!editor || !client) {
    return;
  }
  let result: AllowedTokens;
  try {
    result = await client.sendRequest<AllowedTokens>('espalier/allowedTokens', {
      uri: editor.document.uri.toString(),
      position: editor.selection.active,
      limit: 500,
    });
  } catch (e) {
    void vscode.window.showInformationMessage(`No token preview here: ${e instanceof Error ? e.message : String(e)}`);
    return;
  }
  const pick = vscode.window.createQuickPick();
  pick.title = `${result.count} of ${result.vocabularySize} tokens allowed`
    + (result.endAllowed ? ' · the output may end here' : '')
    + (result.forced ? ` · forced: ${result.forced}` : '');
  pick.items = result.tokens.map((t) => ({ label: t.text, description: `token ${t.id}` }));
  pick.onDidHide(() => pick.dispose());
  pick.show();
}
