import { strict as assert } from 'node:assert';
import fc from 'fast-check';
import { checkPlan } from '../../src/core';
import { applyEdits } from '../../src/core/fix/text';
import {
  calibratePlan, estimateOf, parseRecord, planCalibrationHover, propagate, recordHover, solveSquare, tCdf, tQuantile,
  writeCalibrationRuns,
} from '../../src/core/calibrate';
import { restState, simRobot, simulateMotion, type SimState } from '../../src/core/sim/motion';
import { lapError } from '../../src/core/calibrate/square';

const lapErrorOf = (ed: number, eb: number, side: number, track: number, cw: boolean) => lapError(ed, eb, side, track, cw).x;

// Calibration (robot model, section 4): Borenstein & Feng's square test on
// their own formulas and on a simulated robot, the simple calibrations by hand,
// the t-based intervals against the published t table, and the record's
// messages on bad input.

const close = (actual: number, expected: number, tol: number, what = '') =>
  assert.ok(Math.abs(actual - expected) <= tol, `${what} ${actual} is not within ${tol} of ${expected}`);

const PLAN = 'units mm\nwheel 60 mm\ntrack 120\nfield 2000 by 1200\nstart (100, 100) heading 0\n';

function calibrated(plan: string, record: string) {
  const result = checkPlan(plan);
  return { result, ...calibratePlan(result, plan, record) };
}

