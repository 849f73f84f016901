// One motion as the robot's code runs it, in discrete time (the robot model,
// section 2). The state is carried from motion to motion; each controller
// recomputes its powers once per sample on the (delayed, scaled, wrapped)
// yaw reading, and the wheels follow through their lag (exact zero-order-hold
// steps, see plant.ts).
import type { TurnDirection } from '../types';
import { wrapReading as wrapReadingOf } from '../solve/frame';

/** Bound once: the hot loops call it every sample (a module's live binding can cost a lookup per call). */
const wrapReading = wrapReadingOf;

/** Simulated time after which a motion is cut off and reported (the robot model's 20 s). */
export const MOTION_CAP_S = 20;
/** A wheel slower than this (mm/s) with no power has come to rest. */
export const REST_SPEED = 1e-3;
const RAD = Math.PI / 180;

/** The robot and its sensor, in canonical units. */
export interface SimRobot {
  /** Left wheel surface speed at full power, mm/s (the right wheel's is `mismatch` times it). */
  fullSpeed: number;
  lag: number;
  stall: number;
  mismatch: number;
  /** The track the robot really turns on (the effective track), mm. */
  track: number;
  sample: number;
  delay: number;
  scale: number;
  turns: TurnDirection;
  yawLo: number;
  /** Nominal (left) wheel circumference, mm, and motor degrees per wheel degree: to turn motor targets into travel. */
  circumference: number;
  gear: number;
  /** ENCODER_STEPS samples, s; exp(−sample/lag) and exp(−longStep/lag) (see `simRobot`). */
  longStep: number;
  decay: number;
  decayLong: number;
}

/** Everything that carries from one motion into the next. */
export interface SimState {
  x: number;
  y: number;
  /** Field heading, degrees, unwrapped. */
  h: number;
  vL: number;
  vR: number;
  t: number;
  /** Field heading at which the reading was zeroed. */
  zero: number;
  /** Headings at past sample times, for a delayed reading (kept only with a delay). */
  histT: number[];
  histH: number[];
  /** sin and cos of the heading `cachedH` (radians): kept up to date by the steps, worked out again when `h` was set otherwise. */
  cachedH: number;
  sinH: number;
  cosH: number;
  turnsSinceExact: number;
}

export function restState(x: number, y: number, heading: number, t = 0): SimState {
  return { x, y, h: heading, vL: 0, vR: 0, t, zero: heading, histT: [], histH: [], cachedH: NaN, sinH: 0, cosH: 1, turnsSinceExact: 0 };
}

const NO_HISTORY: number[] = [];

export function copyState(s: SimState): SimState {
  return {
    x: s.x, y: s.y, h: s.h, vL: s.vL, vR: s.vR, t: s.t, zero: s.zero,
    histT: s.histT.length ? s.histT.slice() : NO_HISTORY, histH: s.histH.length ? s.histH.slice() : NO_HISTORY,
    cachedH: s.cachedH, sinH: s.sinH, cosH: s.cosH, turnsSinceExact: s.turnsSinceExact,
  };
}

/** One row of a trace. */
export interface TraceSink {
  row(s: SimState, reading: number, target: number | null, uL: number, uR: number): void;
}

/** Where a motion's poses go, one per step (for the predicted path and the scrubber). */
export interface PoseSink {
  pose(t: number, x: number, y: number, h: number): void;
}

export interface MotionOutcome {
  /** The code moved on; false when the motion stalled or hit the cap. */
  finished: boolean;
  stalled: boolean;
  capped: boolean;
  peakRate: number;
  /** Gyro turns: the error when the motion ended or stalled, degrees. */
  finalError?: number;
}

/** What a wheel does in an encoder motion: its commanded share of the outer wheel's power and its target travel (mm as its encoder counts it). */
export interface EncoderMotion {
  kind: 'encoders';
  /** Target travel per wheel as its encoder counts it (nominal wheel), mm, signed. */
  left: number;
  right: number;
  /** Top power of the wheel that travels most (fraction). */
  power: number;
  /** `ramp A` of a drive: accelerate and decelerate at A mm/s² (commanded speed of the outer wheel). */
  accel?: number;
  /** `ramp` of a turn: power min → power → min with progress. */
  rampMin?: number;
}

