// The command line's JSON document and text lines (spec: command-line.md),
// built from a CheckResult. Pure, so the editor and tests can use it too.
import type { CheckResult, Diagnostic, Pose, Prediction, RunResult, Segment, WheelPair } from './types';
import { traceOf } from './sim/run';
import { normaliseHeading } from './solve/frame';
import { formatRunDistance, formatRunTime, round3 } from './format';

export interface JsonPose { x_mm: number; y_mm: number; heading_deg: number }

export interface JsonSegment {
  line: number;
  kind: Segment['kind'];
  shape?: string;
  sensing?: string;
  start: JsonPose;
  end: JsonPose;
  turned_deg: number;
  yaw_start_deg: number;
  yaw_end_deg: number;
  yaw_target_deg?: number;
  radius_mm?: number;
  wheel_deg?: WheelPair;
  motor_deg?: WheelPair;
  duration_s: number;
  distance_mm: number;
  label?: string;
  complete: boolean;
  /** What the controller simulation predicts (absent when the motion could not be simulated). */
  predicted?: JsonPrediction;
  /** With `--trace`: the simulation's samples, one row each. */
  trace?: JsonTraceRow[];
  /** Where the robot really ends up: the pose's covariance (mm, degrees; field frame), its 95 % ellipse and the heading's sd. */
  spread?: { cov: number[][]; ellipse95: { a_mm: number; b_mm: number; tilt_deg: number }; heading_sd_deg: number };
  /** A mark: the probability of meeting it (0..1). */
  hit_probability?: number;
  /** With `--samples N`: the sampled runs' mean end pose and covariance (mm, degrees). */
  sampled?: { count: number; mean: JsonPose; cov: number[][] };
  /** With `--samples N`, on marks: the share of sampled runs that meet it. */
  sampled_hit_probability?: number;
}

export interface JsonPrediction {
  start_s: number;
  /** null: the motion never ends (stalled, or cut off at 20 s). */
  duration_s: number | null;
  end: JsonPose;
  yaw_end_deg: number;
  /** Gyro turns: signed degrees past the target once the wheels have run down. */
  overshoot_deg?: number;
  /** Gyro turns: time to enter the stop band. */
  settle_s?: number;
  peak_rate_deg_s: number;
  stalled?: boolean;
  capped?: boolean;
}

export interface JsonTraceRow {
  t_s: number;
  yaw_deg: number;
  target_deg: number | null;
  error_deg: number | null;
  power_left_pct: number;
  power_right_pct: number;
  speed_left_mm_s: number;
  speed_right_mm_s: number;
  x_mm: number;
  y_mm: number;
  heading_deg: number;
}

export interface JsonRun {
  name: string;
  line: number;
  duration_s: number;
  distance_mm: number;
  turns: number;
  wrap_crossings: number;
  /** The controller simulation's time for the whole run (null: a motion never ends). */
  predicted_duration_s?: number | null;
  segments: JsonSegment[];
}

export interface JsonDiagnostic {
  line: number;
  column: number;
  endLine: number;
  endColumn: number;
  severity: Diagnostic['severity'];
  code: Diagnostic['code'];
  message: string;
}

export interface JsonDocument {
  file: string;
  title: string;
  diagnostics: JsonDiagnostic[];
  runs: JsonRun[];
}

// Rounded first, then normalised, so a heading a hair under 360 reads 0, never 360.
const pose = (p: Pose): JsonPose => ({ x_mm: round3(p.x), y_mm: round3(p.y), heading_deg: round3(normaliseHeading(round3(p.heading))) });
const pair = (w: WheelPair): WheelPair => ({ left: round3(w.left), right: round3(w.right) });

export function jsonPrediction(p: Prediction): JsonPrediction {
  const out: JsonPrediction = {
    start_s: round3(p.start),
    duration_s: Number.isFinite(p.duration) && !p.capped ? round3(p.duration) : null,
    end: pose(p.end),
    yaw_end_deg: round3(p.reading),
    peak_rate_deg_s: round3(p.peakRate),
  };
  if (p.overshoot !== undefined) out.overshoot_deg = round3(p.overshoot);
  if (p.settle !== undefined) out.settle_s = round3(p.settle);
  if (p.stalled) out.stalled = true;
  if (p.capped) out.capped = true;
  return out;
}

