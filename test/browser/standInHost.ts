// A stand-in for the editor's webview host: serves the built media/preview.js
// and media/preview.css on a private origin (intercepted, nothing leaves the
// machine) under the same CSP the real host writes, provides
// acquireVsCodeApi, records what the preview posts, and switches themes the
// way the editor does (body class plus --vscode-* variables on <html>).
import { previewCsp } from '../../src/shared/csp';
import { readFileSync } from 'fs';
import { join } from 'path';
import type { Browser, Page } from 'playwright-core';
import { checkPlan, renderSvg, targetTables } from '../../src/core';
import { buildTimeline, traceForLine } from '../../src/core/sim/view';
import { buildRenderMessage, type HostMessage, type PreviewMessage, type RenderMessage, type TraceMessage } from '../../src/shared/messages';

export const ORIGIN = 'https://veer-preview.test';
const ROOT = join(__dirname, '..', '..');
const NONCE = 'c3RhbmQtaW4tbm9uY2U=';

export type ThemeKind = 'vscode-light' | 'vscode-dark' | 'vscode-high-contrast';

/**
 * A few of the editor's theme variables, close to its default themes (from
 * memory). The tests compare computed colours with these.
 */
export const THEMES: Record<ThemeKind, Record<string, string>> = {
  'vscode-light': {
    '--vscode-editor-background': '#ffffff',
    '--vscode-editor-foreground': '#3b3b3b',
    '--vscode-charts-blue': '#1a85ff',
    '--vscode-charts-purple': '#652d90',
    '--vscode-charts-orange': '#d18616',
    '--vscode-focusBorder': '#005fb8',
    '--vscode-errorForeground': '#f85149',
    '--vscode-editorWarning-foreground': '#bf8803',
  },
  'vscode-dark': {
    '--vscode-editor-background': '#1f1f1f',
    '--vscode-editor-foreground': '#cccccc',
    '--vscode-charts-blue': '#3794ff',
    '--vscode-charts-purple': '#b180d7',
    '--vscode-charts-orange': '#e0913a',
    '--vscode-focusBorder': '#0078d4',
    '--vscode-errorForeground': '#f48771',
    '--vscode-editorWarning-foreground': '#cca700',
  },
  'vscode-high-contrast': {
    '--vscode-editor-background': '#000000',
    '--vscode-editor-foreground': '#ffffff',
    '--vscode-charts-blue': '#3794ff',
    '--vscode-charts-purple': '#b180d7',
    '--vscode-contrastBorder': '#6fc3df',
    '--vscode-contrastActiveBorder': '#f38518',
    '--vscode-errorForeground': '#f48771',
    '--vscode-editorWarning-foreground': '#ffd700',
  },
};

// The extension's own policy, so the tests see what the editor's page enforces.
const CSP = previewCsp(ORIGIN, NONCE);

function hostScript(initialState: unknown, manualFrames: boolean): string {
  // With manual frames, animation frames run only when the test calls
  // __frame(ms): time moves by exactly that much, and no test waits on a clock.
  const frames = manualFrames ? `
window.__frameTime = 0;
window.__frameQueue = [];
window.requestAnimationFrame = (cb) => { window.__frameQueue.push(cb); return window.__frameQueue.length; };
window.cancelAnimationFrame = () => {};
window.__frame = (ms) => {
  window.__frameTime += ms;
  const due = window.__frameQueue.splice(0);
  for (const cb of due) cb(window.__frameTime);
  return due.length;
};` : '';
  return `${frames}
window.__posted = [];
window.__state = ${JSON.stringify(initialState ?? null)};
window.acquireVsCodeApi = () => ({
  postMessage: (m) => window.__posted.push(JSON.parse(JSON.stringify(m))),
  getState: () => window.__state,
  setState: (s) => { window.__state = JSON.parse(JSON.stringify(s)); },
});
window.__setTheme = (kind, vars) => {
  const html = document.documentElement;
  for (const name of Array.from(html.style)) if (name.startsWith('--vscode-')) html.style.removeProperty(name);
  for (const [name, value] of Object.entries(vars)) html.style.setProperty(name, value);
  document.body.classList.remove('vscode-light', 'vscode-dark', 'vscode-high-contrast');
  document.body.classList.add(kind);
};
`;
}

