// Fitting the robot model to a recorded run (the robot model, sections 1, 2 and 5):
// motor speed, lag and stall power from the commanded powers and the wheel
// travel; the effective track (or the gyro scale), the wheel mismatch, the
// reading's delay and the gyro's drift from the yaw reading against the wheel
// travel. Each value comes with its standard
// error, its 95 % interval and the number of samples behind it, or a plain note
// saying why this log cannot give it.
//
// API
//
//   currentFromSetup(setup: PlanSetup): FitCurrent
//       The plan's robot as the fit needs it (the checked plan's setup, defaults
//       filled in by the check).
//
//   fitRobot(run: RecordedRun, current: FitCurrent, options?: FitOptions): FitResult
//       result.params.{motorSpeed, motorLag, stall, effectiveTrack, gyroScale,
//       mismatch, gyroDelay, drift}: each a FitParam { found, value?, se?, low?,
//       high?, current?, differs?, samples, note? } in the plan's canonical units
//       (deg/s of the motor shaft, s, fraction, mm, plain number, plain number,
//       s, deg/s). `found` false: `note` says why and no number is set. Nothing
//       is ever NaN.
//       The log's travel is as the log reader gives it: mm of the plan's wheel
//       diameter, the right wheel's with the plan's mismatch in it.
//       result.notes: what the fit assumed or skipped, for the whole log.
//       result.residual: rms misfit of the wheel travel (mm) and of the yaw (deg).
//       result.wheelSpeed / eachWheel: the motor fit's own mm/s at full power
//       (both wheels together, and each on its own).
//       effectiveTrack and gyroScale are two readings of ONE number (the yaw per
//       mm of wheel-travel difference): effectiveTrack assumes the plan's gyro
//       scale, gyroScale assumes the plan's effective track. Apply one of them.
//
//   fitFixes(text: string, result: FitResult, options?: FitFixOptions): Fix[]
//       The results as setup-line edits of the plan text (the Fix shape of
//       types.ts, applied with fix/text.ts `applyEdits`): first one fix with every
//       recommended edit (preferred), then one per setup line. Values are offered
//       only where the log found them and the plan's value lies outside their
//       95 % interval (options.all: every value found); fixes' titles give the
//       value and its interval, `changesPath` is set on every one. The track is the
//       recommended reading of the yaw fit; the gyro scale is offered as a
//       separate fix "instead of the track".
//
// How (docs/recorded-runs.md, "Fitting the robot model", says it for users):
// - Motor: an output-error fit. Each wheel is simulated from the log's powers
//   with the exact zero-order-hold step of the plant (power held from its row
//   to the next), and the simulated travel is fitted to the recorded travel by
//   least squares. Given the lag the travel is linear in the wheel speed per
//   unit power K and in each wheel's starting travel and speed, so those are
//   solved exactly and only the lag is searched (a grid on its log, then
//   Brent's search).
//   Both wheels share K and the lag (the plan has one `motor` line; the
//   encoders count nominal-wheel mm, so `mismatch` does not enter); each
//   wheel's own K is worked out too, and a note says when they disagree.
//   (An equation-error fit of the recursion, linear in a and (1-a)K, would
//   take the speeds from differences of noisy travel readings, which biases
//   it: errors in the variables. The output-error fit has no such bias.)
//   The travel's error is white noise, and the wheels' speed may take random
//   pushes (bumps, a tiring battery) that die away through the lag: least
//   squares first, then the pushes' strength by maximum likelihood (kept only
//   where the likelihood-ratio test finds them) and, where there are some, the
//   stall and lag again by generalised least squares through the Kalman
//   filter of that error (plantSums). Covariance: residual variance x
//   (J' W J)^-1 with the full Jacobian (the lag's column by central
//   differences) through the same filter; the motor speed in deg/s by the
//   delta method.
// - Stall: the fit's residual as a function of the stall power changes only
//   where the stall passes a power the log commands. Every such step is tried
//   (coarse then fine when there are many); the stall is bracketed between
//   the largest power that does not move the wheels and the smallest that
//   does, and the reported interval joins every bracket whose residual is
//   within the 95 % likelihood-ratio bound (chi-square, 1 degree: 3.84) of the
//   best. It is a bracket between commanded powers, not a normal interval.
// - Yaw: reading = c1 x left' + c2 x right' + drift x t + an offset per
//   stretch between resets, with each wheel's travel (at the row's time less
//   the reading's delay) as degrees of heading for a 1 mm track. c1 = scale /
//   b_eff; c2 / c1 = true mismatch / plan's mismatch (fitted only when the log
//   both drives and turns; else one column, the plan's mismatch). Wraps are
//   undone and resets found from the jump of one sample against the one
//   predicted from the wheels. The reading's error is white noise plus a
//   random walk (a gyro's angle random walk, slip that builds up): linear
//   least squares (offsets eliminated per stretch) for the searches, then
//   generalised least squares through the local-level Kalman filter, the
//   walk's share of the noise by maximum likelihood (kept only where the
//   likelihood-ratio test finds it); with no walk that is least squares
//   again. The drift is fitted only when the log holds at least STILL_MIN_S
//   seconds with both wheels still; otherwise it is taken as zero. The delay:
//   the residual's minimum over a grid and Brent's search, its se from its
//   Gauss–Newton column; the rest is fitted at it only where it differs from
//   the plan's by more than its interval and a quarter row (the wheels' noise,
//   interpolated between rows, adds error its se does not count).
import type { Fix, PlanSetup, Statement, TextEdit, TurnDirection } from '../types';
import type { RecordedRun } from './types';
import { parsePlan } from '../syntax/parser';
import { insertLinesBefore, lineEndOf } from '../fix/text';

const RAD = Math.PI / 180;
/** The normal distribution's two-sided 95 % quantile. */
export const Z95 = 1.959963984540054;
/** Chi-square, one degree of freedom, 95 %: the likelihood-ratio bound of the stall bracket. */
const CHI2_1_95 = 3.841458820694124;
/** Seconds with both wheels still that the drift needs. */
export const STILL_MIN_S = 1;
/** Both wheels moving less than this (mm) from one row to the next count as still. */
const STILL_MM = 0.5;
/** A yaw reading that differs from the one the wheels predict by more than this (degrees, plus a tenth of the predicted change) starts a new stretch (a reset). */
const JUMP_DEG = 5;
/** The lag is searched between these (s). */
const LAG_LO = 1e-4;
const LAG_HI = 5;
/** Powers up to this share are tried as the stall. */
const STALL_CANDIDATES_BELOW = 0.6;
/** The yaw needs at least this much turning (degrees) to tell the track. */
const MIN_TURNED_DEG = 20;
/** The mismatch is fitted only where the two wheels' travels are less correlated than this, and kept only with a standard error below MISMATCH_SE_MAX. */
const MISMATCH_CORR = 0.9999;
const MISMATCH_SE_MAX = 0.01;
/** The reading's delay is searched from DELAY_LO to DELAY_HI (s) in steps of DELAY_STEP, then refined. */
const DELAY_LO = -0.05;
const DELAY_HI = 0.5;
const DELAY_STEP = 0.05;
/** A random walk of the yaw reading, or pushes on the wheels, above this share of the noise (variance per row) get a note. */
const WALK_NOTE = 0.01;
/** The fit reads at most this many rows of a log (the first ones): about a second of work. */
export const MAX_FIT_ROWS = 100_000;
/** Fewest rows a fit works on. */
export const MIN_ROWS = 20;

/** The robot as the plan describes it: the values being fitted and the ones the fit relies on. */
export interface FitCurrent {
  /** Nominal wheel diameter, mm (to turn wheel mm/s into motor deg/s). */
  wheelDiameter?: number;
  gear: number;
  /** Effective track, mm (the track when the plan gives no `effective`). */
  effectiveTrack?: number;
  /** Motor shaft speed at full power, deg/s. */
  motorSpeed: number;
  /** Motor lag (first-order time constant), s. */
  motorLag: number;
  /** Stall power, fraction. */
  stall: number;
  /** Right wheel diameter over left. */
  mismatch: number;
  gyroScale: number;
  /** How late the yaw reading is, s. */
  gyroDelay: number;
  /** The control loop's sample period, s. */
  sample: number;
  turns: TurnDirection;
  /** The noise model's drift (sd of the per-run drift rate), deg/s. */
  noiseDrift: number;
}

export type FitName = 'motorSpeed' | 'motorLag' | 'stall' | 'effectiveTrack' | 'gyroScale' | 'mismatch' | 'gyroDelay' | 'drift';

export interface FitParam {
  name: FitName;
  /** Plain words: "motor speed". */
  label: string;
  /** Canonical unit of value, se, low, high, current: 'deg/s' (motor, drift), 's' (lag, delay), 'fraction' (stall), 'mm' (track), '' (scale, mismatch). */
  unit: string;
  found: boolean;
  value?: number;
  /** Standard error. */
  se?: number;
  /** 95 % interval. */
  low?: number;
  high?: number;
  /** The plan's value. */
  current?: number;
  /** The plan's value lies outside the 95 % interval. */
  differs?: boolean;
  /** Rows of the log behind the value. */
  samples: number;
  /** Why it is not found, or what it assumes. */
  note?: string;
}

export interface FitResult {
  params: Record<FitName, FitParam>;
  /** Wheel speed per unit power, mm/s of nominal-wheel travel at full power (the motor fit's own number). */
  wheelSpeed?: { value: number; se: number };
  /** Each wheel's own speed at full power (least squares, the same lag), mm/s: far apart means a reversed column or a slipping wheel. */
  eachWheel?: { left: number; right: number };
  residual: { wheelMm?: number; yawDeg?: number };
  notes: string[];
  rows: number;
  source: string;
  /** The plan's noise drift (sd of the per-run drift rate, deg/s), for the drift's edit. */
  noiseDrift?: number;
}

export interface FitOptions {
  /** Fit the drift even with less still time than STILL_MIN_S (tests). */
  stillMin?: number;
}

