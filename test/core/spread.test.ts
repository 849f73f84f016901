import { strict as assert } from 'node:assert';
import { bivariateNormalCdf, discProbability, ellipse95, erfc, normalCdf, rectangleProbability } from '../../src/core/spread/gaussian';
import * as mathjs from 'mathjs';
import { odometryStep, propagateTravel, ZERO_COV } from '../../src/core/spread/propagate';
import { mulberry32 } from '../support/random';
import { propagateRun } from '../../src/core/spread/run';
import { sampleRun, sampleStats } from '../../src/core/spread/sample';
import { hoverAt } from '../../src/core/insight/hover';
import { checkPlan } from '../../src/core';

// The two-dimensional normal behind the spread of where the robot ends up
// (robot model, section 3), against values computed outside the project.

describe('spread: the 2-D normal', () => {
  it('the 95 % ellipse of [[4,1],[1,2]]: semi-axes 5.1427 and 3.0824, tilt 22.5° (robot model section 3; χ² 2 dof at 95 % = 5.991)', () => {
    const e = ellipse95({ xx: 4, xy: 1, yy: 2 });
    assert.ok(Math.abs(e.a - 5.1427) < 1e-4, `${e.a}`);
    assert.ok(Math.abs(e.b - 3.0824) < 1e-4, `${e.b}`);
    assert.ok(Math.abs(e.tilt - 22.5) < 1e-9, `${e.tilt}`);
  });

  it('the standard normal distribution function at 1.96 is 0.975 (any statistics table)', () => {
    assert.ok(Math.abs(normalCdf(1.96) - 0.9750021) < 1e-6);
  });

  it('the error function agrees with math.js\'s erf (an independent implementation) to 1e-13, in and out of the series\' range', () => {
    for (let x = -6; x <= 6; x += 0.173) {
      assert.ok(Math.abs(1 - erfc(x) - mathjs.erf(x)) < 1e-13, `${x}: ${1 - erfc(x)} vs ${mathjs.erf(x)}`);
    }
  });

  it('independent coordinates: the bivariate distribution function is the product of the two (ρ = 0)', () => {
    assert.ok(Math.abs(bivariateNormalCdf(0.3, -1.2, 0) - normalCdf(0.3) * normalCdf(-1.2)) < 1e-12);
  });

  it('P(X ≤ 0, Y ≤ 0) = 1/4 + asin(ρ)/(2π) (Sheppard\'s formula)', () => {
    for (const rho of [-0.9, -0.5, 0.3, 0.8, 0.95]) {
      assert.ok(Math.abs(bivariateNormalCdf(0, 0, rho) - (0.25 + Math.asin(rho) / (2 * Math.PI))) < 1e-10, `${rho}`);
    }
  });

  it('N(0, [[4,1],[1,2]]) in [-3,5] × [-2,2]: 0.787349; with diag(4,2): 0.781169 (SciPy multivariate_normal.cdf with lower_limit, robot model section 3)', () => {
    const p = rectangleProbability({ x: 0, y: 0 }, { xx: 4, xy: 1, yy: 2 }, -3, 5, -2, 2);
    assert.ok(Math.abs(p - 0.787349) < 1e-6, `${p}`);
    const q = rectangleProbability({ x: 0, y: 0 }, { xx: 4, xy: 0, yy: 2 }, -3, 5, -2, 2);
    assert.ok(Math.abs(q - 0.781169) < 1e-6, `${q}`);
  });
});

describe('spread: the probability of reaching a point', () => {
  it('an isotropic spread centred on the point: 1 − exp(−D²/2σ²) (the Rayleigh distribution)', () => {
    for (const [sd, d] of [[10, 20], [20, 20], [5, 3]]) {
      const p = discProbability({ x: 100, y: 50 }, { xx: sd * sd, xy: 0, yy: sd * sd }, { x: 100, y: 50 }, d);
      assert.ok(Math.abs(p - (1 - Math.exp(-(d * d) / (2 * sd * sd)))) < 1e-6, `${sd}, ${d}: ${p}`);
    }
  });

  it('far from the point the probability is nearly zero; a thin spread on it, nearly one', () => {
    assert.ok(discProbability({ x: 0, y: 0 }, { xx: 4, xy: 1, yy: 2 }, { x: 100, y: 0 }, 20) < 1e-12);
    assert.ok(discProbability({ x: 0, y: 0 }, { xx: 1, xy: 0.5, yy: 1 }, { x: 0, y: 0 }, 20) > 1 - 1e-9);
  });
});

