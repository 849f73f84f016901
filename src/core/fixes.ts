// Whole-file fixes computed from a solved plan.
import type { CheckResult, DriveStmt, Fix, MotionStmt, Segment, TextEdit, TurnStmt } from './types';
import { wrapReading } from './solve/frame';
import { fmt } from './units/evaluate';

interface GyroItem {
  index: number;
  stmt: TurnStmt | DriveStmt;
  /** The raw change of reading the code asks for (target − reading). */
  delta: number;
  /** The reading before the item, as planned now. */
  reading: number;
}

/**
 * The fewest `reset yaw` lines that remove every wrap crossing of the file,
 * keeping the robot's path the same: where a reset changes the reference of a
 * later `turn to H` or `hold H`, H is rewritten so the robot does what it did.
 *
 * Per run, a shortest path over reset positions: a reset may go before any
 * motion; existing resets (and turns with `reset`) are fixed; a stretch from
 * one reset to the next is allowed when every gyro target in it lies inside
 * the sensor's range. Targets that no reset can bring into range (a turn of
 * more than the range by itself) are left for their own diagnostics.
 */
export function fewestResets(result: CheckResult): Fix | undefined {
  if (!result.diagnostics.some((d) => d.code === 'wrap-cross')) return undefined;
  const { lo, hi } = result.setup.yawRange;
  const inRange = (t: number) => t >= lo && t < hi;
  const byLine = new Map<number, MotionStmt>();
  for (const s of result.ast.statements) {
    if (s.kind !== 'run' && 'line' in s) byLine.set(s.line, s as MotionStmt);
  }
  const edits: TextEdit[] = [];
  let inserted = 0;

  for (const run of result.runs) {
    const segs = run.segments;
    const items: GyroItem[] = [];
    // Positions: 0 = the run's start; i = just before segment i.
    const mandatory = new Set<number>([0]);
    segs.forEach((seg, i) => {
      const stmt = byLine.get(seg.line);
      if (!stmt) return;
      if (seg.kind === 'reset' || (stmt.kind === 'turn' && stmt.reset)) mandatory.add(i);
      if (stmt.kind === 'turn' && seg.sensing === 'gyro' && seg.yawTarget !== undefined) {
        items.push({ index: i, stmt, delta: seg.yawTarget - seg.yawStart, reading: seg.yawStart });
      } else if (stmt.kind === 'drive' && seg.yawTarget !== undefined) {
        items.push({ index: i, stmt, delta: seg.yawTarget - seg.yawStart, reading: seg.yawStart });
      }
    });
    const startIndex = segs.findIndex((s) => s.kind === 'start');
    if (startIndex < 0) continue;
    const fixable = items.filter((it) => inRange(it.delta));
    const refHeading = (pos: number) => (pos === 0 ? segs[startIndex].start.heading : segs[pos].start.heading);
    const readingAt = (it: GyroItem, ref: number) => wrapReading(segs[it.index].start.heading - refHeading(ref), lo);
    const okStretch = (from: number, to: number) => fixable.every((it) => it.index < from || it.index >= to || inRange(readingAt(it, from) + it.delta));

    // Shortest path: cost[p] = resets inserted so far with the reference set at p.
    const n = segs.length;
    const cost = new Array<number>(n + 1).fill(Infinity);
    const prev = new Array<number>(n + 1).fill(-1);
    cost[0] = 0;
    for (let p = 0; p < n; p++) {
      if (cost[p] === Infinity) continue;
      for (let q = p + 1; q <= n; q++) {
        if (!okStretch(p, q)) break;
        const step = q === n || mandatory.has(q) ? 0 : 1;
        if (q < n && segs[q].kind === 'start') continue;
        if (cost[p] + step < cost[q]) {
          cost[q] = cost[p] + step;
          prev[q] = p;
        }
        if (mandatory.has(q)) break; // a fixed reset cannot be skipped
      }
    }
    if (cost[n] === Infinity) continue;
    const chosen: number[] = [];
    for (let q = prev[n]; q > 0; q = prev[q]) if (!mandatory.has(q)) chosen.push(q);
    chosen.reverse();
    if (chosen.length === 0) continue;
    inserted += chosen.length;

    // The reference in force for each segment after the change.
    const refs = [...new Set([...mandatory, ...chosen])].sort((a, b) => a - b);
    const refFor = (i: number) => refs.filter((r) => r <= i).pop() ?? 0;
    for (const pos of chosen) {
      const stmt = byLine.get(segs[pos].line)!;
      const indent = ' '.repeat(stmt.range.start.character);
      edits.push({ range: { start: { line: stmt.line, character: 0 }, end: { line: stmt.line, character: 0 } }, newText: `${indent}reset yaw\n` });
    }
    for (const it of items) {
      const newReading = readingAt(it, refFor(it.index));
      if (Math.abs(newReading - it.reading) < 1e-9) continue;
      const node = it.stmt.kind === 'turn' ? it.stmt.to : it.stmt.hold;
      if (!node) continue; // `turn A by gyro` is relative and needs no rewrite
      edits.push({ range: node.range, newText: fmt(newReading + it.delta, 3) });
    }
  }
  if (inserted === 0) return undefined;
  return { title: `Insert the fewest \`reset yaw\` lines (${inserted}) that remove every wrap crossing`, edits };
}

/** Segments of a run at a 0-based line, for editor features. */
export function segmentAtLine(result: CheckResult, line: number): { run: number; segment: number; value: Segment } | undefined {
  for (let r = 0; r < result.runs.length; r++) {
    const segs = result.runs[r].segments;
    for (let s = 0; s < segs.length; s++) if (segs[s].line === line) return { run: r, segment: s, value: segs[s] };
  }
  return undefined;
}