const LABELS: Record<FitName, [string, string]> = {
  motorSpeed: ['motor speed', 'deg/s'],
  motorLag: ['motor lag', 's'],
  stall: ['stall power', 'fraction'],
  effectiveTrack: ['effective track', 'mm'],
  gyroScale: ['gyro scale', ''],
  mismatch: ['wheel mismatch', ''],
  gyroDelay: ['gyro delay', 's'],
  drift: ['gyro drift', 'deg/s'],
};

function notFound(name: FitName, note: string, samples = 0, current?: number): FitParam {
  const [label, unit] = LABELS[name];
  return { name, label, unit, found: false, samples, note, ...(current !== undefined && Number.isFinite(current) ? { current } : {}) };
}

function found(name: FitName, value: number, se: number, samples: number, current: number | undefined, note?: string, low?: number, high?: number): FitParam {
  const [label, unit] = LABELS[name];
  if (!Number.isFinite(value) || !Number.isFinite(se)) return notFound(name, 'the fit gave no finite value from this log', samples, current);
  const lo = low ?? value - Z95 * se;
  const hi = high ?? value + Z95 * se;
  const p: FitParam = { name, label, unit, found: true, value, se, low: lo, high: hi, samples };
  if (current !== undefined && Number.isFinite(current)) {
    p.current = current;
    p.differs = current < lo || current > hi;
  }
  if (note) p.note = note;
  return p;
}

/** The plan's robot for the fit, from a checked plan's setup. */
export function currentFromSetup(setup: PlanSetup): FitCurrent {
  const r = setup.robot;
  return {
    wheelDiameter: r.wheelDiameter,
    gear: r.gear ?? 1,
    effectiveTrack: r.effectiveTrack ?? r.track,
    motorSpeed: r.motorSpeed ?? 900,
    motorLag: r.motorLag ?? 0.08,
    stall: r.stall ?? 0.05,
    mismatch: r.mismatch ?? 1,
    gyroScale: setup.gyro.scale,
    gyroDelay: setup.gyro.delay,
    sample: setup.gyro.sample,
    turns: setup.turns,
    noiseDrift: setup.noise.drift,
  };
}

// ---------------------------------------------------------------------------
// Small dense linear algebra (at most 6 unknowns).

/** Inverse of a symmetric positive definite matrix (scaled to unit diagonal first); undefined when singular. */
function invertSym(A: number[][]): number[][] | undefined {
  const n = A.length;
  const d = A.map((row, i) => (row[i] > 0 ? 1 / Math.sqrt(row[i]) : NaN));
  if (d.some((x) => !Number.isFinite(x))) return undefined;
  // Gauss–Jordan with partial pivoting on the scaled matrix.
  const M = A.map((row, i) => [...row.map((v, j) => v * d[i] * d[j]), ...row.map((_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(M[r][c]) > Math.abs(M[p][c])) p = r;
    if (!(Math.abs(M[p][c]) > 1e-12)) return undefined;
    [M[c], M[p]] = [M[p], M[c]];
    const piv = M[c][c];
    for (let j = 0; j < 2 * n; j++) M[c][j] /= piv;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = M[r][c];
      if (f !== 0) for (let j = 0; j < 2 * n; j++) M[r][j] -= f * M[c][j];
    }
  }
  return M.map((row, i) => row.slice(n).map((v, j) => v * d[i] * d[j]));
}

function solveSym(A: number[][], b: number[]): number[] | undefined {
  const inv = invertSym(A);
  if (!inv) return undefined;
  return inv.map((row) => row.reduce((s, v, j) => s + v * b[j], 0));
}

/** (1 + r) / (1 - r) for the residuals' positive lag-one correlation r: the variance factor of AR(1) errors. */
function correlationFactor(num: number, den: number): number {
  if (!(den > 0)) return 1;
  const r = Math.min(0.95, Math.max(0, num / den));
  return (1 + r) / (1 - r);
}

// ---------------------------------------------------------------------------
// Motor: speed per unit power, lag, stall.

interface WheelData {
  t: Float64Array;
  y: Float64Array;
  u: Float64Array;
  /** The median time between rows, s, and a column of ones. */
  step: number;
  one: Float64Array;
  /** Basis columns for the current lag and stall: response to the powers with K = 1, and to a starting speed of 1 mm/s. */
  h: Float64Array;
  f: Float64Array;
}

/** The wheel's travel for K = 1 from rest (h) and for a starting speed of 1 without power (f), exact zero-order hold. */
function basis(w: WheelData, tau: number, stall: number, h = w.h, f = w.f): void {
  const { t, u } = w;
  const n = t.length;
  let hp = 0, hv = 0, fp = 0, fv = 1;
  let lastDt = NaN, a = 0;
  h[0] = 0;
  f[0] = 0;
  for (let k = 0; k < n - 1; k++) {
    const dt = t[k + 1] - t[k];
    // Rows of a regular log are one period apart up to rounding: one exponential serves them all.
    if (!(Math.abs(dt - lastDt) <= 1e-9 * dt)) { a = Math.exp(-dt / tau); lastDt = dt; }
    const g = tau * (1 - a);
    const uk = u[k];
    const ue = uk < stall && uk > -stall ? 0 : uk;
    hp += g * hv + ue * (dt - g);
    hv = a * hv + (1 - a) * ue;
    fp += g * fv;
    // (a starting speed's effect dies away; stopping at zero keeps the loop off denormal numbers, which are slow)
    fv = fv > 1e-200 ? fv * a : 0;
    h[k + 1] = hp;
    f[k + 1] = fp;
  }
}

interface WheelSolution {
  /** K, then (p0, v0) per wheel. */
  beta: number[];
  /** The weighted residual sum of squares (for r = 0 the plain one), its log-likelihood, rows used. */
  sse: number;
  logLik: number;
  used: number;
}

/**
 * The sums of generalised least squares of a wheel's travel y on the columns when the wheel's speed takes
 * random pushes (variance r s^2 per median row step, in proportion to each step's time) that die away
 * through the lag, and each travel reading has white noise (variance s^2): the Kalman filter of that
 * error (travel and speed, stepped like the plant with exp(-dt/tau), the readings the travel) run over y
 * and every column alike, and the innovations' products weighted by their variances. r = 0 is plain least
 * squares.
 */
function plantSums(cols: Float64Array[], y: Float64Array, t: Float64Array, tau: number, r: number, step: number):
  { A: number[][]; b: number[]; yy: number; logS: number; used: number } {
  const n = y.length, p = cols.length;
  const AA = new Float64Array(p * p), bb = new Float64Array(p);
  let yy = 0, logS = 0;
  if (r === 0 && p === 3) {
    // Plain least squares on three columns (the lag and stall searches): scalar sums in one pass.
    const c0 = cols[0], c1 = cols[1], c2 = cols[2];
    let s00 = 0, s01 = 0, s02 = 0, s11 = 0, s12 = 0, s22 = 0, b0 = 0, b1 = 0, b2 = 0;
    for (let i = 0; i < n; i++) {
      const x0 = c0[i], x1 = c1[i], x2 = c2[i], yi = y[i];
      s00 += x0 * x0; s01 += x0 * x1; s02 += x0 * x2; s11 += x1 * x1; s12 += x1 * x2; s22 += x2 * x2;
      b0 += x0 * yi; b1 += x1 * yi; b2 += x2 * yi; yy += yi * yi;
    }
    return { A: [[s00, s01, s02], [s01, s11, s12], [s02, s12, s22]], b: [b0, b1, b2], yy, logS: 0, used: n };
  } else if (r === 0) {
    for (let i = 0; i < n; i++) {
      const yi = y[i];
      for (let a = 0; a < p; a++) {
        const va = cols[a][i];
        bb[a] += va * yi;
        for (let c = a; c < p; c++) AA[a * p + c] += va * cols[c][i];
      }
      yy += yi * yi;
    }
  } else {
    const rs = r / (step || 1);
    // Filtered error means (travel, speed) of y and of each column, and the error's covariance.
    const mp = new Float64Array(p + 1), mv = new Float64Array(p + 1), inn = new Float64Array(p + 1);
    let Ppp = 0, Ppv = 0, Pvv = 0;
    let lastDt = NaN, a = 0, g = 0;
    for (let i = 0; i < n; i++) {
      // Update with row i.
      const S = Ppp + 1;
      const w = 1 / S;
      const kp = Ppp * w, kv = Ppv * w;
      for (let c = 0; c <= p; c++) {
        const v = (c < p ? cols[c][i] : y[i]) - mp[c];
        inn[c] = v;
        mp[c] += kp * v;
        mv[c] += kv * v;
      }
      const vy = inn[p];
      for (let c = 0; c < p; c++) {
        const vc = inn[c] * w;
        bb[c] += vc * vy;
        for (let d = c; d < p; d++) AA[c * p + d] += vc * inn[d];
      }
      yy += vy * vy * w;
      logS += Math.log(S);
      const npp = Ppp - Ppp * kp, npv = Ppv - Ppp * kv, nvv = Pvv - Ppv * kv;
      Ppp = npp; Ppv = npv; Pvv = nvv;
      if (i === n - 1) break;
      // Predict to row i + 1: travel += g v, speed *= a; a push on the speed.
      const dt = t[i + 1] - t[i];
      if (!(Math.abs(dt - lastDt) <= 1e-9 * dt)) { a = Math.exp(-Math.max(0, dt) / tau); g = tau * (1 - a); lastDt = dt; }
      for (let c = 0; c <= p; c++) { mp[c] += g * mv[c]; mv[c] *= a; }
      const q = rs * Math.max(0, dt);
      const pp = Ppp + 2 * g * Ppv + g * g * Pvv;
      const pv = a * (Ppv + g * Pvv);
      const vv = a * a * Pvv + q;
      Ppp = pp; Ppv = pv; Pvv = vv;
    }
  }
  const A = Array.from({ length: p }, (_, x) => Array.from({ length: p }, (_, c) => (x <= c ? AA[x * p + c] : AA[c * p + x])));
  return { A, b: Array.from(bb), yy, logS, used: n };
}

/**
 * Least squares of the travel on [h, 1, f] per wheel with a shared K, the wheels' speed taking random
 * pushes of r times the travel noise's variance (r = 0: plain least squares), for the basis now in the wheels.
 */
function solveWheels(ws: WheelData[], tau: number, r: number): WheelSolution | undefined {
  const m = 1 + 2 * ws.length;
  const A = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  const b = new Array<number>(m).fill(0);
  let yy = 0, logS = 0, used = 0;
  for (let i = 0; i < ws.length; i++) {
    const w = ws[i];
    const S = plantSums([w.h, w.one, w.f], w.y, w.t, tau, r, w.step);
    const idx = [0, 1 + 2 * i, 2 + 2 * i];
    for (let x = 0; x < 3; x++) {
      b[idx[x]] += S.b[x];
      for (let c = 0; c < 3; c++) A[idx[x]][idx[c]] += S.A[x][c];
    }
    yy += S.yy; logS += S.logS; used += S.used;
  }
  // A column of nothing (no power above the stall) leaves K free: no solution.
  if (!(A[0][0] > 0)) return undefined;
  const beta = solveSym(A, b);
  if (!beta) return undefined;
  const sse = Math.max(0, yy - beta.reduce((s, v, j) => s + v * b[j], 0));
  return { beta, sse, used, logLik: -0.5 * (used * Math.log(Math.max(sse, 1e-300) / Math.max(1, used)) + logS) };
}

function sseAt(ws: WheelData[], tau: number, stall: number, r: number): WheelSolution | undefined {
  for (const w of ws) basis(w, tau, stall);
  return solveWheels(ws, tau, r);
}

/** The lag minimising the residual: a coarse grid on log lag, then Brent's parabolic search inside the best bracket. */
function searchLag(ws: WheelData[], stall: number, start: number, q: number, near = false): { tau: number; sol: WheelSolution; atBound: boolean } | undefined {
  const lo = Math.log(LAG_LO), hi = Math.log(LAG_HI);
  const N = 12;
  const grid: number[] = [];
  // Near a lag already found (the stall moved a little): a narrow bracket around it.
  if (near) for (const f of [0.8, 1.25]) grid.push(Math.log(start * f));
  else for (let i = 0; i <= N; i++) grid.push(lo + ((hi - lo) * i) / N);
  if (start > LAG_LO && start < LAG_HI) grid.push(Math.log(start));
  grid.sort((x, y) => x - y);
  // The likelihood, not the residual alone: with pushes on the speed the filter's variances change with the lag.
  const cost = (x: number) => { const sol = sseAt(ws, Math.exp(x), stall, q); return sol ? -sol.logLik : Infinity; };
  const sses = grid.map(cost);
  let best = -1, bestSse = Infinity;
  sses.forEach((s, i) => { if (s < bestSse) { bestSse = s; best = i; } });
  if (best < 0) return undefined;
  const x = brent(cost, grid[Math.max(0, best - 1)], grid[best], grid[Math.min(grid.length - 1, best + 1)], sses[best], 1e-6);
  let xBest = x.x;
  // A narrow bracket whose edge is best: search the whole range after all.
  if (near && (best === 0 || best === grid.length - 1)) return searchLag(ws, stall, start, q);
  // The grid's best when the search found nothing better (a flat or noisy residual).
  if (!(x.f <= bestSse)) xBest = grid[best];
  const sol = sseAt(ws, Math.exp(xBest), stall, q);
  if (!sol) return undefined;
  const atBound = xBest <= lo + (hi - lo) / N || xBest >= hi - (hi - lo) / N;
  return { tau: Math.exp(xBest), sol, atBound };
}

/** Brent's minimisation of f in [a, c] from b with f(b) = fb known (Brent, Algorithms for Minimization without Derivatives, 1973). */
function brent(f: (x: number) => number, a: number, b: number, c: number, fb: number, tol: number, absTol = 1e-10): { x: number; f: number } {
  const CG = 0.3819660112501051;
  let lo = Math.min(a, c), hi = Math.max(a, c);
  let x = b, w = b, v = b, fx = fb, fw = fb, fv = fb;
  let d = 0, e = 0;
  for (let it = 0; it < 60; it++) {
    const xm = 0.5 * (lo + hi);
    const tol1 = tol * Math.abs(x) + absTol, tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (hi - lo)) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const etemp = e;
      e = d;
      if (Math.abs(p) < Math.abs(0.5 * q * etemp) && p > q * (lo - x) && p < q * (hi - x)) {
        d = p / q;
        const u = x + d;
        if (u - lo < tol2 || hi - u < tol2) d = xm >= x ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) { e = x >= xm ? lo - x : hi - x; d = CG * e; }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u >= x) lo = x; else hi = x;
      v = w; fv = fw; w = x; fw = fx; x = u; fx = fu;
    } else {
      if (u < x) lo = u; else hi = u;
      if (fu <= fw || w === x) { v = w; fv = fw; w = u; fw = fu; }
      else if (fu <= fv || v === x || v === w) { v = u; fv = fu; }
    }
  }
  return { x, f: fx };
}

