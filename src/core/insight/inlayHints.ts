// Short facts shown at the end of each motion line while typing: where the
// robot ends up facing, what the yaw sensor then reads, and for encoder turns
// the motor degrees the robot's code must command.
import type { CheckResult, Pos, Segment, Statement } from '../types';
import { formatAngle, formatHeading, formatWheels } from './format';

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
    const parts = [`heading ${formatHeading(last.end.heading)}`, `yaw ${formatAngle(last.yawEnd)}`];
    const encoderTurn = segments.find((s) => s.kind === 'turn' && s.sensing === 'encoders' && s.motorDeg);
    if (encoderTurn?.motorDeg) parts.push(`motor ${formatWheels(encoderTurn.motorDeg)}`);
    hints.push({
      position: statement.range.end,
      label: `→ ${parts.join(' · ')}`,
      tooltip: 'End heading on the field, the yaw sensor reading after this line' +
        (encoderTurn ? ', and the motor degrees to command for this encoder turn' : ''),
    });
  }
  return hints;
}
