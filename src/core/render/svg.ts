// The SVG drawing of a checked plan: the command line writes it to a file and
// the editor preview shows it. Built as strings (no DOM) so it is fast and runs
// anywhere the core runs.
//
// Stable class names (the preview styles, highlights and hit-tests by them):
//   background    white page behind a standalone drawing (standalone only)
//   title         the plan title;  legend, legend-entry: run names and times
//   field         the field rectangle;  grid: its grid lines
//   zone          a zone (dashed rectangle and its name)
//   obstacle      an obstacle, plus obstacle-box or obstacle-circle
//   label         any text naming something (obstacle, zone, mark, turn angle)
//   run, run-N    everything of run N (N = run index modulo 6, for colour)
//   path          the layer holding a run's path
//   seg           one segment's path, plus seg-KIND (seg-drive, seg-turn,
//                 seg-square, ...), seg-SHAPE for turns (seg-spin, seg-pivot-left,
//                 seg-pivot-right, seg-arc), seg-reverse (driving backwards),
//                 seg-incomplete (some value could not be computed)
//   footprint     the robot's outline at the start, after each turn and at the end
//   footprint-front  the triangle inside a footprint's front edge
//   turn-label    a turn's signed angle (beside a spin glyph, or beside the middle of an arc)
//   compass       heading 0 and the positive direction of turns (compass-label: its text)
//   mark          a `mark` checkpoint (diamond and name)
//   start, end    where a run starts (with its heading) and ends
//   collision-footprint  the footprint where a collision first touches (also a marker-error)
//   marker        a diagnostic, plus marker-error, marker-warning or marker-info,
//                 and marker-wrap for a yaw wrap crossing; tag, tag-text: its tag.
//                 Drawn at the diagnostic's `at`, or failing that at the start of
//                 the drawn segment on the diagnostic's line.
//   scale         the scale bar and the field size
//
// Attributes: every element drawn from a plan line has data-line (0-based); the
// elements of a segment also have data-segment="RUN:SEGMENT" (indices into
// CheckResult.runs and RunResult.segments); markers have data-code.
//
// Colours: all shapes paint with currentColor, so a host page colours the
// drawing by setting `color` per class. A standalone drawing carries its own
// <style> doing exactly that; otherwise the markup has no colour at all.
import { formatRunTime } from '../format';
import { predictedPath } from '../sim/run';
import type { CheckResult, Diagnostic, PathPiece, Point, Pose, RunResult, Segment, TurnDirection } from '../types';
import { footprintCorners, footprintOf, forwardVector, rotateAbout, turnSign, type Footprint } from '../solve/frame';
import { escapeXml, num } from './markup';
import { boundRecorded, drawRecorded, RECORDED_STYLE } from './recorded';
import type { RecordedOverlay } from '../record/compare';
import type { SpreadCloud, SpreadShown } from './cloud';
import { drawableSpread, drawCloud, drawSpreadLayer, sampledShares, spreadOval } from './spreadLayer';
import { spreadCentre } from '../spread/run';
import { Bounds, formatLength, makeView, scaleBarLength, type View } from './view';

export interface RenderOptions {
  /** Which run to draw: index or name; default all runs (each in its own colour). */
  run?: number | string;
  /** true (default): a complete file with its own <style> (light colours, white background) for opening
   *  in a browser. false: no embedded colours; elements carry classes only and the host page styles them
   *  (the editor preview maps them to theme colours). */
  standalone?: boolean;
  /** Target width in CSS pixels of the standalone drawing (default 1000). */
  width?: number;
  /** The 95 % ovals, heading wedges and marks' chances: at marks (default), after every motion too ('all'), or none ('off'). */
  spread?: SpreadShown;
  /** Sampled end points to draw as a cloud of dots (with each mark's sampled share beside its chance); drawn whatever `spread` says. */
  cloud?: SpreadCloud;
  /** A recorded run's reconstructed paths (docs/recorded-runs.md), drawn over its run. */
  recorded?: RecordedOverlay;
}

/** The editor's chart colours in its light themes, so an exported drawing matches the preview. */
const RUN_COLOURS = ['#1a85ff', '#652d90', '#388a34', '#d18616', '#e51400', '#bf8803'];
/** Below this radius (mm) a rotation is a spin: there is no arc to draw. */
const SPIN_RADIUS = 0.01;
/** On-screen sizes in CSS pixels (converted with View.px). */
/** Bounds on the drawing's work, whatever the plan: grid lines per side, pieces per arc. */
const MAX_GRID_LINES = 400;
const MAX_ARC_PIECES = 48;
/** Side of the grid cells labels are filed by, CSS pixels. */
const LABEL_CELL_PX = 64;

interface LabelBox { x0: number; y0: number; x1: number; y1: number }

const SIZE = {
  pathStroke: 2.5,
  thinStroke: 1,
  arrow: 5,
  arrowSpacing: 150,
  spinGlyph: 9,
  labelFont: 12,
  smallFont: 10,
  titleFont: 18,
  legendFont: 13,
  marker: 8,
  footer: 34,
};

/**
 * Draws the field, obstacles, zones, the runs' paths and footprints, and a
 * marker for each diagnostic that has a place on the field (see `marker` above).
 * Throws when `options.run` names no run, so that a caller can report the choice.
 */
