// "Veer: Overlay a Recorded Run": reads a log of the active plan's run
// (docs/recorded-runs.md), lays its reconstructed path over the planned and
// predicted paths in the preview, says how far each motion ended from the plan,
// and offers the robot model fitted to the log as setup edits. The log is
// remembered per plan (workspace state) and read again after a reload;
// "Veer: Clear the Recorded Run" forgets it.
import * as vscode from 'vscode';
import type { CheckResult } from '../core';
import { logRobotOf, replayRead, type RecordedOverlay, type Replay } from '../core/record/compare';
import { LogError, readLog, type ReadLog } from '../core/record/log';
import { currentFromSetup, fitFixes, fitRobot } from '../core/record/fit';
import { replayText } from '../cli/replay';
import { getAnalysis, isPlan } from './analysis';
import { toWorkspaceEdit } from './convert';
import { OPEN_PREVIEW_COMMAND, redrawPreview } from './preview';

export const OVERLAY_COMMAND = 'veer.overlayRecordedRun';
export const CLEAR_OVERLAY_COMMAND = 'veer.clearRecordedRun';
const STATE_PREFIX = 'veer.recordedRun:';
/** The largest log the editor reads, bytes. */
const MAX_LOG_BYTES = 64 * 1024 * 1024;

/** What the overlay command resolves with (the editor tests read it). */
export type OverlayOutcome =
  | { status: 'shown'; log: string; run: string; motions: number; alignedBy: 'line' | 'time'; endOffPlanMm?: number; fixes: number }
  | { status: 'error'; message: string; line?: number; column?: number }
  | { status: 'cancelled' };

interface Loaded {
  logUri: vscode.Uri;
  text: string;
  name: string;
  /** The log as last read, and the plan's values it was read with. */
  read?: { key: string; log: ReadLog };
  /** A warning that the log no longer fits the edited plan was shown. */
  warned?: boolean;
  /** The last replay and the check result it was made for. */
  made?: { result: CheckResult; replay?: Replay; error?: string };
}

const loaded = new Map<string, Loaded>();
let state: vscode.Memento | undefined;

export function registerRecordedRun(context: vscode.ExtensionContext): void {
  state = context.workspaceState;
  context.subscriptions.push(
    vscode.commands.registerCommand(OVERLAY_COMMAND, (log?: unknown) => overlayCommand(log)),
    vscode.commands.registerCommand(CLEAR_OVERLAY_COMMAND, () => clearCommand()),
  );
}

function activePlan(): vscode.TextDocument | undefined {
  const active = vscode.window.activeTextEditor?.document;
  if (active && isPlan(active)) return active;
  return vscode.window.visibleTextEditors.map((e) => e.document).find(isPlan);
}

/** The log remembered for a plan, if any. */
export function rememberedLog(plan: vscode.Uri): string | undefined {
  return state?.get<string>(STATE_PREFIX + plan.toString());
}

async function overlayCommand(arg: unknown): Promise<OverlayOutcome> {
  const document = activePlan();
  if (!document) {
    void vscode.window.showInformationMessage('Open a Veer plan (.veer) to lay a recorded run over it.');
    return { status: 'cancelled' };
  }
  let logUri: vscode.Uri | undefined = arg instanceof vscode.Uri ? arg : typeof arg === 'string' ? vscode.Uri.parse(arg, true) : undefined;
  if (!logUri) {
    const remembered = rememberedLog(document.uri);
    const picked = await vscode.window.showOpenDialog({
      canSelectMany: false,
      defaultUri: remembered ? vscode.Uri.parse(remembered, true) : vscode.Uri.joinPath(document.uri, '..'),
      filters: { 'Recorded runs': ['csv', 'tsv', 'txt', 'log'], 'All files': ['*'] },
      openLabel: 'Overlay',
      title: 'Choose the log of a recorded run of this plan',
    });
    logUri = picked?.[0];
  }
  if (!logUri) return { status: 'cancelled' };
  let entry: Loaded;
  try {
    entry = await load(logUri);
  } catch (e) {
    const message = `${basename(logUri)}: ${(e as Error).message}`;
    void vscode.window.showErrorMessage(message);
    return { status: 'error', message };
  }
  const { result } = getAnalysis(document);
  const made = replayFor(entry, result);
  if (!made.replay) {
    const line = made.errorAt?.line;
    const column = made.errorAt?.column;
    const message = `${entry.name}: ${made.error}`;
    void vscode.window.showErrorMessage(message, ...(line !== undefined ? ['Open the Log'] : [])).then(async (choice) => {
      if (choice && line !== undefined) await revealInLog(logUri!, line, column);
    });
    return { status: 'error', message, ...(line !== undefined ? { line } : {}), ...(column !== undefined ? { column } : {}) };
  }
  loaded.set(document.uri.toString(), entry);
  await state?.update(STATE_PREFIX + document.uri.toString(), logUri.toString());
  await vscode.commands.executeCommand(OPEN_PREVIEW_COMMAND, document.uri);
  redrawPreview(document);
  const r = made.replay;
  const c = r.comparison;
  const last = [...c.motions].reverse().find((m) => m.recorded);
  const fit = fitRobot(r.log.run, currentFromSetup(result.setup));
  const fixes = fitFixes(document.getText(), fit);
  const summary = last?.vsPlanned
    ? `ends ${last.vsPlanned.position.toFixed(1)} mm and ${last.vsPlanned.heading.toFixed(1)}° off the plan${last.vsPredicted ? `, ${last.vsPredicted.position.toFixed(1)} mm off the prediction` : ''}`
    : 'reaches no motion';
  const marks = c.motions.filter((m) => m.markMet !== undefined).map((m) => `${m.markMet ? 'meets' : 'misses'} ${m.label}`);
  const actions = ['Show the Comparison', ...(fixes.length ? ['Apply Fitted Values…'] : [])];
  void vscode.window.showInformationMessage(`Recorded run of "${c.name}" (${entry.name}) ${summary}${marks.length ? `; ${marks.join(', ')}` : ''}. Try changes at low speed first.`, ...actions).then(async (choice) => {
    if (choice === 'Show the Comparison') {
      const doc = await vscode.workspace.openTextDocument({ content: replayText(basename(document.uri), entry.name, r, fit, fixes), language: 'plaintext' });
      await vscode.window.showTextDocument(doc, { preview: true, viewColumn: vscode.ViewColumn.Beside });
    } else if (choice === 'Apply Fitted Values…') {
      const pick = await vscode.window.showQuickPick(fixes.map((f) => ({ label: f.title, fix: f })), { title: 'Setup edits from the recorded run', placeHolder: 'Each edit changes the plan\'s robot (and so the prediction)' });
      if (pick) await vscode.workspace.applyEdit(toWorkspaceEdit(document.uri, pick.fix.edits));
    }
  });
  return { status: 'shown', log: logUri.toString(), run: c.name, motions: c.motions.filter((m) => m.recorded).length, alignedBy: c.alignedBy, ...(last?.vsPlanned ? { endOffPlanMm: last.vsPlanned.position } : {}), fixes: fixes.length };
}

