// The run timeline under the drawing: each motion a block as long as its
// predicted time, the time limit marked, problem motions tinted; a scrubber
// and a play button move the robot's footprint along the predicted path in the
// drawing (an overlay made here with DOM calls, never part of an export).
import { DIGITS, formatNumber } from '../core/format';
import type { FootprintShape, RenderMessage, TimelineBlock, TimelineRun } from '../shared/messages';
import { blockAt, outlineAt, poseAt } from './pose';

const SVG_NS = 'http://www.w3.org/2000/svg';
/** Arrow keys move the scrubber this far, seconds (with Shift: ten times as far). */
const ARROW_STEP_S = 0.1;
/** Room after the last finite time when a motion never ends, as a share of the axis. */
const NEVER_ENDS_ROOM = 0.15;
const CLICK_SLOP_PX = 4;

export interface TimelineHost {
  /** The drawing now shown, or undefined before the first. */
  drawing(): SVGSVGElement | undefined;
  reveal(line: number): void;
  /** The scrubbed motion's line changed (undefined: the scrubber was reset). */
  scrubbed(line: number | undefined): void;
  showTooltip(lines: string[], clientX: number, clientY: number): void;
  hideTooltip(): void;
}

const seconds = (v: number): string => `${formatNumber(v, DIGITS.time)} s`;
const finite = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v) && v >= 0;

interface Row {
  run: TimelineRun;
  starts: number[];
  blocks: HTMLElement[];
  /** The block outlined as the scrubbed one. */
  current?: HTMLElement | undefined;
  element: HTMLElement;
  playhead: HTMLElement;
}

export class TimelineView {
  readonly element = document.createElement('div');
  private readonly controls = document.createElement('div');
  private readonly playButton = document.createElement('button');
  private readonly resetButton = document.createElement('button');
  private readonly scrubber = document.createElement('input');
  private readonly clock = document.createElement('span');
  private readonly rowsElement = document.createElement('div');
  private readonly note = document.createElement('div');
  private rows: Row[] = [];
  private footprint: FootprintShape = { kind: 'circle', radius: 0 };
  private turns: 'clockwise' | 'counterclockwise' = 'clockwise';
  /** Seconds shown along the strip. */
  private extent = 1;
  /** The last moment the scrubber reaches: the end of the predicted path. */
  private end = 0;
  private time = 0;
  /** The footprint is shown (the scrubber was moved or played since the last reset). */
  private active = false;
  private playing = false;
  private lastFrame: number | undefined;
  /** Which row the scrubbed line and the editor's mark follow. */
  private focused = 0;
  private reportedLine: number | undefined;
  private overlays: SVGGElement[] = [];

  constructor(private readonly host: TimelineHost) {
    this.element.className = 'timeline';
    this.controls.className = 'timeline-controls';
    this.playButton.type = 'button';
    this.playButton.className = 'play';
    this.playButton.addEventListener('click', () => this.togglePlay());
    this.resetButton.type = 'button';
    this.resetButton.className = 'reset';
    this.resetButton.textContent = 'Reset';
    this.resetButton.title = 'Back to the start, robot hidden (Escape)';
    this.resetButton.setAttribute('aria-label', 'Reset');
    this.resetButton.addEventListener('click', () => this.reset());
    this.scrubber.type = 'range';
    this.scrubber.className = 'scrubber';
    this.scrubber.min = '0';
    this.scrubber.step = 'any';
    this.scrubber.setAttribute('aria-label', 'Time in the run');
    this.scrubber.addEventListener('input', () => { this.pause(); this.setTime(Number(this.scrubber.value)); });
    this.clock.className = 'clock';
    this.clock.setAttribute('aria-live', 'off');
    const buttons = document.createElement('span');
    buttons.className = 'timeline-buttons';
    buttons.append(this.playButton, this.resetButton);
    this.controls.append(buttons, this.scrubber, this.clock);
    this.rowsElement.className = 'timeline-rows';
    this.note.className = 'timeline-note';
    this.element.append(this.controls, this.rowsElement, this.note);
    this.element.addEventListener('keydown', (event) => this.onKey(event));
    this.rowsElement.addEventListener('pointerdown', (event) => this.onPointerDown(event));
    this.rowsElement.addEventListener('pointermove', (event) => this.onHover(event));
    this.rowsElement.addEventListener('pointerleave', () => this.host.hideTooltip());
    this.showPlaying();
  }

