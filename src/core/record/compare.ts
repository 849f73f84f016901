// A recorded run laid against the plan, motion by motion (robot model,
// section 5): where each motion really ended (reconstructed from the log)
// against where the plan says and where the controller simulation predicted,
// and how long it really took. Motions are found in the log by its line
// column, or, without one, by aligning the predicted times with the log's.
import type { CheckResult, Point, Pose, RunResult, Segment, SegmentKind } from '../types';
import { LogError, readLog, type LogRobot, type LogSettings, type ReadLog } from './log';
import { reconstruct, type Reconstruction, type ReconstructedPath } from './odometry';
import type { RecordedRun } from './types';
import { copyState, simulateMotion } from '../sim/motion';
import { simRecordOf } from '../sim/run';
import { meetsMark } from '../spread/gaussian';
import { fmt } from '../units/evaluate';

/** One pose's difference: distance between the axle midpoints, mm, and the heading's, degrees (recorded minus the other). */
export interface PoseError {
  position: number;
  heading: number;
}

export interface MotionComparison {
  /** 1-based plan line. */
  line: number;
  kind: SegmentKind;
  label: string;
  planned: { start: number; duration: number; end: Pose };
  /** `atRest`: the end is where the predicted robot comes to rest after the motion (the log's last motion), not where its code moves on. */
  predicted?: { start: number; duration: number; end: Pose; atRest?: boolean };
  /** Undefined when the log does not reach this motion. */
  recorded?: {
    /** Seconds from the log's first row. */
    start: number;
    duration: number;
    /** The file's lines of the motion's first and last rows. */
    fromLine?: number;
    toLine?: number;
    /** The end by the best reconstruction (wheels and yaw where the log has a yaw, else wheels alone). */
    end: Pose;
    endWheels: Pose;
    endFused?: Pose;
  };
  vsPlanned?: PoseError;
  vsPredicted?: PoseError;
  /** A `mark` with a zone or a point: whether the recorded robot met it (where it was after the motion before the mark). */
  markMet?: boolean;
  /** Recorded minus planned, and minus predicted, seconds. */
  timeVsPlanned?: number;
  timeVsPredicted?: number;
}

export interface RunComparison {
  runIndex: number;
  name: string;
  /** How motions were found in the log. */
  alignedBy: 'line' | 'time';
  /**
   * With `line`: how many lines the plan's motions moved since the log was
   * recorded (lines added, +, or removed, −, above them; the log's line
   * column is read shifted by it). Absent when they did not move.
   */
  lineShift?: number;
  /** With `time`: log time = timeOffset + timeScale × the run's (predicted) time, s. */
  timeOffset?: number;
  timeScale?: number;
  /** Which reconstruction `end` and the errors use. */
  reconstruction: 'wheels' | 'wheels+yaw';
  motions: MotionComparison[];
  /** The log's length and the run's planned and predicted lengths, s. */
  recordedDuration: number;
  plannedDuration: number;
  predictedDuration?: number;
  /** Distance driven by the axle midpoint over the motions the log reaches, recorded and planned, mm. */
  recordedDistance: number;
  plannedDistance: number;
}

/** What the drawing needs: the reconstructed paths, thinned. */
export interface RecordedOverlay {
  name: string;
  runIndex: number;
  wheels: Point[];
  fused?: Point[];
}

export interface Replay {
  log: ReadLog;
  reconstruction: Reconstruction;
  comparison: RunComparison;
  overlay: RecordedOverlay;
}

/** Recorded over planned distance outside this band: wrong units, or a log of another plan. */
export const DISTANCE_RATIO_BAND = [0.6, 1.6] as const;
/** Points kept per drawn path. */
export const OVERLAY_POINTS = 2000;
const MOVED_MM = 1;
/** Wheels that move less than this (mm, both together) up to the log's end are at rest. */
const REST_MM = 0.5;
/** Aligning by time stretches the run's times by at most this factor (or shrinks by its inverse). */
const TIME_SCALE_LIMIT = 2;

/**
 * Reads, reconstructs and compares a log against a checked plan. `run` picks
 * the run (index); by default the one the log's line column names, or the
 * plan's only run. Throws a LogError on a log it cannot use.
 */
