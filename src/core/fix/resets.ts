// The whole-file fix: the fewest `reset yaw` lines that remove the wrap
// crossings, with later `turn to` and `hold` targets rewritten so the robot
// drives the path the plan means.
import type { CheckResult, Fix, Segment, TextEdit } from '../types';
import { wrapReading } from '../solve/frame';
import { motionStatements, readingItems, replay, replayKeepsPath, retargetEdits } from './replay';
import { insertLinesBefore, lineEndOf } from './text';
import { propagateRun } from '../spread/run';

/** Runs up to this long have their equally short placements compared by spread (the comparison is quadratic). */
const TIE_BREAK_MAX_SEGMENTS = 400;
/** At most this many placements are compared. */
const TIE_BREAK_MAX = 64;

/** The title the editor's source action and the docs use. */
export const FEWEST_RESETS_TITLE = 'Insert the fewest yaw resets that remove the wrap crossings';

/**
 * Per run, a shortest path over reset positions: a reset may go before any
 * motion; existing resets (and turns with `reset`) stay; a stretch from one
 * zero to the next is allowed when every gyro target in it, kept at its
 * change of heading, lies inside the sensor's range. Targets that no reset
 * can bring into range (a turn bigger than the range by itself) are left to
 * their own diagnostics and fixes.
 */
export function fewestResets(result: CheckResult, text?: string): Fix | undefined {
  if (!result.diagnostics.some((d) => d.code === 'wrap-cross')) return undefined;
  const { lo, hi } = result.setup.yawRange;
  const inRange = (t: number) => t >= lo && t < hi;
  const zeroReading = wrapReading(0, lo);
  const stmtAt = motionStatements(result);
  const eol = text === undefined ? '\n' : lineEndOf(text);
  const edits: TextEdit[] = [];
  let inserted = 0;
  const reported = new Set(result.diagnostics.filter((d) => d.code === 'wrap-cross').map((d) => d.range.start.line));

  for (const run of result.runs) {
    const segs = run.segments;
    const startIndex = segs.findIndex((s) => s.kind === 'start');
    if (startIndex < 0) continue;
    const items = readingItems(run, stmtAt);
    // Positions: p = just before segment p (0 = the run's start).
    const mandatory = new Set<number>([0]);
    segs.forEach((seg, i) => {
      const stmt = stmtAt(seg.line);
      if (seg.kind === 'reset' || (stmt?.kind === 'turn' && stmt.reset)) mandatory.add(i);
    });
    const refHeading = (p: number): number => (p === 0 ? segs[startIndex].start.heading : segs[p].start.heading);
    const nextMandatory: number[] = new Array(segs.length + 1).fill(segs.length);
    for (let i = segs.length - 1; i >= 0; i--) nextMandatory[i] = mandatory.has(i + 1) ? i + 1 : nextMandatory[i + 1];
    const search = (considered: typeof items): number[] | undefined => {
      const sorted = [...considered].sort((x, y) => x.index - y.index);
      // The furthest q such that the stretch [p, q) keeps every considered target in range
      // (an existing zero ends a stretch): scanning the targets after p, not every segment.
      const reachOf = (p: number): number => {
        const limit = nextMandatory[p];
        let first = 0;
        let last = sorted.length;
        while (first < last) {
          const mid = (first + last) >> 1;
          if (sorted[mid].index < p) first = mid + 1; else last = mid;
        }
        for (let k = first; k < sorted.length && sorted[k].index < limit; k++) {
          const it = sorted[k];
          if (!inRange(wrapReading(segs[it.index].start.heading - refHeading(p), lo) + it.change)) return it.index;
        }
        return limit;
      };
      // Shortest path over positions with unit costs: a sweep over q with a
      // heap of the open zero points p (cost, then position), each open while q <= reach(p).
      const n = segs.length;
      const cost = new Array<number>(n + 1).fill(Infinity);
      const prev = new Array<number>(n + 1).fill(-1);
      const heap = new MinHeap();
      cost[0] = 0;
      heap.push(0, 0, reachOf(0));
      for (let q = 1; q <= n; q++) {
        while (heap.size > 0 && heap.top().reach < q) heap.pop();
        if (heap.size === 0) return undefined;
        const best = heap.top();
        const step = q === n || mandatory.has(q) ? 0 : 1;
        if (q < n && segs[q].kind === 'start') continue;
        cost[q] = best.cost + step;
        prev[q] = best.p;
        if (mandatory.has(q)) {
          // An existing zero cannot be skipped: every stretch ends here.
          heap.clear();
        }
        if (q < n) heap.push(cost[q], q, reachOf(q));
      }
      if (cost[n] === Infinity) return undefined;
      const chosen: number[] = [];
      for (let q = prev[n]; q > 0; q = prev[q]) if (!mandatory.has(q)) chosen.push(q);
      chosen.reverse();
      // Among equally few resets, the placement that leaves the smaller spread at the run's end.
      return chosen.length > 0 && n <= TIE_BREAK_MAX_SEGMENTS ? leastSpread(chosen, reachOf) : chosen;
    };
    /**
     * Every placement with as few resets as `chosen` (at most TIE_BREAK_MAX
     * of them), judged by the 95 % oval at the run's end (the linear model of
     * spread/run.ts with the resets in place): the smallest wins, the first
     * found (the earliest resets) among equals.
     */
    const leastSpread = (chosen: number[], reachOf: (p: number) => number): number[] => {
      const track = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
      if (track === undefined || !(track > 0)) return chosen;
      const n = segs.length;
      const reach = new Array<number>(n);
      for (let p = 0; p < n; p++) reach[p] = p === 0 || segs[p].kind !== 'start' ? reachOf(p) : p;
      // The fewest new resets from a zero at p to the run's end (Infinity: none will do).
      const rest = new Array<number>(n + 1).fill(Infinity);
      rest[n] = 0;
      for (let p = n - 1; p >= 0; p--) {
        if (p > 0 && segs[p].kind === 'start') continue;
        for (let q = p + 1; q <= Math.min(reach[p], n); q++) {
          const c = q === n ? 0 : (mandatory.has(q) ? 0 : 1) + rest[q];
          if (c < rest[p]) rest[p] = c;
          if (mandatory.has(q)) break; // an existing zero ends every stretch
        }
      }
      if (rest[0] !== chosen.length) return chosen;
      const placements: number[][] = [];
      const walk = (p: number, left: number, picked: number[]): void => {
        if (placements.length >= TIE_BREAK_MAX) return;
        for (let q = p + 1; q <= Math.min(reach[p], n); q++) {
          if (q === n) {
            if (left === 0) placements.push(picked);
            return;
          }
          const step = mandatory.has(q) ? 0 : 1;
          if (step + rest[q] === left) walk(q, left - step, step ? [...picked, q] : picked);
          if (mandatory.has(q)) return;
        }
      };
      walk(0, chosen.length, []);
      if (placements.length < 2) return chosen;
      const last = segs[n - 1];
      const spreadWith = (placement: number[]): number => {
        const zeroBefore = new Set(placement.map((p) => segs[p]));
        const sp = propagateRun(segs, result.setup.noise, track, result.setup.turns, { zeroBefore }).bySegment.get(last);
        return sp ? sp.ellipse95.a : Infinity;
      };
      let best = chosen;
      let bestSpread = spreadWith(chosen);
      for (const placement of placements) {
        const s = spreadWith(placement);
        if (s < bestSpread - 1e-9) {
          best = placement;
          bestSpread = s;
        }
      }
      return best;
    };
    // Every gyro target in range; failing that, leave out the turns that no
    // reset of their own can help (their fix is an encoder turn) and accept
    // the result only if nothing crosses that is not already reported.
    const gyroItems = items.filter((it) => it.gyro);
    let chosen = search(gyroItems);
    if (!chosen) chosen = search(gyroItems.filter((it) => inRange(zeroReading + it.change)));
    if (!chosen || chosen.length === 0) continue;
    const zeroBefore = new Map(chosen.map((p) => [p, segs[p].start.heading]));
    const replayed = replay(run, items, stmtAt, lo, hi, { zeroBefore });
    // Around a crossing no reset can remove, the rewritten targets may not
    // keep every motion: leave such a run to its own diagnostics' fixes.
    if (!replayKeepsPath(replayed, run, reported)) continue;
    inserted += chosen.length;

    for (const pos of chosen) {
      const stmt = stmtAt(segs[pos].line)!;
      const indent = ' '.repeat(stmt.range.start.character);
      edits.push(insertLinesBefore(stmt.line, [`${indent}reset yaw`], eol));
    }
    edits.push(...retargetEdits(replayed));
  }
  if (inserted === 0) return undefined;
  return { title: `${FEWEST_RESETS_TITLE} (${inserted} reset${inserted === 1 ? '' : 's'}; the path stays the same)`, edits };
}

