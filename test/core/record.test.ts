import { strict as assert } from 'node:assert';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan } from '../../src/core';
import { readLog, LogError, parseNumber, type LogRobot } from '../../src/core/record/log';
import { arcStep, reconstruct } from '../../src/core/record/odometry';
import { replayLog } from '../../src/core/record/compare';
import { simulateLog } from '../../scripts/recorded-run';

// Recorded runs (robot model, section 5): reading a log, reconstructing its
// path, comparing it motion by motion with the plan.

const root = join(__dirname, '..', '..');
const robot: LogRobot = { wheelDiameter: 60, mismatch: 1, yawLo: -180 };

function throwsAt(fn: () => unknown, pattern: RegExp, line?: number, column?: number): void {
  assert.throws(fn, (e: unknown) => {
    assert.ok(e instanceof LogError, `not a LogError: ${String(e)}`);
    assert.match(e.message, pattern);
    if (line !== undefined) assert.equal(e.line, line, `line of: ${e.message}`);
    if (column !== undefined) assert.equal(e.column, column, `column of: ${e.message}`);
    return true;
  });
}

describe('recorded runs: odometry', () => {
  it('one step of the exact arc lies on the circle the two wheels describe (hand geometry), and within 0.05 mm of the textbook update', () => {
    // Track b = 120 mm, left wheel 100 mm, right 110 mm, from (0, 0) heading 0 (facing +y), turns counterclockwise.
    // Hand calculation: dθ = (110 − 100)/120 = 0.0833333 rad (4.7746°), ds = 105 mm, radius R = ds/dθ = 1260 mm,
    // centre (−1260, 0): end = (−R(1 − cos dθ), R sin dθ) = (−1260 × 0.0034702133, 1260 × 0.0832369162)
    // = (−4.3724688, 104.8785144).
    const end = arcStep({ x: 0, y: 0, heading: 0 }, 100, 110, 120, 'counterclockwise');
    assert.ok(Math.abs(end.x - -4.3724688) < 1e-6, `x ${end.x}`);
    assert.ok(Math.abs(end.y - 104.8785144) < 1e-6, `y ${end.y}`);
    assert.ok(Math.abs(end.heading - 4.7746483) < 1e-6, `heading ${end.heading}`);
    // The textbook update (Siegwart & Nourbakhsh, Introduction to Autonomous Mobile Robots, ch. 5, eq. 5.7):
    // θ from +x counterclockwise (here 90°), Δx = ds cos(θ + dθ/2), Δy = ds sin(θ + dθ/2)
    // = (105 cos 92.3873°, 105 sin 92.3873°) = (−4.3737342, 104.9088674): the same to second order in dθ.
    assert.ok(Math.abs(end.x - -4.3737342) < 0.005);
    assert.ok(Math.abs(end.y - 104.9088674) < 0.05);
  });

  it('many small steps of the textbook update converge on the exact arc (Siegwart & Nourbakhsh, eq. 5.7, step → 0)', () => {
    // 1000 steps of eq. 5.7 written out here, against one exact step: the same end within 1e-4 mm.
    let x = 0; let y = 0; let th = Math.PI / 2;
    for (let k = 0; k < 1000; k++) {
      const dsr = 0.110; const dsl = 0.100; const dt = (dsr - dsl) / 120; const ds = (dsr + dsl) / 2;
      x += ds * Math.cos(th + dt / 2); y += ds * Math.sin(th + dt / 2); th += dt;
    }
    const end = arcStep({ x: 0, y: 0, heading: 0 }, 100, 110, 120, 'counterclockwise');
    assert.ok(Math.hypot(end.x - x, end.y - y) < 1e-4);
  });

  it('a spin on the spot and a straight drive (hand calculation), clockwise headings', () => {
    // Spin: each wheel travels π × 60 mm × 90/180 = 94.2477796 mm on a 120 mm track: 90° clockwise, no travel.
    const spin = arcStep({ x: 10, y: 20, heading: 0 }, 94.2477796, -94.2477796, 120, 'clockwise');
    assert.ok(Math.abs(spin.heading - 90) < 1e-6 && Math.abs(spin.x - 10) < 1e-9 && Math.abs(spin.y - 20) < 1e-9);
    // Straight, facing heading 90 (clockwise: +x): 100 mm to the right.
    const drive = arcStep({ x: 0, y: 0, heading: 90 }, 100, 100, 120, 'clockwise');
    assert.ok(Math.abs(drive.x - 100) < 1e-9 && Math.abs(drive.y) < 1e-9);
  });

  it('reconstructs a quarter circle from a log in wheel degrees, by the wheels and by wheels plus yaw', () => {
    // A 60 mm wheel: 1 wheel degree = π 60/360 = 0.5235988 mm. A quarter circle of radius 300 mm on a 120 mm
    // track (clockwise, heading 0 → 90): left wheel (outer) 360 × π/2 = 565.4867 mm, right 240 × π/2 = 376.9911 mm;
    // the end, by hand: centre (300, 0) from (0, 0) facing +y, so the end is (300, 300) heading 90.
    const rows = ['time_s,left_deg,right_deg,yaw_deg'];
    const n = 200;
    for (let i = 0; i <= n; i++) {
      const f = i / n;
      rows.push(`${(f * 2).toFixed(3)},${(565.4867 * f) / 0.5235988},${(376.9911 * f) / 0.5235988},${90 * f}`);
    }
    const { run } = readLog(rows.join('\n'), 'arc.csv', robot);
    const rec = reconstruct(run, { x: 0, y: 0, heading: 0 }, { track: 120, turns: 'clockwise', gyroScale: 1 });
    for (const p of [rec.wheels, rec.fused!]) {
      const i = n;
      assert.ok(Math.abs(p.x[i] - 300) < 1e-3 && Math.abs(p.y[i] - 300) < 1e-3 && Math.abs(p.heading[i] - 90) < 1e-4, `${p.x[i]}, ${p.y[i]}, ${p.heading[i]}`);
    }
  });

  it('takes a jump of the reading while the wheels stand still as a zeroing of the sensor, and unwraps the range', () => {
    const rows = ['t_s,left_mm,right_mm,yaw_deg'];
    // Spin from heading 170 to 190 across the wrap (readings 170 → −170), then a reset to 0, then 100 mm straight.
    const spin = (deg: number) => (Math.PI * 120 * deg) / 360; // each wheel's travel on a 120 mm track
    let t = 0;
    for (let k = 0; k <= 20; k++) rows.push(`${(t += 0.01).toFixed(2)},${spin(k)},${-spin(k)},${((170 + k + 180) % 360) - 180}`);
    rows.push(`${(t += 0.01).toFixed(2)},${spin(20)},${-spin(20)},0`);
    for (let k = 1; k <= 10; k++) rows.push(`${(t += 0.01).toFixed(2)},${spin(20) + 10 * k},${-spin(20) + 10 * k},0`);
    const { run } = readLog(rows.join('\n'), 'reset.csv', robot);
    const rec = reconstruct(run, { x: 0, y: 0, heading: 170 }, { track: 120, turns: 'clockwise', gyroScale: 1 });
    assert.deepEqual(rec.zeroings, [21]); // rows 0..20 spin, row 21 reads 0
    const last = run.samples.length - 1;
    // Heading 190 after the spin, kept through the reset; 100 mm along heading 190 (clockwise from +y):
    // x = 100 sin 190° = −17.3648, y = 100 cos 190° = −98.4808 (hand calculation).
    assert.ok(Math.abs(rec.fused!.heading[last] - 190) < 1e-9);
    assert.ok(Math.abs(rec.fused!.x[last] - -17.3648) < 1e-3 && Math.abs(rec.fused!.y[last] - -98.4808) < 1e-3);
  });
});

