import { strict as assert } from 'node:assert';
import fc from 'fast-check';
import { checkPlan } from '../../src/core';
import type { Segment } from '../../src/core/types';
import { encoderTurnTime, gyroTurnTime, linearRampTime, profileTime } from '../../src/core/solve/timing';

// Times of drives and turns (spec section 8). Sources: the trapezoidal profile
// of constant-acceleration kinematics (t = D/v + v/a when D >= v²/a, else
// 2·sqrt(D/a)); the spec's s·ln(v1/v0)/(v1−v0) for speed linear in distance;
// the gyro turn's phases derived by hand below.

function near(actual: number | undefined, expected: number, tolerance: number, what: string): void {
  assert.ok(actual !== undefined && Math.abs(actual - expected) <= tolerance, `${what}: expected ${expected} ± ${tolerance}, got ${actual}`);
}

function onlySegment(lines: string[]): Segment {
  const r = checkPlan(lines.join('\n'));
  assert.deepEqual(r.diagnostics.filter((d) => d.severity === 'error').map((d) => d.message), []);
  return r.runs[0].segments[r.runs[0].segments.length - 1];
}

// 60 mm wheels, 900 deg/s motors: full speed = 900/360 · π · 60 = 150π mm/s (spec section 5).
const FULL = 150 * Math.PI;
const robot = ['wheel 60', 'track 120', 'motor 900 deg/s lag 0 ms'];

describe('timing: drives', () => {
  it('without ramp a drive takes |D| / v', () => {
    // Spec section 8: |D| / v with v = 50 % of full speed (the default power).
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'drive 600']).duration, 600 / (0.5 * FULL), 1e-9, '50 % drive');
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'drive -600 speed 200 mm/s']).duration, 3, 1e-9, 'backwards at 200 mm/s');
  });

  it('with a ramp long enough to reach speed: trapezoid, t = D/v + v/a', () => {
    // D = 1000 ≥ v²/a = 40000/800 = 50: trapezoidal profile (constant-acceleration kinematics).
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'drive 1000 speed 200 mm/s ramp 800 mm/s^2']).duration, 1000 / 200 + 200 / 800, 1e-9, 'trapezoid');
  });

  it('with a ramp too short to reach speed: triangle, t = 2·sqrt(D/a)', () => {
    // D = 30 < v²/a = 50: triangular profile (constant-acceleration kinematics).
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'drive 30 speed 200 mm/s ramp 800 mm/s^2']).duration, 2 * Math.sqrt(30 / 800), 1e-9, 'triangle');
  });

  it('the profile is continuous where trapezoid meets triangle (D = v²/a)', () => {
    fc.assert(fc.property(fc.double({ min: 10, max: 2000, noNaN: true }), fc.double({ min: 50, max: 5000, noNaN: true }), (v, a) => {
      const d = (v * v) / a;
      // Both formulas give 2v/a at D = v²/a (algebra on the trapezoid formulas).
      near(profileTime(d * (1 + 1e-12), v, a), 2 * v / a, 1e-6 * (2 * v / a), 'above');
      near(profileTime(d * (1 - 1e-12), v, a), 2 * v / a, 1e-6 * (2 * v / a), 'below');
      // A ramp never makes a drive faster than driving at top speed throughout.
      assert.ok(profileTime(d * 3, v, a) >= (d * 3) / v);
    }), { numRuns: 200, seed: 21 });
  });
});

describe('timing: encoder turns', () => {
  it('without ramp: the faster wheel\'s travel over its speed', () => {
    // Spin 90°: each wheel rolls 60 · π/2 mm (arc = radius × angle) at 50 % of full speed (spec section 8).
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'turn 90']).duration, (60 * Math.PI / 2) / (0.5 * FULL), 1e-9, 'spin');
    // Pivot: the moving wheel rolls 120 · π/2.
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'turn 90 pivot right speed 40%']).duration, (120 * Math.PI / 2) / (0.4 * FULL), 1e-9, 'pivot');
  });

  it('with ramp: each half takes s·ln(v1/v0)/(v1−v0) (spec section 8)', () => {
    const s = 60 * Math.PI / 2; // outer wheel travel of a 90° spin (arc = radius × angle)
    const v0 = 0.1 * FULL; // `min` default 10 % (spec section 5)
    const v1 = 0.5 * FULL; // `speed` default 50 %
    const half = (s / 2) * Math.log(v1 / v0) / (v1 - v0);
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'turn 90 ramp']).duration, 2 * half, 1e-9, 'ramped spin');
    const s2 = 180 * Math.PI / 2; // arc 120: outer wheel at 180 mm from the centre
    const v0b = 0.2 * FULL;
    const v1b = 0.8 * FULL;
    near(onlySegment([...robot, 'start (0, 0) heading 0', 'turn -90 arc 120 speed 80% min 20% ramp']).duration,
      2 * (s2 / 2) * Math.log(v1b / v0b) / (v1b - v0b), 1e-9, 'ramped arc');
  });

  it('the ramp formula tends to s/v as v1 → v0, and is slower than top speed throughout', () => {
    // Limit of s·ln(v1/v0)/(v1−v0) as v1 → v0 is s/v0 (l'Hôpital).
    near(linearRampTime(100, 50, 50 * (1 + 1e-9)), 2, 1e-6, 'limit');
    near(linearRampTime(100, 50, 50), 2, 1e-12, 'equal speeds');
    fc.assert(fc.property(fc.double({ min: 1, max: 500, noNaN: true }), fc.double({ min: 1, max: 100, noNaN: true }), fc.double({ min: 101, max: 1000, noNaN: true }),
      (s, vMin, vTop) => {
        const t = encoderTurnTime(s, vTop, vMin, true);
        assert.ok(t >= s / vTop && t <= s / vMin, `${t} outside [${s / vTop}, ${s / vMin}]`);
      }), { numRuns: 200, seed: 22 });
  });
});

