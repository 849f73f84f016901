// Short facts shown at the end of each motion line while typing: where the
// robot ends up facing, what the yaw sensor then reads, and the motor degrees
// the robot's code must command.
import type { CheckResult, Pos, Segment, Statement } from '../types';
import { formatAngle, formatHeading } from './format';

export interface InlayHintInfo {
  position: Pos;
  label: string;
  tooltip?: string;
}

const HINTED_KINDS = new Set<Statement['kind']>(['start', 'drive', 'turn', 'resetYaw', 'square']);

export function inlayHints(result: CheckResult, lines?: { from: number; to: number }): InlayHintInfo[] {
  const segmentsByLine = new Map<number, Segment[]>();
  for (const segment of result.runs.flatMap((run) => run.segments)) {
    const list = segmentsByLine.get(segment.line) ?? [];
    list.push(segment);
    segmentsByLine.set(segment.line, list);
  }
  const hints: InlayHintInfo[] = [];
  for (const statement of result.ast.statements) {
    if (!HINTED_KINDS.has(statement.kind)) continue;
    if (lines && (statement.line < lines.from || statement.line > lines.to)) continue;
    const segments = segmentsByLine.get(statement.line);
    if (!segments) continue;
    const last = segments[segments.length - 1];
    // Short enough for the editor's default hint width (43 characters): the facing, the
    // reading, and the motor degrees in whole degrees; the tooltip says what each is.
    const parts = [formatHeading(last.end.heading), `yaw ${formatAngle(last.yawEnd)}`];
    const moving = segments.filter((s) => s.motorDeg);
    if (moving.length) {
      const left = moving.reduce((t, s) => t + s.motorDeg!.left, 0);
      const right = moving.reduce((t, s) => t + s.motorDeg!.right, 0);
      parts.push(`L ${Math.round(left)}° R ${Math.round(right)}°`);
    }
    hints.push({
      position: statement.range.end,
      label: `→ ${parts.join(' · ')}`,
      tooltip: `Facing ${formatHeading(last.end.heading)} on the field after this line; the yaw sensor then reads ${formatAngle(last.yawEnd)}` +
        (moving.length ? '; the motor degrees to command, left and right (hover the line for the exact values)' : ''),
    });
  }
  return hints;
}