describe('calibration: the square test (Borenstein & Feng 1996)', () => {
  it('the paper\'s formulas on the hand example: L = 1 m, b = 0.12 m, x_cw = -20 mm, x_ccw = +10 mm', () => {
    // Frame (the paper's): each lap starts facing +x, y to the robot's left, the clockwise lap turns right;
    // x is how far ahead of its start the robot stops. By hand: alpha = (-20 + 10)/(-4000) = 0.0025 rad,
    // beta = (-20 - 10)/(-4000) = 0.0075 rad, R = 500/sin(0.00375) = 133333.65 mm,
    // E_d = (R + 60)/(R - 60) = 1.000900, E_b = 90/(90 - 0.143239°) = 1.001594.
    const s = solveSquare(-20, 10, 1000, 120);
    close(s.alpha, 0.0025, 1e-15, 'alpha');
    close(s.beta, 0.0075, 1e-15, 'beta');
    close(s.radius, 500 / Math.sin(0.00375), 1e-6, 'R');
    assert.equal(s.mismatch.toFixed(6), '1.000900');
    assert.equal(s.trackFactor.toFixed(6), '1.001594');
    // The same in metres gives the same ratios (the formulas are free of units).
    const m = solveSquare(-0.02, 0.01, 1, 0.12);
    close(m.mismatch, s.mismatch, 1e-12, 'metres');
  });

  it('the same numbers through a record: one lap per line, the mean of the laps per direction', () => {
    // Laps -21/-19 and 11/9 have the hand example's means (-20 and 10).
    const { calibration } = calibrated(PLAN, 'lap clockwise 1000 mm ahead -21 left 3\nlap clockwise 1 m ahead -19\nlap counterclockwise 1000 ahead 11\nlap counterclockwise 100 cm ahead 9 left -2\n');
    assert.ok(calibration?.square);
    assert.equal(calibration.square.formula.mismatch.toFixed(6), '1.000900');
    assert.equal(calibration.square.formula.trackFactor.toFixed(6), '1.001594');
    // The values offered are the exact laps' (Newton's method on the lap's arcs, started from the formulas):
    // they differ from the first-order formulas by the products of the errors, here below 1e-4.
    close(calibration.square.mismatch.value, 1.0009004, 1e-5, 'exact mismatch');
    close(calibration.square.trackFactor.value, 1.0015941, 1e-4, 'exact track factor');
    // The effective track the exact factor gives: 120 × factor (the wheel unchanged).
    close(calibration.square.track.value, 120 * calibration.square.trackFactor.value, 1e-9, 'track');
    // The spread by hand: each direction's two laps differ by ±1 mm, so sd √2 and se 1 mm per mean.
    // E_d ≈ 1 + b·beta/L and beta = (x_cw − x_ccw)/(−4L), so |dE_d/dx| ≈ b/(4L²) = 120/4e6 = 3e-5 per mm,
    // and se(E_d) ≈ √(1² + 1²) × 3e-5 = 4.24e-5 (first order; the exact laps' derivative differs by about 1 %,
    // the turn error's share in the curvature, so the check allows 2.5 %).
    close(calibration.square.mismatch.se, Math.SQRT2 * 3e-5, 1e-6, 'mismatch se');
    // Welch–Satterthwaite with two equal parts of one degree of freedom each: df = (2s²)²/(2s⁴) = 2.
    close(calibration.square.mismatch.df, 2, 0.01, 'df'); // the two derivatives differ a little in the exact laps
  });

  it('round trip: a simulated robot with a known wheel mismatch and track error, its laps measured, both recovered within 5e-5', () => {
    // Veer's own controller simulation (src/core/sim/motion.ts) with no motor lag: each wheel runs to its
    // encoder target at constant speed and the pose follows the exact arc update, i.e. exact kinematics.
    // The wheels are the paper's: mean diameter right, D_R/D_L = E_d; the real track is E_b times the one
    // the turns are commanded with.
    for (const [Ed, Eb] of [[1.004, 1.02], [0.997, 0.985], [1.0015, 1.005]]) {
      const nominal = 130;
      const robot = simRobot({
        fullSpeed: 200, lag: 0, stall: 0, mismatch: Ed, track: nominal * Eb, sample: 0.01, delay: 0, scale: 1,
        turns: 'clockwise', yawLo: -180, circumference: Math.PI * 56, gear: 1,
      });
      // Encoder targets on the left wheel's scale: the left wheel is 2/(1 + E_d) of the mean.
      const left = 2 / (1 + Ed);
      const L = 1500;
      const lapEnd = (right: boolean): SimState => {
        const s = restState(0, 0, 0);
        const quarter = ((Math.PI / 2) * nominal) / 2; // each wheel's travel for 90° on the commanded track
        for (let leg = 0; leg < 4; leg++) {
          simulateMotion(s, robot, { kind: 'encoders', left: L * left, right: L * left, power: 0.5 });
          const w = right ? 1 : -1; // a right turn: the left wheel forwards (clockwise)
          simulateMotion(s, robot, { kind: 'encoders', left: w * quarter * left, right: -w * quarter * left, power: 0.3 });
        }
        return s;
      };
      // Started facing +y (heading 0): ahead is +y, the robot's left is -x.
      const cw = lapEnd(true);
      const ccw = lapEnd(false);
      const record = [cw, cw, ccw, ccw].map((s, i) =>
        `lap ${i < 2 ? 'clockwise' : 'counterclockwise'} ${L} mm ahead ${s.y.toFixed(4)} left ${(-s.x).toFixed(4)}`).join('\n');
      const { calibration, record: parsed } = calibrated(`wheel 56\ntrack ${nominal}\n`, record);
      assert.deepEqual(parsed.problems, []);
      assert.ok(calibration?.square, JSON.stringify(calibration?.problems));
      close(calibration.square.mismatch.value, Ed, 5e-5, `mismatch (E_d ${Ed}, E_b ${Eb})`);
      close(calibration.square.trackFactor.value, Eb, 5e-5, `track factor (E_d ${Ed}, E_b ${Eb})`);
      // The paper's first-order formulas alone miss by more than that for errors this size (the products of the errors they leave out).
      assert.ok(Math.abs(calibration.square.formula.trackFactor - Eb) > 5e-5, `${calibration.square.formula.trackFactor}`);
    }
  });
});

