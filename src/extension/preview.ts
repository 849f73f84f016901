// The path preview's host side: one webview panel beside the editor that
// follows the active plan, renders the core's SVG for it, keeps the drawing
// and the text linked both ways, exports, and comes back after a reload.
// It also sends the predicted timeline with each drawing, the trace of the
// motion under the cursor, and marks in the editor the line the preview's
// scrubber has reached.
import { previewCsp } from '../shared/csp';
import { randomBytes } from 'crypto';
import * as vscode from 'vscode';
import { renderSvg, targetTables, targetsCsv, targetsMarkdown, type CheckResult } from '../core';
import { buildTimeline, traceForLine } from '../core/sim/view';
import {
  buildRenderMessage,
  parsePreviewMessage,
  type DocumentStamp,
  type HostMessage,
  type PreviewMessage,
} from '../shared/messages';
import { getAnalysis, isPlan, onDidAnalyse } from './analysis';
import { recordedOverlayFor } from './recordedRun';
import type { SpreadCloud, SpreadShown } from '../core/render/cloud';
import { SPREAD_SHOWN } from '../shared/messages';

export const PREVIEW_VIEW_TYPE = 'veer.preview';
export const OPEN_PREVIEW_COMMAND = 'veer.openPreview';

/** The cursor highlight follows selection changes at most this often, ms. */
const CURSOR_THROTTLE_MS = 50;
const DEFAULT_DELAY_MS = 100;
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

let current: PathPreview | undefined;

/** The line the preview's scrubber has reached, marked across the whole line in the editor. */
let scrubDecoration: vscode.TextEditorDecorationType | undefined;

export function registerPreview(context: vscode.ExtensionContext): void {
  const mediaRoot = vscode.Uri.joinPath(context.extensionUri, 'media');
  scrubDecoration = vscode.window.createTextEditorDecorationType({
    isWholeLine: true,
    backgroundColor: new vscode.ThemeColor('editor.rangeHighlightBackground'),
    overviewRulerColor: new vscode.ThemeColor('editorOverviewRuler.rangeHighlightForeground'),
    overviewRulerLane: vscode.OverviewRulerLane.Center,
  });
  context.subscriptions.push(
    vscode.commands.registerCommand(OPEN_PREVIEW_COMMAND, async (resource?: unknown) => {
      const document = await planToPreview(resource);
      if (!document) {
        void vscode.window.showInformationMessage('Open a Veer plan (.veer) to preview its path.');
        return;
      }
      if (current) {
        current.reveal();
      } else {
        const panel = vscode.window.createWebviewPanel(
          PREVIEW_VIEW_TYPE,
          previewTitle(document),
          { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true },
          webviewOptions(mediaRoot),
        );
        current = new PathPreview(panel, mediaRoot);
      }
      current.show(document);
    }),
    vscode.window.registerWebviewPanelSerializer(PREVIEW_VIEW_TYPE, {
      async deserializeWebviewPanel(panel: vscode.WebviewPanel, state: unknown) {
        panel.webview.options = webviewOptions(mediaRoot);
        current?.dispose();
        current = new PathPreview(panel, mediaRoot);
        const restored = restoredState(state);
        if (restored?.spread) current.spread = restored.spread;
        const document = restored ? await openDocument(restored.uri) : undefined;
        if (document) current.show(document, restored?.run);
      },
    }),
    vscode.window.onDidChangeActiveTextEditor((editor) => {
      if (editor && isPlan(editor.document)) current?.show(editor.document);
    }),
    vscode.workspace.onDidChangeTextDocument((event) => current?.documentChanged(event.document)),
    onDidAnalyse((analysis) => current?.analysed(analysis.uri, analysis.version)),
    vscode.window.onDidChangeTextEditorSelection((event) => current?.selectionChanged(event.textEditor)),
    vscode.window.onDidChangeVisibleTextEditors(() => current?.markScrub()),
    { dispose: () => current?.dispose() },
    scrubDecoration,
  );
}

function webviewOptions(mediaRoot: vscode.Uri): vscode.WebviewOptions & vscode.WebviewPanelOptions {
  return { enableScripts: true, localResourceRoots: [mediaRoot] };
}

