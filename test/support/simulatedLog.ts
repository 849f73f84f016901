// Recorded runs made by Veer's own plant (src/core/sim/motion.ts `advancePlant`:
// the exact zero-order-hold wheel step of the robot model, section 2) from a
// schedule of wheel powers, with seeded measurement noise: the truth the fit
// tests and the fit benchmark recover.
import type { RecordedRun, RecordedSample } from '../../src/core/record/types';
import type { TurnDirection } from '../../src/core/types';
import { advancePlant, restState, simRobot } from '../../src/core/sim/motion';
import { wrapReading } from '../../src/core/solve/frame';
import { normalSource } from '../../src/core/spread/sample';
import { checkPlan } from '../../src/core/check';
import { traceOf } from '../../src/core/sim/run';

export interface TruthRobot {
  /** Left wheel surface speed at full power, mm/s (the right wheel's is `mismatch` times it). */
  fullSpeed: number;
  lag: number;
  stall: number;
  mismatch: number;
  /** Effective track, mm. */
  track: number;
  /** Reading over the true angle turned. */
  scale: number;
  /** Drift of the reading, deg/s. */
  drift: number;
  sample: number;
  turns: TurnDirection;
  yawLo: number;
}

/** Powers held for a while. */
export interface PowerStep { uL: number; uR: number; duration: number }

export interface LogNoise {
  seed: number;
  /** sd of each wheel-travel reading, mm. */
  travel: number;
  /** sd of each yaw reading, degrees. */
  yaw: number;
  /** Rows with a yaw reading / with powers (default both). */
  withYaw?: boolean;
  withPower?: boolean;
  /** Encoder resolution, mm: each travel reading rounded to a multiple of it (after the noise). */
  quantum?: number;
  /** Yaw resolution, degrees (after the noise). */
  yawQuantum?: number;
  /** The plan's mismatch: the log reader converts the right wheel's degrees with it (default 1). */
  planMismatch?: number;
  /** sd of the yaw reading's random walk per sample, degrees (a gyro's angle random walk; default 0). */
  yawWalk?: number;
  /** sd of a random push on each wheel's speed per sample, mm/s (bumps, a changing floor; default 0). */
  speedKick?: number;
  /** How late the yaw reading is, s: the heading that long ago, interpolated between samples (default 0). */
  delay?: number;
  /** Sample times (s) at which the reading is zeroed again (a `reset yaw`). */
  resets?: number[];
}

export const TRUTH: TruthRobot = {
  // 900 deg/s motor, 56 mm wheel, gear 1: 900 x pi x 56 / 360 mm/s.
  fullSpeed: (900 * Math.PI * 56) / 360,
  lag: 0.07,
  stall: 0.055,
  mismatch: 1.002,
  track: 124.5,
  scale: 1.01,
  drift: 0.01,
  sample: 0.01,
  turns: 'clockwise',
  yawLo: -180,
};

/**
 * A test run as a robot's calibration routine would drive it: still time at
 * both ends (drift), a stair of small powers across the stall, drives, spins
 * both ways, an arc, a gyro-turn-like power that falls off toward its floor,
 * and a reverse drive.
 */
export function calibrationSchedule(): PowerStep[] {
  const s: PowerStep[] = [{ uL: 0, uR: 0, duration: 1.5 }];
  for (const u of [0.02, 0.04, 0.05, 0.06, 0.07]) s.push({ uL: u, uR: u, duration: 0.3 }, { uL: 0, uR: 0, duration: 0.3 });
  s.push({ uL: 0.5, uR: 0.5, duration: 1 }, { uL: 0, uR: 0, duration: 0.4 });
  s.push({ uL: 0.4, uR: -0.4, duration: 0.8 }, { uL: 0, uR: 0, duration: 0.4 });
  s.push({ uL: -0.3, uR: 0.3, duration: 1 }, { uL: 0, uR: 0, duration: 0.4 });
  s.push({ uL: 0.6, uR: 0.3, duration: 1 }, { uL: 0, uR: 0, duration: 0.4 });
  // A P-controlled turn: power 0.5 x (remaining share), floored at 8 %.
  for (let k = 0; k < 120; k++) {
    const u = Math.max(0.08, Math.min(0.5, 0.5 * (1 - k / 120)));
    s.push({ uL: u, uR: -u, duration: 0.01 });
  }
  s.push({ uL: 0, uR: 0, duration: 0.4 });
  s.push({ uL: -0.4, uR: -0.4, duration: 0.7 }, { uL: 0, uR: 0, duration: 1.5 });
  return s;
}

