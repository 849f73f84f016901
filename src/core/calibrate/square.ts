// The bidirectional square test of Borenstein & Feng, "Measurement and
// correction of systematic odometry errors in mobile robots", IEEE Trans.
// Robotics and Automation 12(6), 1996: laps of an L × L square clockwise and
// counter-clockwise; from the centres of gravity of the laps' return errors,
// the wheel-diameter ratio and the track's scale.
//
// Frame (the paper's, and the one the record's lap lines use): the robot
// starts each lap facing along +x (the first leg), y is to its left; a
// clockwise lap (seen from above) turns right. A lap's return error is where
// the robot stopped minus where it started: x = how far ahead of the start,
// y = how far to the left. Only the x errors enter the formulas.

/** What the square test gives from the two centres of gravity. */
export interface SquareSolution {
  /** Turn error of each 90° turn, radians (positive: the robot turns too little). */
  alpha: number;
  /** Heading change per leg from unequal wheels, radians (positive: the path curves left). */
  beta: number;
  /** Radius of the curved leg, mm (Infinity for a straight one). */
  radius: number;
  /** Right wheel diameter over left (the paper's E_d). */
  mismatch: number;
  /** Actual over commanded track (the paper's E_b). */
  trackFactor: number;
}

/**
 * Borenstein & Feng's formulas: alpha = (x_cw + x_ccw)/(−4L),
 * beta = (x_cw − x_ccw)/(−4L), R = (L/2)/sin(beta/2),
 * E_d = (R + b/2)/(R − b/2), E_b = 90°/(90° − alpha).
 * `xCw`, `xCcw` and `side` in one length unit; `track` (b) in the same.
 */
export function solveSquare(xCw: number, xCcw: number, side: number, track: number): SquareSolution {
  const alpha = (xCw + xCcw) / (-4 * side);
  const beta = (xCw - xCcw) / (-4 * side);
  const s = Math.sin(beta / 2);
  const radius = s === 0 ? Infinity : side / 2 / s;
  // (R + b/2)/(R − b/2) written with 1/R, so a straight leg (1/R = 0) gives exactly 1.
  const inv = (2 * s) / side;
  const mismatch = (1 + (track / 2) * inv) / (1 - (track / 2) * inv);
  const alphaDeg = (alpha * 180) / Math.PI;
  return { alpha, beta, radius, mismatch, trackFactor: 90 / (90 - alphaDeg) };
}

/**
 * The return error of one lap, exactly, on the paper's wheel model: wheel
 * diameters 2/(1 + E_d) and 2E_d/(1 + E_d) of the nominal one, the real track
 * E_b times the commanded `track`; every leg commands `side` on both wheels,
 * every turn ±90° on the commanded track. Each motion is one arc (constant
 * wheel speeds), so the pose update is exact. Returns (x ahead, y left), the
 * paper's frame.
 */
export function lapError(mismatch: number, trackFactor: number, side: number, track: number, clockwise: boolean): { x: number; y: number } {
  const left = 2 / (1 + mismatch);
  const right = (2 * mismatch) / (1 + mismatch);
  const realTrack = trackFactor * track;
  const quarter = ((Math.PI / 2) * track) / 2;
  const turn = clockwise ? 1 : -1; // the left wheel forwards turns right
  let x = 0;
  let y = 0;
  let phi = 0; // counter-clockwise from +x
  const arc = (sL: number, sR: number) => {
    const dPhi = (sR - sL) / realTrack;
    const ds = (sL + sR) / 2;
    const half = dPhi / 2;
    const chord = Math.abs(half) < 1e-12 ? ds : (ds * Math.sin(half)) / half;
    x += chord * Math.cos(phi + half);
    y += chord * Math.sin(phi + half);
    phi += dPhi;
  };
  for (let leg = 0; leg < 4; leg++) {
    arc(side * left, side * right);
    arc(turn * quarter * left, -turn * quarter * right);
  }
  return { x, y };
}

/**
 * The mismatch and track factor whose exact laps (`lapError`) stop at the
 * measured x_cw and x_ccw: Newton's method on the two equations, started from
 * the paper's first-order formulas. The formulas alone leave out the products
 * of the errors (on a 1 m square, 1.6e-4 in E_b for a 1 % track error, 3.2e-4
 * for 0.5 % with a mismatch of 1.002);
 * this removes that. Undefined when it does not converge (errors far beyond
 * any robot's).
 */
export function refineSquare(xCw: number, xCcw: number, side: number, track: number): { mismatch: number; trackFactor: number } | undefined {
  const first = solveSquare(xCw, xCcw, side, track);
  let e = first.mismatch;
  let f = first.trackFactor;
  const residual = (ed: number, eb: number) => [lapError(ed, eb, side, track, true).x - xCw, lapError(ed, eb, side, track, false).x - xCcw];
  for (let k = 0; k < 30; k++) {
    const r = residual(e, f);
    if (Math.abs(r[0]) + Math.abs(r[1]) < 1e-10 * side) return { mismatch: e, trackFactor: f };
    const h = 1e-7;
    const re = residual(e + h, f);
    const rf = residual(e, f + h);
    const j = [[(re[0] - r[0]) / h, (rf[0] - r[0]) / h], [(re[1] - r[1]) / h, (rf[1] - r[1]) / h]];
    const det = j[0][0] * j[1][1] - j[0][1] * j[1][0];
    if (!(Math.abs(det) > 0)) return undefined;
    e -= (j[1][1] * r[0] - j[0][1] * r[1]) / det;
    f -= (-j[1][0] * r[0] + j[0][0] * r[1]) / det;
    if (!(e > 0.5 && e < 2 && f > 0.5 && f < 2)) return undefined;
  }
  return undefined;
}
