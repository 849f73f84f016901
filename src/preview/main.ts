// The path preview's webview: shows the SVG the host rendered with the core,
// links it to the editor (cursor highlight, click to reveal, hover numbers),
// and offers zoom, pan, a run selector and export. No geometry here: the
// drawing comes whole from the core's renderer. Under the drawing: the run's
// predicted timeline with a scrubber (timeline.ts) and the trace of the motion
// under the cursor (traceChart.ts).
import {
  MAX_VIEW_WIDTH,
  MIN_VIEW_WIDTH,
  parseHostMessage,
  SPREAD_SHOWN,
  type CursorMessage,
  type PreviewMessage,
  type RenderMessage,
  type SegmentSummary,
  type TraceMessage,
} from '../shared/messages';
import { rasterise } from './rasterise';
import { TargetsView } from './targetsView';
import { importSvg } from './safeSvg';
import { TimelineView } from './timeline';
import { tooltipLines } from './tooltip';
import { TraceChart } from './traceChart';
import { formatViewBox, isViewBox, panBy, parseViewBox, zoomAbout, type ViewBox } from './viewport';

/** What survives a window reload (the host's serializer gets it too). */
interface PreviewState {
  uri: string;
  version: number;
  run: number;
  /** Absent while the drawing is fitted to the panel. */
  view?: ViewBox;
  /** Which tab is shown. */
  tab?: 'drawing' | 'targets';
  /** Sections under the drawing the user folded away ('timeline', 'trace'). */
  folded?: string[];
  /** Where the drawing shows the 95 % ovals, once the user chose (absent: at marks). */
  spread?: (typeof SPREAD_SHOWN)[number];
}

/** The spread select's choices, in the toolbar's words. */
const SPREAD_LABELS: Record<(typeof SPREAD_SHOWN)[number], string> = { marks: 'Spread: marks', all: 'Spread: every motion', off: 'Spread: off' };

const SECTIONS = ['timeline', 'trace'] as const;

interface VsCodeApi {
  postMessage(message: PreviewMessage): void;
  getState(): unknown;
  setState(state: PreviewState): void;
}

declare function acquireVsCodeApi(): VsCodeApi;

/** A change of the drawing area's width by more than this share asks the host for a drawing sized anew. */
const RESIZE_SHARE = 0.1;
/** Large background shapes: a click on them is a click on empty field, not on a plan line. */
const NOT_REVEALED = '.field, .grid';
/** A press that moves less than this many pixels is a click, not a drag. */
const CLICK_SLOP_PX = 4;
const BUTTON_ZOOM_FACTOR = 1.5;
/** Where to look around the pointer for something to hit: the point itself, then rings of 3 and 6 pixels. */
const HIT_OFFSETS: readonly [number, number][] = [[0, 0],
  ...[3, 6].flatMap((r) => [0, 45, 90, 135, 180, 225, 270, 315].map((a) => [Math.round(r * Math.cos((a * Math.PI) / 180)), Math.round(r * Math.sin((a * Math.PI) / 180))] as [number, number]))];

function readState(value: unknown): PreviewState | undefined {
  if (typeof value !== 'object' || value === null) return undefined;
  const s = value as Record<string, unknown>;
  if (typeof s.uri !== 'string' || typeof s.version !== 'number' || typeof s.run !== 'number') return undefined;
  return {
    uri: s.uri, version: s.version, run: s.run, ...(isViewBox(s.view) ? { view: s.view } : {}),
    ...(s.tab === 'targets' ? { tab: 'targets' as const } : {}),
    ...(Array.isArray(s.folded) ? { folded: SECTIONS.filter((name) => (s.folded as unknown[]).includes(name)) } : {}),
    ...spreadOf(s.spread),
  };
}

function spreadOf(value: unknown): { spread?: (typeof SPREAD_SHOWN)[number] } {
  const spread = SPREAD_SHOWN.find((v) => v === value);
  return spread ? { spread } : {};
}

