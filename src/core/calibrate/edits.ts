// The calibrated values as edits of the plan's setup lines (`wheel`, `track`,
// `gyro`): text edits the editor applies as one undoable change and the
// command line prints as the lines to write.
import type { CheckResult, ExprNode, Fix, GyroStmt, LengthUnitName, Range, Statement, TextEdit, TrackStmt, WheelStmt } from '../types';
import type { CalibrationResult } from './compute';
import type { Estimate } from './stats';

const MM_PER: Record<LengthUnitName, number> = { mm: 1, cm: 10, m: 1000, in: 25.4 };
const LENGTH_DECIMALS: Record<LengthUnitName, number> = { mm: 3, cm: 4, m: 6, in: 5 };

export interface SetupEdits {
  /** One fix per calibrated value (its title says where it comes from); the editor offers each. */
  fixes: Fix[];
  /** Every value at once, preferred; absent when there is at most one. */
  all?: Fix;
  /** The setup lines as they read after every edit (for the command line). */
  lines: string[];
}

/** Up to `decimals` decimals, without trailing zeros. */
export function decimals(v: number, n: number): string {
  const t = v.toFixed(n).replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
  return t === '-0' ? '0' : t;
}

/** A length for a setup line: bare in the file's unit when the old value was bare, in mm otherwise. */
function lengthText(mm: number, unit: LengthUnitName, old?: ExprNode): string {
  const bare = !old || /^[\d.\s]+$/.test(old.text);
  if (bare) return decimals(mm / MM_PER[unit], LENGTH_DECIMALS[unit]);
  return `${decimals(mm, 3)} mm`;
}

function within(e: Estimate, digits: number, unit = ''): string {
  return `±${decimals(e.half95, digits)}${unit} at 95 %`;
}

function insertAfter(range: Range, text: string): TextEdit {
  return { range: { start: range.end, end: range.end }, newText: text };
}

/** Replace an option's value, or add the option after the statement's last token. */
function setOption(stmt: Statement, value: ExprNode | undefined, option: string, text: string): TextEdit {
  if (value) return { range: value.range, newText: text };
  return insertAfter(stmt.range, ` ${option} ${text}`);
}