export interface GyroTurnMotion {
  kind: 'gyro-turn';
  target: number;
  /** Fraction of power per degree of error. */
  gain: number;
  min: number;
  power: number;
  stop: number;
  ramp: boolean;
  /** Each wheel's share of the turning power for a turn in the positive direction (outer wheel ±1; an arc's shares both reverse to turn back). */
  shareL: number;
  shareR: number;
}

export interface HoldDriveMotion {
  kind: 'hold';
  target: number;
  gain: number;
  /** Signed distance the encoders must count (their mean), mm. */
  distance: number;
  power: number;
  accel?: number;
}

export interface WaitMotion {
  kind: 'wait';
  time: number;
}

export type SimMotion = EncoderMotion | GyroTurnMotion | HoldDriveMotion | WaitMotion;

/**
 * An encoder motion whose powers do not change (no ramp) is stepped this many
 * samples at a time: the wheels' response is exact for any step under a held
 * power, and only the pose's arc per step is approximate.
 */
export const ENCODER_STEPS = 4;
/** Wheel speeds in the ratio of their commands within this share (of the commands squared) move on one arc. */
export const STEADY_RATIO = 1e-4;
/** How far (mm) an arc step may bulge off its chord, and how much it may turn (degrees). */
export const STEADY_BULGE = 2;
export const STEADY_DEG = 30;

/** The lowest power a ramped drive commands (or its top power when lower), so that it never creeps. */
export const RAMP_FLOOR = 0.1;

/** The yaw reading as the robot's code sees it now (delayed, scaled, wrapped into the range). */
export function readingOf(s: SimState, r: SimRobot): number {
  return wrapReading(r.scale * (headingAt(s, s.t - r.delay) - s.zero), r.yawLo);
}

/** The heading at time `t` (≤ now), interpolated between the samples kept. */
function headingAt(s: SimState, t: number): number {
  if (t >= s.t || s.histT.length === 0) return s.h;
  const T = s.histT;
  if (t <= T[0]) return s.histH[0];
  let i = T.length - 1;
  while (i > 0 && T[i - 1] > t) i--;
  // T[i-1] <= t < T[i] (or t beyond the last kept: between it and now)
  const t1 = i < T.length ? T[i] : s.t;
  const h1 = i < T.length ? s.histH[i] : s.h;
  const t0 = T[i - 1];
  const h0 = s.histH[i - 1];
  return t1 > t0 ? h0 + ((h1 - h0) * (t - t0)) / (t1 - t0) : h1;
}

function remember(s: SimState, r: SimRobot): void {
  if (r.delay <= 0) return;
  if (s.histT === NO_HISTORY) { s.histT = []; s.histH = []; }
  s.histT.push(s.t);
  s.histH.push(s.h);
  // Keep what a delayed reading can still ask for.
  const keepFrom = s.t - r.delay - 2 * r.sample;
  let drop = 0;
  while (drop < s.histT.length - 2 && s.histT[drop + 1] < keepFrom) drop++;
  if (drop > 64) {
    s.histT.splice(0, drop);
    s.histH.splice(0, drop);
  }
}

/** The scratch of `advance`: a step's powers, length and decay, and the two travels it gives. */
interface Step {
  sL: number;
  sR: number;
  uL: number;
  uR: number;
  dt: number;
  decay: number;
  regulated: boolean;
}

function newStep(): Step {
  return { sL: 0, sR: 0, uL: 0, uR: 0, dt: 0, decay: 0, regulated: false };
}

export function effective(u: number, stall: number): number {
  return Math.abs(u) < stall ? 0 : u;
}

/**
 * Advances the plant by `dt` with wheel powers uL, uR held: each wheel's
 * exact first-order response, then the exact arc of the two travels.
 * Returns the two travels in `out`.
 */
function advance(s: SimState, r: SimRobot, uL: number, uR: number, dt: number, out: Step, regulated = false, decay = -1): void {
  out.uL = uL;
  out.uR = uR;
  out.dt = dt;
  out.regulated = regulated;
  out.decay = decay;
  step(s, r, out);
}

