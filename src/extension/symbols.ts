// The outline: runs, with their motion lines and marks as children.
import * as vscode from 'vscode';
import { documentSymbols } from '../core/insight';
import { getAnalysis, LANGUAGE_ID } from './analysis';
import { toDocumentSymbol } from './convert';

export function registerSymbols(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.languages.registerDocumentSymbolProvider(
      LANGUAGE_ID,
      {
        provideDocumentSymbols(document) {
          return documentSymbols(getAnalysis(document).result, document.getText()).map(toDocumentSymbol);
        },
      },
      { label: 'Veer runs' },
    ),
  );
}
