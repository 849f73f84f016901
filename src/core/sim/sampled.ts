// The controller simulation of motion.ts for the sampled runs of the Monte
// Carlo (spread/sample.ts): the same motions, controllers, steps and
// decisions, but with no trace, no pose sink and no outcome object, the
// state held in local variables for the whole motion and each plant step
// written out in the loop (a state object's number fields cost a load and a
// store per use; here they stay in registers). A robot whose reading is
// delayed (its heading history) is left to simulateMotion.
//
// The plant step's divisions by constants and by the track are made
// multiplications by their reciprocals, and the chord is ds·sin(half)/half
// from the series directly: the last bits of a step may differ from
// motion.ts's, and a sampled pose by far less than 1e-9 mm or degree
// (test/core/sampleBatch.test.ts holds the two paths equal to that).
//
// Keep it in step with motion.ts: a change to a controller or to the plant
// step there is made here too (the equality test catches a miss).
import {
  clamp1, decayOf, effective, MOTION_CAP_S as CAP_S, RAMP_FLOOR as FLOOR, REST_SPEED as REST, STEADY_BULGE as BULGE, STEADY_DEG as ST_DEG,
  STEADY_RATIO as RATIO, type SimMotion, type SimRobot, type SimState,
} from './motion';

/** motion.ts's constants, bound once: the loops read them every step (an imported binding can cost a lookup per use). */
const MOTION_CAP_S = CAP_S;
const RAMP_FLOOR = FLOOR;
const STEADY_BULGE = BULGE;
const REST_SPEED = REST;
const STEADY_RATIO = RATIO;
const STEADY_DEG = ST_DEG;

const RAD = Math.PI / 180;
const DEG = 180 / Math.PI;
const SIXTH = 1 / 6;
const TWELFTH = 1 / 12;
const TWENTIETH = 1 / 20;
const THIRTIETH = 1 / 30;
const FORTY_SECOND = 1 / 42;
const FIFTY_SIXTH = 1 / 56;

/** Whether `runSampledMotion` takes this robot: a reading without delay (no heading history to keep). */
export function sampledPathFits(r: SimRobot): boolean {
  return r.delay <= 0;
}

/**
 * Runs one motion from `s` (mutated to where the code moves on), as
 * simulateMotion(s, r, m) does with the motion's travel (an encoder motion's
 * two targets, a held drive's distance) multiplied by `travelScale`. Returns
 * whether the code moved on (false: the motion stalled or hit the cap).
 * Only for a robot that `sampledPathFits`.
 */
export function runSampledMotion(s: SimState, r: SimRobot, m: SimMotion, travelScale: number): boolean {
  return runPrepared(s, r, prepareSampled(m), travelScale);
}

/**
 * A motion's settings in one flat array, its kind first: the loops read them the same way whatever the shape of
 * the motion's object (the sampler prepares each motion once and runs it in every sampled run).
 */
export type SampledMotion = Float64Array;
const WAIT = 0;
const ENCODERS = 1;
const GYRO_TURN = 2;
const HOLD = 3;

export function prepareSampled(m: SimMotion): SampledMotion {
  switch (m.kind) {
    case 'wait': return Float64Array.of(WAIT, m.time);
    case 'encoders': return Float64Array.of(ENCODERS, m.left, m.right, m.power, m.accel !== undefined && m.accel > 0 ? m.accel : 0, m.rampMin ?? -1);
    case 'gyro-turn': return Float64Array.of(GYRO_TURN, m.target, m.gain, m.min, m.power, m.stop, m.ramp ? 1 : 0, m.shareL, m.shareR);
    case 'hold': return Float64Array.of(HOLD, m.target, m.gain, m.distance, m.power, m.accel !== undefined && m.accel > 0 ? m.accel : 0);
  }
}

/** runSampledMotion of a prepared motion. */
export function runPrepared(s: SimState, r: SimRobot, m: SampledMotion, travelScale: number): boolean {
  switch (m[0]) {
    case ENCODERS: return encoders(s, r, m, travelScale);
    case GYRO_TURN: return gyroTurn(s, r, m);
    case HOLD: return hold(s, r, m, travelScale);
    default: return waitOn(s, r, m[1]);
  }
}

