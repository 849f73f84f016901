// Reading a recorded run (robot model, section 5): a delimited log, one row per
// sample, its columns found by header name or given by position, every value
// converted into Veer's units. Anything the reader cannot be sure of (a unit
// nobody named, a cell that is not a number, time that runs backwards, a gap)
// is an error naming the file's line and the column, never a guess.
import Papa from 'papaparse';
import { wrapReading } from '../solve/frame';
import { showText } from '../text';
import type { RecordedRun, RecordedSample } from './types';

/** What a column holds. */
export type ColumnRole = 'time' | 'left' | 'right' | 'yaw' | 'power-left' | 'power-right' | 'line';
export const COLUMN_ROLES: readonly ColumnRole[] = ['time', 'left', 'right', 'yaw', 'power-left', 'power-right', 'line'];

export type TimeUnit = 's' | 'ms';
export type WheelUnit = { kind: 'deg' } | { kind: 'rot' } | { kind: 'mm' } | { kind: 'counts'; perTurn: number };
export type YawUnit = 'deg' | 'rad';
export type YawSign = 'plan' | 'reversed';
export type PowerUnit = 'pct' | 'frac';

/**
 * How to read a log: the same choices as `veer replay`'s options and the log's
 * own settings comment (`# veer: wheel-units=deg yaw-units=rad`).
 */
export interface LogSettings {
  /** Roles by position, for a log without a header row (`-` skips a column). */
  columns?: Array<ColumnRole | '-'>;
  timeUnits?: TimeUnit;
  wheelUnits?: WheelUnit;
  yawUnits?: YawUnit;
  yawSign?: YawSign;
  powerUnits?: PowerUnit;
}

/** What the reader needs from the plan: wheel travel into mm, the yaw into the plan's range. */
export interface LogRobot {
  /** The left wheel's diameter, mm (undefined: the plan has none yet). */
  wheelDiameter?: number;
  /** Right wheel diameter over left. */
  mismatch: number;
  /** The low end of the plan's yaw range, degrees. */
  yawLo: number;
}

/** A problem in the log: `line` is the file's 1-based line, `column` the 1-based column. */
export class LogError extends Error {
  constructor(message: string, readonly line?: number, readonly column?: number) {
    super(message);
  }
}

export interface ReadLog {
  run: RecordedRun;
  /** The settings in force (the options given over the log's comment over the header's units). */
  settings: LogSettings;
  /** What the reader did that a person should know (columns left out, where units came from). */
  notes: string[];
}

/** The settings comment's prefix: `# veer: key=value ...`. */
export const SETTINGS_PREFIX = 'veer:';
/** Cap on rows (a log of 10 minutes at 1 kHz). */
export const MAX_LOG_ROWS = 1_000_000;
/** Rows read first, for the delimiter and the header. */
const HEAD_ROWS = 50;
/** A wheel faster than this (mm/s) between two rows means the unit is wrong. */
export const WHEEL_SPEED_LIMIT = 5000;

