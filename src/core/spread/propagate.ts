// Linear propagation of the pose's uncertainty along wheel travel (the robot
// model, section 3): each wheel's travel carries a random error of variance
// k·|travel| (Chong & Kleeman, 1997), pushed through the odometry update by
// its Jacobians, in sub-steps of at most MAX_STEP_MM so that the growth of the
// across-track spread with the heading error is followed.
//
// Poses here use the compass convention (heading clockwise from +y, in
// radians); the caller turns a counterclockwise file's headings round.

/** A symmetric 3×3 covariance of (x, y, heading) as its six entries (mm², mm·rad, rad²). */
export interface Cov3 {
  xx: number;
  xy: number;
  xh: number;
  yy: number;
  yh: number;
  hh: number;
}

export const ZERO_COV: Cov3 = { xx: 0, xy: 0, xh: 0, yy: 0, yh: 0, hh: 0 };

/** The longest travel (mm, of the faster wheel) propagated in one step. */
export const MAX_STEP_MM = 100;

/**
 * The covariance after the wheels travel sL and sR (mm) from a pose heading
 * `h` (compass radians), with track `b` (mm) and per-wheel error constants
 * kL, kR (mm: variance k·|travel|), in sub-steps.
 */
export function propagateTravel(p: Cov3, h: number, sL: number, sR: number, b: number, kL: number, kR: number): Cov3 {
  const n = Math.max(1, Math.ceil(Math.max(Math.abs(sL), Math.abs(sR)) / MAX_STEP_MM));
  let out = p;
  let heading = h;
  for (let i = 0; i < n; i++) {
    out = odometryStep(out, heading, sL / n, sR / n, b, kL, kR);
    heading += (sL - sR) / n / b;
  }
  return out;
}

/**
 * One odometry step: x += ds·sin(h + dh/2), y += ds·cos(h + dh/2), h += dh,
 * with ds = (sL + sR)/2 and dh = (sL − sR)/b; P' = F P Fᵀ + G Q Gᵀ with Q =
 * diag(kL|sL|, kR|sR|).
 */
export function odometryStep(p: Cov3, h: number, sL: number, sR: number, b: number, kL: number, kR: number): Cov3 {
  const ds = (sL + sR) / 2;
  const dh = (sL - sR) / b;
  const m = h + dh / 2;
  const sin = Math.sin(m);
  const cos = Math.cos(m);
  // F = [[1, 0, f13], [0, 1, f23], [0, 0, 1]]
  const f13 = ds * cos;
  const f23 = -ds * sin;
  const xx = p.xx + 2 * f13 * p.xh + f13 * f13 * p.hh;
  const xy = p.xy + f13 * p.yh + f23 * p.xh + f13 * f23 * p.hh;
  const xh = p.xh + f13 * p.hh;
  const yy = p.yy + 2 * f23 * p.yh + f23 * f23 * p.hh;
  const yh = p.yh + f23 * p.hh;
  const hh = p.hh;
  // G columns: the pose's change per mm of left and of right wheel travel.
  const gLx = sin / 2 + (ds * cos) / (2 * b);
  const gLy = cos / 2 - (ds * sin) / (2 * b);
  const gLh = 1 / b;
  const gRx = sin / 2 - (ds * cos) / (2 * b);
  const gRy = cos / 2 + (ds * sin) / (2 * b);
  const gRh = -1 / b;
  const qL = kL * Math.abs(sL);
  const qR = kR * Math.abs(sR);
  return {
    xx: xx + qL * gLx * gLx + qR * gRx * gRx,
    xy: xy + qL * gLx * gLy + qR * gRx * gRy,
    xh: xh + qL * gLx * gLh + qR * gRx * gRh,
    yy: yy + qL * gLy * gLy + qR * gRy * gRy,
    yh: yh + qL * gLy * gLh + qR * gRy * gRh,
    hh: hh + qL * gLh * gLh + qR * gRh * gRh,
  };
}