/**
 * One plant step, its powers, length and decay taken from `out` (not passed
 * as numbers: the step is too long to be inlined, and numbers passed to a call
 * are boxed, which in the hot loops would cost an allocation each).
 */
function step(s: SimState, r: SimRobot, out: Step): void {
  const uL = out.uL;
  const uR = out.uR;
  const dt = out.dt;
  const regulated = out.regulated;
  const decay = out.decay;
  const cL = (regulated ? uL : effective(uL, r.stall)) * r.fullSpeed;
  const cR = (regulated ? uR : effective(uR, r.stall)) * r.fullSpeed * r.mismatch;
  const a = decay >= 0 ? decay : decayOf(r, dt);
  const g = r.lag * (1 - a);
  const sL = g * s.vL + cL * (dt - g);
  const sR = g * s.vR + cR * (dt - g);
  s.vL = a * s.vL + (1 - a) * cL;
  s.vR = a * s.vR + (1 - a) * cR;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const dTheta = (sign * (sL - sR)) / r.track;
  const ds = (sL + sR) / 2;
  const half = dTheta / 2;
  const h2 = half * half;
  if (s.cachedH !== s.h) {
    s.sinH = Math.sin(s.h * RAD);
    s.cosH = Math.cos(s.h * RAD);
  }
  // sin and cos of half the turn, and sin(x)/x, by their series for the small turns of one sample (the next
  // terms are below 1e-12 there), exactly otherwise.
  const small = h2 < 1e-2;
  const sinHalf = small ? half * (1 - (h2 / 6) * (1 - (h2 / 20) * (1 - h2 / 42))) : Math.sin(half);
  const cosHalf = small ? 1 - (h2 / 2) * (1 - (h2 / 12) * (1 - (h2 / 30) * (1 - h2 / 56))) : Math.cos(half);
  // The mean heading's sin and cos: the heading's, turned by half the step.
  const sinMid = s.sinH * cosHalf + s.cosH * sinHalf;
  const cosMid = s.cosH * cosHalf - s.sinH * sinHalf;
  if (ds !== 0) {
    // Along the chord of the arc, at the mean heading.
    const chord = half === 0 ? ds : (ds * sinHalf) / half;
    s.x += sign * sinMid * chord;
    s.y += cosMid * chord;
  }
  s.h += dTheta / RAD;
  // Turned by the other half; worked out afresh now and then so that rounding cannot pile up.
  if (small && ++s.turnsSinceExact < 64) {
    s.sinH = sinMid * cosHalf + cosMid * sinHalf;
    s.cosH = cosMid * cosHalf - sinMid * sinHalf;
  } else {
    s.sinH = Math.sin(s.h * RAD);
    s.cosH = Math.cos(s.h * RAD);
    s.turnsSinceExact = 0;
  }
  s.cachedH = s.h;
  s.t += dt;
  out.sL = sL;
  out.sR = sR;
}

/** One plant step of `dt` with wheel powers uL, uR held (for tests and tools; the motion loops call `advance`). */
export function advancePlant(s: SimState, r: SimRobot, uL: number, uR: number, dt: number): { sL: number; sR: number } {
  const out = newStep();
  advance(s, r, uL, uR, dt, out);
  return { sL: out.sL, sR: out.sR };
}

/** Travel of one wheel over `dt` from speed v under command c (mm/s), exact. */
function wheelTravel(v: number, c: number, lag: number, dt: number, decay?: number): number {
  const g = lag > 0 ? lag * (1 - (decay ?? Math.exp(-dt / lag))) : 0;
  return g * v + c * (dt - g);
}

/** exp(−dt/lag) for a step of `dt` (worked out once for the sample period and for the encoder motions' longer steps). */
export function decayOf(r: SimRobot, dt: number): number {
  if (dt === r.sample) return r.decay;
  if (dt === r.longStep) return r.decayLong;
  return r.lag > 0 ? Math.exp(-dt / r.lag) : 0;
}