describe('calibration: the simple tests', () => {
  it('a 60 mm wheel that drives 985 mm for 1000 mm commanded is 59.10 mm; a 120 mm track that spins 3588° for 3600° is 120.401 mm', () => {
    // By hand: 60 × 985/1000 = 59.10; 120 × 3600/3588 = 120.4013.
    const wheel = calibrated(PLAN, 'drive 1000 mm measured 985, 985\n').calibration!;
    assert.equal(wheel.wheel!.diameter.value.toFixed(2), '59.10');
    const track = calibrated(PLAN, 'spin 10 turns measured 3588, 3588 deg\n').calibration!;
    assert.equal(track.spin!.track.value.toFixed(3), '120.401');
  });

  it('both recorded: the track follows the new wheel, because the wheel sets every turn\'s wheel degrees', () => {
    // By hand: the robot's spin turned 3588/3600 of the command with wheels 0.985 of their size, so the real
    // track is 120 × 3600/3588 × 0.985 = 118.595; on the new 59.10 mm wheel the turns need WE × 3600/3588 × 59.10/60,
    // the same number (the two factors of 0.985 are one).
    const c = calibrated(PLAN, 'drive 1000 mm measured 985, 985\nspin 10 turns measured 3588, 3588\n').calibration!;
    close(c.spin!.track.value, 120 * (3600 / 3588) * 0.985, 1e-9);
  });

  it('the gyro\'s scale is the total reading over the true angle', () => {
    // By hand: (3612/3600 + 3609/3600 + 3615/3600)/3 = 3612/3600 = 1.003333.
    const c = calibrated(PLAN, 'gyro 10 turns reads 3612, 3609 deg, 3615\n').calibration!;
    close(c.gyro!.scale.value, 3612 / 3600, 1e-12);
  });

  it('the uncertainty: mean ± Student\'s t 95 % interval of the trials', () => {
    // Drives of 985, 987, 983 mm: mean 985, sd 2, se 2/√3 = 1.1547; t(0.975, 2) = 4.303 (the published t table),
    // so the ratio is 0.985 ± 0.004968 and the diameter 59.10 ± 0.2981 mm (× 60).
    const c = calibrated(PLAN, 'drive 1000 mm measured 985, 987, 983\n').calibration!;
    close(c.wheel!.ratio.se, 2 / Math.sqrt(3) / 1000, 1e-12, 'se');
    close(c.wheel!.diameter.half95, 4.302653 * (2 / Math.sqrt(3)) * 0.06, 1e-6, 'half-width');
  });
});

