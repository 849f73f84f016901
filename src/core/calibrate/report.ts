// The calibration as people and programs read it: text lines for the command
// line, a JSON document, and hover text for the plan's setup lines and the
// record's lines. Every surface says the same numbers the same way.
import type { CheckResult, LengthUnitName, Pos, Range } from '../types';
import type { CalibrationResult } from './compute';
import type { CalibrationRecord, RecordProblem } from './record';
import type { Estimate } from './stats';
import { decimals, type SetupEdits } from './edits';

const MM_PER: Record<LengthUnitName, number> = { mm: 1, cm: 10, m: 1000, in: 25.4 };
const LENGTH_DECIMALS: Record<LengthUnitName, number> = { mm: 2, cm: 3, m: 5, in: 4 };

export const INTERVAL_NOTE = 'each value is the mean of the trials ± its 95 % interval, by Student\'s t on their spread';

/** A length in the file's unit with fixed decimals (59.10 mm). */
function len(mm: number, unit: LengthUnitName): string {
  return `${fixed(mm / MM_PER[unit], LENGTH_DECIMALS[unit])} ${unit}`;
}

/** A length with its 95 % half-width: `59.10 ± 0.30 mm`. */
function lenPm(e: Estimate, unit: LengthUnitName): string {
  return `${fixed(e.value / MM_PER[unit], LENGTH_DECIMALS[unit])} ± ${fixed(e.half95 / MM_PER[unit], LENGTH_DECIMALS[unit])} ${unit}`;
}

/** A plain number with its 95 % half-width: `1.00333 ± 0.00138`. */
function numPm(e: Estimate, digits: number): string {
  return `${fixed(e.value, digits)} ± ${fixed(e.half95, digits)}`;
}