/** A robot with the decays of its two regular steps worked out. */
export function simRobot(base: Omit<SimRobot, 'decay' | 'decayLong' | 'longStep'>): SimRobot {
  const longStep = base.sample * ENCODER_STEPS;
  const decay = (dt: number) => (base.lag > 0 ? Math.exp(-dt / base.lag) : 0);
  return { ...base, longStep, decay: decay(base.sample), decayLong: decay(longStep) };
}

/**
 * The time within (0, dt] at which a wheel's travel reaches `need` (the
 * travel rising monotonically through it): Newton's method on the exact
 * travel, whose derivative is the wheel's speed, kept inside a bracket.
 */
function crossingTime(v: number, c: number, lag: number, dt: number, need: number): number {
  const dir = Math.sign(wheelTravel(v, c, lag, dt)) || 1;
  let lo = 0;
  let hi = dt;
  let t = dt * Math.min(1, Math.max(0, need / (wheelTravel(v, c, lag, dt) || need)));
  for (let k = 0; k < 30; k++) {
    const e = lag > 0 ? Math.exp(-t / lag) : 0;
    const f = dir * (wheelTravel(v, c, lag, t, e) - need);
    if (f >= 0) hi = t; else lo = t;
    if (Math.abs(f) < 1e-9) return t;
    if (hi - lo < 1e-12) break;
    const speed = dir * (c + (v - c) * e);
    let next = speed > 0 ? t - f / speed : (lo + hi) / 2;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    t = next;
  }
  return hi;
}

/** The turning rate, deg/s. */
function rate(s: SimState, r: SimRobot): number {
  return Math.abs((s.vL - s.vR) / r.track) / RAD;
}

/** Runs one motion from `s` (mutated to where the code moves on). */
export function simulateMotion(s: SimState, r: SimRobot, m: SimMotion, trace?: TraceSink, poses?: PoseSink): MotionOutcome {
  switch (m.kind) {
    case 'wait': return runWait(s, r, m, trace, poses);
    case 'encoders': return runEncoders(s, r, m, trace, poses);
    case 'gyro-turn': return runGyroTurn(s, r, m, trace, poses);
    case 'hold': return runHold(s, r, m, trace, poses);
  }
}

function runWait(s: SimState, r: SimRobot, m: WaitMotion, trace?: TraceSink, poses?: PoseSink): MotionOutcome {
  const end = s.t + m.time;
  const out = newStep();
  let peak = 0;
  while (s.t < end - 1e-12) {
    trace?.row(s, readingOf(s, r), null, 0, 0);
    remember(s, r);
    advance(s, r, 0, 0, Math.min(r.sample, end - s.t), out);
    peak = Math.max(peak, rate(s, r));
    poses?.pose(s.t, s.x, s.y, s.h);
    // Once the wheels are at rest nothing changes: jump to the end.
    if (Math.abs(s.vL) < REST_SPEED && Math.abs(s.vR) < REST_SPEED && r.delay <= 0) {
      s.vL = 0;
      s.vR = 0;
      s.t = end;
      poses?.pose(s.t, s.x, s.y, s.h);
    }
  }
  s.t = end;
  return { finished: true, stalled: false, capped: false, peakRate: peak };
}