  /** A new render: the rows for its runs; the scrubbed moment is kept for the same document. */
  show(message: RenderMessage, sameDocument: boolean): void {
    this.footprint = message.footprint;
    this.turns = message.turns;
    const runs = message.timeline;
    if (!sameDocument) {
      this.pause();
      this.active = false;
      this.time = 0;
      this.focused = 0;
    }
    this.focused = Math.min(this.focused, Math.max(0, runs.length - 1));
    this.measure(runs);
    this.scrubber.max = String(this.end);
    this.rows = runs.map((run, i) => this.buildRow(run, i, message.runNames.length > 1 || runs.length > 1));
    this.rowsElement.replaceChildren(...this.rows.map((r) => r.element));
    const empty = runs.length === 0 || runs.every((r) => r.blocks.length === 0);
    this.note.hidden = !empty;
    this.note.textContent = empty ? 'No predicted timeline for this plan.' : '';
    this.controls.hidden = empty;
    this.element.classList.toggle('is-empty', empty);
    this.time = Math.min(this.time, this.end);
    this.buildOverlays();
    this.update();
  }

  /** The drawing was replaced: the overlay goes into the new one. */
  private buildOverlays(): void {
    for (const o of this.overlays) o.remove();
    this.overlays = [];
    const svg = this.host.drawing();
    if (!svg) return;
    for (const row of this.rows) {
      const g = document.createElementNS(SVG_NS, 'g');
      g.setAttribute('class', `scrub-robot run-${row.run.runIndex}`);
      g.setAttribute('aria-hidden', 'true');
      g.dataset.run = String(row.run.runIndex);
      const body = document.createElementNS(SVG_NS, this.footprint.kind === 'circle' ? 'circle' : 'polygon');
      body.setAttribute('class', 'scrub-body');
      const nose = document.createElementNS(SVG_NS, 'line');
      nose.setAttribute('class', 'scrub-nose');
      const axle = document.createElementNS(SVG_NS, 'circle');
      axle.setAttribute('class', 'scrub-axle');
      g.append(body, nose, axle);
      svg.append(g);
      this.overlays.push(g);
    }
  }

  private measure(runs: readonly TimelineRun[]): void {
    let end = 0;
    let neverEnds = false;
    let limit = 0;
    for (const run of runs) {
      if (finite(run.total)) end = Math.max(end, run.total);
      else neverEnds = true;
      for (const b of run.blocks) {
        if (finite(b.duration)) end = Math.max(end, b.start + b.duration);
        else neverEnds = true;
      }
      const last = run.poses.t[run.poses.t.length - 1];
      if (finite(last)) end = Math.max(end, last);
      if (finite(run.limit)) limit = Math.max(limit, run.limit);
    }
    this.end = end;
    const axis = Math.max(end, limit);
    this.extent = axis > 0 ? axis * (neverEnds ? 1 + NEVER_ENDS_ROOM : 1) : 1;
  }

  private percent(t: number): string {
    return `${(Math.min(1, Math.max(0, t / this.extent)) * 100).toFixed(3)}%`;
  }

