// `veer replay PLAN LOG`: a recorded run laid against its plan, motion by
// motion (docs/recorded-runs.md), as text or JSON (schema/replay.schema.json),
// with the robot model fitted to the log. Also reads a log for `veer render --log`.
import { parseArgs } from 'node:util';
import { checkPlan, ExpressionCache, type CheckResult, type Pose } from '../core';
import { replayLog, type MotionComparison, type PoseError, type RecordedOverlay, type Replay } from '../core/record/compare';
import { LogError, parseSetting, settingsText, type LogSettings } from '../core/record/log';
import { currentFromSetup, fitFixes, fitRobot, type FitParam, type FitResult } from '../core/record/fit';
import type { Fix } from '../core';
import { FileError, readTextFile, type CliIo } from './main';

export const REPLAY_HELP = `  veer replay PLAN LOG [--json] [--run NAME] [--columns ROLES] [--time-units U] [--wheel-units U]
        [--yaw-units U] [--yaw-sign S] [--power-units U]
                                           compare a recorded run with the plan, motion by motion: where
                                           each motion really ended (from the log's wheels and yaw) against
                                           the plan and the prediction, and how long it took; and the robot
                                           model fitted to the log (docs/recorded-runs.md)
`;

const USAGE = 'Usage: veer replay PLAN LOG [--json] [--run NAME] [--columns time,left,right,...] [--time-units s|ms] [--wheel-units deg|rot|mm|counts:N] [--yaw-units deg|rad] [--yaw-sign plan|reversed] [--power-units pct|frac]';
/** The largest log read, bytes (about ten minutes at 1 kHz). */
export const MAX_LOG_BYTES = 256 * 1024 * 1024;

class ReplayUsage extends Error {}

/** The log options shared by `replay` and `render --log`, as parseArgs options. */
export const LOG_OPTIONS = {
  columns: { type: 'string' },
  'time-units': { type: 'string' },
  'wheel-units': { type: 'string' },
  'yaw-units': { type: 'string' },
  'yaw-sign': { type: 'string' },
  'power-units': { type: 'string' },
} as const;

/** The log settings given as options; throws a usage error naming the option. */
export function logSettingsOf(values: Record<string, unknown>): LogSettings {
  const settings: LogSettings = {};
  for (const key of Object.keys(LOG_OPTIONS)) {
    const v = values[key];
    if (typeof v !== 'string') continue;
    try {
      parseSetting(key, v, settings);
    } catch (e) {
      throw new ReplayUsage(`--${(e as Error).message.replace(/^`/, '').replace(/`/, '')}`);
    }
  }
  return settings;
}