function runEncoders(s: SimState, r: SimRobot, m: EncoderMotion, trace?: TraceSink, poses?: PoseSink): MotionOutcome {
  const outer = Math.max(Math.abs(m.left), Math.abs(m.right));
  const start = s.t;
  if (outer === 0) return { finished: true, stalled: false, capped: false, peakRate: 0 };
  const shareL = m.left / outer;
  const shareR = m.right / outer;
  let encL = 0;
  let encR = 0;
  let doneL = m.left === 0;
  let doneR = m.right === 0;
  const out = newStep();
  let peak = 0;
  const floor = Math.min(RAMP_FLOOR, m.power);
  // Locals, so that the loop reads no optional field of the motion.
  const accel = m.accel !== undefined && m.accel > 0 ? m.accel : 0;
  const rampMin = m.rampMin ?? -1;
  const power = m.power;
  const left = m.left;
  const right = m.right;
  const held = accel === 0 && rampMin < 0;
  const tracing = trace !== undefined;
  while (!(doneL && doneR)) {
    if (!(s.t - start < MOTION_CAP_S)) return { finished: false, stalled: false, capped: true, peakRate: peak };
    // The outer wheel's power now.
    let p = power;
    if (!held) {
      const progress = Math.max(left !== 0 ? Math.abs(encL / left) : 0, right !== 0 ? Math.abs(encR / right) : 0);
      if (accel > 0) {
        const remaining = Math.max(0, outer * (1 - progress));
        const v = Math.min(power * r.fullSpeed, accel * (s.t - start) + floor * r.fullSpeed, Math.sqrt(2 * accel * remaining) + floor * r.fullSpeed);
        p = v / r.fullSpeed;
      } else {
        p = rampMin + (power - rampMin) * Math.min(1, 2 * progress, 2 * (1 - progress));
        p = Math.max(rampMin, Math.min(power, p));
      }
    }
    // The motors' own regulation turns each wheel at its share of the power; below the stall power nothing moves.
    const moving = Math.abs(p) >= r.stall;
    const uL = doneL || !moving ? 0 : shareL * p;
    const uR = doneR || !moving ? 0 : shareR * p;
    if (tracing) trace.row(s, readingOf(s, r), null, uL, uR);
    if (!moving && Math.abs(s.vL) < REST_SPEED && Math.abs(s.vR) < REST_SPEED) {
      return { finished: false, stalled: true, capped: false, peakRate: peak };
    }
    // Does a wheel reach its target within this sample?
    const cL = uL * r.fullSpeed;
    const cR = uR * r.fullSpeed * r.mismatch;
    let dt = held && !tracing ? r.longStep : r.sample;
    // While the two wheels' speeds stand in the ratio of their commands (from
    // rest, or once any earlier motion's coast has died away), both approach
    // their commands in the same proportion: the robot follows one arc, and
    // the step is exact at any length. Take steps whose arc bulges at most
    // STEADY_BULGE off its chord, so the positions kept for the quick
    // obstacle test stay close to the path between them.
    const scale = Math.abs(cL) + Math.abs(cR);
    if (held && !tracing && scale > 0 && Math.abs(s.vL * cR - s.vR * cL) <= STEADY_RATIO * scale * scale && s.vL * cL >= 0 && s.vR * cR >= 0) {
      // A straight line in one step; an arc in steps whose bulge off their chord stays under STEADY_BULGE.
      const turnRate = Math.abs(cL - cR) / r.track; // rad/s
      if (turnRate === 0) dt = MOTION_CAP_S;
      else {
        const radius = (Math.abs(cL + cR) / 2) / turnRate;
        const angle = radius > STEADY_BULGE ? 2 * Math.acos(1 - STEADY_BULGE / radius) : Math.PI;
        dt = Math.max(dt, Math.min(angle, STEADY_DEG * RAD) / turnRate);
      }
    }
    if (!(dt > 0 && dt <= MOTION_CAP_S)) dt = r.sample; // never a step of no time, or of none at all
    let finishing = 0; // 1: the left wheel arrives in this step, 2: the right
    let decay = decayOf(r, dt);
    if (!doneL) {
      const need = left - encL;
      const d = wheelTravel(s.vL, cL, r.lag, dt, decay);
      if (Math.sign(need) * d >= Math.abs(need)) { dt = crossingTime(s.vL, cL, r.lag, dt, need); finishing = 1; decay = decayOf(r, dt); }
    }
    if (!doneR) {
      const need = (right - encR) * r.mismatch; // real travel the right wheel still needs
      const d = wheelTravel(s.vR, cR, r.lag, dt, decay);
      if (Math.sign(need) * d >= Math.abs(need)) { dt = crossingTime(s.vR, cR, r.lag, dt, need); finishing = 2; decay = decayOf(r, dt); }
    }
    remember(s, r);
    advance(s, r, uL, uR, dt, out, true, decay);
    encL += out.sL;
    encR += out.sR / r.mismatch;
    peak = Math.max(peak, rate(s, r));
    if (poses) poses.pose(s.t, s.x, s.y, s.h);
    if (finishing === 1 || (!doneL && Math.sign(left) * (encL - left) >= -1e-9)) { doneL = true; encL = left; }
    if (finishing === 2 || (!doneR && Math.sign(right) * (encR - right) >= -1e-9)) { doneR = true; encR = right; }
  }
  return { finished: true, stalled: false, capped: false, peakRate: peak };
}