  private buildRow(run: TimelineRun, index: number, named: boolean): Row {
    const element = document.createElement('div');
    element.className = 'timeline-row';
    element.dataset.row = String(index);
    element.classList.toggle('is-focused', index === this.focused);
    const name = document.createElement('span');
    name.className = 'row-name';
    name.textContent = named ? run.name : '';
    name.title = run.name;
    const strip = document.createElement('div');
    strip.className = `strip run-${run.runIndex}`;
    const limit = finite(run.limit) ? run.limit : undefined;
    if (limit !== undefined) {
      const over = document.createElement('div');
      over.className = 'over-limit';
      over.style.left = this.percent(limit);
      const marker = document.createElement('div');
      marker.className = 'limit-marker';
      marker.style.left = this.percent(limit);
      marker.title = `time limit ${seconds(limit)}`;
      strip.append(over, marker);
    }
    const blocks: HTMLElement[] = [];
    for (const block of run.blocks) {
      const b = document.createElement('div');
      blocks.push(b);
      const ends = finite(block.duration);
      const stop = ends ? block.start + block.duration : Infinity;
      b.className = [
        'block', `kind-${block.kind}`, block.problem ? `problem-${block.problem}` : '', ends ? '' : 'never-ends',
        limit !== undefined && stop > limit ? 'is-over' : '',
      ].filter(Boolean).join(' ');
      b.dataset.line = String(block.line);
      b.style.left = this.percent(block.start);
      b.style.width = ends ? this.percent(block.duration) : `calc(100% - ${this.percent(block.start)})`;
      b.textContent = block.label;
      strip.append(b);
    }
    const playhead = document.createElement('div');
    playhead.className = 'playhead';
    strip.append(playhead);
    const total = document.createElement('span');
    total.className = 'row-total';
    total.textContent = [finite(run.total) ? seconds(run.total) : 'never ends', limit !== undefined ? `limit ${seconds(limit)}` : ''].filter(Boolean).join(' · ');
    total.classList.toggle('is-over', limit !== undefined && !(finite(run.total) && run.total <= limit));
    element.append(name, strip, total);
    return { run, starts: run.blocks.map((b) => b.start), blocks, element, playhead };
  }

  private blockLines(block: TimelineBlock, limit: number | undefined): string[] {
    const ends = finite(block.duration);
    const lines = [
      `line ${block.line + 1}: ${block.label}`,
      ends ? `${seconds(block.start)} → ${seconds(block.start + block.duration)} (${seconds(block.duration)})` : `from ${seconds(block.start)}, never ends`,
    ];
    if (limit !== undefined && (!ends || block.start + block.duration > limit)) {
      lines.push(ends ? `ends ${seconds(block.start + block.duration - limit)} past the ${seconds(limit)} limit` : `past the ${seconds(limit)} limit`);
    }
    if (block.problem) lines.push(block.problem === 'error' ? 'an error on this line' : 'a warning on this line');
    return lines;
  }

  private hit(event: { target: EventTarget | null }): { row: Row; rowIndex: number; block?: TimelineBlock; strip?: HTMLElement } | undefined {
    const target = event.target as Element | null;
    const rowElement = target?.closest?.('.timeline-row') as HTMLElement | null;
    if (!rowElement) return undefined;
    const rowIndex = Number(rowElement.dataset.row);
    const row = this.rows[rowIndex];
    if (!row) return undefined;
    const blockElement = target?.closest?.('.block') as HTMLElement | null;
    const strip = rowElement.querySelector<HTMLElement>('.strip') ?? undefined;
    const blockIndex = blockElement ? row.blocks.indexOf(blockElement) : -1;
    return { row, rowIndex, ...(blockIndex >= 0 ? { block: row.run.blocks[blockIndex] } : {}), ...(strip ? { strip } : {}) };
  }

  private onHover(event: PointerEvent): void {
    const hit = this.hit(event);
    if (!hit?.block) {
      this.host.hideTooltip();
      return;
    }
    this.host.showTooltip(this.blockLines(hit.block, finite(hit.row.run.limit) ? hit.row.run.limit : undefined), event.clientX, event.clientY);
  }

