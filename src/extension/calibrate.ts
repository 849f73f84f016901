// Calibration in the editor: "Veer: Write Calibration Runs" opens the runs
// that measure the active plan's robot; the record next to a plan (NAME.calib)
// gets its problems underlined, and a hover on each line with its result; the
// plan's `wheel`, `track` and `gyro` lines get the computed values as a hover
// and as edits. The core computes everything; this file only converts.
import * as vscode from 'vscode';
import {
  calibratePlan, parseRecord, planCalibrationHover, recordHover, writeCalibrationRuns, type CalibrationRecord, type PlanCalibration,
} from '../core/calibrate';
import type { LengthUnitName } from '../core/types';
import { getAnalysis, isPlan, LANGUAGE_ID, onDidAnalyse } from './analysis';
import { toCodeAction, toHover, toRange } from './convert';

export const RECORD_LANGUAGE_ID = 'veer-calibration';
export const WRITE_RUNS_COMMAND = 'veer.writeCalibrationRuns';
const RECORD_SOURCE = 'veer calibration';

/** The record next to a plan: the same name, ending `.calib`. */
function recordUriOf(plan: vscode.Uri): vscode.Uri | undefined {
  if (!/\.veer$/i.test(plan.path)) return undefined;
  return plan.with({ path: plan.path.replace(/\.veer$/i, '.calib') });
}

function planUriOf(record: vscode.Uri): vscode.Uri {
  return record.with({ path: record.path.replace(/\.calib$/i, '.veer') });
}