interface MotorFit {
  params: Pick<Record<FitName, FitParam>, 'motorSpeed' | 'motorLag' | 'stall'>;
  wheelSpeed?: { value: number; se: number };
  eachWheel?: { left: number; right: number };
  rmsMm?: number;
  notes: string[];
}

function fitMotor(run: RecordedRun, cur: FitCurrent): MotorFit {
  const none = (why: string): MotorFit => ({
    params: {
      motorSpeed: notFound('motorSpeed', why, 0, cur.motorSpeed),
      motorLag: notFound('motorLag', why, 0, cur.motorLag),
      stall: notFound('stall', why, 0, cur.stall),
    },
    notes: [],
  });
  if (!run.hasPower) return none('the log has no power columns: the motor speed, lag and stall come from the powers the code commanded and the wheel travel they gave');
  const notes: string[] = [];
  // Rows with powers; a row without them holds the row before's powers (said in a note).
  const t: number[] = [], yL: number[] = [], yR: number[] = [], uL: number[] = [], uR: number[] = [];
  let held = 0, pl: number | undefined, pr: number | undefined;
  for (const s of run.samples) {
    let a = s.powerLeft, b = s.powerRight;
    if (a === undefined || b === undefined || !Number.isFinite(a) || !Number.isFinite(b)) {
      if (pl === undefined || pr === undefined) continue;
      a = a !== undefined && Number.isFinite(a) ? a : pl;
      b = b !== undefined && Number.isFinite(b) ? b : pr;
      held++;
    }
    if (!Number.isFinite(s.t) || !Number.isFinite(s.left) || !Number.isFinite(s.right)) continue;
    if (t.length && !(s.t >= t[t.length - 1])) continue;
    // The reader gives the right wheel's travel times the plan's mismatch; its encoder counted nominal-wheel mm.
    t.push(s.t); yL.push(s.left); yR.push(s.right / cur.mismatch); uL.push(a); uR.push(b);
    pl = a; pr = b;
  }
  if (held > 0) notes.push(`${held} row${held === 1 ? '' : 's'} of ${run.source} had no power; the fit took the power of the row before (held until the next row, as the robot's code does)`);
  const n = t.length;
  if (n < MIN_ROWS) return none(`the log has only ${n} row${n === 1 ? '' : 's'} with powers: the motor fit needs at least ${MIN_ROWS}`);
  const step = medianStep(t);
  const mk = (y: number[], u: number[]): WheelData => ({
    t: Float64Array.from(t), y: Float64Array.from(y), u: Float64Array.from(u), h: new Float64Array(n), f: new Float64Array(n), step,
    one: new Float64Array(n).fill(1),
  });
  const ws = [mk(yL, uL), mk(yR, uR)];
  const anyPower = uL.some((v) => v !== 0) || uR.some((v) => v !== 0);
  if (!anyPower) return none('every power in the log is zero: nothing shows how fast the wheels go at a power');
  // 1. The lag at the plan's stall by least squares, 2. the stall at that lag, 3. the lag again; then
  // 4. how much the travel wanders (the random walk's share, by maximum likelihood) and, where it does,
  // 5. the stall and 6. the lag again with it.
  let stall = cur.stall;
  let search = searchLag(ws, stall, cur.motorLag, 0);
  if (!search) {
    stall = 0;
    search = searchLag(ws, stall, cur.motorLag, 0);
    if (!search) return none('no power in the log moves the model\'s wheels: the motor cannot be fitted');
  }
  let stallFit = profileStall(ws, search.tau, n, 0);
  if (stallFit.best !== undefined && stallFit.best !== stall) {
    const again = searchLag(ws, stallFit.best, search.tau, 0, true);
    if (again) { stall = stallFit.best; search = again; }
  }
  for (const w of ws) basis(w, search.tau, stall);
  const q = wheelWalk(ws, search.tau);
  if (q > 0) {
    stallFit = profileStall(ws, search.tau, n, q);
    if (stallFit.best !== undefined) stall = stallFit.best;
    const again = searchLag(ws, stall, search.tau, q, true);
    if (again) search = again;
  }
  const { tau } = search;
  const sol = search.sol;
  const K = sol.beta[0];
  for (const w of ws) basis(w, tau, stall);
  // The plain least squares at the solution: the rms misfit shown, and each wheel on its own (the same
  // lag): two wheels far apart mean a column the wrong way round or a wheel that slips, and one motor
  // speed fits neither.
  let sse0 = 0;
  const own = ws.map((w) => {
    const S = levelSums([w.h, w.f], w.y, w.t, 0, w.step);
    const b = solveSym(S.A, S.b);
    if (b) sse0 += Math.max(0, S.yy - b[0] * S.b[0] - b[1] * S.b[1]);
    return b ? b[0] : NaN;
  });
  const rmsMm = Math.sqrt(sse0 / (ws.length * n));
  if (Number.isFinite(own[0]) && Number.isFinite(own[1]) && (own[0] * own[1] <= 0 || Math.abs(own[0] - own[1]) > 0.1 * Math.max(Math.abs(own[0]), Math.abs(own[1])))) {
    notes.push(`the wheels disagree: at full power the left goes ${own[0].toFixed(0)} mm/s and the right ${own[1].toFixed(0)} mm/s by this log (more than 10 % apart), so one motor speed fits neither; check that the power and travel columns belong together and have the same sign, and look for a slipping wheel`);
  }
  if (q > WALK_NOTE) notes.push(`the wheels' speed is pushed about beyond what the powers explain (by ${Math.sqrt(q).toFixed(2)} times the travel's noise per row): bumps, a changing floor, a tiring battery, or encoders that count in coarse steps; the motor's intervals allow for it`);
  // The covariance: the Jacobian's columns [K, lag, p0 and v0 per wheel] through the same filter.
  const eps = 1e-4 * tau;
  const hp = new Float64Array(n), fp = new Float64Array(n), hm = new Float64Array(n), fm = new Float64Array(n);
  const m = 2 + 2 * ws.length;
  const JtJ = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  let wsse = 0, used = 0;
  for (let i = 0; i < ws.length; i++) {
    const w = ws[i];
    const p0 = sol.beta[1 + 2 * i], v0 = sol.beta[2 + 2 * i];
    basis(w, tau + eps, stall, hp, fp);
    basis(w, tau - eps, stall, hm, fm);
    const dTau = new Float64Array(n);
    for (let k = 0; k < n; k++) dTau[k] = (K * (hp[k] - hm[k]) + v0 * (fp[k] - fm[k])) / (2 * eps);
    const S = plantSums([w.h, dTau, w.one, w.f], w.y, w.t, tau, q, w.step);
    const idx = [0, 1, 2 + 2 * i, 3 + 2 * i];
    for (let a = 0; a < 4; a++) for (let c = 0; c < 4; c++) JtJ[idx[a]][idx[c]] += S.A[a][c];
    // The weighted residual at the solution (the lag's column has no coefficient there).
    const coef = [K, 0, p0, v0];
    let quad = 0, lin = 0;
    for (let a = 0; a < 4; a++) { lin += coef[a] * S.b[a]; for (let c = 0; c < 4; c++) quad += coef[a] * coef[c] * S.A[a][c]; }
    wsse += S.yy - 2 * lin + quad;
    used += S.used;
  }
  const dof = used - m;
  const sigma2 = Math.max(0, wsse) / dof;
  const inv = invertSym(JtJ);
  const params: MotorFit['params'] = {
    motorSpeed: notFound('motorSpeed', 'the motor fit did not converge on this log', n, cur.motorSpeed),
    motorLag: notFound('motorLag', 'the motor fit did not converge on this log', n, cur.motorLag),
    stall: stallFit.param(cur.stall),
  };
  if (!inv || !(dof > 0)) return { params, notes, rmsMm };
  const seK = Math.sqrt(sigma2 * inv[0][0]);
  const seTau = Math.sqrt(sigma2 * inv[1][1]);
  let wheelSpeed: MotorFit['wheelSpeed'];
  if (K > 0 && Number.isFinite(seK)) {
    wheelSpeed = { value: K, se: seK };
    if (cur.wheelDiameter !== undefined && cur.wheelDiameter > 0) {
      // Motor shaft deg/s = wheel mm/s x 360 x gear / (pi D): linear, so the se scales alike.
      const f = (360 * cur.gear) / (Math.PI * cur.wheelDiameter);
      params.motorSpeed = found('motorSpeed', K * f, seK * f, n, cur.motorSpeed);
    } else {
      params.motorSpeed = notFound('motorSpeed', `the wheels go ${K.toFixed(1)} mm/s at full power, but the plan gives no wheel diameter to turn that into motor degrees per second`, n);
    }
  } else {
    params.motorSpeed = notFound('motorSpeed', 'the fitted wheel speed at full power is not positive: the powers and the travel in this log do not agree (are the power columns of the right wheels and sign?)', n, cur.motorSpeed);
  }
  if (search.atBound) {
    const dt = medianStep(t);
    params.motorLag = tau <= 2 * LAG_LO
      ? notFound('motorLag', `the lag is too short to see at this log's sample period (${(dt * 1000).toFixed(1)} ms): the wheels reach each new speed within one sample`, n, cur.motorLag)
      : notFound('motorLag', 'the lag came out longer than any motor\'s: the log does not hold enough changes of power to tell it', n, cur.motorLag);
  } else {
    params.motorLag = found('motorLag', tau, seTau, n, cur.motorLag);
  }
  const eachWheel = Number.isFinite(own[0]) && Number.isFinite(own[1]) ? { left: own[0], right: own[1] } : undefined;
  return { params, wheelSpeed, ...(eachWheel ? { eachWheel } : {}), rmsMm, notes };
}