/** Parses one settings value (`deg`, `counts:360`, ...) into settings; throws a plain message on a bad one. */
export function parseSetting(key: string, value: string, into: LogSettings): void {
  const v = value.trim().toLowerCase();
  const bad = (choices: string) => new Error(`\`${key}\` takes ${choices}, not \`${showText(value, 40)}\``);
  switch (key) {
    case 'columns': {
      const roles = v.split(',').map((r) => r.trim());
      const unknown = roles.find((r) => r !== '-' && !(COLUMN_ROLES as readonly string[]).includes(normaliseRole(r) ?? ''));
      if (unknown !== undefined) throw new Error(`\`columns\` names each column by position with ${COLUMN_ROLES.join(', ')} or - (skip), e.g. \`time,left,right,yaw\`; \`${showText(unknown, 40)}\` is none of these`);
      const named = roles.filter((r) => r !== '-').map((r) => normaliseRole(r)!);
      const twice = named.find((r, i) => named.indexOf(r) !== i);
      if (twice) throw new Error(`\`columns\` names \`${twice}\` twice`);
      into.columns = roles.map((r) => (r === '-' ? '-' : normaliseRole(r)!));
      return;
    }
    case 'time-units':
      if (v !== 's' && v !== 'ms') throw bad('`s` or `ms`');
      into.timeUnits = v;
      return;
    case 'wheel-units': {
      const counts = /^counts:(\d+(?:\.\d+)?)$/.exec(v);
      if (counts) {
        const perTurn = Number(counts[1]);
        if (!(perTurn > 0)) throw new Error('`wheel-units counts:N` needs N > 0 counts per wheel turn');
        into.wheelUnits = { kind: 'counts', perTurn };
      } else if (v === 'deg' || v === 'rot' || v === 'mm') into.wheelUnits = { kind: v };
      else throw bad('`deg` (wheel degrees), `rot` (wheel turns), `mm` or `counts:N` (N counts per wheel turn)');
      return;
    }
    case 'yaw-units':
      if (v !== 'deg' && v !== 'rad') throw bad('`deg` or `rad`');
      into.yawUnits = v;
      return;
    case 'yaw-sign':
      if (v !== 'plan' && v !== 'reversed') throw bad('`plan` (positive the way the plan\'s `turns` go) or `reversed`');
      into.yawSign = v;
      return;
    case 'power-units':
      if (v !== 'pct' && v !== 'frac') throw bad('`pct` (-100 to 100) or `frac` (-1 to 1)');
      into.powerUnits = v;
      return;
    default:
      throw new Error(`unknown setting \`${showText(key, 40)}\`: the settings are columns, time-units, wheel-units, yaw-units, yaw-sign and power-units`);
  }
}

/** Writes settings back as the text of a settings comment (or of command-line options). */
export function settingsText(s: LogSettings): string[] {
  const out: string[] = [];
  if (s.columns) out.push(`columns=${s.columns.join(',')}`);
  if (s.timeUnits) out.push(`time-units=${s.timeUnits}`);
  if (s.wheelUnits) out.push(`wheel-units=${s.wheelUnits.kind === 'counts' ? `counts:${s.wheelUnits.perTurn}` : s.wheelUnits.kind}`);
  if (s.yawUnits) out.push(`yaw-units=${s.yawUnits}`);
  if (s.yawSign) out.push(`yaw-sign=${s.yawSign}`);
  if (s.powerUnits) out.push(`power-units=${s.powerUnits}`);
  return out;
}

function normaliseRole(name: string): ColumnRole | undefined {
  const n = name.trim().toLowerCase().replace(/[\s_-]+/g, '-');
  if (n === 't' || n === 'time') return 'time';
  if (n === 'left' || n === 'right' || n === 'yaw' || n === 'line') return n;
  if (n === 'power-left' || n === 'left-power') return 'power-left';
  if (n === 'power-right' || n === 'right-power') return 'power-right';
  return undefined;
}

/** A header cell: its role and the unit written with it (`left_deg`, `left [deg]`, `Left (rot)`). */
function headerCell(cell: string): { role?: ColumnRole; unit?: string } {
  const text = cell.trim().toLowerCase();
  const bracket = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]$/.exec(text);
  if (bracket) return { role: normaliseRole(bracket[1]), unit: bracket[2] };
  const whole = normaliseRole(text);
  if (whole) return { role: whole };
  const m = /^(.*?)[\s_-]+([a-z%]+)$/.exec(text);
  if (m) {
    const role = normaliseRole(m[1]);
    if (role) return { role, unit: m[2] };
  }
  return {};
}

interface Column {
  role: ColumnRole;
  index: number;
  name: string;
  /** The unit written in the header, if any. */
  headerUnit?: string;
}

function describe(c: Column): string {
  return `column ${c.index + 1} (${c.name})`;
}

const HEADER_UNITS: Record<ColumnRole, string[]> = {
  time: ['s', 'ms'],
  left: ['deg', 'rot', 'mm', 'counts'],
  right: ['deg', 'rot', 'mm', 'counts'],
  yaw: ['deg', 'rad'],
  'power-left': ['pct', '%', 'frac'],
  'power-right': ['pct', '%', 'frac'],
  line: [],
};

