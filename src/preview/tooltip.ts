// The hover text of a segment. Plain strings only: the caller puts them into
// the page with textContent, never as markup.
import type { SegmentSummary } from '../shared/messages';

import { DIGITS, formatNumber as fixed } from '../core/format';

function kindLabel(seg: SegmentSummary): string {
  return seg.shape ? `${seg.kind} (${seg.shape})` : seg.kind;
}

/** Lines of the tooltip; plan lines are shown 1-based, as the editor numbers them. */
export function tooltipLines(seg: SegmentSummary): string[] {
  const lines = [
    `line ${seg.line + 1}: ${kindLabel(seg)}${seg.complete ? '' : ' (incomplete)'}`,
    `end (${fixed(seg.endX, DIGITS.length)}, ${fixed(seg.endY, DIGITS.length)}) mm, heading ${fixed(seg.endHeading, DIGITS.angle)}°`,
    `yaw reading ${fixed(seg.yawEnd, DIGITS.angle)}°`,
  ];
  if (seg.motorDeg) lines.push(`motors L ${fixed(seg.motorDeg.left, DIGITS.angle)}°, R ${fixed(seg.motorDeg.right, DIGITS.angle)}°`);
  lines.push(Number.isFinite(seg.duration) ? `time ${fixed(seg.duration, DIGITS.time)} s` : 'time unknown');
  return lines;
}
