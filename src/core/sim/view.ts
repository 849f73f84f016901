// What the editor and the preview show of the controller simulation: a run's
// predicted timeline (motions as blocks, the predicted path sampled in time
// for the scrubber) and the trace of the motion on one line.
import type { CheckResult, RunResult, Segment } from '../types';
import { MAX_TIMELINE_POSES, type TimelineBlock, type TimelineRun, type TraceMessage } from '../../shared/messages';
import { copyState, simulateMotion } from './motion';
import { simRecordOf, traceOf } from './run';
import { PoseBuffer } from './path';
import { fmt } from '../units/evaluate';

/** A trace as the preview receives it, without the document stamp. */
export type TraceView = Omit<TraceMessage, 'type' | 'uri' | 'version'>;

/** The timeline of each run drawn: `run` is an index into `result.runs`, or -1 for every run. */
export function buildTimeline(result: CheckResult, run: number): TimelineRun[] {
  const indices = run >= 0 && run < result.runs.length ? [run] : result.runs.map((_, i) => i);
  return indices.map((i) => timelineOf(result, result.runs[i], i));
}

function timelineOf(result: CheckResult, run: RunResult, runIndex: number): TimelineRun {
  const worst = new Map<number, 'error' | 'warning'>();
  for (const d of result.diagnostics) {
    const line = d.range.start.line;
    if (d.severity === 'error') worst.set(line, 'error');
    else if (d.severity === 'warning' && !worst.has(line)) worst.set(line, 'warning');
  }
  const blocks: TimelineBlock[] = [];
  const poses = new PoseBuffer();
  for (const seg of run.segments) {
    const p = seg.predicted;
    if (!p || seg.kind === 'start') continue;
    const problem = worst.get(seg.line);
    blocks.push({ line: seg.line, kind: seg.kind, start: p.start, duration: Number.isFinite(p.duration) ? p.duration : -1, label: labelOf(seg), ...(problem ? { problem } : {}) });
    // The motion's poses, simulated again from its recorded start.
    const rec = simRecordOf(seg);
    if (rec) {
      poses.pose(p.start, rec.state.x, rec.state.y, rec.state.h);
      simulateMotion(copyState(rec.state), rec.robot, rec.motion, undefined, poses);
    }
    poses.pose(p.start + (Number.isFinite(p.duration) ? p.duration : 0), p.end.x, p.end.y, p.end.heading);
  }
  const stride = Math.max(1, Math.ceil(poses.length / MAX_TIMELINE_POSES));
  const pick = <T>(a: T[]) => a.filter((_, i) => i % stride === 0 || i === a.length - 1);
  const total = run.predictedDuration;
  return {
    runIndex, name: run.name,
    total: total === undefined ? run.duration : Number.isFinite(total) ? total : -1,
    ...(result.setup.limit !== undefined ? { limit: result.setup.limit } : {}),
    blocks,
    poses: { t: pick(poses.t), x: pick(poses.x), y: pick(poses.y), heading: pick(poses.h) },
  };
}

function labelOf(seg: Segment): string {
  switch (seg.kind) {
    case 'drive': return `drive ${fmt(seg.distance, 0)} mm${seg.sensing === 'gyro' ? ' (hold)' : ''}`;
    case 'turn': return `turn ${fmt(seg.turned, 1)}°${seg.sensing === 'gyro' ? ' by gyro' : ''}`;
    case 'square': return 'square';
    case 'wait': return `wait ${fmt(seg.duration, 2)} s`;
    case 'mark': return `mark "${seg.label ?? ''}"`;
    case 'reset': return 'reset yaw';
    default: return seg.kind;
  }
}

/** The trace of the motion on `line` (0-based), or a note saying why there is none. */
export function traceForLine(result: CheckResult, line: number): TraceView {
  const seg = result.runs.flatMap((r) => r.segments).find((s) => s.line === line && s.kind !== 'start');
  if (!seg) return { line, title: `Line ${line + 1}`, note: 'Put the cursor on a motion (drive, turn, square or wait) to see what the robot is predicted to do.' };
  const rows = traceOf(seg);
  if (!rows || !seg.predicted) {
    return { line, title: `Line ${line + 1}: ${labelOf(seg)}`, note: 'Not simulated: a value it needs is missing, or an earlier motion never ends.' };
  }
  const p = seg.predicted;
  const facts = [Number.isFinite(p.duration) ? `predicted ${fmt(p.duration, 2)} s` : p.capped ? 'never ends' : 'stalls'];
  if (p.overshoot !== undefined) facts.push(`${p.overshoot >= 0 ? 'overshoot' : 'short by'} ${fmt(Math.abs(p.overshoot), 1)}°`);
  if (p.peakRate >= 0.5) facts.push(`peak ${fmt(p.peakRate, 0)}°/s`);
  const rec = simRecordOf(seg);
  return {
    line,
    title: `Line ${line + 1}: ${labelOf(seg)}, ${facts.join(', ')}`,
    columns: {
      t: rows.t,
      reading: rows.reading,
      target: rows.target,
      error: rows.error,
      powerLeft: rows.powerLeft.map((u) => u * 100),
      powerRight: rows.powerRight.map((u) => u * 100),
      speedLeft: rows.speedLeft,
      speedRight: rows.speedRight,
    },
    ...(rec?.motion.kind === 'gyro-turn' ? { stop: rec.motion.stop } : {}),
  };
}