function element<K extends keyof HTMLElementTagNameMap>(tag: K, props: Partial<HTMLElementTagNameMap[K]> = {}): HTMLElementTagNameMap[K] {
  return Object.assign(document.createElement(tag), props);
}

class Preview {
  private readonly api = acquireVsCodeApi();
  private state: PreviewState = readState(this.api.getState()) ?? { uri: '', version: -1, run: -1 };
  private svg: SVGSVGElement | undefined;
  private fit: ViewBox | undefined;
  private segments = new Map<string, SegmentSummary>();
  private currentLine: number | undefined;
  /** The scrubbed motion's line: while the scrubber is out, the drawing marks it instead of the cursor's. */
  private scrubLine: number | undefined;

  private readonly title = element('span', { className: 'title' });
  private readonly counts = element('span', { className: 'counts' });
  private readonly runSelect = element('select', { className: 'run-select', title: 'Run to draw' });
  private readonly spreadSelect = element('select', {
    className: 'spread-select',
    title: 'Where the real robot ends up: the oval that holds it in 19 runs out of 20 and the heading\'s band, at marks, after every motion, or not at all',
  });
  /** Says when the drawing holds a Monte Carlo cloud (Veer: Sample the Runs). */
  private readonly cloudNote = element('span', { className: 'cloud-note' });
  private readonly stage = element('div', { className: 'stage' });
  private readonly tooltip = element('div', { className: 'tooltip' });
  private readonly status = element('div', { className: 'status', textContent: 'Waiting for the plan…' });
  private readonly notice = element('span', { className: 'notice' });
  private readonly readout = element('span', { className: 'readout' });
  private readonly tabs = element('div', { className: 'tabs' });
  private readonly drawingTab = element('button', { type: 'button', className: 'tab', textContent: 'Drawing' });
  private readonly targetsTab = element('button', { type: 'button', className: 'tab', textContent: 'Targets' });
  private readonly targets = new TargetsView(
    (line) => this.post({ type: 'reveal', ...this.stamp(), line }),
    (format) => this.post({ type: 'copyTargets', ...this.stamp(), format }),
  );
  private readonly below = element('div', { className: 'below' });
  private readonly trace = new TraceChart();
  private readonly timeline = new TimelineView({
    drawing: () => this.svg,
    reveal: (line) => this.post({ type: 'reveal', ...this.stamp(), line }),
    scrubbed: (line) => {
      this.scrubLine = line;
      this.applyHighlight();
      if (this.state.uri) this.post({ type: 'scrub', ...this.stamp(), line: line ?? -1 });
    },
    showTooltip: (lines, x, y) => this.showTooltip(lines, x, y, false),
    hideTooltip: () => { this.tooltip.hidden = true; },
  });

