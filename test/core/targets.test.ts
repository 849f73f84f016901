import { strict as assert } from 'node:assert';
import { checkPlan, targetsCsv, targetsMarkdown, targetsText, targetTables } from '../../src/core';
import { plannedOnly } from '../support/planned';

// The targets table: one row per thing the robot's code does. Expected values
// come from the differential-drive relations (wheel degrees = travel / (π d) ·
// 360; a spin's wheels each travel (W/2)·θ; Siegwart & Nourbakhsh, ch. 3) and
// the spec's timing rules (section 8: |D| / v, the power times the full speed).

const PLAN = [
  'wheel 62 mm', 'track 128 mm effective 130 mm', 'gear 2',
  'run "lap, first"', 'start (500, 500) heading 0', 'drive 300 speed 40%', 'reset yaw', 'turn 90 by gyro min 12%', 'wait 1.5 s', 'turn -90',
  'mark "here"',
];
const text = PLAN.join('\n');
const result = checkPlan(text);
const [table] = targetTables(result, text);
const wheelDeg = (mm: number, d: number) => (mm / (Math.PI * d)) * 360;
/** mm/s at full power: 900 deg/s motors (the default) over gear 2, on a 62 mm wheel (spec section 5). */
const full = ((900 / 2) * Math.PI * 62) / 360;

describe('targets table', () => {
  it('lists the drives, turns, waits and resets, not the start or the marks', () => {
    assert.deepEqual(plannedOnly(result.diagnostics), []);
    assert.equal(table.run, 'lap, first');
    assert.deepEqual(table.rows.map((r) => [r.line, r.kind, r.motion]), [
      [6, 'drive', 'drive 300 speed 40%'], [7, 'reset', 'reset yaw'], [8, 'turn', 'turn 90 by gyro min 12%'],
      [9, 'wait', 'wait 1.5 s'], [10, 'turn', 'turn -90'],
    ]);
  });

  it('gives wheel and motor degrees, the yaw target, power and speed', () => {
    const [drive, , gyroTurn, , encoderTurn] = table.rows;
    assert.ok(Math.abs(drive.left_wheel_deg! - wheelDeg(300, 62)) < 1e-3);
    assert.ok(Math.abs(drive.left_motor_deg! - 2 * wheelDeg(300, 62)) < 1e-3, 'motor degrees include the gear');
    assert.equal(drive.power_pct, 40);
    assert.ok(Math.abs(drive.speed_mm_s! - 0.4 * full) < 1e-3);
    assert.ok(Math.abs(drive.duration_s! - 300 / (0.4 * full)) < 1e-3);
    assert.equal(gyroTurn.yaw_target_deg, 90);
    assert.equal(gyroTurn.min_power_pct, 12);
    assert.equal(gyroTurn.power_pct, 50);
    // Encoder spin: motor degrees on the effective track, (130/2)(π/2) per wheel, times the gear.
    assert.ok(Math.abs(encoderTurn.left_motor_deg! + 2 * wheelDeg(65 * Math.PI / 2, 62)) < 1e-3);
    assert.ok(Math.abs(encoderTurn.left_wheel_deg! + wheelDeg(64 * Math.PI / 2, 62)) < 1e-3);
  });

  it('start times add up the durations before each row (the wait counts, the mark does not move the clock)', () => {
    const rows = table.rows;
    for (let i = 1; i < rows.length; i++) assert.ok(Math.abs(rows[i].start_s - (rows[i - 1].start_s + rows[i - 1].duration_s!)) < 2e-3, `row ${i}`);
    assert.equal(rows[3].duration_s, 1.5);
  });

  it('CSV: RFC 4180 quoting of a run name with a comma, one header, CRLF rows', () => {
    const csv = targetsCsv([table]);
    const lines = csv.split('\r\n');
    assert.equal(lines[0], 'run,line,motion,start_s,duration_s,predicted_s,left_wheel_deg,right_wheel_deg,left_motor_deg,right_motor_deg,yaw_target_deg,power_pct,min_power_pct,speed_mm_s');
    assert.ok(lines[1].startsWith('"lap, first",6,drive 300 speed 40%,0,'));
    assert.equal(lines.length, 1 + 5 + 1); // header, five rows, and the empty string after the last CRLF
  });

  it('Markdown and text have one row per motion', () => {
    const md = targetsMarkdown([table]);
    assert.equal(md.split('\n').filter((l) => /^\| \d+ \|/.test(l)).length, 5);
    assert.match(md, /\| `turn 90 by gyro min 12%` \|/);
    const txt = targetsText([table]);
    assert.match(txt, /^run "lap, first"$/m);
    assert.equal(txt.split('\n').filter((l) => /^\s+\d+\s/.test(l)).length, 5);
  });
});
