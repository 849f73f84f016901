// The shared per-document analysis: the latest CheckResult of every open plan.
//
// API (also used by the preview host):
//   getAnalysis(document): Analysis
//       The result for the document's current version. Checks at once when the
//       cache is older than the document (the core is synchronous and fast), so
//       hovers, hints and completion never see a stale plan.
//   onDidAnalyse: vscode.Event<Analysis>
//       Fires after a document has been checked: once when a plan opens, then
//       after each pause in typing (`veer.check.delay` ms). Handlers should
//       still compare `analysis.version` with the document's version if they do
//       async work, and drop results that have become stale.
//   registerAnalysis(context): starts the tracking; call once from activate.
//
// One ExpressionCache per document keeps compiled expressions between checks.
import * as vscode from 'vscode';
import { checkPlan, ExpressionCache, type CheckResult } from '../core';

export const LANGUAGE_ID = 'veer';

export interface Analysis {
  uri: vscode.Uri;
  version: number;
  /** The text that was checked (fixes are proven against it). */
  text: string;
  result: CheckResult;
}

interface DocumentState {
  cache: ExpressionCache;
  latest?: Analysis;
  timer?: ReturnType<typeof setTimeout>;
}

const states = new Map<string, DocumentState>();
const analysed = new vscode.EventEmitter<Analysis>();
export const onDidAnalyse: vscode.Event<Analysis> = analysed.event;

export function isPlan(document: vscode.TextDocument): boolean {
  return document.languageId === LANGUAGE_ID;
}

export function getAnalysis(document: vscode.TextDocument): Analysis {
  const state = stateOf(document);
  if (state.latest && state.latest.version === document.version) return state.latest;
  return analyse(document, state);
}

export function registerAnalysis(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    analysed,
    vscode.workspace.onDidOpenTextDocument((document) => {
      if (isPlan(document)) publish(document);
    }),
    vscode.workspace.onDidChangeTextDocument((event) => {
      if (isPlan(event.document) && event.contentChanges.length > 0) schedule(event.document);
    }),
    vscode.workspace.onDidCloseTextDocument((document) => forget(document.uri)),
    { dispose: () => [...states.values()].forEach((state) => state.timer && clearTimeout(state.timer)) },
  );
  for (const document of vscode.workspace.textDocuments) {
    if (isPlan(document)) publish(document);
  }
}

function stateOf(document: vscode.TextDocument): DocumentState {
  const key = document.uri.toString();
  let state = states.get(key);
  if (!state) {
    state = { cache: new ExpressionCache() };
    states.set(key, state);
  }
  return state;
}

function analyse(document: vscode.TextDocument, state: DocumentState): Analysis {
  const text = document.getText();
  const result = checkPlan(text, { fileName: fileNameOf(document.uri), cache: state.cache });
  const analysis: Analysis = { uri: document.uri, version: document.version, text, result };
  // A check of an older version finishing late must never replace a newer one.
  if (!state.latest || state.latest.version <= analysis.version) state.latest = analysis;
  return analysis;
}

function publish(document: vscode.TextDocument): void {
  analysed.fire(getAnalysis(document));
}

function schedule(document: vscode.TextDocument): void {
  const state = stateOf(document);
  if (state.timer) clearTimeout(state.timer);
  const delay = vscode.workspace.getConfiguration('veer', document).get<number>('check.delay', 300);
  state.timer = setTimeout(() => {
    state.timer = undefined;
    if (document.isClosed) return;
    publish(document);
  }, Math.max(0, delay));
}

function forget(uri: vscode.Uri): void {
  const key = uri.toString();
  const state = states.get(key);
  if (state?.timer) clearTimeout(state.timer);
  states.delete(key);
}

function fileNameOf(uri: vscode.Uri): string {
  const base = uri.path.split('/').pop() ?? '';
  return base || uri.toString();
}
