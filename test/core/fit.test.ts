// The robot model fitted to a recorded run (src/core/record/fit.ts). The logs
// are made by Veer's own plant, `advancePlant` of src/core/sim/motion.ts (the
// exact zero-order-hold wheel step of the robot model, section 2), from known
// true values and seeded measurement noise (test/support/simulatedLog.ts); one
// of them replays the powers the controller simulation commands for the demo
// plan. The fit must find the truth within its reported uncertainty.
import { strict as assert } from 'node:assert';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fitFixes, fitRobot, currentFromSetup, roundForPlan, MAX_FIT_ROWS, type FitCurrent, type FitName, type FitResult } from '../../src/core/record/fit';
import { checkPlan } from '../../src/core/check';
import { applyEdits } from '../../src/core/fix/text';
import { readLog } from '../../src/core/record/log';
import { DEMO_TRUE_ROBOT, simulateLog } from '../../scripts/recorded-run';
import { calibrationSchedule, plannedSchedule, simulatedLog, TRUTH, type LogNoise, type TruthRobot } from '../support/simulatedLog';

/** The plan's robot in these tests: wheel 56 mm, gear 1; the values being fitted set away from the truth. */
const PLAN: FitCurrent = {
  wheelDiameter: 56, gear: 1, effectiveTrack: 121, motorSpeed: 800, motorLag: 0.08, stall: 0.05,
  mismatch: 1, gyroScale: TRUTH.scale, gyroDelay: 0, sample: 0.01, turns: 'clockwise', noiseDrift: 0.5 / 60,
};
/** TRUTH's values in the fit's units: 900 deg/s is the motor speed TRUTH.fullSpeed was made from (56 mm wheel, gear 1). */
const TRUE_VALUES: Partial<Record<FitName, number>> = {
  motorSpeed: 900, motorLag: TRUTH.lag, stall: TRUTH.stall, effectiveTrack: TRUTH.track,
  gyroScale: TRUTH.scale, mismatch: TRUTH.mismatch, drift: TRUTH.drift,
};
const NOISE = { travel: 0.1, yaw: 0.15 };

function log(seed: number, extra: Partial<LogNoise> = {}, truth: TruthRobot = TRUTH) {
  return simulatedLog(truth, calibrationSchedule(), { seed, ...NOISE, planMismatch: PLAN.mismatch, ...extra });
}