/**
 * Reads a log into a recorded run. `options` (the command line's, or the
 * editor's) take precedence over the log's settings comment, which takes
 * precedence over units written in the header. Throws a LogError naming the
 * line and column of the first problem.
 */
export function readLog(text: string, source: string, robot: LogRobot, options: LogSettings = {}): ReadLog {
  const notes: string[] = [];
  // The leading comment block: settings, and the lines to count.
  const lines = splitLeadingComments(text);
  const fromComment: LogSettings = {};
  for (const c of lines.comments) {
    const body = c.text.replace(/^#\s*/, '');
    if (!body.toLowerCase().startsWith(SETTINGS_PREFIX)) continue;
    for (const pair of body.slice(SETTINGS_PREFIX.length).trim().split(/\s+/).filter(Boolean)) {
      const eq = pair.indexOf('=');
      if (eq <= 0) throw new LogError(`line ${c.line}: the settings comment takes key=value pairs, e.g. \`# veer: wheel-units=deg yaw-units=deg\`; \`${showText(pair, 40)}\` has no \`=\``, c.line);
      try {
        parseSetting(pair.slice(0, eq).trim().toLowerCase(), pair.slice(eq + 1), fromComment);
      } catch (e) {
        throw new LogError(`line ${c.line}: ${(e as Error).message}`, c.line);
      }
    }
  }
  const settings: LogSettings = { ...fromComment, ...definedOnly(options) };

  // The first rows, for the delimiter and the header (or, with `columns`, the first row of data).
  const head = Papa.parse<string[]>(lines.rest, { delimiter: '', delimitersToGuess: [',', '\t', ';', '|'], skipEmptyLines: false, header: false, preview: HEAD_ROWS });
  const delimiter = head.meta.delimiter;
  const firstLine = lines.restLine;
  const rowLines: number[] = [];
  const rows: string[][] = [];
  const headAt = head.data.findIndex((r) => !skipped(r));
  if (headAt < 0) throw new LogError(`${source} has no rows of data${head.data.length >= HEAD_ROWS ? ` in its first ${HEAD_ROWS} lines after the comments` : ''}`);
  rows.push(head.data[headAt]);
  rowLines.push(firstLine + headAt);
  const headProblem = head.errors.find((e) => e.type === 'Quotes' && (e.row ?? 0) <= headAt);
  if (headProblem) throw quoteError(firstLine + (headProblem.row ?? 0), headProblem.message);

  // Columns: by position, or from the header row.
  let columns: Column[];
  let dataFrom: number;
  if (settings.columns) {
    const header = rows[0];
    const used = settings.columns.flatMap((role, index) => (role === '-' ? [] : [header[index] ?? '']));
    if (used.some((cell) => cell.trim() !== '' && !Number.isFinite(Number(cell)))) {
      throw new LogError(`line ${rowLines[0]}: \`columns\` says the log has no header row, but this row is not numbers (\`${showText(header.slice(0, 4).join(','), 60)}\`): leave \`columns\` out to read the header, or delete the row`, rowLines[0]);
    }
    columns = settings.columns.flatMap((role, index) => (role === '-' ? [] : [{ role, index, name: role }]));
    dataFrom = 0;
  } else {
    const header = rows[0];
    if (header.every((cell) => cell.trim() === '' || Number.isFinite(Number(cell)))) {
      throw new LogError(`line ${rowLines[0]}: the log has no header row: name the columns in the first row (e.g. \`time_s,left_deg,right_deg,yaw_deg\`) or give them by position (\`--columns time,left,right,yaw\`, or \`# veer: columns=time,left,right,yaw\`)`, rowLines[0]);
    }
    columns = [];
    const ignored: string[] = [];
    header.forEach((cell, index) => {
      const { role, unit } = headerCell(cell);
      if (!role) {
        ignored.push(`${index + 1} (${showText(cell.trim(), 40) || 'no name'})`);
        return;
      }
      const twice = columns.find((c) => c.role === role);
      if (twice) throw new LogError(`line ${rowLines[0]}, column ${index + 1} (${showText(cell.trim(), 40)}): a second ${role} column (the first is column ${twice.index + 1}); keep one`, rowLines[0], index + 1);
      if (unit !== undefined && !HEADER_UNITS[role].includes(unit)) {
        throw new LogError(`line ${rowLines[0]}, column ${index + 1} (${showText(cell.trim(), 40)}): unknown unit \`${showText(unit, 20)}\` for ${role}; use ${HEADER_UNITS[role].join(', ') || 'no unit'}`, rowLines[0], index + 1);
      }
      columns.push({ role, index, name: showText(cell.trim(), 40), headerUnit: unit });
    });
    if (ignored.length) notes.push(`columns left out (not a name Veer reads): ${ignored.join(', ')}`);
    dataFrom = 1;
  }
  const col = (role: ColumnRole) => columns.find((c) => c.role === role);
  const time = col('time');
  const left = col('left');
  const right = col('right');
  const missing = (['time', 'left', 'right'] as const).filter((r) => !col(r));
  if (!time || !left || !right) {
    const where = settings.columns ? 'in `columns`' : `in the header (line ${rowLines[0]})`;
    throw new LogError(`the log has no ${missing.join(', no ')} column ${where}: a recorded run needs time, left and right wheel travel (header names time, left, right; units as in time_s, left_deg)`, rowLines[0]);
  }
  const yaw = col('yaw');
  const pl = col('power-left');
  const pr = col('power-right');
  if (!!pl !== !!pr) {
    const one = (pl ?? pr)!;
    throw new LogError(`line ${rowLines[0]}, ${describe(one)}: a log with powers needs both power-left and power-right`, rowLines[0], one.index + 1);
  }
  const lineCol = col('line');

  // Units: options and comment over header.
  const headerLine = settings.columns ? undefined : rowLines[0];
  const timeUnit = unitOf(time, settings.timeUnits, 'time-units', 's or ms, e.g. `time_s` or `time_ms`', headerLine) as TimeUnit;
  const wheelUnitOf = (c: Column): WheelUnit => {
    if (settings.wheelUnits) {
      if (c.headerUnit && c.headerUnit !== settings.wheelUnits.kind) throw conflict(c, settings.wheelUnits.kind, headerLine);
      return settings.wheelUnits;
    }
    if (!c.headerUnit) throw noUnit(c, 'wheel-units', '`deg`, `rot`, `mm` or `counts:N`, e.g. `left_deg`', headerLine);
    if (c.headerUnit === 'counts') throw new LogError(`${where(headerLine, c)}: counts need the counts per wheel turn: add \`wheel-units=counts:N\` to the log's settings comment (or pass \`--wheel-units counts:N\`)`, headerLine, c.index + 1);
    return { kind: c.headerUnit as 'deg' | 'rot' | 'mm' };
  };
  const leftUnit = wheelUnitOf(left);
  const rightUnit = wheelUnitOf(right);
  const yawUnit = yaw ? (unitOf(yaw, settings.yawUnits, 'yaw-units', 'deg or rad, e.g. `yaw_deg`', headerLine) as YawUnit) : undefined;
  const powerUnit = pl && pr ? (unitOf(pl, settings.powerUnits, 'power-units', 'pct or frac, e.g. `power_left_pct`', headerLine, { '%': 'pct' }) as PowerUnit) : undefined;
  if (pl && pr && !settings.powerUnits) {
    const other = unitOf(pr, undefined, 'power-units', 'pct or frac', headerLine, { '%': 'pct' });
    if (other !== powerUnit) throw new LogError(`${where(headerLine, pr)}: the two power columns have different units (${powerUnit}, ${other}); give both the same`, headerLine, pr.index + 1);
  }
  const yawSign = settings.yawSign ?? 'plan';
  const resolved: LogSettings = { timeUnits: timeUnit, wheelUnits: leftUnit, ...(yawUnit ? { yawUnits: yawUnit, yawSign } : {}), ...(powerUnit ? { powerUnits: powerUnit } : {}), ...(settings.columns ? { columns: settings.columns } : {}) };
  if (leftUnit.kind !== rightUnit.kind) notes.push(`the wheels' columns have different units (${leftUnit.kind}, ${rightUnit.kind})`);

  const toMm = (unit: WheelUnit, right: boolean, c: Column): number => {
    if (unit.kind === 'mm') return 1;
    const d = robot.wheelDiameter;
    if (d === undefined || !(d > 0)) throw new LogError(`${describe(c)}: wheel travel in ${unit.kind} needs the plan's \`wheel\` diameter; add a \`wheel\` line to the plan`, undefined, c.index + 1);
    const circumference = Math.PI * d * (right ? robot.mismatch : 1);
    return unit.kind === 'deg' ? circumference / 360 : unit.kind === 'rot' ? circumference : circumference / unit.perTurn;
  };
  const kL = toMm(leftUnit, false, left);
  const kR = toMm(rightUnit, true, right);
  const kT = timeUnit === 'ms' ? 1e-3 : 1;
  const kYaw = yawUnit === 'rad' ? 180 / Math.PI : 1;
  const sYaw = yawSign === 'reversed' ? -1 : 1;
  const kP = powerUnit === 'pct' ? 0.01 : 1;

  const width = Math.max(...columns.map((c) => c.index)) + 1;
  const samples: RecordedSample[] = [];
  const dataLines: number[] = [];
  let t0 = 0;
  let l0 = 0;
  let r0 = 0;
  const num = (row: string[], c: Column, line: number): number => {
    const cell = row[c.index];
    const v = cell === undefined ? NaN : parseNumber(cell);
    // `+''` and `+' '` are 0: an empty cell is told apart only when the number is 0.
    if (v - v !== 0 || (v === 0 && cell.trim() === '')) {
      throw new LogError(`line ${line}, ${describe(c)}: ${cell === undefined || cell.trim() === '' ? 'the cell is empty' : `\`${showText(cell, 40)}\` is not a number`}; every row needs a number there`, line, c.index + 1);
    }
    return v;
  };
  // Each row is converted as the parser reads it and then dropped (a 100,000-row log is 700,000 cells).
  const processRow = (row: string[], line: number): void => {
    const i = samples.length;
    if (i >= MAX_LOG_ROWS) throw new LogError(`${source} has more than ${MAX_LOG_ROWS.toLocaleString('en-US')} rows; Veer reads at most that many (cut the log to the run)`, line);
    if (row.length < width) throw new LogError(`line ${line}: ${row.length} column${row.length === 1 ? '' : 's'}, but the log needs ${width} (column ${row.length + 1} is missing)`, line, row.length + 1);
    const t = num(row, time, line) * kT;
    const l = num(row, left, line) * kL;
    const r = num(row, right, line) * kR;
    if (i === 0) {
      t0 = t;
      l0 = l;
      r0 = r;
    }
    // Every sample has every field (undefined where the log has no such column): one object shape for the whole run.
    const s: RecordedSample = {
      t: t - t0, left: l - l0, right: r - r0,
      yaw: yaw ? wrapReading(sYaw * num(row, yaw, line) * kYaw, robot.yawLo) : undefined,
      powerLeft: undefined, powerRight: undefined, line: undefined,
    };
    if (pl && pr) {
      const a = num(row, pl, line) * kP;
      const b = num(row, pr, line) * kP;
      if (Math.abs(a) > 1 + 1e-9 || Math.abs(b) > 1 + 1e-9) {
        const c = Math.abs(a) > 1 + 1e-9 ? pl : pr;
        {
          throw new LogError(`line ${line}, ${describe(c)}: power ${num(row, c, line)} is beyond full power (${powerUnit === 'pct' ? '-100 to 100 %' : '-1 to 1'})${powerUnit === 'frac' ? '; are the powers in per cent? (power-units=pct)' : ''}`, line, c.index + 1);
        }
      }
      s.powerLeft = a;
      s.powerRight = b;
    }
    if (lineCol) {
      const v = num(row, lineCol, line);
      if (!Number.isInteger(v) || v < 1) throw new LogError(`line ${line}, ${describe(lineCol)}: \`${showText(row[lineCol.index], 20)}\` is not a plan line (a whole number from 1)`, line, lineCol.index + 1);
      s.line = v;
    }
    if (i > 0) {
      const prev = samples[i - 1];
      const dt = s.t - prev.t;
      if (!(dt > 0)) {
        throw new LogError(`line ${line}, ${describe(time)}: time ${fmt(t / kT)} is ${dt === 0 ? 'the same as' : 'before'} the row before's (${fmt((prev.t + t0) / kT)}); rows must be in time order, one per sample`, line, time.index + 1);
      }
      const dl = Math.abs(s.left - prev.left);
      const dr = Math.abs(s.right - prev.right);
      if (dl > WHEEL_SPEED_LIMIT * dt || dr > WHEEL_SPEED_LIMIT * dt) {
        const c = dl > WHEEL_SPEED_LIMIT * dt ? left : right;
        const d = c === left ? dl : dr;
        {
          throw new LogError(`line ${line}, ${describe(c)}: the wheel moved ${fmt(Math.abs(d))} mm in ${fmt(dt)} s (${fmt(Math.abs(d) / dt / 1000)} m/s) as read in ${unitName(c === left ? leftUnit : rightUnit)}: is that the column's unit (wheel-units), and the time's (time-units)?`, line, c.index + 1);
        }
      }
    }
    samples.push(s);
    dataLines.push(line);
  };
  let index = 0;
  let failure: unknown;
  Papa.parse<string[]>(lines.rest, {
    delimiter, skipEmptyLines: false, header: false,
    step: (results, parser) => {
      const line = firstLine + index++;
      if (line < rowLines[0] + dataFrom || failure !== undefined) return;
      try {
        const quotes = results.errors.length ? results.errors.find((e) => e.type === 'Quotes') : undefined;
        if (quotes) throw quoteError(line, quotes.message);
        if (!skipped(results.data)) processRow(results.data, line);
      } catch (e) {
        failure = e;
        parser.abort();
      }
    },
  });
  if (failure !== undefined) throw failure;
  const count = samples.length;
  if (count < 2) throw new LogError(`${source} has ${count === 0 ? 'no rows' : 'one row'} of data${dataFrom ? ' after the header' : ''}: a recorded run needs at least two`);
  checkGaps(samples, dataLines, 0, time, t0, kT);
  const at = (c: Column | undefined) => (c ? c.index + 1 : undefined);
  const run: RecordedRun = {
    samples, hasYaw: !!yaw, hasPower: !!(pl && pr), hasLine: !!lineCol, source,
    fileLines: dataLines,
    columns: { time: at(time), left: at(left), right: at(right), yaw: at(yaw), powerLeft: at(pl), powerRight: at(pr), line: at(lineCol) },
  };
  return { run, settings: resolved, notes };
}

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * A cell as a number, exactly as `+cell` reads it. Plain decimals of at most
 * 15 digits (what logs hold) are read digit by digit: the digits as a whole
 * number below 2^53 and one division by an exact power of ten give the
 * correctly rounded value (Clinger's fast path, "How to read floating point
 * numbers accurately", 1990); anything else (exponents, more digits, spaces,
 * words) goes to `+cell`. Several times faster on a 100,000-row log.
 */