/** Segments of a run at a 0-based line, for editor features. */
export function segmentAtLine(result: CheckResult, line: number): { run: number; segment: number; value: Segment } | undefined {
  for (let r = 0; r < result.runs.length; r++) {
    const segs = result.runs[r].segments;
    for (let s = 0; s < segs.length; s++) if (segs[s].line === line) return { run: r, segment: s, value: segs[s] };
  }
  return undefined;
}

/** A binary heap of open zero points, least cost first, then the earliest position (the first of equals, as a scan would pick). */
class MinHeap {
  private items: { cost: number; p: number; reach: number }[] = [];
  get size(): number { return this.items.length; }
  top(): { cost: number; p: number; reach: number } { return this.items[0]; }
  clear(): void { this.items = []; }
  push(cost: number, p: number, reach: number): void {
    const a = this.items;
    a.push({ cost, p, reach });
    let i = a.length - 1;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (!this.less(a[i], a[parent])) break;
      [a[i], a[parent]] = [a[parent], a[i]];
      i = parent;
    }
  }
  pop(): void {
    const a = this.items;
    const last = a.pop()!;
    if (a.length === 0) return;
    a[0] = last;
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let m = i;
      if (l < a.length && this.less(a[l], a[m])) m = l;
      if (r < a.length && this.less(a[r], a[m])) m = r;
      if (m === i) break;
      [a[i], a[m]] = [a[m], a[i]];
      i = m;
    }
  }
  private less(x: { cost: number; p: number }, y: { cost: number; p: number }): boolean {
    return x.cost < y.cost || (x.cost === y.cost && x.p < y.p);
  }
}