export function renderSvg(result: CheckResult, options: RenderOptions = {}): string {
  const standalone = options.standalone ?? true;
  const targetWidth = options.width && options.width > 0 ? options.width : 1000;
  const runs = selectRuns(result.runs, options.run);
  const diagnostics = visibleDiagnostics(result, runs);
  const turns = result.setup.turns;
  const footprint = footprintOf(result.setup.robot);

  // Keys for the predicted path and a recorded run's paths (a coach must tell them from the plan's).
  const legendKeys: LegendKey[] = [];
  if (runs.some(({ run }) => run.segments.some((seg) => (predictedPath(seg)?.length ?? 0) > 0))) {
    legendKeys.push({ cls: 'predicted-key', dash: [2, 3], text: 'predicted' });
  }
  if (options.recorded && runs.some((r) => r.index === options.recorded!.runIndex)) {
    if (options.recorded.fused) legendKeys.push({ cls: 'recorded-key', text: 'recorded: wheels and yaw' });
    legendKeys.push({ cls: 'recorded-key', dash: options.recorded.fused ? [5, 3] : undefined, text: options.recorded.fused ? 'wheels alone' : 'recorded: wheels alone' });
  }
  const header = headerLayout(result, runs, legendKeys);
  const view = makeView(
    boundRecorded(contentBounds(result, runs, diagnostics, footprint), options.recorded),
    targetWidth,
    header.height,
    SIZE.footer,
  );
  const d = new Drawing(view, turns, footprint);

  const out: string[] = [];
  if (standalone) out.push('<?xml version="1.0" encoding="UTF-8"?>\n');
  const size = standalone ? ` width="${num(targetWidth)}" height="${num(view.height / view.px)}"` : '';
  // data-frame: field x = user x + a, field y = b − user y (for a pointer read-out).
  const frame = `${num(-view.x(0))} ${num(view.y(0))}`;
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="veer"${size} viewBox="0 0 ${num(view.width)} ${num(view.height)}" data-frame="${frame}"`,
    ` font-family="system-ui, -apple-system, 'Segoe UI', sans-serif">\n`,
  );
  if (standalone) {
    out.push(standaloneStyle(view.px), `<rect class="background" width="${num(view.width)}" height="${num(view.height)}" fill="none" stroke="none"/>\n`);
  }
  out.push(`<g fill="none" stroke="currentColor" stroke-linecap="round" stroke-linejoin="round">\n`);
  header.draw(out, d);
  drawField(out, d, result);
  drawZones(out, d, result);
  drawObstacles(out, d, result);
  for (const { run, index } of runs) drawFootprints(out, d, run, index);
  for (const { run, index } of runs) drawPath(out, d, run, index);
  for (const { run, index } of runs) drawPredicted(out, d, run, index);
  const recordedRun = options.recorded && runs.find((r) => r.index === options.recorded!.runIndex);
  if (options.recorded && recordedRun) drawRecorded(out, view, options.recorded, recordedRun.run.line, SIZE.labelFont);
  const spread = { shown: options.spread ?? 'marks', shares: sampledShares(options.cloud) };
  for (const { run, index } of runs) drawSpreadLayer(out, d, run, runClass(index), spread.shown, (seg, i) => segmentAttrs(seg, index, i));
  if (options.cloud) drawCloud(out, d, options.cloud, runs, runClass, segmentAttrs);
  for (const { run, index } of runs) drawAnnotations(out, d, run, index, spread);
  drawMarkers(out, d, diagnostics);
  drawScale(out, d, result);
  drawCompass(out, d);
  out.push('</g>\n</svg>\n');
  return out.join('');
}

interface IndexedRun {
  run: RunResult;
  index: number;
}

function selectRuns(runs: RunResult[], which: number | string | undefined): IndexedRun[] {
  const all = runs.map((run, index) => ({ run, index }));
  if (which === undefined) return all;
  const found = typeof which === 'number' ? all[which] : all.find((r) => r.run.name === which);
  if (!found) {
    const names = runs.map((r) => `"${r.name}"`).join(', ') || 'none';
    throw new Error(`No run ${typeof which === 'number' ? `number ${which}` : `named "${which}"`}; the runs are: ${names}.`);
  }
  return [found];
}

interface PlacedDiagnostic {
  diag: Diagnostic;
  at: Point;
}

/**
 * Diagnostics with a field position, less those inside runs that are not drawn:
 * a marker with no path near it would only confuse. A diagnostic without `at`
 * on the line of a drawn segment is placed where that segment starts, so that a
 * problem found on the yaw reading (a wrap crossing) still shows on the path.
 */
function visibleDiagnostics(result: CheckResult, shown: IndexedRun[]): PlacedDiagnostic[] {
  const segmentStartAtLine = new Map<number, Point>();
  for (const { run } of shown) {
    for (const seg of run.segments) {
      if (!segmentStartAtLine.has(seg.line) && finite(seg.start)) segmentStartAtLine.set(seg.line, seg.start);
    }
  }
  const starts = result.runs.map((r) => r.line);
  const runAtLine = (line: number): number => {
    let found = -1;
    starts.forEach((start, i) => {
      if (start <= line && (found < 0 || start >= starts[found])) found = i;
    });
    return found;
  };
  const shownIndices = new Set(shown.map((r) => r.index));
  const placed: PlacedDiagnostic[] = [];
  for (const diag of result.diagnostics) {
    const line = diag.range.start.line;
    const at = diag.at && finite(diag.at) ? diag.at : segmentStartAtLine.get(line);
    const owner = runAtLine(line);
    if (at && (owner < 0 || shownIndices.has(owner))) placed.push({ diag, at: { x: at.x, y: at.y } });
  }
  return placed;
}

function finite(p: Point): boolean {
  return Number.isFinite(p.x) && Number.isFinite(p.y);
}

function distance(a: Point, b: Point): number {
  return Math.hypot(a.x - b.x, a.y - b.y);
}

/** Distance from the axle midpoint to the farthest point of the footprint. */
function footprintReach(fp: Footprint): number {
  if (fp.kind === 'circle') return fp.radius;
  return Math.hypot(fp.length / 2 + Math.abs(fp.axle), fp.width / 2);
}

function contentBounds(result: CheckResult, runs: IndexedRun[], diagnostics: PlacedDiagnostic[], fp: Footprint): Bounds {
  const b = new Bounds();
  const { field, obstacles, zones } = result.setup;
  if (field) {
    b.add(0, 0);
    b.add(field.width, field.height);
  }
  for (const o of obstacles) {
    if (o.min && o.max) {
      b.add(o.min.x, o.min.y);
      b.add(o.max.x, o.max.y);
    } else if (o.center && o.radius !== undefined) {
      b.addAround(o.center, o.radius);
    }
  }
  for (const z of zones) {
    b.add(z.min.x, z.min.y);
    b.add(z.max.x, z.max.y);
  }
  const reach = footprintReach(fp);
  for (const { run } of runs) {
    for (const seg of run.segments) {
      b.addAround(seg.start, reach);
      b.addAround(seg.end, reach);
      for (const piece of seg.path) {
        b.add(piece.from.x, piece.from.y);
        b.add(piece.to.x, piece.to.y);
        // The whole circle holds the arc; a little slack in the view is harmless. A square's
        // turn onto the wall is short and its centre may lie far off: its ends suffice.
        if (piece.type === 'rotate' && seg.kind !== 'square') b.addAround(piece.center, distance(piece.center, piece.from));
      }
    }
  }
  for (const { at } of diagnostics) b.add(at.x, at.y);
  return b;
}

/** Field-to-SVG conversion plus the small glyphs every layer uses. */
class Drawing {
  constructor(
    readonly view: View,
    readonly turns: TurnDirection,
    readonly footprint: Footprint,
  ) {}

  /** `x y` of a field point in SVG user units. */
  xy(p: Point): string {
    return `${num(this.view.x(p.x))} ${num(this.view.y(p.y))}`;
  }

  /** A length of `n` CSS pixels in user units. */
  px(n: number): string {
    return num(n * this.view.px);
  }

  /** An open arrowhead with its tip at `tip`, pointing along the field direction `dir` (unit vector). */
  chevron(tip: Point, dir: Point): string {
    const a = SIZE.arrow * this.view.px;
    const back = { x: tip.x - dir.x * a, y: tip.y - dir.y * a };
    const side = { x: -dir.y * a * 0.7, y: dir.x * a * 0.7 };
    return `M${this.xy({ x: back.x + side.x, y: back.y + side.y })}L${this.xy(tip)}L${this.xy({ x: back.x - side.x, y: back.y - side.y })}`;
  }

  /**
   * Arc commands from `from` about `center` by `turned` degrees (file convention).
   * Split into pieces of at most 90 degrees: an SVG arc whose ends coincide draws
   * nothing, and short pieces never need the large-arc flag.
   */
  arc(from: Point, center: Point, turned: number): string {
    const r = num(distance(center, from));
    const sweep = turnSign(this.turns) * turned > 0 ? 1 : 0; // 1 = clockwise on screen (SVG y down)
    // A turn of several full circles draws over itself: at most MAX_ARC_PIECES pieces, whatever the angle.
    const steps = Math.min(MAX_ARC_PIECES, Math.max(1, Math.ceil(Math.abs(turned) / 90)));
    let d = '';
    for (let k = 1; k <= steps; k++) {
      const p = rotateAbout(from, center, (turned * k) / steps, this.turns);
      d += `A${r} ${r} 0 0 ${sweep} ${this.xy(p)}`;
    }
    return d;
  }

  /** Unit direction of travel along the circle about `center` at `p`, turning by the sign of `turned`. */
  tangent(p: Point, center: Point, turned: number): Point {
    const ahead = rotateAbout(p, center, Math.sign(turned) * 0.5, this.turns);
    const len = distance(ahead, p) || 1;
    return { x: (ahead.x - p.x) / len, y: (ahead.y - p.y) / len };
  }

  /** A circle as a path, so that it can share one element with other strokes. */
  circle(c: Point, r: number): string {
    const rr = num(r);
    return `M${this.xy({ x: c.x - r, y: c.y })}A${rr} ${rr} 0 1 0 ${this.xy({ x: c.x + r, y: c.y })}A${rr} ${rr} 0 1 0 ${this.xy({ x: c.x - r, y: c.y })}Z`;
  }

  text(cls: string, at: Point, content: string, fontPx: number, extra = ''): string {
    return `<text class="${cls}" x="${num(this.view.x(at.x))}" y="${num(this.view.y(at.y))}" font-size="${this.px(fontPx)}" fill="currentColor" stroke="none"${extra}>${escapeXml(content)}</text>`;
  }

  /**
   * Boxes (user units) of the labels placed so far, so later labels keep
   * clear of them: filed by grid cell, so a drawing with thousands of labels
   * compares each new one with its neighbours only.
   */
  private readonly labelCells = new Map<string, LabelBox[]>();

  private cellsOf(b: LabelBox, visit: (key: string) => boolean | void): boolean {
    const size = LABEL_CELL_PX * this.view.px;
    for (let i = Math.floor(b.x0 / size); i <= Math.floor(b.x1 / size); i++) {
      for (let j = Math.floor(b.y0 / size); j <= Math.floor(b.y1 / size); j++) if (visit(`${i},${j}`) === false) return false;
    }
    return true;
  }

  /**
   * A label placed where it overlaps no label placed before: at `at` if that
   * is free, else the nearest free spot above or below it (then further out).
   * Sizes are estimated from the text, on the generous side (0.62 em a
   * character), so real boxes in a browser do not touch either.
   */
  label(cls: string, at: Point, content: string, fontPx: number, anchor: 'start' | 'middle' | 'end', extra = ''): string {
    const px = this.view.px;
    const w = content.length * fontPx * 0.62 * px + 2 * px;
    const h = fontPx * 1.3 * px;
    const boxAt = (p: Point) => {
      const x = this.view.x(p.x);
      const y = this.view.y(p.y); // the text is centred on y (dy 0.35em)
      const x0 = anchor === 'start' ? x - px : anchor === 'middle' ? x - w / 2 : x - w + px;
      return { x0, y0: y - h / 2, x1: x0 + w, y1: y + h / 2 };
    };
    const free = (b: LabelBox) => this.cellsOf(b, (key) =>
      (this.labelCells.get(key) ?? []).every((o) => b.x1 <= o.x0 || b.x0 >= o.x1 || b.y1 <= o.y0 || b.y0 >= o.y1));
    let place = at;
    let box = boxAt(at);
    if (!free(box)) {
      for (let k = 1; k <= 8; k++) {
        const up = { x: at.x, y: at.y + k * h * 1.05 };
        const down = { x: at.x, y: at.y - k * h * 1.05 };
        const found = [up, down].find((p) => free(boxAt(p)));
        if (found) {
          place = found;
          box = boxAt(found);
          break;
        }
      }
    }
    this.cellsOf(box, (key) => {
      const list = this.labelCells.get(key);
      if (list) list.push(box);
      else this.labelCells.set(key, [box]);
    });
    return this.text(cls, place, content, fontPx, `${extra} text-anchor="${anchor}" dy="0.35em"`);
  }
}

function segmentAttrs(seg: Segment, runIndex: number, segIndex: number): string {
  return ` data-line="${seg.line}" data-segment="${runIndex}:${segIndex}"`;
}

function runClass(index: number): string {
  return `run run-${index % RUN_COLOURS.length}`;
}

// ---------------------------------------------------------------------------
// Header: title and the legend of runs

interface HeaderLayout {
  height(px: number, width: number): number;
  draw(out: string[], d: Drawing): void;
}

/** The legend wraps short of the heading compass in the top right corner (px). */
const COMPASS_ROOM = 80;

/** A key of the legend that is not a run: how a kind of line is drawn (a recorded run's two paths). */
interface LegendKey {
  /** Classes of the key's group (its colour comes from them). */
  cls: string;
  dash?: number[];
  text: string;
}

function headerLayout(result: CheckResult, runs: IndexedRun[], keys: LegendKey[] = []): HeaderLayout {
  const title = result.setup.title;
  const planStmt = result.ast.statements.find((s) => s.kind === 'plan');
  const entries: { run?: RunResult; index: number; key?: LegendKey; text: string }[] = runs.map(({ run, index }) => ({
    run,
    index,
    text: `${run.name}${Number.isFinite(run.duration) ? ` · ${formatRunTime(run.duration)}` : ''}${run.predictedDuration === undefined ? '' : Number.isFinite(run.predictedDuration) ? `, predicted ${formatRunTime(run.predictedDuration)}` : ', never ends'}`,
  }));
  for (const key of keys) entries.push({ index: -1, key, text: key.text });
  const swatch = 18;
  const gap = 16;
  // Text width is not measurable without a font engine; 0.6 em per character is
  // a fair average for sans-serif text.
  const entryWidth = (text: string): number => swatch + 6 + text.length * 0.6 * SIZE.legendFont + gap;
  const rowHeight = SIZE.legendFont + 8;
  const titleHeight = title ? SIZE.titleFont + 16 : 8;

  const rowsFor = (widthPx: number): number[] => {
    // Row index of each entry, wrapping when the next entry would overflow.
    const rows: number[] = [];
    let x = 0;
    let row = 0;
    for (const e of entries) {
      const w = entryWidth(e.text);
      if (x > 0 && x + w > widthPx) {
        row++;
        x = 0;
      }
      rows.push(row);
      x += w;
    }
    return rows;
  };
  const legendRows = (px: number, width: number): number => {
    if (entries.length === 0) return 0;
    const rows = rowsFor(width / px - 16 - COMPASS_ROOM);
    return rows[rows.length - 1] + 1;
  };

  return {
    height: (px, width) => titleHeight + legendRows(px, width) * rowHeight + 6,
    draw(out, d) {
      const view = d.view;
      const left = view.margin;
      const px = view.px;
      if (title) {
        const line = planStmt ? ` data-line="${planStmt.line}"` : '';
        out.push(
          `<text class="title"${line} x="${num(left)}" y="${num((SIZE.titleFont + 6) * px)}" font-size="${d.px(SIZE.titleFont)}" font-weight="600" fill="currentColor" stroke="none">${escapeXml(title)}</text>\n`,
        );
      }
      if (entries.length === 0) return;
      const rows = rowsFor(view.width / px - 16 - COMPASS_ROOM);
      out.push('<g class="legend">\n');
      let x = left;
      let lastRow = 0;
      entries.forEach((e, i) => {
        if (rows[i] !== lastRow) {
          x = left;
          lastRow = rows[i];
        }
        const y = (titleHeight + rows[i] * rowHeight + SIZE.legendFont) * px;
        const mid = y - SIZE.legendFont * 0.35 * px;
        const dash = e.key?.dash ? ` stroke-dasharray="${e.key.dash.map((v) => d.px(v)).join(' ')}"` : '';
        out.push(
          e.run ? `<g class="legend-entry ${runClass(e.index)}" data-line="${e.run.line}">` : `<g class="legend-entry legend-key ${e.key?.cls ?? ''}">`,
          `<path d="M${num(x)} ${num(mid)}h${d.px(swatch)}" stroke-width="${d.px(SIZE.pathStroke + 0.5)}"${dash}/>`,
          `<text x="${num(x + (swatch + 6) * px)}" y="${num(y)}" font-size="${d.px(SIZE.legendFont)}" fill="currentColor" stroke="none">${escapeXml(e.text)}</text></g>\n`,
        );
        x += entryWidth(e.text) * px;
      });
      out.push('</g>\n');
    },
  };
}

// ---------------------------------------------------------------------------
// Field, zones, obstacles

function drawField(out: string[], d: Drawing, result: CheckResult): void {
  const { field } = result.setup;
  const view = d.view;
  const fieldStmt = result.ast.statements.find((s) => s.kind === 'field');
  const line = fieldStmt ? ` data-line="${fieldStmt.line}"` : '';
  let x0: number;
  let y0: number;
  let x1: number;
  let y1: number;
  let grid: number;
  if (field) {
    [x0, y0, x1, y1, grid] = [0, 0, field.width, field.height, field.grid];
    const tl = { x: 0, y: field.height };
    out.push(
      `<rect class="field"${line} x="${num(view.x(tl.x))}" y="${num(view.y(tl.y))}" width="${num(field.width)}" height="${num(field.height)}"`,
      ` fill="currentColor" fill-opacity="0.04" stroke-width="${d.px(1.5)}"/>\n`,
    );
  } else {
    // No field: a 100 mm grid across the view still lets the reader judge distances.
    grid = 100;
    [x0, y0, x1, y1] = [-view.x(0), view.y(0) - view.contentBottom, view.width - view.x(0), view.y(0) - view.contentTop];
  }
  // Too dense a grid is noise, not information.
  if (!(grid > 0) || grid / view.px < 6 || ![x0, y0, x1, y1].every(Number.isFinite)) return;
  // Lines counted by index, never by adding up coordinates (which stall where
  // a step is lost in rounding), and never more than MAX_GRID_LINES a side.
  const lines = (lo: number, hi: number, draw: (at: number) => void) => {
    const first = Math.floor(lo / grid) + 1;
    const count = Math.min(MAX_GRID_LINES, Math.max(0, Math.ceil((hi - 1e-6) / grid) - first));
    for (let k = 0; k < count; k++) draw((first + k) * grid);
  };
  const parts: string[] = [];
  lines(x0, x1, (gx) => parts.push(`M${num(view.x(gx))} ${num(view.y(y1))}V${num(view.y(y0))}`));
  lines(y0, y1, (gy) => parts.push(`M${num(view.x(x0))} ${num(view.y(gy))}H${num(view.x(x1))}`));
  if (parts.length > 0) {
    out.push(`<path class="grid"${field ? line : ''} d="${parts.join('')}" stroke-opacity="0.35" stroke-width="${d.px(0.75)}"/>\n`);
  }
}

function drawZones(out: string[], d: Drawing, result: CheckResult): void {
  const view = d.view;
  for (const z of result.setup.zones) {
    if (!finite(z.min) || !finite(z.max)) continue;
    out.push(
      `<g class="zone" data-line="${z.line}"><title>${escapeXml(`zone ${z.name}`)}</title>`,
      `<rect x="${num(view.x(z.min.x))}" y="${num(view.y(z.max.y))}" width="${num(z.max.x - z.min.x)}" height="${num(z.max.y - z.min.y)}"`,
      ` fill="currentColor" fill-opacity="0.1" stroke-width="${d.px(1.5)}" stroke-dasharray="${d.px(6)} ${d.px(4)}"/>`,
      d.label('label', { x: z.min.x + 5 * view.px, y: z.max.y - (SIZE.labelFont / 2 + 5) * view.px }, z.name, SIZE.labelFont, 'start'),
      '</g>\n',
    );
  }
}

function drawObstacles(out: string[], d: Drawing, result: CheckResult): void {
  const view = d.view;
  const labelAttrs = ' font-weight="600"';
  for (const o of result.setup.obstacles) {
    let shape: string;
    let centre: Point;
    if (o.kind === 'box' && o.min && o.max && finite(o.min) && finite(o.max)) {
      shape = `<rect x="${num(view.x(o.min.x))}" y="${num(view.y(o.max.y))}" width="${num(o.max.x - o.min.x)}" height="${num(o.max.y - o.min.y)}"`;
      centre = { x: (o.min.x + o.max.x) / 2, y: (o.min.y + o.max.y) / 2 };
    } else if (o.kind === 'circle' && o.center && finite(o.center) && o.radius !== undefined && o.radius >= 0) {
      shape = `<circle cx="${num(view.x(o.center.x))}" cy="${num(view.y(o.center.y))}" r="${num(o.radius)}"`;
      centre = o.center;
    } else {
      continue;
    }
    out.push(
      `<g class="obstacle obstacle-${o.kind}" data-line="${o.line}"><title>${escapeXml(o.name)}</title>`,
      `${shape} fill="currentColor" fill-opacity="0.3" stroke-width="${d.px(1.5)}"/>`,
      d.label('label', centre, o.name, SIZE.labelFont, 'middle', labelAttrs),
      '</g>\n',
    );
  }
}

// ---------------------------------------------------------------------------
// Runs

/** Poses where the footprint is drawn: the start, after each turn, the end; keyed by segment index. */
function footprintPoses(run: RunResult): Map<number, Pose> {
  const poses = new Map<number, Pose>();
  const segs = run.segments;
  if (segs.length === 0) return poses;
  const startIndex = Math.max(0, segs.findIndex((s) => s.kind === 'start'));
  const startSeg = segs[startIndex];
  poses.set(startIndex, startSeg.kind === 'start' ? startSeg.end : startSeg.start);
  segs.forEach((seg, i) => {
    if (seg.kind === 'turn') poses.set(i, seg.end);
  });
  poses.set(segs.length - 1, segs[segs.length - 1].end);
  return poses;
}

function drawFootprints(out: string[], d: Drawing, run: RunResult, runIndex: number): void {
  const fp = d.footprint;
  if (fp.kind === 'circle' && !(fp.radius > 0)) return;
  out.push(
    `<g class="footprints ${runClass(runIndex)}" fill="currentColor" fill-opacity="0.04" stroke-opacity="0.45" stroke-width="${d.px(SIZE.thinStroke)}">\n`,
  );
  for (const [i, pose] of footprintPoses(run)) {
    if (!finite(pose) || !Number.isFinite(pose.heading)) continue;
    const fwd = forwardVector(pose.heading, d.turns);
    let outline: string;
    let frontReach: number;
    if (fp.kind === 'rect') {
      const c = footprintCorners(fp, pose, d.turns);
      outline = `M${d.xy(c[0])}L${d.xy(c[1])}L${d.xy(c[2])}L${d.xy(c[3])}Z`;
      frontReach = fp.length / 2 - fp.axle;
    } else {
      outline = d.circle(pose, fp.radius);
      frontReach = fp.radius;
    }
    // A small triangle inside the front edge shows which way the outline faces.
    const a = Math.min(8 * d.view.px, frontReach * 0.4);
    const tip = { x: pose.x + fwd.x * (frontReach - a * 0.2), y: pose.y + fwd.y * (frontReach - a * 0.2) };
    const base = { x: tip.x - fwd.x * a, y: tip.y - fwd.y * a };
    const side = { x: -fwd.y * a * 0.6, y: fwd.x * a * 0.6 };
    const front = `M${d.xy(tip)}L${d.xy({ x: base.x + side.x, y: base.y + side.y })}L${d.xy({ x: base.x - side.x, y: base.y - side.y })}Z`;
    out.push(`<path class="footprint"${segmentAttrs(run.segments[i], runIndex, i)} d="${outline}"/>`,
      `<path class="footprint-front"${segmentAttrs(run.segments[i], runIndex, i)} d="${front}" fill="currentColor" fill-opacity="0.6" stroke="none"/>\n`);
  }
  out.push('</g>\n');
}

function isBackwards(piece: PathPiece, turns: TurnDirection): boolean {
  const f = forwardVector(piece.from.heading, turns);
  return (piece.to.x - piece.from.x) * f.x + (piece.to.y - piece.from.y) * f.y < 0;
}

function finitePiece(piece: PathPiece): boolean {
  return finite(piece.from) && finite(piece.to) && (piece.type === 'line' || (finite(piece.center) && Number.isFinite(piece.turned)));
}

/** The stroke of one segment: its pieces, then arrowheads and spin glyphs as extra subpaths. */
function segmentPath(d: Drawing, seg: Segment): { d: string; backwards: boolean } {
  const px = d.view.px;
  let main = '';
  let extra = '';
  let pen: Point | undefined;
  let backwards = false;
  for (const piece of seg.path) {
    if (!finitePiece(piece)) continue;
    const moveTo = (p: Point): void => {
      if (!pen || distance(pen, p) > 0.01) main += `M${d.xy(p)}`;
    };
    if (piece.type === 'line') {
      const len = distance(piece.from, piece.to);
      if (len < 0.01) continue;
      moveTo(piece.from);
      main += `L${d.xy(piece.to)}`;
      pen = piece.to;
      backwards ||= isBackwards(piece, d.turns);
      const lenPx = len / px;
      if (lenPx >= 4 * SIZE.arrow) {
        const dir = { x: (piece.to.x - piece.from.x) / len, y: (piece.to.y - piece.from.y) / len };
        const count = Math.max(1, Math.floor(lenPx / SIZE.arrowSpacing));
        for (let k = 0; k < count; k++) {
          const t = (k + 0.5) / count;
          const tip = { x: piece.from.x + dir.x * (len * t + (SIZE.arrow / 2) * px), y: piece.from.y + dir.y * (len * t + (SIZE.arrow / 2) * px) };
          extra += d.chevron(tip, dir);
        }
      }
    } else if (distance(piece.center, piece.from) < SPIN_RADIUS) {
      extra += spinGlyph(d, piece.center, piece.from.heading, piece.turned);
    } else {
      moveTo(piece.from);
      main += d.arc(piece.from, piece.center, piece.turned);
      pen = piece.to;
      const r = distance(piece.center, piece.from);
      if ((r * Math.abs(piece.turned) * Math.PI) / 180 / px >= 6 * SIZE.arrow) {
        const mid = rotateAbout(piece.from, piece.center, piece.turned / 2, d.turns);
        extra += d.chevron(mid, d.tangent(mid, piece.center, piece.turned));
      }
    }
  }
  return { d: main + extra, backwards };
}

/**
 * A spin does not move the axle midpoint, so there is no arc to draw: a short
 * curved arrow around the point shows the direction and roughly the amount.
 */
function spinGlyph(d: Drawing, c: Point, heading: number, turned: number): string {
  const r = SIZE.spinGlyph * d.view.px;
  const f = forwardVector(heading, d.turns);
  const from = { x: c.x + f.x * r, y: c.y + f.y * r };
  // Tiny turns still get a visible glyph; whole turns cannot be drawn as an arc anyway.
  const shown = Math.sign(turned || 1) * Math.min(Math.max(Math.abs(turned), 45), 320);
  const to = rotateAbout(from, c, shown, d.turns);
  return `M${d.xy(from)}${d.arc(from, c, shown)}${d.chevron(to, d.tangent(to, c, shown))}`;
}

function drawPath(out: string[], d: Drawing, run: RunResult, runIndex: number): void {
  out.push(`<g class="path ${runClass(runIndex)}" data-line="${run.line}" stroke-width="${d.px(SIZE.pathStroke)}">\n`);
  const dash = ` stroke-dasharray="${d.px(7)} ${d.px(5)}"`;
  run.segments.forEach((seg, i) => {
    const stroke = segmentPath(d, seg);
    if (!stroke.d) return;
    let cls = `seg seg-${seg.kind}`;
    if (seg.shape) cls += ` seg-${seg.shape.replace(' ', '-')}`;
    if (stroke.backwards) cls += ' seg-reverse';
    if (!seg.complete) cls += ' seg-incomplete';
    out.push(
      `<path class="${cls}"${segmentAttrs(seg, runIndex, i)} d="${stroke.d}"${stroke.backwards ? dash : ''}${seg.complete ? '' : ' stroke-opacity="0.5"'}/>\n`,
    );
  });
  out.push('</g>\n');
}

/**
 * The controller simulation's path where it leaves the planned one (by more
 * than 2 mm or 0.5°): a thin dotted line beside the planned path.
 */
function drawPredicted(out: string[], d: Drawing, run: RunResult, runIndex: number): void {
  let path = '';
  let pen: Point | undefined;
  for (const seg of run.segments) {
    for (const piece of predictedPath(seg) ?? []) {
      if (!finitePiece(piece) || distance(piece.from, piece.to) < 0.05) continue;
      if (!pen || distance(pen, piece.from) > 0.01) path += `M${d.xy(piece.from)}`;
      path += piece.type === 'line' || distance(piece.center, piece.from) > 1e5 ? `L${d.xy(piece.to)}` : d.arc(piece.from, piece.center, piece.turned);
      pen = piece.to;
    }
  }
  if (!path) return;
  out.push(`<g class="predicted ${runClass(runIndex)}" data-line="${run.line}"><path d="${path}" stroke-width="${d.px(SIZE.thinStroke * 1.5)}" stroke-dasharray="${d.px(2)} ${d.px(3)}" stroke-opacity="0.9"/><title>Predicted path of "${escapeXml(run.name)}" (controller simulation)</title></g>\n`);
}

/** Turn centres, spin angles, marks, and the start and end markers: drawn above every path. */
function drawAnnotations(out: string[], d: Drawing, run: RunResult, runIndex: number,
  spread: { shown: SpreadShown; shares: Map<string, number> } = { shown: 'marks', shares: new Map() }): void {
  const px = d.view.px;
  const segs = run.segments;
  out.push(`<g class="${runClass(runIndex)}" stroke-width="${d.px(SIZE.thinStroke * 1.5)}">\n`);
  segs.forEach((seg, i) => {
    const attrs = segmentAttrs(seg, runIndex, i);
    for (const piece of seg.path) {
      if (piece.type !== 'rotate' || !finitePiece(piece) || seg.kind === 'square') continue;
      const angle = Math.round(piece.turned * 10) / 10;
      const angleText = `${angle > 0 ? '+' : ''}${angle}°`;
      if (distance(piece.center, piece.from) >= SPIN_RADIUS) {
        if (seg.kind !== 'turn') continue;
        // The angle beside the middle of the arc, on the side away from its centre.
        const r = distance(piece.center, piece.from);
        const mid = rotateAbout(piece.from, piece.center, piece.turned / 2, d.turns);
        const out1 = { x: (mid.x - piece.center.x) / r, y: (mid.y - piece.center.y) / r };
        const reach = 10 * px;
        const at = { x: mid.x + out1.x * reach, y: mid.y + out1.y * reach };
        const anchor = out1.x > 0.4 ? 'start' : out1.x < -0.4 ? 'end' : 'middle';
        out.push(d.label('label turn-label', at, angleText, SIZE.smallFont, anchor, attrs), '\n');
      } else if (seg.kind === 'turn') {
        // The angle goes on the bisector of the glyph, clear of the paths in and out.
        const f = forwardVector(piece.from.heading, d.turns);
        const shown = Math.sign(piece.turned || 1) * Math.min(Math.max(Math.abs(piece.turned), 45), 320);
        const reach = (SIZE.spinGlyph + 5) * px;
        const at = rotateAbout({ x: piece.center.x + f.x * reach, y: piece.center.y + f.y * reach }, piece.center, shown / 2, d.turns);
        // Anchor the text on its side nearest the glyph, so it grows away from it.
        const outwardX = at.x - piece.center.x;
        const anchor = outwardX > 0.4 * reach ? 'start' : outwardX < -0.4 * reach ? 'end' : 'middle';
        out.push(d.label('label turn-label', at, angleText, SIZE.smallFont, anchor, attrs), '\n');
      }
    }
    if (seg.kind === 'mark' && seg.label !== undefined && finite(seg.end)) {
      const s = 5 * px;
      const p = seg.end;
      // Where the real robot ends in 19 runs out of 20 (the spread's 95 % oval), and how often it meets the mark
      // (and, after sampling, the share of sampled runs that did).
      const on = spread.shown !== 'off';
      const ovalSpread = on ? drawableSpread(seg) : undefined;
      const oval = ovalSpread ? spreadOval(d, spreadCentre(seg), ovalSpread, 'spread') : '';
      const sampled = spread.shares.get(`${runIndex}:${i}`);
      const chance = on && seg.hitProbability !== undefined ? ` · ${formatChance(seg.hitProbability)}` : '';
      const about = (on && seg.hitProbability !== undefined ? `: met in ${formatChance(seg.hitProbability)} of runs; the oval holds 19 runs in 20` : '')
        + (sampled !== undefined ? `; met by ${formatChance(sampled)} of the sampled runs` : '');
      out.push(
        `<g class="mark"${attrs}><title>${escapeXml(`mark ${seg.label}${about}`)}</title>`,
        oval,
        `<path d="M${d.xy({ x: p.x, y: p.y + s })}L${d.xy({ x: p.x + s, y: p.y })}L${d.xy({ x: p.x, y: p.y - s })}L${d.xy({ x: p.x - s, y: p.y })}Z" fill="currentColor"/>`,
        d.label('label', { x: p.x + 8 * px, y: p.y }, `${seg.label}${chance}`, SIZE.labelFont, 'start'),
        // The sampled share on a line of its own under the name, so the label stays short.
        sampled !== undefined ? d.label('label sampled-share', { x: p.x + 8 * px, y: p.y - 15 * px }, `sampled ${formatChance(sampled)}`, SIZE.smallFont, 'start') : '',
        '</g>\n',
      );
    }
  });
  drawStartEnd(out, d, run, runIndex);
  out.push('</g>\n');
}

/** A share of runs as people say it: "99 %", and never "100 %" for what is only nearly sure. */
function formatChance(p: number): string {
  const pct = p * 100;
  if (pct > 99.5 && pct < 100) return '> 99 %';
  if (pct < 0.5 && pct > 0) return '< 1 %';
  return `${Math.round(pct)} %`;
}

function drawStartEnd(out: string[], d: Drawing, run: RunResult, runIndex: number): void {
  const segs = run.segments;
  if (segs.length === 0) return;
  const px = d.view.px;
  const startIndex = Math.max(0, segs.findIndex((s) => s.kind === 'start'));
  const startSeg = segs[startIndex];
  const start = startSeg.kind === 'start' ? startSeg.end : startSeg.start;
  if (finite(start) && Number.isFinite(start.heading)) {
    const f = forwardVector(start.heading, d.turns);
    const len = 24 * px;
    const tip = { x: start.x + f.x * len, y: start.y + f.y * len };
    out.push(
      `<g class="start"${segmentAttrs(startSeg, runIndex, startIndex)}><title>${escapeXml(`start of ${run.name}`)}</title>`,
      `<path d="M${d.xy(start)}L${d.xy(tip)}${d.chevron(tip, f)}" stroke-width="${d.px(2)}"/>`,
      `<circle cx="${num(d.view.x(start.x))}" cy="${num(d.view.y(start.y))}" r="${d.px(5)}" fill="currentColor"/></g>\n`,
    );
  }
  const lastIndex = segs.length - 1;
  const end = segs[lastIndex].end;
  if (finite(end)) {
    const time = Number.isFinite(run.duration) ? ` (${formatRunTime(run.duration)})` : '';
    out.push(
      `<g class="end"${segmentAttrs(segs[lastIndex], runIndex, lastIndex)}><title>${escapeXml(`end of ${run.name}${time}`)}</title>`,
      `<path d="${d.circle(end, 7 * px)}" stroke-width="${d.px(2)}"/>`,
      `<circle cx="${num(d.view.x(end.x))}" cy="${num(d.view.y(end.y))}" r="${d.px(3)}" fill="currentColor"/></g>\n`,
    );
  }
}

// ---------------------------------------------------------------------------
// Diagnostics

const SEVERITY_ORDER = { information: 0, warning: 1, error: 2 } as const;

function drawMarkers(out: string[], d: Drawing, diagnostics: PlacedDiagnostic[]): void {
  if (diagnostics.length === 0) return;
  // Errors on top of warnings, wrap crossings on top of everything.
  const rank = ({ diag }: PlacedDiagnostic): number => SEVERITY_ORDER[diag.severity] + (diag.code === 'wrap-cross' ? 3 : 0);
  const sorted = [...diagnostics].sort((a, b) => rank(a) - rank(b));
  const px = d.view.px;
  const p = (n: number): string => d.px(n);
  out.push(`<g class="markers" stroke-width="${p(2)}">\n`);
  // A collision shows the robot's footprint where it first touches the obstacle, in the error colour.
  for (const { diag } of sorted) {
    if (diag.code !== 'collision' || !diag.pose || !finite(diag.pose) || !Number.isFinite(diag.pose.heading)) continue;
    const fp = d.footprint;
    const outline = fp.kind === 'rect'
      ? (() => { const c = footprintCorners(fp, diag.pose!, d.turns); return `M${d.xy(c[0])}L${d.xy(c[1])}L${d.xy(c[2])}L${d.xy(c[3])}Z`; })()
      : fp.radius > 0 ? d.circle(diag.pose, fp.radius) : '';
    if (!outline) continue;
    out.push(
      `<path class="marker marker-error collision-footprint" data-line="${diag.range.start.line}" data-code="collision" d="${outline}" fill="currentColor" fill-opacity="0.25" stroke-width="${p(2)}">`,
      `<title>${escapeXml(`Error [collision]: ${diag.message}`)}</title></path>\n`,
    );
  }
  for (const { diag, at } of sorted) {
    const wrap = diag.code === 'wrap-cross';
    const severityClass = diag.severity === 'information' ? 'marker-info' : `marker-${diag.severity}`;
    const cls = `marker ${severityClass}${wrap ? ' marker-wrap' : ''}`;
    const word = diag.severity === 'error' ? 'Error' : diag.severity === 'warning' ? 'Warning' : 'Note';
    out.push(
      `<g class="${cls}" data-line="${diag.range.start.line}" data-code="${escapeXml(diag.code)}" transform="translate(${num(d.view.x(at.x))} ${num(d.view.y(at.y))})">`,
      `<title>${escapeXml(`${word} [${diag.code}]: ${diag.message}`)}</title>`,
    );
    const r = SIZE.marker;
    if (wrap) {
      // Two rings wide enough to leave a spin glyph at the same point readable.
      const tagX = (r + 9) * px;
      out.push(
        `<circle r="${p(r + 7)}" fill="currentColor" fill-opacity="0.1" stroke-width="${p(2.5)}"/>`,
        `<circle r="${p(r + 3)}" stroke-width="${p(1.5)}"/>`,
        `<rect class="tag" x="${num(tagX)}" y="${p(-r - 17)}" width="${p(34)}" height="${p(15)}" rx="${p(3)}" fill="currentColor" fill-opacity="0.15" stroke-width="${p(1)}"/>`,
        `<text class="tag-text" x="${num(tagX + 17 * px)}" y="${p(-r - 6)}" font-size="${p(11)}" font-weight="700" text-anchor="middle" fill="currentColor" stroke="none">wrap</text>`,
      );
    } else if (diag.severity === 'error') {
      const s = r * 0.4;
      out.push(
        `<circle r="${p(r)}" fill="currentColor" fill-opacity="0.2"/>`,
        `<path d="M${p(-s)} ${p(-s)}L${p(s)} ${p(s)}M${p(s)} ${p(-s)}L${p(-s)} ${p(s)}"/>`,
      );
    } else if (diag.severity === 'warning') {
      out.push(
        `<path d="M0 ${p(-r - 1)}L${p(r)} ${p(r * 0.75)}L${p(-r)} ${p(r * 0.75)}Z" fill="currentColor" fill-opacity="0.2"/>`,
        `<path d="M0 ${p(-r * 0.35)}V${p(r * 0.15)}M0 ${p(r * 0.45)}V${p(r * 0.46)}"/>`,
      );
    } else {
      out.push(`<circle r="${p(r * 0.6)}" fill="currentColor" fill-opacity="0.2" stroke-width="${p(1.5)}"/>`);
    }
    out.push('</g>\n');
  }
  out.push('</g>\n');
}

// ---------------------------------------------------------------------------
// Footer: scale bar and field size

function drawScale(out: string[], d: Drawing, result: CheckResult): void {
  const view = d.view;
  const px = view.px;
  const unit = result.setup.lengthUnit;
  const length = scaleBarLength(view.width * 0.2, unit);
  const x = view.margin;
  const y = view.contentBottom + 12 * px;
  const tick = 5 * px;
  const textY = num(y + (SIZE.labelFont / 2 - 1) * px);
  out.push(
    `<g class="scale" stroke-width="${d.px(1.5)}">`,
    `<path d="M${num(x)} ${num(y - tick)}V${num(y)}H${num(x + length)}V${num(y - tick)}M${num(x + length / 2)} ${num(y)}v${num(-tick * 0.6)}"/>`,
    `<text x="${num(x + length + 8 * px)}" y="${textY}" font-size="${d.px(SIZE.labelFont)}" fill="currentColor" stroke="none">${escapeXml(formatLength(length, unit))}</text>`,
  );
  const field = result.setup.field;
  if (field) {
    const size = `field ${formatLength(field.width, unit)} × ${formatLength(field.height, unit)}`;
    out.push(
      `<text x="${num(view.width - view.margin)}" y="${textY}" font-size="${d.px(SIZE.labelFont)}" text-anchor="end" fill="currentColor" stroke="none">${escapeXml(size)}</text>`,
    );
  }
  out.push('</g>\n');
}

// ---------------------------------------------------------------------------
// Standalone colours

/** Light colours for a drawing opened on its own; sizes in user units, hence `px`. */
/**
 * Which way is heading 0 and which way positive turns go: an arrow up the
 * field marked 0°, and a curved arrow from it marked +, in the top right
 * corner of the content area.
 */
function drawCompass(out: string[], d: Drawing): void {
  const v = d.view;
  const px = v.px;
  const r = 22 * px;
  // Centre in user units, converted back to field units for the helpers: just above the field's top right corner.
  const ux = v.width - v.margin - r - 14 * px;
  const uy = Math.max(v.contentTop - r - 4 * px, r + 16 * px);
  const c = { x: ux - v.x(0), y: v.y(0) - uy };
  const up = { x: 0, y: 1 };
  const tip = { x: c.x, y: c.y + r };
  const from = { x: c.x, y: c.y + r * 0.7 };
  const arcEnd = rotateAbout(from, c, 70, d.turns);
  const dir = d.tangent(arcEnd, c, 70);
  out.push(
    `<g class="compass" stroke-width="${d.px(2)}"><title>Heading 0 faces up the field; positive headings and turns go ${d.turns}</title>`,
    `<path d="M${d.xy(c)}L${d.xy(tip)}${d.chevron(tip, up)}"/>`,
    `<path d="M${d.xy(from)}${d.arc(from, c, 70)}${d.chevron(arcEnd, dir)}"/>`,
    d.text('compass-label', { x: c.x - 6 * px, y: c.y + r + 2 * px }, 'heading 0°', SIZE.smallFont, ' text-anchor="end" dy="0.35em"'),
    d.text('compass-label', { x: arcEnd.x + (d.turns === 'clockwise' ? 8 : -8) * px, y: arcEnd.y - 10 * px }, '+', SIZE.labelFont + 2, ` text-anchor="${d.turns === 'clockwise' ? 'start' : 'end'}" dy="0.35em" font-weight="700"`),
    '</g>\n',
  );
}

function standaloneStyle(px: number): string {
  const halo = num(3 * px);
  const runs = RUN_COLOURS.map((c, i) => `.run-${i}{color:${c}}`).join('');
  return (
    '<style>' +
    '.veer{color:#334155}' +
    '.background{fill:#fff}' +
    '.field{color:#64748b;fill:#f8fafc;fill-opacity:1}' +
    '.grid{color:#cbd5e1;stroke-opacity:1}' +
    '.zone{color:#059669}' +
    '.obstacle{color:#475569}.obstacle .label{fill:#1e293b}' +
    runs +
    `.label,.title,.legend text,.tag-text{paint-order:stroke;stroke:#fff;stroke-width:${halo};stroke-linejoin:round}` +
    '.title{fill:#0f172a}' +
    '.turn-label{fill-opacity:0.85}' +
    '.start circle{stroke:#fff}' +
    '.marker-error{color:#dc2626}.marker-warning{color:#d97706}.marker-info{color:#2563eb}' +
    '.marker-wrap .tag{fill-opacity:1}.marker-wrap .tag-text{fill:#fff;stroke:none}' +
    '.scale{color:#475569}' +
    RECORDED_STYLE +
    '</style>\n'
  );
}