export function parseNumber(cell: string): number {
  const n = cell.length;
  if (n === 0 || n > 17) return +cell;
  let i = 0;
  let c = cell.charCodeAt(0);
  const negative = c === 45; // -
  if (negative || c === 43) i = 1; // +
  let m = 0;
  let digits = 0;
  let frac = -1;
  for (; i < n; i++) {
    c = cell.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      digits++;
      if (frac >= 0) frac++;
    } else if (c === 46 && frac < 0) frac = 0; // .
    else return +cell;
  }
  if (digits === 0 || digits > 15) return +cell;
  const v = frac > 0 ? m / POW10[frac] : m;
  return negative ? -v : v;
}

/** A blank row, or a comment after the leading block. */
function skipped(r: string[]): boolean {
  if (r.length === 0 || (r.length === 1 && r[0].trim() === '')) return true;
  const first = r[0];
  const c = first.charCodeAt(0);
  return c === 35 /* # */ || ((c === 32 || c === 9) && first.trimStart().startsWith('#'));
}

function quoteError(line: number, message: string): LogError {
  return new LogError(`line ${line}: ${message.toLowerCase()}; check the quotes on that line`, line);
}

/** A gap: more than 10 typical intervals and more than 0.1 s without a row. */
function checkGaps(samples: RecordedSample[], rowLines: number[], dataFrom: number, time: Column, t0: number, kT: number): void {
  const n = samples.length;
  // The median interval, from a spread of up to 1,001 intervals.
  const stride = Math.max(1, Math.floor((n - 1) / 1000));
  const dts: number[] = [];
  for (let i = 1; i < n; i += stride) dts.push(samples[i].t - samples[i - 1].t);
  dts.sort((a, b) => a - b);
  const median = dts[Math.floor(dts.length / 2)];
  const limit = Math.max(10 * median, 0.1);
  for (let i = 1; i < n; i++) {
    const dt = samples[i].t - samples[i - 1].t;
    if (dt > limit) {
      const line = rowLines[dataFrom + i];
      throw new LogError(`line ${line}, ${describe(time)}: ${fmt(dt)} s without a row since ${fmt((samples[i - 1].t + t0) / kT)} (the log's usual interval is ${fmt(median)} s): the log has a gap, and the path across it cannot be reconstructed; record without pauses, or cut the log before the gap`, line, time.index + 1);
    }
  }
}

