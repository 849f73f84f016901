import { strict as assert } from 'node:assert';
import { checkPlan } from '../../src/core';
import { sampleRun, type RunSamples } from '../../src/core/spread/sample';
import { simRecordOf } from '../../src/core/sim/run';
import { restState, simulateMotion, type SimMotion, type SimRobot } from '../../src/core/sim/motion';
import { runSampledMotion } from '../../src/core/sim/sampled';

// The Monte Carlo's quick simulation (src/core/sim/sampled.ts) against the
// scalar one it stands in for (simulateMotion of src/core/sim/motion.ts, kept
// callable through sampleRun's `scalar` option): the same sampled poses.
//
// Not bit for bit: the quick plant step multiplies by the reciprocals of its
// constants and of the track where motion.ts divides, and takes the chord as
// ds·sin(half)/half from the series directly, so a step may differ in its last
// bits and the poses by rounding. The allowance, 1e-9 mm and 1e-9 degree, is
// the task's; rounding differences measure about 1e-11 mm (common practice,
// no published source). Every decision (stop band, stall, crossing, a long
// step kept or not) must come out the same, or a pose would be off by a
// whole control step: far more than the allowance.

const MM = 1e-9;
const DEG = 1e-9;

function compare(name: string, text: string, count: number, seed: number, expectErrors = false): { motions: number; samples: RunSamples } {
  const r = checkPlan(text);
  const errors = r.diagnostics.filter((d) => d.severity === 'error');
  if (!expectErrors) assert.deepEqual(errors.map((d) => d.message), [], `${name}: the plan has no errors`);
  let motions = 0;
  let last: RunSamples | undefined;
  for (const run of r.runs) {
    const segs = run.segments;
    const simulated = segs.filter((s) => simRecordOf(s) !== undefined).length;
    assert.ok(simulated > 0, `${name}: the check simulated the run`);
    motions += simulated;
    const quick = sampleRun(segs, r.setup.noise, 120, r.setup.turns, count, seed);
    const scalar = sampleRun(segs, r.setup.noise, 120, r.setup.turns, count, seed, undefined, { scalar: true });
    for (let i = 0; i < segs.length; i++) {
      for (let s = 0; s < count; s++) {
        const at = `${name}: line ${segs[i].line + 1} (${segs[i].kind}), sample ${s}`;
        assert.ok(Math.abs(quick.x[i][s] - scalar.x[i][s]) <= MM, `${at}: x ${quick.x[i][s]} vs ${scalar.x[i][s]}`);
        assert.ok(Math.abs(quick.y[i][s] - scalar.y[i][s]) <= MM, `${at}: y ${quick.y[i][s]} vs ${scalar.y[i][s]}`);
        assert.ok(Math.abs(quick.heading[i][s] - scalar.heading[i][s]) <= DEG, `${at}: heading ${quick.heading[i][s]} vs ${scalar.heading[i][s]}`);
      }
    }
    last = quick;
  }
  return { motions, samples: last! };
}

const ROBOT = ['wheel 56 mm', 'track 120 mm', 'field 6000 by 6000'];