describe('calibration: statistics', () => {
  /** A seeded normal generator (mulberry32 and Box–Muller), so the coverage tests repeat exactly. */
  function normals(seed: number): () => number {
    let t = seed >>> 0;
    const uniform = () => {
      t = (t + 0x6d2b79f5) >>> 0;
      let r = Math.imul(t ^ (t >>> 15), 1 | t);
      r = (r + Math.imul(r ^ (r >>> 7), 61 | r)) ^ r;
      return ((r ^ (r >>> 14)) >>> 0) / 4294967296;
    };
    return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  }

  it('the 95 % intervals hold the true value in 95 % of repeated calibrations (their definition), drive and square test', () => {
    // 2000 simulated calibrations each; the share that covers the truth should be 0.95 within three of its
    // standard errors, √(0.95 × 0.05 / 2000) = 0.0049 (the binomial distribution).
    const trials = 2000;
    const base = checkPlan(PLAN); // checked once: the record changes, the plan does not
    const gauss = normals(11);
    let wheelHits = 0;
    let squareHits = 0;
    const trueRatio = 0.985;
    const [Ed, Eb] = [1.002, 1.006];
    const L = 1000;
    const xCw = lapErrorOf(Ed, Eb, L, 120, true);
    const xCcw = lapErrorOf(Ed, Eb, L, 120, false);
    for (let k = 0; k < trials; k++) {
      const drives = [0, 1, 2].map(() => (1000 * trueRatio + 2 * gauss()).toFixed(3)).join(', ');
      const laps = [0, 1, 2, 3, 4].flatMap(() => [
        `lap clockwise ${L} ahead ${(xCw + 3 * gauss()).toFixed(4)}`,
        `lap counterclockwise ${L} ahead ${(xCcw + 5 * gauss()).toFixed(4)}`,
      ]).join('\n');
      const c = calibratePlan(base, PLAN, `drive 1000 mm measured ${drives}\n${laps}\n`).calibration!;
      const w = c.wheel!.mean;
      if (Math.abs(w.value - 60 * trueRatio) <= w.half95) wheelHits++;
      const m = c.square!.mismatch;
      if (Math.abs(m.value - Ed) <= m.half95) squareHits++;
    }
    close(wheelHits / trials, 0.95, 3 * 0.0049, 'drive coverage');
    // The square's interval is first-order with Welch–Satterthwaite degrees of freedom: close to 95 % too.
    close(squareHits / trials, 0.95, 3 * 0.0049, 'square coverage');
  });

  it('Student\'s t quantiles match the published table (two-sided 95 %)', () => {
    // Any statistics textbook's t table, e.g. Montgomery & Runger, Applied Statistics, Table V: t(0.025, ν).
    const table: Array<[number, number]> = [[1, 12.706], [2, 4.303], [3, 3.182], [4, 2.776], [9, 2.262], [29, 2.045]];
    for (const [df, t] of table) close(tQuantile(0.975, df), t, 5e-4, `df ${df}`);
    // With infinitely many degrees of freedom it is the normal's 1.95996.
    close(tQuantile(0.975, Infinity), 1.959964, 1e-5, 'normal');
    // The distribution function at df = 1 is the Cauchy's: 1/2 + atan(t)/π.
    close(tCdf(2, 1), 0.5 + Math.atan(2) / Math.PI, 1e-12, 'Cauchy');
  });

  it('propagation of independent means: a sum\'s se is the root of the sum of squares (first order is exact for linear functions)', () => {
    const a = estimateOf([1, 2, 3]); // se 1/√3
    const b = estimateOf([10, 14]); // se 2
    const sum = propagate(a.value + b.value, [{ of: a, derivative: 1 }, { of: b, derivative: 1 }]);
    close(sum.se, Math.sqrt(1 / 3 + 4), 1e-12);
    // Welch–Satterthwaite by hand: (1/3 + 4)² / ((1/3)²/2 + 4²/1) = 18.778/16.056 = 1.1696.
    close(sum.df, (1 / 3 + 4) ** 2 / ((1 / 9) / 2 + 16), 1e-12);
  });
});

