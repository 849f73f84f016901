// Hover on a plan: a name's value, a value in the file's units, or what a motion line computes.
import * as vscode from 'vscode';
import { hoverAt } from '../core/insight';
import { getAnalysis, LANGUAGE_ID } from './analysis';
import { fromPosition, toHover } from './convert';

export function registerHover(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.languages.registerHoverProvider(LANGUAGE_ID, {
      provideHover(document, position) {
        const info = hoverAt(getAnalysis(document).result, document.getText(), fromPosition(position));
        return info && toHover(info);
      },
    }),
  );
}
