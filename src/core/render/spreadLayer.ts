// The spread in the drawing (robot model, section 3): the 95 % oval where the
// real robot ends a motion in about 19 runs out of 20, the heading's 95 % band
// as a thin wedge from that point, and the Monte Carlo cloud of sampled end
// points. svg.ts calls these; marks draw their own oval (see drawAnnotations).
//
// Class names (beside those listed in svg.ts):
//   spread        a 95 % oval (at a mark, inside the mark's group)
//   spread-end    a 95 % oval at the end of a motion (with "every motion")
//   heading-band  the heading's 95 % band: a wedge from the oval's centre
//   spread-layer  the layer of a run's motion-end ovals and wedges
//   cloud         the sampled end points of one place of a run (dots)
import type { Point, RunResult, Segment, SegmentSpread, TurnDirection } from '../types';
import { forwardVector } from '../solve/frame';
import { spreadCentre } from '../spread/run';
import type { SpreadCloud, SpreadShown } from './cloud';
import { escapeXml, num } from './markup';
import type { View } from './view';

/** What the spread layers need of the drawing (svg.ts's Drawing has both). */
export interface SpreadCanvas {
  readonly view: View;
  readonly turns: TurnDirection;
}

/** z of the standard normal at 97.5 %: a two-sided 95 % band is ±1.96 standard deviations. */
const Z95 = 1.959963984540054;
/** The wedge's length on screen, CSS pixels. */
const WEDGE_PX = 30;
/** Dot size of the cloud, CSS pixels. */
const DOT_PX = 2.6;
/** Straight pieces of a wedge's arc. */
const WEDGE_PIECES = 12;


/** Whether a segment's spread can be drawn as an oval. */
export function drawableSpread(seg: Segment): SegmentSpread | undefined {
  const s = seg.spread;
  const e = s?.ellipse95;
  const c = spreadCentre(seg);
  return e && Number.isFinite(e.a) && Number.isFinite(e.b) && Number.isFinite(e.tilt) && e.a > 0 && Number.isFinite(c.x) && Number.isFinite(c.y)
    ? s
    : undefined;
}

/** The 95 % oval about `p` (field frame; tilt counterclockwise from +x, hence the minus on screen, where y points down). */
export function spreadOval(c: SpreadCanvas, p: Point, spread: SegmentSpread, cls: string, attrs = ''): string {
  const e = spread.ellipse95;
  const cx = num(c.view.x(p.x));
  const cy = num(c.view.y(p.y));
  const px = c.view.px;
  return `<ellipse class="${cls}"${attrs} cx="${cx}" cy="${cy}" rx="${num(e.a)}" ry="${num(Math.max(e.b, 0.01))}" transform="rotate(${num(-e.tilt)} ${cx} ${cy})"`
    + ` fill="currentColor" fill-opacity="0.08" stroke-width="${num(px)}" stroke-dasharray="${num(3 * px)} ${num(2 * px)}"/>`;
}

/**
 * The heading's 95 % band (±1.96 standard deviations about the predicted,
 * else planned, heading) as a thin wedge from the oval's centre, WEDGE_PX
 * long; a band of a whole turn or more is a disc.
 */
export function headingWedge(c: SpreadCanvas, seg: Segment, spread: SegmentSpread, attrs = ''): string {
  const p = spreadCentre(seg);
  if (!Number.isFinite(p.heading) || !Number.isFinite(spread.headingSd)) return '';
  const r = WEDGE_PX * c.view.px;
  const half = Math.min(180, Z95 * spread.headingSd);
  const at = (q: Point) => `${num(c.view.x(q.x))} ${num(c.view.y(q.y))}`;
  let d = `M${at(p)}`;
  for (let k = 0; k <= WEDGE_PIECES; k++) {
    const f = forwardVector(p.heading - half + (2 * half * k) / WEDGE_PIECES, c.turns);
    d += `L${at({ x: p.x + f.x * r, y: p.y + f.y * r })}`;
  }
  d += 'Z';
  const title = `heading within ±${formatDegrees(Z95 * spread.headingSd)} in 19 runs out of 20`;
  return `<path class="heading-band"${attrs} d="${d}" fill="currentColor" fill-opacity="0.18" stroke-width="${num(0.75 * c.view.px)}"><title>${escapeXml(title)}</title></path>`;
}

function formatDegrees(deg: number): string {
  return deg >= 10 ? `${Math.round(deg)}°` : `${Math.round(deg * 10) / 10}°`;
}