describe('recorded runs: reading a log', () => {
  const base = 'time_s,left_deg,right_deg\n0,0,0\n0.01,10,10\n0.02,20,20\n';

  it('converts wheel degrees, turns, counts and mm into mm (wheel circumference π D)', () => {
    // π × 60 mm = 188.4956 mm a turn; 20 wheel degrees = 10.4720 mm; counts:720 → 40 counts = 10.4720 mm.
    const deg = readLog(base, 'a.csv', robot).run.samples[2];
    assert.ok(Math.abs(deg.left - 10.4719755) < 1e-6);
    const rot = readLog('time_s,left_rot,right_rot\n0,0,0\n1,0.5,0.5\n', 'b.csv', robot).run.samples[1];
    assert.ok(Math.abs(rot.right - 94.2477796) < 1e-6);
    const counts = readLog('# veer: wheel-units=counts:720\ntime_ms,left,right\n0,0,0\n10,40,40\n', 'c.csv', robot).run.samples[1];
    assert.ok(Math.abs(counts.left - 10.4719755) < 1e-6);
    assert.equal(readLog('time_ms,left,right\n0,0,0\n10,40,40\n', 'c.csv', robot, { wheelUnits: { kind: 'counts', perTurn: 720 } }).run.samples[1].t, 0.01);
    // The right wheel is `mismatch` times the left: 0.5 turns of a 1.01 × 60 mm wheel = 95.1903 mm.
    const mis = readLog('time_s,left_rot,right_rot\n0,0,0\n1,0.5,0.5\n', 'b.csv', { ...robot, mismatch: 1.01 }).run.samples[1];
    assert.ok(Math.abs(mis.right - 95.1902574) < 1e-6);
  });

  it('reads columns by position, yaw in radians with the other sign, powers in per cent and the plan line', () => {
    const text = '# veer: columns=t,-,left,right,yaw,power-left,power-right,line wheel-units=mm time-units=s yaw-units=rad yaw-sign=reversed power-units=pct\n' +
      '5.0,x,0,0,0,50,50,3\n5.01,y,1,1,-0.5,60,-60,4\n';
    const { run, settings } = readLog(text, 'p.csv', robot);
    const s = run.samples[1];
    // −(−0.5 rad) = +28.6479° (180/π × 0.5); time from the first row; powers as fractions.
    assert.ok(Math.abs(s.yaw! - 28.6478898) < 1e-6);
    assert.ok(Math.abs(s.t - 0.01) < 1e-12);
    assert.equal(s.powerLeft, 0.6);
    assert.equal(s.powerRight, -0.6);
    assert.equal(s.line, 4);
    assert.ok(run.hasYaw && run.hasPower && run.hasLine);
    assert.deepEqual(settings.columns, ['time', '-', 'left', 'right', 'yaw', 'power-left', 'power-right', 'line']);
  });

  it('header names with units in brackets, semicolons, CRLF; unknown columns are listed, not guessed', () => {
    const { run, notes } = readLog('Time [ms];Left (deg);Right (deg);Battery\r\n0;0;0;7.9\r\n10;1;1;7.9\r\n', 'd.csv', robot);
    assert.equal(run.samples[1].t, 0.01);
    assert.match(notes.join(), /columns left out.*4 \(Battery\)/);
  });

  it('the command line\'s choices override the log\'s settings comment', () => {
    const text = '# veer: wheel-units=deg\ntime_s,left,right\n0,0,0\n0.01,1,1\n';
    assert.ok(Math.abs(readLog(text, 'e.csv', robot, { wheelUnits: { kind: 'mm' } }).run.samples[1].left - 1) < 1e-12);
  });

  it('bad logs: each message names the file line and the column, and says what to do', () => {
    throwsAt(() => readLog('time_s,left_deg\n0,0\n0.01,1\n', 'f', robot), /no right column/);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,abc,1\n', 'f', robot), /line 3, column 2 \(left_deg\): `abc` is not a number/, 3, 2);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,,1\n', 'f', robot), /line 3, column 2 .*empty/, 3, 2);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.02,1,1\n0.01,2,2\n', 'f', robot), /line 4, column 1 \(time_s\): time 0.01 is before the row before's \(0.02\)/, 4, 1);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,0,0\n0.01,1,1\n', 'f', robot), /is the same as/, 4, 1);
    // A gap: 2 s without a row where rows come every 10 ms.
    const gap = ['time_s,left_deg,right_deg', ...Array.from({ length: 20 }, (_, i) => `${i / 100},${i},${i}`), '2.2,21,21'].join('\n');
    throwsAt(() => readLog(gap, 'f', robot), /line 22, column 1 \(time_s\): 2.01 s without a row.*gap/, 22, 1);
    throwsAt(() => readLog('time_s,left,right_deg\n0,0,0\n0.01,1,1\n', 'f', robot), /column 2 \(left\): the unit of left is not given.*wheel-units/, 1, 2);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,1,1\n', 'f', robot, { wheelUnits: { kind: 'mm' } }), /header says deg, the settings say mm/, 1, 2);
    throwsAt(() => readLog('time_s,left_furlong,right_deg\n0,0,0\n', 'f', robot), /unknown unit `furlong`/, 1, 2);
    throwsAt(() => readLog('0,0,0\n0.01,1,1\n', 'f', robot), /no header row.*--columns/, 1);
    // Millimetres read as wheel turns: 50 turns in 10 ms is 942 m/s, a unit mix-up.
    throwsAt(() => readLog('time_s,left_rot,right_rot\n0,0,0\n0.01,50,50\n', 'f', robot), /line 3, column 2 \(left_rot\): the wheel moved 9424.78 mm in 0.01 s.*wheel-units/, 3, 2);
    throwsAt(() => readLog('time_s,left_mm,right_mm,power_left_frac,power_right_frac\n0,0,0,0,0\n0.01,1,1,50,50\n', 'f', robot), /line 3, column 4 .*beyond full power.*per cent/, 3, 4);
    throwsAt(() => readLog('time_s,left_mm,right_mm,line\n0,0,0,2.5\n0.01,0,0,3\n', 'f', robot), /line 2, column 4 \(line\): `2.5` is not a plan line/, 2, 4);
    throwsAt(() => readLog('# veer: wheel-units=inch\ntime_s,left,right\n0,0,0\n', 'f', robot), /line 1: `wheel-units` takes/, 1);
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,1\n', 'f', robot), /line 3: 2 columns, but the log needs 3/, 3);
    // A cell's invisible characters are written out, never sent to the terminal as they are.
    throwsAt(() => readLog('time_s,left_deg,right_deg\n0,0,0\n0.01,\u001b[31mred,1\n', 'f', robot), /`<U\+001B>\[31mred` is not a number/, 3, 2);
  });

  it('a yaw in radians read as degrees, and a yaw counting the other way, are caught against the wheels', () => {
    // A spin of 180° (each wheel π × 120/2 = 188.5 mm on a 120 mm track) over 100 rows.
    const rows = (yaw: (deg: number) => number) => ['time_s,left_mm,right_mm,yaw_deg',
      ...Array.from({ length: 101 }, (_, i) => `${i / 100},${1.884956 * i},${-1.884956 * i},${yaw(1.8 * i)}`)].join('\n');
    const rob = { track: 120, turns: 'clockwise' as const, gyroScale: 1 };
    const start = { x: 0, y: 0, heading: 0 };
    const radians = readLog(rows((d) => (d * Math.PI) / 180), 'r.csv', robot).run;
    throwsAt(() => reconstruct(radians, start, rob), /column 4 \(yaw\): the yaw turned 3.1° in all, the wheels 180°: if the yaw is in radians, set yaw-units=rad/, undefined, 4);
    const reversed = readLog(rows((d) => -d), 'r.csv', robot).run;
    throwsAt(() => reconstruct(reversed, start, rob), /turns the other way.*yaw-sign=reversed/, undefined, 4);
    const right = readLog(rows((d) => d), 'r.csv', robot).run;
    assert.ok(Math.abs(reconstruct(right, start, rob).fused!.heading[100] - 180) < 1e-3);
  });
});

