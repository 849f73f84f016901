// The Monte Carlo cloud the drawing shows: each run sampled on the error
// model (spread/sample.ts, the same seeds as `veer check --json --samples`),
// kept at the run's end and at each mark, with each mark's sampled share of
// runs that meet it. Pure: the editor runs it in a worker, the command line
// in-process.
import type { CheckResult } from '../types';
import { shareMeeting } from '../spread/gaussian';
import { sampleRun } from '../spread/sample';

/** Where the drawing shows the 95 % ovals: at marks only (the default), after every motion too, or nowhere. */
export type SpreadShown = 'marks' | 'all' | 'off';

export const SPREAD_CHOICES: readonly SpreadShown[] = ['marks', 'all', 'off'];

/** The sampled end points at one place of one run. */
export interface CloudSpot {
  /** Index into CheckResult.runs and into that run's segments. */
  run: number;
  segment: number;
  /** 0-based plan line of the segment. */
  line: number;
  /** The run's last segment, or a `mark`. */
  kind: 'end' | 'mark';
  /** Axle midpoints of the sampled runs, mm (at most `MAX_DRAWN_POINTS` kept; shares use every sample). */
  x: number[];
  y: number[];
  /** A mark with a zone or a point: the share of all sampled runs that meet it. */
  share?: number;
}

export interface SpreadCloud {
  /** Runs sampled per plan run. */
  count: number;
  seed: number;
  spots: CloudSpot[];
}

/** Points kept per spot for drawing: beyond this the dots only darken, and the drawing grows. */
export const MAX_DRAWN_POINTS = 2000;

/**
 * Samples every run `count` times (run r with seed `seed + r`, as the command
 * line does) and keeps the cloud at each run's end and each mark. Runs
 * without a track width (the robot is not set up) or without segments give
 * no spots. `onProgress` gets the share done, 0..1.
 */
export function sampleCloud(result: CheckResult, count: number, seed = 1, onProgress?: (done: number) => void): SpreadCloud {
  const spots: CloudSpot[] = [];
  const width = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
  const runs = result.runs;
  if (width !== undefined && Number.isFinite(width) && width > 0) {
    runs.forEach((run, r) => {
      const segs = run.segments;
      if (segs.length === 0) return;
      const samples = sampleRun(segs, result.setup.noise, width, result.setup.turns, count, seed + r,
        onProgress && ((f: number) => onProgress((r + f) / runs.length)));
      const kept = Math.min(count, MAX_DRAWN_POINTS);
      const keep = (i: number): { x: number[]; y: number[] } => {
        const x: number[] = [];
        const y: number[] = [];
        for (let j = 0; j < kept; j++) {
          const px = samples.x[i][j];
          const py = samples.y[i][j];
          if (Number.isFinite(px) && Number.isFinite(py)) {
            x.push(Math.round(px * 100) / 100);
            y.push(Math.round(py * 100) / 100);
          }
        }
        return { x, y };
      };
      segs.forEach((seg, i) => {
        if (seg.kind !== 'mark' || !seg.complete) return;
        const share = seg.markTarget ? shareMeeting(seg.markTarget, samples.x[i], samples.y[i]) : undefined;
        spots.push({ run: r, segment: i, line: seg.line, kind: 'mark', ...keep(i), ...(share !== undefined ? { share } : {}) });
      });
      // The run's end, unless a mark there already holds these very samples.
      const last = segs.length - 1;
      if (segs[last].complete && segs[last].kind !== 'mark') spots.push({ run: r, segment: last, line: segs[last].line, kind: 'end', ...keep(last) });
    });
  }
  onProgress?.(1);
  return { count, seed, spots };
}

/** Whether a value (from a worker or a message) has the shape of a SpreadCloud. */
export function isSpreadCloud(value: unknown): value is SpreadCloud {
  if (typeof value !== 'object' || value === null) return false;
  const v = value as Record<string, unknown>;
  return typeof v.count === 'number' && typeof v.seed === 'number' && Array.isArray(v.spots)
    && v.spots.every((s: unknown) => {
      if (typeof s !== 'object' || s === null) return false;
      const o = s as Record<string, unknown>;
      return Number.isInteger(o.run) && Number.isInteger(o.segment) && Number.isInteger(o.line) && (o.kind === 'end' || o.kind === 'mark')
        && Array.isArray(o.x) && Array.isArray(o.y) && o.x.length === o.y.length && (o.share === undefined || typeof o.share === 'number');
    });
}