export function jsonTrace(s: Segment): JsonTraceRow[] | undefined {
  const rows = traceOf(s);
  if (!rows) return undefined;
  return rows.t.map((t, i) => ({
    t_s: round3(t),
    yaw_deg: round3(rows.reading[i]),
    target_deg: rows.target[i] === null ? null : round3(rows.target[i]!),
    error_deg: rows.error[i] === null ? null : round3(rows.error[i]!),
    power_left_pct: round3(rows.powerLeft[i] * 100),
    power_right_pct: round3(rows.powerRight[i] * 100),
    speed_left_mm_s: round3(rows.speedLeft[i]),
    speed_right_mm_s: round3(rows.speedRight[i]),
    x_mm: round3(rows.x[i]),
    y_mm: round3(rows.y[i]),
    heading_deg: round3(normaliseHeading(round3(rows.heading[i]))),
  }));
}

export function jsonSegment(s: Segment, withTrace = false): JsonSegment {
  const out: JsonSegment = {
    line: s.line + 1,
    kind: s.kind,
    start: pose(s.start),
    end: pose(s.end),
    turned_deg: round3(s.turned),
    yaw_start_deg: round3(s.yawStart),
    yaw_end_deg: round3(s.yawEnd),
    duration_s: round3(s.duration),
    distance_mm: round3(s.distance),
    complete: s.complete,
  };
  if (s.shape) out.shape = s.shape;
  if (s.sensing) out.sensing = s.sensing;
  if (s.yawTarget !== undefined) out.yaw_target_deg = round3(s.yawTarget);
  if (s.radius !== undefined) out.radius_mm = round3(s.radius);
  if (s.wheelDeg) out.wheel_deg = pair(s.wheelDeg);
  if (s.motorDeg) out.motor_deg = pair(s.motorDeg);
  if (s.label !== undefined) out.label = s.label;
  if (s.predicted) out.predicted = jsonPrediction(s.predicted);
  if (s.spread) {
    const r6 = (v: number) => Math.round(v * 1e6) / 1e6;
    out.spread = {
      cov: s.spread.cov.map((row) => row.map(r6)),
      ellipse95: { a_mm: round3(s.spread.ellipse95.a), b_mm: round3(s.spread.ellipse95.b), tilt_deg: round3(s.spread.ellipse95.tilt) },
      heading_sd_deg: round3(s.spread.headingSd),
    };
  }
  if (s.hitProbability !== undefined) out.hit_probability = Math.round(s.hitProbability * 1e6) / 1e6;
  if (withTrace && s.kind !== 'start') {
    const trace = jsonTrace(s);
    if (trace) out.trace = trace;
  }
  return out;
}

export function jsonDiagnostic(d: Diagnostic): JsonDiagnostic {
  return {
    line: d.range.start.line + 1,
    column: d.range.start.character + 1,
    endLine: d.range.end.line + 1,
    endColumn: d.range.end.character + 1,
    severity: d.severity,
    code: d.code,
    message: d.message,
  };
}

export function jsonRun(r: RunResult, withTrace = false): JsonRun {
  return {
    name: r.name,
    line: r.line + 1,
    duration_s: round3(r.duration),
    distance_mm: round3(r.distance),
    turns: r.turns,
    wrap_crossings: r.wrapCrossings,
    ...(r.predictedDuration !== undefined ? { predicted_duration_s: Number.isFinite(r.predictedDuration) ? round3(r.predictedDuration) : null } : {}),
    segments: r.segments.map((s) => jsonSegment(s, withTrace)),
  };
}

export function toJsonDocument(file: string, result: CheckResult, withTrace = false): JsonDocument {
  return {
    file,
    title: result.setup.title,
    diagnostics: result.diagnostics.map(jsonDiagnostic),
    runs: result.runs.map((r) => jsonRun(r, withTrace)),
  };
}

/** `FILE:LINE:COL: SEVERITY: MESSAGE [CODE]`, the form editors' problem matchers read. */
export function diagnosticLine(file: string, d: Diagnostic): string {
  return `${file}:${d.range.start.line + 1}:${d.range.start.character + 1}: ${d.severity}: ${d.message} [${d.code}]`;
}

/** One line per run: distance, time, turns, wrap crossings. */
export function runSummaryLine(r: RunResult): string {
  const predicted = r.predictedDuration === undefined ? '' : ` (predicted ${Number.isFinite(r.predictedDuration) ? formatRunTime(r.predictedDuration) : 'never ends'})`;
  return `run "${r.name}": ${formatRunDistance(r.distance)}, ${formatRunTime(r.duration)}${predicted}, ${r.turns} turn${r.turns === 1 ? '' : 's'}, ${r.wrapCrossings} wrap crossing${r.wrapCrossings === 1 ? '' : 's'}`;
}