describe('recorded runs: comparison with the plan', () => {
  const planText = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
  const result = checkPlan(planText, { fileName: 'parcel-table.veer' });
  const demo = simulateLog(planText, 'parcel-table.veer');

  it('the committed demo log is what scripts/recorded-run.ts makes', () => {
    // When the simulation or the demo plan changes, make the log again: node --import tsx scripts/recorded-run.ts
    assert.ok(readFileSync(join(root, 'examples', 'parcel-table.log.csv'), 'utf8') === demo.csv,
      'examples/parcel-table.log.csv is out of date: run `node --import tsx scripts/recorded-run.ts`');
  });

  it('the demo log: each motion found by its line; wheels plus yaw end near where the simulated true robot ended', () => {
    const r = replayLog(result, demo.csv, 'demo.csv');
    const c = r.comparison;
    assert.equal(c.alignedBy, 'line');
    assert.equal(c.reconstruction, 'wheels+yaw');
    assert.deepEqual(c.motions.filter((m) => m.recorded).map((m) => m.line), [16, 17, 18, 19]);
    const last = c.motions.find((m) => m.line === 19)!;
    // The true robot's wheels are 1 % smaller than the plan's, so the log's 2.4 m of wheel travel reads
    // about 24 mm long (1 % of it): the reconstruction by wheels and yaw may be that far off, no more than 40 mm.
    const off = Math.hypot(last.recorded!.end.x - demo.trueEnd.x, last.recorded!.end.y - demo.trueEnd.y);
    assert.ok(off < 40, `wheels + yaw end ${off.toFixed(1)} mm from the true end`);
    // By the wheels alone the 0.8 % larger right wheel and the 2 % wider track bend the path: its end heading is
    // off by several degrees (0.008 × 2315 mm / 123 mm = 8.6° from the mismatch alone, hand estimate).
    assert.ok(Math.abs(last.recorded!.endWheels.heading - demo.trueEnd.heading) > 4);
    // With the yaw the end heading is the gyro's reading: within 1.5° of the true one (a practical bound, common practice,
    // no published source).
    assert.ok(Math.abs(last.recorded!.end.heading - demo.trueEnd.heading) < 1.5);
    // The last motion ends at rest in the log, and is compared with where the predicted robot comes to rest:
    // closer in heading than the pose where the predicted code moves on (the pivot still coasting then).
    const seg19 = result.runs[0].segments.find((x) => x.line === 18)!;
    assert.ok(last.predicted!.atRest);
    assert.ok(Math.abs(last.vsPredicted!.heading) < Math.abs(last.recorded!.end.heading - seg19.predicted!.end.heading));
    // Time: the true motor is 5 % slower, so each drive takes longer than predicted.
    for (const m of c.motions.filter((x) => x.kind === 'drive')) assert.ok(m.timeVsPredicted! > 0);
  });

  it('without the line column, motions are found by aligning times, and end within a quarter second\'s travel of the line column\'s answer', () => {
    const noLine = demo.csv.replace(/,line\n/, '\n').replace(/,\d+\n/g, '\n');
    const byTime = replayLog(result, noLine, 'demo.csv').comparison;
    const byLine = replayLog(result, demo.csv, 'demo.csv').comparison;
    assert.equal(byTime.alignedBy, 'time');
    for (const m of byTime.motions.filter((x) => x.kind !== 'mark')) {
      const other = byLine.motions.find((x) => x.line === m.line)!;
      const d = Math.hypot(m.recorded!.end.x - other.recorded!.end.x, m.recorded!.end.y - other.recorded!.end.y);
      // Times stretched to the log's are good to about a quarter of a second per motion here (the slower motor
      // stretches drives more than the gyro turn's settling); at the 1565 mm drive's planned 50 % (900 deg/s on
      // 58 mm wheels: 455.5 mm/s × 0.5 = 227.8 mm/s) that is 57 mm (hand bound).
      assert.ok(d < 57, `line ${m.line}: ${d.toFixed(1)} mm apart`);
    }
  });

  it('a `reset yaw` found by the line column: a small jump of the reading there is the zeroing, not a turn', () => {
    const plan = checkPlan('wheel 60 mm\ntrack 120 mm\nrun "r"\nstart (0, 0) heading 0\nturn 3\nreset yaw\ndrive 300\n', { fileName: 'z.veer' });
    // A 3° spin on a 120 mm track: each wheel π × 120 × 3/360 = 3.14159 mm (hand calculation), 10 rows; then the
    // reading is zeroed and the robot drives 300 mm straight in 30 rows.
    const rows = ['time_s,left_mm,right_mm,yaw_deg,line'];
    let t = 0;
    for (let k = 0; k <= 10; k++) rows.push(`${(t += 0.01).toFixed(2)},${0.314159 * k},${-0.314159 * k},${0.3 * k},5`);
    for (let k = 1; k <= 30; k++) rows.push(`${(t += 0.01).toFixed(2)},${3.14159 + 10 * k},${-3.14159 + 10 * k},0,7`);
    const r = replayLog(plan, rows.join('\n'), 'z.csv');
    assert.deepEqual(r.reconstruction.zeroings, [11]);
    const drive = r.comparison.motions.find((m) => m.line === 7)!;
    // Heading 3° kept through the zeroing; 300 mm along it: (300 sin 3°, 300 cos 3°) = (15.7008, 299.5889) (hand calculation).
    assert.ok(Math.abs(drive.recorded!.end.heading - 3) < 1e-3, `heading ${drive.recorded!.end.heading}`);
    assert.ok(Math.abs(drive.recorded!.end.x - 15.7008) < 0.01 && Math.abs(drive.recorded!.end.y - 299.5889) < 0.01, JSON.stringify(drive.recorded!.end));
  });

  it('a plan with two runs: the line column says which; without it, the run must be named', () => {
    const two = checkPlan(`${planText}\nrun "back"\nstart (1825, 1010) heading 180\ndrive 500\n`, { fileName: 'two.veer' });
    assert.equal(replayLog(two, demo.csv, 'demo.csv').comparison.runIndex, 0);
    const noLine = demo.csv.replace(/,line\n/, '\n').replace(/,\d+\n/g, '\n');
    throwsAt(() => replayLog(two, noLine, 'demo.csv'), /the plan has 2 runs \("to the dock", "back"\): say which one the log recorded \(`--run NAME`\)/);
    assert.equal(replayLog(two, noLine, 'demo.csv', {}, 0).comparison.alignedBy, 'time');
  });

  it('a log of another plan, and a unit mix-up, are refused with the row and column', () => {
    const other = demo.csv.replace(/,17\n/g, ',42\n');
    throwsAt(() => replayLog(result, other, 'other.csv'), /line \d+, column 7 \(line\): plan line 42 is not a motion of run "to the dock" \(lines 14 to 20\)/, undefined, 7);
    // Wheel degrees read as millimetres: 0.506 mm a degree on 58 mm wheels, so the log drives about twice the plan (1/0.506 = 1.98).
    throwsAt(() => replayLog(result, demo.csv, 'demo.csv', { wheelUnits: { kind: 'mm' } }), /header says deg, the settings say mm/);
    const asMm = demo.csv.replace('left_deg,right_deg', 'left_mm,right_mm');
    throwsAt(() => replayLog(result, asMm, 'demo.csv'), /column 2 \(left\) and column 3 \(right\): over the motions it completes, the log drives \d+ mm where the plan drives \d+ mm \(\d\.\d\d times\).*wheel units/);
    // A log cut short in the middle of the long drive is a run stopped early, not a unit mix-up: it is read.
    const cut = demo.csv.split('\n').slice(0, 700).join('\n');
    const early = replayLog(result, cut, 'cut.csv').comparison;
    assert.deepEqual(early.motions.filter((m) => m.recorded).map((m) => m.line), [16, 17, 18]);
  });

  it('reads the line column shifted when setup lines were added above the run (as the fitted values\' edits do), and says so', () => {
    // One setup line inserted before the run moves every motion one line down: the log's lines 16 to 19 (the demo's
    // drive, turn, drive, turn) now name the start, drive, turn and drive. The shift that makes every named line a
    // moving motion is +1, and the comparison is then the same as against the unedited plan.
    const lines = planText.split('\n');
    const at = lines.findIndex((l) => l.startsWith('run '));
    const edited = [...lines.slice(0, at), 'gyro delay 10 ms', ...lines.slice(at)].join('\n');
    const original = replayLog(result, demo.csv, 'demo.csv').comparison;
    assert.equal(original.lineShift, undefined);
    const moved = replayLog(checkPlan(edited), demo.csv, 'demo.csv').comparison;
    assert.equal(moved.lineShift, 1);
    assert.deepEqual(moved.motions.filter((m) => m.recorded).map((m) => m.line), original.motions.filter((m) => m.recorded).map((m) => m.line + 1));
  });
});