/** wrapReading of solve/frame.ts; within the range the value itself (the floor is 0), with no division. */
function wrap(value: number, lo: number): number {
  const d = value - lo;
  const w = d >= 0 && d < 360 ? value : value - 360 * Math.floor(d / 360);
  return w >= lo + 360 ? w - 360 : w;
}

/**
 * The numbers in and out of `crossingTime` (a call passes and returns its numbers boxed, an allocation each):
 * in v, c, lag, dt, need and the decay over dt; out the time and the decay at that time.
 */
const cross = new Float64Array(8);
const V = 0, C = 1, LAG = 2, DT = 3, NEED = 4, DECAY_DT = 5, T_OUT = 6, DECAY_OUT = 7;

/**
 * motion.ts's crossingTime, given the decay over `dt` (exp(−dt/lag), as decayOf gives it) instead of working it out
 * twice, and giving the decay at the time it returns too (the same exp(−t/lag) that decayOf would give).
 */
function crossingTime(): void {
  const v = cross[V];
  const c = cross[C];
  const lag = cross[LAG];
  const dt = cross[DT];
  const need = cross[NEED];
  const decayAtDt = cross[DECAY_DT];
  const g0 = lag > 0 ? lag * (1 - decayAtDt) : 0;
  const whole = g0 * v + c * (dt - g0);
  const dir = Math.sign(whole) || 1;
  let lo = 0;
  let hi = dt;
  let hiDecay = decayAtDt;
  let t = dt * Math.min(1, Math.max(0, need / (whole || need)));
  for (let k = 0; k < 30; k++) {
    const e = lag > 0 ? Math.exp(-t / lag) : 0;
    const g = lag > 0 ? lag * (1 - e) : 0;
    const f = dir * ((g * v + c * (t - g)) - need);
    if (f >= 0) { hi = t; hiDecay = e; } else lo = t;
    if (Math.abs(f) < 1e-9) {
      cross[T_OUT] = t;
      cross[DECAY_OUT] = e;
      return;
    }
    if (hi - lo < 1e-12) break;
    const speed = dir * (c + (v - c) * e);
    let next = speed > 0 ? t - f / speed : (lo + hi) / 2;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    t = next;
  }
  cross[T_OUT] = hi;
  cross[DECAY_OUT] = hiDecay;
}

/** The motion's locals back into the state, once at its end (small enough to be inlined: no boxed numbers). */
function storeState(s: SimState, x: number, y: number, h: number, vL: number, vR: number, t: number, cachedH: number, sinH: number,
  cosH: number, tse: number): void {
  s.x = x;
  s.y = y;
  s.h = h;
  s.vL = vL;
  s.vR = vR;
  s.t = t;
  s.cachedH = cachedH;
  s.sinH = sinH;
  s.cosH = cosH;
  s.turnsSinceExact = tse;
}

