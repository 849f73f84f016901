import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { runVeer } from '../support/cli';
import { plannedOnly } from '../support/planned';

const example = join(__dirname, '..', '..', 'examples', 'parcel-table.veer');

const run = runVeer;

function tempPlan(text: string | Buffer, name = 'plan.veer'): string {
  const dir = mkdtempSync(join(tmpdir(), 'veer-cli-'));
  const file = join(dir, name);
  writeFileSync(file, text);
  return file;
}

describe('veer command line', () => {
  it('checks the example plan: no problems, one summary line, exit 0', () => {
    const r = run(['check', example]);
    assert.equal(r.status, 0, r.out + r.err);
    assert.match(r.out, /run "to the dock": \d+\.\d\d m, \d+\.\d s \(predicted \d+\.\d s\), 2 turns, 0 wrap crossings/);
  });

  it('prints problems as FILE:LINE:COL: SEVERITY: MESSAGE [CODE] and exits 1 on errors', () => {
    const file = tempPlan('wheel 56\ntrack 160\nstart (0, 0) heading 0\nturn 200 by gyro\n');
    const r = run(['check', file]);
    assert.equal(r.status, 1);
    // Line 4, column 1: the turn statement (1-based, as problem matchers read).
    assert.match(r.out, new RegExp(`^${file.replace(/[.\\/]/g, '\\$&')}:4:1: error: .+ \\[wrap-cross\\]$`, 'm'));
  });

  it('warnings pass, but fail under --strict', () => {
    const file = tempPlan('wheel 56\ntrack 160\nlimit 1 s\nstart (0, 0) heading 0\ndrive 2000\n');
    assert.equal(run(['check', file]).status, 0);
    const strict = run(['check', '--strict', file]);
    assert.equal(strict.status, 1);
    assert.match(strict.out, /warning: .*\[over-time\]/);
  });

  describe('veer targets', () => {
    it('prints the demo plan\'s targets as CSV: one row per motion, with the wheel degrees of the differential-drive relation', () => {
      const r = run(['targets', '--csv', example]);
      assert.equal(r.status, 0, r.err);
      const rows = r.out.trim().split('\r\n').map((l) => l.split(','));
      assert.equal(rows.length, 5);
      const header = rows[0];
      const first = Object.fromEntries(header.map((h, i) => [h, rows[1][i]]));
      assert.equal(first.motion, 'drive 3 * lane speed 60% hold 0 ramp 800 mm/s^2');
      // 750 mm on a 58 mm wheel: 750 / (π · 58) · 360 = 1481.787 (arc length over circumference).
      assert.equal(Number(first.left_wheel_deg), Math.round((750 / (Math.PI * 58)) * 360 * 1000) / 1000);
      assert.equal(first.yaw_target_deg, '0');
      assert.equal(first.power_pct, '60');
    });

    it('--json gives the same rows; --run picks a run; errors make exit 1 with the problems on stderr', () => {
      const r = run(['targets', '--json', '--run', '1', example]);
      assert.equal(r.status, 0);
      const doc = JSON.parse(r.out);
      assert.equal(doc.runs.length, 1);
      assert.equal(doc.runs[0].rows.length, 4);
      const bad = tempPlan('wheel 56\ntrack 160\nstart (0, 0) heading 0\nturn 200 by gyro\n');
      const e = run(['targets', bad]);
      assert.equal(e.status, 1);
      assert.match(e.err, /wrap-cross/);
      assert.match(e.err, /some targets may be missing or wrong/);
      assert.equal(run(['targets', '--csv', '--json', example]).status, 2);
      assert.equal(run(['check', '--csv', example]).status, 2);
      // The sampled runs go only into `check --json`, with a sensible count.
      for (const args of [['check', '--samples', '100', example], ['check', '--json', '--samples', '1', example], ['check', '--json', '--samples', 'many', example],
        ['check', '--json', '--seed', '3', example], ['targets', '--samples', '10', example]]) {
        const r = run(args);
        assert.equal(r.status, 2, args.join(' '));
        assert.match(r.err, /--samples|--seed/);
      }
      // The simulation's samples go only into `check --json`.
      for (const args of [['check', '--trace', example], ['check', '--format', 'sarif', '--trace', example], ['targets', '--trace', example], ['render', example, '-o', '/dev/null', '--trace']]) {
        const r = run(args);
        assert.equal(r.status, 2, args.join(' '));
        assert.match(r.err, /--trace/);
        assert.equal(r.err.trim().split('\n').length, 2, r.err); // one line, and the pointer to --help
      }
    });
  });

  describe('veer fix', () => {
    const wrapping = ['units mm', 'wheel 60 mm', 'track 130 mm', 'start (150, 150) heading 0', 'drive 550 hold 0',
      'turn 90 by gyro min 10%', 'drive 900 hold 90', 'Turn 90 by gyro min 10%', 'drive 300 hold 180', 'turn -90 arc 200', ''].join('\n');

    it('prints the fixed plan: the case fixed, the fewest resets, later targets rewritten; a summary on stderr', () => {
      const file = tempPlan(wrapping);
      const r = run(['fix', file]);
      assert.equal(r.status, 0, r.err);
      // Hand-derived: `Turn` becomes `turn`; after it the target 180 crosses; one reset anywhere from before the
      // drive of 900 to before that turn brings every target into range. Of these, the reset just before the turn
      // leaves the smaller spread at the run's end (the linear model: 49.6 mm against 67.6 mm before the drive, whose
      // held heading would carry the first turn's error into the reference), so only the last hold is rewritten.
      assert.equal(r.out, ['units mm', 'wheel 60 mm', 'track 130 mm', 'start (150, 150) heading 0', 'drive 550 hold 0',
        'turn 90 by gyro min 10%', 'drive 900 hold 90', 'reset yaw', 'turn 90 by gyro min 10%', 'drive 300 hold 90', 'turn -90 arc 200', ''].join('\n'));
      assert.match(r.err, /wrote `turn`/);
      assert.match(r.err, /inserted 1 `reset yaw` line and rewrote 1 later target, removing 1 wrap crossing; every motion ends where it did/);
      assert.equal(readFileSync(file, 'utf8'), wrapping, 'without --write the file is untouched');
      assert.equal(run(['check', file]).status, 1);
    });

    it('--write rewrites the file in place, and a second run has nothing to do', () => {
      const file = tempPlan(wrapping);
      const r = run(['fix', '--write', file]);
      assert.equal(r.status, 0, r.err);
      assert.equal(r.out, '');
      assert.match(readFileSync(file, 'utf8'), /drive 900 hold 90\nreset yaw\nturn 90 by gyro/);
      assert.equal(run(['check', file]).status, 0);
      const again = run(['fix', '--write', file]);
      assert.equal(again.status, 0);
      assert.match(again.err, /nothing to fix/);
    });

    it('exits 1 when errors remain (a turn no reset can help) and 2 on usage errors', () => {
      const file = tempPlan('wheel 56\ntrack 160\nstart (0, 0) heading 0\nturn 200 by gyro\n');
      const r = run(['fix', file]);
      assert.equal(r.status, 1);
      assert.equal(r.out, readFileSync(file, 'utf8'));
      assert.match(r.err, /1 error remain/);
      assert.equal(run(['fix']).status, 2);
      assert.equal(run(['fix', file, file]).status, 2);
      assert.equal(run(['check', '--write', file]).status, 2);
    });
  });

  it('--json gives the document of the command-line spec', () => {
    const r = run(['check', '--json', example]);
    assert.equal(r.status, 0);
    const doc = JSON.parse(r.out);
    assert.equal(doc.file, example);
    assert.deepEqual(plannedOnly(doc.diagnostics), []);
    assert.equal(doc.runs.length, 1);
    const turn = doc.runs[0].segments.find((s: { kind: string }) => s.kind === 'turn');
    assert.equal(turn.line, 17);
    assert.equal(turn.shape, 'spin');
    assert.equal(turn.sensing, 'gyro');
    assert.deepEqual(turn.start, { x_mm: 200, y_mm: 950, heading_deg: 0 });
    // Spin wheel arc = (W/2)·θ; wheel degrees = arc / (π d) · 360 (differential-drive relation):
    // (121/2 · π/2) / (π · 58) · 360 = 187.759.
    const spin = ((121 / 2) * (Math.PI / 2)) / (Math.PI * 58) * 360;
    assert.ok(Math.abs(turn.wheel_deg.left - spin) < 0.001);
    assert.ok(Math.abs(turn.wheel_deg.right + spin) < 0.001);
    assert.equal(turn.yaw_target_deg, 90);
    for (const key of ['duration_s', 'distance_mm']) assert.equal(typeof doc.runs[0][key], 'number');
  });

  it('--json with several files prints an array', () => {
    const r = run(['check', '--json', example, example]);
    const docs = JSON.parse(r.out);
    assert.ok(Array.isArray(docs));
    assert.equal(docs.length, 2);
  });

  it('renders an SVG and exits 0', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'veer-svg-')), 'demo.svg');
    const r = run(['render', example, '-o', out]);
    assert.equal(r.status, 0, r.err);
    const svg = readFileSync(out, 'utf8');
    assert.match(svg, /^(<\?xml[^>]*>\s*)?<svg[\s>]/);
    assert.match(svg, /data-line="16"/);
  });

  it('render --run picks a run by name and refuses an unknown one', () => {
    const file = tempPlan('wheel 56\ntrack 160\nrun "a"\nstart (0, 0) heading 0\ndrive 100\nrun "b"\nstart (500, 0) heading 0\ndrive 200\n');
    const out = join(mkdtempSync(join(tmpdir(), 'veer-svg-')), 'b.svg');
    assert.equal(run(['render', file, '-o', out, '--run', 'b']).status, 0);
    assert.ok(existsSync(out));
    const bad = run(['render', file, '-o', out, '--run', 'c']);
    assert.equal(bad.status, 2);
    assert.match(bad.err, /no run "c" \(runs: "a", "b"\)/);
  });

  it('bad input: one clear line and exit 2, nothing on stdout', () => {
    const dir = mkdtempSync(join(tmpdir(), 'veer-bad-'));
    const cases: Array<[string[], RegExp]> = [
      [['check', join(dir, 'missing.veer')], /missing\.veer: no such file/],
      [['check', dir], /is a directory/],
      [['check', tempPlan(Buffer.from([0x77, 0x68, 0x65, 0x65, 0x6c, 0x20, 0xff, 0xfe, 0x0a]))], /is not UTF-8 text/],
      [['check'], /needs at least one plan file/],
      [['frobnicate', example], /unknown command `frobnicate`/],
      [['check', '--bogus', example], /Unknown option '--bogus'/],
      [['render', example], /needs `-o OUT.svg`/],
    ];
    for (const [args, message] of cases) {
      const r = run(args);
      assert.equal(r.status, 2, args.join(' '));
      assert.equal(r.out, '');
      assert.match(r.err, message);
      assert.equal(r.err.trim().split('\n')[0].startsWith('veer: '), true);
    }
  });

  it('--help and --version exit 0', () => {
    const h = run(['--help']);
    assert.equal(h.status, 0);
    assert.match(h.out, /veer check/);
    const v = run(['--version']);
    assert.equal(v.status, 0);
    assert.equal(v.out.trim(), JSON.parse(readFileSync(join(__dirname, '..', '..', 'package.json'), 'utf8')).version);
  });

  it('the built `veer` binary runs (after `npm run build`)', function () {
    const bin = join(__dirname, '..', '..', 'bin', 'veer.js');
    if (!existsSync(join(__dirname, '..', '..', 'dist', 'cli.js'))) {
      throw new Error('dist/cli.js is missing: run `npm run build` first (npm test does)');
    }
    const r = spawnSync(process.execPath, [bin, 'check', example], { encoding: 'utf8' });
    assert.equal(r.status, 0, r.stderr);
    assert.match(r.stdout, /to the dock/);
  });
});