describe('calibration: the record\'s messages', () => {
  const problemsOf = (record: string) => {
    const r = calibrated(PLAN, record);
    return [...r.record.problems, ...(r.calibration?.problems ?? [])];
  };

  it('missing measurements name the line and say what to write', () => {
    const [p] = problemsOf('# drives\ndrive 1000 mm measured\n');
    assert.equal(p.range.start.line, 1);
    assert.match(p.message, /^line 2: no measurements: write each trial's value/);
    const [q] = problemsOf('drive 1000 mm\n');
    assert.match(q.message, /^line 1: missing `measured`/);
    const [lap] = problemsOf('lap clockwise 800 mm ahead -3\nlap clockwise 800 mm ahead -4\n');
    assert.match(lap.message, /^line 1: missing measurements: .*no counterclockwise lap/);
  });

  it('wrong units name the line, the column and both kinds', () => {
    const [p] = problemsOf('drive 1000 mm measured 985 mm, 98.7 deg\n');
    assert.equal(p.range.start.character, 31);
    assert.match(p.message, /^line 1: `98.7 deg` is an angle, but a measured distance is a length/);
    const [q] = problemsOf('spin 10 turns measured 3588 mm\n');
    assert.match(q.message, /is a length, but a measured angle is an angle/);
    const [r] = problemsOf('drive 1000 mm measured 98.5 cm, 0.987 km\n');
    assert.match(r.message, /`km` is not a unit/);
    // A number plainly in another unit than the record's (metres written bare in a millimetre record).
    const [s] = problemsOf('drive 1000 mm measured 0.985, 0.987\n');
    assert.match(s.message, /check the unit/);
  });

  it('too few trials name the line and ask for more', () => {
    const [p] = problemsOf('\ndrive 1000 mm measured 985\n');
    assert.match(p.message, /^line 2: too few trials for the straight drive: one recorded, at least 2 needed/);
    const [q] = problemsOf('lap clockwise 800 mm ahead -3\nlap counterclockwise 800 mm ahead 4\nlap counterclockwise 800 mm ahead 5\n');
    assert.match(q.message, /^line 1: too few trials for the clockwise laps/);
  });

  it('a misspelt word gets a suggestion; a gyro reading within the range is refused with the sum to write', () => {
    assert.match(problemsOf('drvie 1000 mm measured 985, 986\n')[0].message, /did you mean `drive`/);
    assert.match(problemsOf('lap clockwse 800 mm ahead 3\n')[0].message, /did you mean `clockwise`/);
    assert.match(problemsOf('gyro 10 turns reads 12, 13\n')[0].message, /write the total the gyro counted.*3600° \+ 12° = 3612°/);
    assert.match(problemsOf('lap clockwise 800 mm ahead -3\nlap counterclockwise 700 mm ahead 4\n')[0].message, /same side/);
    assert.match(problemsOf('units mm\nunits cm\n')[0].message, /already set on line 1/);
  });

  it('careless and hostile records: odd characters, huge numbers, a huge line, too long a file; never a throw', () => {
    assert.match(problemsOf('drive 1000 mm measured 98€5, 986\n')[0].message, /^line 1: unexpected `€`/);
    assert.match(problemsOf('drive 1000 mm measured 1e999, 986\n')[0].message, /too large/);
    assert.match(problemsOf('lap clockwise 800 mm ahead 500\nlap counterclockwise 800 mm ahead 4\n')[0].message, /more than a quarter of the side/);
    // 30,000 trials on one line (150,000 characters): read in linear time (the tokenizer never copies the rest of the line).
    const line = `drive 1000 mm measured ${Array.from({ length: 30_000 }, (_, i) => 980 + (i % 10)).join(', ')}\n`;
    const started = Date.now();
    const r = calibrated(PLAN, line);
    assert.ok(Date.now() - started < 2000, `${Date.now() - started} ms`);
    assert.equal(r.calibration!.wheel!.ratio.n, 30_000);
    // A file far beyond any record is refused as a whole.
    assert.match(parseRecord('#'.repeat(300_000)).problems[0].message, /too long/);
  });

  it('any text: the reader and the computation never throw, and every problem points into the text at its line', () => {
    const words = ['drive', 'spin', 'gyro', 'lap', 'units', 'measured', 'reads', 'ahead', 'left', 'clockwise', 'counterclockwise',
      'turns', 'mm', 'cm', 'm', 'in', 'deg', 'rad', '°', ',', '#', '-', '1000', '985', '3588', '-20', '0', '1e999', '.5', 'x', '\t', '€'];
    const base = checkPlan(PLAN);
    fc.assert(fc.property(fc.array(fc.array(fc.constantFrom(...words), { maxLength: 12 }).map((ws) => ws.join(' ')), { maxLength: 8 }), (lines) => {
      const text = lines.join('\n');
      const { record, calibration } = calibratePlan(base, PLAN, text);
      const split = text.split('\n');
      for (const p of [...record.problems, ...(calibration?.problems ?? [])]) {
        assert.ok(p.range.start.line < split.length && p.range.end.character <= split[p.range.start.line].length + 1, JSON.stringify(p));
        assert.match(p.message, new RegExp(`^line ${p.range.start.line + 1}: `));
      }
      for (const v of [calibration?.wheel?.diameter, calibration?.spin?.track, calibration?.gyro?.scale, calibration?.square?.mismatch]) {
        if (v) assert.ok(Number.isFinite(v.value) && Number.isFinite(v.half95), JSON.stringify(v));
      }
    }), { numRuns: 2000, seed: 5 });
  });

  it('the record\'s units apply to its bare lengths', () => {
    const r = parseRecord('units cm\ndrive 100 measured 98.5, 98.7\n');
    assert.deepEqual(r.problems, []);
    const drive = r.entries[0];
    assert.ok(drive.kind === 'drive');
    assert.equal(drive.commanded, 1000);
    assert.deepEqual(drive.trials.map((t) => t.value), [985, 987]);
  });
});

describe('calibration: the runs to measure', () => {
  it('writes a plan for the robot, sized to the field, that checks without errors and says what to measure', () => {
    const plan = 'plan "Seed tray"\nunits cm\nwheel 5.6 cm\ntrack 12 cm effective 12.2 cm\nbody 14 by 17 axle -2.5\nfield 180 by 100\nstart (20, 20) heading 0\n';
    const runs = writeCalibrationRuns(checkPlan(plan), { planName: 'tray.veer' });
    assert.deepEqual(runs.problems, []);
    const text = runs.text!;
    const check = checkPlan(text);
    assert.deepEqual(check.diagnostics.filter((d) => d.severity === 'error').map((d) => `${d.range.start.line + 1}: ${d.message}`), []);
    assert.deepEqual(check.runs.map((r) => r.name), ['straight drive', 'spins by encoders', 'spins for the gyro', 'square, clockwise lap', 'square, counterclockwise lap']);
    // The robot's own values, in millimetres.
    assert.equal(check.setup.robot.wheelDiameter, 56);
    assert.equal(check.setup.robot.effectiveTrack, 122);
    // The square: the field's short side (1000 mm) less the footprint's reach on both sides
    // (hypot(70, 85 + 25) = 130.4 mm, + 50 mm to spare, rounded up: 181 mm), down to 50 mm: 600 mm.
    assert.equal(runs.side, 600);
    // Each lap ends on its start pose (the planned path; Borenstein's laps close).
    for (const run of check.runs.slice(3)) {
      const first = run.segments[0].start;
      const last = run.segments[run.segments.length - 1].end;
      close(Math.hypot(last.x - first.x, last.y - first.y), 0, 1e-6, run.name);
      close(last.heading - first.heading, run.name.includes('counter') ? -360 : 360, 1e-9, run.name);
    }
    // The clockwise lap turns right (clockwise seen from above: under `turns clockwise` a positive turn).
    assert.ok(check.runs[3].segments.filter((s) => s.kind === 'turn').every((s) => s.turned === 90));
    assert.match(text, /#\s+drive \d+ mm measured ___/);
    assert.match(text, /#\s+lap clockwise 600 mm ahead ___ left ___/);
    assert.match(text, /tray\.calib/);
    assert.match(text, /Safety: .*low speeds/);
  });

  it('under `turns counterclockwise` a clockwise lap turns by -90', () => {
    const runs = writeCalibrationRuns(checkPlan('turns counterclockwise\nwheel 56\ntrack 120\nfield 1500 by 1500\n'));
    const check = checkPlan(runs.text!);
    const cw = check.runs.find((r) => r.name === 'square, clockwise lap')!;
    assert.ok(cw.segments.filter((s) => s.kind === 'turn').every((s) => s.turned === -90));
  });

  it('a robot that needs 25 % power to move, and a title of 120 characters: runs that still check without errors', () => {
    const plan = `plan "${'a'.repeat(120)}"\nwheel 56\ntrack 120\nmotor 900 deg/s stall 25%\nfield 2000 by 1500\n`;
    const runs = writeCalibrationRuns(checkPlan(plan));
    const check = checkPlan(runs.text!);
    assert.deepEqual(check.diagnostics.filter((d) => d.severity === 'error').map((d) => `${d.range.start.line + 1}: ${d.message}`), []);
  });

  it('refuses a field too small for the square, and a plan without a wheel, saying why', () => {
    assert.match(writeCalibrationRuns(checkPlan('wheel 56\ntrack 120\nfield 500 by 400\n')).problems[0], /too small for the square test/);
    assert.match(writeCalibrationRuns(checkPlan('track 120\n')).problems[0], /no usable `wheel D`/);
  });
});

describe('calibration: the setup edits and hovers', () => {
  it('offers the values as edits of the setup lines; applied, the plan reads them back', () => {
    const plan = 'units mm\nwheel 60 mm\ntrack 120 effective 121\nfield 2000 by 1200\nstart (100, 100) heading 0\n';
    const record = 'drive 1000 mm measured 985, 985\nspin 10 turns measured 3588, 3588\ngyro 10 turns reads 3612, 3612\nlap clockwise 1000 ahead -20\nlap clockwise 1000 ahead -20\nlap counterclockwise 1000 ahead 10\nlap counterclockwise 1000 ahead 10\n';
    const { result, edits, calibration } = calibrated(plan, record);
    assert.ok(edits.all);
    const fixed = checkPlan(applyEdits(plan, edits.all.edits));
    assert.deepEqual(fixed.diagnostics.filter((d) => d.severity === 'error'), []);
    // The mismatch and the wheel from the square and the drive: left = 2 × 59.10/(1 + 1.000900) (rounded to 6 decimals and 0.001 mm).
    close(fixed.setup.robot.mismatch!, calibration!.square!.mismatch.value, 5e-7);
    close(fixed.setup.robot.wheelDiameter!, (2 * 59.1) / (1 + calibration!.square!.mismatch.value), 1e-3);
    // The preferred track (the spins' and the square's intervals are both zero wide here: the spins win ties).
    close(fixed.setup.robot.effectiveTrack!, calibration!.spin!.track.value, 1e-3);
    close(fixed.setup.gyro.scale, 3612 / 3600, 1e-5);
    const e = calibration!.square!.mismatch.value;
    assert.deepEqual(edits.lines, [`wheel ${(2 * 59.1 / (1 + e)).toFixed(3)} mm mismatch ${e.toFixed(6).replace(/0+$/, '')}`, `track 120 effective ${calibration!.spin!.track.value.toFixed(3)}`, 'gyro scale 1.00333']);
    // Hovers: the plan's track line, and a record line.
    const hover = planCalibrationHover(result, calibration!, 'p.calib', { line: 2, character: 2 });
    assert.match(hover!.markdown, /effective track \(spins by encoders, 2 trials\)/);
    const onRecord = recordHover(parseRecord(record), calibration, 'mm', { line: 0, character: 0 });
    assert.match(onRecord!.markdown, /mean diameter is 59\.10 ± 0\.00 mm/);
  });

  it('adds a `gyro` line under the track when the plan has none, and `effective` when the track has none', () => {
    const plan = 'wheel 56\ntrack 120\n';
    const { edits } = calibrated(plan, 'gyro 10 turns reads 3590, 3591\nspin 10 turns measured 3600, 3610\n');
    const text = applyEdits(plan, edits.all!.edits);
    assert.match(text, /^wheel 56\ntrack 120 effective 119\.\d+\ngyro scale 0\.997\d*\n$/);
    // The track above the wheel: the new `gyro` line goes between them, and the printed lines keep them apart.
    const upside = 'track 120\nwheel 56\n';
    const other = calibrated(upside, 'gyro 10 turns reads 3590, 3591\ndrive 1000 measured 990, 991\n').edits;
    assert.match(applyEdits(upside, other.all!.edits), /^track 120\ngyro scale 0\.997\d*\nwheel 55\.4\d*\n$/);
    assert.deepEqual(other.lines.map((l) => l.split(' ')[0]), ['wheel', 'gyro']);
  });
});
