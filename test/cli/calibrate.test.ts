import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runVeer } from '../support/cli';
import Ajv2020 from 'ajv/dist/2020';
import { checkPlan } from '../../src/core';

const run = runVeer;

function folder(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'veer-calibrate-'));
  for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, name), text);
  return dir;
}

const PLAN = 'plan "Tray"\nunits mm\nwheel 60 mm\ntrack 120\nfield 2000 by 1200\nstart (200, 200) heading 0\ndrive 500\n';

describe('veer calibrate', () => {
  it('--runs writes the calibration runs: a plan that checks without errors, with the record\'s lines as comments', () => {
    const dir = folder({ 'tray.veer': PLAN });
    const out = join(dir, 'calibration.veer');
    const r = run(['calibrate', join(dir, 'tray.veer'), '--runs', out]);
    assert.equal(r.status, 0, r.err);
    assert.match(r.err, /wrote .*calibration\.veer: a \d+ mm straight drive, spins, and laps of a \d+ mm square; .*tray\.calib/);
    const text = readFileSync(out, 'utf8');
    assert.equal(checkPlan(text).diagnostics.filter((d) => d.severity === 'error').length, 0);
    assert.match(text, /#\s+spin \d+ turns measured ___/);
    // `-` prints them instead.
    const printed = run(['calibrate', join(dir, 'tray.veer'), '--runs', '-']);
    assert.equal(printed.out, text);
  });

  it('computes the values from the record next to the plan, and prints the setup lines', () => {
    const dir = folder({
      'tray.veer': PLAN,
      'tray.calib': '# what the robot did\ndrive 1000 mm measured 985, 985\nspin 10 turns measured 3588, 3588\ngyro 10 turns reads 3612, 3612\n',
    });
    const r = run(['calibrate', join(dir, 'tray.veer')]);
    assert.equal(r.status, 0, r.err + r.out);
    // By hand: 60 × 985/1000 = 59.1 mm; 120 × 3600/3588 × 0.985 = 118.595 mm (the track on the new wheel);
    // 3612/3600 = 1.00333.
    assert.match(r.out, /mean diameter is 59\.10 ± 0\.00 mm \(the plan says 60\.00 mm\)/);
    assert.match(r.out, /Setup lines for .*tray\.veer:\n  wheel 59\.1 mm\n  track 120 effective 118\.595\n  gyro scale 1\.00333\n/);
  });

  it('--json gives each value with its standard error and 95 % interval', () => {
    const dir = folder({ 'tray.veer': PLAN, 'm.calib': 'drive 1000 mm measured 985, 987, 983\n' });
    const r = run(['calibrate', join(dir, 'tray.veer'), '--record', join(dir, 'm.calib'), '--json']);
    assert.equal(r.status, 0, r.err);
    const doc = JSON.parse(r.out);
    // Mean 985, sd 2, se 2/√3 mm of 1000 mm; t(0.975, 2) = 4.303 (the published t table): ratio 0.985 ± 0.004968.
    assert.equal(doc.wheel.ratio.value, 0.985);
    assert.ok(Math.abs(doc.wheel.ratio.ci95[1] - (0.985 + 4.302653 * (2 / Math.sqrt(3)) / 1000)) < 1e-8);
    assert.equal(doc.wheel.ratio.n, 3);
    assert.equal(doc.interval, 'student-t-95');
    assert.deepEqual(doc.setup_lines, ['wheel 59.1 mm']);
  });

  it('--json follows schema/calibrate.schema.json (validated with Ajv) with every test recorded, and with none', () => {
    const ajv = new Ajv2020({ allErrors: true, strict: true });
    const validate = ajv.compile(JSON.parse(readFileSync(join(__dirname, '..', '..', 'schema', 'calibrate.schema.json'), 'utf8')));
    const dir = folder({
      'tray.veer': PLAN,
      'full.calib': 'drive 1000 mm measured 985, 987\nspin 10 turns measured 3588, 3590\ngyro 10 turns reads 3612, 3610\n' +
        'lap clockwise 950 mm ahead -21 left 3\nlap clockwise 950 mm ahead -19 left 5\nlap counterclockwise 950 mm ahead 11\nlap counterclockwise 950 mm ahead 9\n',
      'bad.calib': 'drive 1000 mm measured 985\n',
      'nowheel.veer': 'track 120\n',
    });
    for (const [plan, record] of [['tray.veer', 'full.calib'], ['tray.veer', 'bad.calib'], ['nowheel.veer', 'full.calib']]) {
      const r = run(['calibrate', join(dir, plan), '--record', join(dir, record), '--json']);
      const doc = JSON.parse(r.out);
      assert.ok(validate(doc), `${plan} ${record}: ${ajv.errorsText(validate.errors)}`);
    }
  });

  it('bad records exit 1 with FILE:LINE:COL problems; a missing record and bad usage exit 2', () => {
    const dir = folder({ 'tray.veer': PLAN, 'tray.calib': 'drive 1000 mm measured 985\nspin 10 turns measured 3588 mm, 3590\n' });
    const r = run(['calibrate', join(dir, 'tray.veer')]);
    assert.equal(r.status, 1);
    assert.match(r.out, /tray\.calib:1:1: error: too few trials for the straight drive/);
    assert.match(r.out, /tray\.calib:2:24: error: `3588 mm` is a length, but a measured angle is an angle/);
    const missing = run(['calibrate', join(dir, 'tray.veer'), '--record', join(dir, 'none.calib')]);
    assert.equal(missing.status, 2);
    assert.match(missing.err, /none\.calib: no such file/);
    const lonely = folder({ 'lone.veer': PLAN });
    assert.match(run(['calibrate', join(lonely, 'lone.veer')]).err, /lone\.calib: no such file \(the record next to the plan\)\. Write the calibration runs with `veer calibrate/);
    assert.equal(run(['calibrate']).status, 2);
    assert.equal(run(['calibrate', join(dir, 'tray.veer'), '--runs', 'x.veer', '--json']).status, 2);
    // Never over the plan itself.
    const self = run(['calibrate', join(dir, 'tray.veer'), '--runs', join(dir, 'tray.veer')]);
    assert.equal(self.status, 2);
    assert.match(self.err, /is the plan itself/);
    assert.equal(readFileSync(join(dir, 'tray.veer'), 'utf8'), PLAN);
    // Nor over the measurements.
    const record = readFileSync(join(dir, 'tray.calib'), 'utf8');
    const over = run(['calibrate', join(dir, 'tray.veer'), '--runs', join(dir, 'tray.calib')]);
    assert.equal(over.status, 2);
    assert.match(over.err, /calibration record: writing the runs there would destroy the measurements/);
    assert.equal(readFileSync(join(dir, 'tray.calib'), 'utf8'), record);
  });

  it('a field too small for the square: exit 1 and why, no file written', () => {
    const dir = folder({ 'small.veer': 'wheel 56\ntrack 120\nfield 500 by 400\n' });
    const r = run(['calibrate', join(dir, 'small.veer'), '--runs', join(dir, 'c.veer')]);
    assert.equal(r.status, 1);
    assert.match(r.err, /too small for the square test/);
    assert.equal(existsSync(join(dir, 'c.veer')), false);
  });

  it('the example plan\'s record (examples/parcel-table.calib) gives every value without a problem', () => {
    const r = run(['calibrate', join(__dirname, '..', '..', 'examples', 'parcel-table.veer'), '--json']);
    assert.equal(r.status, 0, r.out);
    const doc = JSON.parse(r.out);
    assert.deepEqual(doc.problems, []);
    // The drives by hand: (1591 + 1593 + 1590)/3/1600 = 0.994583; the wheels' mean 58 × that = 57.686 mm.
    assert.ok(Math.abs(doc.wheel.mean_diameter_mm.value - 58 * (4774 / 3 / 1600)) < 1e-6); // JSON keeps 10 significant digits
    assert.equal(doc.square.x_cw_mm.n, 5);
    assert.equal(doc.setup_lines.length, 3);
  });

  it('is listed in --help', () => {
    assert.match(run(['--help']).out, /veer calibrate PLAN --runs OUT\.veer/);
  });
});
