// The statistics of repeated trials: mean, standard error, Student's t 95 %
// interval, and the first-order propagation of independent means into a
// value computed from them (with the Welch–Satterthwaite degrees of freedom).
import { normalCdf } from '../spread/gaussian';

/** A value from repeated trials: its mean, standard error and Student's t 95 % half-width. */
export interface Estimate {
  value: number;
  /** Standard error of `value`. */
  se: number;
  /** Half-width of the 95 % interval: t(0.975, df) · se. */
  half95: number;
  /** Degrees of freedom of the interval (n − 1 for one set of trials). */
  df: number;
  /** How many trials went in. */
  n: number;
}

export function mean(values: readonly number[]): number {
  let s = 0;
  for (const v of values) s += v;
  return s / values.length;
}

/** Sample standard deviation (n − 1 in the denominator). */
export function sampleSd(values: readonly number[]): number {
  const m = mean(values);
  let s = 0;
  for (const v of values) s += (v - m) * (v - m);
  return Math.sqrt(s / (values.length - 1));
}

/** Mean, standard error and t-based 95 % interval of at least two trials. */
export function estimateOf(values: readonly number[]): Estimate {
  const n = values.length;
  if (n < 2) throw new Error('an estimate needs at least two trials');
  const se = sampleSd(values) / Math.sqrt(n);
  return { value: mean(values), se, half95: tQuantile(0.975, n - 1) * se, df: n - 1, n };
}

/**
 * A value computed from independent estimates, to first order: `value` and
 * the partial derivative of the result by each input. Degrees of freedom by
 * Welch–Satterthwaite: (Σ (c_i se_i)²)² / Σ (c_i se_i)⁴ / df_i.
 */
export function propagate(value: number, terms: ReadonlyArray<{ of: Estimate; derivative: number }>): Estimate {
  let variance = 0;
  let denominator = 0;
  let n = 0;
  for (const { of, derivative } of terms) {
    const part = (derivative * of.se) ** 2;
    variance += part;
    if (of.df > 0) denominator += (part * part) / of.df;
    n += of.n;
  }
  const se = Math.sqrt(variance);
  // With no spread at all the interval is zero wide whatever its degrees of freedom.
  const df = denominator > 0 ? (variance * variance) / denominator : Math.max(1, ...terms.filter((t) => Number.isFinite(t.of.df)).map((t) => t.of.df));
  return { value, se, half95: tQuantile(0.975, df) * se, df, n };
}

/** A known constant as an estimate with no spread (for `propagate`). */
export function exact(value: number): Estimate {
  return { value, se: 0, half95: 0, df: Infinity, n: 0 };
}

// ---------------------------------------------------------------------------
// Student's t distribution

/** ln Γ(x) for x > 0 (Lanczos, g = 7, 9 terms). */
function lnGamma(x: number): number {
  const c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  x -= 1;
  let a = c[0];
  const t = x + 7.5;
  for (let i = 1; i < 9; i++) a += c[i] / (x + i);
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(a);
}

/** The continued fraction of the regularized incomplete beta function (modified Lentz). */
function betaFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d; if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c; if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d; if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c; if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < 1e-15) break;
  }
  return h;
}

/** The regularized incomplete beta function I_x(a, b). */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  return x < (a + 1) / (a + b + 2) ? (front * betaFraction(x, a, b)) / a : 1 - (front * betaFraction(1 - x, b, a)) / b;
}

/** P(T ≤ t) for Student's t with `df` degrees of freedom (any df > 0, Infinity: the normal). */
export function tCdf(t: number, df: number): number {
  if (!Number.isFinite(df)) return normalCdf(t);
  const tail = 0.5 * incompleteBeta(df / (df + t * t), df / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** The density of Student's t. */
function tPdf(t: number, df: number): number {
  if (!Number.isFinite(df)) return Math.exp(-t * t / 2) / Math.sqrt(2 * Math.PI);
  return Math.exp(lnGamma((df + 1) / 2) - lnGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - ((df + 1) / 2) * Math.log1p((t * t) / df));
}

/**
 * The p-quantile of Student's t (p in (0.5, 1)): Newton's method on the
 * distribution function (its derivative is the density), kept inside a
 * bracket that bisection narrows whenever a step would leave it.
 */
export function tQuantile(p: number, df: number): number {
  let lo = 0;
  let hi = 1;
  while (tCdf(hi, df) < p && hi < 1e12) { lo = hi; hi *= 2; }
  let t = (lo + hi) / 2;
  for (let i = 0; i < 200; i++) {
    const f = tCdf(t, df) - p;
    if (f < 0) lo = t; else hi = t;
    if (Math.abs(f) < 1e-14 || hi - lo < 1e-13 * hi) break;
    let next = t - f / tPdf(t, df);
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    t = next;
  }
  return t;
}