function baseName(uri: vscode.Uri): string {
  return uri.path.replace(/^.*\//, '');
}

/** A document's text: the open editor's (unsaved edits included), else the file's; undefined when there is none. */
async function textOf(uri: vscode.Uri): Promise<string | undefined> {
  const open = vscode.workspace.textDocuments.find((d) => d.uri.toString() === uri.toString());
  if (open) return open.getText();
  try {
    return new TextDecoder('utf-8').decode(await vscode.workspace.fs.readFile(uri));
  } catch {
    return undefined;
  }
}

/** The calibration of a plan document from its record, or undefined when it has none. */
async function calibrationOf(document: vscode.TextDocument): Promise<{ calibration: PlanCalibration; recordName: string } | undefined> {
  const recordUri = recordUriOf(document.uri);
  if (!recordUri) return undefined;
  const recordText = await textOf(recordUri);
  if (recordText === undefined) return undefined;
  const analysis = getAnalysis(document);
  return { calibration: calibratePlan(analysis.result, analysis.text, recordText), recordName: baseName(recordUri) };
}

export function registerCalibration(context: vscode.ExtensionContext): void {
  const problems = vscode.languages.createDiagnosticCollection(RECORD_SOURCE);
  context.subscriptions.push(problems);

  context.subscriptions.push(vscode.commands.registerCommand(WRITE_RUNS_COMMAND, async () => {
    const editor = vscode.window.activeTextEditor;
    if (!editor || !isPlan(editor.document)) {
      void vscode.window.showErrorMessage('Veer: open a plan (a .veer file) first: the calibration runs are written for its robot and field.');
      return;
    }
    const plan = editor.document;
    const planName = baseName(plan.uri).replace(/\.veer$/i, '') + (/\.veer$/i.test(plan.uri.path) ? '.veer' : '');
    const runs = writeCalibrationRuns(getAnalysis(plan).result, { planName: planName || 'plan.veer' });
    if (!runs.text) {
      void vscode.window.showErrorMessage(`Veer: no calibration runs for this plan: ${runs.problems.join('; ')}.`);
      return;
    }
    const document = await vscode.workspace.openTextDocument({ language: LANGUAGE_ID, content: runs.text });
    await vscode.window.showTextDocument(document, { viewColumn: vscode.ViewColumn.Beside, preview: false });
  }));

  // The plan's setup lines: the values as a hover and as edits.
  context.subscriptions.push(vscode.languages.registerHoverProvider(LANGUAGE_ID, {
    async provideHover(document, position) {
      const found = await calibrationOf(document);
      if (!found?.calibration.calibration) return undefined;
      const info = planCalibrationHover(getAnalysis(document).result, found.calibration.calibration, found.recordName, { line: position.line, character: position.character });
      return info && toHover(info);
    },
  }));
  context.subscriptions.push(vscode.languages.registerCodeActionsProvider(LANGUAGE_ID, {
    async provideCodeActions(document, range) {
      const analysis = getAnalysis(document);
      const setup = analysis.result.ast.statements.filter((s) => (s.kind === 'wheel' || s.kind === 'track' || s.kind === 'gyro') && s.line >= range.start.line && s.line <= range.end.line);
      if (!setup.length) return [];
      const found = await calibrationOf(document);
      if (!found) return [];
      const { fixes, all } = found.calibration.edits;
      const lines = new Set(setup.map((s) => s.line));
      // The fixes that edit this line (a new `gyro` line belongs to the line above it), and everything at once.
      const here = fixes.filter((f) => f.edits.some((e) => lines.has(e.range.start.line) || lines.has(e.range.start.line - 1)));
      return [...here, ...(all && here.length ? [all] : [])].map((f) => toCodeAction(document.uri, f, vscode.CodeActionKind.QuickFix, []));
    },
  }, { providedCodeActionKinds: [vscode.CodeActionKind.QuickFix] }));

  // The record: its problems, and each line's result.
  context.subscriptions.push(vscode.languages.registerHoverProvider(RECORD_LANGUAGE_ID, {
    async provideHover(document, position) {
      const { record, computed, lengthUnit } = await recordCalibration(document);
      const info = recordHover(record, computed?.calibration, lengthUnit, { line: position.line, character: position.character });
      return info && toHover(info);
    },
  }));
  const refresh = async (document: vscode.TextDocument) => {
    if (document.languageId !== RECORD_LANGUAGE_ID) return;
    const { record, computed } = await recordCalibration(document);
    const all = [...record.problems, ...(computed?.calibration?.problems ?? [])];
    problems.set(document.uri, all.map((p) => {
      const d = new vscode.Diagnostic(toRange(p.range), p.message.replace(/^line \d+: /, ''), p.severity === 'error' ? vscode.DiagnosticSeverity.Error : vscode.DiagnosticSeverity.Warning);
      d.source = RECORD_SOURCE;
      return d;
    }));
  };
  context.subscriptions.push(
    vscode.workspace.onDidOpenTextDocument((d) => void refresh(d)),
    vscode.workspace.onDidChangeTextDocument((e) => { if (e.contentChanges.length > 0) void refresh(e.document); }),
    vscode.workspace.onDidCloseTextDocument((d) => problems.delete(d.uri)),
    // A changed plan changes what its open record computes (a missing track, another wheel).
    onDidAnalyse((analysis) => {
      const recordUri = recordUriOf(analysis.uri);
      const record = recordUri && vscode.workspace.textDocuments.find((d) => d.uri.toString() === recordUri.toString());
      if (record) void refresh(record);
    }),
  );
  for (const d of vscode.workspace.textDocuments) void refresh(d);
}

/**
 * A record document read once, and computed against its plan when it has one. The record is
 * calibratePlan's own reading, except for a plan without a usable wheel, where that one carries the
 * plan's problem (the record's lines show their own problems only).
 */
async function recordCalibration(document: vscode.TextDocument): Promise<{ record: CalibrationRecord; computed?: PlanCalibration; lengthUnit: LengthUnitName }> {
  const plan = await planOf(document);
  const analysis = plan && getAnalysis(plan);
  const computed = analysis ? calibratePlan(analysis.result, analysis.text, document.getText()) : undefined;
  const record = computed?.calibration ? computed.record : parseRecord(document.getText());
  return { record, computed, lengthUnit: analysis ? analysis.result.setup.lengthUnit : 'mm' };
}

/** The plan a record belongs to (the same name, ending `.veer`), opened without showing it. */
async function planOf(record: vscode.TextDocument): Promise<vscode.TextDocument | undefined> {
  const uri = planUriOf(record.uri);
  if (uri.toString() === record.uri.toString()) return undefined;
  try {
    const document = await vscode.workspace.openTextDocument(uri);
    return isPlan(document) ? document : undefined;
  } catch {
    return undefined;
  }
}