function runGyroTurn(s: SimState, r: SimRobot, m: GyroTurnMotion, trace?: TraceSink, poses?: PoseSink): MotionOutcome {
  const start = s.t;
  const out = newStep();
  let peak = 0;
  const first = readingOf(s, r);
  const span = m.target - first;
  // Long steps need a reading without delay (the delayed reading needs every sample's heading), no trace (one row
  // per sample), and an arc that bulges at most STEADY_BULGE off its chord where the poses are kept.
  const longTurns = !m.ramp && !trace && r.delay <= 0 && (!poses || arcBulge(r, m) <= STEADY_BULGE);
  for (;;) {
    const reading = readingOf(s, r);
    const e = m.target - reading;
    if (Math.abs(e) < m.stop) return { finished: true, stalled: false, capped: false, peakRate: peak, finalError: e };
    if (!(s.t - start < MOTION_CAP_S)) return { finished: false, stalled: false, capped: true, peakRate: peak, finalError: e };
    let u: number;
    if (m.ramp) {
      const progress = span === 0 ? 1 : (reading - first) / span;
      u = m.min + (m.power - m.min) * Math.max(0, Math.min(1, 2 * progress, 2 * (1 - progress)));
    } else u = Math.min(m.power, Math.max(m.min, m.gain * Math.abs(e)));
    const dir = Math.sign(e); // +1: turn in the positive direction
    const uL = dir * u * m.shareL;
    const uR = dir * u * m.shareR;
    if (trace) trace.row(s, reading, m.target, uL, uR);
    if (effective(uL, r.stall) === 0 && effective(uR, r.stall) === 0 && Math.abs(s.vL) < REST_SPEED && Math.abs(s.vR) < REST_SPEED) {
      return { finished: false, stalled: true, capped: false, peakRate: peak, finalError: e };
    }
    remember(s, r);
    // Far from the target the power is held at its top (saturated), and near it at the floor `min`: ENCODER_STEPS
    // samples are then one exact step of the wheels, and one arc while their speeds stand in the ratio of their
    // commands. The error falls monotonically through the step, so the step is kept when at its end the error is
    // still saturated (or still under the floor's reach) and outside the stop band, and the reading has not wrapped.
    const saturated = u === m.power && m.gain * Math.abs(e) >= m.power;
    const floored = u === m.min && m.gain * Math.abs(e) <= m.min && effective(u, r.stall) !== 0;
    if (longTurns && (saturated || floored) && steady(s, uL * r.fullSpeed, uR * r.fullSpeed * r.mismatch)) {
      const x = s.x, y = s.y, h = s.h, vL = s.vL, vR = s.vR, t = s.t;
      advance(s, r, uL, uR, r.longStep, out, false, r.decayLong);
      const after = readingOf(s, r);
      const eAfter = m.target - after;
      const keeps = saturated ? m.gain * Math.abs(eAfter) >= m.power : Math.abs(eAfter) >= m.stop && Math.abs(eAfter) <= Math.abs(e);
      if (keeps && Math.sign(eAfter) === dir && Math.abs(after - reading - r.scale * (s.h - h)) < 1e-6) {
        peak = Math.max(peak, rate(s, r));
        poses?.pose(s.t, s.x, s.y, s.h);
        continue;
      }
      s.x = x; s.y = y; s.h = h; s.vL = vL; s.vR = vR; s.t = t;
    }
    advance(s, r, uL, uR, r.sample, out);
    peak = Math.max(peak, rate(s, r));
    poses?.pose(s.t, s.x, s.y, s.h);
  }
}

/** How far a long step of a turn at full power bulges off its chord, mm (0 for a spin). */
function arcBulge(r: SimRobot, m: GyroTurnMotion): number {
  const cL = m.shareL * m.power * r.fullSpeed;
  const cR = m.shareR * m.power * r.fullSpeed * r.mismatch;
  const turnRate = Math.abs(cL - cR) / r.track;
  const radius = Math.abs(cL + cR) / 2 / (turnRate || 1);
  const angle = turnRate * r.longStep;
  return radius * (1 - Math.cos(angle / 2));
}