/** A recorded run of `schedule` on `truth`, one row per sample period. */
export function simulatedLog(truth: TruthRobot, schedule: PowerStep[], noise: LogNoise): RecordedRun {
  const robot = simRobot({
    fullSpeed: truth.fullSpeed, lag: truth.lag, stall: truth.stall, mismatch: truth.mismatch, track: truth.track,
    sample: truth.sample, delay: 0, scale: truth.scale, turns: truth.turns, yawLo: truth.yawLo,
    circumference: Math.PI * 56, gear: 1,
  });
  const gauss = normalSource(noise.seed);
  const s = restState(0, 0, 0);
  const samples: RecordedSample[] = [];
  const withYaw = noise.withYaw ?? true;
  const withPower = noise.withPower ?? true;
  const resets = [...(noise.resets ?? [])].sort((a, b) => a - b);
  let left = 0, right = 0;
  let zero = 0, zeroT = 0;
  const delay = noise.delay ?? 0;
  let walk = 0;
  // (time, heading) of every sample so far, for a delayed reading.
  const hist: number[] = [];
  const headingAt = (when: number): number => {
    let i = hist.length - 2;
    while (i > 0 && hist[i] > when) i -= 2;
    if (i + 2 >= hist.length || hist[i] >= when) return hist[Math.max(0, i) + 1];
    const [t0, h0, t1, h1] = [hist[i], hist[i + 1], hist[i + 2], hist[i + 3]];
    return h0 + ((h1 - h0) * (when - t0)) / (t1 - t0);
  };
  const row = (uL: number, uR: number) => {
    while (resets.length && resets[0] <= s.t + 1e-9) { resets.shift(); zero = s.h; zeroT = s.t; }
    const q = (v: number, step?: number) => (step ? Math.round(v / step) * step : v);
    const sample: RecordedSample = { t: s.t, left: q(left + noise.travel * gauss(), noise.quantum), right: q(right + noise.travel * gauss(), noise.quantum) * (noise.planMismatch ?? 1) };
    hist.push(s.t, s.h);
    if (noise.yawWalk) walk += noise.yawWalk * gauss();
    if (withYaw) sample.yaw = wrapReading(q(truth.scale * (headingAt(s.t - delay) - zero) + truth.drift * (s.t - zeroT) + walk + noise.yaw * gauss(), noise.yawQuantum), truth.yawLo);
    if (withPower) { sample.powerLeft = uL; sample.powerRight = uR; }
    samples.push(sample);
  };
  for (const step of schedule) {
    const n = Math.max(1, Math.round(step.duration / truth.sample));
    for (let k = 0; k < n; k++) {
      row(step.uL, step.uR);
      const out = advancePlant(s, robot, step.uL, step.uR, truth.sample);
      if (noise.speedKick) { s.vL += noise.speedKick * gauss(); s.vR += noise.speedKick * gauss(); }
      left += out.sL;
      // The right encoder counts nominal-wheel mm (its real travel over the mismatch); the log reader
      // turns its degrees into mm with the plan's mismatch.
      right += out.sR / truth.mismatch;
    }
  }
  row(0, 0);
  return { samples, hasYaw: withYaw, hasPower: withPower, hasLine: false, source: `simulated-${noise.seed}.csv` };
}

/**
 * The powers the controller simulation commands, sample by sample, when it
 * runs the first run of `planText` (src/core/sim/run.ts `traceOf`, one row per
 * control-loop sample): a realistic schedule to replay through the plant.
 */
export function plannedSchedule(planText: string): PowerStep[] {
  const result = checkPlan(planText);
  const steps: PowerStep[] = [];
  for (const seg of result.runs[0]?.segments ?? []) {
    const rows = traceOf(seg);
    if (!rows) continue;
    for (let k = 0; k + 1 < rows.t.length; k++) {
      const duration = rows.t[k + 1] - rows.t[k];
      if (duration > 0) steps.push({ uL: rows.powerLeft[k], uR: rows.powerRight[k], duration });
    }
  }
  return steps;
}
