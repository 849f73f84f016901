// A status bar item for the active plan: run time, distance, wrap problems.
// Clicking it opens the path preview.
import * as vscode from 'vscode';
import { statusSummary } from '../core/insight';
import { getAnalysis, isPlan, onDidAnalyse } from './analysis';
import { OPEN_PREVIEW_COMMAND } from './preview';

export function registerStatusBar(context: vscode.ExtensionContext): void {
  const item = vscode.window.createStatusBarItem('veer.summary', vscode.StatusBarAlignment.Left, 50);
  item.name = 'Veer plan summary';
  item.command = OPEN_PREVIEW_COMMAND;

  const refresh = () => {
    const editor = vscode.window.activeTextEditor;
    const enabled = vscode.workspace.getConfiguration('veer').get<boolean>('statusBar.enabled', true);
    if (!enabled || !editor || !isPlan(editor.document)) {
      item.hide();
      return;
    }
    const summary = statusSummary(getAnalysis(editor.document).result);
    const icon = summary.wrapProblems > 0 ? '$(warning)' : '$(check)';
    const [runs, time, distance, wrap] = summary.parts;
    item.text = `$(compass) ${runs} · ${time} · ${distance} · ${icon} ${wrap}`;
    item.tooltip = `${summary.tooltip}\n\nClick to open the path preview.`;
    item.backgroundColor = summary.wrapProblems > 0 ? new vscode.ThemeColor('statusBarItem.warningBackground') : undefined;
    item.show();
  };

  context.subscriptions.push(
    item,
    vscode.window.onDidChangeActiveTextEditor(refresh),
    onDidAnalyse((analysis) => {
      if (vscode.window.activeTextEditor?.document.uri.toString() === analysis.uri.toString()) refresh();
    }),
    vscode.workspace.onDidChangeConfiguration((event) => {
      if (event.affectsConfiguration('veer.statusBar')) refresh();
    }),
  );
  refresh();
}
