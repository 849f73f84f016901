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
import { MOTION_CAP_S, RAMP_FLOOR, STEADY_BULGE, type EncoderMotion, type GyroTurnMotion, type HoldDriveMotion, type SimMotion, type SimRobot, type SimState } from './motion';

const RAD = Math.PI / 180;
const DEG = 180 / Math.PI;
const SIXTH = 1 / 6;
const TWELFTH = 1 / 12;
const TWENTIETH = 1 / 20;
const THIRTIETH = 1 / 30;
const FORTY_SECOND = 1 / 42;
const FIFTY_SIXTH = 1 / 56;
/** As in motion.ts. */
const REST_SPEED = 1e-3;
const STEADY_RATIO = 1e-4;
const STEADY_DEG = 30;

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
  switch (m.kind) {
    case 'wait': return waitOn(s, r, m.time);
    case 'encoders': return encoders(s, r, m, travelScale);
    case 'gyro-turn': return gyroTurn(s, r, m);
    case 'hold': return hold(s, r, m, travelScale);
  }
}

function store(s: SimState, x: number, y: number, h: number, vL: number, vR: number, t: number, cachedH: number, sinH: number, cosH: number, tse: number): void {
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

/** wrapReading of solve/frame.ts; within the range the value itself (the floor is 0), with no division. */
function wrap(value: number, lo: number): number {
  const d = value - lo;
  const w = d >= 0 && d < 360 ? value : value - 360 * Math.floor(d / 360);
  return w >= lo + 360 ? w - 360 : w;
}

function effective(u: number, stall: number): number {
  return Math.abs(u) < stall ? 0 : u;
}

/** exp(−dt/lag), as motion.ts's decayOf. */
function decayOf(r: SimRobot, dt: number): number {
  if (dt === r.sample) return r.decay;
  if (dt === r.longStep) return r.decayLong;
  return r.lag > 0 ? Math.exp(-dt / r.lag) : 0;
}

/** Travel of one wheel over `dt` from speed v under command c (mm/s), exact (motion.ts's wheelTravel). */
function wheelTravel(v: number, c: number, lag: number, dt: number, decay: number | undefined): number {
  const g = lag > 0 ? lag * (1 - (decay ?? Math.exp(-dt / lag))) : 0;
  return g * v + c * (dt - g);
}

/** The decay exp(−t/lag) at the time crossingTime returned. */
const crossingDecay = new Float64Array(1);

/**
 * motion.ts's crossingTime, given the decay over `dt` (exp(−dt/lag), as decayOf gives it) instead of working it out
 * twice, and leaving the decay at the time it returns in `crossingDecay` (the same exp(−t/lag) decayOf would give).
 */
function crossingTime(v: number, c: number, lag: number, dt: number, need: number, decayAtDt: number): number {
  const whole = wheelTravel(v, c, lag, dt, decayAtDt);
  const dir = Math.sign(whole) || 1;
  let lo = 0;
  let hi = dt;
  let hiDecay = decayAtDt;
  let t = dt * Math.min(1, Math.max(0, need / (whole || need)));
  for (let k = 0; k < 30; k++) {
    const e = lag > 0 ? Math.exp(-t / lag) : 0;
    const f = dir * (wheelTravel(v, c, lag, t, e) - need);
    if (f >= 0) { hi = t; hiDecay = e; } else lo = t;
    if (Math.abs(f) < 1e-9) { crossingDecay[0] = e; return t; }
    if (hi - lo < 1e-12) break;
    const speed = dir * (c + (v - c) * e);
    let next = speed > 0 ? t - f / speed : (lo + hi) / 2;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    t = next;
  }
  crossingDecay[0] = hiDecay;
  return hi;
}

function clamp1(u: number): number {
  return u > 1 ? 1 : u < -1 ? -1 : u;
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
  store(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return true;
}

function encoders(s: SimState, r: SimRobot, m: EncoderMotion, travelScale: number): boolean {
  const left = m.left * travelScale;
  const right = m.right * travelScale;
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
  const power = m.power;
  const floor = Math.min(RAMP_FLOOR, power);
  const accel = m.accel !== undefined && m.accel > 0 ? m.accel : 0;
  const rampMin = m.rampMin ?? -1;
  const held = accel === 0 && rampMin < 0;
  const full = r.fullSpeed;
  const mismatch = r.mismatch;
  const lag = r.lag;
  const stall = r.stall;
  const track = r.track;
  let finished = true;
  // The last steady arc's commands and its step.
  let arcL = NaN;
  let arcR = NaN;
  let arcDt = 0;
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
      }
    }
    if (!(dt > 0 && dt <= MOTION_CAP_S)) dt = r.sample;
    let finishing = 0; // 1: the left wheel arrives in this step, 2: the right
    let a = decayOf(r, dt);
    if (!doneL) {
      const need = left - encL;
      const d = wheelTravel(vL, cL, lag, dt, a);
      if (Math.sign(need) * d >= Math.abs(need)) { dt = crossingTime(vL, cL, lag, dt, need, a); finishing = 1; a = crossingDecay[0]; }
    }
    if (!doneR) {
      const need = (right - encR) * mismatch;
      const d = wheelTravel(vR, cR, lag, dt, a);
      if (Math.sign(need) * d >= Math.abs(need)) { dt = crossingTime(vR, cR, lag, dt, need, a); finishing = 2; a = crossingDecay[0]; }
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
    encR += sR / mismatch;
    if (finishing === 1 || (!doneL && Math.sign(left) * (encL - left) >= -1e-9)) { doneL = true; encL = left; }
    if (finishing === 2 || (!doneR && Math.sign(right) * (encR - right) >= -1e-9)) { doneR = true; encR = right; }
  }
  store(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}

function gyroTurn(s: SimState, r: SimRobot, m: GyroTurnMotion): boolean {
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
  const target = m.target;
  const gain = m.gain;
  const min = m.min;
  const power = m.power;
  const stop = m.stop;
  const ramp = m.ramp;
  const shareL = m.shareL;
  const shareR = m.shareR;
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
  store(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}

function hold(s: SimState, r: SimRobot, m: HoldDriveMotion, travelScale: number): boolean {
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
  const distance = m.distance * travelScale;
  const goal = Math.abs(distance);
  const back = distance < 0 ? -1 : 1;
  const power = m.power;
  const floor = Math.min(RAMP_FLOOR, power);
  const target = m.target;
  const gain = m.gain;
  const accel = m.accel !== undefined && m.accel > 0 ? m.accel : 0;
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
      const floorSpeed = floor * full;
      const least = Math.min(power * full, accel * (t - start) + floorSpeed);
      const sq = 2 * accel * Math.max(0, goal - counted);
      const reach = least - floorSpeed;
      const bound = reach + least * 1e-9;
      const v = reach > 0 && !(sq > bound * bound) ? Math.min(least, Math.sqrt(sq) + floorSpeed) : least;
      p = v / full;
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
    const mean = (back * ((gSample * vL + cL * (sample - gSample)) + (gSample * vR + cR * (sample - gSample)) / mismatch)) / 2;
    if (mean >= need) {
      let lo2 = 0;
      let hi = dt;
      for (let k = 0; k < 30; k++) {
        const mid = (lo2 + hi) / 2;
        if ((back * (wheelTravel(vL, cL, lag, mid, undefined) + wheelTravel(vR, cR, lag, mid, undefined) / mismatch)) / 2 >= need) hi = mid;
        else lo2 = mid;
      }
      dt = hi;
    }
    const a = dt === sample ? decay : decayOf(r, dt);
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
    counted += dt === sample ? mean : back * (sL + sR / mismatch) / 2;
  }
  store(s, x, y, h, vL, vR, t, cachedH, sinH, cosH, tse);
  return finished;
}
