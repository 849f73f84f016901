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

/**
 * Settings that bring the turn's predicted overshoot inside its stop band
 * without a stall, the one that helps most (smallest error at rest, then
 * quickest) first. Each option is searched by halving over its whole steps
 * (the overshoot grows with `min`, `gain` and `speed`), so a search costs a
 * handful of simulations of the one motion; results are remembered for the
 * same motion from the same state.
 */
export function tuneGyroTurn(seg: Segment): Tuning[] {
  const rec = simRecordOf(seg);
  if (!rec || rec.motion.kind !== 'gyro-turn') return [];
  const key = JSON.stringify([rec.motion, rec.robot, rec.state, seg.turned]);
  const known = memo.get(key);
  if (known) return known;
  const m = rec.motion;
  const stall = rec.robot.stall;
  const found: Tuning[] = [];
  const tried = (patch: Partial<GyroSettings>) => retryGyroTurn(seg, patch);
  const good = (r: ReturnType<typeof tried>, stop = m.stop) => r !== undefined && r.outcome.finished && r.overshoot <= MARGIN * stop && r.overshoot >= -stop;
  // The largest value among `values` (rising) that works, by halving.
  const largest = (values: number[], patch: (v: number) => Partial<GyroSettings>): { v: number; r: NonNullable<ReturnType<typeof tried>> } | undefined => {
    let lo = 0;
    let hi = values.length - 1;
    let best: { v: number; r: NonNullable<ReturnType<typeof tried>> } | undefined;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const r = tried(patch(values[mid]));
      if (good(r)) { best = { v: values[mid], r: r! }; lo = mid + 1; } else hi = mid - 1;
    }
    return best;
  };
  const range = (from: number, to: number, step: number) => { const out: number[] = []; for (let v = from; v <= to + 1e-9; v += step) out.push(Math.round(v * 1e6) / 1e6); return out; };
  const mins = range(Math.floor(stall * 100 + 1e-9) + 1, Math.floor(m.min * 100 - 1e-9), 1);
  const byMin = mins.length ? largest(mins, (pct) => ({ min: pct / 100 })) : undefined;
  if (byMin) found.push({ option: 'min', value: byMin.v / 100, overshoot: byMin.r.overshoot, duration: byMin.r.duration });
  const gains = range(1, 9, 1).map((k) => roundTo((m.gain * 100 * k) / 10, 2)).filter((g, i, a) => g > 0 && a.indexOf(g) === i);
  const byGain = largest(gains, (g) => ({ gain: g / 100 }));
  if (byGain) found.push({ option: 'gain', value: byGain.v, overshoot: byGain.r.overshoot, duration: byGain.r.duration });
  if (!m.ramp) {
    const r = tried({ ramp: true });
    if (good(r)) found.push({ option: 'ramp', overshoot: r!.overshoot, duration: r!.duration });
  }
  const speeds = range(Math.floor(Math.max(m.min, stall) * 20 + 1e-9) * 5 + 5, Math.ceil(m.power * 20 - 1e-9) * 5 - 5, 5);
  const bySpeed = speeds.length ? largest(speeds, (pct) => ({ power: pct / 100 })) : undefined;
  if (bySpeed) found.push({ option: 'speed', value: bySpeed.v / 100, overshoot: bySpeed.r.overshoot, duration: bySpeed.r.duration });
  // Stopping the power earlier lets the robot coast onto the target. The overshoot falls as the
  // band widens (by less than the widening when the robot arrives fast): aim it at zero by the
  // secant method over half-degree bands, starting from the band the coast alone would need.
  const widest = Math.min(MAX_STOP, Math.abs(seg.turned) / 3);
  const half = (v: number) => Math.min(widest, Math.max(m.stop + 0.5, Math.round(v * 2) / 2));
  let bestStop: Tuning | undefined;
  const tryStop = (stop: number) => {
    const r = tried({ stop });
    if (r && r.outcome.finished && good(r, stop) && Math.abs(r.overshoot) < m.stop
      && (!bestStop || Math.abs(r.overshoot) < Math.abs(bestStop.overshoot) - 0.05)) {
      bestStop = { option: 'stop', value: stop, overshoot: r.overshoot, duration: r.duration };
    }
    return r?.overshoot;
  };
  if (widest > m.stop) {
    let [a, fa] = [m.stop, seg.predicted?.overshoot ?? 0];
    let b = half(m.stop + fa);
    let fb = tryStop(b);
    for (let k = 0; k < 5 && fb !== undefined && Math.abs(fb) > 0.2 && fb !== fa; k++) {
      const c = half(b - (fb * (b - a)) / (fb - fa));
      if (c === b) break;
      [a, fa, b] = [b, fb, c];
      fb = tryStop(b);
    }
  }
  if (bestStop) found.push(bestStop);
  found.sort((a, b) => Math.abs(a.overshoot) - Math.abs(b.overshoot) || a.duration - b.duration);
  remember(key, found);
  return found;
}

const memo = new Map<string, Tuning[]>();
const MEMO_SIZE = 2000;

function remember(key: string, value: Tuning[]): void {
  if (memo.size >= MEMO_SIZE) memo.delete(memo.keys().next().value!);
  memo.set(key, value);
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
