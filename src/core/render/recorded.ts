// The drawing's layer of a recorded run (docs/recorded-runs.md): the path
// reconstructed from the log's wheels and yaw (solid) and from the wheels
// alone (dashed), over the planned and predicted paths.
//
// Class names: recorded (the layer), recorded-fused, recorded-wheels (the two
// paths), recorded-end (where the log ends), recorded-label (its name).
import type { RecordedOverlay } from '../record/compare';
import type { Point } from '../types';
import { escapeXml, num } from './markup';
import type { Bounds, View } from './view';

/** The standalone drawing's colours of the layer. */
export const RECORDED_STYLE = '.recorded,.recorded-key{color:#c026d3}.recorded-label{fill:#86198f}';

/** Adds the recorded paths' points to the drawing's bounds. */
export function boundRecorded(b: Bounds, overlay: RecordedOverlay | undefined): Bounds {
  if (!overlay) return b;
  for (const p of overlay.wheels) b.add(p.x, p.y);
  for (const p of overlay.fused ?? []) b.add(p.x, p.y);
  return b;
}

function pathOf(view: View, pts: Point[]): string {
  let d = '';
  for (let i = 0; i < pts.length; i++) {
    const x = view.x(pts[i].x);
    const y = view.y(pts[i].y);
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    d += `${d ? 'L' : 'M'}${num(x)} ${num(y)}`;
  }
  return d;
}

/** Draws the layer (nothing when the overlay's run is not among the runs drawn). */
export function drawRecorded(out: string[], view: View, overlay: RecordedOverlay, runLine: number, fontPx: number): void {
  const px = view.px;
  const best = overlay.fused ?? overlay.wheels;
  out.push(`<g class="recorded" data-line="${runLine}"><title>${escapeXml(`Recorded run of "${overlay.name}": ${overlay.fused ? 'solid from the wheels and the yaw, dashed from the wheels alone' : 'from the wheels alone'}`)}</title>\n`);
  if (overlay.fused) {
    out.push(`<path class="recorded-wheels" d="${pathOf(view, overlay.wheels)}" stroke-width="${num(1.2 * px)}" stroke-dasharray="${num(5 * px)} ${num(3 * px)}" stroke-opacity="0.7"/>\n`);
  }
  out.push(`<path class="${overlay.fused ? 'recorded-fused' : 'recorded-wheels'}" d="${pathOf(view, best)}" stroke-width="${num(1.8 * px)}"/>\n`);
  const end = best[best.length - 1];
  if (end && Number.isFinite(end.x) && Number.isFinite(end.y)) {
    const x = view.x(end.x);
    const y = view.y(end.y);
    out.push(
      `<circle class="recorded-end" cx="${num(x)}" cy="${num(y)}" r="${num(3.5 * px)}" fill="currentColor"/>`,
      `<text class="label recorded-label" x="${num(x - 6 * px)}" y="${num(y + 28 * px)}" font-size="${num(fontPx * px)}" text-anchor="end" fill="currentColor" stroke="none">recorded</text>\n`,
    );
  }
  out.push('</g>\n');
}
