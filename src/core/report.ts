// The command line's JSON document and text lines (spec: command-line.md),
// built from a CheckResult. Pure, so the editor and tests can use it too.
import type { CheckResult, Diagnostic, Pose, RunResult, Segment, WheelPair } from './types';
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
}

export interface JsonRun {
  name: string;
  line: number;
  duration_s: number;
  distance_mm: number;
  turns: number;
  wrap_crossings: number;
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

export function jsonSegment(s: Segment): JsonSegment {
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

export function jsonRun(r: RunResult): JsonRun {
  return {
    name: r.name,
    line: r.line + 1,
    duration_s: round3(r.duration),
    distance_mm: round3(r.distance),
    turns: r.turns,
    wrap_crossings: r.wrapCrossings,
    segments: r.segments.map(jsonSegment),
  };
}

export function toJsonDocument(file: string, result: CheckResult): JsonDocument {
  return {
    file,
    title: result.setup.title,
    diagnostics: result.diagnostics.map(jsonDiagnostic),
    runs: result.runs.map(jsonRun),
  };
}

/** `FILE:LINE:COL: SEVERITY: MESSAGE [CODE]`, the form editors' problem matchers read. */
export function diagnosticLine(file: string, d: Diagnostic): string {
  return `${file}:${d.range.start.line + 1}:${d.range.start.character + 1}: ${d.severity}: ${d.message} [${d.code}]`;
}

/** One line per run: distance, time, turns, wrap crossings. */
export function runSummaryLine(r: RunResult): string {
  return `run "${r.name}": ${formatRunDistance(r.distance)}, ${formatRunTime(r.duration)}, ${r.turns} turn${r.turns === 1 ? '' : 's'}, ${r.wrapCrossings} wrap crossing${r.wrapCrossings === 1 ? '' : 's'}`;
}