function unitOf(c: Column, setting: string | undefined, key: string, choices: string, headerLine: number | undefined, aliases: Record<string, string> = {}): string {
  const header = c.headerUnit !== undefined ? aliases[c.headerUnit] ?? c.headerUnit : undefined;
  if (setting !== undefined) {
    if (header !== undefined && header !== setting) throw conflict(c, setting, headerLine);
    return setting;
  }
  if (header === undefined) throw noUnit(c, key, choices, headerLine);
  return header;
}

function where(headerLine: number | undefined, c: Column): string {
  return headerLine !== undefined ? `line ${headerLine}, ${describe(c)}` : describe(c);
}

function conflict(c: Column, setting: string, headerLine: number | undefined): LogError {
  return new LogError(`${where(headerLine, c)}: the header says ${c.headerUnit}, the settings say ${setting}; make them agree (the settings come from the command line or the log's \`# veer:\` comment)`, headerLine, c.index + 1);
}

function noUnit(c: Column, key: string, choices: string, headerLine: number | undefined): LogError {
  return new LogError(`${where(headerLine, c)}: the unit of ${c.role} is not given: write it in the header (${choices}), in the log's settings comment (\`# veer: ${key}=...\`), or pass \`--${key}\``, headerLine, c.index + 1);
}

function unitName(u: WheelUnit): string {
  return u.kind === 'counts' ? `counts (${u.perTurn} a turn)` : u.kind === 'deg' ? 'wheel degrees' : u.kind === 'rot' ? 'wheel turns' : 'mm';
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

function definedOnly(s: LogSettings): LogSettings {
  return Object.fromEntries(Object.entries(s).filter(([, v]) => v !== undefined)) as LogSettings;
}

/** The comment lines at the top (with their 1-based lines) and the rest of the text with the line it starts on. */
function splitLeadingComments(text: string): { comments: Array<{ line: number; text: string }>; rest: string; restLine: number } {
  const comments: Array<{ line: number; text: string }> = [];
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  for (;;) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = text.length;
    const raw = text.slice(pos, end).replace(/\r$/, '');
    const trimmed = raw.trim();
    if (trimmed.startsWith('#') || (trimmed === '' && end < text.length)) {
      if (trimmed) comments.push({ line, text: trimmed });
      pos = end + 1;
      line++;
      if (pos > text.length) return { comments, rest: '', restLine: line };
      continue;
    }
    return { comments, rest: text.slice(pos), restLine: line };
  }
}