function medianStep(t: ArrayLike<number>): number {
  if (t.length < 2) return 0;
  const d = new Float64Array(t.length - 1);
  for (let k = 1; k < t.length; k++) d[k - 1] = t[k] - t[k - 1];
  d.sort();
  return d[d.length >> 1];
}

/**
 * The stall power: the residual of the motor fit (at the lag found) for each
 * step of the stall across a commanded power.
 */
function profileStall(ws: WheelData[], tau: number, n: number, q: number): { best?: number; param(current: number): FitParam } {
  const set = new Set<number>();
  for (const w of ws) for (const u of w.u) { const a = Math.abs(u); if (a > 0 && a < 1.0000001) set.add(a); }
  const levels = [...set].sort((a, b) => a - b);
  // Candidate i: stall = levels[i] (levels below it do not move the wheels).
  const cands = levels.filter((l) => l < STALL_CANDIDATES_BELOW);
  if (levels.length === 0) return { param: (c) => notFound('stall', 'the log commands no power', 0, c) };
  if (cands.length === 0) {
    return { param: (c) => notFound('stall', `the smallest power in the log is ${pct(levels[0])}: it moved the wheels, so the stall is at most that; the log never commands a power too small to move them`, n, c) };
  }
  const sse = new Map<number, number>();
  const evalAt = (i: number) => {
    if (!sse.has(i)) sse.set(i, sseAt(ws, tau, cands[i], q)?.sse ?? Infinity);
    return sse.get(i)!;
  };
  const COARSE = 48;
  const step = Math.max(1, Math.ceil(cands.length / COARSE));
  let best = 0;
  for (let i = 0; i < cands.length; i += step) if (evalAt(i) < evalAt(best)) best = i;
  if (step > 1) {
    const lo = Math.max(0, best - step), hi = Math.min(cands.length - 1, best + step);
    for (let i = lo; i <= hi; i++) if (evalAt(i) < evalAt(best)) best = i;
  }
  const N = ws.length * n;
  const sigma2 = evalAt(best) / Math.max(1, N - 6);
  const plausible = [...sse.entries()].filter(([, s]) => (s - evalAt(best)) / sigma2 < CHI2_1_95).map(([i]) => i);
  const iLo = Math.min(...plausible), iHi = Math.max(...plausible);
  const low = iLo > 0 ? cands[iLo - 1] : 0;
  const high = cands[iHi];
  const bestLow = best > 0 ? cands[best - 1] : 0;
  return {
    best: cands[best],
    param(current: number): FitParam {
      if (best === 0 && iHi === 0) {
        const p = notFound('stall', `every power in the log moved the wheels, down to the smallest, ${pct(cands[0])}: the stall is at most that, and this log cannot tell how much lower`, n, current);
        if (current > cands[0]) p.note += ` (the plan's ${pct(current)} is above it)`;
        return p;
      }
      const value = (bestLow + cands[best]) / 2;
      const se = (high - low) / (2 * Z95);
      const p = found('stall', value, se, n, current,
        `between ${pct(bestLow)}, the largest power that did not move the wheels, and ${pct(cands[best])}, the smallest that did; the 95 % interval joins every such bracket the travel cannot rule out (a bracket between commanded powers, not a normal interval)`,
        low, high);
      // The bracket's low end is a power that did not move the wheels: a plan's stall there is too low (a wheel moves at the stall power).
      if (p.found && p.differs === false && current <= low) p.differs = true;
      return p;
    },
  };
}

function fmtSeconds(s: number): string {
  return Number.isFinite(s) ? (s >= 120 ? `${(s / 60).toFixed(1)} min` : `${s.toFixed(1)} s`) : 'an unknown time';
}

function pct(v: number): string {
  return `${+(v * 100).toPrecision(4)} %`;
}

// ---------------------------------------------------------------------------
// Yaw: effective track (or gyro scale) and drift.

interface YawFit {
  params: Pick<Record<FitName, FitParam>, 'effectiveTrack' | 'gyroScale' | 'mismatch' | 'gyroDelay' | 'drift'>;
  rmsDeg?: number;
  notes: string[];
}

/** Least squares of y on the columns (already centred): coefficients, their covariance factor (X^T X)^-1, or undefined when singular. */
function regress(cols: ArrayLike<number>[], y: ArrayLike<number>): { beta: number[]; inv: number[][]; sse: number } | undefined {
  const p = cols.length;
  const A = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const b = new Array<number>(p).fill(0);
  // One pass over the rows for every product (at most five columns).
  const c0 = cols[0], c1 = cols[1] ?? c0, c2 = cols[2] ?? c0, c3 = cols[3] ?? c0;
  let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s11 = 0, s12 = 0, s13 = 0, s22 = 0, s23 = 0, s33 = 0;
  let y0 = 0, y1 = 0, y2 = 0, y3 = 0;
  if (p <= 4) {
    for (let k = 0; k < y.length; k++) {
      const a = c0[k], bb = c1[k], c = c2[k], d = c3[k], yk = y[k];
      s00 += a * a; s01 += a * bb; s02 += a * c; s03 += a * d; s11 += bb * bb; s12 += bb * c; s13 += bb * d;
      s22 += c * c; s23 += c * d; s33 += d * d;
      y0 += a * yk; y1 += bb * yk; y2 += c * yk; y3 += d * yk;
    }
    const S = [[s00, s01, s02, s03], [s01, s11, s12, s13], [s02, s12, s22, s23], [s03, s13, s23, s33]];
    const Y = [y0, y1, y2, y3];
    for (let a = 0; a < p; a++) { b[a] = Y[a]; for (let c = 0; c < p; c++) A[a][c] = S[a][c]; }
  } else {
    for (let a = 0; a < p; a++) {
      for (let c = a; c < p; c++) {
        let sum = 0;
        for (let k = 0; k < y.length; k++) sum += cols[a][k] * cols[c][k];
        A[a][c] = A[c][a] = sum;
      }
      let sy = 0;
      for (let k = 0; k < y.length; k++) sy += cols[a][k] * y[k];
      b[a] = sy;
    }
  }
  const inv = invertSym(A);
  if (!inv) return undefined;
  const beta = inv.map((row) => row.reduce((s, v, j) => s + v * b[j], 0));
  // The residual's sum of squares from the sums (the columns are centred, so it loses little): y'y - beta'X'y.
  let yy = 0;
  for (let k = 0; k < y.length; k++) yy += y[k] * y[k];
  return { beta, inv, sse: Math.max(0, yy - beta.reduce((s, v, j) => s + v * b[j], 0)) };
}