export function replayLog(result: CheckResult, text: string, source: string, options: LogSettings = {}, run?: number): Replay {
  return replayRead(result, readLog(text, source, logRobotOf(result), options), run);
}

/** What reading a log needs from a checked plan: a log read with the same values can be replayed again (see `replayRead`). */
export function logRobotOf(result: CheckResult): LogRobot {
  const r = result.setup.robot;
  return { wheelDiameter: r.wheelDiameter, mismatch: r.mismatch ?? 1, yawLo: result.setup.yawRange.lo };
}

/** `replayLog` for a log already read (with `logRobotOf(result)`'s values): the editor reads a log once and replays it on every edit. */
export function replayRead(result: CheckResult, log: ReadLog, run?: number): Replay {
  const r = result.setup.robot;
  const runIndex = run ?? pickRun(result, log.run);
  const plan = result.runs[runIndex];
  const start = plan.segments.find((s) => s.kind === 'start');
  if (!start) throw new LogError(`run "${plan.name}" has no \`start\`: the recorded path needs the run's start pose`);
  const reconstruction = reconstruct(log.run, start.start, {
    track: r.effectiveTrack ?? r.track ?? NaN, turns: result.setup.turns, gyroScale: result.setup.gyro.scale,
  }, zeroHints(plan, log.run));
  const comparison = compareRun(plan, runIndex, log.run, reconstruction);
  return { log, reconstruction, comparison, overlay: overlayOf(reconstruction, plan.name, runIndex) };
}

/**
 * Where the plan zeroes the yaw (`reset yaw`, a turn with `reset`), as rows of
 * a log with a line column: the first row of that line or, when the code never
 * logs the reset's own line, of the next motion after it.
 */
function zeroHints(plan: RunResult, run: RecordedRun): number[] {
  if (!run.hasLine) return [];
  const order = new Map<number, number>();
  plan.segments.forEach((x, i) => { if (!order.has(x.line + 1)) order.set(x.line + 1, i); });
  const zeroing = plan.segments.map((x, i) => (x.kind === 'reset' || x.zeroesYaw ? i : -1)).filter((i) => i >= 0);
  const hints: number[] = [];
  const s = run.samples;
  const shift = lineShiftOf(plan, run);
  let next = 0;
  for (let i = 0; i < s.length && next < zeroing.length; i++) {
    const o = s[i].line === undefined ? undefined : order.get(s[i].line! + shift);
    if (o === undefined) continue;
    if (o >= zeroing[next]) {
      hints.push(i);
      while (next < zeroing.length && zeroing[next] <= o) next++;
    }
  }
  return hints;
}

/** The run a log belongs to: the one its line column names, or the plan's only run. */
function pickRun(result: CheckResult, run: RecordedRun): number {
  if (result.runs.length === 0) throw new LogError('the plan has no run to compare the log with');
  if (result.runs.length === 1) return 0;
  if (run.hasLine) {
    const first = run.samples.find((s) => s.line !== undefined)!.line! - 1;
    const i = result.runs.findIndex((r) => r.line === first || r.segments.some((s) => s.line === first));
    if (i >= 0) return i;
  }
  throw new LogError(`the plan has ${result.runs.length} runs (${result.runs.map((r) => `"${r.name}"`).join(', ')}): say which one the log recorded (\`--run NAME\`)`);
}

/** How far the log's line column may be off the plan's lines (setup lines added or removed since it was recorded). */
const MAX_LINE_SHIFT = 50;
const MOVING: ReadonlySet<string> = new Set(['drive', 'turn', 'square', 'wait']);

/**
 * The shift that makes every line the log names a moving motion of the run
 * (drive, turn, square, wait): 0 when the lines have not moved (or when no
 * shift explains them: the caller's own checks then say what is wrong), else
 * the smallest that does. A robot's code names the motion it is running, so a
 * log that names the run's `start`, a mark or a setup line was recorded
 * against other line numbers.
 */
function lineShiftOf(plan: RunResult, run: RecordedRun): number {
  const named = new Set<number>();
  for (const s of run.samples) if (s.line !== undefined && s.line !== plan.line + 1) named.add(s.line);
  const moving = new Set(plan.segments.filter((s) => MOVING.has(s.kind)).map((s) => s.line + 1));
  const fits = (k: number) => [...named].every((l) => moving.has(l + k));
  if (named.size === 0 || fits(0)) return 0;
  for (let d = 1; d <= MAX_LINE_SHIFT; d++) {
    for (const k of [d, -d]) if (fits(k)) return k;
  }
  return 0;
}

