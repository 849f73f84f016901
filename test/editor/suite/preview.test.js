// The path preview command in a real editor: it opens one webview tab beside
// the plan, follows the active plan, and running it again reuses that tab.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri } = require('./helpers');

const FIXTURE = 'wrap-check.veer';

function previewTabs() {
  return vscode.window.tabGroups.all.flatMap((group) => group.tabs
    .filter((tab) => tab.input instanceof vscode.TabInputWebview && tab.input.viewType.endsWith('veer.preview'))
    .map((tab) => ({ tab, group })));
}

/** Resolves once `accept(previewTabs())` holds; the tab list changes by event, checked with a deadline. */
function previewTabsWhere(accept, timeoutMs = 15000) {
  return new Promise((resolve, reject) => {
    const check = () => {
      const tabs = previewTabs();
      if (accept(tabs)) {
        done();
        resolve(tabs);
      }
    };
    const subscriptions = [vscode.window.tabGroups.onDidChangeTabs(check), vscode.window.tabGroups.onDidChangeTabGroups(check)];
    const timer = setTimeout(() => {
      done();
      reject(new Error(`preview tabs never matched; tabs: ${vscode.window.tabGroups.all.flatMap((g) => g.tabs.map((t) => t.label)).join(', ')}`));
    }, timeoutMs);
    const done = () => {
      subscriptions.forEach((s) => s.dispose());
      clearTimeout(timer);
    };
    check();
  });
}

describe('Veer path preview', () => {
  let editor;
  let copy;

  before(async () => {
    const document = await vscode.workspace.openTextDocument(fixtureUri(FIXTURE));
    editor = await vscode.window.showTextDocument(document, vscode.ViewColumn.One);
  });

  after(async () => {
    const tabs = previewTabs().map((t) => t.tab);
    if (tabs.length) await vscode.window.tabGroups.close(tabs);
    if (copy) {
      await vscode.window.showTextDocument(copy);
      await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
    }
  });

  it('is a contributed command', async () => {
    const commands = await vscode.commands.getCommands(true);
    assert.ok(commands.includes('veer.openPreview'));
  });

  it('opens a webview tab beside the plan, titled after it', async () => {
    await vscode.commands.executeCommand('veer.openPreview');
    const [{ group }] = await previewTabsWhere((tabs) => tabs.length === 1 && tabs[0].tab.label === `Preview ${FIXTURE}`);
    assert.notEqual(group.viewColumn, editor.viewColumn, 'the preview opens in another column');
  });

  it('follows the active plan, in the same single tab, also when the command runs again', async () => {
    copy = await vscode.workspace.openTextDocument({ language: 'veer', content: editor.document.getText() });
    await vscode.window.showTextDocument(copy, vscode.ViewColumn.One);
    const name = copy.uri.path.split('/').pop();
    // The title changes on the existing panel; a second panel would be created before that.
    const followed = await previewTabsWhere((tabs) => tabs.some((t) => t.tab.label === `Preview ${name}`));
    assert.equal(followed.length, 1);
    await vscode.commands.executeCommand('veer.openPreview');
    const again = await previewTabsWhere((tabs) => tabs.length >= 1);
    assert.deepEqual(again.map((t) => t.tab.label), [`Preview ${name}`]);
  });
});