function fitYaw(run: RecordedRun, cur: FitCurrent, options: FitOptions): YawFit {
  const track = cur.effectiveTrack;
  const none = (why: string, driftWhy = why): YawFit => ({
    params: {
      effectiveTrack: notFound('effectiveTrack', why, 0, track),
      gyroScale: notFound('gyroScale', why, 0, cur.gyroScale),
      mismatch: notFound('mismatch', why, 0, cur.mismatch),
      gyroDelay: notFound('gyroDelay', why, 0, cur.gyroDelay),
      drift: notFound('drift', driftWhy, 0),
    },
    notes: [],
  });
  if (!run.hasYaw) return none('the log has no yaw column: the effective track, the gyro scale, its delay and the mismatch come from the yaw reading against the wheel travel', 'the log has no yaw column: the drift is the reading\'s change while the wheels stand still');
  const notes: string[] = [];
  // Rows with every number, in time order (a row whose time runs back is left out, as in the motor fit).
  const all: RecordedRun['samples'] = [];
  for (const s of run.samples) {
    if (!Number.isFinite(s.t) || !Number.isFinite(s.left) || !Number.isFinite(s.right)) continue;
    if (all.length && !(s.t >= all[all.length - 1].t)) continue;
    all.push(s);
  }
  const sign = cur.turns === 'clockwise' ? 1 : -1;
  // Each wheel's travel as degrees of heading for a track of 1 mm: heading = left' + right' with
  // left' = sign x left, right' = -sign x right (the right wheel's travel holds the plan's mismatch already).
  const NA = all.length;
  const At = new Float64Array(NA), Al = new Float64Array(NA), Ar = new Float64Array(NA);
  for (let k = 0; k < NA; k++) { At[k] = all[k].t; Al[k] = (sign * all[k].left) / RAD; Ar[k] = (-sign * all[k].right) / RAD; }
  // The yaw rows.
  const rowsWithYaw: number[] = [];
  for (let k = 0; k < NA; k++) { const y = all[k].yaw; if (y !== undefined && Number.isFinite(y)) rowsWithYaw.push(k); }
  const n = rowsWithYaw.length;
  if (n < MIN_ROWS) return none(`the log has only ${n} row${n === 1 ? '' : 's'} with a yaw reading: the yaw fit needs at least ${MIN_ROWS}`);
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = At[rowsWithYaw[i]];
  const L = new Float64Array(n), R = new Float64Array(n), rateL = new Float64Array(n), rateR = new Float64Array(n);
  /** The wheels at each yaw row's time less `delay`, by linear interpolation between rows (and their rates). */
  const wheelsAt = (delay: number): void => interpolateWheels(At, Al, Ar, t, delay, L, R, rateL, rateR);
  // Unwrap the reading and find its resets, with the wheels at the plan's delay.
  wheelsAt(cur.gyroDelay);
  const Y = new Float64Array(n);
  const seg = new Int32Array(n);
  let still = 0, stillRows = 0;
  const c0 = track !== undefined && track > 0 ? cur.gyroScale / track : 0;
  let segs = 1, resets = 0, wraps = 0;
  for (let i = 0; i < n; i++) {
    const row = all[rowsWithYaw[i]];
    const yaw = row.yaw!;
    if (i === 0) { Y[0] = yaw; continue; }
    const prev = all[rowsWithYaw[i - 1]];
    const pred = c0 * (L[i] + R[i] - L[i - 1] - R[i - 1]);
    const jump = yaw - prev.yaw! - pred;
    const turns = Math.round(jump / 360);
    const rest = jump - 360 * turns;
    if (Math.abs(rest) <= JUMP_DEG + 0.1 * Math.abs(pred)) {
      Y[i] = Y[i - 1] + (yaw - prev.yaw!) - 360 * turns;
      if (turns !== 0) wraps++;
    } else { Y[i] = yaw; segs++; resets++; }
    seg[i] = segs - 1;
    const dt = row.t - prev.t;
    if (dt > 0 && Math.abs(row.left - prev.left) <= STILL_MM && Math.abs(row.right - prev.right) <= STILL_MM) {
      still += dt;
      stillRows++;
    }
  }
  if (resets > 0) notes.push(`the yaw reading jumped ${resets} time${resets === 1 ? '' : 's'} by more than the wheels explain (a reset of the reading, or a glitch): each stretch between jumps is fitted with its own zero`);
  if (wraps > 0) notes.push(`the yaw reading wrapped ${wraps} time${wraps === 1 ? '' : 's'}; the fit follows it across the wrap`);
  const stillMin = options.stillMin ?? STILL_MIN_S;
  const withDrift = still >= stillMin;
  if (!withDrift) notes.push(`the drift is taken as zero for the track: the log has ${still.toFixed(2)} s with both wheels still, and the drift needs at least ${stillMin} s`);
  // Offsets per stretch eliminated: centre every column within its stretch.
  const nseg = segs;
  const sum = new Float64Array(nseg), cnt = new Float64Array(nseg);
  for (let i = 0; i < n; i++) cnt[seg[i]]++;
  const centre = (v: Float64Array, out = new Float64Array(n)): Float64Array => centreInto(v, seg, cnt, sum, out);
  const Tc = centre(t), Yc = centre(Y);
  const Lc = new Float64Array(n), Rc = new Float64Array(n), Dc = new Float64Array(n);
  const tCols = withDrift ? [Tc] : [];
  let dMin = Infinity, dMax = -Infinity;
  for (let i = 0; i < n; i++) { const d = L[i] + R[i]; if (d < dMin) dMin = d; if (d > dMax) dMax = d; }
  // The robot's turning in this log, degrees of heading on the plan's track.
  const turnedDeg = track !== undefined && track > 0 ? (dMax - dMin) / track : 0;
  const driftNote = withDrift ? undefined : `the log has ${still.toFixed(2)} s with both wheels still; the drift needs at least ${stillMin} s of standing still (wait a few seconds at the start of the run)`;
  // The mismatch needs both turning and driving straight: the two wheels' columns must not move together.
  centre(L, Lc); centre(R, Rc);
  let sLL = 0, sRR = 0, sLR = 0;
  for (let i = 0; i < n; i++) { sLL += Lc[i] * Lc[i]; sRR += Rc[i] * Rc[i]; sLR += Lc[i] * Rc[i]; }
  const corr = sLL > 0 && sRR > 0 ? Math.abs(sLR) / Math.sqrt(sLL * sRR) : 1;
  let twoWheels = corr < MISMATCH_CORR;
  let mismatchWhy = twoWheels ? '' : 'the log does not both drive and turn: the wheels moved together (or against each other) throughout, so their sizes cannot be told apart';
  const residualOf = (cols: Float64Array[], beta: number[]) => {
    const c0 = cols[0], c1 = cols[1] ?? c0, c2 = cols[2] ?? c0;
    const b0 = beta[0], b1 = cols.length > 1 ? beta[1] : 0, b2 = cols.length > 2 ? beta[2] : 0;
    let sse = 0, lag1 = 0, prevR = 0;
    for (let i = 0; i < n; i++) {
      const r = Yc[i] - b0 * c0[i] - b1 * c1[i] - b2 * c2[i];
      sse += r * r;
      if (i > 0 && seg[i] === seg[i - 1]) lag1 += r * prevR;
      prevR = r;
    }
    return { sse, factor: correlationFactor(lag1, sse) };
  };
  /** The columns and fit with the wheels at `delay`. */
  /** The columns and fit with the wheels at `delay` (`quick`: the residual from the sums only, for the search). */
  const fitAt = (delay: number, quick = false) => {
    wheelsAt(delay);
    centre(L, Lc); centre(R, Rc);
    for (let i = 0; i < n; i++) Dc[i] = Lc[i] + Rc[i];
    const cols = twoWheels ? [Lc, Rc, ...tCols] : [Dc, ...tCols];
    const fit = regress(cols, Yc);
    if (!fit) return undefined;
    return { cols, fit, ...(quick ? { sse: fit.sse, factor: 1 } : residualOf(cols, fit.beta)) };
  };
  if (turnedDeg < 1e-9 || !fitAt(cur.gyroDelay)) {
    const why = track === undefined || !(track > 0)
      ? 'the plan has no `track` line: add the measured track (middle of one tyre to the other) first, e.g. `track 120 mm`'
      : 'the wheels never turned the robot in this log: the track shows only in turns';
    return {
      params: {
        effectiveTrack: notFound('effectiveTrack', why, n, track),
        gyroScale: notFound('gyroScale', why, n, cur.gyroScale),
        mismatch: notFound('mismatch', twoWheels ? why : mismatchWhy, n, cur.mismatch),
        gyroDelay: notFound('gyroDelay', why, n, cur.gyroDelay),
        drift: notFound('drift', driftNote ?? 'the drift could not be separated from the turning in this log', stillRows),
      },
      notes,
    };
  }
  // The reading's delay: the residual's minimum over a grid, then Brent's search (only with enough turning).
  let delay = cur.gyroDelay;
  let delayWhy = '';
  if (turnedDeg >= MIN_TURNED_DEG) {
    const grid: number[] = [];
    for (let d = DELAY_LO; d <= DELAY_HI + 1e-12; d += DELAY_STEP) grid.push(d);
    const cost = (d: number) => fitAt(d, true)?.sse ?? Infinity;
    const sses = grid.map(cost);
    let best = 0;
    sses.forEach((v, i) => { if (v < sses[best]) best = i; });
    if (best === 0 || best === grid.length - 1) {
      delayWhy = `the yaw reading fits the wheels best at a delay of ${(grid[best] * 1000).toFixed(0)} ms, the end of the range tried: are the log's columns from one moment?`;
    } else {
      // To a microsecond: far below any delay's standard error.
      const m = brent(cost, grid[best - 1], grid[best], grid[best + 1], sses[best], 0, 1e-6);
      delay = m.f <= sses[best] ? m.x : grid[best];
    }
  } else delayWhy = `the robot turned only about ${turnedDeg.toFixed(1)}° in this log; the reading's delay shows in turns`;
  // The delay's standard error (Gauss–Newton): its column d(model)/d(delay) = -(c1 x left rate + c2 x right
  // rate), centred per stretch, next to the others.
  let delaySe = NaN;
  if (!delayWhy) {
    const at = fitAt(delay)!;
    const b = at.fit.beta;
    const g = new Float64Array(n);
    for (let i = 0; i < n; i++) g[i] = twoWheels ? -(b[0] * rateL[i] + b[1] * rateR[i]) : -b[0] * (rateL[i] + rateR[i]);
    const full = regress([...at.cols, centre(g)], Yc);
    const dofD = n - nseg - b.length - 1;
    if (full && dofD > 0) delaySe = Math.sqrt((at.sse / dofD) * at.factor * full.inv[b.length][b.length]);
    else delayWhy = 'the delay could not be separated from the rest in this log';
  }
  // The other values are fitted at the delay found only where it differs from the plan's by more than its
  // interval and a quarter of the log's row spacing; a small difference there is within the rows' timing,
  // and the wheels' own noise, interpolated between rows, would only blur them.
  const rowStep = medianStep(t);
  const useDelay = !delayWhy && Math.abs(delay - cur.gyroDelay) > Math.max(Z95 * delaySe, 0.25 * rowStep);
  const fittedDelay = delay;
  if (!useDelay) delay = cur.gyroDelay;
  if (twoWheels) {
    // Keep the mismatch only where the log tells it well (delta method on c2 / c1).
    const at = fitAt(delay);
    const m = at ? (cur.mismatch * at.fit.beta[1]) / at.fit.beta[0] : NaN;
    const varM = at ? mismatchVariance(at.fit.beta, at.fit.inv, (at.sse / Math.max(1, n - nseg - at.fit.beta.length)) * at.factor, m) : NaN;
    if (!(Number.isFinite(m) && m > 0 && varM >= 0 && Math.sqrt(varM) < MISMATCH_SE_MAX)) {
      twoWheels = false;
      mismatchWhy = 'the log holds too little straight driving next to its turning to tell the two wheels\' sizes apart';
    }
  }
  const chosen = fitAt(delay)!;
  const ols = chosen.fit.beta;
  const p = ols.length;
  const rmsDeg = Math.sqrt(chosen.sse / n);
  // The final fit: generalised least squares with the reading's error as white noise plus a random walk
  // (a gyro's angle random walk, and anything the wheels leave unexplained that builds up), each stretch's
  // zero a diffuse start of the walk. The two variances come from the least-squares residuals' differences.
  const raw: Float64Array[] = twoWheels ? [L, R] : [Float64Array.from(L, (v, i) => v + R[i])];
  if (withDrift) raw.push(t);
  let delayIndex = -1;
  if (useDelay) {
    const g = new Float64Array(n);
    for (let i = 0; i < n; i++) g[i] = twoWheels ? -(ols[0] * rateL[i] + ols[1] * rateR[i]) : -ols[0] * (rateL[i] + rateR[i]);
    raw.push(g);
    delayIndex = p;
  }
  const q = walkRatio(raw, Y, seg, t, rowStep);
  const gls = localLevelGls(raw, Y, seg, t, q, rowStep);
  if (!gls || !(gls.dof > 0)) return none(`the log's ${n} yaw rows in ${nseg} stretches leave nothing to fit with`);
  const beta = gls.beta;
  const inv = gls.inv;
  const sigma2 = gls.sigma2;
  if (q > WALK_NOTE) notes.push(`the yaw reading wanders against the wheels (a random walk ${Math.sqrt(q).toFixed(2)} times its noise per row): a gyro's angle random walk, or wheel slip; the intervals allow for it`);
  const c = beta[0];
  const seC = Math.sqrt(sigma2 * inv[0][0]);
  let effectiveTrack: FitParam, gyroScale: FitParam;
  if (turnedDeg < MIN_TURNED_DEG) {
    const why = `the robot turned only about ${turnedDeg.toFixed(1)}° in this log; the track and the gyro scale need turning (at least ${MIN_TURNED_DEG}°, better a few whole turns)`;
    effectiveTrack = notFound('effectiveTrack', why, n, track);
    gyroScale = notFound('gyroScale', why, n, cur.gyroScale);
  } else if (!(c > 0) || !(seC < 0.5 * c)) {
    const why = c > 0
      ? 'the yaw reading follows the wheels too loosely in this log to tell the track'
      : 'the yaw reading turns against the wheels: is the yaw column in the plan\'s sign convention (the `turns` setup)?';
    effectiveTrack = notFound('effectiveTrack', why, n, track);
    gyroScale = notFound('gyroScale', why, n, cur.gyroScale);
  } else {
    // b = scale / c; scale = c x b (delta method: the relative se carries over).
    const bFit = cur.gyroScale / c;
    effectiveTrack = found('effectiveTrack', bFit, (bFit * seC) / c, n, track,
      `assumes the plan's gyro scale ${cur.gyroScale}: a log alone tells only scale / track (use this or the gyro scale, not both)`);
    gyroScale = track !== undefined && track > 0
      ? found('gyroScale', c * track, seC * track, n, cur.gyroScale,
        `assumes the plan's effective track ${+track.toFixed(3)} mm: a log alone tells only scale / track (use this or the effective track, not both)`)
      : notFound('gyroScale', 'the plan gives no track to tell the scale from', n);
  }
  let mismatch: FitParam;
  if (twoWheels) {
    // The right wheel's travel already holds the plan's mismatch: the fit finds the true one over it.
    const m = (cur.mismatch * beta[1]) / beta[0];
    mismatch = found('mismatch', m, Math.sqrt(Math.max(0, mismatchVariance(beta, inv, sigma2, m))), n, cur.mismatch,
      'from the heading the yaw reading shows against the two wheels\' travel (straight drives show it best)');
  } else {
    mismatch = notFound('mismatch', mismatchWhy, n, cur.mismatch);
    notes.push(`the track assumes the plan's mismatch ${cur.mismatch}: ${mismatchWhy}`);
  }
  let gyroDelay: FitParam;
  if (!delayWhy) {
    const se = delayIndex >= 0 ? Math.sqrt(sigma2 * inv[delayIndex][delayIndex]) : delaySe;
    gyroDelay = found('gyroDelay', fittedDelay, se, n, cur.gyroDelay, useDelay
      ? 'how late the yaw reading is against the wheels\' travel; the track, scale, mismatch and drift are fitted at this delay'
      : `how late the yaw reading is against the wheels' travel; within a quarter of the log's row spacing (or its interval) of the plan's ${(cur.gyroDelay * 1000).toFixed(0)} ms, so the rest is fitted at the plan's`);
    // Below a quarter row the difference is within the rows' timing: not worth an edit.
    if (!useDelay) gyroDelay.differs = false;
    if (gyroDelay.high !== undefined && gyroDelay.high < 0) {
      gyroDelay.note = `the yaw reading leads the wheels by ${(-fittedDelay * 1000).toFixed(1)} ms: is the log's yaw column one row early? ${gyroDelay.note}`;
    }
  } else {
    gyroDelay = notFound('gyroDelay', delayWhy, n, cur.gyroDelay);
    if (turnedDeg >= MIN_TURNED_DEG) notes.push(`the fit uses the plan's gyro delay (${(cur.gyroDelay * 1000).toFixed(0)} ms): ${delayWhy}`);
  }
  const driftParam = withDrift
    ? found('drift', beta[p - 1], Math.sqrt(sigma2 * inv[p - 1][p - 1]), stillRows, undefined,
      `from ${still.toFixed(1)} s with both wheels still (fitted with the turning)`)
    : notFound('drift', driftNote!, stillRows);
  return { params: { effectiveTrack, gyroScale, mismatch, gyroDelay, drift: driftParam }, rmsDeg, notes };
}