export function setupEdits(result: CheckResult, text: string, calibration: CalibrationResult): SetupEdits {
  const unit = result.setup.lengthUnit;
  const find = <K extends Statement['kind']>(kind: K) => result.ast.statements.find((s): s is Extract<Statement, { kind: K }> => s.kind === kind);
  const wheel = find('wheel') as WheelStmt | undefined;
  const track = find('track') as TrackStmt | undefined;
  const gyro = find('gyro') as GyroStmt | undefined;
  const fixes: Fix[] = [];
  const c = calibration;
  const unitLabel = unit;

  if (wheel) {
    const edits: TextEdit[] = [];
    const parts: string[] = [];
    if (c.wheel) {
      const d = c.wheel.diameter;
      edits.push({ range: wheel.diameter.range, newText: lengthText(d.value, unit, wheel.diameter) });
      parts.push(`the wheel to ${decimals(d.value / MM_PER[unit], LENGTH_DECIMALS[unit] - 1)} ${unitLabel} (${c.wheel.ratio.n} drives, ${within({ ...d, half95: d.half95 / MM_PER[unit] }, LENGTH_DECIMALS[unit] - 1, ` ${unitLabel}`)})`);
    }
    if (c.square) {
      edits.push(setOption(wheel, wheel.mismatch, 'mismatch', decimals(c.square.mismatch.value, 6)));
      parts.push(`the mismatch to ${decimals(c.square.mismatch.value, 6)} (square test, ${within(c.square.mismatch, 6)})`);
    }
    if (edits.length) fixes.push({ title: `Set ${parts.join(' and ')}`, edits, changesPath: true });
  }
  if (track) {
    const effective = (e: Estimate, from: string) => {
      const text = lengthText(e.value, unit, track.effective ?? track.width);
      fixes.push({
        title: `Set the effective track to ${decimals(e.value / MM_PER[unit], LENGTH_DECIMALS[unit] - 1)} ${unitLabel} (${from}, ${within({ ...e, half95: e.half95 / MM_PER[unit] }, LENGTH_DECIMALS[unit] - 1, ` ${unitLabel}`)})`,
        edits: [setOption(track, track.effective, 'effective', text)],
        changesPath: true,
      });
      return fixes[fixes.length - 1];
    };
    const fromSpins = c.spin && effective(c.spin.track, `${c.spin.ratio.n} spins by encoders`);
    const fromSquare = c.square && effective(c.square.track, 'square test');
    // The narrower interval is the one to prefer.
    if (fromSpins && fromSquare) (c.spin!.track.half95 <= c.square!.track.half95 ? fromSpins : fromSquare).preferred = true;
  }
  if (c.gyro) {
    const text = decimals(c.gyro.scale.value, 5);
    const title = `Set the gyro's scale to ${text} (${c.gyro.scale.n} trials, ${within(c.gyro.scale, 5)})`;
    if (gyro) fixes.push({ title, edits: [setOption(gyro, gyro.scale, 'scale', text)], changesPath: true });
    else {
      // A new `gyro` line under the track (or the wheel): setup lines stay together.
      const below = track ?? wheel;
      const line = below ? below.line + 1 : 0;
      fixes.push({ title, edits: [{ range: { start: { line, character: 0 }, end: { line, character: 0 } }, newText: `gyro scale ${text}\n` }], changesPath: true });
    }
  }

  // Everything at once: the wheel's fix, the preferred track, the gyro. Edits on one statement merge in order.
  const chosen = fixes.filter((f, i) => !(f.title.startsWith('Set the effective track') && fixes.some((g, j) => j !== i && g.title.startsWith('Set the effective track') && g.preferred && !f.preferred)));
  const all = chosen.length > 1 ? { title: `Set every calibrated value (${chosen.length} setup changes)`, edits: chosen.flatMap((f) => f.edits), preferred: true, changesPath: true } : undefined;
  if (!all && chosen.length === 1) chosen[0].preferred = true;
  return { fixes, ...(all ? { all } : {}), lines: linesAfter(result, text, all ?? chosen[0]) };
}

/** The setup lines the fix touches, as they read after it. */
function linesAfter(result: CheckResult, text: string, fix: Fix | undefined): string[] {
  if (!fix) return [];
  const lines = text.split(/\r\n|\r|\n/);
  const kinds = new Set(['wheel', 'track', 'gyro']);
  const out: string[] = [];
  const byLine = new Map<number, TextEdit[]>();
  // A whole new line (it ends with a line break) is listed as it is; the others edit their statement.
  const inserted = fix.edits.filter((e) => e.newText.endsWith('\n'));
  for (const e of fix.edits) if (!inserted.includes(e)) byLine.set(e.range.start.line, [...(byLine.get(e.range.start.line) ?? []), e]);
  for (const s of result.ast.statements) {
    if (!kinds.has(s.kind)) continue;
    const edits = byLine.get(s.line);
    if (!edits) continue;
    byLine.delete(s.line);
    out.push(applyToStatement(s, lines[s.line] ?? '', edits));
  }
  for (const e of inserted) out.push(e.newText.trim());
  return out;
}

/** The statement's text with the edits on its own line applied. */
function applyToStatement(s: Statement, lineText: string, edits: TextEdit[]): string {
  let out = lineText.slice(s.range.start.character, s.range.end.character);
  for (const e of [...edits].sort((a, b) => b.range.start.character - a.range.start.character)) {
    const from = e.range.start.character - s.range.start.character;
    const to = e.range.end.character - s.range.start.character;
    out = out.slice(0, from) + e.newText + out.slice(to);
  }
  return out;
}
