// The targets table: one row per motion, the numbers the robot's code needs
// (start time, duration, wheel and motor degrees, yaw target, power and
// speed), as plain data and as text, CSV and Markdown. The command line's
// `veer targets` and the preview's table both come from here.
import type { CheckResult, Segment } from './types';
import { lineStartOffsets } from './text';
import { DIGITS, formatNumber, round3 } from './format';

export interface TargetRow {
  /** 1-based line of the motion. */
  line: number;
  /** The statement as written (comments left out). */
  motion: string;
  kind: Segment['kind'];
  start_s: number;
  duration_s: number | null;
  /** The controller simulation's time for the motion (null: it never ends). */
  predicted_s?: number | null;
  left_wheel_deg?: number;
  right_wheel_deg?: number;
  left_motor_deg?: number;
  right_motor_deg?: number;
  yaw_target_deg?: number;
  power_pct?: number;
  min_power_pct?: number;
  speed_mm_s?: number;
}

export interface TargetTable {
  run: string;
  rows: TargetRow[];
}

export interface TargetsDocument {
  file: string;
  title: string;
  runs: TargetTable[];
}

/** Segments that are something the robot's code does (the start and marks are places, not motions). */
const IN_TABLE: ReadonlySet<Segment['kind']> = new Set(['drive', 'turn', 'square', 'wait', 'reset']);

/** The targets of every run (or of run `run`, by index). */
export function targetTables(result: CheckResult, text: string, run?: number): TargetTable[] {
  const starts = lineStartOffsets(text);
  const statementText = (line: number): string => {
    const stmt = result.ast.statements.find((s) => s.line === line);
    if (!stmt) return '';
    const from = starts[line] + stmt.range.start.character;
    return text.slice(from, starts[line] + stmt.range.end.character).trim();
  };
  const runs = run === undefined ? result.runs : result.runs.slice(run, run + 1);
  return runs.map((r) => {
    let clock = 0;
    const rows: TargetRow[] = [];
    for (const seg of r.segments) {
      const startAt = clock;
      clock += seg.duration;
      if (!IN_TABLE.has(seg.kind)) continue;
      const row: TargetRow = {
        line: seg.line + 1,
        motion: statementText(seg.line),
        kind: seg.kind,
        start_s: round3(startAt),
        duration_s: Number.isFinite(seg.duration) ? round3(seg.duration) : null,
      };
      if (seg.predicted) row.predicted_s = Number.isFinite(seg.predicted.duration) && !seg.predicted.capped ? round3(seg.predicted.duration) : null;
      if (seg.wheelDeg) {
        row.left_wheel_deg = round3(seg.wheelDeg.left);
        row.right_wheel_deg = round3(seg.wheelDeg.right);
      }
      if (seg.motorDeg) {
        row.left_motor_deg = round3(seg.motorDeg.left);
        row.right_motor_deg = round3(seg.motorDeg.right);
      }
      if (seg.yawTarget !== undefined) row.yaw_target_deg = round3(seg.yawTarget);
      if (seg.power !== undefined) row.power_pct = round3(seg.power * 100);
      if (seg.minPower !== undefined) row.min_power_pct = round3(seg.minPower * 100);
      if (seg.wheelSpeed !== undefined) row.speed_mm_s = round3(seg.wheelSpeed);
      rows.push(row);
    }
    return { run: r.name, rows };
  });
}

export function targetsDocument(file: string, result: CheckResult, text: string, run?: number): TargetsDocument {
  return { file, title: result.setup.title, runs: targetTables(result, text, run) };
}

