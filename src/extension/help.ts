// What each problem code means: the diagnostics reference shipped with the
// extension, opened read-only at that code's section when its link (the code
// in a problem's hover or in the Problems panel) is followed.
import * as vscode from 'vscode';

export const HELP_SCHEME = 'veer-help';
const HELP_PATH = '/diagnostics.md';

/** Line of each `## code` heading in docs/diagnostics.md, read at activation. */
const headingLines = new Map<string, number>();
let docsText = '';

/** The link of a code: the reference, scrolled to that code's heading (its line as the editor reads `#L` fragments). */
export function helpUri(code: string): vscode.Uri {
  const line = headingLines.get(code);
  return vscode.Uri.from({ scheme: HELP_SCHEME, path: HELP_PATH, fragment: line === undefined ? code : `L${line + 1}` });
}

export async function registerHelp(context: vscode.ExtensionContext): Promise<void> {
  const provider: vscode.TextDocumentContentProvider = { provideTextDocumentContent: () => docsText };
  context.subscriptions.push(vscode.workspace.registerTextDocumentContentProvider(HELP_SCHEME, provider));
  try {
    const bytes = await vscode.workspace.fs.readFile(vscode.Uri.joinPath(context.extensionUri, 'docs', 'diagnostics.md'));
    docsText = new TextDecoder().decode(bytes);
  } catch {
    docsText = 'The reference of problem codes is missing from this installation.';
  }
  docsText.split(/\r\n|\r|\n/).forEach((line, i) => {
    const m = /^## ([a-z-]+)\s*$/.exec(line);
    if (m) headingLines.set(m[1], i);
  });
}

export const OPEN_REFERENCE_COMMAND = 'veer.openReference';

/** "Veer: Open the Plan Reference": the language reference shipped with the extension, rendered. */
export function registerReference(context: vscode.ExtensionContext): void {
  context.subscriptions.push(vscode.commands.registerCommand(OPEN_REFERENCE_COMMAND, async () => {
    const uri = vscode.Uri.joinPath(context.extensionUri, 'docs', 'language.md');
    try {
      await vscode.commands.executeCommand('markdown.showPreview', uri);
    } catch {
      await vscode.window.showTextDocument(uri, { preview: true });
    }
  }));
}