function pageHtml(): string {
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="UTF-8">
<meta http-equiv="Content-Security-Policy" content="${CSP}">
<link rel="stylesheet" href="${ORIGIN}/media/uplot.css">
<link rel="stylesheet" href="${ORIGIN}/media/preview.css">
</head><body class="vscode-light">
<script nonce="${NONCE}" src="${ORIGIN}/host.js"></script>
<script nonce="${NONCE}" src="${ORIGIN}/media/preview.js"></script>
</body></html>`;
}

export interface StandIn {
  page: Page;
  /** Delivers a message as the editor does: a window message event. */
  send(message: HostMessage): Promise<void>;
  posted(): Promise<PreviewMessage[]>;
  /** Resolves with the first posted message of `type` that `accept` takes. */
  waitForPosted<T extends PreviewMessage['type']>(type: T, accept?: (m: Extract<PreviewMessage, { type: T }>) => boolean): Promise<Extract<PreviewMessage, { type: T }>>;
  setTheme(kind: ThemeKind): Promise<void>;
  /** With `manualFrames`: runs the animation frames due, `ms` after the last; resolves with how many ran. */
  frame(ms: number): Promise<number>;
  /** Errors the page threw or logged (CSP refusals show up here). */
  errors: string[];
}

export interface StandInOptions {
  /** Animation frames run only when the test calls `frame(ms)` (see hostScript). */
  manualFrames?: boolean;
}

export async function openStandIn(browser: Browser, initialState?: unknown, options: StandInOptions = {}): Promise<StandIn> {
  const context = await browser.newContext({ viewport: { width: 900, height: 700 } });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  await context.route(`${ORIGIN}/**`, async (route) => {
    const path = new URL(route.request().url()).pathname;
    if (path === '/' || path === '/index.html') return route.fulfill({ contentType: 'text/html', body: pageHtml() });
    if (path === '/host.js') return route.fulfill({ contentType: 'text/javascript', body: hostScript(initialState, options.manualFrames ?? false) });
    if (path === '/media/preview.js' || path === '/media/preview.css' || path === '/media/uplot.css') {
      const type = path.endsWith('.js') ? 'text/javascript' : 'text/css';
      return route.fulfill({ contentType: type, body: readFileSync(join(ROOT, path)) });
    }
    return route.fulfill({ status: 404, body: '' });
  });
  // Anything else (an injected <img src=x>, say) must not reach the network either.
  await context.route((url) => !url.href.startsWith(ORIGIN), (route) => route.abort());
  await page.goto(`${ORIGIN}/index.html`);
  await page.waitForFunction(() => (window as unknown as { __posted: { type: string }[] }).__posted.some((m) => m.type === 'ready'));

  const posted = (): Promise<PreviewMessage[]> => page.evaluate(() => (window as unknown as { __posted: PreviewMessage[] }).__posted);
  return {
    page,
    errors,
    send: (message) => page.evaluate((m) => window.postMessage(m, '*'), message),
    posted,
    async waitForPosted(type, accept = () => true) {
      for (;;) {
        const seen = await posted();
        const found = seen.find((m) => m.type === type && accept(m as never));
        if (found) return found as never;
        await page.waitForFunction((n) => (window as unknown as { __posted: unknown[] }).__posted.length > n, seen.length);
      }
    },
    frame: (ms) => page.evaluate((m) => (window as unknown as { __frame: (ms: number) => number }).__frame(m), ms),
    setTheme: (kind) => page.evaluate(([k, vars]) => (window as unknown as { __setTheme: (k: string, v: object) => void }).__setTheme(k, vars), [kind, THEMES[kind]] as const),
  };
}

export function fixture(name: string): string {
  return readFileSync(join(__dirname, 'fixtures', name), 'utf8');
}

/** A render message built exactly as the extension host builds it, from the real core. */
export function renderFor(text: string, uri: string, version: number, run = -1): RenderMessage {
  const result = checkPlan(text, { fileName: uri.split('/').pop() ?? uri });
  const svg = renderSvg(result, { standalone: false, ...(run >= 0 ? { run } : {}) });
  return buildRenderMessage(result, { uri, version }, run, svg, targetTables(result, text), 1000, buildTimeline(result, run));
}

/** The trace message the extension host sends for the cursor on `line`, from the real core. */
export function traceFor(text: string, uri: string, version: number, line: number): TraceMessage {
  const result = checkPlan(text, { fileName: uri.split('/').pop() ?? uri });
  return { type: 'trace', uri, version, ...traceForLine(result, line) };
}