async function clearCommand(): Promise<boolean> {
  const document = activePlan();
  if (!document) return false;
  const key = document.uri.toString();
  const had = loaded.delete(key) || rememberedLog(document.uri) !== undefined;
  await state?.update(STATE_PREFIX + key, undefined);
  redrawPreview(document);
  return had;
}

async function load(logUri: vscode.Uri): Promise<Loaded> {
  const stat = await vscode.workspace.fs.stat(logUri);
  if (stat.size > MAX_LOG_BYTES) throw new Error(`too large for a log (${(stat.size / 1e6).toFixed(0)} MB; the editor reads at most ${MAX_LOG_BYTES / 1024 / 1024} MB): cut it to the run, or use \`veer replay\``);
  const bytes = await vscode.workspace.fs.readFile(logUri);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new Error('is not UTF-8 text; save the log as UTF-8 (or plain ASCII) text');
  }
  return { logUri, text, name: basename(logUri) };
}

function replayFor(entry: Loaded, result: CheckResult): { replay?: Replay; error?: string; errorAt?: { line?: number; column?: number } } {
  if (entry.made?.result === result) return { replay: entry.made.replay, error: entry.made.error };
  try {
    // The log is read again only when the plan's wheel or yaw range changes; every edit reconstructs and compares.
    const robot = logRobotOf(result);
    const key = `${robot.wheelDiameter}|${robot.mismatch}|${robot.yawLo}`;
    if (entry.read?.key !== key) entry.read = { key, log: readLog(entry.text, entry.name, robot) };
    const replay = replayRead(result, entry.read.log);
    entry.made = { result, replay };
    return { replay };
  } catch (e) {
    if (!(e instanceof LogError)) throw e;
    entry.made = { result, error: e.message };
    return { error: e.message, errorAt: { line: e.line, column: e.column } };
  }
}

/**
 * The recorded paths to draw over `document`'s plan (the preview calls this on
 * every drawing). A remembered log not yet read is read now and the preview
 * redrawn when it arrives.
 */
export function recordedOverlayFor(document: vscode.TextDocument, result: CheckResult): RecordedOverlay | undefined {
  const key = document.uri.toString();
  const entry = loaded.get(key);
  if (!entry) {
    const remembered = rememberedLog(document.uri);
    if (remembered && !pending.has(key)) {
      pending.add(key);
      load(vscode.Uri.parse(remembered, true)).then((e) => {
        loaded.set(key, e);
        redrawPreview(document);
      }, (err: Error) => {
        void vscode.window.showWarningMessage(`The recorded run remembered for ${basename(document.uri)} cannot be read: ${err.message}. Run "Veer: Clear the Recorded Run" to forget it.`);
      });
    }
    return undefined;
  }
  const made = replayFor(entry, result);
  if (!made.replay && made.error && !entry.warned) {
    // The plan changed so that the log no longer fits it: draw without it, and say so once (not on every keystroke).
    entry.warned = true;
    void vscode.window.showWarningMessage(`The recorded run ${entry.name} does not fit the plan as it is now, so the preview leaves it out until it does: ${made.error}`);
  }
  return made.replay?.overlay;
}

const pending = new Set<string>();

async function revealInLog(logUri: vscode.Uri, line: number, column?: number): Promise<void> {
  const doc = await vscode.workspace.openTextDocument(logUri);
  const l = Math.max(0, Math.min(doc.lineCount - 1, line - 1));
  let start = 0;
  let end = doc.lineAt(l).text.length;
  if (column !== undefined) {
    // Columns are delimited cells: select the one named.
    const text = doc.lineAt(l).text;
    const delimiter = [',', '\t', ';', '|'].find((d) => text.includes(d)) ?? ',';
    const cells = text.split(delimiter);
    start = cells.slice(0, column - 1).reduce((n, c) => n + c.length + 1, 0);
    end = Math.min(text.length, start + (cells[column - 1]?.length ?? 0));
  }
  await vscode.window.showTextDocument(doc, { selection: new vscode.Range(l, start, l, end) });
}

function basename(uri: vscode.Uri): string {
  return uri.path.split('/').pop() || uri.toString();
}
