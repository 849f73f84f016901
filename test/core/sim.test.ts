import { strict as assert } from 'node:assert';
import { plantStep, wheelStep, type PlantParams, type PlantState } from '../../src/core/sim/plant';
import { simulateGyroSpin } from '../../src/core/sim/gyroTurn';
import { profileTime } from '../../src/core/solve/timing';

// The controller simulation's first pieces (issue 9), against results that
// need no code of ours: the second-order step response of a proportional
// turn, the coast of a first-order lag, and the closed form of a turn held at
// its minimum power.

const rest = (): PlantState => ({ pose: { x: 0, y: 0, heading: 0 }, vLeft: 0, vRight: 0, time: 0 });

/** A robot whose spin turns at `degPerSecond` at full power: ω = 2v/b, so v = ω · b/2. */
function plant(degPerSecond: number, extra: Partial<PlantParams> = {}): PlantParams {
  const track = 120;
  return { fullSpeed: (degPerSecond * Math.PI) / 180 * (track / 2), lag: 0.06, stall: 0, track, mismatch: 1, sample: 0.01, turns: 'clockwise', ...extra };
}

describe('simulation: the plant', () => {
  it('a first-order lag released at speed w coasts w·τ further (the lag\'s impulse response integrates to τ)', () => {
    const w = 200;
    let v = w;
    let travel = 0;
    for (let k = 0; k < 2000; k++) {
      const step = wheelStep(v, 0, 0.08, 0.001);
      v = step.v;
      travel += step.travel;
    }
    assert.ok(Math.abs(travel - w * 0.08) < 1e-6, `${travel}`);
  });

  it('the zero-order-hold step is exact: one large step equals many small ones', () => {
    const one = wheelStep(50, 300, 0.08, 0.1);
    let v = 50;
    let travel = 0;
    for (let k = 0; k < 10000; k++) {
      const s = wheelStep(v, 300, 0.08, 0.1 / 10000);
      v = s.v;
      travel += s.travel;
    }
    assert.ok(Math.abs(one.v - v) < 1e-9 && Math.abs(one.travel - travel) < 1e-9);
  });

  it('below the stall power the wheels do not move', () => {
    const p = plant(300, { stall: 0.05 });
    const s = plantStep(rest(), 0.04, 0.04, p);
    assert.deepEqual([s.vLeft, s.vRight, s.pose.x, s.pose.y], [0, 0, 0, 0]);
  });

  it('equal wheel travel drives straight along the heading; opposite travel spins in place', () => {
    const p = plant(300, { lag: 0 });
    const straight = plantStep({ ...rest(), pose: { x: 0, y: 0, heading: 90 } }, 0.5, 0.5, p);
    assert.ok(Math.abs(straight.pose.x - 0.5 * p.fullSpeed * p.sample) < 1e-12 && Math.abs(straight.pose.y) < 1e-12);
    const spin = plantStep(rest(), 0.5, -0.5, p);
    assert.ok(Math.hypot(spin.pose.x, spin.pose.y) < 1e-12);
    // 150 deg/s (half of 300) for 10 ms: 1.5°.
    assert.ok(Math.abs(spin.pose.heading - 1.5) < 1e-9);
  });
});

describe('simulation: gyro turns', () => {
  it('a linear proportional turn overshoots as the second-order formula says (Ogata, Modern Control Engineering)', () => {
    // Closed loop τ s² + s + K Kp = 0: ζ = 1/(2√(τ K Kp)), overshoot exp(−πζ/√(1−ζ²)).
    // K = 3 deg/s per %, τ = 60 ms, Kp = 4 %/deg: ζ = 0.589, overshoot 10.1 %.
    const zeta = 1 / (2 * Math.sqrt(0.06 * 3 * 4));
    const expected = Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
    assert.ok(Math.abs(expected - 0.101) < 0.001);
    // No floor, no saturation (10° × 4 %/deg = 40 %), no delay, a small sample period, never stopping.
    const p = plant(300, { sample: 0.0001 });
    const r = simulateGyroSpin(rest(), p, { target: 10, gain: 0.04, min: 0, speed: 1, stop: 0 }, { zeroHeading: 0, scale: 1, delaySamples: 0 }, 1.5);
    const peak = Math.max(...r.trace.map((row) => row.heading));
    const overshoot = (peak - 10) / 10;
    assert.ok(Math.abs(overshoot - expected) < 0.002, `${overshoot} vs ${expected}`);
  });

  it('a turn held at its minimum power ends within one sample\'s travel of −stop + w(τ + delay) past the target', () => {
    // Floor-dominated: the power is `min` throughout, the robot turns at w = K·min, the power stops
    // at the first sample inside the band, then the robot coasts w·τ; a delayed reading adds w·delay.
    const p = plant(300, { sample: 0.01 });
    const min = 0.2;
    const w = 300 * min; // 60 deg/s
    const delay = 2 * p.sample;
    const r = simulateGyroSpin(rest(), p, { target: 90, gain: 0.00001, min, speed: 0.5, stop: 1 }, { zeroHeading: 0, scale: 1, delaySamples: 2 });
    const lo = -1 + w * (p.lag + delay);
    const hi = lo + w * p.sample;
    assert.ok(r.settled);
    assert.ok(r.overshoot >= lo - 1e-9 && r.overshoot < hi, `${r.overshoot} not in [${lo}, ${hi})`);
    assert.ok(Math.abs(r.peakRate - w) < 1e-6);
  });

  it('a minimum power below the stall power never reaches the band: the turn is cut off at the cap', () => {
    const p = plant(300, { stall: 0.05 });
    const r = simulateGyroSpin(rest(), p, { target: 90, gain: 0.01, min: 0.04, speed: 0.5, stop: 1 }, { zeroHeading: 0, scale: 1, delaySamples: 0 }, 5);
    assert.equal(r.settled, false);
    // It stalls short: power falls to min (4 % < 5 %) once gain·|e| < 5 %, i.e. 5° from the target (1 %/deg).
    assert.ok(r.atStop.pose.heading > 80 && r.atStop.pose.heading < 90 - 1, `${r.atStop.pose.heading}`);
  });
});

describe('simulation: the speed profile a ramped drive follows', () => {
  it('trapezoidal and triangular profile times (constant-acceleration kinematics: t = d/v + v/a, or 2√(d/a) when too short)', () => {
    // d = 1 m, v = 0.5 m/s, a = 1 m/s²: 2.5 s; d = 0.2 m: 0.894427 s (the check values).
    assert.ok(Math.abs(profileTime(1000, 500, 1000) - 2.5) < 1e-12);
    assert.ok(Math.abs(profileTime(200, 500, 1000) - 0.894427191) < 1e-9);
  });
});