/** Whether the wheels' speeds stand in the ratio of their commands cL, cR (mm/s), each turning its command's way. */
function steady(s: SimState, cL: number, cR: number): boolean {
  const scale = Math.abs(cL) + Math.abs(cR);
  return scale > 0 && Math.abs(s.vL * cR - s.vR * cL) <= STEADY_RATIO * scale * scale && s.vL * cL >= 0 && s.vR * cR >= 0;
}

function runHold(s: SimState, r: SimRobot, m: HoldDriveMotion, trace?: TraceSink, poses?: PoseSink): MotionOutcome {
  const start = s.t;
  const out = newStep();
  let peak = 0;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const goal = Math.abs(m.distance);
  const back = m.distance < 0 ? -1 : 1;
  const floor = Math.min(RAMP_FLOOR, m.power);
  // Locals, so that the loop reads no field of the motion (whose shape varies).
  const power = m.power;
  const target = m.target;
  const gain = m.gain;
  const accel = m.accel !== undefined && m.accel > 0 ? m.accel : 0;
  const full = r.fullSpeed;
  let counted = 0; // mean of the two encoders, along the drive's direction
  while (counted < goal - 1e-9) {
    if (!(s.t - start < MOTION_CAP_S)) return { finished: false, stalled: false, capped: true, peakRate: peak };
    const reading = readingOf(s, r);
    const e = target - reading;
    let p = power;
    if (accel > 0) {
      const v = Math.min(power * full, accel * (s.t - start) + floor * full, Math.sqrt(2 * accel * Math.max(0, goal - counted)) + floor * full);
      p = v / full;
    }
    const steer = sign * gain * e;
    const uL = clamp1(back * p + steer);
    const uR = clamp1(back * p - steer);
    if (trace) trace.row(s, reading, target, uL, uR);
    const eL = effective(uL, r.stall);
    const eR = effective(uR, r.stall);
    if (eL === 0 && eR === 0 && Math.abs(s.vL) < REST_SPEED && Math.abs(s.vR) < REST_SPEED) {
      return { finished: false, stalled: true, capped: false, peakRate: peak };
    }
    // Would the encoders' mean pass the distance within this sample? Find when.
    const cL = eL * full;
    const cR = eR * full * r.mismatch;
    let dt = r.sample;
    const need = goal - counted;
    if (meanTravel(s, r, cL, cR, back, dt, r.decay) >= need) {
      let lo = 0;
      let hi = dt;
      for (let k = 0; k < 30; k++) {
        const mid = (lo + hi) / 2;
        if (meanTravel(s, r, cL, cR, back, mid) >= need) hi = mid;
        else lo = mid;
      }
      dt = hi;
    }
    remember(s, r);
    advance(s, r, uL, uR, dt, out, false, dt === r.sample ? r.decay : -1);
    counted += back * (out.sL + out.sR / r.mismatch) / 2;
    peak = Math.max(peak, rate(s, r));
    poses?.pose(s.t, s.x, s.y, s.h);
  }
  return { finished: true, stalled: false, capped: false, peakRate: peak };
}

/** The mean of the two encoders' travel over `dt` (as they count it), along the drive's direction. */
function meanTravel(s: SimState, r: SimRobot, cL: number, cR: number, back: number, dt: number, decay?: number): number {
  return (back * (wheelTravel(s.vL, cL, r.lag, dt, decay) + wheelTravel(s.vR, cR, r.lag, dt, decay) / r.mismatch)) / 2;
}

export function clamp1(u: number): number {
  return u > 1 ? 1 : u < -1 ? -1 : u;
}

/**
 * Where the robot comes to rest if no more power is given: each wheel coasts
 * v·τ further (the integral of a first-order lag's decay), along one arc.
 */
export function coastedHeading(s: SimState, r: SimRobot): number {
  const sign = r.turns === 'clockwise' ? 1 : -1;
  return s.h + ((sign * (s.vL - s.vR) * r.lag) / r.track) / RAD;
}