describe('spread: propagation along wheel travel', () => {
  it('a straight drive reaches the closed form of Chong & Kleeman (1997) within 0.5 %: kL = kR = 1e-5 m, b = 0.12 m, D = 1 m', () => {
    // var across = k D³/(3 b²) = 4.6296e-4 m², var heading = k D / b² = 1.3889e-3 rad², cov = k D²/(2 b²)
    // with k = kL + kR (robot model section 3). Here in mm: k = 0.02 mm, b = 120 mm, D = 1000 mm.
    const p = propagateTravel(ZERO_COV, 0, 1000, 1000, 120, 0.01, 0.01);
    const across = p.xx / 1e6; // heading 0 faces +y: across the track is x
    assert.ok(Math.abs(across / 4.6296e-4 - 1) < 0.005, `${across}`);
    assert.ok(Math.abs(p.hh / 1.3889e-3 - 1) < 0.001, `${p.hh}`);
    assert.ok(Math.abs(p.xh / (0.02 * 1e6 / (2 * 14400)) - 1) < 0.005, `${p.xh}`);
  });

  it('one step over the whole drive understates the across-track spread: D³/4 instead of D³/3 (robot model section 3)', () => {
    const one = odometryStep(ZERO_COV, 0, 1000, 1000, 120, 0.01, 0.01);
    assert.ok(Math.abs(one.xx / (0.02 * 1e9 / (4 * 14400)) - 1) < 1e-9, `${one.xx}`);
  });
});

describe('spread: the linear model against sampling', () => {
  it('an arc: the propagated covariance matches 4,000 sampled drives with independent wheel errors (within sampling error)', () => {
    // Each wheel's travel, in 1 mm pieces, gets an error of variance k per mm (Chong & Kleeman's
    // model); each sampled path is integrated exactly piece by piece. Sampling error of a variance
    // from 4,000 samples: about √(2/4000) = 2.2 %; allowed 8 % (over 3 σ).
    const k = 0.01;
    const b = 120;
    const [sL, sR] = [600, 400];
    const linear = propagateTravel(ZERO_COV, 0, sL, sR, b, k, k);
    const rand = mulberry32(77);
    const gauss = () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    const N = 4000;
    const pieces = 300;
    const xs: number[] = [];
    const ys: number[] = [];
    const hs: number[] = [];
    for (let n = 0; n < N; n++) {
      let [x, y, h] = [0, 0, 0];
      for (let i = 0; i < pieces; i++) {
        const l = sL / pieces + Math.sqrt(k * (sL / pieces)) * gauss();
        const r = sR / pieces + Math.sqrt(k * (sR / pieces)) * gauss();
        const dh = (l - r) / b;
        const ds = (l + r) / 2;
        const chord = Math.abs(dh) < 1e-12 ? ds : (ds * Math.sin(dh / 2)) / (dh / 2);
        x += chord * Math.sin(h + dh / 2);
        y += chord * Math.cos(h + dh / 2);
        h += dh;
      }
      xs.push(x);
      ys.push(y);
      hs.push(h);
    }
    const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
    const cov = (a: number[], c: number[]) => { const ma = mean(a); const mc = mean(c); return a.reduce((s, v, i) => s + (v - ma) * (c[i] - mc), 0) / (a.length - 1); };
    for (const [name, sampled, lin] of [['xx', cov(xs, xs), linear.xx], ['yy', cov(ys, ys), linear.yy], ['hh', cov(hs, hs), linear.hh]] as const) {
      assert.ok(Math.abs(sampled / lin - 1) < 0.08, `${name}: sampled ${sampled} vs linear ${lin}`);
    }
  });
});