/**
 * The random walk's variance per row over the white noise's: the q that maximises the likelihood with
 * the noise's variance concentrated out (a grid on log q from 1e-5 up, then Brent's search; none
 * unless the likelihood-ratio test finds it).
 */
function maxLikelihoodWalk(logLik: (q: number) => number, top = 3): number {
  const cost = (lq: number) => {
    const l = logLik(Math.pow(10, lq));
    return Number.isFinite(l) ? -l : Infinity;
  };
  const flat = -logLik(0);
  const grid: number[] = [];
  for (let lq = -5; lq <= top; lq += 2) grid.push(lq);
  const f = grid.map(cost);
  let best = 0;
  f.forEach((v, i) => { if (v < f[best]) best = i; });
  // No walk unless it is clearly more likely: the likelihood-ratio test at 5 % (the walk's variance sits
  // on the boundary at zero, so the bound is chi-square's 90 % point, 2.71: Self & Liang, JASA 1987).
  if (!(2 * (flat - f[best]) > 2.705543454095404)) return 0;
  if (best === 0 || best === grid.length - 1) return Math.pow(10, grid[best]);
  const m = brent(cost, grid[best - 1], grid[best], grid[best + 1], f[best], 0, 1e-3);
  return Math.pow(10, m.f <= f[best] ? m.x : grid[best]);
}