  constructor() {
    const button = (label: string, title: string, action: () => void): HTMLButtonElement => {
      const b = element('button', { type: 'button', textContent: label, title });
      b.dataset.action = label.toLowerCase();
      b.addEventListener('click', action);
      return b;
    };
    this.runSelect.hidden = true;
    this.runSelect.setAttribute('aria-label', 'Run to draw');
    this.runSelect.addEventListener('change', () => this.post({ type: 'selectRun', ...this.stamp(), run: Number(this.runSelect.value) }));
    this.spreadSelect.setAttribute('aria-label', 'Spread to draw');
    this.spreadSelect.append(...SPREAD_SHOWN.map((v) => element('option', { value: v, textContent: SPREAD_LABELS[v] })));
    this.spreadSelect.value = this.state.spread ?? 'marks';
    this.spreadSelect.addEventListener('change', () => {
      const spread = SPREAD_SHOWN.find((v) => v === this.spreadSelect.value) ?? 'marks';
      this.state.spread = spread;
      this.saveState();
      this.post({ type: 'setSpread', ...this.stamp(), spread });
    });
    this.cloudNote.hidden = true;
    const toolbar = element('div', { className: 'toolbar' });
    toolbar.setAttribute('role', 'toolbar');
    toolbar.append(
      this.title, this.runSelect, this.spreadSelect, this.cloudNote, this.counts, this.notice, element('span', { className: 'spacer' }), this.readout,
      button('Fit', 'Fit the drawing to the panel', () => this.setView(undefined)),
      button('+', 'Zoom in', () => this.zoomCentre(BUTTON_ZOOM_FACTOR)),
      button('−', 'Zoom out', () => this.zoomCentre(1 / BUTTON_ZOOM_FACTOR)),
      button('SVG', 'Export the drawing as an SVG file', () => this.post({ type: 'exportSvg', ...this.stamp() })),
      button('PNG', 'Export the drawing as a PNG image', () => void this.exportPng()),
    );
    this.tooltip.hidden = true;
    this.tooltip.setAttribute('role', 'tooltip');
    this.stage.append(this.status);
    this.tabs.setAttribute('role', 'tablist');
    for (const [tab, name] of [[this.drawingTab, 'drawing'], [this.targetsTab, 'targets']] as const) {
      tab.setAttribute('role', 'tab');
      tab.dataset.tab = name;
      tab.addEventListener('click', () => this.showTab(name));
    }
    this.tabs.append(this.drawingTab, this.targetsTab);
    this.below.append(
      this.section('timeline', 'Timeline', 'Predicted time of each motion; play or scrub to move the robot along its predicted path', this.timeline.element),
      this.section('trace', 'Trace', 'The controller simulation of the motion under the cursor', this.trace.element),
    );
    document.body.append(toolbar, this.tabs, this.stage, this.below, this.targets.element, this.tooltip);
    this.showTab(this.state.tab ?? 'drawing', false);

    window.addEventListener('message', (event) => this.onMessage(event.data));
    // The host sizes text and strokes for the panel: tell it the width, now and after a resize.
    let resizeTimer: ReturnType<typeof setTimeout> | undefined;
    new ResizeObserver(() => {
      if (resizeTimer) clearTimeout(resizeTimer);
      resizeTimer = setTimeout(() => this.reportWidth(), 150);
    }).observe(document.body);
    this.stage.addEventListener('wheel', (event) => this.onWheel(event), { passive: false });
    this.stage.addEventListener('pointerdown', (event) => this.onPointerDown(event));
    this.stage.addEventListener('pointermove', (event) => this.onHover(event));
    this.stage.addEventListener('pointerleave', () => { this.tooltip.hidden = true; this.readout.textContent = ''; });
    this.post({ type: 'ready', uri: this.state.uri, version: this.state.version, ...(this.state.spread ? { spread: this.state.spread } : {}) });
  }

  /** A foldable section under the drawing; whether it is folded survives a reload. */
  private section(name: (typeof SECTIONS)[number], label: string, title: string, content: HTMLElement): HTMLDetailsElement {
    const details = element('details', { className: `section section-${name}` });
    details.open = !this.state.folded?.includes(name);
    const summary = element('summary', { textContent: label, title });
    details.append(summary, content);
    details.addEventListener('toggle', () => {
      const folded = new Set(this.state.folded ?? []);
      if (details.open) folded.delete(name);
      else folded.add(name);
      this.state.folded = SECTIONS.filter((n) => folded.has(n));
      this.saveState();
    });
    return details;
  }

  /** The drawing or the targets table; the choice survives a reload. */
  private showTab(tab: 'drawing' | 'targets', save = true): void {
    this.state.tab = tab;
    const targets = tab === 'targets';
    this.stage.hidden = targets;
    this.below.hidden = targets;
    this.targets.element.hidden = !targets;
    if (targets) this.targets.revealed();
    this.drawingTab.setAttribute('aria-selected', String(!targets));
    this.targetsTab.setAttribute('aria-selected', String(targets));
    document.body.dataset.tab = tab;
    if (save) this.saveState();
  }

  private renderedWidth = 0;
  /** The width last asked for: the resize timer and the first frame after a render may both look, and one request is enough. */
  private askedWidth = 0;

