// Quick fixes carried by the checker's diagnostics, and the source action that
// inserts the fewest `reset yaw` lines removing every wrap crossing.
import * as vscode from 'vscode';
import type * as core from '../core';
import { fewestResets } from '../core/fixes';
import { getAnalysis, LANGUAGE_ID } from './analysis';
import { codeOf, DIAGNOSTIC_SOURCE, toCodeAction, toRange } from './convert';

export const FEWEST_RESETS_KIND = vscode.CodeActionKind.Source.append('veer').append('fewestResets');

export function registerCodeActions(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.languages.registerCodeActionsProvider(LANGUAGE_ID, new PlanCodeActions(), {
      providedCodeActionKinds: [vscode.CodeActionKind.QuickFix, FEWEST_RESETS_KIND],
    }),
  );
}

/**
 * The editor asks for code actions on every cursor move; the plan-wide fix is
 * computed once per check result, not once per request.
 */
const fewestResetsByResult = new WeakMap<core.CheckResult, core.Fix | undefined>();
function fewestResetsOf(result: core.CheckResult): core.Fix | undefined {
  if (!fewestResetsByResult.has(result)) fewestResetsByResult.set(result, fewestResets(result));
  return fewestResetsByResult.get(result);
}

class PlanCodeActions implements vscode.CodeActionProvider {
  provideCodeActions(
    document: vscode.TextDocument,
    _range: vscode.Range,
    context: vscode.CodeActionContext,
  ): vscode.CodeAction[] {
    const result = getAnalysis(document).result;
    const actions: vscode.CodeAction[] = [];
    if (!context.only || context.only.contains(vscode.CodeActionKind.QuickFix)) {
      for (const shown of context.diagnostics) {
        if (shown.source !== DIAGNOSTIC_SOURCE) continue;
        const found = result.diagnostics.find((d) => sameDiagnostic(d, shown));
        for (const fix of found?.fixes ?? []) {
          actions.push(toCodeAction(document.uri, fix, vscode.CodeActionKind.QuickFix, [shown]));
        }
      }
    }
    if (!context.only || FEWEST_RESETS_KIND.intersects(context.only)) {
      const fix = fewestResetsOf(result);
      if (fix) actions.push(toCodeAction(document.uri, { ...fix, preferred: false }, FEWEST_RESETS_KIND, []));
    }
    return actions;
  }
}

/** The editor hands back its own copies; match them to the core's by code, place and text. */
function sameDiagnostic(core: core.Diagnostic, shown: vscode.Diagnostic): boolean {
  return core.code === codeOf(shown) && core.message === shown.message && toRange(core.range).isEqual(shown.range);
}