  private timeAtX(strip: HTMLElement, clientX: number): number {
    const r = strip.getBoundingClientRect();
    return Math.min(this.end, Math.max(0, ((clientX - r.left) / Math.max(1, r.width)) * this.extent));
  }

  /** A click on a block reveals its line; a drag along a strip scrubs. */
  private onPointerDown(event: PointerEvent): void {
    if (event.button !== 0) return;
    const hit = this.hit(event);
    if (!hit?.strip) return;
    const strip = hit.strip;
    this.focus(hit.rowIndex);
    const startX = event.clientX;
    let dragging = false;
    const move = (e: PointerEvent): void => {
      if (!dragging && Math.abs(e.clientX - startX) < CLICK_SLOP_PX) return;
      if (!dragging) {
        dragging = true;
        strip.setPointerCapture(e.pointerId);
        this.host.hideTooltip();
        this.pause();
      }
      this.setTime(this.timeAtX(strip, e.clientX));
    };
    const up = (e: PointerEvent): void => {
      this.rowsElement.removeEventListener('pointermove', move);
      this.rowsElement.removeEventListener('pointerup', up);
      this.rowsElement.removeEventListener('pointercancel', up);
      if (dragging) return;
      if (hit.block) this.host.reveal(hit.block.line);
      else if (e.type === 'pointerup') { this.pause(); this.setTime(this.timeAtX(strip, e.clientX)); }
    };
    this.rowsElement.addEventListener('pointermove', move);
    this.rowsElement.addEventListener('pointerup', up);
    this.rowsElement.addEventListener('pointercancel', up);
  }

  private focus(rowIndex: number): void {
    if (rowIndex === this.focused) return;
    this.focused = rowIndex;
    this.rows.forEach((r, i) => r.element.classList.toggle('is-focused', i === rowIndex));
    this.update();
  }

  private onKey(event: KeyboardEvent): void {
    const target = event.target as HTMLElement | null;
    // A focused button acts on Space and Enter itself.
    if (target?.tagName === 'BUTTON' || this.controls.hidden) return;
    const step = event.shiftKey ? ARROW_STEP_S * 10 : ARROW_STEP_S;
    const starts = this.rows[this.focused]?.starts ?? [];
    let next: number | undefined;
    switch (event.key) {
      case ' ':
        this.togglePlay();
        break;
      case 'ArrowRight':
      case 'ArrowUp':
        next = this.time + step;
        break;
      case 'ArrowLeft':
      case 'ArrowDown':
        next = this.time - step;
        break;
      case 'PageDown':
        next = starts.find((s) => s > this.time + 1e-9) ?? this.end;
        break;
      case 'PageUp':
        next = [...starts].reverse().find((s) => s < this.time - 1e-9) ?? 0;
        break;
      case 'Home':
        next = 0;
        break;
      case 'End':
        next = this.end;
        break;
      case 'Escape':
        this.reset();
        break;
      case 'Enter': {
        const line = this.currentBlock()?.line;
        if (line !== undefined) this.host.reveal(line);
        break;
      }
      default:
        return;
    }
    event.preventDefault();
    if (next !== undefined) {
      this.pause();
      this.setTime(next);
    }
  }

  togglePlay(): void {
    if (this.playing) this.pause();
    else this.play();
  }

  private play(): void {
    if (this.end <= 0) return;
    if (this.time >= this.end) this.time = 0;
    this.playing = true;
    this.active = true;
    this.lastFrame = undefined;
    this.showPlaying();
    this.update();
    requestAnimationFrame((ts) => this.frame(ts));
  }

  private pause(): void {
    if (!this.playing) return;
    this.playing = false;
    this.showPlaying();
  }

  /** One animation frame of play, at real time (the frame's own timestamp, not a wall clock). */
  private frame(ts: number): void {
    if (!this.playing) return;
    if (this.lastFrame !== undefined) this.time = Math.min(this.end, this.time + Math.max(0, ts - this.lastFrame) / 1000);
    this.lastFrame = ts;
    if (this.time >= this.end) {
      this.playing = false;
      this.showPlaying();
    }
    this.update();
    if (this.playing) requestAnimationFrame((next) => this.frame(next));
  }