function fixed(v: number, digits: number): string {
  const t = v.toFixed(digits);
  return /^-0\.?0*$/.test(t) ? t.slice(1) : t;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** One paragraph per result, in plain words (the CLI prints them; the hovers reuse them). */
export function describe(c: CalibrationResult, unit: LengthUnitName): { wheel?: string; spin?: string; gyro?: string; square?: string } {
  const out: { wheel?: string; spin?: string; gyro?: string; square?: string } = {};
  if (c.wheel) {
    const w = c.wheel;
    out.wheel = `wheel (straight drive, ${plural(w.ratio.n, 'trial')}): the robot drove ${numPm(w.ratio, 5)} of the commanded distance, so the wheels' mean diameter is ${lenPm(w.mean, unit)} (the plan says ${len(c.plan.wheel, unit)})` +
      (w.mismatch !== 1 ? `; with the mismatch ${fixed(w.mismatch, 6)} the left wheel, which \`wheel\` gives, is ${lenPm(w.diameter, unit)}` : '');
  }
  if (c.spin) {
    const sp = c.spin;
    out.spin = `effective track (spins by encoders, ${plural(sp.ratio.n, 'trial')}): the robot turned ${fixed(1 / sp.ratio.value, 5)} of the commanded angle, so the effective track is ${lenPm(sp.track, unit)} (the plan's is ${len(c.plan.effectiveTrack ?? NaN, unit)})` +
      (sp.wheelFactor !== 1 ? `; this includes the new wheel value (× ${fixed(sp.wheelFactor, 5)}), because the wheel sets every turn's wheel degrees too` : '');
  }
  if (c.gyro) {
    out.gyro = `gyro scale (${plural(c.gyro.scale.n, 'trial')}): the gyro reads ${numPm(c.gyro.scale, 5)} times the true angle (the plan says ${decimals(c.plan.gyroScale, 5)})`;
  }
  if (c.square) {
    const q = c.square;
    out.square = `square test (${q.xCw.n} clockwise and ${q.xCcw.n} counterclockwise laps of ${decimals(q.side / MM_PER[unit], 3)} ${unit}): the laps stopped on average ${lenPm(q.xCw, unit)} (clockwise) and ${lenPm(q.xCcw, unit)} (counterclockwise) ahead of their start; ` +
      `each 90° turn is ${fixed(Math.abs(q.alphaDeg.value), 3)}° ${q.alphaDeg.value >= 0 ? 'short' : 'too far'} and each leg curves ${fixed(Math.abs(q.betaDeg.value), 3)}° to the ${q.betaDeg.value >= 0 ? 'left' : 'right'}. ` +
      `Wheel mismatch (right over left) ${numPm(q.mismatch, 6)}, track factor ${numPm(q.trackFactor, 6)} ` +
      `(exact laps; the paper's first-order formulas give ${fixed(q.formula.mismatch, 6)} and ${fixed(q.formula.trackFactor, 6)}), so the effective track is ${lenPm(q.track, unit)}`;
  }
  return out;
}

/** The command line's text: the results, the problems, and the setup lines to write. */
export function calibrationText(file: string, recordFile: string, c: CalibrationResult, record: CalibrationRecord, edits: SetupEdits, unit: LengthUnitName): string {
  const lines: string[] = [];
  for (const p of [...record.problems, ...c.problems]) lines.push(problemLine(recordFile, p));
  const parts = describe(c, unit);
  const found = [parts.wheel, parts.spin, parts.gyro, parts.square].filter((p): p is string => !!p);
  if (found.length) {
    lines.push(`Calibration of ${file} from ${recordFile} (${INTERVAL_NOTE}):`);
    for (const p of found) lines.push(`  ${p}.`);
  } else lines.push(`${recordFile}: no complete test recorded yet, so nothing to compute`);
  if (edits.lines.length) {
    lines.push(`Setup lines for ${file}:`);
    for (const l of edits.lines) lines.push(`  ${l}`);
  }
  return lines.join('\n') + '\n';
}

/** FILE:LINE:COL: SEVERITY: MESSAGE, as `veer check` prints problems. */
export function problemLine(file: string, p: RecordProblem): string {
  return `${file}:${p.range.start.line + 1}:${p.range.start.character + 1}: ${p.severity}: ${p.message.replace(/^line \d+: /, '')}`;
}

function estimateJson(e: Estimate) {
  const r = (v: number) => Number(v.toPrecision(10));
  return { value: r(e.value), se: r(e.se), ci95: [r(e.value - e.half95), r(e.value + e.half95)], n: e.n, df: r(e.df) };
}

/** The JSON document of `veer calibrate --json` (lengths in mm, angles in degrees). */
export function calibrationJson(file: string, recordFile: string, c: CalibrationResult, record: CalibrationRecord, edits: SetupEdits) {
  const problems = [...record.problems, ...c.problems].map((p) => ({
    line: p.range.start.line + 1, column: p.range.start.character + 1, severity: p.severity, message: p.message,
  }));
  return {
    file,
    record: recordFile,
    interval: 'student-t-95',
    problems,
    plan: { wheel_mm: c.plan.wheel, mismatch: c.plan.mismatch, effective_track_mm: c.plan.effectiveTrack ?? null, gyro_scale: c.plan.gyroScale },
    ...(c.wheel ? { wheel: { ratio: estimateJson(c.wheel.ratio), mean_diameter_mm: estimateJson(c.wheel.mean), wheel_mm: estimateJson(c.wheel.diameter), mismatch: c.wheel.mismatch, lines: c.wheel.lines.map((l) => l + 1) } } : {}),
    ...(c.spin ? { spins: { ratio: estimateJson(c.spin.ratio), effective_track_mm: estimateJson(c.spin.track), wheel_factor: c.spin.wheelFactor, lines: c.spin.lines.map((l) => l + 1) } } : {}),
    ...(c.gyro ? { gyro: { scale: estimateJson(c.gyro.scale), lines: c.gyro.lines.map((l) => l + 1) } } : {}),
    ...(c.square ? {
      square: {
        side_mm: c.square.side, track_mm: c.square.b,
        x_cw_mm: estimateJson(c.square.xCw), x_ccw_mm: estimateJson(c.square.xCcw),
        ...(c.square.yCw ? { y_cw_mm: estimateJson(c.square.yCw) } : {}),
        ...(c.square.yCcw ? { y_ccw_mm: estimateJson(c.square.yCcw) } : {}),
        alpha_deg: estimateJson(c.square.alphaDeg), beta_deg: estimateJson(c.square.betaDeg),
        formula: { mismatch: c.square.formula.mismatch, track_factor: c.square.formula.trackFactor },
        mismatch: estimateJson(c.square.mismatch), track_factor: estimateJson(c.square.trackFactor), effective_track_mm: estimateJson(c.square.track),
        lines: c.square.lines.map((l) => l + 1),
      },
    } : {}),
    setup_lines: edits.lines,
  };
}

export interface CalibrationHover {
  markdown: string;
  range: Range;
}

function inRange(r: Range, p: Pos): boolean {
  const before = (a: Pos, b: Pos) => a.line < b.line || (a.line === b.line && a.character <= b.character);
  return before(r.start, p) && before(p, r.end);
}

/** Hover on the plan's `wheel`, `track` or `gyro` line: what the record says about it. */
export function planCalibrationHover(result: CheckResult, c: CalibrationResult, recordName: string, pos: Pos): CalibrationHover | undefined {
  const stmt = result.ast.statements.find((s) => s.line === pos.line && inRange(s.range, pos));
  if (!stmt) return undefined;
  const parts = describe(c, result.setup.lengthUnit);
  const texts = stmt.kind === 'wheel' ? [parts.wheel, parts.square && `mismatch from the ${parts.square}`]
    : stmt.kind === 'track' ? [parts.spin, parts.square]
      : stmt.kind === 'gyro' ? [parts.gyro] : [];
  const found = texts.filter((t): t is string => !!t);
  if (!found.length) return undefined;
  return {
    markdown: `**Calibration** (from ${recordName}; ${INTERVAL_NOTE}):\n\n${found.map((t) => `- ${t}.`).join('\n')}\n\nThe light bulb on this line offers the values as edits.`,
    range: stmt.range,
  };
}

/** Hover on a record line: that test's result, or its problem. */
export function recordHover(record: CalibrationRecord, c: CalibrationResult | undefined, unit: LengthUnitName, pos: Pos): CalibrationHover | undefined {
  const entry = record.entries.find((e) => e.line === pos.line);
  if (!entry) return undefined;
  const problem = [...record.problems, ...(c?.problems ?? [])].find((p) => p.range.start.line === pos.line);
  if (problem) return { markdown: problem.message, range: entry.range };
  if (!c) return { markdown: 'Open the plan this record belongs to (the same name, ending `.veer`) to see the calibrated values.', range: entry.range };
  const parts = describe(c, unit);
  const text = entry.kind === 'drive' ? parts.wheel : entry.kind === 'spin' ? parts.spin : entry.kind === 'gyro' ? parts.gyro : parts.square;
  if (!text) return undefined;
  return { markdown: `${text}.\n\n(${INTERVAL_NOTE})`, range: entry.range };
}
