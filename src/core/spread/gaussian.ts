// The two-dimensional normal distribution the spread of the robot's end
// position follows (the robot model, section 3): its 95 % ellipse, and the
// probability that it lies inside a rectangle or within a distance of a point.

/** A 2×2 covariance [[sxx, sxy], [sxy, syy]]. */
export interface Cov2 {
  xx: number;
  xy: number;
  yy: number;
}

/** χ² with two degrees of freedom at 95 %: −2 ln(0.05). */
export const CHI2_2DOF_95 = -2 * Math.log(0.05);

/**
 * The 95 % ellipse of a 2-D normal: semi-axes √(χ²·λ) of the covariance's
 * eigenvalues, the major axis tilted by ½·atan2(2 sxy, sxx − syy) from +x
 * (degrees, counterclockwise).
 */
export function ellipse95(c: Cov2): { a: number; b: number; tilt: number } {
  const mean = (c.xx + c.yy) / 2;
  const d = Math.hypot((c.xx - c.yy) / 2, c.xy);
  const l1 = Math.max(0, mean + d);
  const l2 = Math.max(0, mean - d);
  return { a: Math.sqrt(CHI2_2DOF_95 * l1), b: Math.sqrt(CHI2_2DOF_95 * l2), tilt: (0.5 * Math.atan2(2 * c.xy, c.xx - c.yy) * 180) / Math.PI };
}

/** The standard normal distribution function. */
export function normalCdf(x: number): number {
  return x >= 0 ? 1 - 0.5 * erfc(x / Math.SQRT2) : 0.5 * erfc(-x / Math.SQRT2);
}

/**
 * The complementary error function for x ≥ 0: the Maclaurin series of erf
 * below 3 (Abramowitz & Stegun 7.1.5), the continued fraction of erfc above
 * (A&S 7.1.14, evaluated by the modified Lentz method); about 1e-15 relative.
 */
export function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x);
  if (x < 3) {
    // erf x = 2/√π Σ (−1)ⁿ x^(2n+1) / (n! (2n+1))
    let term = x;
    let sum = x;
    for (let n = 1; n < 100; n++) {
      term *= (-x * x) / n;
      const add = term / (2 * n + 1);
      sum += add;
      if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * sum;
  }
  // erfc x = exp(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …)))))
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let n = 1; n < 200; n++) {
    const a = n / 2;
    d = x + a * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = x + a / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f);
}

/** Gauss–Legendre nodes and weights on [−1, 1], 20 points (computed once by Newton's method on P₂₀). */
const GL = gaussLegendre(20);

function gaussLegendre(n: number): { x: number[]; w: number[] } {
  const x: number[] = [];
  const w: number[] = [];
  for (let i = 1; i <= n; i++) {
    let z = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let k = 0; k < 100; k++) {
      let p0 = 1;
      let p1 = z;
      for (let j = 2; j <= n; j++) [p0, p1] = [p1, ((2 * j - 1) * z * p1 - (j - 1) * p0) / j];
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const step = p1 / dp;
      z -= step;
      if (Math.abs(step) < 1e-15) break;
    }
    x.push(z);
    w.push(2 / ((1 - z * z) * dp * dp));
  }
  return { x, w };
}

/**
 * P(X ≤ h, Y ≤ k) for standard normals with correlation ρ: Φ(h)Φ(k) plus
 * (1/2π) ∫₀^asin ρ exp(−(h² + k² − 2hk sin θ) / (2 cos² θ)) dθ (the integral
 * form used by Drezner and Wesolowsky, 1990), by Gauss–Legendre quadrature.
 */
export function bivariateNormalCdf(h: number, k: number, rho: number): number {
  if (h === -Infinity || k === -Infinity) return 0;
  if (h === Infinity) return normalCdf(k);
  if (k === Infinity) return normalCdf(h);
  const r = Math.max(-1, Math.min(1, rho));
  const top = Math.asin(r);
  let sum = 0;
  for (let i = 0; i < GL.x.length; i++) {
    const t = (top / 2) * (GL.x[i] + 1);
    const s = Math.sin(t);
    const c2 = 1 - s * s;
    sum += GL.w[i] * (c2 > 0 ? Math.exp(-(h * h + k * k - 2 * h * k * s) / (2 * c2)) : 0);
  }
  return Math.max(0, Math.min(1, normalCdf(h) * normalCdf(k) + (top / 2) * sum / (2 * Math.PI)));
}