function waitOn(s: SimState, r: SimRobot, time: number): boolean {
  let x = s.x;
  let y = s.y;
  let h = s.h;
  let vL = s.vL;
  let vR = s.vR;
  let t = s.t;
  let cachedH = s.cachedH;
  let sinH = s.sinH;
  let cosH = s.cosH;
  let tse = s.turnsSinceExact;
  let sL = 0;
  let sR = 0;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const invTrack = 1 / r.track;
  const end = t + time;
  while (t < end - 1e-12) {
    const dt = Math.min(r.sample, end - t);
    const a = decayOf(r, dt);
    const g = r.lag * (1 - a);
    const b = 1 - a;
    const cL = 0;
    const cR = 0;
    {
      // The plant step: motion.ts's advance with the commands cL, cR (mm/s) over dt, decay a, g = lag·(1 − a), b = 1 − a.
      sL = g * vL + cL * (dt - g);
      sR = g * vR + cR * (dt - g);
      vL = a * vL + b * cL;
      vR = a * vR + b * cR;
      const dTheta = sign * (sL - sR) * invTrack;
      const ds = (sL + sR) * 0.5;
      const half = dTheta * 0.5;
      const h2 = half * half;
      if (cachedH !== h) {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
      }
      const small = h2 < 1e-2;
      let sinHalf: number;
      let cosHalf: number;
      let chord: number;
      if (small) {
        const sinc = 1 - h2 * SIXTH * (1 - h2 * TWENTIETH * (1 - h2 * FORTY_SECOND)); // sin(half)/half
        sinHalf = half * sinc;
        cosHalf = 1 - h2 * 0.5 * (1 - h2 * TWELFTH * (1 - h2 * THIRTIETH * (1 - h2 * FIFTY_SIXTH)));
        chord = ds * sinc;
      } else {
        sinHalf = Math.sin(half);
        cosHalf = Math.cos(half);
        chord = (ds * sinHalf) / half;
      }
      const sinMid = sinH * cosHalf + cosH * sinHalf;
      const cosMid = cosH * cosHalf - sinH * sinHalf;
      if (ds !== 0) {
        x += sign * sinMid * chord;
        y += cosMid * chord;
      }
      h += dTheta * DEG;
      if (small && ++tse < 64) {
        sinH = sinMid * cosHalf + cosMid * sinHalf;
        cosH = cosMid * cosHalf - sinMid * sinHalf;
      } else {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
        tse = 0;
      }
      cachedH = h;
      t += dt;
    }
    // Once the wheels are at rest nothing changes: jump to the end.
    if (Math.abs(vL) < REST_SPEED && Math.abs(vR) < REST_SPEED) {
      vL = 0;
      vR = 0;
      t = end;
    }
  }
  t = end;
  storeState(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return true;
}

function encoders(s: SimState, r: SimRobot, m: SampledMotion, travelScale: number): boolean {
  const left = m[1] * travelScale;
  const right = m[2] * travelScale;
  const outer = Math.max(Math.abs(left), Math.abs(right));
  if (outer === 0) return true;
  let x = s.x;
  let y = s.y;
  let h = s.h;
  let vL = s.vL;
  let vR = s.vR;
  let t = s.t;
  let cachedH = s.cachedH;
  let sinH = s.sinH;
  let cosH = s.cosH;
  let tse = s.turnsSinceExact;
  let sL = 0;
  let sR = 0;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const invTrack = 1 / r.track;
  const start = t;
  const shareL = left / outer;
  const shareR = right / outer;
  let encL = 0;
  let encR = 0;
  let doneL = left === 0;
  let doneR = right === 0;
  const power = m[3];
  const floor = Math.min(RAMP_FLOOR, power);
  const accel = m[4];
  const rampMin = m[5];
  const held = accel === 0 && rampMin < 0;
  const full = r.fullSpeed;
  const mismatch = r.mismatch;
  const lag = r.lag;
  const stall = r.stall;
  const track = r.track;
  const sample = r.sample;
  const longStep = r.longStep;
  const decay = r.decay;
  const decayLong = r.decayLong;
  const unit = mismatch === 1; // x / 1 is x: no division
  let finished = true;
  // The last steady arc's commands and its step.
  let arcL = NaN;
  let arcR = NaN;
  let arcDt = 0;
  let arcDecay = 0;
  while (!(doneL && doneR)) {
    if (!(t - start < MOTION_CAP_S)) { finished = false; break; }
    // The outer wheel's power now.
    let p = power;
    if (!held) {
      const progress = Math.max(left !== 0 ? Math.abs(encL / left) : 0, right !== 0 ? Math.abs(encR / right) : 0);
      if (accel > 0) {
        const remaining = Math.max(0, outer * (1 - progress));
        const v = Math.min(power * full, accel * (t - start) + floor * full, Math.sqrt(2 * accel * remaining) + floor * full);
        p = v / full;
      } else {
        p = rampMin + (power - rampMin) * Math.min(1, 2 * progress, 2 * (1 - progress));
        p = Math.max(rampMin, Math.min(power, p));
      }
    }
    const moving = Math.abs(p) >= stall;
    const uL = doneL || !moving ? 0 : shareL * p;
    const uR = doneR || !moving ? 0 : shareR * p;
    if (!moving && Math.abs(vL) < REST_SPEED && Math.abs(vR) < REST_SPEED) { finished = false; break; }
    const cL = uL * full;
    const cR = uR * full * mismatch;
    let dt = held ? r.longStep : r.sample;
    // One arc at any length while the speeds stand in the ratio of their commands (motion.ts says why).
    const scale = Math.abs(cL) + Math.abs(cR);
    if (held && scale > 0 && Math.abs(vL * cR - vR * cL) <= STEADY_RATIO * scale * scale && vL * cL >= 0 && vR * cR >= 0) {
      if (cL === arcL && cR === arcR) dt = arcDt; // the same commands: the same step
      else {
        const turnRate = Math.abs(cL - cR) / track;
        if (turnRate === 0) dt = MOTION_CAP_S;
        else {
          const radius = (Math.abs(cL + cR) / 2) / turnRate;
          const angle = radius > STEADY_BULGE ? 2 * Math.acos(1 - STEADY_BULGE / radius) : Math.PI;
          dt = Math.max(dt, Math.min(angle, STEADY_DEG * RAD) / turnRate);
        }
        arcL = cL;
        arcR = cR;
        arcDt = dt;
        arcDecay = decayOf(r, dt);
      }
    }
    if (!(dt > 0 && dt <= MOTION_CAP_S)) dt = r.sample;
    let finishing = 0; // 1: the left wheel arrives in this step, 2: the right
    // decayOf(dt), and wheelTravel below, written out: a call that is not inlined passes its numbers boxed.
    let a = dt === arcDt ? arcDecay : dt === sample ? decay : dt === longStep ? decayLong : lag > 0 ? Math.exp(-dt / lag) : 0;
    if (!doneL) {
      const need = left - encL;
      const gd = lag > 0 ? lag * (1 - a) : 0;
      const d = gd * vL + cL * (dt - gd);
      if (Math.sign(need) * d >= Math.abs(need)) {
        cross[V] = vL; cross[C] = cL; cross[LAG] = lag; cross[DT] = dt; cross[NEED] = need; cross[DECAY_DT] = a;
        crossingTime();
        dt = cross[T_OUT];
        a = cross[DECAY_OUT];
        finishing = 1;
      }
    }
    if (!doneR) {
      const need = (right - encR) * mismatch;
      const gd = lag > 0 ? lag * (1 - a) : 0;
      const d = gd * vR + cR * (dt - gd);
      if (Math.sign(need) * d >= Math.abs(need)) {
        cross[V] = vR; cross[C] = cR; cross[LAG] = lag; cross[DT] = dt; cross[NEED] = need; cross[DECAY_DT] = a;
        crossingTime();
        dt = cross[T_OUT];
        a = cross[DECAY_OUT];
        finishing = 2;
      }
    }
    const g = lag * (1 - a);
    const b = 1 - a;
    {
      // The plant step: motion.ts's advance with the commands cL, cR (mm/s) over dt, decay a, g = lag·(1 − a), b = 1 − a.
      sL = g * vL + cL * (dt - g);
      sR = g * vR + cR * (dt - g);
      vL = a * vL + b * cL;
      vR = a * vR + b * cR;
      const dTheta = sign * (sL - sR) * invTrack;
      const ds = (sL + sR) * 0.5;
      const half = dTheta * 0.5;
      const h2 = half * half;
      if (cachedH !== h) {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
      }
      const small = h2 < 1e-2;
      let sinHalf: number;
      let cosHalf: number;
      let chord: number;
      if (small) {
        const sinc = 1 - h2 * SIXTH * (1 - h2 * TWENTIETH * (1 - h2 * FORTY_SECOND)); // sin(half)/half
        sinHalf = half * sinc;
        cosHalf = 1 - h2 * 0.5 * (1 - h2 * TWELFTH * (1 - h2 * THIRTIETH * (1 - h2 * FIFTY_SIXTH)));
        chord = ds * sinc;
      } else {
        sinHalf = Math.sin(half);
        cosHalf = Math.cos(half);
        chord = (ds * sinHalf) / half;
      }
      const sinMid = sinH * cosHalf + cosH * sinHalf;
      const cosMid = cosH * cosHalf - sinH * sinHalf;
      if (ds !== 0) {
        x += sign * sinMid * chord;
        y += cosMid * chord;
      }
      h += dTheta * DEG;
      if (small && ++tse < 64) {
        sinH = sinMid * cosHalf + cosMid * sinHalf;
        cosH = cosMid * cosHalf - sinMid * sinHalf;
      } else {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
        tse = 0;
      }
      cachedH = h;
      t += dt;
    }
    encL += sL;
    encR += unit ? sR : sR / mismatch;
    if (finishing === 1 || (!doneL && Math.sign(left) * (encL - left) >= -1e-9)) { doneL = true; encL = left; }
    if (finishing === 2 || (!doneR && Math.sign(right) * (encR - right) >= -1e-9)) { doneR = true; encR = right; }
  }
  storeState(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}

function gyroTurn(s: SimState, r: SimRobot, m: SampledMotion): boolean {
  let x = s.x;
  let y = s.y;
  let h = s.h;
  let vL = s.vL;
  let vR = s.vR;
  let t = s.t;
  let cachedH = s.cachedH;
  let sinH = s.sinH;
  let cosH = s.cosH;
  let tse = s.turnsSinceExact;
  let sL = 0;
  let sR = 0;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const invTrack = 1 / r.track;
  const target = m[1];
  const gain = m[2];
  const min = m[3];
  const power = m[4];
  const stop = m[5];
  const ramp = m[6] !== 0;
  const shareL = m[7];
  const shareR = m[8];
  const full = r.fullSpeed;
  const mismatch = r.mismatch;
  const stall = r.stall;
  const scale = r.scale;
  const zero = s.zero;
  const lo = r.yawLo;
  const sample = r.sample;
  const longStep = r.longStep;
  const decay = r.decay;
  const decayLong = r.decayLong;
  const lag = r.lag;
  const start = t;
  const first = wrap(scale * (h - zero), lo);
  const span = target - first;
  // motion.ts's longTurns with no trace and no pose sink (the reading has no delay here).
  const longTurns = !ramp;
  let finished: boolean;
  // Saved before a long step, to go back when it is not kept.
  let x0 = 0, y0 = 0, h0 = 0, vL0 = 0, vR0 = 0, t0 = 0;
  // 0: a step of one sample; 1: a long step; 2: a long step's end, to be checked.
  let phase = 0;
  let reading = 0;
  let e = 0;
  let dir = 0;
  let saturated = false;
  let cL = 0;
  let cR = 0;
  for (;;) {
    if (phase === 2) {
      // After a long step: kept when the error is still saturated (or still under the floor's reach), outside the
      // stop band, on the same side, and the reading has not wrapped; otherwise back to before it, one sample.
      phase = 0;
      const after = wrap(scale * (h - zero), lo);
      const eAfter = target - after;
      const keeps = saturated ? gain * Math.abs(eAfter) >= power : Math.abs(eAfter) >= stop && Math.abs(eAfter) <= Math.abs(e);
      if (!(keeps && Math.sign(eAfter) === dir && Math.abs(after - reading - scale * (h - h0)) < 1e-6)) {
        // As in motion.ts, the heading's sin and cos stay as the long step left them.
        x = x0; y = y0; h = h0; vL = vL0; vR = vR0; t = t0;
        phase = 3;
      }
    }
    // phase 3: one sample step after a long step was undone, with the commands worked out before it.
    if (phase === 3) phase = 0;
    else {
      reading = wrap(scale * (h - zero), lo);
      e = target - reading;
      if (Math.abs(e) < stop) { finished = true; break; }
      if (!(t - start < MOTION_CAP_S)) { finished = false; break; }
      let u: number;
      if (ramp) {
        const progress = span === 0 ? 1 : (reading - first) / span;
        u = min + (power - min) * Math.max(0, Math.min(1, 2 * progress, 2 * (1 - progress)));
      } else u = Math.min(power, Math.max(min, gain * Math.abs(e)));
      dir = Math.sign(e); // +1: turn in the positive direction
      const uL = dir * u * shareL;
      const uR = dir * u * shareR;
      const eL = effective(uL, stall);
      const eR = effective(uR, stall);
      if (eL === 0 && eR === 0 && Math.abs(vL) < REST_SPEED && Math.abs(vR) < REST_SPEED) { finished = false; break; }
      cL = eL * full;
      cR = eR * full * mismatch;
      saturated = u === power && gain * Math.abs(e) >= power;
      const floored = u === min && gain * Math.abs(e) <= min && effective(u, stall) !== 0;
      if (longTurns && (saturated || floored)) {
        // steady(): the speeds in the ratio of the commands uL·full, uR·full·mismatch, each turning its way.
        const kL = uL * full;
        const kR = uR * full * mismatch;
        const k = Math.abs(kL) + Math.abs(kR);
        if (k > 0 && Math.abs(vL * kR - vR * kL) <= STEADY_RATIO * k * k && vL * kL >= 0 && vR * kR >= 0) {
          x0 = x; y0 = y; h0 = h; vL0 = vL; vR0 = vR; t0 = t;
          phase = 1;
        }
      }
    }
    const dt = phase === 1 ? longStep : sample;
    const a = phase === 1 ? decayLong : decay;
    const g = lag * (1 - a);
    const b = 1 - a;
    {
      // The plant step: motion.ts's advance with the commands cL, cR (mm/s) over dt, decay a, g = lag·(1 − a), b = 1 − a.
      sL = g * vL + cL * (dt - g);
      sR = g * vR + cR * (dt - g);
      vL = a * vL + b * cL;
      vR = a * vR + b * cR;
      const dTheta = sign * (sL - sR) * invTrack;
      const ds = (sL + sR) * 0.5;
      const half = dTheta * 0.5;
      const h2 = half * half;
      if (cachedH !== h) {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
      }
      const small = h2 < 1e-2;
      let sinHalf: number;
      let cosHalf: number;
      let chord: number;
      if (small) {
        const sinc = 1 - h2 * SIXTH * (1 - h2 * TWENTIETH * (1 - h2 * FORTY_SECOND)); // sin(half)/half
        sinHalf = half * sinc;
        cosHalf = 1 - h2 * 0.5 * (1 - h2 * TWELFTH * (1 - h2 * THIRTIETH * (1 - h2 * FIFTY_SIXTH)));
        chord = ds * sinc;
      } else {
        sinHalf = Math.sin(half);
        cosHalf = Math.cos(half);
        chord = (ds * sinHalf) / half;
      }
      const sinMid = sinH * cosHalf + cosH * sinHalf;
      const cosMid = cosH * cosHalf - sinH * sinHalf;
      if (ds !== 0) {
        x += sign * sinMid * chord;
        y += cosMid * chord;
      }
      h += dTheta * DEG;
      if (small && ++tse < 64) {
        sinH = sinMid * cosHalf + cosMid * sinHalf;
        cosH = cosMid * cosHalf - sinMid * sinHalf;
      } else {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
        tse = 0;
      }
      cachedH = h;
      t += dt;
    }
    if (phase === 1) phase = 2;
  }
  storeState(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}

function hold(s: SimState, r: SimRobot, m: SampledMotion, travelScale: number): boolean {
  let x = s.x;
  let y = s.y;
  let h = s.h;
  let vL = s.vL;
  let vR = s.vR;
  let t = s.t;
  let cachedH = s.cachedH;
  let sinH = s.sinH;
  let cosH = s.cosH;
  let tse = s.turnsSinceExact;
  let sL = 0;
  let sR = 0;
  const sign = r.turns === 'clockwise' ? 1 : -1;
  const invTrack = 1 / r.track;
  const distance = m[3] * travelScale;
  const goal = Math.abs(distance);
  const back = distance < 0 ? -1 : 1;
  const power = m[4];
  const floor = Math.min(RAMP_FLOOR, power);
  const target = m[1];
  const gain = m[2];
  const accel = m[5];
  const full = r.fullSpeed;
  const mismatch = r.mismatch;
  const stall = r.stall;
  const lag = r.lag;
  const scale = r.scale;
  const zero = s.zero;
  const lo = r.yawLo;
  const sample = r.sample;
  const decay = r.decay;
  const gSample = lag * (1 - decay);
  const unit = mismatch === 1; // x / 1 is x: no division
  const floorSpeed = floor * full;
  const top = power * full;
  const pTop = top / full;
  let risen = false;
  const start = t;
  let counted = 0; // mean of the two encoders, along the drive's direction
  let finished = true;
  while (counted < goal - 1e-9) {
    if (!(t - start < MOTION_CAP_S)) { finished = false; break; }
    const e = target - wrap(scale * (h - zero), lo);
    let p = power;
    if (accel > 0) {
      // Math.min(power·full, accel·(t − start) + floor·full, √(2·accel·left) + floor·full), the root worked out only
      // where it can be the least (where it is surely larger, the least of the other two is the least of all three).
      // Once the rise has reached the top it stays there (t only grows): the top alone.
      let least = top;
      if (!risen) {
        const rise = accel * (t - start) + floorSpeed;
        least = Math.min(top, rise);
        risen = rise >= top;
      }
      const sq = 2 * accel * Math.max(0, goal - counted);
      const reach = least - floorSpeed;
      const bound = reach + least * 1e-9;
      const v = reach > 0 && !(sq > bound * bound) ? Math.min(least, Math.sqrt(sq) + floorSpeed) : least;
      p = v === top ? pTop : v / full;
    }
    const steer = sign * gain * e;
    const uL = clamp1(back * p + steer);
    const uR = clamp1(back * p - steer);
    const eL = effective(uL, stall);
    const eR = effective(uR, stall);
    if (eL === 0 && eR === 0 && Math.abs(vL) < REST_SPEED && Math.abs(vR) < REST_SPEED) { finished = false; break; }
    // Would the encoders' mean pass the distance within this sample? Find when.
    const cL = eL * full;
    const cR = eR * full * mismatch;
    let dt = sample;
    const need = goal - counted;
    // The encoders' mean over a sample (the step's own travels, as wheelTravel gives them: g is 0 without a lag).
    const travelR = gSample * vR + cR * (sample - gSample);
    const mean = (back * ((gSample * vL + cL * (sample - gSample)) + (unit ? travelR : travelR / mismatch))) / 2;
    // The decay over dt: that of a sample, or (the bisection's end) the one worked out at that time.
    let a = decay;
    if (mean >= need) {
      cross[DECAY_OUT] = decay; // the decay at hi, kept out of a boxed local
      let lo2 = 0;
      let hi = dt;
      for (let k = 0; k < 30; k++) {
        const mid = (lo2 + hi) / 2;
        // exp(−mid/lag) once for both wheels (wheelTravel would work out the same number for each).
        // wheelTravel of each wheel written out (a call that is not inlined passes its numbers boxed).
        const e = lag > 0 ? Math.exp(-mid / lag) : 0;
        const gm = lag > 0 ? lag * (1 - e) : 0;
        const midR = gm * vR + cR * (mid - gm);
        if ((back * ((gm * vL + cL * (mid - gm)) + (unit ? midR : midR / mismatch))) / 2 >= need) {
          hi = mid;
          cross[DECAY_OUT] = e;
        } else lo2 = mid;
      }
      dt = hi;
      a = cross[DECAY_OUT];
    }
    const g = lag * (1 - a);
    const b = 1 - a;
    {
      // The plant step: motion.ts's advance with the commands cL, cR (mm/s) over dt, decay a, g = lag·(1 − a), b = 1 − a.
      sL = g * vL + cL * (dt - g);
      sR = g * vR + cR * (dt - g);
      vL = a * vL + b * cL;
      vR = a * vR + b * cR;
      const dTheta = sign * (sL - sR) * invTrack;
      const ds = (sL + sR) * 0.5;
      const half = dTheta * 0.5;
      const h2 = half * half;
      if (cachedH !== h) {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
      }
      const small = h2 < 1e-2;
      let sinHalf: number;
      let cosHalf: number;
      let chord: number;
      if (small) {
        const sinc = 1 - h2 * SIXTH * (1 - h2 * TWENTIETH * (1 - h2 * FORTY_SECOND)); // sin(half)/half
        sinHalf = half * sinc;
        cosHalf = 1 - h2 * 0.5 * (1 - h2 * TWELFTH * (1 - h2 * THIRTIETH * (1 - h2 * FIFTY_SIXTH)));
        chord = ds * sinc;
      } else {
        sinHalf = Math.sin(half);
        cosHalf = Math.cos(half);
        chord = (ds * sinHalf) / half;
      }
      const sinMid = sinH * cosHalf + cosH * sinHalf;
      const cosMid = cosH * cosHalf - sinH * sinHalf;
      if (ds !== 0) {
        x += sign * sinMid * chord;
        y += cosMid * chord;
      }
      h += dTheta * DEG;
      if (small && ++tse < 64) {
        sinH = sinMid * cosHalf + cosMid * sinHalf;
        cosH = cosMid * cosHalf - sinMid * sinHalf;
      } else {
        sinH = Math.sin(h * RAD);
        cosH = Math.cos(h * RAD);
        tse = 0;
      }
      cachedH = h;
      t += dt;
    }
    counted += dt === sample ? mean : back * (sL + (unit ? sR : sR / mismatch)) / 2;
  }
  storeState(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}
