import { strict as assert } from 'node:assert';
import { bivariateNormalCdf, ellipse95, normalCdf, rectangleProbability } from '../../src/core/spread/gaussian';
import { odometryStep, propagateTravel, ZERO_COV } from '../../src/core/spread/propagate';
import { mulberry32 } from '../support/random';

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