/** The yaw's walk (see maxLikelihoodWalk). */
function walkRatio(cols: Float64Array[], y: Float64Array, seg: Int32Array, t: Float64Array, step: number): number {
  return maxLikelihoodWalk((q) => localLevelGls(cols, y, seg, t, q, step)?.logLik ?? -Infinity);
}

/** How hard the wheels' speed is pushed about, for the basis now in them (see maxLikelihoodWalk). */
function wheelWalk(ws: WheelData[], tau: number): number {
  return maxLikelihoodWalk((r) => solveWheels(ws, tau, r)?.logLik ?? -Infinity, 5);
}

/**
 * The sums of generalised least squares of y on the columns with errors white (variance s^2) plus a
 * random walk (variance q s^2 per median row step, in proportion to each step's time), restarted
 * (diffuse) at each stretch `seg` (none: one stretch): the Kalman filter of the local-level model run
 * over y and every column alike (its gain does not depend on the data), and the innovations' products
 * weighted by their variances (Harvey, Forecasting, Structural Time Series Models and the Kalman
 * Filter, 1989, on regression with a stochastic level). q = 0 is least squares with an offset per stretch.
 */
function levelSums(cols: Float64Array[], y: Float64Array, t: Float64Array, q: number, step: number, seg?: Int32Array):
  { A: number[][]; b: number[]; yy: number; logS: number; used: number } {
  const n = y.length, p = cols.length;
  if (p === 2 && seg === undefined) return levelSums2(cols[0], cols[1], y, t, q, step);
  const qs = q / (step || 1);
  const mX = new Float64Array(p), vx = new Float64Array(p);
  const AA = new Float64Array(p * p), bb = new Float64Array(p);
  let mY = 0, yy = 0, used = 0, P = 0, logS = 0;
  for (let i = 0; i < n; i++) {
    if (i === 0 || (seg !== undefined && seg[i] !== seg[i - 1])) {
      // A new stretch: its level is the first reading (a diffuse start), left out of the sums.
      mY = y[i];
      for (let c = 0; c < p; c++) mX[c] = cols[c][i];
      P = 1;
      continue;
    }
    const dt = t[i] - t[i - 1];
    const Pp = P + (dt > 0 ? qs * dt : 0);
    const S = Pp + 1;
    const K = Pp / S;
    const w = 1 / S;
    const vy = y[i] - mY;
    mY += K * vy;
    for (let c = 0; c < p; c++) { const v = cols[c][i] - mX[c]; vx[c] = v; mX[c] += K * v; }
    P = Pp * w;
    for (let a = 0; a < p; a++) {
      const va = vx[a] * w;
      bb[a] += va * vy;
      for (let c = a; c < p; c++) AA[a * p + c] += va * vx[c];
    }
    yy += vy * vy * w;
    logS += Math.log(S);
    used++;
  }
  const A = Array.from({ length: p }, (_, a) => Array.from({ length: p }, (_, c) => (a <= c ? AA[a * p + c] : AA[c * p + a])));
  return { A, b: Array.from(bb), yy, logS, used };
}

/** levelSums for two columns and one stretch (the motor fit's inner loop), with scalar sums. */
function levelSums2(h: Float64Array, f: Float64Array, y: Float64Array, t: Float64Array, q: number, step: number):
  { A: number[][]; b: number[]; yy: number; logS: number; used: number } {
  const n = y.length;
  const qs = q / (step || 1);
  let mY = y[0], mH = h[0], mF = f[0], P = 1;
  let hh = 0, hf = 0, ff = 0, hy = 0, fy = 0, yy = 0, logS = 0;
  for (let i = 1; i < n; i++) {
    const dt = t[i] - t[i - 1];
    const Pp = P + (dt > 0 ? qs * dt : 0);
    const S = Pp + 1;
    const w = 1 / S;
    const K = Pp * w;
    const vy = y[i] - mY, vh = h[i] - mH, vf = f[i] - mF;
    mY += K * vy; mH += K * vh; mF += K * vf;
    P = Pp * w;
    hh += vh * vh * w; hf += vh * vf * w; ff += vf * vf * w; hy += vh * vy * w; fy += vf * vy * w; yy += vy * vy * w;
    if (q > 0) logS += Math.log(S);
  }
  // With no walk S = 1 + 1/k after k rows, and the log-sum telescopes to log n.
  if (q === 0) logS = Math.log(n);
  return { A: [[hh, hf], [hf, ff]], b: [hy, fy], yy, logS, used: n - 1 };
}

/** Generalised least squares with the local-level error (see levelSums): coefficients, (X'WX)^-1, the noise's variance, the log-likelihood. */
function localLevelGls(cols: Float64Array[], y: Float64Array, seg: Int32Array, t: Float64Array, q: number, step: number):
  { beta: number[]; inv: number[][]; sigma2: number; dof: number; logLik: number } | undefined {
  const p = cols.length;
  const S = levelSums(cols, y, t, q, step, seg);
  const inv = invertSym(S.A);
  if (!inv) return undefined;
  const beta = inv.map((row) => row.reduce((s, v, j) => s + v * S.b[j], 0));
  const sse = Math.max(0, S.yy - beta.reduce((s, v, j) => s + v * S.b[j], 0));
  const dof = S.used - p;
  // The log-likelihood with the noise's variance at its estimate sse / used (constants left out).
  const logLik = -0.5 * (S.used * Math.log(Math.max(sse, 1e-300) / Math.max(1, S.used)) + S.logS);
  return { beta, inv, sigma2: dof > 0 ? sse / dof : NaN, dof, logLik };
}

/** Each wheel's travel (and rate) at times t less `delay`, by linear interpolation between the rows (At, Al, Ar). */
function interpolateWheels(At: Float64Array, Al: Float64Array, Ar: Float64Array, t: Float64Array, delay: number,
  L: Float64Array, R: Float64Array, rateL: Float64Array, rateR: Float64Array): void {
  const NA = At.length, n = t.length;
  let j = 0;
  for (let i = 0; i < n; i++) {
    const tt = t[i] - delay;
    while (j < NA - 2 && At[j + 1] <= tt) j++;
    while (j > 0 && At[j] > tt) j--;
    const j1 = j + 1 < NA ? j + 1 : NA - 1;
    const span = At[j1] - At[j];
    const w = span > 0 ? Math.min(1, Math.max(0, (tt - At[j]) / span)) : 0;
    const dl = Al[j1] - Al[j], dr = Ar[j1] - Ar[j];
    L[i] = Al[j] + w * dl;
    R[i] = Ar[j] + w * dr;
    rateL[i] = span > 0 ? dl / span : 0;
    rateR[i] = span > 0 ? dr / span : 0;
  }
}

/** v less its mean within each stretch, into out. */
function centreInto(v: Float64Array, seg: Int32Array, cnt: Float64Array, sum: Float64Array, out: Float64Array): Float64Array {
  const n = v.length;
  sum.fill(0);
  for (let i = 0; i < n; i++) sum[seg[i]] += v[i];
  for (let i = 0; i < sum.length; i++) sum[i] /= cnt[i];
  for (let i = 0; i < n; i++) out[i] = v[i] - sum[seg[i]];
  return out;
}

/** The variance of m = mismatch x c2 / c1 (delta method) from the coefficients' covariance sigma2 x inv. */
function mismatchVariance(beta: number[], inv: number[][], sigma2: number, m: number): number {
  return m * m * sigma2 * (inv[1][1] / (beta[1] * beta[1]) + inv[0][0] / (beta[0] * beta[0]) - (2 * inv[0][1]) / (beta[0] * beta[1]));
}

// ---------------------------------------------------------------------------

/** Fits the robot model to a recorded run. */
export function fitRobot(run: RecordedRun, current: FitCurrent, options: FitOptions = {}): FitResult {
  const notes: string[] = [];
  if (run.samples.length > MAX_FIT_ROWS) {
    notes.push(`the fit uses the first ${MAX_FIT_ROWS.toLocaleString('en-US')} of the log's ${run.samples.length.toLocaleString('en-US')} rows (${fmtSeconds(run.samples[MAX_FIT_ROWS - 1].t)} of it): plenty to fit the model, and quick enough to offer while you edit`);
    run = { ...run, samples: run.samples.slice(0, MAX_FIT_ROWS) };
  }
  const rows = run.samples.length;
  if (rows < MIN_ROWS) {
    const why = `the log has only ${rows} row${rows === 1 ? '' : 's'}: a fit needs at least ${MIN_ROWS} (record the whole run, every control-loop sample)`;
    const params = {} as Record<FitName, FitParam>;
    const cur: Record<FitName, number | undefined> = {
      motorSpeed: current.motorSpeed, motorLag: current.motorLag, stall: current.stall,
      effectiveTrack: current.effectiveTrack, gyroScale: current.gyroScale, mismatch: current.mismatch, gyroDelay: current.gyroDelay, drift: undefined,
    };
    for (const name of Object.keys(LABELS) as FitName[]) params[name] = notFound(name, why, 0, cur[name]);
    return { params, residual: {}, notes: [...notes, why], rows, source: run.source, noiseDrift: current.noiseDrift };
  }
  let unread = 0, back = 0, last = -Infinity;
  for (const s of run.samples) {
    if (!Number.isFinite(s.t) || !Number.isFinite(s.left) || !Number.isFinite(s.right)) { unread++; continue; }
    if (s.t < last) back++; else last = s.t;
  }
  if (unread) notes.push(`${unread} row${unread === 1 ? '' : 's'} of ${run.source} without a number for the time or a wheel ${unread === 1 ? 'is' : 'are'} left out of the fit`);
  if (back) notes.push(`${back} row${back === 1 ? '' : 's'} of ${run.source} whose time runs back ${back === 1 ? 'is' : 'are'} left out of the fit`);
  const motor = fitMotor(run, current);
  const yaw = fitYaw(run, current, options);
  notes.push(...motor.notes, ...yaw.notes);
  const step = medianStep(run.samples.map((s) => s.t));
  if (step > 0 && current.sample > 0 && Math.abs(step - current.sample) > 0.25 * current.sample) {
    notes.push(`the log's rows are ${(step * 1000).toFixed(1)} ms apart and the plan's control loop runs every ${(current.sample * 1000).toFixed(1)} ms: the fit takes each row's power as held until the next row`);
  }
  const residual: FitResult['residual'] = {};
  if (motor.rmsMm !== undefined) residual.wheelMm = motor.rmsMm;
  if (yaw.rmsDeg !== undefined) residual.yawDeg = yaw.rmsDeg;
  return {
    params: { ...motor.params, ...yaw.params },
    ...(motor.wheelSpeed ? { wheelSpeed: motor.wheelSpeed } : {}),
    ...(motor.eachWheel ? { eachWheel: motor.eachWheel } : {}),
    residual,
    notes,
    rows,
    source: run.source,
    noiseDrift: current.noiseDrift,
  };
}

