// End-of-line facts on motion lines (end heading, yaw reading, motor degrees),
// refreshed after each analysis and switchable with `veer.inlayHints.enabled`.
import * as vscode from 'vscode';
import { inlayHints } from '../core/insight';
import { getAnalysis, LANGUAGE_ID, onDidAnalyse } from './analysis';
import { toInlayHint } from './convert';

export function registerInlayHints(context: vscode.ExtensionContext): void {
  const changed = new vscode.EventEmitter<void>();
  context.subscriptions.push(
    changed,
    onDidAnalyse(() => changed.fire()),
    vscode.workspace.onDidChangeConfiguration((event) => {
      if (event.affectsConfiguration('veer.inlayHints')) changed.fire();
    }),
    vscode.languages.registerInlayHintsProvider(LANGUAGE_ID, {
      onDidChangeInlayHints: changed.event,
      provideInlayHints(document, range) {
        if (!vscode.workspace.getConfiguration('veer', document).get<boolean>('inlayHints.enabled', true)) return [];
        const lines = { from: range.start.line, to: range.end.line };
        return inlayHints(getAnalysis(document).result, lines).map(toInlayHint);
      },
    }),
  );
}