async function planToPreview(resource: unknown): Promise<vscode.TextDocument | undefined> {
  // From the editor title button the command gets the file's URI.
  if (resource instanceof vscode.Uri) {
    const document = await openDocument(resource.toString());
    if (document && isPlan(document)) return document;
  }
  const active = vscode.window.activeTextEditor?.document;
  if (active && isPlan(active)) return active;
  return vscode.window.visibleTextEditors.map((e) => e.document).find(isPlan);
}

async function openDocument(uri: string): Promise<vscode.TextDocument | undefined> {
  try {
    return await vscode.workspace.openTextDocument(vscode.Uri.parse(uri, true));
  } catch {
    return undefined;
  }
}

/** The webview's saved state is untrusted data: keep only the fields the host needs. */
function restoredState(state: unknown): { uri: string; run: number; spread?: SpreadShown } | undefined {
  if (typeof state !== 'object' || state === null) return undefined;
  const s = state as Record<string, unknown>;
  if (typeof s.uri !== 'string' || s.uri === '') return undefined;
  const spread = SPREAD_SHOWN.find((v) => v === s.spread);
  return { uri: s.uri, run: typeof s.run === 'number' && Number.isInteger(s.run) ? s.run : -1, ...(spread ? { spread } : {}) };
}

/** How long the sampling command waits for the preview to say it drew the cloud (a new webview loads first), ms. */
const CLOUD_SHOWN_TIMEOUT_MS = 60000;

/**
 * Hands a Monte Carlo cloud of `document` at `version` to the preview, which
 * draws it until the plan's next edit. Resolves with the number of dots the
 * webview reports on screen, or undefined when no preview shows this document
 * (or it did not answer in time).
 */
export function showCloud(document: vscode.TextDocument, version: number, cloud: SpreadCloud): Promise<number | undefined> {
  return current ? current.showCloud(document, version, cloud) : Promise.resolve(undefined);
}

/** Draws `document` again if the preview shows it (a recorded run was laid over it or cleared). */
export function redrawPreview(document: vscode.TextDocument): void {
  if (current && isPreviewing(document)) current.show(document);
}

/** Whether the preview is open on this document. */
export function isPreviewing(document: vscode.TextDocument): boolean {
  return current?.previewing(document.uri) ?? false;
}