describe('spread: along a run (robot model section 3 rules)', () => {
  const noise = { drive: 0.01, turn: 0.015, gyro: 1, drift: 0.5 / 60 };
  const robot = ['wheel 56 mm', 'track 120 mm', 'motor 900 deg/s lag 20 ms', 'field 3000 by 3000'];
  /** The final heading's standard deviation (degrees) of a plan; turns written with `reset` zero the yaw first. */
  const finalHeadingSd = (motions: string[]) => {
    const lines = [...robot, 'start (1500, 500) heading 0', ...motions];
    const r = checkPlan(lines.join('\n'), { simulate: false });
    const segs = r.runs[0].segments;
    const { bySegment } = propagateRun(segs, noise, 120, 'clockwise');
    return bySegment.get(segs[segs.length - 1])!.headingSd;
  };

  it('resetting the yaw before every gyro turn lets the errors add up; keeping one reference does not', () => {
    const legs = (reset: boolean) => [0, 1, 2, 3].flatMap(() => ['drive 400', `turn 90 by gyro${reset ? ' reset' : ''}`]);
    const every = finalHeadingSd(legs(true));
    const kept = finalHeadingSd(legs(false));
    // Kept: the last turn ends on the start's reference: the gyro's 1° (and a few seconds of drift).
    assert.ok(Math.abs(kept - 1) < 0.05, `${kept}`);
    // Reset each time: every drive's heading error (wheel noise over 400 mm) becomes the next reference's.
    assert.ok(every > kept + 0.5, `${every} vs ${kept}`);
  });

  it("a reset just after squaring on a wall removes the earlier reference's error", () => {
    // An error in the reference first (a reset after a long encoder drive), then a square against the top wall.
    const before = ['drive 1000', 'reset yaw', 'drive 500', 'square front'];
    const without = finalHeadingSd([...before, 'drive -300', 'turn 90 by gyro']);
    const withReset = finalHeadingSd([...before, 'reset yaw', 'drive -300', 'turn 90 by gyro']);
    // After the square the heading's error is the square's 0.5°; the turn then ends on it plus the gyro's 1°
    // (robot model section 3: √(0.5² + 1²) = 1.118°, and a second of drift).
    assert.ok(Math.abs(withReset - Math.hypot(0.5, 1)) < 0.02, `${withReset}`);
    assert.ok(without > withReset + 0.3, `${without} vs ${withReset}`);
  });
});