/** The probability that N(mean, cov) lies in the rectangle [x0, x1] × [y0, y1]. */
export function rectangleProbability(mean: { x: number; y: number }, c: Cov2, x0: number, x1: number, y0: number, y1: number): number {
  const sx = Math.sqrt(c.xx);
  const sy = Math.sqrt(c.yy);
  if (!(sx > 0) || !(sy > 0)) {
    // A degenerate spread: a line or a point.
    const inX = sx > 0 ? normalCdf((x1 - mean.x) / sx) - normalCdf((x0 - mean.x) / sx) : Number(mean.x >= x0 && mean.x <= x1);
    const inY = sy > 0 ? normalCdf((y1 - mean.y) / sy) - normalCdf((y0 - mean.y) / sy) : Number(mean.y >= y0 && mean.y <= y1);
    return inX * inY;
  }
  const rho = c.xy / (sx * sy);
  const F = (x: number, y: number) => bivariateNormalCdf((x - mean.x) / sx, (y - mean.y) / sy, rho);
  return Math.max(0, Math.min(1, F(x1, y1) - F(x0, y1) - F(x1, y0) + F(x0, y0)));
}

const GL32 = gaussLegendre(32);

/**
 * The probability that N(mean, cov) lies within `radius` of `center`: the
 * density integrated over the disc in polar coordinates (Gauss–Legendre in
 * both the radius and the angle).
 */
export function discProbability(mean: { x: number; y: number }, c: Cov2, center: { x: number; y: number }, radius: number): number {
  const det = c.xx * c.yy - c.xy * c.xy;
  if (!(det > 0)) {
    // A degenerate spread: the mean itself decides.
    return Math.hypot(mean.x - center.x, mean.y - center.y) <= radius ? 1 : 0;
  }
  const ixx = c.yy / det;
  const ixy = -c.xy / det;
  const iyy = c.xx / det;
  const norm = 1 / (2 * Math.PI * Math.sqrt(det));
  let sum = 0;
  for (let i = 0; i < GL32.x.length; i++) {
    const rho = (radius / 2) * (GL32.x[i] + 1);
    for (let j = 0; j < GL32.x.length; j++) {
      const phi = Math.PI * (GL32.x[j] + 1);
      const dx = center.x + rho * Math.cos(phi) - mean.x;
      const dy = center.y + rho * Math.sin(phi) - mean.y;
      sum += GL32.w[i] * GL32.w[j] * rho * Math.exp(-0.5 * (ixx * dx * dx + 2 * ixy * dx * dy + iyy * dy * dy));
    }
  }
  return Math.max(0, Math.min(1, norm * sum * (radius / 2) * Math.PI));
}

/** What a `mark` asks for: to be inside a zone, or within a distance of a point. */
export type MarkTarget =
  | { kind: 'zone'; name: string; min: { x: number; y: number }; max: { x: number; y: number } }
  | { kind: 'point'; at: { x: number; y: number }; within: number };

/** Whether a position meets the mark. */
export function meetsMark(t: MarkTarget, x: number, y: number): boolean {
  return t.kind === 'zone' ? x >= t.min.x && x <= t.max.x && y >= t.min.y && y <= t.max.y : Math.hypot(x - t.at.x, y - t.at.y) <= t.within;
}

/** The share of sampled positions (xs[j], ys[j]) that meet the mark. */
export function shareMeeting(t: MarkTarget, xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  let met = 0;
  for (let j = 0; j < xs.length; j++) if (meetsMark(t, xs[j], ys[j])) met++;
  return xs.length ? met / xs.length : 0;
}

/** The chance that N(mean, c) meets the mark. */
export function markProbability(t: MarkTarget, mean: { x: number; y: number }, c: Cov2): number {
  return t.kind === 'zone' ? rectangleProbability(mean, c, t.min.x, t.max.x, t.min.y, t.max.y) : discProbability(mean, c, t.at, t.within);
}
