// Settings the simulation shows work: for a gyro turn that overshoots its stop
// band or stalls short of it, other `min`, `gain`, `speed` or `ramp` values,
// each tried by simulating the motion again from where it really starts.
import type { Fix, Segment, TextEdit, TurnStmt } from '../types';
import { fmt } from '../units/evaluate';
import { retryGyroTurn, simRecordOf, type GyroSettings } from './run';

export interface Tuning {
  option: 'min' | 'gain' | 'speed' | 'ramp' | 'stop';
  /** The new value: a fraction for `min`/`speed`, % per degree for `gain`, degrees for `stop`; absent for `ramp`. */
  value?: number;
  overshoot: number;
  duration: number;
}

/** What a good fix leaves of the stop band: the overshoot stays below this share of it. */
const MARGIN = 0.8;
/** The widest stop band a fix suggests, degrees. */
const MAX_STOP = 10;

/** Settings that bring the turn's predicted overshoot inside its stop band without a stall, quickest first. */
export function tuneGyroTurn(seg: Segment): Tuning[] {
  const rec = simRecordOf(seg);
  if (!rec || rec.motion.kind !== 'gyro-turn') return [];
  const m = rec.motion;
  const stall = rec.robot.stall;
  const found: Tuning[] = [];
  const works = (patch: Partial<GyroSettings>) => {
    const r = retryGyroTurn(seg, patch);
    return r && r.outcome.finished && r.overshoot <= MARGIN * m.stop && r.overshoot >= -m.stop ? r : undefined;
  };
  // A lower floor: the highest whole percent that works (the least slowdown).
  for (let pct = Math.floor(m.min * 100 - 1e-9); pct >= 1 && pct / 100 > stall; pct--) {
    const r = works({ min: pct / 100 });
    if (r) { found.push({ option: 'min', value: pct / 100, overshoot: r.overshoot, duration: r.duration }); break; }
  }
  // A lower gain, in steps of a tenth of the present one.
  for (let k = 9; k >= 1; k--) {
    const gain = roundTo((m.gain * 100 * k) / 10, 2);
    if (!(gain > 0) || gain >= m.gain * 100) continue;
    const r = works({ gain: gain / 100 });
    if (r) { found.push({ option: 'gain', value: gain, overshoot: r.overshoot, duration: r.duration }); break; }
  }
  // Slower near the end: the ramp's power falls back to `min` at the target.
  if (!m.ramp) {
    const r = works({ ramp: true });
    if (r) found.push({ option: 'ramp', overshoot: r.overshoot, duration: r.duration });
  }
  // A lower top power, in whole 5 % steps.
  for (let pct = Math.ceil(m.power * 20 - 1e-9) * 5 - 5; pct / 100 > Math.max(m.min, stall); pct -= 5) {
    const r = works({ power: pct / 100 });
    if (r) { found.push({ option: 'speed', value: pct / 100, overshoot: r.overshoot, duration: r.duration }); break; }
  }
  // Stopping the power a little earlier lets the robot coast onto the target: the band that leaves the smallest error.
  let bestStop: Tuning | undefined;
  // A band of at most a third of the turn (a wider one would leave the turn hardly begun).
  const widest = Math.min(MAX_STOP, Math.abs(seg.turned) / 3);
  for (let stop = Math.floor(m.stop * 2 + 1e-9) / 2 + 0.5; stop <= widest; stop += 0.5) {
    const r = retryGyroTurn(seg, { stop });
    if (r && r.outcome.finished && Math.abs(r.overshoot) <= MARGIN * stop && Math.abs(r.overshoot) < m.stop
      && (!bestStop || Math.abs(r.overshoot) < Math.abs(bestStop.overshoot) - 0.05)) {
      bestStop = { option: 'stop', value: stop, overshoot: r.overshoot, duration: r.duration };
    }
  }
  if (bestStop) found.push(bestStop);
  // What helps most: the smallest error at rest, then the quickest.
  return found.sort((a, b) => Math.abs(a.overshoot) - Math.abs(b.overshoot) || a.duration - b.duration);
}

/** The lowest whole-percent `min` above the stall power with which the turn settles inside its band. */
export function unstallGyroTurn(seg: Segment): Tuning | undefined {
  const rec = simRecordOf(seg);
  if (!rec || rec.motion.kind !== 'gyro-turn') return undefined;
  const m = rec.motion;
  for (let pct = Math.floor(rec.robot.stall * 100 + 1e-9) + 1; pct / 100 <= m.power; pct++) {
    const r = retryGyroTurn(seg, { min: pct / 100 });
    if (r && r.outcome.finished) return { option: 'min', value: pct / 100, overshoot: r.overshoot, duration: r.duration };
  }
  return undefined;
}

/** The words of a tuning, e.g. "lower `min` to 8 %". */
export function describeTuning(t: Tuning, current: { min: number; gain: number; power: number }): string {
  switch (t.option) {
    case 'min': return `${t.value! < current.min ? 'lower' : 'raise'} \`min\` to ${fmt(t.value! * 100)} %`;
    case 'gain': return `lower \`gain\` to ${fmt(t.value!)}`;
    case 'speed': return `lower \`speed\` to ${fmt(t.value! * 100)} %`;
    case 'ramp': return 'add `ramp`, so the power falls back to `min` near the target';
    case 'stop': return `widen the stop band to ${fmt(t.value!)}°, so the power stops earlier and the robot coasts onto the target`;
  }
}

/** The fix that writes a tuning into the turn's line; its title names the predicted result. */
export function tuningFix(t: Tuning, stmt: TurnStmt, current: { min: number; gain: number; power: number }, preferred: boolean): Fix {
  const words = describeTuning(t, current);
  const title = `${words.charAt(0).toUpperCase()}${words.slice(1).replace(/, so .*$/, '')} (predicted: ${fmt(Math.abs(t.overshoot), 1)}° ${t.overshoot >= 0 ? 'past' : 'short of'} the target, ${fmt(t.duration, 2)} s)`;
  return { title, edits: [optionEdit(stmt, t)], ...(preferred ? { preferred: true } : {}) };
}

function optionEdit(stmt: TurnStmt, t: Tuning): TextEdit {
  const text = t.option === 'ramp' ? 'ramp' : t.option === 'gain' ? `gain ${fmt(t.value!, 6)}` : t.option === 'stop' ? `stop ${fmt(t.value!, 6)} deg` : `${t.option} ${fmt(t.value! * 100, 6)}%`;
  const existing = stmt.optionRanges[t.option];
  if (existing) return { range: existing, newText: text };
  return { range: { start: stmt.range.end, end: stmt.range.end }, newText: ` ${text}` };
}

function roundTo(v: number, digits: number): number {
  if (v === 0) return 0;
  const f = 10 ** (digits - Math.ceil(Math.log10(Math.abs(v))));
  return Math.round(v * f) / f;
}