  private reportWidth(): void {
    const width = Math.round(Math.min(MAX_VIEW_WIDTH, Math.max(MIN_VIEW_WIDTH, this.stage.clientWidth || document.body.clientWidth)));
    if (!this.state.uri || width === this.askedWidth || (this.renderedWidth && Math.abs(width - this.renderedWidth) < RESIZE_SHARE * this.renderedWidth)) return;
    this.askedWidth = width;
    this.post({ type: 'viewSize', ...this.stamp(), width });
  }

  private stamp(): { uri: string; version: number } {
    return { uri: this.state.uri, version: this.state.version };
  }

  private post(message: PreviewMessage): void {
    this.api.postMessage(message);
  }

  private saveState(): void {
    this.api.setState(this.state);
  }

  private onMessage(data: unknown): void {
    const message = parseHostMessage(data);
    if (!message) return;
    if (message.type === 'render') this.render(message);
    else if (message.type === 'trace') this.showTrace(message);
    else this.highlight(message);
  }

  private render(message: RenderMessage): void {
    const sameDocument = message.uri === this.state.uri;
    if (sameDocument && message.version < this.state.version) return;
    const svg = importSvg(message.svg, document);
    if (!svg) {
      this.status.textContent = 'The drawing could not be read.';
      return;
    }
    svg.removeAttribute('width');
    svg.removeAttribute('height');
    // At the top of a tall panel, not floating in its middle.
    svg.setAttribute('preserveAspectRatio', 'xMidYMin meet');
    svg.classList.add('drawing');
    const keepView = sameDocument && message.run === this.state.run ? this.state.view : undefined;
    this.state = {
      uri: message.uri, version: message.version, run: message.run, ...(keepView ? { view: keepView } : {}),
      ...(this.state.tab ? { tab: this.state.tab } : {}), ...(this.state.folded ? { folded: this.state.folded } : {}),
      ...(this.state.spread ? { spread: this.state.spread } : {}),
    };
    this.fit = parseViewBox(svg.getAttribute('viewBox')) ?? undefined;
    this.svg?.remove();
    this.status.remove();
    this.svg = svg;
    this.stage.append(svg);
    if (!this.fit) {
      const box = svg.getBBox();
      this.fit = { x: box.x, y: box.y, width: Math.max(box.width, 1), height: Math.max(box.height, 1) };
    }
    svg.style.setProperty('--veer-unit', String(this.fit.width / message.width));
    this.renderedWidth = message.width;
    this.applyView();
    this.segments = new Map(message.segments.map((s) => [s.id, s]));
    this.title.textContent = message.title;
    this.title.title = message.title; // the whole title, when the toolbar has to shorten it
    this.counts.textContent = [
      message.errorCount ? `${message.errorCount} error${message.errorCount === 1 ? '' : 's'}` : '',
      message.warningCount ? `${message.warningCount} warning${message.warningCount === 1 ? '' : 's'}` : '',
    ].filter(Boolean).join(', ');
    this.counts.classList.toggle('has-errors', message.errorCount > 0);
    this.fillRunSelect(message);
    this.showSpread(message);
    this.targets.show(message.run >= 0 ? message.targets.slice(message.run, message.run + 1) : message.targets);
    if (!sameDocument) this.currentLine = undefined;
    this.timeline.show(message, sameDocument);
    this.applyHighlight();
    this.saveState();
    document.body.dataset.version = String(message.version);
    // A drawing sized for another width (the first one, or one from before a resize): ask for this
    // panel's, once the frame is laid out (reading a width here would force a layout of the new drawing).
    requestAnimationFrame(() => this.reportWidth());
  }

  /** The spread choice the drawing was made with, and its Monte Carlo cloud (whose dots are counted back to the host). */
  private showSpread(message: RenderMessage): void {
    if (message.spread) this.spreadSelect.value = message.spread;
    this.cloudNote.hidden = !message.cloud;
    if (!message.cloud || !this.svg) {
      this.cloudNote.textContent = '';
      return;
    }
    let dots = 0;
    for (const path of Array.from(this.svg.querySelectorAll('.cloud path'))) dots += (path.getAttribute('d')?.match(/M/g) ?? []).length;
    this.cloudNote.textContent = `${message.cloud.count.toLocaleString('en')} sampled runs`;
    this.cloudNote.title = 'The dots are where sampled runs end (at each run\'s end and each mark); they clear at the next edit of the plan';
    this.post({ type: 'cloudShown', ...this.stamp(), id: message.cloud.id, dots });
  }

