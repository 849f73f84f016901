// Replays the yaw readings of a solved run with other zero points, keeping
// every motion's change of heading: the readings a fixed plan will have, and
// so the `turn to` and `hold` targets that make it drive the same path.
import type { CheckResult, DriveStmt, MotionStmt, RunResult, TextEdit, TurnStmt } from '../types';
import { YawReadings } from '../solve/readings';
import { writeNumber } from './text';

/** A motion whose target is a yaw reading (gyro turns and holds, and `turn to` by encoders). */
export interface ReadingItem {
  /** Index of the segment in its run. */
  index: number;
  stmt: TurnStmt | DriveStmt;
  /** `turn to H` or `hold H`: the target is written in the file. */
  absolute: boolean;
  /** The change of heading the motion means (kept by every fix). */
  change: number;
  /** The target as written (absolute) or as computed (relative), in the plan as it is. */
  target: number;
  /** Whether the robot's code reads the sensor. */
  gyro: boolean;
}

export interface ReplayChanges {
  /** A zero just before segment i, taken at this field heading. */
  zeroBefore?: ReadonlyMap<number, number>;
  /** Segments that no longer read the sensor (turned into encoder motions). */
  encoders?: ReadonlySet<number>;
}

export interface ReplayedItem extends ReadingItem {
  /** The target the motion needs after the changes to drive the same path. */
  newTarget: number;
  crossing: boolean;
  /** False when no written target can ask for this change after the changes (a change of more than half a turn where targets are read as the change nearest zero). */
  representable: boolean;
}

/**
 * Whether a replay keeps every motion and adds no problem: every change can
 * still be written, and nothing crosses the wrap point that is not already
 * reported as a crossing of its own (`reportedLines`).
 */
export function replayKeepsPath(items: readonly ReplayedItem[], run: RunResult, reportedLines: ReadonlySet<number>, except?: number): boolean {
  return items.every((it) => it.index === except || (it.representable && (!it.crossing || reportedLines.has(run.segments[it.index].line))));
}

const MOTION_KINDS: ReadonlySet<string> = new Set(['start', 'drive', 'turn', 'resetYaw', 'square', 'wait', 'mark']);

/** The motion statement on each line, as a lookup for the fix engine. */
export function motionStatements(result: CheckResult): (line: number) => MotionStmt | undefined {
  const byLine = new Map<number, MotionStmt>();
  for (const s of result.ast.statements) if (MOTION_KINDS.has(s.kind)) byLine.set(s.line, s as MotionStmt);
  return (line) => byLine.get(line);
}

/** The motions of a run that aim at a yaw reading, with their statements. */
export function readingItems(run: RunResult, stmtAt: (line: number) => MotionStmt | undefined): ReadingItem[] {
  const items: ReadingItem[] = [];
  run.segments.forEach((seg, index) => {
    if (seg.yawTarget === undefined || !seg.complete) return;
    const stmt = stmtAt(seg.line);
    if (!stmt || (stmt.kind !== 'turn' && stmt.kind !== 'drive')) return;
    const absolute = stmt.kind === 'drive' || stmt.to !== undefined;
    items.push({ index, stmt, absolute, change: seg.asked ?? seg.turned, target: seg.yawTarget, gyro: seg.sensing === 'gyro' });
  });
  return items;
}

/**
 * Readings over segments [from, to) of a run: `from` must be a zero point (the
 * start, a reset, or a turn with `reset`) so the tracker starts from a known
 * state. Returns each item in the range with its new target.
 */
export function replay(
  run: RunResult, items: readonly ReadingItem[], stmtAt: (line: number) => MotionStmt | undefined,
  lo: number, hi: number, changes: ReplayChanges, from = 0, to = run.segments.length,
): ReplayedItem[] {
  const yaw = new YawReadings(lo, hi);
  const byIndex = new Map(items.map((it) => [it.index, it]));
  const out: ReplayedItem[] = [];
  for (let i = from; i < to; i++) {
    const seg = run.segments[i];
    const h = seg.start.heading;
    if (seg.kind === 'start' || seg.kind === 'reset') yaw.zero(h);
    const stmt = stmtAt(seg.line);
    if (stmt?.kind === 'turn' && stmt.reset) yaw.zero(h);
    const ref = changes.zeroBefore?.get(i);
    if (ref !== undefined) yaw.zero(ref);
    const it = byIndex.get(i);
    if (it) {
      let newTarget = yaw.reading(h) + it.change;
      let representable = true;
      // Where the plan's targets are read as the change nearest zero, any
      // whole turn more or less means the same: keep the one written.
      if (it.absolute && yaw.nearestChange(h)) {
        newTarget -= 360 * Math.round((newTarget - it.target) / 360);
        representable = Math.abs(yaw.absoluteChange(newTarget, h) - it.change) < 1e-9;
      }
      const gyro = it.gyro && !changes.encoders?.has(i);
      const crossing = gyro ? yaw.gyroMotion(newTarget, h) : false;
      out.push({ ...it, newTarget, crossing, representable });
    }
    yaw.settle(seg.end.heading);
  }
  return out;
}

/**
 * The edits that write each absolute target (`turn to H`, `hold H`) the value
 * its replay needs, for the items from segment `from` on except `skip`.
 */
export function retargetEdits(items: readonly ReplayedItem[], from = 0, skip?: number): TextEdit[] {
  const edits: TextEdit[] = [];
  for (const it of items) {
    if (!it.absolute || it.index < from || it.index === skip || Math.abs(it.newTarget - it.target) < 1e-9) continue;
    const node = it.stmt.kind === 'drive' ? it.stmt.hold : it.stmt.to;
    if (node) edits.push({ range: node.range, newText: writeNumber(it.newTarget) });
  }
  return edits;
}

/** The stretch of zero points around segment i: [last zero at or before i, next zero after i). */
export function stretchAround(run: RunResult, i: number, stmtAt: (line: number) => MotionStmt | undefined): [number, number] {
  const isZero = (k: number) => {
    const seg = run.segments[k];
    if (seg.kind === 'start' || seg.kind === 'reset') return true;
    const stmt = stmtAt(seg.line);
    return stmt?.kind === 'turn' && stmt.reset;
  };
  let from = i;
  while (from > 0 && !isZero(from)) from--;
  let to = i + 1;
  while (to < run.segments.length && !isZero(to)) to++;
  return [from, to];
}
