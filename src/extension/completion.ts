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
          const items = completionsAt(text, fromPosition(position), getAnalysis(document).result).map(toCompletionItem);
          // Incomplete: asked again on every keystroke, so a list closes as soon as the word on the
          // line is complete (the core then offers nothing) and Enter starts a new line.
          return new vscode.CompletionList(items, true);
        },
      },
      ' ',
      '"',
    ),
  );
}