  private fillRunSelect(message: RenderMessage): void {
    this.runSelect.replaceChildren(
      element('option', { value: '-1', textContent: 'All runs' }),
      ...message.runNames.map((name, i) => element('option', { value: String(i), textContent: name })),
    );
    this.runSelect.value = String(message.run);
    this.runSelect.hidden = message.runNames.length < 2;
  }

  private showTrace(message: TraceMessage): void {
    if (message.uri !== this.state.uri || message.version < this.state.version) return;
    this.trace.show(message);
  }

  private highlight(message: CursorMessage): void {
    if (message.uri !== this.state.uri || message.version < this.state.version) return;
    this.currentLine = message.line;
    this.applyHighlight();
  }

  private applyHighlight(): void {
    const line = this.scrubLine ?? this.currentLine;
    this.targets.highlight(line);
    for (const el of Array.from(this.stage.querySelectorAll('.is-current'))) el.classList.remove('is-current');
    if (line === undefined || !this.svg) return;
    for (const el of Array.from(this.svg.querySelectorAll(`[data-line="${line}"]`))) el.classList.add('is-current');
  }

  private setView(view: ViewBox | undefined): void {
    if (view) this.state.view = view;
    else delete this.state.view;
    this.applyView();
    this.saveState();
  }

  private applyView(): void {
    const view = this.state.view ?? this.fit;
    if (this.svg && view) this.svg.setAttribute('viewBox', formatViewBox(view));
    document.body.classList.toggle('is-fitted', !this.state.view);
  }

  /** The user-space point under a client (screen) point, or undefined before the first drawing. */
  private toUser(clientX: number, clientY: number): DOMPoint | undefined {
    const ctm = this.svg?.getScreenCTM();
    return ctm ? new DOMPoint(clientX, clientY).matrixTransform(ctm.inverse()) : undefined;
  }

  private zoomAt(factor: number, clientX: number, clientY: number): void {
    const view = this.state.view ?? this.fit;
    const p = this.toUser(clientX, clientY);
    if (!view || !this.fit || !p) return;
    this.setView(zoomAbout(view, this.fit, factor, p.x, p.y));
  }

  private zoomCentre(factor: number): void {
    const r = this.stage.getBoundingClientRect();
    this.zoomAt(factor, r.left + r.width / 2, r.top + r.height / 2);
  }

  private onWheel(event: WheelEvent): void {
    event.preventDefault();
    // Exponential in the wheel distance, so trackpads and wheels feel alike.
    this.zoomAt(Math.exp(-event.deltaY * 0.0015), event.clientX, event.clientY);
  }

  private onPointerDown(event: PointerEvent): void {
    if (event.button !== 0 || !this.svg) return;
    const lineElement = this.hitAt(event.clientX, event.clientY, '[data-line]');
    const start = { x: event.clientX, y: event.clientY };
    let last = start;
    let dragging = false;
    const move = (e: PointerEvent): void => {
      if (!dragging && Math.hypot(e.clientX - start.x, e.clientY - start.y) < CLICK_SLOP_PX) return;
      if (!dragging) {
        dragging = true;
        this.stage.setPointerCapture(e.pointerId);
        this.stage.classList.add('is-dragging');
        this.tooltip.hidden = true;
      }
      const view = this.state.view ?? this.fit;
      const scale = this.svg?.getScreenCTM()?.a;
      if (view && scale) this.setView(panBy(view, (e.clientX - last.x) / scale, (e.clientY - last.y) / scale));
      last = { x: e.clientX, y: e.clientY };
    };
    const up = (): void => {
      this.stage.removeEventListener('pointermove', move);
      this.stage.removeEventListener('pointerup', up);
      this.stage.removeEventListener('pointercancel', up);
      this.stage.classList.remove('is-dragging');
      if (dragging || !lineElement) return;
      const line = Number(lineElement.getAttribute('data-line'));
      if (Number.isInteger(line) && line >= 0) this.post({ type: 'reveal', ...this.stamp(), line });
    };
    this.stage.addEventListener('pointermove', move);
    this.stage.addEventListener('pointerup', up);
    this.stage.addEventListener('pointercancel', up);
  }

