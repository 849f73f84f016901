// Quick fixes carried by the checker's diagnostics, and the source action that
// inserts the fewest `reset yaw` lines removing the wrap crossings. Every fix
// is proven by the core (applied, re-checked, the path compared) before the
// editor offers it.
import * as vscode from 'vscode';
import type * as core from '../core';
import { bestReset, fewestResets, proveFix } from '../core/fix';
import { getAnalysis, LANGUAGE_ID, type Analysis } from './analysis';
import { codeOf, DIAGNOSTIC_SOURCE, toCodeAction, toDiagnostic, toRange } from './convert';

export const FEWEST_RESETS_KIND = vscode.CodeActionKind.Source.append('veer').append('fewestResets');
/** The one reset that shrinks the run's final spread most: offered anywhere in the run. */
export const BEST_RESET_KIND = vscode.CodeActionKind.Refactor.append('veer').append('bestReset');

export function registerCodeActions(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.languages.registerCodeActionsProvider(LANGUAGE_ID, new PlanCodeActions(), {
      providedCodeActionKinds: [vscode.CodeActionKind.QuickFix, FEWEST_RESETS_KIND, BEST_RESET_KIND],
    }),
  );
}

/**
 * The editor asks for code actions on every cursor move: the plan-wide fix
 * and each proof are computed once per check result, not once per request.
 */
const fewestResetsByResult = new WeakMap<core.CheckResult, core.Fix | undefined>();
const proofs = new WeakMap<core.Fix, boolean>();

function proven(analysis: Analysis, fix: core.Fix, target?: core.Diagnostic): boolean {
  let ok = proofs.get(fix);
  if (ok === undefined) {
    ok = proveFix(analysis.text, analysis.result, fix, target).ok;
    proofs.set(fix, ok);
  }
  return ok;
}

const bestResetByResult = new WeakMap<core.CheckResult, Map<number, core.Fix | undefined>>();

/** The best reset of the run at `line` (worked out once per check result and run, and proven). */
function bestResetOf(analysis: Analysis, line: number): core.Fix | undefined {
  const result = analysis.result;
  const runIndex = result.runs.findIndex((r) => r.segments.length > 0 && line >= r.line && line <= r.segments[r.segments.length - 1].line);
  if (runIndex < 0) return undefined;
  let byRun = bestResetByResult.get(result);
  if (!byRun) bestResetByResult.set(result, (byRun = new Map()));
  if (!byRun.has(runIndex)) {
    const fix = bestReset(result, runIndex, analysis.text)?.fix;
    byRun.set(runIndex, fix && proven(analysis, fix) ? fix : undefined);
  }
  return byRun.get(runIndex);
}

function fewestResetsOf(analysis: Analysis): core.Fix | undefined {
  const result = analysis.result;
  if (!fewestResetsByResult.has(result)) {
    const fix = fewestResets(result, analysis.text);
    fewestResetsByResult.set(result, fix && proven(analysis, fix) ? fix : undefined);
  }
  return fewestResetsByResult.get(result);
}

class PlanCodeActions implements vscode.CodeActionProvider {
  provideCodeActions(
    document: vscode.TextDocument,
    range: vscode.Range,
    context: vscode.CodeActionContext,
  ): vscode.CodeAction[] {
    const analysis = getAnalysis(document);
    const result = analysis.result;
    const actions: vscode.CodeAction[] = [];
    if (!context.only || context.only.contains(vscode.CodeActionKind.QuickFix)) {
      // The problems the editor passes, and ours in the range asked about: the editor's copy of
      // the problems can lag a moment behind the ones just published.
      const shownFor = (d: core.Diagnostic) => context.diagnostics.find((shown) => shown.source === DIAGNOSTIC_SOURCE && sameDiagnostic(d, shown));
      for (const d of result.diagnostics) {
        // The range first: some fixes are worked out only when asked for (a search of simulations).
        const shown = shownFor(d);
        if (!shown && !toRange(d.range).intersection(range)) continue;
        if (!d.fixes?.length) continue;
        for (const fix of d.fixes) {
          if (!proven(analysis, fix, d)) continue;
          actions.push(toCodeAction(document.uri, fix, vscode.CodeActionKind.QuickFix, [shown ?? toDiagnostic(document.uri, d)]));
        }
      }
    }
    if (!context.only || FEWEST_RESETS_KIND.intersects(context.only)) {
      const fix = fewestResetsOf(analysis);
      if (fix) actions.push(toCodeAction(document.uri, { ...fix, preferred: false }, FEWEST_RESETS_KIND, []));
    }
    if (context.only ? BEST_RESET_KIND.intersects(context.only) : context.triggerKind === vscode.CodeActionTriggerKind.Invoke) {
      const fix = bestResetOf(analysis, range.start.line);
      if (fix) actions.push(toCodeAction(document.uri, { ...fix, preferred: false }, BEST_RESET_KIND, []));
    }
    return actions;
  }
}

/** The editor hands back its own copies; match them to the core's by code, place and text. */
function sameDiagnostic(core: core.Diagnostic, shown: vscode.Diagnostic): boolean {
  return core.code === codeOf(shown) && core.message === shown.message && toRange(core.range).isEqual(shown.range);
}
