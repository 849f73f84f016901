// The yaw reset that shrinks a run's final spread most (robot model, section 3,
// "reset strategy"): a `reset yaw` copies the heading's error into the
// sensor's reference, so one placed where the heading is known best (just after
// a `square`, say) makes every later gyro motion end closer to the plan. The
// insertion keeps the path: later `turn to` and `hold` targets are rewritten to
// the readings the new zero gives.
import type { CheckResult, Fix, Segment, TextEdit } from '../types';
import { propagateRun } from '../spread/run';
import { motionStatements, readingItems, replay, replayKeepsPath, retargetEdits } from './replay';
import { insertLinesBefore, lineEndOf } from './text';
import { fmt } from '../units/evaluate';

/** An improvement smaller than this (mm of the 95 % oval's long half-axis, and share of it) is not offered. */
const LEAST_GAIN_MM = 1;
const LEAST_GAIN_SHARE = 0.03;
/** Runs longer than this are not searched (each candidate is one propagation of the run). */
const MAX_SEGMENTS = 400;

export interface BestReset {
  fix: Fix;
  /** 0-based line the reset goes before, and the run's final 95 % half-axis now and with it (mm). */
  line: number;
  before: number;
  after: number;
}

/**
 * For the run `runIndex`, the one `reset yaw` whose insertion shrinks the 95 %
 * oval at the run's end most, with the edits that keep the path; undefined
 * when no placement helps by at least 1 mm and 3 %.
 */
export function bestReset(result: CheckResult, runIndex: number, text?: string): BestReset | undefined {
  const run = result.runs[runIndex];
  const track = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
  if (!run || track === undefined || !(track > 0) || run.segments.length > MAX_SEGMENTS) return undefined;
  const segs = run.segments;
  const last = segs[segs.length - 1];
  const { noise, turns, yawRange } = result.setup;
  const finalSpread = (zeroBefore?: ReadonlySet<Segment>) => propagateRun(segs, noise, track, turns, { zeroBefore }).bySegment.get(last)?.ellipse95.a;
  const now = finalSpread();
  // A reset changes only the gyro motions after it.
  let lastGyro = -1;
  segs.forEach((s, i) => { if (s.sensing === 'gyro') lastGyro = i; });
  if (now === undefined || lastGyro < 0) return undefined;
  const stmtAt = motionStatements(result);
  const items = readingItems(run, stmtAt);
  const reported = new Set(result.diagnostics.filter((d) => d.code === 'wrap-cross').map((d) => d.range.start.line));
  let best: { index: number; spread: number } | undefined;
  const startIndex = segs.findIndex((s) => s.kind === 'start');
  for (let i = startIndex + 1; i <= lastGyro; i++) {
    const seg = segs[i];
    // Before a motion that is not already a zero.
    if (seg.kind === 'start' || seg.kind === 'reset' || seg.zeroesYaw || seg.kind === 'mark') continue;
    const spread = finalSpread(new Set([seg]));
    if (spread === undefined || (best && spread >= best.spread - 1e-9)) continue;
    best = { index: i, spread };
  }
  if (!best || now - best.spread < Math.max(LEAST_GAIN_MM, LEAST_GAIN_SHARE * now)) return undefined;
  const at = segs[best.index];
  const replayed = replay(run, items, stmtAt, yawRange.lo, yawRange.hi, { zeroBefore: new Map([[best.index, at.start.heading]]) });
  if (!replayKeepsPath(replayed, run, reported)) return undefined;
  const stmt = stmtAt(at.line);
  if (!stmt) return undefined;
  const eol = text === undefined ? '\n' : lineEndOf(text);
  const edits: TextEdit[] = [insertLinesBefore(stmt.line, [`${' '.repeat(stmt.range.start.character)}reset yaw`], eol), ...retargetEdits(replayed)];
  const runName = result.runs.length > 1 ? `the run "${run.name}"` : 'the run';
  return {
    line: at.line,
    before: now,
    after: best.spread,
    fix: {
      title: `Insert \`reset yaw\` before line ${at.line + 1}: ${runName} ends within ${fmt(best.spread, 0)} mm instead of ${fmt(now, 0)} mm (19 runs in 20; the path stays the same)`,
      edits,
    },
  };
}