describe('spread: marks', () => {
  it('a mark\'s `level` sets the share of runs it wants; outside 50 % to under 100 % it is refused', () => {
    // The same 2 m encoder drive as below; the chance of ending within 180 mm is between 80 % and 95 % here.
    const plan = (level: string) => ['wheel 56 mm', 'track 120 mm', 'noise drive 5% wheel 0.02 mm', 'start (500, 500) heading 0', 'drive 2000',
      `mark "far" at (500, 2500) within 180${level}`].join('\n');
    const plain = checkPlan(plan(''), { simulate: false });
    const p = plain.runs[0].segments.find((s) => s.kind === 'mark')!.hitProbability!;
    assert.ok(p > 0.8 && p < 0.95, `${p}`);
    assert.equal(plain.diagnostics.filter((d) => d.code === 'miss').length, 1);
    assert.equal(checkPlan(plan(' level 80%'), { simulate: false }).diagnostics.filter((d) => d.code === 'miss').length, 0);
    const strict = checkPlan(plan(' level 99%'), { simulate: false }).diagnostics.find((d) => d.code === 'miss')!;
    assert.match(strict.message, /\(99 % wanted\)/);
    for (const bad of [' level 100%', ' level 30%']) {
      const d = checkPlan(plan(bad), { simulate: false }).diagnostics.find((x) => x.severity === 'error')!;
      assert.match(d.message, /^A level of/);
    }
  });

  it('`noise square A across D` sets the spread a square leaves (robot model section 3)', () => {
    const text = ['wheel 56 mm', 'track 120 mm', 'noise square 2 deg across 3 mm', 'field 2000 by 2000', 'start (300, 300) heading 0', 'drive 1000', 'square front'].join('\n');
    const r = checkPlan(text, { simulate: false });
    const sq = r.runs[0].segments.find((s) => s.kind === 'square')!.spread!;
    // Facing the top wall: the heading's sd is A, the position's across the wall (y) is D.
    assert.ok(Math.abs(sq.headingSd - 2) < 1e-9, `${sq.headingSd}`);
    assert.ok(Math.abs(Math.sqrt(sq.cov[1][1]) - 3) < 1e-9, `${sq.cov[1][1]}`);
  });

  it('a mark the planned pose meets but most runs miss gets a miss warning naming the biggest source', () => {
    // 2 m by encoders with a 5 % distance scale: about 100 mm along the track (robot model section 3,
    // distScale × D), more than the wheels' random error across it (√(k D³ / 3b²) = 61 mm with k = 0.02 mm).
    const text = ['wheel 56 mm', 'track 120 mm', 'noise drive 5%', 'start (500, 500) heading 0', 'drive 2000', 'mark "far" at (500, 2500) within 20 mm'].join('\n');
    const r = checkPlan(text, { simulate: false });
    const mark = r.runs[0].segments.find((s) => s.kind === 'mark')!;
    assert.ok(mark.hitProbability! < 0.2, `${mark.hitProbability}`);
    const miss = r.diagnostics.find((d) => d.code === 'miss')!;
    assert.match(miss.message, /^Only \d+ % of runs end within 20 mm of \(500, 2500\) \(95 % wanted\)/);
    assert.match(miss.message, /Most of it comes from the distance error of encoder drives \(±5 %/);
    // The along-track spread: sd 100 mm (5 % of 2 m) dominates the oval's long axis: √5.991 × 100 = 244.8 mm.
    assert.ok(Math.abs(mark.spread!.ellipse95.a - Math.sqrt(5.991 * (100 ** 2 + 0))) < 1, `${mark.spread!.ellipse95.a}`);
  });

  it('a mark met in almost every run gets no warning', () => {
    const r = checkPlan(['wheel 56 mm', 'track 120 mm', 'zone "bay" (300, 300) to (700, 1100)', 'start (500, 500) heading 0', 'drive 200', 'mark "in" in "bay"'].join('\n'), { simulate: false });
    // A 200 mm drive spreads a few millimetres (Chong & Kleeman: √(k D³/3b²) ≈ 2 mm across, 1 % of 200 mm along),
    // and the zone's nearest edge is 200 mm away: the chance is 1 to many decimals.
    assert.ok(r.runs[0].segments.find((s) => s.kind === 'mark')!.hitProbability! > 0.999);
    assert.equal(r.diagnostics.filter((d) => d.code === 'miss').length, 0);
  });
});

describe('spread: the linear model against the Monte Carlo', () => {
  it('mean and covariance of 4,000 sampled runs agree with the linear model within sampling error (3 σ), for small noise', () => {
    // Sampling error of a variance from N samples: σ²·√(2/N) (2.2 % at N = 4,000); of a mean: σ/√N.
    const noise = { drive: 0.005, turn: 0.005, gyro: 0.5, drift: 0.5 / 60 };
    const lines = ['wheel 56 mm', 'track 120 mm', 'field 3000 by 3000', 'start (800, 600) heading 0', 'drive 600', 'turn 90',
      'drive 400 hold 90', 'turn -45 arc 300', 'turn 45 by gyro', 'reset yaw', 'drive 300', 'turn -90 by gyro', 'drive 500'];
    const r = checkPlan(lines.join('\n'), { simulate: false });
    const segs = r.runs[0].segments;
    const linear = propagateRun(segs, noise, 120, 'clockwise').bySegment;
    const samples = sampleRun(segs, noise, 120, 'clockwise', 4000, 12345);
    for (let i = 1; i < segs.length; i++) {
      const { mean, cov } = sampleStats(samples, i);
      const lin = linear.get(segs[i])!.cov;
      const end = segs[i].end;
      for (const [k, planned] of [[0, end.x], [1, end.y]] as const) {
        const sd = Math.sqrt(lin[k][k]);
        assert.ok(Math.abs(mean[k] - planned) <= 3 * sd / Math.sqrt(4000) + 0.05, `line ${segs[i].line + 1} mean ${k}: ${mean[k]} vs ${planned} (sd ${sd})`);
      }
      for (let a = 0; a < 3; a++) {
        for (let b = a; b < 3; b++) {
          // A covariance's sampling sd: √((σa²σb² + σab²)/N).
          const tol = 3 * Math.sqrt((lin[a][a] * lin[b][b] + lin[a][b] ** 2) / 4000) + 1e-9;
          assert.ok(Math.abs(cov[a][b] - lin[a][b]) <= tol, `line ${segs[i].line + 1} cov[${a}][${b}]: sampled ${cov[a][b]} vs linear ${lin[a][b]} (± ${tol})`);
        }
      }
    }
  });
});

describe('spread: the Monte Carlo with the controller simulation', () => {
  it('simulates every sampled run: its mean is the predicted end, its variances the linear model\'s (3 σ), for small noise', () => {
    // The same sampling errors as above; the sampled runs now go through the controllers (motor lag 30 ms, a 10 ms
    // loop, gyro turns that stop in their band, a held drive, a square), so they scatter about the predicted ends.
    const noise = { drive: 0.005, turn: 0.005, gyro: 0.5, drift: 0.5 / 60 };
    const lines = ['wheel 56 mm', 'track 120 mm', 'motor 600 deg/s lag 30 ms', 'field 3000 by 3000', 'start (800, 600) heading 0', 'drive 600 speed 40%',
      'turn to 90 by gyro speed 30% min 8% stop 3 deg', 'drive 400 hold 90 speed 40%', 'turn 45 by gyro speed 30% min 8% stop 3 deg', 'reset yaw',
      'drive 300 speed 40%', 'turn -45 by gyro speed 30% min 8% stop 3 deg', 'square front speed 30%', 'drive -300 speed 40%', 'turn 30 speed 30%'];
    const r = checkPlan(lines.join('\n'));
    const segs = r.runs[0].segments;
    assert.ok(segs.slice(1).every((s) => s.predicted), 'every motion is predicted');
    const N = 3000;
    const samples = sampleRun(segs, noise, 120, 'clockwise', N, 99);
    const linear = propagateRun(segs, noise, 120, 'clockwise').bySegment;
    let afterHold = false;
    for (let i = 1; i < segs.length; i++) {
      const { mean, cov } = sampleStats(samples, i);
      const lin = linear.get(segs[i])!.cov;
      const end = segs[i].predicted!.end;
      for (const [k, predicted] of [[0, end.x], [1, end.y], [2, end.heading]] as const) {
        // A mean's sampling error is σ/√N. Beyond it the controllers are a little nonlinear (a turn that starts a
        // little off stops a little differently in its band, which a long drive carries sideways): 0.12 σ and 0.1°,
        // common practice, no published source.
        const sd = Math.sqrt(lin[k][k]);
        const tol = 3 * sd / Math.sqrt(N) + (k === 2 ? 0.1 : 0.12 * sd + 0.3);
        assert.ok(Math.abs(mean[k] - predicted) <= tol, `line ${segs[i].line + 1} mean ${k}: ${mean[k]} vs predicted ${predicted} (± ${tol})`);
      }
      if (segs[i].kind === 'drive' && segs[i].sensing === 'gyro') afterHold = true;
      for (let a = 0; a < 3; a++) {
        for (let b = a; b < 3; b++) {
          // The linear model takes a held drive onto its heading at once; the simulated one steers there over some
          // distance, which ties its sideways error to its heading's: its covariances (off the diagonal) are left out.
          if (a !== b && afterHold) continue;
          // A covariance's sampling sd: √((σa²σb² + σab²)/N); 6 % more for the controllers' nonlinearity.
          const tol = 3 * Math.sqrt((lin[a][a] * lin[b][b] + lin[a][b] ** 2) / N) + 0.06 * Math.sqrt(lin[a][a] * lin[b][b]) + 1e-9;
          assert.ok(Math.abs(cov[a][b] - lin[a][b]) <= tol, `line ${segs[i].line + 1} cov[${a}][${b}]: sampled ${cov[a][b]} vs linear ${lin[a][b]} (± ${tol})`);
        }
      }
    }
  });

  it('a sampled run whose turn never ends stays where it stopped, and the sampling repeats with its seed', () => {
    // A gyro turn whose `min` is under the stall power stalls (robot model, section 2): the rest of that run never happens.
    const text = ['wheel 56 mm', 'track 120 mm', 'motor 600 deg/s lag 30 ms stall 12%', 'start (500, 500) heading 0', 'turn 90 by gyro min 5% stop 1 deg', 'drive 300'].join('\n');
    const r = checkPlan(text);
    const segs = r.runs[0].segments;
    const a = sampleRun(segs, r.setup.noise, 120, 'clockwise', 50, 3);
    const b = sampleRun(segs, r.setup.noise, 120, 'clockwise', 50, 3);
    assert.deepEqual(Array.from(a.x[2]), Array.from(b.x[2]));
    for (let s = 0; s < 50; s++) {
      assert.equal(a.x[2][s], a.x[1][s]);
      assert.equal(a.y[2][s], a.y[1][s]);
    }
  });
});

describe('spread: what a reset does', () => {
  it('the hover of a reset compares the spread at the run\'s end with and without it', () => {
    // Every turn zeroed versus one reference (the rule the tests above check): the hover shows the two figures side by side.
    const text = ['wheel 56 mm', 'track 120 mm', 'start (500, 500) heading 0', 'drive 800', 'turn 90 by gyro', 'drive 800', 'reset yaw', 'turn 90 by gyro', 'drive 800'].join('\n');
    const r = checkPlan(text, { simulate: false });
    const md = hoverAt(r, text, { line: 6, character: 7 })!.markdown;
    const m = /at the run's end ([\d.]+) mm with it, ([\d.]+) mm without it/.exec(md);
    assert.ok(m, md);
    // Zeroing after a drive hands that drive's heading error on to the next gyro turn: the end spreads wider with it.
    assert.ok(Number(m[1]) > Number(m[2]), md);
    assert.match(md, /heading at the end \(±2 sd\): [\d.]+° with it, [\d.]+° without it/);
  });
});

describe('spread: noise wheel', () => {
  it('`noise wheel K` sets the wheels\' random error: twice K, twice the heading variance of a straight encoder drive (k D / b², Chong & Kleeman)', () => {
    const headingVar = (extra: string[]) => {
      const r = checkPlan(['wheel 56 mm', 'track 120 mm', 'noise drive 0% turn 0% gyro 0 deg drift 0 deg/s', ...extra, 'start (500, 500) heading 0', 'drive 1000'].join('\n'), { simulate: false });
      assert.deepEqual(r.diagnostics.filter((d) => d.severity === 'error').map((d) => d.message), []);
      return r.runs[0].segments[1].spread!.cov[2][2];
    };
    const base = headingVar([]);
    // k = kL + kR = 0.02 mm, D = 1000 mm, b = 120 mm: 0.02·1000/120² rad² = 1.3889e-3 rad² = 4.5595 deg².
    assert.ok(Math.abs(base - 1.3889e-3 * (180 / Math.PI) ** 2) < 0.01, `${base}`);
    const r2 = checkPlan(['wheel 56 mm', 'track 120 mm', 'noise drive 0% turn 0% gyro 0 deg drift 0 deg/s wheel 0.02 mm', 'start (500, 500) heading 0', 'drive 1000'].join('\n'), { simulate: false });
    assert.ok(Math.abs(r2.runs[0].segments[1].spread!.cov[2][2] / base - 2) < 1e-9);
  });

  it('a wheel noise outside 0 to 10 mm is refused with a clear message', () => {
    const r = checkPlan(['wheel 56 mm', 'track 120 mm', 'noise wheel 50 mm', 'start (500, 500) heading 0'].join('\n'));
    const e = r.diagnostics.find((d) => d.code === 'setup')!;
    assert.match(e.message, /wheel noise of 50 mm is far beyond any wheel on a table/);
  });
});