describe('recorded runs: reading numbers', () => {
  it('reads every cell exactly as JavaScript\'s own string-to-number conversion (the oracle: `+cell`), 200,000 generated cells', () => {
    // A seeded generator of decimals as logs write them (signs, leading and trailing points, up to 17 characters),
    // and of cells the fast path must hand over (exponents, spaces, words, 16+ digits).
    let a = 12345;
    const next = () => { a = (Math.imul(a, 1103515245) + 12345) >>> 0; return a / 4294967296; };
    const shapes = [
      () => (next() * 10 ** Math.floor(next() * 8)).toFixed(Math.floor(next() * 8)),
      () => `-${(next() * 1000).toFixed(Math.floor(next() * 5))}`,
      () => `.${Math.floor(next() * 1e6)}`,
      () => `${Math.floor(next() * 1e6)}.`,
      () => `+${(next() * 100).toFixed(3)}`,
      () => String(next() * 1e-9),
      () => `${Math.floor(next() * 1e17)}`,
      () => ` ${(next() * 10).toFixed(2)}`,
      () => ['', '.', '-', '1.2.3', 'abc', '1e3', 'Infinity', '0x1f', '-0', '00012.50'][Math.floor(next() * 10)],
    ];
    for (let k = 0; k < 200_000; k++) {
      const cell = shapes[k % shapes.length]();
      const want = +cell;
      const got = parseNumber(cell);
      assert.ok(Object.is(got, want), `${JSON.stringify(cell)}: ${got} vs ${want}`);
    }
  });
});

