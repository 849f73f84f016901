// Closed-form times of the plan language's motions (spec section 8).

/**
 * Time to travel `distance` at top speed `v`, accelerating and decelerating at
 * `accel` (trapezoidal profile; triangular when too short to reach `v`).
 * Without `accel` the speed is reached at once.
 */
export function profileTime(distance: number, v: number, accel?: number): number {
  const d = Math.abs(distance);
  if (d === 0) return 0;
  if (!(v > 0)) return Infinity;
  if (accel === undefined || !(accel > 0)) return d / v;
  // Distance spent reaching v and stopping again: v^2 / (2a) each way.
  if (d >= (v * v) / accel) return d / v + v / accel;
  return 2 * Math.sqrt(d / accel);
}

/**
 * Time to cover `s` while the speed changes linearly with distance from `v0`
 * to `v1`: t = s ln(v1/v0) / (v1 - v0) (spec section 8), `s / v0` when equal.
 */
export function linearRampTime(s: number, v0: number, v1: number): number {
  if (s === 0) return 0;
  if (!(v0 > 0) || !(v1 > 0)) return Infinity;
  if (Math.abs(v1 - v0) < 1e-12 * Math.max(v0, v1)) return s / v0;
  return (s * Math.log(v1 / v0)) / (v1 - v0);
}

/**
 * An encoder turn: the faster wheel travels `s` mm. Top wheel speed `vTop`,
 * lowest `vMin` (both mm/s). With `ramp` the power rises linearly with
 * progress from min to top half way and falls back to min.
 */
export function encoderTurnTime(s: number, vTop: number, vMin: number, ramp: boolean): number {
  const d = Math.abs(s);
  if (!ramp) return d > 0 ? d / vTop : 0;
  return 2 * linearRampTime(d / 2, vMin, vTop);
}

export interface GyroTurnParams {
  /** Size of the turn, degrees (unsigned). */
  angle: number;
  /** Turn rate at 100 % power, degrees per second. */
  ratePerPower: number;
  /** Proportional gain, fraction of power per degree of error (1 %/deg = 0.01). */
  gain: number;
  top: number;
  min: number;
  /** The controller stops when |error| < stop, degrees. */
  stop: number;
  /** Motor first-order time constant, s. */
  lag: number;
}

/**
 * A proportional gyro turn in closed form, with power clamp(gain*|e|, min, top):
 * full power while gain*e >= top, an exponential approach while between the
 * limits (de/dt = -k*gain*e), then minimum power down to the stop band. The
 * motor lag adds about one time constant to reach speed. The controller
 * simulation (with lag and 10 ms sampling) will replace this estimate.
 */
export function gyroTurnTime(p: GyroTurnParams): number {
  const { angle, ratePerPower: k, gain, top, min, stop, lag } = p;
  if (!(angle > stop)) return 0;
  if (!(k > 0) || !(top > 0)) return Infinity;
  const eTop = gain > 0 ? top / gain : Infinity; // error above which power is at top
  const eMin = gain > 0 ? min / gain : Infinity; // error below which power is at min
  let t = 0;
  let e = angle;
  if (e > eTop) {
    t += (e - eTop) / (k * top);
    e = eTop;
  }
  const eEnd = Math.max(eMin, stop);
  if (e > eEnd && gain > 0) {
    t += Math.log(e / eEnd) / (k * gain);
    e = eEnd;
  }
  if (e > stop) {
    if (!(min > 0)) return Infinity;
    t += (e - stop) / (k * min);
  }
  return t + lag;
}