  /** Back to the start with the footprint hidden; the editor's mark goes. */
  reset(): void {
    this.pause();
    this.active = false;
    this.time = 0;
    this.update();
  }

  private setTime(t: number): void {
    this.active = true;
    this.time = Math.min(this.end, Math.max(0, t));
    this.update();
  }

  private currentBlock(): TimelineBlock | undefined {
    const row = this.rows[this.focused];
    return row && this.active ? blockAt(row.run.blocks, this.time, row.starts) : undefined;
  }

  private showPlaying(): void {
    this.playButton.textContent = this.playing ? 'Pause' : '▶ Play';
    this.playButton.setAttribute('aria-label', this.playing ? 'Pause' : 'Play');
    this.playButton.title = this.playing ? 'Pause (Space)' : 'Play the run at real speed (Space)';
    this.element.classList.toggle('is-playing', this.playing);
  }

  private update(): void {
    this.scrubber.value = String(this.time);
    this.element.classList.toggle('is-active', this.active);
    const block = this.currentBlock();
    const text = `${seconds(this.time)} of ${seconds(this.end)}`;
    const full = block ? `${text}, line ${block.line + 1}: ${block.label}` : text;
    // Short, so its column keeps one width while the time changes; the whole text is on hover and for screen readers.
    this.clock.textContent = seconds(this.time);
    this.clock.title = full;
    this.scrubber.setAttribute('aria-valuetext', full);
    for (const [i, row] of this.rows.entries()) {
      row.playhead.style.left = this.percent(this.time);
      row.playhead.hidden = !this.active;
      const at = this.active && i === this.focused ? blockAt(row.run.blocks, this.time, row.starts) : undefined;
      const current = at ? row.blocks[row.run.blocks.indexOf(at)] : undefined;
      if (row.current !== current) {
        row.current?.classList.remove('is-current');
        current?.classList.add('is-current');
        row.current = current;
      }
    }
    this.moveOverlays();
    const line = block?.line;
    if (line !== this.reportedLine) {
      this.reportedLine = line;
      this.host.scrubbed(line);
    }
  }

  private moveOverlays(): void {
    const svg = this.host.drawing();
    const frame = svg?.getAttribute('data-frame')?.split(' ').map(Number);
    const ok = !!frame && frame.length === 2 && frame.every(Number.isFinite);
    this.rows.forEach((row, i) => {
      const g = this.overlays[i];
      if (!g) return;
      const pose = this.active && ok ? poseAt(row.run.poses, this.time) : undefined;
      g.style.display = pose ? '' : 'none';
      if (!pose || !frame) return;
      // data-frame: field x = user x + a, field y = b − user y.
      const ux = (x: number) => (x - frame[0]!).toFixed(2);
      const uy = (y: number) => (frame[1]! - y).toFixed(2);
      const outline = outlineAt(this.footprint, pose, this.turns);
      const [body, nose, axle] = Array.from(g.children) as SVGElement[];
      if (outline.kind === 'circle') {
        body!.setAttribute('cx', ux(outline.centre.x));
        body!.setAttribute('cy', uy(outline.centre.y));
        body!.setAttribute('r', outline.radius.toFixed(2));
      } else {
        body!.setAttribute('points', outline.points.map((p) => `${ux(p.x)},${uy(p.y)}`).join(' '));
      }
      nose!.setAttribute('x1', ux(pose.x));
      nose!.setAttribute('y1', uy(pose.y));
      nose!.setAttribute('x2', ux(outline.nose.x));
      nose!.setAttribute('y2', uy(outline.nose.y));
      axle!.setAttribute('cx', ux(pose.x));
      axle!.setAttribute('cy', uy(pose.y));
    });
  }
}
