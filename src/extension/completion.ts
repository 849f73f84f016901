// Completion of keywords, options, units, `let` names and zone names.
import * as vscode from 'vscode';
import { completionsAt } from '../core/insight';
import { getAnalysis, LANGUAGE_ID } from './analysis';
import { fromPosition, toCompletionItem } from './convert';

export function registerCompletion(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.languages.registerCompletionItemProvider(
      LANGUAGE_ID,
      {
        provideCompletionItems(document, position) {
          const text = document.getText();
          return completionsAt(text, fromPosition(position), getAnalysis(document).result).map(toCompletionItem);
        },
      },
      ' ',
      '"',
    ),
  );
}