/** Every number anywhere in the result is finite (never NaN, never Infinity). */
function assertFinite(value: unknown, path = 'result'): void {
  if (typeof value === 'number') assert.ok(Number.isFinite(value), `${path} is ${value}`);
  else if (Array.isArray(value)) value.forEach((v, i) => assertFinite(v, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) assertFinite(v, `${path}.${k}`);
}

function within(fit: FitResult, name: FitName, truth: number, k = 3): void {
  const p = fit.params[name];
  assert.ok(p.found, `${name} not found: ${p.note}`);
  // k standard errors: a normal estimate lies within 3 se of the truth 99.73 % of the time (normal distribution).
  assert.ok(Math.abs(p.value! - truth) <= k * p.se!, `${name}: ${p.value} ± ${p.se}, truth ${truth}`);
}

describe('fitting the robot model to a recorded run', () => {
  it('recovers every value of a simulated calibration run within its reported uncertainty', () => {
    // Seed 2: on seed 1 the drift lands 3.05 se from the truth, the 1-in-400 event a 3-se check allows;
    // the coverage test below counts such misses over 200 seeds.
    const fit = fitRobot(log(2), PLAN);
    assertFinite(fit);
    for (const name of ['motorSpeed', 'motorLag', 'effectiveTrack', 'mismatch', 'drift'] as FitName[]) within(fit, name, TRUE_VALUES[name]!);
    // The gyro scale is the same number as the track read the other way: with the plan's track at 121 mm,
    // scale = c x 121 where c = TRUTH.scale / TRUTH.track (hand calculation: 1.01 x 121 / 124.5 = 0.98161).
    within(fit, 'gyroScale', (TRUTH.scale * 121) / TRUTH.track);
    // The stall: the log's stair commands 5 % (does not move the wheels, truth 5.5 %) and 6 % (moves them):
    // the bracket is (5 %, 6 %], its middle 5.5 % (hand calculation).
    const stall = fit.params.stall;
    assert.ok(stall.found);
    assert.ok(Math.abs(stall.low! - 0.05) < 1e-12 && Math.abs(stall.high! - 0.06) < 1e-12, `${stall.low}..${stall.high}`);
    assert.ok(Math.abs(stall.value! - 0.055) < 1e-12);
    // Every value the plan has wrong lies outside its interval, so it is flagged.
    for (const name of ['motorSpeed', 'motorLag', 'effectiveTrack', 'mismatch'] as FitName[]) assert.equal(fit.params[name].differs, true, name);
    // The residuals are the noise put in (0.1 mm, 0.15 deg): the model is exact, so nothing else is left.
    // To 10 % of it (common practice, no published source): the sample sd of n rows of normal noise is off by about
    // 1/sqrt(2n) of itself (the chi distribution's spread), under 2 % for this log's thousands of rows.
    assert.ok(Math.abs(fit.residual.wheelMm! - 0.1) < 0.01, `${fit.residual.wheelMm}`);
    assert.ok(Math.abs(fit.residual.yawDeg! - 0.15) < 0.015, `${fit.residual.yawDeg}`);
    assert.equal(fit.params.motorSpeed.samples, fit.rows);
    // Each wheel alone: TRUTH.fullSpeed = 900 x pi x 56 / 360 = 439.823 mm/s (the right wheel's encoder
    // counts nominal millimetres, so it shows the same), to 0.1 % (common practice, no published source).
    assert.ok(Math.abs(fit.eachWheel!.left / TRUTH.fullSpeed - 1) < 0.001 && Math.abs(fit.eachWheel!.right / TRUTH.fullSpeed - 1) < 0.001);
  });

  it('95 % intervals contain the truth in about 95 % of 200 seeded runs', function () {
    this.timeout(120_000);
    // With true coverage 95 %, the number of hits in 200 runs is Binomial(200, 0.95): mean 190, sd 3.08.
    // The check accepts 180..198 hits (0.90..0.99); outside it by chance: P(X <= 179) + P(X >= 199)
    // = 0.00116 + 0.00040 = 0.0016 per value (exact binomial sums), so a miss means a wrong interval.
    // The gyro scale is checked on plans that carry the true track (its assumption), the rest on PLAN.
    const SEEDS = 200;
    const hits: Partial<Record<FitName, number>> = {};
    const scalePlan: FitCurrent = { ...PLAN, effectiveTrack: TRUTH.track, gyroScale: 1 };
    let stallBracketed = 0;
    for (let seed = 1; seed <= SEEDS; seed++) {
      const run = log(1000 + seed);
      const fit = fitRobot(run, PLAN);
      const fitScale = fitRobot(run, scalePlan);
      const check = (f: FitResult, name: FitName) => {
        const p = f.params[name];
        assert.ok(p.found, `seed ${seed}: ${name} not found: ${p.note}`);
        if (p.low! <= TRUE_VALUES[name]! && TRUE_VALUES[name]! <= p.high!) hits[name] = (hits[name] ?? 0) + 1;
      };
      for (const name of ['motorSpeed', 'motorLag', 'effectiveTrack', 'mismatch', 'drift'] as FitName[]) check(fit, name);
      check(fitScale, 'gyroScale');
      const s = fit.params.stall;
      if (s.found && s.low! < TRUTH.stall && TRUTH.stall <= s.high!) stallBracketed++;
    }
    for (const name of ['motorSpeed', 'motorLag', 'effectiveTrack', 'mismatch', 'drift', 'gyroScale'] as FitName[]) {
      const share = (hits[name] ?? 0) / SEEDS;
      assert.ok(share >= 0.9 && share <= 0.99, `${name}: ${share} of the 95 % intervals hold the truth`);
    }
    // The stall's interval is a bracket between commanded powers: it must always hold the truth.
    assert.equal(stallBracketed, SEEDS);
  });

  it('and so they do when the yaw reading wanders (a gyro\'s angle random walk)', function () {
    this.timeout(120_000);
    // The reading's error: white noise 0.05 deg plus a random walk of 0.01 deg per row. Least squares
    // alone gave intervals far too narrow here (about a quarter of them held the truth); the fit's
    // local-level model finds the walk and widens them. Same binomial bounds as above.
    const SEEDS = 200;
    const hits: Partial<Record<FitName, number>> = {};
    for (let seed = 1; seed <= SEEDS; seed++) {
      const fit = fitRobot(log(3000 + seed, { yaw: 0.05, yawWalk: 0.01 }), PLAN);
      for (const name of ['effectiveTrack', 'mismatch', 'drift'] as FitName[]) {
        const p = fit.params[name];
        assert.ok(p.found, `seed ${seed}: ${name} not found: ${p.note}`);
        if (p.low! <= TRUE_VALUES[name]! && TRUE_VALUES[name]! <= p.high!) hits[name] = (hits[name] ?? 0) + 1;
      }
    }
    for (const name of ['effectiveTrack', 'mismatch', 'drift'] as FitName[]) {
      const share = (hits[name] ?? 0) / SEEDS;
      assert.ok(share >= 0.9 && share <= 0.99, `${name}: ${share} of the 95 % intervals hold the truth`);
    }
  });

  it('and so they do when the wheels\' speed takes random pushes (bumps, a changing floor)', function () {
    this.timeout(120_000);
    // Each wheel's speed pushed by 1 mm/s (sd) every row, the push dying away through the lag. Least
    // squares alone held the truth in about a fifth of these runs; the fit's Kalman filter of the pushes
    // widens the intervals. Same binomial bounds as above.
    const SEEDS = 200;
    const hits: Partial<Record<FitName, number>> = {};
    for (let seed = 1; seed <= SEEDS; seed++) {
      const fit = fitRobot(log(5000 + seed, { speedKick: 1 }), PLAN);
      for (const name of ['motorSpeed', 'motorLag'] as FitName[]) {
        const p = fit.params[name];
        assert.ok(p.found, `seed ${seed}: ${name} not found: ${p.note}`);
        if (p.low! <= TRUE_VALUES[name]! && TRUE_VALUES[name]! <= p.high!) hits[name] = (hits[name] ?? 0) + 1;
      }
    }
    for (const name of ['motorSpeed', 'motorLag'] as FitName[]) {
      const share = (hits[name] ?? 0) / SEEDS;
      assert.ok(share >= 0.9 && share <= 0.99, `${name}: ${share} of the 95 % intervals hold the truth`);
    }
  });

  it('fits a log of the demo plan\'s own controller powers (the simulation\'s trace, replayed through the plant)', () => {
    const text = readFileSync(join(__dirname, '../../examples/parcel-table.veer'), 'utf8');
    const plan = currentFromSetup(checkPlan(text).setup);
    // A truth without drift: the demo run never stands still, so the fit takes the drift as zero.
    const truth: TruthRobot = { ...TRUTH, drift: 0, scale: plan.gyroScale };
    const run = simulatedLog(truth, plannedSchedule(text), { seed: 5, ...NOISE, planMismatch: plan.mismatch });
    const fit = fitRobot(run, plan);
    assertFinite(fit);
    // Motor speed for the plan's 58 mm wheel: TRUTH.fullSpeed x 360 / (pi x 58) = 900 x 56 / 58 = 868.966 deg/s (hand calculation).
    within(fit, 'motorSpeed', (900 * 56) / 58);
    within(fit, 'motorLag', TRUTH.lag);
    within(fit, 'effectiveTrack', TRUTH.track);
    within(fit, 'mismatch', TRUTH.mismatch);
    assert.equal(fit.params.drift.found, false);
    assert.match(fit.params.drift.note!, /both wheels still/);
    // The demo's smallest powers: the bracket must hold the true 5.5 %.
    const s = fit.params.stall;
    assert.ok(s.found && s.low! < TRUTH.stall && TRUTH.stall <= s.high!, `${s.low}..${s.high}: ${s.note}`);
  });

  it('fits a log made by the full controller simulation on a different robot (scripts/recorded-run.ts)', () => {
    // An independent log path: the demo plan run closed-loop on the script's "true" robot (encoders in
    // whole degrees, time jitter, a 10 ms late yaw reading), read back through the log reader. Drift set
    // to zero: the demo run never stands still, so the fit takes it as zero.
    const text = readFileSync(join(__dirname, '../../examples/parcel-table.veer'), 'utf8');
    const truth = { ...DEMO_TRUE_ROBOT, drift: 0 };
    const { csv } = simulateLog(text, 'parcel-table.veer', truth);
    const checked = checkPlan(text);
    const plan = currentFromSetup(checked.setup);
    const { run } = readLog(csv, 'true-robot.csv', { wheelDiameter: plan.wheelDiameter, mismatch: plan.mismatch, yawLo: checked.setup.yawRange.lo });
    const fit = fitRobot(run, plan);
    assertFinite(fit);
    const holds = (name: FitName, v: number) => {
      const p = fit.params[name];
      assert.ok(p.found && p.low! <= v && v <= p.high!, `${name}: ${p.value} in ${p.low}..${p.high}, truth ${v}`);
    };
    // Hand calculations from the script's truth: the motor shaft at speedScale x 900 = 855 deg/s; the lag
    // and stall as given; the track in the log's millimetres (the plan's 58 mm wheel, while the true wheel
    // is wheelScale of it) is 123 x trackScale / wheelScale = 126.727 mm, read with the plan's gyro scale 1
    // while the true one is 1.01: 126.727 / 1.01 = 125.472 mm.
    holds('motorSpeed', 900 * truth.speedScale);
    holds('motorLag', truth.lag);
    holds('stall', truth.stall);
    holds('mismatch', truth.mismatch);
    holds('effectiveTrack', (123 * truth.trackScale) / truth.wheelScale / truth.gyroScale);
    // The delay's interval counts the yaw's noise only (docs/recorded-runs.md): to a practical 1 ms.
    assert.ok(Math.abs(fit.params.gyroDelay.value! - truth.gyroDelay) < 0.001, `${fit.params.gyroDelay.value}`);
  });

  it('follows the yaw reading across wraps and resets, in either turn direction', () => {
    for (const turns of ['clockwise', 'counterclockwise'] as const) {
      const truth: TruthRobot = { ...TRUTH, turns, yawLo: 0 };
      const run = log(7, { resets: [6.5, 7.6] }, truth);
      const fit = fitRobot(run, { ...PLAN, turns });
      assert.ok(fit.notes.some((n) => /jumped 2 times/.test(n)), fit.notes.join(' | '));
      within(fit, 'effectiveTrack', TRUTH.track);
      within(fit, 'mismatch', TRUTH.mismatch);
      within(fit, 'drift', TRUTH.drift);
    }
  });

  it('finds how late the yaw reading is, and fits the rest at that delay', () => {
    // A reading 40 ms late (4 rows). Its standard error counts the yaw's noise only, not the wheels'
    // interpolated between rows, so the delay is checked to a practical 1 ms (common practice, no published source).
    const fit = fitRobot(log(3, { delay: 0.04 }), PLAN);
    assertFinite(fit);
    assert.ok(Math.abs(fit.params.gyroDelay.value! - 0.04) < 0.001, `${fit.params.gyroDelay.value}`);
    assert.equal(fit.params.gyroDelay.differs, true);
    within(fit, 'effectiveTrack', TRUTH.track);
    within(fit, 'mismatch', TRUTH.mismatch);
    within(fit, 'drift', TRUTH.drift);
    const text = 'plan "x"\nwheel 56 mm\ntrack 120 mm\ngyro sample 10 ms\nrun "a"\nstart (0, 0) heading 0\n';
    const out = applyEdits(text, fitFixes(text, fit)[0].edits);
    assert.match(out, /^gyro sample 10 ms delay \S+ ms$/m);
    assert.ok(Math.abs(checkPlan(out).setup.gyro.delay - 0.04) < 0.001);
    // Without a delay in the log, the delay found is within a quarter row of zero: nothing to change.
    const none = fitRobot(log(3), PLAN);
    assert.equal(none.params.gyroDelay.found, true);
    assert.equal(none.params.gyroDelay.differs, false);
    assert.ok(Math.abs(none.params.gyroDelay.value!) < 0.0025);
  });

  it('reads the right wheel as the log reader gives it, with the plan\'s mismatch in it', () => {
    // The reader converts the right wheel's degrees with the plan's mismatch (1.005 here): the fit divides it out.
    const plan = { ...PLAN, mismatch: 1.005 };
    const run = simulatedLog(TRUTH, calibrationSchedule(), { seed: 3, ...NOISE, planMismatch: 1.005 });
    const fit = fitRobot(run, plan);
    within(fit, 'mismatch', TRUTH.mismatch);
    within(fit, 'motorSpeed', 900);
    within(fit, 'effectiveTrack', TRUTH.track);
  });

  it('stays close on a log with whole encoder degrees and a coarse yaw (no model noise but rounding)', () => {
    // Encoder resolution one wheel degree: pi x 56 / 360 = 0.4887 mm; yaw in hundredths of a degree.
    // Rounding is not independent noise, so the check is a practical tolerance (common practice, no published source):
    // motor speed and track within 0.5 %, lag within 5 %, mismatch within 0.001.
    const fit = fitRobot(log(9, { travel: 0, yaw: 0.05, quantum: (Math.PI * 56) / 360, yawQuantum: 0.01 }), PLAN);
    assertFinite(fit);
    assert.ok(Math.abs(fit.params.motorSpeed.value! / 900 - 1) < 0.005);
    assert.ok(Math.abs(fit.params.motorLag.value! / TRUTH.lag - 1) < 0.05);
    assert.ok(Math.abs(fit.params.effectiveTrack.value! / TRUTH.track - 1) < 0.005);
    assert.ok(Math.abs(fit.params.mismatch.value! - TRUTH.mismatch) < 0.001);
  });

  describe('what a log cannot tell', () => {
    it('no power columns: no motor speed, lag or stall, and a note saying why', () => {
      const fit = fitRobot(log(2, { withPower: false }), PLAN);
      assertFinite(fit);
      for (const name of ['motorSpeed', 'motorLag', 'stall'] as FitName[]) {
        assert.equal(fit.params[name].found, false);
        assert.match(fit.params[name].note!, /no power columns/);
        assert.equal(fit.params[name].value, undefined);
      }
      within(fit, 'effectiveTrack', TRUTH.track);
    });

    it('no yaw column: no track, gyro scale, mismatch or drift', () => {
      const fit = fitRobot(log(2, { withYaw: false }), PLAN);
      assertFinite(fit);
      for (const name of ['effectiveTrack', 'gyroScale', 'mismatch', 'drift'] as FitName[]) {
        assert.equal(fit.params[name].found, false);
        assert.match(fit.params[name].note!, /no yaw column/);
      }
      within(fit, 'motorSpeed', 900);
    });

    it('a too-short log: every value not found, with the row count', () => {
      const run = log(2);
      run.samples = run.samples.slice(0, 5);
      const fit = fitRobot(run, PLAN);
      assertFinite(fit);
      for (const p of Object.values(fit.params)) {
        assert.equal(p.found, false);
        assert.match(p.note!, /only 5 rows/);
      }
      assert.deepEqual(fitFixes('plan "x"\nwheel 56 mm\n', fit), []);
    });

    it('no time standing still: no drift; no turning: no track; no power: no motor', () => {
      // Straight drives only, back to back, never still.
      const run = simulatedLog(TRUTH, [{ uL: 0.4, uR: 0.4, duration: 2 }, { uL: -0.3, uR: -0.3, duration: 2 }], { seed: 4, ...NOISE });
      const fit = fitRobot(run, PLAN);
      assertFinite(fit);
      assert.equal(fit.params.drift.found, false);
      assert.match(fit.params.drift.note!, /both wheels still/);
      assert.equal(fit.params.effectiveTrack.found, false);
      assert.match(fit.params.effectiveTrack.note!, /turned only about/);
      assert.equal(fit.params.mismatch.found, false);
      const idle = simulatedLog(TRUTH, [{ uL: 0, uR: 0, duration: 1 }], { seed: 4, ...NOISE });
      const still = fitRobot(idle, PLAN);
      assertFinite(still);
      assert.match(still.params.motorSpeed.note!, /every power in the log is zero/);
      assert.match(still.params.effectiveTrack.note!, /turned only about/);
    });

    it('a right wheel whose travel runs against its power: a note says the wheels disagree', () => {
      const run = log(2);
      for (const r of run.samples) r.right = -r.right;
      const fit = fitRobot(run, PLAN);
      assertFinite(fit);
      assert.ok(fit.notes.some((n) => /the wheels disagree/.test(n)), fit.notes.join(' | '));
      assert.ok(fit.eachWheel!.left > 0 && fit.eachWheel!.right < 0);
      // The agreeing log has no such note.
      assert.ok(!fitRobot(log(2), PLAN).notes.some((n) => /disagree/.test(n)));
    });

    it('rows without numbers, or whose time runs back, are left out and counted', () => {
      const run = log(2);
      run.samples[10] = { ...run.samples[10], left: NaN };
      run.samples[20] = { ...run.samples[20], t: 0.05 };
      const fit = fitRobot(run, PLAN);
      assertFinite(fit);
      assert.ok(fit.notes.some((n) => /1 row of simulated-2\.csv without a number/.test(n)), fit.notes.join(' | '));
      assert.ok(fit.notes.some((n) => /1 row of simulated-2\.csv whose time runs back/.test(n)));
      within(fit, 'motorSpeed', 900);
    });

    it('random logs of every shape: never a NaN, and every value either found or explained', function () {
      this.timeout(60_000);
      // Seeded shapes: random powers and durations, with or without yaw and powers, short and long.
      let a = 12345;
      const rnd = () => ((a = (Math.imul(a, 1103515245) + 12345) >>> 0) / 4294967296);
      for (let trial = 0; trial < 60; trial++) {
        const steps = Array.from({ length: 1 + Math.floor(rnd() * 12) }, () => ({
          uL: rnd() < 0.3 ? 0 : (rnd() * 2 - 1), uR: rnd() < 0.3 ? 0 : (rnd() * 2 - 1), duration: rnd() < 0.2 ? 0.01 : rnd() * 2,
        }));
        const run = simulatedLog(TRUTH, steps, { seed: trial, ...NOISE, withYaw: rnd() < 0.8, withPower: rnd() < 0.8 });
        const fit = fitRobot(run, PLAN);
        assertFinite(fit);
        for (const p of Object.values(fit.params)) {
          if (p.found) assert.ok(p.value !== undefined && p.se !== undefined && p.low! <= p.value && p.value <= p.high!, `${trial} ${p.name}`);
          else assert.ok(p.note && p.note.length > 10 && p.value === undefined, `${trial} ${p.name}: ${p.note}`);
        }
        for (const f of fitFixes('plan "x"\nwheel 56 mm\ntrack 121 mm\n', fit)) assert.ok(f.edits.length > 0 && f.title.length > 0);
      }
    });

    it('a log longer than 100,000 rows: the fit reads the first 100,000 and says so', function () {
      this.timeout(60_000);
      const long = calibrationSchedule();
      const steps = Array.from({ length: 74 }, () => long).flat(); // 74 x 13.7 s at 10 ms: about 101,400 rows
      const run = simulatedLog(TRUTH, steps, { seed: 4, ...NOISE });
      assert.ok(run.samples.length > MAX_FIT_ROWS);
      const fit = fitRobot(run, PLAN);
      assert.equal(fit.rows, MAX_FIT_ROWS);
      assert.ok(fit.notes.some((n) => /uses the first 100,000 of the log's 10\d,\d{3} rows/.test(n)), fit.notes.join(' | '));
      within(fit, 'motorSpeed', 900);
    });

    it('a plan without a track: the yaw fit says to add one', () => {
      const fit = fitRobot(log(2), { ...PLAN, effectiveTrack: undefined });
      assertFinite(fit);
      assert.match(fit.params.effectiveTrack.note!, /no `track` line/);
      within(fit, 'motorSpeed', 900);
    });

    it('a log that never commands a power too small to move the wheels: the stall is only bounded', () => {
      const schedule = calibrationSchedule().map((s) => (s.uL !== 0 && Math.abs(s.uL) < 0.06 ? { ...s, uL: 0, uR: 0 } : s));
      const fit = fitRobot(simulatedLog(TRUTH, schedule, { seed: 6, ...NOISE }), PLAN);
      assert.equal(fit.params.stall.found, false);
      assert.match(fit.params.stall.note!, /down to the smallest, 6 %: the stall is at most that/);
    });
  });

  describe('the results as setup edits', () => {
    const PLAN_TEXT = [
      'plan "Bench"',
      'wheel 56 mm',
      'track 120 mm effective 121 mm',
      'motor 800 deg/s lag 80 ms',
      'gyro scale 1.01',
      'run "a"',
      'start (0, 0) heading 0',
      'drive 100',
      '',
    ].join('\n');

    it('offers one fix with every value the plan has wrong, and one per setup line; applied, the plan reads them back', () => {
      const fit = fitRobot(log(1), PLAN);
      const fixes = fitFixes(PLAN_TEXT, fit);
      assert.ok(fixes.length >= 4, fixes.map((f) => f.title).join('\n'));
      assert.equal(fixes[0].preferred, true);
      assert.ok(fixes.every((f) => f.changesPath));
      const out = applyEdits(PLAN_TEXT, fixes[0].edits);
      const checked = checkPlan(out);
      assert.deepEqual(checked.diagnostics.filter((d) => d.severity === 'error'), []);
      const r = checked.setup.robot;
      const P = fit.params;
      // Each value written rounded to a tenth of its standard error's order (roundForPlan), within it of the fit.
      assert.ok(Math.abs(r.motorSpeed! - P.motorSpeed.value!) <= P.motorSpeed.se!);
      assert.ok(Math.abs(r.motorLag! - P.motorLag.value!) <= P.motorLag.se!);
      assert.ok(Math.abs(r.effectiveTrack! - P.effectiveTrack.value!) <= P.effectiveTrack.se!);
      assert.ok(Math.abs(r.mismatch! - P.mismatch.value!) <= P.mismatch.se!);
      assert.equal(r.stall, 0.055);
      assert.equal(r.track, 120); // the measured track stays
      assert.match(out, /^motor \S+ deg\/s lag \S+ ms stall 5\.5%$/m);
      // The gyro scale is offered alone, as the other reading of the same number, never in the combined fix.
      const scaleFix = fixes.find((f) => /^Set the gyro scale/.test(f.title))!;
      assert.match(scaleFix.title, /instead of the effective track/);
      assert.ok(!fixes[0].edits.some((e) => e.range.start.line === 4), 'the combined fix leaves the `gyro` line alone');
      const withScale = checkPlan(applyEdits(PLAN_TEXT, scaleFix.edits)).setup.gyro.scale;
      assert.ok(Math.abs(withScale - P.gyroScale.value!) <= P.gyroScale.se!);
    });

    it('adds the setup lines a plan lacks, after its last setup line', () => {
      const bare = 'plan "Bare"\nwheel 56 mm\ntrack 121 mm\nrun "a"\nstart (0, 0) heading 0\ndrive 100\n';
      const plan = currentFromSetup(checkPlan(bare).setup);
      const fit = fitRobot(simulatedLog(TRUTH, calibrationSchedule(), { seed: 8, ...NOISE }), plan);
      const out = applyEdits(bare, fitFixes(bare, fit)[0].edits);
      const lines = out.split('\n');
      assert.match(lines[3], /^motor \S+ deg\/s lag \S+ ms stall 5\.5%$/);
      // The drift (0.6 deg/min, truth) is above the default noise drift of 0.5 deg/min by more than its
      // uncertainty only on some seeds; whichever, the plan must check clean.
      assert.deepEqual(checkPlan(out).diagnostics.filter((d) => d.severity === 'error'), []);
      assert.equal(lines[lines.indexOf('run "a"') - 1].startsWith('track 121 mm effective'), false);
      assert.match(out, /^track 121 mm effective \S+ mm$/m);
    });

    it('keeps the plan\'s line ends and writes a motor speed given in rpm in deg/s', () => {
      // 140 rpm is 840 deg/s, the truth 900 deg/s (150 rpm).
      const crlf = 'plan "x"\r\nwheel 56 mm\r\ntrack 121 mm\r\nmotor 140 rpm\r\nrun "a"\r\nstart (0, 0) heading 0\r\n';
      const plan = currentFromSetup(checkPlan(crlf).setup);
      const fit = fitRobot(simulatedLog(TRUTH, calibrationSchedule(), { seed: 8, ...NOISE }), plan);
      const out = applyEdits(crlf, fitFixes(crlf, fit)[0].edits);
      assert.equal(out.split('\r\n').length, out.split('\n').length, 'every line ends in CRLF');
      assert.match(out, /^motor \S+ deg\/s lag \S+ ms stall 5\.5%\r$/m);
      // The speed written is the fitted one rounded to 0.1 deg/s, within 3 se of the truth.
      assert.ok(Math.abs(checkPlan(out).setup.robot.motorSpeed! - 900) < 0.05 + 3 * fit.params.motorSpeed.se!);
    });

    it('offers nothing where the plan already agrees with the log (unless asked for all)', () => {
      const truthPlan: FitCurrent = { ...PLAN, motorSpeed: 900, motorLag: TRUTH.lag, stall: 0.055, effectiveTrack: TRUTH.track, mismatch: TRUTH.mismatch, noiseDrift: 1 };
      // Each 95 % interval misses the truth on 1 seed in 20 (seed 1's track does): on seed 2 every interval holds it.
      const fit = fitRobot(log(2, { planMismatch: TRUTH.mismatch }), truthPlan);
      assert.deepEqual(fitFixes(PLAN_TEXT, fit), []);
      assert.ok(fitFixes(PLAN_TEXT, fit, { all: true }).length > 0);
    });

    it('rounds to a tenth of the standard error\'s order', () => {
      // Hand calculations: se 3.2 -> step 0.1; se 0.0004 -> step 0.00001; se 0.02 -> step 0.001.
      assert.equal(roundForPlan(812.3456, 3.2), 812.3);
      assert.equal(roundForPlan(1.0123456, 0.0004), 1.01235);
      assert.equal(roundForPlan(124.48644, 0.02), 124.486);
    });
  });
});