describe('timing: gyro turns (closed-form phases)', () => {
  // Hand-derived from the controller in spec section 5, power = clamp(g·e, min, top),
  // turn rate = k·power: (1) while g·e >= top the error falls linearly,
  // t1 = (A − top/g)/(k·top); (2) between the limits de/dt = −k·g·e, so
  // t2 = ln(e_top/e_min)/(k·g); (3) at min power down to the stop band,
  // t3 = (min/g − stop)/(k·min); plus one motor time constant to reach speed.
  const params = { angle: 90, ratePerPower: 400, gain: 0.01, top: 0.5, min: 0.1, stop: 1, lag: 0.08 };

  it('sums the three phases and the lag', () => {
    const t1 = (90 - 50) / (400 * 0.5);
    const t2 = Math.log(50 / 10) / (400 * 0.01);
    const t3 = (10 - 1) / (400 * 0.1);
    near(gyroTurnTime(params), t1 + t2 + t3 + 0.08, 1e-12, 'three phases');
  });

  it('skips the phases a small turn never reaches', () => {
    // 30° < e_top = 50°: only the proportional and minimum-power phases (hand-derived).
    near(gyroTurnTime({ ...params, angle: 30 }), Math.log(30 / 10) / 4 + 9 / 40 + 0.08, 1e-12, 'no full-power phase');
    // 5° < e_min = 10°: only minimum power.
    near(gyroTurnTime({ ...params, angle: 5 }), (5 - 1) / 40 + 0.08, 1e-12, 'minimum power only');
    // Already inside the stop band: no motion.
    assert.equal(gyroTurnTime({ ...params, angle: 0.5 }), 0);
  });

  it('a stop band wider than min/gain ends the proportional phase at the stop band', () => {
    // e_min = 10° < stop = 15°: phase 2 runs from 50° to 15°, no phase 3 (hand-derived).
    near(gyroTurnTime({ ...params, stop: 15 }), 40 / 200 + Math.log(50 / 15) / 4 + 0.08, 1e-12, 'wide stop band');
  });

  it('the simulated time of a gyro spin approaches the closed form as the sample period shrinks (no lag)', () => {
    // The solver's gyro-turn time comes from the controller simulation (spec section 8); with no
    // motor lag and a 1 ms loop it must agree with the hand-derived phases: spin, outer radius
    // W/2 = 60 mm, rate = FULL/60 rad/s at 100 % (arc = radius × angle).
    const seg = onlySegment([...robot, 'gyro sample 1 ms', 'start (0, 0) heading 0', 'turn 90 by gyro gain 1 speed 50% min 10%']);
    const k = (FULL / 60) * (180 / Math.PI);
    const expected = (90 - 50) / (k * 0.5) + Math.log(50 / 10) / (k * 0.01) + (10 - 1) / (k * 0.1);
    near(gyroTurnTime({ angle: 90, ratePerPower: k, gain: 0.01, top: 0.5, min: 0.1, stop: 1, lag: 0 }), expected, 1e-9, 'closed form');
    // One sample at most per phase boundary: 3 ms.
    near(seg.duration, expected, 0.003, 'simulated gyro spin time');
  });
});

describe('timing: runs and the limit', () => {
  it('a run\'s time is the sum of its segments, and a limit below it warns over-time on the run', () => {
    const lines = [...robot, 'limit 2 s', 'run "r"', 'start (0, 0) heading 0', 'drive 600', 'wait 1.5 s', 'turn 90'];
    const r = checkPlan(lines.join('\n'));
    const sum = 600 / (0.5 * FULL) + 1.5 + (60 * Math.PI / 2) / (0.5 * FULL); // the formulas above
    near(r.runs[0].duration, sum, 1e-9, 'run time');
    assert.deepEqual(r.diagnostics.map((d) => [d.range.start.line, d.code]), [[4, 'over-time']]);
  });
});