/** The motions that take part in a comparison (a start has no motion; marks and resets take no time). */
function motionsOf(plan: RunResult): Segment[] {
  return plan.segments.filter((s) => s.kind !== 'start');
}

export function compareRun(plan: RunResult, runIndex: number, run: RecordedRun, rec: Reconstruction): RunComparison {
  const s = run.samples;
  const n = s.length;
  const motions = motionsOf(plan);
  const best = rec.fused ?? rec.wheels;
  // The planned (and predicted) start of each motion from the run's start.
  let clock = 0;
  const plannedStart = new Map<Segment, number>();
  for (const seg of motions) {
    plannedStart.set(seg, clock);
    clock += Number.isFinite(seg.duration) ? seg.duration : 0;
  }
  const predictedAll = motions.every((m) => m.predicted && Number.isFinite(m.predicted.duration));
  // Each motion's span of samples [from, to] (to: where the code moved on).
  const spans = new Map<Segment, { from: number; to: number }>();
  let alignedBy: 'line' | 'time';
  let timeOffset: number | undefined;
  let timeScale: number | undefined;
  let lineShift = 0;
  if (run.hasLine) {
    alignedBy = 'line';
    lineShift = lineShiftOf(plan, run);
    const byLine = new Map<number, Segment>();
    for (const seg of plan.segments) if (!byLine.has(seg.line + 1)) byLine.set(seg.line + 1, seg);
    const lines = plan.segments.map((x) => x.line + 1);
    const range = `lines ${Math.min(...lines, plan.line + 1)} to ${Math.max(...lines)}`;
    let current: Segment | undefined;
    let lastOrder = -1;
    const order = new Map(plan.segments.map((x, i) => [x, i]));
    for (let i = 0; i < n; i++) {
      const logged = s[i].line;
      if (logged === undefined) continue;
      const l = logged + lineShift;
      const seg = byLine.get(l);
      if (!seg) {
        if (l === plan.line + 1) continue; // the `run` line itself: before the first motion
        const fileLine = run.fileLines?.[i];
        throw new LogError(`${fileLine !== undefined ? `line ${fileLine}, ` : ''}column ${run.columns?.line ?? '?'} (line): plan line ${l} is not a motion of run "${plan.name}" (${range}): is this a log of another plan, or of an older version of it?`, fileLine, run.columns?.line);
      }
      if (seg !== current) {
        const o = order.get(seg)!;
        if (o < lastOrder) {
          const fileLine = run.fileLines?.[i];
          throw new LogError(`${fileLine !== undefined ? `line ${fileLine}, ` : ''}column ${run.columns?.line ?? '?'} (line): the log goes back from plan line ${current!.line + 1} to line ${l}; a run's motions come once each, in plan order`, fileLine, run.columns?.line);
        }
        lastOrder = o;
        if (current) spans.get(current)!.to = i;
        if (spans.has(seg)) throw new LogError(`plan line ${l} appears twice in the log, apart`);
        spans.set(seg, { from: i, to: n - 1 });
        current = seg;
      }
    }
  } else {
    alignedBy = 'time';
    // The run's time 0 is where the wheels first move, less the start of the first motion that moves them.
    let moved = 0;
    while (moved < n && Math.abs(s[moved].left) + Math.abs(s[moved].right) < MOVED_MM) moved++;
    const firstMoving = motions.find((m) => m.distance > 0 || m.turned !== 0);
    const base = (seg: Segment) => (predictedAll ? seg.predicted!.start : plannedStart.get(seg)!);
    const since = moved > 0 && moved < n ? s[moved - 1].t : 0;
    // The run's motions stretched (or shrunk) to the time the log's wheels move: a slower robot takes longer throughout.
    let rest = n - 1;
    while (rest > 0 && Math.abs(s[rest - 1].left - s[n - 1].left) + Math.abs(s[rest - 1].right - s[n - 1].right) < REST_MM) rest--;
    const lastMoving = [...motions].reverse().find((m) => m.distance > 0 || m.turned !== 0);
    const from = firstMoving ? base(firstMoving) : 0;
    const lastDuration = lastMoving ? (predictedAll ? lastMoving.predicted!.duration : lastMoving.duration) : 0;
    const until = lastMoving ? base(lastMoving) + (Number.isFinite(lastDuration) ? lastDuration : 0) : from;
    timeScale = until > from && s[rest].t > since ? Math.min(TIME_SCALE_LIMIT, Math.max(1 / TIME_SCALE_LIMIT, (s[rest].t - since) / (until - from))) : 1;
    timeOffset = since - from * timeScale;
    for (const seg of motions) {
      const t0 = base(seg) * timeScale + timeOffset;
      const own = predictedAll ? seg.predicted!.duration : seg.duration;
      const dur = (Number.isFinite(own) ? own : 0) * timeScale;
      if (t0 > s[n - 1].t) continue; // the log ends before this motion
      const from = indexAt(run, Math.max(0, t0));
      const to = indexAt(run, Math.min(s[n - 1].t, t0 + dur));
      spans.set(seg, { from, to });
    }
  }

  // The last motion the log reaches ends where the wheels come to rest (the log may run on after the code ends).
  const lastSpan = [...motions].reverse().map((m) => spans.get(m)).find((x) => x);
  let atRest: Segment | undefined;
  if (lastSpan && lastSpan.to === n - 1) {
    atRest = motions.find((m) => spans.get(m) === lastSpan);
    let rest = n - 1;
    while (rest > lastSpan.from && Math.abs(s[rest - 1].left - s[n - 1].left) + Math.abs(s[rest - 1].right - s[n - 1].right) < REST_MM) rest--;
    lastSpan.to = rest;
  }
  const out: MotionComparison[] = [];
  let recordedDistance = 0;
  let plannedDistance = 0;
  // The distances are checked on the motions the log completes: the one it ends in may have been cut short
  // (a robot stopped early), unless it is the run's last moving motion.
  const finalMotion = [...motions].reverse().find((m) => m.distance > 0 || m.turned !== 0);
  let checkedRecorded = 0;
  let checkedPlanned = 0;
  for (const seg of motions) {
    const span = spans.get(seg);
    const m: MotionComparison = {
      line: seg.line + 1, kind: seg.kind, label: labelOf(seg),
      planned: { start: plannedStart.get(seg)!, duration: seg.duration, end: seg.end },
    };
    if (seg.predicted) {
      // The log's last motion ends where the wheels came to rest: compared with where the prediction comes to rest.
      const rest = seg === atRest ? predictedRest(seg) : undefined;
      m.predicted = { start: seg.predicted.start, duration: seg.predicted.duration, end: rest ?? seg.predicted.end, ...(rest ? { atRest: true } : {}) };
    }
    if (span) {
      const end = poseOf(best, span.to);
      const endWheels = poseOf(rec.wheels, span.to);
      m.recorded = {
        start: s[span.from].t, duration: s[span.to].t - s[span.from].t,
        ...(run.fileLines ? { fromLine: run.fileLines[span.from], toLine: run.fileLines[span.to] } : {}),
        end, endWheels, ...(rec.fused ? { endFused: poseOf(rec.fused, span.to) } : {}),
      };
      m.vsPlanned = poseError(end, seg.end);
      m.timeVsPlanned = m.recorded.duration - seg.duration;
      if (seg.predicted && Number.isFinite(seg.predicted.duration)) {
        m.vsPredicted = poseError(end, m.predicted!.end);
        m.timeVsPredicted = m.recorded.duration - seg.predicted.duration;
      }
      const travel = travelled(run, span.from, span.to);
      recordedDistance += travel;
      plannedDistance += seg.distance;
      if (span !== lastSpan || seg === finalMotion) {
        checkedRecorded += travel;
        checkedPlanned += seg.distance;
      }
    }
    if (seg.markTarget && !m.recorded) {
      const before = [...out].reverse().find((x) => x.recorded);
      if (before?.recorded) m.markMet = meetsMark(seg.markTarget, before.recorded.end.x, before.recorded.end.y);
    } else if (seg.markTarget && m.recorded) m.markMet = meetsMark(seg.markTarget, m.recorded.end.x, m.recorded.end.y);
    out.push(m);
  }
  if (spans.size === 0) throw new LogError(`the log reaches none of the motions of run "${plan.name}"`);
  const ratio = checkedRecorded / checkedPlanned;
  if (checkedPlanned > 100 && !(ratio >= DISTANCE_RATIO_BAND[0] && ratio <= DISTANCE_RATIO_BAND[1])) {
    throw new LogError(`column ${run.columns?.left ?? '?'} (left) and column ${run.columns?.right ?? '?'} (right): over the motions it completes, the log drives ${Math.round(checkedRecorded)} mm where the plan drives ${Math.round(checkedPlanned)} mm (${ratio.toFixed(2)} times): check the wheel units (deg, rot, counts:N, mm) and the plan's wheel diameter, or is this a log of another plan?`, undefined, run.columns?.left);
  }
  return {
    runIndex, name: plan.name, alignedBy, ...(lineShift ? { lineShift } : {}), ...(timeOffset !== undefined ? { timeOffset, timeScale } : {}),
    reconstruction: rec.fused ? 'wheels+yaw' : 'wheels',
    motions: out,
    recordedDuration: s[n - 1].t,
    plannedDuration: plan.duration,
    ...(plan.predictedDuration !== undefined && Number.isFinite(plan.predictedDuration) ? { predictedDuration: plan.predictedDuration } : {}),
    recordedDistance, plannedDistance,
  };
}

