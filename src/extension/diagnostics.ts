// Publishes the checker's diagnostics for every open plan after each analysis.
import * as vscode from 'vscode';
import { onDidAnalyse, type Analysis } from './analysis';
import { toDiagnostic } from './convert';

export function registerDiagnostics(context: vscode.ExtensionContext): void {
  const collection = vscode.languages.createDiagnosticCollection('veer');
  const publish = (analysis: Analysis) => {
    const document = vscode.workspace.textDocuments.find((d) => d.uri.toString() === analysis.uri.toString());
    // Typing may have moved on since this check began: its ranges would be wrong.
    if (!document || document.version !== analysis.version) return;
    collection.set(analysis.uri, analysis.result.diagnostics.map((d) => toDiagnostic(analysis.uri, d)));
  };
  context.subscriptions.push(
    collection,
    onDidAnalyse(publish),
    vscode.workspace.onDidCloseTextDocument((document) => collection.delete(document.uri)),
  );
}