describe('recorded runs: careless and hostile logs', () => {
  const planText = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
  const result = checkPlan(planText, { fileName: 'parcel-table.veer' });
  const demo = readFileSync(join(root, 'examples', 'parcel-table.log.csv'), 'utf8');

  it('3,000 mangled logs: each is read or refused with a LogError, never another exception (seeded)', () => {
    let a = 7;
    const next = () => { a = (Math.imul(a, 1103515245) + 12345) >>> 0; return a / 4294967296; };
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(next() * xs.length)];
    const lines = demo.split('\n');
    const junk = ['', ',', ',,,,,,,,', '"', '"a,b"', 'NaN', '1e308', '-1e308', 'Infinity', '\u0000', '\u202e', '#', '# veer: columns=', '# veer: wheel-units=counts:0',
      'time_s;left_deg;right_deg', '\t', '0x10', '1'.repeat(400), '😀', '-0', '99999999999999999999'];
    let refused = 0;
    let read = 0;
    for (let k = 0; k < 3000; k++) {
      const copy = lines.slice(0, 40 + Math.floor(next() * 200));
      for (let m = 0; m < 1 + Math.floor(next() * 4); m++) {
        const at = Math.floor(next() * copy.length);
        const what = next();
        if (what < 0.3) copy[at] = pick(junk);
        else if (what < 0.55) copy.splice(at, 1);
        else if (what < 0.8) {
          const cells = copy[at].split(',');
          cells[Math.floor(next() * cells.length)] = pick(junk);
          copy[at] = cells.join(',');
        } else copy.splice(at, 0, copy[Math.floor(next() * copy.length)]);
      }
      try {
        replayLog(result, copy.join('\n'), 'mangled.csv');
        read++;
      } catch (e) {
        if (!(e instanceof LogError)) throw new Error(`case ${k}: ${(e as Error).stack}\n${copy.slice(0, 12).join('\n')}`);
        refused++;
      }
    }
    // Both outcomes occur: the mangling reaches the reader's checks and also leaves logs it can use.
    assert.ok(refused > 0 && read > 0, `${read} read, ${refused} refused`);
  });
});