function formatMm(mm: number): string {
  return mm >= 100 ? `${Math.round(mm)} mm` : `${Math.round(mm * 10) / 10} mm`;
}

const MOTIONS = new Set(['drive', 'turn', 'square']);

/**
 * A run's ovals at motion ends (only with "every motion") and the heading
 * wedge at each oval drawn (marks too, unless the spread is off). An end
 * that a mark or the next motion repeats (the same place: a spin in place)
 * is drawn once, by the last of them. `attrsOf` gives a segment's data
 * attributes.
 */
export function drawSpreadLayer(out: string[], c: SpreadCanvas, run: RunResult, runClass: string, shown: SpreadShown,
  attrsOf: (seg: Segment, index: number) => string): void {
  if (shown === 'off') return;
  const parts: string[] = [];
  const segs = run.segments;
  const samePlace = (a: Segment, b: Segment) => Math.abs(a.end.x - b.end.x) < 0.01 && Math.abs(a.end.y - b.end.y) < 0.01;
  /** Whether a later mark, or the next motion, ends where this motion does. */
  const repeated = (i: number): boolean => {
    for (let j = i + 1; j < segs.length; j++) {
      const next = segs[j];
      if (next.kind === 'mark' && next.label !== undefined && drawableSpread(next) && samePlace(next, segs[i])) return true;
      if (MOTIONS.has(next.kind)) return samePlace(next, segs[i]);
    }
    return false;
  };
  segs.forEach((seg, i) => {
    const spread = drawableSpread(seg);
    if (!spread) return;
    const attrs = attrsOf(seg, i);
    if (seg.kind === 'mark' && seg.label !== undefined) {
      parts.push(headingWedge(c, seg, spread, attrs));
      return;
    }
    if (shown !== 'all' || !MOTIONS.has(seg.kind) || repeated(i)) return;
    const e = spread.ellipse95;
    parts.push(
      `<g class="spread-end"${attrs}><title>${escapeXml(`line ${seg.line + 1}: the robot ends this ${seg.kind} inside the oval in 19 runs out of 20 (${formatMm(e.a)} by ${formatMm(e.b)})`)}</title>`,
      spreadOval(c, spreadCentre(seg), spread, 'spread'),
      headingWedge(c, seg, spread),
      '</g>\n',
    );
  });
  if (parts.length) out.push(`<g class="spread-layer ${runClass}">\n`, ...parts, '</g>\n');
}

/** The sampled end points of the drawn runs: small semi-transparent dots, one path per place. */
export function drawCloud(out: string[], c: SpreadCanvas, cloud: SpreadCloud, runs: readonly { run: RunResult; index: number }[],
  runClass: (index: number) => string, attrsOf: (seg: Segment, runIndex: number, index: number) => string): void {
  const byIndex = new Map(runs.map((r) => [r.index, r.run]));
  const px = c.view.px;
  for (const spot of cloud.spots) {
    const run = byIndex.get(spot.run);
    const seg = run?.segments[spot.segment];
    if (!run || !seg || spot.x.length === 0) continue;
    let d = '';
    const n = Math.min(spot.x.length, spot.y.length);
    for (let j = 0; j < n; j++) {
      if (Number.isFinite(spot.x[j]) && Number.isFinite(spot.y[j])) d += `M${num(c.view.x(spot.x[j]))} ${num(c.view.y(spot.y[j]))}h0`;
    }
    if (!d) continue;
    const where = spot.kind === 'end' ? `the end of ${run.name}` : `mark ${seg.label ?? ''}`;
    const share = spot.share !== undefined ? `; ${Math.round(spot.share * 1000) / 10} % of them meet the mark` : '';
    out.push(
      `<g class="cloud ${runClass(spot.run)}"${attrsOf(seg, spot.run, spot.segment)}><title>${escapeXml(`${cloud.count} sampled runs at ${where}${share}`)}</title>`,
      // The inner group keeps the preview's highlight of the cursor's line from resizing the dots.
      `<g><path d="${d}" stroke-width="${num(DOT_PX * px)}" stroke-linecap="round" stroke-opacity="0.35"/></g></g>\n`,
    );
  }
}

/** The sampled share of each mark, by "RUN:SEGMENT". */
export function sampledShares(cloud: SpreadCloud | undefined): Map<string, number> {
  const shares = new Map<string, number>();
  for (const s of cloud?.spots ?? []) if (s.share !== undefined) shares.set(`${s.run}:${s.segment}`, s.share);
  return shares;
}