export function previewHtml(webview: vscode.Webview, mediaRoot: vscode.Uri): string {
  const nonce = randomBytes(18).toString('base64');
  const css = webview.asWebviewUri(vscode.Uri.joinPath(mediaRoot, 'preview.css'));
  const chartCss = webview.asWebviewUri(vscode.Uri.joinPath(mediaRoot, 'uplot.css'));
  const script = webview.asWebviewUri(vscode.Uri.joinPath(mediaRoot, 'preview.js'));
  const csp = previewCsp(webview.cspSource, nonce);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="UTF-8">
<meta http-equiv="Content-Security-Policy" content="${csp}">
<meta name="viewport" content="width=device-width, initial-scale=1.0">
<link rel="stylesheet" href="${chartCss.toString()}">
<link rel="stylesheet" href="${css.toString()}">
<title>Path Preview</title>
</head>
<body>
<script nonce="${nonce}" src="${script.toString()}"></script>
</body>
</html>`;
}

class PathPreview implements vscode.Disposable {
  private document: vscode.TextDocument | undefined;
  private run = -1;
  /** The drawing area's width in CSS pixels, as the webview last reported it. */
  private viewWidth = 1000;
  /** What the webview was last sent; its messages about anything else are stale. */
  private posted: DocumentStamp | undefined;
  private renderTimer: ReturnType<typeof setTimeout> | undefined;
  private cursorTimer: ReturnType<typeof setTimeout> | undefined;
  private cursorPending = false;
  private readonly disposables: vscode.Disposable[] = [];
  private disposed = false;
  /** What the last trace was made from: another is sent only when the cursor's line or the check result changes. */
  private traced: { result: CheckResult; line: number; stamp: DocumentStamp } | undefined;
  /** The line the scrubber reached (-1: none), marked in the document's visible editors. */
  private scrubLine = -1;
  /** Where the drawing shows the 95 % ovals (the toolbar's choice). */
  spread: SpreadShown = 'marks';
  /** The last Monte Carlo cloud, for one version of one document: cleared by the next edit. */
  private cloud: { uri: string; version: number; cloud: SpreadCloud; id: number } | undefined;
  /** Numbers the clouds, so the webview's word that it drew one is about that one. */
  private cloudSerial = 0;
  /** Sampling commands waiting for the webview to draw their cloud. */
  private cloudWaiters: { id: number; resolve: (dots: number | undefined) => void }[] = [];

  constructor(private readonly panel: vscode.WebviewPanel, mediaRoot: vscode.Uri) {
    panel.webview.html = previewHtml(panel.webview, mediaRoot);
    this.disposables.push(
      panel.webview.onDidReceiveMessage((raw: unknown) => {
        const message = parsePreviewMessage(raw);
        if (message) void this.onMessage(message);
      }),
      panel.onDidDispose(() => this.dispose()),
    );
  }

  reveal(): void {
    this.panel.reveal(undefined, true);
  }

  show(document: vscode.TextDocument, run = -1): void {
    if (this.document?.uri.toString() !== document.uri.toString()) {
      this.setScrub(-1);
      this.document = document;
      this.run = run;
      this.posted = undefined;
    }
    this.panel.title = previewTitle(document);
    this.renderNow();
    this.postCursor();
  }

  documentChanged(document: vscode.TextDocument): void {
    if (!this.isPreviewing(document.uri)) return;
    this.document = document;
    if (this.renderTimer) clearTimeout(this.renderTimer);
    const delay = vscode.workspace.getConfiguration('veer', document).get<number>('preview.delay', DEFAULT_DELAY_MS);
    this.renderTimer = setTimeout(() => this.renderNow(), Math.max(0, delay));
  }

  /** Another feature checked the plan: draw it unless this version is already shown. */
  analysed(uri: vscode.Uri, version: number): void {
    if (this.isPreviewing(uri) && (this.posted?.version ?? -1) < version && this.document?.version === version) this.renderNow();
  }

  selectionChanged(editor: vscode.TextEditor): void {
    if (!this.isPreviewing(editor.document.uri)) return;
    if (this.cursorTimer) {
      this.cursorPending = true;
      return;
    }
    this.postCursor(editor);
    this.cursorTimer = setTimeout(() => {
      this.cursorTimer = undefined;
      if (this.cursorPending) {
        this.cursorPending = false;
        this.postCursor();
      }
    }, CURSOR_THROTTLE_MS);
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    if (current === this) current = undefined;
    if (this.renderTimer) clearTimeout(this.renderTimer);
    if (this.cursorTimer) clearTimeout(this.cursorTimer);
    this.setScrub(-1);
    for (const waiter of [...this.cloudWaiters]) waiter.resolve(undefined);
    this.disposables.forEach((d) => d.dispose());
    this.panel.dispose();
  }

  previewing(uri: vscode.Uri): boolean {
    return this.isPreviewing(uri);
  }

  showCloud(document: vscode.TextDocument, version: number, cloud: SpreadCloud): Promise<number | undefined> {
    if (!this.isPreviewing(document.uri) || document.version !== version) return Promise.resolve(undefined);
    const id = ++this.cloudSerial;
    this.cloud = { uri: document.uri.toString(), version, cloud, id };
    return new Promise((resolve) => {
      const waiter = {
        id,
        resolve: (dots: number | undefined) => {
          clearTimeout(timer);
          this.cloudWaiters = this.cloudWaiters.filter((w) => w !== waiter);
          resolve(dots);
        },
      };
      const timer = setTimeout(() => waiter.resolve(undefined), CLOUD_SHOWN_TIMEOUT_MS);
      this.cloudWaiters.push(waiter);
      this.renderNow();
    });
  }

  /** The cloud of this version of the document, if it has one; an older document version's cloud is dropped. */
  private cloudFor(uri: string, version: number): { cloud: SpreadCloud; id: number } | undefined {
    if (this.cloud && (this.cloud.uri !== uri || this.cloud.version < version)) this.cloud = undefined;
    return this.cloud?.version === version ? this.cloud : undefined;
  }

  private isPreviewing(uri: vscode.Uri): boolean {
    return !this.disposed && this.document?.uri.toString() === uri.toString();
  }

  private editorOf(document: vscode.TextDocument): vscode.TextEditor | undefined {
    const uri = document.uri.toString();
    const active = vscode.window.activeTextEditor;
    if (active?.document.uri.toString() === uri) return active;
    return vscode.window.visibleTextEditors.find((e) => e.document.uri.toString() === uri);
  }

  private post(message: HostMessage): void {
    if (!this.disposed) void this.panel.webview.postMessage(message);
  }

  private renderNow(): void {
    if (this.renderTimer) clearTimeout(this.renderTimer);
    this.renderTimer = undefined;
    const document = this.document;
    if (!document || this.disposed) return;
    const { result, version, text } = getAnalysis(document);
    if (this.run >= result.runs.length) this.run = -1;
    const shown = this.cloudFor(document.uri.toString(), version);
    const cloud = shown?.cloud;
    const recorded = recordedOverlayFor(document, result);
    const svg = renderSvg(result, { standalone: false, width: this.viewWidth, ...runOption(this.run), spread: this.spread, ...(cloud ? { cloud } : {}), ...(recorded ? { recorded } : {}) });
    const message = buildRenderMessage(result, { uri: document.uri.toString(), version }, this.run, svg, targetTables(result, text), this.viewWidth,
      buildTimeline(result, this.run));
    message.spread = this.spread;
    if (shown) message.cloud = { count: shown.cloud.count, id: shown.id, dots: shown.cloud.spots.filter((s) => this.run < 0 || s.run === this.run).reduce((n, s) => n + s.x.length, 0) };
    this.posted = { uri: message.uri, version: message.version };
    this.post(message);
    this.postTrace();
  }

  private postCursor(editor = this.document && this.editorOf(this.document)): void {
    if (!editor || !this.posted) return;
    this.post({ type: 'cursor', uri: editor.document.uri.toString(), version: editor.document.version, line: editor.selection.active.line });
    this.postTrace(editor);
  }

  /** The trace of the motion on the cursor's line, unless the webview already has it. */
  private postTrace(editor = this.document && this.editorOf(this.document)): void {
    const document = this.document;
    if (!document || !this.posted || this.disposed) return;
    const { result, version } = getAnalysis(document);
    const line = editor?.document.uri.toString() === document.uri.toString() ? editor.selection.active.line : this.traced?.line ?? 0;
    const stamp = { uri: document.uri.toString(), version };
    if (this.traced && this.traced.result === result && this.traced.line === line && this.traced.stamp.uri === stamp.uri) return;
    this.traced = { result, line, stamp };
    this.post({ type: 'trace', ...stamp, ...traceForLine(result, line) });
  }

  /** Marks the scrubbed line in every visible editor of the document (-1 clears the mark). */
  private setScrub(line: number): void {
    this.scrubLine = line;
    this.markScrub();
  }

  markScrub(): void {
    if (!scrubDecoration) return;
    const uri = this.document?.uri.toString();
    for (const editor of vscode.window.visibleTextEditors) {
      const mine = editor.document.uri.toString() === uri && !this.disposed && this.scrubLine >= 0 && this.scrubLine < editor.document.lineCount;
      editor.setDecorations(scrubDecoration, mine ? [new vscode.Range(this.scrubLine, 0, this.scrubLine, 0)] : []);
    }
  }

  private async onMessage(message: PreviewMessage): Promise<void> {
    if (message.type === 'ready') {
      // The webview (re)loaded, e.g. after being hidden: it has nothing drawn.
      if (message.spread) this.spread = message.spread;
      this.posted = undefined;
      this.traced = undefined;
      this.setScrub(-1);
      this.renderNow();
      this.postCursor();
      return;
    }
    const document = this.document;
    if (!document || !this.posted || message.uri !== this.posted.uri) return;
    switch (message.type) {
      case 'scrub':
        // A line of an older version may now hold other text: only -1 (clear) is taken from one.
        this.setScrub(message.version === document.version && message.line < document.lineCount ? message.line : -1);
        return;
      case 'reveal':
        if (message.version === this.posted.version && message.line < document.lineCount) await this.revealLine(document, message.line);
        return;
      case 'selectRun':
        this.run = message.run;
        this.renderNow();
        return;
      case 'setSpread':
        if (message.spread !== this.spread) {
          this.spread = message.spread;
          this.renderNow();
        }
        return;
      case 'cloudShown':
        for (const waiter of this.cloudWaiters.filter((w) => w.id === message.id)) waiter.resolve(message.dots);
        return;
      case 'viewSize':
        // Text and strokes are sized for the panel's width: a narrow panel gets the same readable labels.
        if (message.width !== this.viewWidth) {
          this.viewWidth = message.width;
          this.renderNow();
        }
        return;
      case 'exportSvg': {
        const { result, version } = getAnalysis(document);
        const cloud = this.cloudFor(document.uri.toString(), version)?.cloud;
        const recorded = recordedOverlayFor(document, result);
        const svg = renderSvg(result, { standalone: true, ...runOption(this.run), spread: this.spread, ...(cloud ? { cloud } : {}), ...(recorded ? { recorded } : {}) });
        await this.save(document, 'svg', new TextEncoder().encode(svg));
        return;
      }
      case 'copyTargets': {
        const analysis = getAnalysis(document);
        const tables = targetTables(analysis.result, analysis.text, this.run >= 0 ? this.run : undefined);
        await vscode.env.clipboard.writeText(message.format === 'csv' ? targetsCsv(tables) : targetsMarkdown(tables));
        void vscode.window.showInformationMessage(`Copied the targets table as ${message.format === 'csv' ? 'CSV' : 'Markdown'}.`);
        return;
      }
      case 'exportPng': {
        const bytes = Buffer.from(message.base64, 'base64');
        if (!PNG_SIGNATURE.every((b, i) => bytes[i] === b)) return;
        await this.save(document, 'png', bytes);
        return;
      }
    }
  }

  private async revealLine(document: vscode.TextDocument, line: number): Promise<void> {
    const text = document.lineAt(line);
    const selection = new vscode.Selection(line, text.firstNonWhitespaceCharacterIndex, line, text.range.end.character);
    const column = this.editorOf(document)?.viewColumn ?? vscode.ViewColumn.One;
    const editor = await vscode.window.showTextDocument(document, { viewColumn: column, selection, preserveFocus: false });
    editor.revealRange(selection, vscode.TextEditorRevealType.InCenterIfOutsideViewport);
  }

  /** The save dialog asks before replacing an existing file; nothing is written without it. */
  private async save(document: vscode.TextDocument, extension: 'svg' | 'png', bytes: Uint8Array): Promise<void> {
    const runName = this.run >= 0 ? getAnalysis(document).result.runs[this.run]?.name : undefined;
    const stem = basename(document.uri).replace(/\.veer$/i, '') + (runName ? `-${safeFileName(runName)}` : '');
    const target = await vscode.window.showSaveDialog({
      defaultUri: vscode.Uri.joinPath(document.uri, '..', `${stem}.${extension}`),
      filters: extension === 'svg' ? { 'SVG drawing': ['svg'] } : { 'PNG image': ['png'] },
      saveLabel: `Export ${extension.toUpperCase()}`,
      title: `Export the path drawing as ${extension.toUpperCase()}`,
    });
    if (!target) return;
    await vscode.workspace.fs.writeFile(target, bytes);
    void vscode.window.showInformationMessage(`Saved the path drawing to ${vscode.workspace.asRelativePath(target)}.`);
  }
}

function previewTitle(document: vscode.TextDocument): string {
  return `Preview ${basename(document.uri)}`;
}

function runOption(run: number): { run?: number } {
  return run >= 0 ? { run } : {};
}

function basename(uri: vscode.Uri): string {
  return uri.path.split('/').pop() || uri.toString();
}

function safeFileName(name: string): string {
  return name.replace(/[^\p{L}\p{N}_-]+/gu, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'run';
}