  /**
   * The drawn element under a point, or failing that the nearest one within a
   * few pixels: a thin path is hard to hit exactly.
   */
  private hitAt(clientX: number, clientY: number, selector: string): Element | undefined {
    return this.hitsAt(clientX, clientY, [selector])[0];
  }

  /** The first hit for each selector, from one scan of the points around the pointer. */
  private hitsAt(clientX: number, clientY: number, selectors: readonly string[]): (Element | undefined)[] {
    const found: (Element | undefined)[] = selectors.map(() => undefined);
    let missing = selectors.length;
    for (const [dx, dy] of HIT_OFFSETS) {
      for (const el of document.elementsFromPoint(clientX + dx, clientY + dy)) {
        if (!this.svg?.contains(el)) continue;
        selectors.forEach((selector, i) => {
          if (found[i]) return;
          const hit = el.closest(selector);
          if (hit && !hit.matches(NOT_REVEALED)) {
            found[i] = hit;
            missing--;
          }
        });
        if (missing === 0) return found;
      }
    }
    return found;
  }

  /** Field coordinates (mm) of a client point, from the drawing's frame. */
  private fieldAt(clientX: number, clientY: number): { x: number; y: number } | undefined {
    const frame = this.svg?.getAttribute('data-frame')?.split(' ').map(Number);
    const p = this.toUser(clientX, clientY);
    if (!frame || frame.length !== 2 || !frame.every(Number.isFinite) || !p) return undefined;
    return { x: p.x + frame[0], y: frame[1] - p.y };
  }

  private onHover(event: PointerEvent): void {
    if (this.stage.classList.contains('is-dragging')) return;
    const at = this.fieldAt(event.clientX, event.clientY);
    this.readout.textContent = at ? `x ${Math.round(at.x)} mm, y ${Math.round(at.y)} mm` : '';
    // A problem marker says what the problem is.
    const [marker, segment] = this.hitsAt(event.clientX, event.clientY, ['.marker', '[data-segment]']);
    const id = segment?.getAttribute('data-segment');
    const seg = id ? this.segments.get(id) : undefined;
    const lines = marker ? [marker.querySelector('title')?.textContent ?? ''].filter(Boolean) : seg ? tooltipLines(seg) : [];
    if (lines.length === 0) {
      this.tooltip.hidden = true;
      return;
    }
    this.showTooltip(lines, event.clientX, event.clientY, !!marker);
  }

  private showTooltip(lines: readonly string[], clientX: number, clientY: number, problem: boolean): void {
    this.tooltip.classList.toggle('is-problem', problem);
    this.tooltip.replaceChildren(...lines.map((text) => element('div', { textContent: text })));
    this.tooltip.hidden = false;
    // Keep the tooltip inside the panel near the right and bottom edges.
    const pad = 12;
    const w = this.tooltip.offsetWidth;
    const h = this.tooltip.offsetHeight;
    const left = clientX + pad + w > window.innerWidth ? clientX - pad - w : clientX + pad;
    const top = clientY + pad + h > window.innerHeight ? clientY - pad - h : clientY + pad;
    this.tooltip.style.left = `${Math.max(0, left)}px`;
    this.tooltip.style.top = `${Math.max(0, top)}px`;
  }

  private async exportPng(): Promise<void> {
    if (!this.svg || !this.fit) return;
    const background = getComputedStyle(document.body).backgroundColor;
    this.notice.textContent = '';
    try {
      const base64 = await rasterise(this.svg, this.fit, background);
      this.post({ type: 'exportPng', ...this.stamp(), base64 });
    } catch (error) {
      this.notice.textContent = error instanceof Error ? error.message : String(error);
    }
  }
}

new Preview();