/** Where the simulated robot comes to rest after a motion (its wheels coasting down), from the check's record of it. */
function predictedRest(seg: Segment): Pose | undefined {
  const rec = simRecordOf(seg);
  if (!rec || !seg.predicted || !Number.isFinite(seg.predicted.duration)) return undefined;
  const state = copyState(rec.state);
  if (!simulateMotion(state, rec.robot, rec.motion).finished) return undefined;
  // Ten lags (at least a second) of standing still: the wheels' speed falls to e^-10 of what it was.
  simulateMotion(state, rec.robot, { kind: 'wait', time: Math.max(1, 10 * rec.robot.lag) });
  return { x: state.x, y: state.y, heading: state.h };
}

/** The first sample at or after time t (the last when t is past the end). */
function indexAt(run: RecordedRun, t: number): number {
  const s = run.samples;
  let lo = 0;
  let hi = s.length - 1;
  if (t >= s[hi].t) return hi;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (s[mid].t < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function travelled(run: RecordedRun, from: number, to: number): number {
  let d = 0;
  const s = run.samples;
  for (let i = from + 1; i <= to; i++) d += Math.abs((s[i].left - s[i - 1].left + s[i].right - s[i - 1].right) / 2);
  return d;
}

function poseOf(p: ReconstructedPath, i: number): Pose {
  return { x: p.x[i], y: p.y[i], heading: p.heading[i] };
}

export function poseError(a: Pose, b: Pose): PoseError {
  return { position: Math.hypot(a.x - b.x, a.y - b.y), heading: a.heading - b.heading };
}

function labelOf(seg: Segment): string {
  switch (seg.kind) {
    case 'drive': return `drive ${fmt(seg.distance, 0)} mm${seg.sensing === 'gyro' ? ' (hold)' : ''}`;
    case 'turn': return `turn ${fmt(seg.turned, 1)}°${seg.sensing === 'gyro' ? ' by gyro' : ''}`;
    case 'wait': return `wait ${fmt(seg.duration, 2)} s`;
    case 'mark': return `mark "${seg.label ?? ''}"`;
    case 'reset': return 'reset yaw';
    default: return seg.kind;
  }
}

/** The reconstructed paths thinned to at most OVERLAY_POINTS points each, for the drawing. */
export function overlayOf(rec: Reconstruction, name: string, runIndex: number): RecordedOverlay {
  const thin = (p: ReconstructedPath): Point[] => {
    const n = p.x.length;
    const stride = Math.max(1, Math.ceil(n / OVERLAY_POINTS));
    const pts: Point[] = [];
    for (let i = 0; i < n; i += stride) pts.push({ x: p.x[i], y: p.y[i] });
    if ((n - 1) % stride !== 0) pts.push({ x: p.x[n - 1], y: p.y[n - 1] });
    return pts;
  };
  return { name, runIndex, wheels: thin(rec.wheels), ...(rec.fused ? { fused: thin(rec.fused) } : {}) };
}
