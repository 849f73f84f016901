// A status bar item for the active plan: runs, time, distance and its problems.
// Clicking it opens the path preview.
import * as vscode from 'vscode';
import { statusSummary } from '../core/insight';
import { getAnalysis, isPlan, onDidAnalyse } from './analysis';
import { OPEN_PREVIEW_COMMAND } from './preview';

export function registerStatusBar(context: vscode.ExtensionContext): void {
  const item = vscode.window.createStatusBarItem('veer.summary', vscode.StatusBarAlignment.Left, 50);
  item.name = 'Veer plan summary';
  item.command = OPEN_PREVIEW_COMMAND;

  // The plan last shown: the summary stays while the preview (or another
  // panel that is not a text editor) has the focus.
  let shown: vscode.TextDocument | undefined;
  const refresh = () => {
    const enabled = vscode.workspace.getConfiguration('veer').get<boolean>('statusBar.enabled', true);
    const editor = vscode.window.activeTextEditor;
    if (editor) shown = isPlan(editor.document) ? editor.document : undefined;
    if (shown?.isClosed) shown = undefined;
    if (!enabled || !shown) {
      item.hide();
      return;
    }
    const summary = statusSummary(getAnalysis(shown).result);
    const icon = summary.errors > 0 ? '$(error)' : summary.warnings > 0 ? '$(warning)' : '$(check)';
    const [runs, time, distance, problems] = summary.parts;
    item.text = `$(compass) ${runs} · ${time} · ${distance} · ${icon} ${problems}`;
    item.tooltip = `${summary.tooltip}\n\nClick to open the path preview.`;
    item.backgroundColor = summary.errors > 0 ? new vscode.ThemeColor('statusBarItem.errorBackground')
      : summary.warnings > 0 ? new vscode.ThemeColor('statusBarItem.warningBackground') : undefined;
    item.show();
  };

  context.subscriptions.push(
    item,
    vscode.window.onDidChangeActiveTextEditor(refresh),
    onDidAnalyse((analysis) => {
      if (shown?.uri.toString() === analysis.uri.toString() || vscode.window.activeTextEditor?.document.uri.toString() === analysis.uri.toString()) refresh();
    }),
    vscode.workspace.onDidCloseTextDocument((document) => {
      if (document === shown) refresh();
    }),
    vscode.workspace.onDidChangeConfiguration((event) => {
      if (event.affectsConfiguration('veer.statusBar')) refresh();
    }),
  );
  refresh();
}
