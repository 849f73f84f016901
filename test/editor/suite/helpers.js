// Shared waits for the editor suites: every wait is on an editor event, with a
// deadline so a missing event fails the test instead of hanging it.
const vscode = require('vscode');

const workspaceRoot = () => vscode.workspace.workspaceFolders[0].uri;
const fixtureUri = (name) => vscode.Uri.joinPath(workspaceRoot(), name);

/** Resolves with the document's diagnostics once `accept` holds for them. */
function diagnosticsWhere(uri, accept, timeoutMs = 15000) {
  return new Promise((resolve, reject) => {
    const check = () => {
      const found = vscode.languages.getDiagnostics(uri);
      if (accept(found)) {
        done();
        resolve(found);
      }
    };
    const subscription = vscode.languages.onDidChangeDiagnostics((event) => {
      if (event.uris.some((u) => u.toString() === uri.toString())) check();
    });
    const timer = setTimeout(() => {
      done();
      reject(new Error(`diagnostics of ${uri} never matched; last: ${JSON.stringify(vscode.languages.getDiagnostics(uri).map(codeOf))}`));
    }, timeoutMs);
    const done = () => {
      subscription.dispose();
      clearTimeout(timer);
    };
    check();
  });
}

function codeOf(diagnostic) {
  return typeof diagnostic.code === 'object' ? diagnostic.code.value : diagnostic.code;
}

/** A scratch copy of a fixture, as an untitled plan, so edits never touch the workspace files. */
async function scratchCopy(name) {
  const original = await vscode.workspace.openTextDocument(fixtureUri(name));
  const document = await vscode.workspace.openTextDocument({ language: 'veer', content: original.getText() });
  await vscode.window.showTextDocument(document);
  return document;
}

function hoverText(hovers) {
  return hovers.flatMap((h) => h.contents).map((c) => (typeof c === 'string' ? c : c.value)).join('\n');
}

module.exports = { fixtureUri, diagnosticsWhere, codeOf, scratchCopy, hoverText };