/** `veer replay ...` (argv after the command word); returns the exit status. */
export function replayCommand(argv: string[], io: CliIo, readPlan: (file: string) => string): number {
  try {
    return replay(argv, io, readPlan);
  } catch (e) {
    if (e instanceof ReplayUsage) {
      io.err(`veer replay: ${e.message}\n${USAGE}\n`);
      return 2;
    }
    if (e instanceof ReadError) {
      io.err(`veer replay: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
}

class ReadError extends Error {}

function replay(argv: string[], io: CliIo, readPlan: (file: string) => string): number {
  let parsed;
  try {
    parsed = parseArgs({ args: argv, allowPositionals: true, options: { json: { type: 'boolean' }, run: { type: 'string' }, help: { type: 'boolean', short: 'h' }, ...LOG_OPTIONS } });
  } catch (e) {
    throw new ReplayUsage((e as Error).message.replace(/\. To specify.*$/s, ''));
  }
  const { values, positionals } = parsed;
  if (values.help) {
    io.out(`${USAGE}\n\n${REPLAY_HELP}\nSee docs/recorded-runs.md for the log's columns, units and settings comment.\n`);
    return 0;
  }
  if (positionals.length !== 2) throw new ReplayUsage('`veer replay` takes a plan file and a log file');
  const [planFile, logFile] = positionals;
  const settings = logSettingsOf(values);
  let text: string;
  try {
    text = readPlan(planFile);
  } catch (e) {
    throw new ReadError((e as Error).message);
  }
  const result = checkPlan(text, { fileName: planFile, cache: new ExpressionCache() });
  const runIndex = values.run === undefined ? undefined : runOf(result, values.run, planFile);
  const logText = readLogFile(logFile);
  let r: Replay;
  try {
    r = replayLog(result, logText, logFile, settings, runIndex);
  } catch (e) {
    if (e instanceof LogError) {
      io.err(`veer replay: ${logFile}: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
  const fit = fitRobot(r.log.run, currentFromSetup(result.setup));
  const edits = fitFixes(text, fit);
  if (values.json) io.out(JSON.stringify(replayJson(planFile, logFile, r, fit, edits), null, 2) + '\n');
  else io.out(replayText(planFile, logFile, r, fit, edits));
  const errors = result.diagnostics.filter((d) => d.severity === 'error').length;
  if (errors) io.err(`${planFile}: ${errors} error${errors === 1 ? '' : 's'} in the plan (\`veer check ${planFile}\` lists them): the comparison uses the plan as far as it could be computed\n`);
  return errors ? 1 : 0;
}

/** Reads a log file (UTF-8 text, at most MAX_LOG_BYTES). */
export function readLogFile(file: string): string {
  return asOwn(() => readTextFile(file, MAX_LOG_BYTES, {
    missing: 'no such file',
    notFile: 'is not a regular file; save the log to a file first',
    tooLarge: (bytes) => `too large for a log (${(bytes / 1e6).toFixed(0)} MB; the limit is ${MAX_LOG_BYTES / 1024 / 1024} MB): cut it to the run`,
    notUtf8: 'is not UTF-8 text; save the log as UTF-8 (or plain ASCII) text',
  }));
}

/** The shared file helpers' errors, worded as this command's own (`veer replay: ...`). */
function asOwn<T>(f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof FileError) throw new ReadError(e.message);
    throw e;
  }
}

/**
 * For `veer render --log LOG`: the recorded paths to draw. Returns a message
 * instead when the log cannot be used.
 */
export function overlayForRender(result: CheckResult, logFile: string, values: Record<string, unknown>, run?: number): { overlay: RecordedOverlay } | { error: string } {
  try {
    const settings = logSettingsOf(values);
    return { overlay: replayLog(result, readLogFile(logFile), logFile, settings, run).overlay };
  } catch (e) {
    if (e instanceof LogError || e instanceof ReadError || e instanceof ReplayUsage) return { error: `${e instanceof LogError ? `${logFile}: ` : ''}${e.message}` };
    throw e;
  }
}

function runOf(result: CheckResult, run: string, file: string): number {
  const byName = result.runs.findIndex((r) => r.name === run);
  if (byName >= 0) return byName;
  const n = /^\d+$/.test(run) ? Number(run) - 1 : -1;
  if (n >= 0 && n < result.runs.length) return n;
  throw new ReplayUsage(`${file} has no run "${run}" (runs: ${result.runs.map((r) => `"${r.name}"`).join(', ') || 'none'})`);
}

// ---------------------------------------------------------------------------
// Output

const r3 = (v: number) => Math.round(v * 1000) / 1000;
const poseJson = (p: Pose) => ({ x_mm: r3(p.x), y_mm: r3(p.y), heading_deg: r3(p.heading) });
const errJson = (e: PoseError) => ({ position_mm: r3(e.position), heading_deg: r3(e.heading) });

export function replayJson(planFile: string, logFile: string, r: Replay, fit: FitResult, edits: Fix[] = []) {
  const c = r.comparison;
  return {
    plan: planFile,
    log: logFile,
    run: c.name,
    run_index: c.runIndex,
    rows: r.log.run.samples.length,
    aligned_by: c.alignedBy,
    ...(c.lineShift ? { line_shift: c.lineShift } : {}),
    ...(c.timeOffset !== undefined ? { time_offset_s: r3(c.timeOffset), time_scale: r3(c.timeScale ?? 1) } : {}),
    reconstruction: c.reconstruction,
    settings: settingsText(r.log.settings),
    notes: r.log.notes,
    zeroings: r.reconstruction.zeroings.length,
    duration_s: { recorded: r3(c.recordedDuration), planned: r3(c.plannedDuration), ...(c.predictedDuration !== undefined ? { predicted: r3(c.predictedDuration) } : {}) },
    distance_mm: { recorded: r3(c.recordedDistance), planned: r3(c.plannedDistance) },
    motions: c.motions.map((m) => ({
      line: m.line,
      kind: m.kind,
      label: m.label,
      planned: { start_s: r3(m.planned.start), duration_s: r3(m.planned.duration), end: poseJson(m.planned.end) },
      ...(m.predicted ? { predicted: { start_s: r3(m.predicted.start), duration_s: Number.isFinite(m.predicted.duration) ? r3(m.predicted.duration) : null, end: poseJson(m.predicted.end), ...(m.predicted.atRest ? { at_rest: true } : {}) } } : {}),
      ...(m.recorded ? {
        recorded: {
          start_s: r3(m.recorded.start), duration_s: r3(m.recorded.duration),
          ...(m.recorded.fromLine !== undefined ? { from_line: m.recorded.fromLine, to_line: m.recorded.toLine } : {}),
          end: poseJson(m.recorded.end), end_wheels: poseJson(m.recorded.endWheels),
          ...(m.recorded.endFused ? { end_fused: poseJson(m.recorded.endFused) } : {}),
        },
      } : {}),
      ...(m.vsPlanned ? { vs_planned: errJson(m.vsPlanned) } : {}),
      ...(m.vsPredicted ? { vs_predicted: errJson(m.vsPredicted) } : {}),
      ...(m.timeVsPlanned !== undefined ? { time_vs_planned_s: r3(m.timeVsPlanned) } : {}),
      ...(m.timeVsPredicted !== undefined ? { time_vs_predicted_s: r3(m.timeVsPredicted) } : {}),
      ...(m.markMet !== undefined ? { mark_met: m.markMet } : {}),
    })),
    fit: {
      params: Object.values(fit.params).map((p) => ({
        name: p.name, label: p.label, unit: p.unit, found: p.found, samples: p.samples,
        ...(p.value !== undefined ? { value: p.value } : {}),
        ...(p.se !== undefined ? { se: p.se } : {}),
        ...(p.low !== undefined && p.high !== undefined ? { low: p.low, high: p.high } : {}),
        ...(p.current !== undefined ? { current: p.current } : {}),
        ...(p.differs !== undefined ? { differs: p.differs } : {}),
        ...(p.note ? { note: p.note } : {}),
      })),
      notes: fit.notes,
    },
    setup_edits: edits.map((f) => ({
      title: f.title,
      ...(f.preferred ? { preferred: true } : {}),
      // 1-based lines and columns; the end column is just after the text replaced.
      edits: f.edits.map((e) => ({ line: e.range.start.line + 1, column: e.range.start.character + 1, end_line: e.range.end.line + 1, end_column: e.range.end.character + 1, new_text: e.newText })),
    })),
  };
}

function f(v: number, d: number): string {
  const s = v.toFixed(d);
  return s === `-${(0).toFixed(d)}` ? (0).toFixed(d) : s;
}

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

function lpad(s: string, n: number): string {
  return s.length >= n ? s : ' '.repeat(n - s.length) + s;
}

function errText(e: PoseError | undefined): string {
  return e ? `${lpad(f(e.position, 1), 6)} mm ${lpad(f(e.heading, 1), 6)}°` : lpad('—', 17);
}

function timeText(m: MotionComparison): string {
  const p = m.predicted && Number.isFinite(m.predicted.duration) ? f(m.predicted.duration, 2) : '—';
  const rec = m.recorded ? f(m.recorded.duration, 2) : 'not in log';
  return `${lpad(f(m.planned.duration, 2), 6)} ${lpad(p, 6)} ${lpad(rec, 10)}`;
}

export function replayText(planFile: string, logFile: string, r: Replay, fit: FitResult, edits: Fix[] = []): string {
  const c = r.comparison;
  const lines: string[] = [];
  const shifted = c.lineShift ? ` (read ${Math.abs(c.lineShift)} line${Math.abs(c.lineShift) === 1 ? '' : 's'} ${c.lineShift > 0 ? 'further down' : 'further up'}: the plan's motions have moved since the log was recorded)` : '';
  const how = c.alignedBy === 'line' ? `motions found by the log's line column${shifted}` : `motions found by aligning times (the run starts ${f(c.timeOffset ?? 0, 2)} s into the log, its times stretched ${f(c.timeScale ?? 1, 3)} times to the log's)`;
  lines.push(`${planFile}: run "${c.name}" against ${logFile}: ${r.log.run.samples.length} rows, ${f(c.recordedDuration, 2)} s; ${how}; the path from ${c.reconstruction === 'wheels' ? 'the wheels alone' : 'the wheels and the yaw'}`);
  for (const n of r.log.notes) lines.push(`  note: ${n}`);
  if (r.reconstruction.zeroings.length) lines.push(`  note: the yaw was zeroed ${r.reconstruction.zeroings.length} time${r.reconstruction.zeroings.length === 1 ? '' : 's'} (a jump of the reading while the wheels did not turn)`);
  lines.push('');
  lines.push(`${lpad('line', 4)}  ${pad('motion', 22)} ${lpad('time s: plan', 12)} ${lpad('pred.', 6)} ${lpad('log', 10)}   ${pad('end off the plan', 17)}   ${pad('off the prediction', 17)}`);
  const marks: string[] = [];
  for (const m of c.motions) {
    if (m.markMet !== undefined) marks.push(`${m.label} (line ${m.line}): the recorded run ${m.markMet ? 'meets it' : 'MISSES it'}`);
    if ((m.kind === 'mark' || m.kind === 'reset') && !m.recorded) continue;
    lines.push(`${lpad(String(m.line), 4)}  ${pad(m.label, 22)} ${lpad('', 6)}${timeText(m)}   ${errText(m.vsPlanned)}   ${errText(m.vsPredicted)}`);
  }
  const last = [...c.motions].reverse().find((m) => m.recorded);
  if (last?.predicted?.atRest) lines.push(`  (line ${last.line}, the log's last motion: its time and end run until the wheels come to rest, and its prediction is where the predicted robot comes to rest)`);
  if (marks.length) {
    lines.push('');
    lines.push(...marks);
  }
  if (last?.recorded) {
    lines.push('');
    const e = last.vsPlanned!;
    lines.push(`Run end (line ${last.line}): the log ends at (${f(last.recorded.end.x, 1)}, ${f(last.recorded.end.y, 1)}) heading ${f(last.recorded.end.heading, 1)}°, ${f(e.position, 1)} mm and ${f(e.heading, 1)}° off the plan${last.vsPredicted ? `, ${f(last.vsPredicted.position, 1)} mm and ${f(last.vsPredicted.heading, 1)}° off the prediction` : ''}.`);
    if (last.recorded.endFused) {
      const w = last.recorded.endWheels;
      lines.push(`  By the wheels alone it ends at (${f(w.x, 1)}, ${f(w.y, 1)}) heading ${f(w.heading, 1)}°: the gap between the two is what the wheels get wrong (track, unequal wheels, slip).`);
    }
  }
  lines.push(`Time: ${f(c.recordedDuration, 2)} s in the log; planned ${f(c.plannedDuration, 2)} s${c.predictedDuration !== undefined ? `, predicted ${f(c.predictedDuration, 2)} s` : ''}.`);
  lines.push('');
  lines.push('The robot model fitted to the log (95 % intervals; the editor offers the values as setup edits):');
  for (const p of Object.values(fit.params)) lines.push(`  ${fitLine(p)}`);
  for (const n of fit.notes) lines.push(`  note: ${n}`);
  if (edits.length) {
    lines.push('');
    lines.push('Setup edits the fit suggests (the editor applies them; apply one of the track and the gyro scale, not both):');
    for (const f of edits) lines.push(`  ${f.preferred ? '*' : '-'} ${f.title}`);
  }
  lines.push('');
  lines.push('Safety: try every change at low speed first and keep people clear of a moving robot.');
  return lines.join('\n') + '\n';
}

function fitLine(p: FitParam): string {
  // Enough digits that the interval's two ends differ: two significant digits of its half-width, in the unit shown.
  const scale = p.unit === 'fraction' ? 100 : p.unit === 's' ? 1000 : p.unit === 'deg/s' && p.name === 'drift' ? 60 : 1;
  const half = p.low !== undefined && p.high !== undefined ? ((p.high - p.low) / 2) * scale : 0;
  const least = p.unit === 'fraction' ? 1 : p.unit === 's' ? 0 : p.unit === 'deg/s' && p.name === 'drift' ? 2 : p.unit === 'deg/s' ? 0 : p.unit === 'mm' ? 1 : 4;
  const digits = half > 0 && Number.isFinite(half) ? Math.min(6, Math.max(least, 1 - Math.floor(Math.log10(half)))) : least;
  const show = (v: number) => (p.unit === 'fraction' ? `${f(v * 100, digits)} %` : p.unit === 's' ? `${f(v * 1000, digits)} ms` : p.unit === 'deg/s' && p.name === 'drift' ? `${f(v * 60, digits)} deg/min` : p.unit === 'deg/s' ? `${f(v, digits)} deg/s` : p.unit === 'mm' ? `${f(v, digits)} mm` : f(v, digits));
  if (!p.found || p.value === undefined) return `${pad(p.label, 16)} not found: ${p.note ?? 'this log cannot give it'}`;
  const range = p.low !== undefined && p.high !== undefined ? ` (${show(p.low)} to ${show(p.high)})` : '';
  const plan = p.current !== undefined ? `; the plan says ${show(p.current)}${p.differs ? ', outside the interval' : ''}` : '';
  return `${pad(p.label, 16)} ${show(p.value)}${range}${plan}`;
}