describe('the Monte Carlo\'s quick simulation equals the scalar one (within 1e-9 mm and 1e-9°)', () => {
  it('gyro turns, plain, with `to`, ramped, with a reset, counted both ways', () => {
    compare('gyro turns', [...ROBOT, 'motor 600 deg/s lag 80 ms', 'start (3000, 3000) heading 0',
      'turn 90 by gyro', 'turn to 160 by gyro speed 60% min 8%', 'turn -135 by gyro reset', 'turn 45 by gyro ramp speed 50%',
      'turn to -30 by gyro ramp', 'turn 170 by gyro speed 100% gain 3 stop 0.5 deg', 'turn -60 arc 300 by gyro', 'reset yaw', 'turn 10 by gyro stop 2 deg'].join('\n'), 300, 11);
  });

  it('held drives with and without a ramp, forwards and back', () => {
    compare('holds', [...ROBOT, 'start (1000, 1000) heading 30', 'drive 800 hold 30 speed 60%', 'drive -500 hold 35 ramp 800 mm/s^2',
      'drive 1200 hold 20 ramp 300 mm/s^2 speed 80%', 'turn to 90 by gyro', 'drive 300 hold 90 gain 4', 'drive -20 hold 90'].join('\n'), 300, 12);
  });

  it('encoder drives and turns: straight, ramped, arcs, pivots, spins, ramped turns', () => {
    compare('encoders', [...ROBOT, 'start (3000, 3000) heading 0', 'drive 600 speed 60%', 'drive -300 ramp 600 mm/s^2', 'turn 90 arc 200',
      'turn -90 arc 200 reverse', 'turn 90 pivot left', 'turn -90 pivot right', 'turn 180', 'turn -45 ramp min 12%', 'turn 30 speed 100%',
      'drive 5'].join('\n'), 300, 13);
  });

  it('squares, waits and resets between motions', () => {
    compare('squares', ['wheel 56 mm', 'track 120 mm', 'motor 600 deg/s lag 30 ms', 'field 3000 by 3000', 'start (800, 600) heading 0',
      'drive 600 speed 40%', 'wait 1.5 s', 'turn to 90 by gyro speed 30% min 8% stop 3 deg', 'drive 400 hold 90 speed 40%',
      'turn 45 by gyro speed 30% min 8% stop 3 deg', 'reset yaw', 'wait 0.3', 'drive 300 speed 40%', 'turn -45 by gyro speed 30% min 8% stop 3 deg',
      'square front speed 30%', 'drive -300 speed 40%', 'turn 30 speed 30%'].join('\n'), 300, 14);
  });

  it('a run that stalls: the rest never happens, the same in both', () => {
    const { samples } = compare('stall', [...ROBOT, 'motor 600 deg/s lag 30 ms stall 12%', 'start (500, 500) heading 0',
      'turn 90 by gyro min 5% stop 1 deg', 'drive 300'].join('\n'), 100, 3, true);
    // The stalled turn: the drive after it never moves the robot (the test in spread.test.ts, on the quick path).
    for (let s = 0; s < 100; s++) assert.equal(samples.x[2][s], samples.x[1][s]);
  });

  it('motor lag 0 and 80 ms, a wheel mismatch, a stall power, a gyro scale', () => {
    const motions = ['start (3000, 3000) heading 10', 'drive 500 speed 60%', 'turn 90 by gyro', 'drive 400 hold 100 ramp 500 mm/s^2',
      'turn -45 arc 250', 'turn to -80 by gyro min 9%', 'wait 0.5', 'turn 60 pivot left', 'drive -200'];
    compare('no lag', [...ROBOT, 'motor 600 deg/s lag 0 ms', ...motions].join('\n'), 200, 21);
    compare('80 ms lag', [...ROBOT, 'motor 700 deg/s lag 80 ms', ...motions].join('\n'), 200, 22);
    compare('mismatch', ['wheel 56 mm mismatch 1.02', 'track 120 mm', 'field 6000 by 6000', 'motor 600 deg/s lag 50 ms stall 8%', 'gyro scale 1.01', ...motions].join('\n'), 200, 23);
    compare('mismatch under 1, sample 20 ms', ['wheel 56 mm mismatch 0.97', 'track 120 mm', 'field 6000 by 6000', 'gyro sample 20 ms', ...motions].join('\n'), 200, 24);
  });

  it('headings counted counterclockwise', () => {
    compare('counterclockwise', ['turns counterclockwise', ...ROBOT, 'start (3000, 3000) heading 90', 'drive 400', 'turn 90 by gyro',
      'drive 300 hold 90 ramp 600 mm/s^2', 'turn -90 arc 200', 'turn 45 pivot right', 'turn to 0 by gyro ramp', 'square front'].join('\n'), 200, 31);
  });

  it('a delayed reading takes the scalar path (the quick one keeps no heading history): still the same', () => {
    compare('delay', [...ROBOT, 'gyro delay 20 ms', 'start (3000, 3000) heading 0', 'turn 90 by gyro', 'drive 300 hold 90', 'turn -90 by gyro'].join('\n'), 50, 41);
  });

  it('runSampledMotion on its own: each kind of motion from a moving start, against simulateMotion (to the bit but for rounding)', () => {
    // Not through the check: hand-made motions, including a long gyro turn that is cut off at 20 s and a hold whose
    // wheels are under the stall power, from a state still coasting from an earlier motion.
    const robot = (lag: number, mismatch: number): SimRobot => ({
      fullSpeed: 420, lag, stall: 0.06, mismatch, track: 121, sample: 0.01, delay: 0, scale: 1.02, turns: 'clockwise', yawLo: -180,
      circumference: Math.PI * 56, gear: 1, longStep: 0.04, decay: lag > 0 ? Math.exp(-0.01 / lag) : 0, decayLong: lag > 0 ? Math.exp(-0.04 / lag) : 0,
    });
    const motions: SimMotion[] = [
      { kind: 'gyro-turn', target: 120, gain: 0.01, min: 0.1, power: 0.7, stop: 1, ramp: false, shareL: 1, shareR: -1 },
      { kind: 'gyro-turn', target: -170, gain: 0.02, min: 0.08, power: 0.5, stop: 0.5, ramp: true, shareL: 1, shareR: 0.3 },
      { kind: 'gyro-turn', target: 90, gain: 0.01, min: 0.03, power: 0.5, stop: 0.01, ramp: false, shareL: 1, shareR: -1 },
      { kind: 'hold', target: 5, gain: 0.03, distance: 700, power: 0.6 },
      { kind: 'hold', target: -5, gain: 0.03, distance: -450, power: 0.9, accel: 700 },
      { kind: 'hold', target: 0, gain: 0.01, distance: 100, power: 0.04 },
      { kind: 'encoders', left: 300, right: 300, power: 0.6 },
      { kind: 'encoders', left: 250, right: -250, power: 0.5, rampMin: 0.1 },
      { kind: 'encoders', left: 400, right: 150, power: 0.7, accel: 900 },
      { kind: 'encoders', left: -200, right: 0, power: 0.4 },
      { kind: 'wait', time: 0.73 },
    ];
    let compared = 0;
    for (const [lag, mismatch] of [[0.08, 1], [0, 1.03], [0.03, 0.98]]) {
      const r = robot(lag, mismatch);
      for (const m of motions) {
        for (const [vL, vR] of [[0, 0], [150, -80], [-60, 200]]) {
          const a = restState(100, 200, 33);
          a.vL = vL;
          a.vR = vR;
          a.zero = 10;
          const b = restState(100, 200, 33);
          b.vL = vL;
          b.vR = vR;
          b.zero = 10;
          const finished = simulateMotion(a, r, m).finished;
          assert.equal(runSampledMotion(b, r, m, 1), finished, `${m.kind}: finished`);
          for (const k of ['x', 'y', 'h', 't', 'vL', 'vR'] as const) {
            // The allowance of the file's head; the speeds and time are held to the same.
            assert.ok(Math.abs(a[k] - b[k]) <= 1e-9, `${m.kind} lag ${lag} mismatch ${mismatch} from (${vL}, ${vR}): ${k} ${b[k]} vs ${a[k]}`);
          }
          compared++;
        }
      }
    }
    assert.equal(compared, 99);
  });
});
