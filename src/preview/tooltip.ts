// The hover text of a segment. Plain strings only: the caller puts them into
// the page with textContent, never as markup.
import type { SegmentSummary } from '../shared/messages';

function fixed(value: number, digits: number): string {
  // Avoid showing "-0.0" for values that round to zero.
  const s = value.toFixed(digits);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

function kindLabel(seg: SegmentSummary): string {
  return seg.shape ? `${seg.kind} (${seg.shape})` : seg.kind;
}

/** Lines of the tooltip; plan lines are shown 1-based, as the editor numbers them. */
export function tooltipLines(seg: SegmentSummary): string[] {
  const lines = [
    `line ${seg.line + 1}: ${kindLabel(seg)}${seg.complete ? '' : ' (incomplete)'}`,
    `end (${fixed(seg.endX, 1)}, ${fixed(seg.endY, 1)}) mm, heading ${fixed(seg.endHeading, 1)}°`,
    `yaw reading ${fixed(seg.yawEnd, 1)}°`,
  ];
  if (seg.motorDeg) lines.push(`motors L ${fixed(seg.motorDeg.left, 1)}°, R ${fixed(seg.motorDeg.right, 1)}°`);
  lines.push(Number.isFinite(seg.duration) ? `time ${fixed(seg.duration, 2)} s` : 'time unknown');
  return lines;
}
