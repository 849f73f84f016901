// "Veer: Sample the Runs (Monte Carlo)": samples every run of the active plan
// on its error model in a worker thread (dist/sampleWorker.js), with a
// cancellable progress notification, and hands the cloud of end points to the
// path preview, which draws it until the plan's next edit. The extension host
// only starts the worker and waits for messages: it never samples itself.
import * as vscode from 'vscode';
import type { SpreadCloud } from '../core/render/cloud';
import { getAnalysis, isPlan } from './analysis';
import { isPreviewing, OPEN_PREVIEW_COMMAND, showCloud } from './preview';
import type { SampleRequest } from './sampleWorker';
import { runWorker } from './sampleRunner';

export const SAMPLE_COMMAND = 'veer.sampleRuns';
export const SAMPLE_COUNT_SETTING = 'sampling.count';
const DEFAULT_COUNT = 1000;
const MIN_COUNT = 10;
const MAX_COUNT = 100_000;
/** The seed of `veer check --json --samples N` without `--seed`: the editor's cloud is the command line's. */
const SEED = 1;

/** What the command resolves with (the editor tests read it). */
export type SamplingOutcome =
  | { status: 'done'; count: number; ms: number; dots: number | undefined; marks: { line: number; label: string; sampled: number; linear?: number }[] }
  | { status: 'cancelled' }
  | { status: 'stale' };

/** The plan being sampled, while a sampling runs: one at a time. */
let sampling: string | undefined;

export function registerSampling(context: vscode.ExtensionContext): void {
  const script = vscode.Uri.joinPath(context.extensionUri, 'dist', 'sampleWorker.js').fsPath;
  context.subscriptions.push(vscode.commands.registerCommand(SAMPLE_COMMAND, async () => {
    if (sampling) {
      void vscode.window.showInformationMessage(`Veer is already sampling the runs of ${sampling}: wait for it, or cancel it in its notification.`);
      return undefined;
    }
    sampling = 'a plan';
    try {
      return await sampleActivePlan(script, (name) => { sampling = name; });
    } finally {
      sampling = undefined;
    }
  }));
}

async function sampleActivePlan(script: string, started: (name: string) => void): Promise<SamplingOutcome | undefined> {
  const active = vscode.window.activeTextEditor?.document;
  const document = active && isPlan(active) ? active : vscode.window.visibleTextEditors.map((e) => e.document).find(isPlan);
  if (!document) {
    void vscode.window.showInformationMessage('Open a Veer plan (.veer) to sample its runs.');
    return undefined;
  }
  const count = vscode.workspace.getConfiguration('veer', document).get<unknown>(SAMPLE_COUNT_SETTING, DEFAULT_COUNT);
  if (typeof count !== 'number' || !Number.isInteger(count) || count < MIN_COUNT || count > MAX_COUNT) {
    void vscode.window.showErrorMessage(`The setting veer.${SAMPLE_COUNT_SETTING} must be a whole number of runs from ${MIN_COUNT} to ${MAX_COUNT.toLocaleString('en')} `
      + `(it is ${JSON.stringify(count)}); change it in Settings › Veer, e.g. to ${DEFAULT_COUNT}.`);
    return undefined;
  }
  const { result, version, text } = getAnalysis(document);
  const track = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
  if (track === undefined || result.runs.length === 0) {
    void vscode.window.showInformationMessage('Nothing to sample yet: the plan needs a robot with its track width and at least one run.');
    return undefined;
  }
  const name = document.uri.path.split('/').pop() ?? document.uri.toString();
  started(name);
  if (!isPreviewing(document)) await vscode.commands.executeCommand(OPEN_PREVIEW_COMMAND, document.uri);
  const request: SampleRequest = { text, fileName: name, count, seed: SEED };
  let reply: { cloud: SpreadCloud; ms: number } | 'cancelled';
  try {
    reply = await vscode.window.withProgress(
      { location: vscode.ProgressLocation.Notification, title: `Sampling ${count.toLocaleString('en')} runs of ${name}`, cancellable: true },
      (progress, token) => runWorker(script, request, token, (done) => progress.report(done)),
    );
  } catch (e) {
    void vscode.window.showErrorMessage(`The sampling of ${name} failed: ${e instanceof Error ? e.message : String(e)}`);
    return undefined;
  }
  if (reply === 'cancelled') return { status: 'cancelled' };
  if (document.version !== version) {
    void vscode.window.showInformationMessage(`${name} changed while its runs were sampled; run "Veer: Sample the Runs" again for the new text.`);
    return { status: 'stale' };
  }
  const { cloud, ms } = reply;
  const marks = cloud.spots.filter((s) => s.kind === 'mark' && s.share !== undefined).map((s) => {
    const seg = result.runs[s.run]?.segments[s.segment];
    return { line: s.line, label: seg?.label ?? '', sampled: s.share!, ...(seg?.hitProbability !== undefined ? { linear: seg.hitProbability } : {}) };
  });
  const dots = await showCloud(document, version, cloud);
  const pct = (p: number) => `${Math.round(p * 1000) / 10} %`;
  const said = marks.slice(0, 3).map((m) => `${m.label} met by ${pct(m.sampled)}${m.linear !== undefined ? ` (the oval's model: ${pct(m.linear)})` : ''}`);
  void vscode.window.showInformationMessage(`Sampled ${count.toLocaleString('en')} runs of ${name} in ${(ms / 1000).toFixed(1)} s`
    + `${said.length ? `: ${said.join('; ')}${marks.length > 3 ? '; …' : ''}` : ''}. The dots in the preview clear at the next edit.`);
  return { status: 'done', count, ms, dots, marks };
}