// ---------------------------------------------------------------------------
// Setup edits.

export interface FitFixOptions {
  /** Offer every value found, also where the plan's value lies inside its interval. */
  all?: boolean;
}

/**
 * A value rounded to a tenth of its standard error's order, but never finer than `finest` (a step
 * below what the robot repeats from run to run), at most 6 significant digits.
 */
export function roundForPlan(v: number, se: number, finest = 0): number {
  const step = Math.max(finest, se > 0 ? Math.pow(10, Math.floor(Math.log10(se)) - 1) : 0);
  const r = step > 0 ? Math.round(v / step) * step : v;
  return Number(r.toPrecision(6));
}

/** At most 6 significant digits (String(-0) is already '0'). */
function num(v: number): string {
  return String(Number(v.toPrecision(6)));
}

/** The fitted values as setup-line edits of the plan `text`. */
export function fitFixes(text: string, fit: FitResult, options: FitFixOptions = {}): Fix[] {
  const { ast } = parsePlan(text);
  const eol = lineEndOf(text);
  const offer = (p: FitParam) => p.found && p.value !== undefined && p.se !== undefined && (options.all || p.differs !== false);
  const find = <K extends Statement['kind']>(kind: K) => ast.statements.find((s) => s.kind === kind) as Extract<Statement, { kind: K }> | undefined;
  // New setup lines go after the last setup statement before the first run.
  const firstRun = ast.statements.findIndex((s) => s.kind === 'run' || s.kind === 'start');
  const setupBefore = ast.statements.slice(0, firstRun < 0 ? undefined : firstRun);
  const lastSetup = setupBefore[setupBefore.length - 1];
  const insertAt = lastSetup ? lastSetup.line + 1 : 0;
  const newLine = (line: string): TextEdit => insertLinesBefore(insertAt, [line], eol);
  const option = (stmt: Statement, node: { range: TextEdit['range'] } | undefined, key: string, value: string): TextEdit =>
    node ? { range: node.range, newText: value } : { range: { start: stmt.range.end, end: stmt.range.end }, newText: ` ${key} ${value}` };
  // Interval ends with one more decimal than the standard error's first.
  const interval = (p: FitParam, scale = 1) => {
    const places = Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(p.se! * scale || 1))));
    return `${(p.low! * scale).toFixed(places)} to ${(p.high! * scale).toFixed(places)}`;
  };
  const P = fit.params;
  const from = fit.source ? ` (fitted to ${fit.source})` : '';
  const fixes: Fix[] = [];
  const recommended: TextEdit[] = [];
  const said: string[] = [];
  /** One value's fix, also part of the preferred fix that sets every value. */
  const recommend = (title: string, edits: TextEdit[], says = [title]) => {
    fixes.push({ title: `Set the ${title}${from}`, edits, changesPath: true });
    recommended.push(...edits);
    said.push(...says);
  };

  // motor S lag T stall P
  const motorParts: { key: 'speed' | 'lag' | 'stall'; text: string; say: string }[] = [];
  if (offer(P.motorSpeed)) {
    const v = roundForPlan(P.motorSpeed.value!, P.motorSpeed.se!, 0.1);
    motorParts.push({ key: 'speed', text: `${num(v)} deg/s`, say: `motor speed ${num(v)} deg/s (95 %: ${interval(P.motorSpeed)})` });
  }
  if (offer(P.motorLag)) {
    const v = roundForPlan(P.motorLag.value! * 1000, P.motorLag.se! * 1000, 0.1);
    motorParts.push({ key: 'lag', text: `${num(v)} ms`, say: `lag ${num(v)} ms (95 %: ${interval(P.motorLag, 1000)} ms)` });
  }
  if (offer(P.stall)) {
    const v = roundForPlan(P.stall.value! * 100, P.stall.se! * 100, 0.1);
    motorParts.push({ key: 'stall', text: `${num(v)}%`, say: `stall ${num(v)} % (between ${num(P.stall.low! * 100)} and ${num(P.stall.high! * 100)} %)` });
  }
  if (motorParts.length) {
    const stmt = find('motor');
    const edits: TextEdit[] = [];
    if (stmt) {
      for (const part of motorParts) {
        if (part.key === 'speed') edits.push({ range: stmt.speed.range, newText: part.text });
        else edits.push(option(stmt, stmt[part.key], part.key, part.text));
      }
    } else {
      // A new line needs a speed: the plan's (the default) when only the lag or stall is offered.
      const speed = motorParts.find((p) => p.key === 'speed')?.text ?? `${num(P.motorSpeed.current ?? 900)} deg/s`;
      edits.push(newLine(['motor', speed, ...motorParts.filter((p) => p.key !== 'speed').map((p) => `${p.key} ${p.text}`)].join(' ')));
    }
    // Option edits of one line keep their text order when applied.
    recommend(motorParts.map((p) => p.say).join(', '), mergeSameLine(edits), motorParts.map((p) => p.say));
  }
  // track W effective WE
  if (offer(P.effectiveTrack)) {
    const p = P.effectiveTrack;
    const v = roundForPlan(p.value!, p.se!, 0.01);
    const stmt = find('track');
    const say = `effective track ${num(v)} mm (95 %: ${interval(p)} mm, assuming the gyro scale ${fitScaleText(p)})`;
    if (stmt) {
      const edits = [option(stmt, stmt.effective, 'effective', `${num(v)} mm`)];
      recommend(say, edits);
    }
  }
  // wheel D mismatch E
  if (offer(P.mismatch)) {
    const p = P.mismatch;
    const v = roundForPlan(p.value!, p.se!, 1e-5);
    const stmt = find('wheel');
    if (stmt) {
      const say = `wheel mismatch ${num(v)} (95 %: ${interval(p)})`;
      const edits = [option(stmt, stmt.mismatch, 'mismatch', num(v))];
      recommend(say, edits);
    }
  }
  // gyro delay T (only a delay the robot can have: not below zero)
  const gyroStmt = find('gyro');
  let delayText: string | undefined;
  if (offer(P.gyroDelay) && P.gyroDelay.value! >= 0) {
    const p = P.gyroDelay;
    const v = roundForPlan(p.value! * 1000, p.se! * 1000, 0.1);
    delayText = `${num(v)} ms`;
    const say = `gyro delay ${num(v)} ms (95 %: ${interval(p, 1000)} ms)`;
    const edits = [gyroStmt ? option(gyroStmt, gyroStmt.delay, 'delay', delayText) : newLine(`gyro delay ${delayText}`)];
    recommend(say, edits);
  }
  // gyro scale F: instead of the track
  if (offer(P.gyroScale)) {
    const p = P.gyroScale;
    const v = roundForPlan(p.value!, p.se!, 1e-5);
    const stmt = gyroStmt;
    // Without a gyro line, the new one carries the delay too (two gyro lines would be an error).
    const edit = stmt ? option(stmt, stmt.scale, 'scale', num(v)) : newLine(`gyro ${delayText ? `delay ${delayText} ` : ''}scale ${num(v)}`);
    fixes.push({ title: `Set the gyro scale ${num(v)} (95 %: ${interval(p)}) instead of the effective track, which it assumes${from}`, edits: [edit], changesPath: true });
  }
  // noise drift R: only where the drift seen is larger than the plan's spread allows for.
  const d = P.drift;
  if (d.found && d.value !== undefined && d.se !== undefined && Math.abs(d.value) > 0) {
    const current = fit.noiseDrift;
    const lowAbs = Math.max(0, Math.min(Math.abs(d.low!), Math.abs(d.high!)) * (Math.sign(d.low!) === Math.sign(d.high!) ? 1 : 0));
    if (options.all || current === undefined || lowAbs > current) {
      const perMin = roundForPlan(Math.abs(d.value) * 60, d.se * 60, 0.01);
      const stmt = find('noise');
      const edit = stmt ? option(stmt, stmt.drift, 'drift', `${num(perMin)} deg/min`) : newLine(`noise drift ${num(perMin)} deg/min`);
      const say = `gyro drift ${num(perMin)} deg/min in the noise model (this run drifted ${num(roundForPlan(d.value * 60, d.se * 60))} deg/min, 95 %: ${interval(d, 60)})`;
      recommend(say, [edit]);
    }
  }
  if (recommended.length > 1) {
    fixes.unshift({ title: `Set the fitted values${from}: ${said.join('; ')}`, edits: mergeSameLine(recommended), preferred: true, changesPath: true });
  } else if (fixes.length) fixes[0].preferred = true;
  return fixes;
}

function fitScaleText(p: FitParam): string {
  const m = /gyro scale ([0-9.]+)/.exec(p.note ?? '');
  return m ? m[1] : 'of the plan';
}

/** Insertions at one point are joined into one edit (two edits at one position would not apply in a defined order). */
function mergeSameLine(edits: TextEdit[]): TextEdit[] {
  const out: TextEdit[] = [];
  for (const e of edits) {
    const same = out.find((o) => o.range.start.line === e.range.start.line && o.range.start.character === e.range.start.character
      && o.range.end.line === e.range.end.line && o.range.end.character === e.range.end.character && posEq(o.range.start, o.range.end));
    if (same && posEq(e.range.start, e.range.end)) same.newText += e.newText;
    else out.push({ range: e.range, newText: e.newText });
  }
  return out;
}

function posEq(a: { line: number; character: number }, b: { line: number; character: number }): boolean {
  return a.line === b.line && a.character === b.character;
}