/** The columns, in order, with the headers and explanations every surface shows (text, Markdown, the preview). */
export const TARGET_COLUMNS: readonly { key: keyof TargetRow; header: string; title: string }[] = [
  { key: 'line', header: 'Line', title: 'The plan line' },
  { key: 'motion', header: 'Motion', title: 'The line as written' },
  { key: 'start_s', header: 'Start (s)', title: 'When the motion starts, from the start of the run' },
  { key: 'duration_s', header: 'Time (s)', title: 'How long the motion takes (a gyro turn: as simulated)' },
  { key: 'predicted_s', header: 'Predicted (s)', title: 'How long the real robot takes, from the controller simulation (motor lag, stall, the control loop), starting where the previous motion really ended' },
  { key: 'left_wheel_deg', header: 'Wheel L (°)', title: 'Left wheel rotation, degrees' },
  { key: 'right_wheel_deg', header: 'Wheel R (°)', title: 'Right wheel rotation, degrees' },
  { key: 'left_motor_deg', header: 'Motor L (°)', title: 'Left motor target, degrees: with the gear and, for encoder turns, the effective track' },
  { key: 'right_motor_deg', header: 'Motor R (°)', title: 'Right motor target, degrees: with the gear and, for encoder turns, the effective track' },
  { key: 'yaw_target_deg', header: 'Yaw target (°)', title: 'The reading the robot\'s code steers to' },
  { key: 'power_pct', header: 'Power (%)', title: 'Top power' },
  { key: 'min_power_pct', header: 'Min (%)', title: 'Lowest power of a gyro or ramped turn' },
  { key: 'speed_mm_s', header: 'Speed (mm/s)', title: 'Wheel speed at the top power' },
];

/** Decimals of each column where a person reads it (text tables; CSV and JSON keep three). */
function columnDigits(key: keyof TargetRow): number {
  if (key === 'start_s' || key === 'duration_s' || key === 'predicted_s') return DIGITS.time;
  if (key === 'speed_mm_s') return DIGITS.speed;
  if (key === 'power_pct' || key === 'min_power_pct') return DIGITS.power;
  return DIGITS.angle;
}

function cell(row: TargetRow, key: keyof TargetRow): string {
  const v = row[key];
  if (v === undefined || v === null) return '';
  return typeof v === 'number' ? String(v) : v;
}

/** A cell as a person reads it: the same rounding as every other surface. */
export function readableCell(row: TargetRow, key: keyof TargetRow): string {
  const v = row[key];
  if (v === undefined || v === null) return key === 'duration_s' ? '?' : key === 'predicted_s' && v === null ? 'never' : '';
  return typeof v === 'number' ? (key === 'line' ? String(v) : formatNumber(v, columnDigits(key))) : v;
}

/** RFC 4180 CSV: a header row, then one row per motion; a `run` column first. */
export function targetsCsv(tables: readonly TargetTable[]): string {
  const quote = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const header = ['run', ...TARGET_COLUMNS.map((c) => c.key)].join(',');
  const lines = [header];
  for (const t of tables) for (const row of t.rows) lines.push([quote(t.run), ...TARGET_COLUMNS.map((c) => quote(cell(row, c.key)))].join(','));
  return `${lines.join('\r\n')}\r\n`;
}

/** A Markdown table per run, under its name. */
export function targetsMarkdown(tables: readonly TargetTable[]): string {
  const esc = (s: string) => s.replace(/\|/g, '\\|');
  return tables.map((t) => [
    `### ${esc(t.run)}`,
    '',
    `| ${TARGET_COLUMNS.map((c) => c.header).join(' | ')} |`,
    `|${TARGET_COLUMNS.map((c) => (c.key === 'motion' ? ' --- ' : ' ---: ')).join('|')}|`,
    ...t.rows.map((row) => `| ${TARGET_COLUMNS.map((c) => esc(c.key === 'motion' ? `\`${cell(row, c.key)}\`` : readableCell(row, c.key))).join(' | ')} |`),
  ].join('\n')).join('\n\n') + '\n';
}

/** Aligned plain text for a terminal: a heading per run, then the columns. */
export function targetsText(tables: readonly TargetTable[]): string {
  const out: string[] = [];
  for (const t of tables) {
    out.push(`run "${t.run}"`);
    const rows = [TARGET_COLUMNS.map((c) => c.header), ...t.rows.map((row) => TARGET_COLUMNS.map((c) => readableCell(row, c.key)))];
    const widths = TARGET_COLUMNS.map((_, i) => Math.max(...rows.map((r) => r[i].length)));
    for (const r of rows) out.push(r.map((v, i) => (TARGET_COLUMNS[i].key === 'motion' ? v.padEnd(widths[i]) : v.padStart(widths[i]))).join('  ').trimEnd());
    out.push('');
  }
  return out.join('\n');
}
