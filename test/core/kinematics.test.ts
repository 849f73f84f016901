import { strict as assert } from 'node:assert';
import Flatten from '@flatten-js/core';
import fc from 'fast-check';
import { checkPlan, toJsonDocument } from '../../src/core';
import type { CheckResult, Segment } from '../../src/core/types';
import { SPEC_EXAMPLE } from '../support/spec-example';
import { plannedOnly } from '../support/planned';

// Differential-drive kinematics of the solver, checked against outside
// references: Siegwart, Nourbakhsh & Scaramuzza, "Introduction to Autonomous
// Mobile Robots", 2nd ed., MIT Press 2011, ch. 3 (wheel arc = radius x angle;
// each wheel moves on a circle about the instantaneous centre of rotation, ICR)
// and the chord of a circle, 2R sin(theta/2); @flatten-js/core as an
// independent geometry library.

const RAD = Math.PI / 180;

function check(lines: string[]): CheckResult {
  return checkPlan(lines.join('\n'));
}

function segmentOn(result: CheckResult, line: number): Segment {
  const found = result.runs.flatMap((r) => r.segments).find((s) => s.line === line);
  assert.ok(found, `no segment on line ${line}`);
  return found;
}

function errors(result: CheckResult): string[] {
  return plannedOnly(result.diagnostics).filter((d) => d.severity === 'error').map((d) => `${d.range.start.line}: ${d.code}: ${d.message}`);
}

function near(actual: number | undefined, expected: number, tolerance: number, what: string): void {
  assert.ok(actual !== undefined && Math.abs(actual - expected) <= tolerance, `${what}: expected ${expected} ± ${tolerance}, got ${actual}`);
}

/** Wheel degrees for a wheel surface travel of `mm` on wheels of diameter `d` (arc = radius x angle, Siegwart ch. 3). */
const wheelDegreesFor = (mm: number, d: number) => (mm / (Math.PI * d)) * 360;

describe('kinematics: wheel and motor degrees', () => {
  const robot = ['wheel 56 mm', 'track 160 mm'];

  it('a spin on 56 mm wheels 160 mm apart needs 2.86 wheel degrees per degree of turn', () => {
    const r = check([...robot, 'start (500, 500) heading 0', 'turn 90']);
    assert.deepEqual(errors(r), []);
    const s = segmentOn(r, 3);
    // Each wheel rolls (W/2)·θ = 80 mm · π/2 (Siegwart ch. 3, arc = radius × angle).
    near(s.wheelDeg!.left, wheelDegreesFor(80 * Math.PI / 2, 56), 1e-9, 'left wheel');
    near(s.wheelDeg!.right, -wheelDegreesFor(80 * Math.PI / 2, 56), 1e-9, 'right wheel');
    // 2.86 motor degrees per degree of spin: common practice, no published source (W/D = 160/56).
    near(s.wheelDeg!.left / 90, 2.86, 0.005, 'degrees per degree of spin');
  });

  it('a pivot on the same robot needs 5.71 wheel degrees per degree of turn, the still wheel 0', () => {
    const r = check([...robot, 'start (500, 500) heading 0', 'turn 90 pivot left']);
    const s = segmentOn(r, 3);
    near(s.wheelDeg!.left, 0, 1e-9, 'still wheel');
    // 5.71: common practice, no published source (2W/D = 320/56).
    near(Math.abs(s.wheelDeg!.right) / 90, 5.71, 0.005, 'degrees per degree of pivot');
  });

  it('calibrated factors 2.9 (spin) and 5.8 (pivot) come from one effective track of 162.4 mm', () => {
    const r = check(['wheel 56 mm', 'track 160 mm effective 162.4 mm', 'start (500, 500) heading 0',
      'turn 90', 'turn 90 pivot left', 'turn -90 pivot right']);
    assert.deepEqual(errors(r), []);
    const spin = segmentOn(r, 3);
    const pivotLeft = segmentOn(r, 4);
    const pivotRight = segmentOn(r, 5);
    // 2.9 and 5.8 motor degrees per degree: common practice, no published source (162.4/56 = 2.9).
    near(spin.motorDeg!.left / 90, 2.9, 1e-9, 'spin factor');
    near(spin.motorDeg!.right / 90, -2.9, 1e-9, 'spin factor, right');
    near(Math.abs(pivotLeft.motorDeg!.right) / 90, 5.8, 1e-9, 'pivot factor');
    near(pivotLeft.motorDeg!.left, 0, 1e-9, 'still wheel of a pivot left stays still with the effective track');
    near(Math.abs(pivotRight.motorDeg!.left) / 90, 5.8, 1e-9, 'pivot right factor');
    near(pivotRight.motorDeg!.right, 0, 1e-9, 'still wheel of a pivot right');
    // The measured track still sets the wheel degrees and the path (W/D = 160/56, common practice).
    near(spin.wheelDeg!.left / 90, 160 / 56, 1e-9, 'wheel degrees use the measured track');
  });

  it('a gyro turn ignores the effective track (the sensor, not the wheels, decides when to stop)', () => {
    const r = check(['wheel 56 mm', 'track 160 mm effective 162.4 mm', 'start (500, 500) heading 0', 'turn 90 by gyro']);
    const s = segmentOn(r, 3);
    // W/D = 160/56 per degree: arc = radius × angle (Siegwart ch. 3).
    near(s.motorDeg!.left / 90, 160 / 56, 1e-9, 'gyro spin motor degrees');
  });

  it('gear multiplies motor degrees, not wheel degrees', () => {
    const r = check([...robot, 'gear 3', 'start (500, 500) heading 0', 'drive 100', 'turn 90']);
    const drive = segmentOn(r, 4);
    const spin = segmentOn(r, 5);
    // Drive: 100 mm / (π · 56 mm) · 360 (wheel circumference, arc = radius × angle).
    near(drive.wheelDeg!.left, wheelDegreesFor(100, 56), 1e-9, 'drive wheel degrees');
    // gear G = motor degrees per wheel degree (the spec's definition of `gear`).
    near(drive.motorDeg!.left, 3 * wheelDegreesFor(100, 56), 1e-9, 'drive motor degrees');
    near(spin.motorDeg!.left, 3 * wheelDegreesFor(80 * Math.PI / 2, 56), 1e-9, 'spin motor degrees');
  });
});

describe('kinematics: arcs, the instantaneous centre of rotation and the chord', () => {
  it('each wheel runs on a circle about the ICR: travel (R ∓ W/2)·θ (Siegwart ch. 3)', () => {
    fc.assert(fc.property(
      fc.integer({ min: 0, max: 600 }), fc.integer({ min: -270, max: 270 }).filter((a) => a !== 0),
      fc.constantFrom('clockwise', 'counterclockwise'),
      (R, angle, turns) => {
        const r = check([`turns ${turns}`, 'wheel 60', 'track 120', 'start (2000, 2000) heading 30', `turn ${angle} arc ${R}`]);
        const s = segmentOn(r, 4);
        // Outer wheel (R + W/2)·|θ|, inner (R − W/2)·|θ| (signed: backwards below W/2): Siegwart ch. 3.
        const theta = Math.abs(angle) * RAD;
        const outer = wheelDegreesFor((R + 60) * theta, 60);
        const inner = wheelDegreesFor((R - 60) * theta, 60);
        // The outer wheel is the left one for a clockwise turn on the field.
        const clockwiseOnField = (angle > 0) === (turns === 'clockwise');
        near(clockwiseOnField ? s.wheelDeg!.left : s.wheelDeg!.right, outer, 1e-6, 'outer wheel');
        near(clockwiseOnField ? s.wheelDeg!.right : s.wheelDeg!.left, inner, 1e-6, 'inner wheel');
        near(s.radius, R, 1e-9, 'radius');
        // The centre lies R to the side turned to, so the start is R from it.
        near(Math.hypot(s.start.x - s.center!.x, s.start.y - s.center!.y), R, 1e-6, 'start to ICR');
        near(Math.hypot(s.end.x - s.center!.x, s.end.y - s.center!.y), R, 1e-6, 'end to ICR');
        // Chord of a circle: |end − start| = 2R sin(θ/2).
        near(Math.hypot(s.end.x - s.start.x, s.end.y - s.start.y), 2 * R * Math.abs(Math.sin(theta / 2)), 1e-6, 'chord');
        near(s.distance, R * theta, 1e-6, 'arc length R·θ');
      },
    ), { numRuns: 200, seed: 11 });
  });

  it('end points agree with @flatten-js/core rotating the start about the solver\'s centre', () => {
    fc.assert(fc.property(
      fc.integer({ min: 0, max: 500 }), fc.integer({ min: -360, max: 360 }), fc.integer({ min: 0, max: 359 }),
      fc.constantFrom('clockwise', 'counterclockwise'),
      fc.constantFrom('spin', 'pivot left', 'pivot right', 'arc', 'arc reverse'),
      (R, angle, heading, turns, shape) => {
        const shapeText = shape.startsWith('arc') ? shape.replace('arc', `arc ${R}`) : shape;
        const r = check([`turns ${turns}`, 'wheel 60', 'track 120', `start (3000, 3000) heading ${heading}`, `turn ${angle} ${shapeText}`]);
        assert.deepEqual(errors(r), []);
        const s = segmentOn(r, 4);
        // flatten-js rotates counterclockwise for a positive angle.
        const ccwRadians = (turns === 'clockwise' ? -angle : angle) * RAD;
        const oracle = new Flatten.Point(s.start.x, s.start.y).rotate(ccwRadians, new Flatten.Point(s.center!.x, s.center!.y));
        near(s.end.x, oracle.x, 1e-6, 'end x');
        near(s.end.y, oracle.y, 1e-6, 'end y');
        near(s.end.heading, heading + angle, 1e-9, 'end heading');
      },
    ), { numRuns: 300, seed: 12 });
  });

  it('the centre lies on the side turned to (forwards) and on the other side in reverse', () => {
    // Heading 0 faces +y; a clockwise turn turns right (+x): spec section 2. R = 200: invented value.
    const r = check(['wheel 60', 'track 120', 'start (1000, 1000) heading 0', 'turn 90 arc 200', 'turn 90 arc 200 reverse']);
    const forward = segmentOn(r, 3);
    const backward = segmentOn(r, 4);
    // Quarter circle to the right about (1200, 1000): hand-derived from the spec's frame.
    near(forward.center!.x, 1200, 1e-9, 'centre x');
    near(forward.end.x, 1200, 1e-9, 'end x');
    near(forward.end.y, 1200, 1e-9, 'end y');
    // Reverse: now facing +x, backing up on a circle whose centre is to the left (+y): (1200, 1400).
    near(backward.center!.x, 1200, 1e-9, 'reverse centre x');
    near(backward.center!.y, 1400, 1e-9, 'reverse centre y');
    near(backward.end.x, 1000, 1e-9, 'reverse end x');
    near(backward.end.y, 1400, 1e-9, 'reverse end y');
    near(backward.end.heading, 180, 1e-9, 'reverse heading');
    // Both wheels run backwards in reverse: (R ± W/2)·θ (Siegwart ch. 3).
    // The centre is on the left, so the left wheel is the inner one.
    near(backward.wheelDeg!.left, -wheelDegreesFor(140 * Math.PI / 2, 60), 1e-9, 'reverse inner wheel');
    near(backward.wheelDeg!.right, -wheelDegreesFor(260 * Math.PI / 2, 60), 1e-9, 'reverse outer wheel');
  });

  it('ratio Q is the arc of radius R = (W/2)(1+Q)/(1−Q) (the spec\'s equivalence)', () => {
    fc.assert(fc.property(
      fc.integer({ min: -100, max: 95 }), fc.integer({ min: -180, max: 180 }).filter((a) => a !== 0), fc.boolean(),
      (q, angle, reverse) => {
        const R = (60 * (1 + q / 100)) / (1 - q / 100);
        const rev = reverse ? ' reverse' : '';
        const r = check(['wheel 60', 'track 120', 'run "a"', 'start (3000, 3000) heading 0', `turn ${angle} ratio ${q}%${rev}`,
          'run "b"', 'start (3000, 3000) heading 0', `turn ${angle} arc ${R}${rev}`]);
        const byRatio = r.runs[0].segments[1];
        const byArc = r.runs[1].segments[1];
        near(byRatio.end.x, byArc.end.x, 1e-6, 'x');
        near(byRatio.end.y, byArc.end.y, 1e-6, 'y');
        near(byRatio.wheelDeg!.left, byArc.wheelDeg!.left, 1e-6, 'left');
        near(byRatio.wheelDeg!.right, byArc.wheelDeg!.right, 1e-6, 'right');
        // And the inner wheel turns at Q times the outer one (the definition of `ratio`).
        const [inner, outer] = Math.abs(byRatio.wheelDeg!.left) < Math.abs(byRatio.wheelDeg!.right)
          ? [byRatio.wheelDeg!.left, byRatio.wheelDeg!.right] : [byRatio.wheelDeg!.right, byRatio.wheelDeg!.left];
        near(inner / outer, q / 100, 1e-9, 'wheel ratio');
      },
    ), { numRuns: 150, seed: 13 });
  });

  it('with an effective track a ratio keeps its wheel ratio in motor degrees', () => {
    const r = check(['wheel 56', 'track 160 effective 162.4', 'start (3000, 3000) heading 0', 'turn 90 ratio 50%']);
    const s = segmentOn(r, 3);
    // `ratio` is defined as inner/outer wheel speed (spec section 5), so 0.5 however the track is calibrated.
    near(s.motorDeg!.right / s.motorDeg!.left, 0.5, 1e-9, 'motor ratio');
  });
});

describe('kinematics: frames and the two turn conventions', () => {
  it('heading 90 faces +x under clockwise and −x under counterclockwise (spec section 2)', () => {
    const cw = check(['wheel 56', 'track 160', 'start (1000, 1000) heading 90', 'drive 100']);
    const ccw = check(['turns counterclockwise', 'wheel 56', 'track 160', 'start (1000, 1000) heading 90', 'drive 100']);
    // 100 mm along ±x: spec section 2.
    near(segmentOn(cw, 3).end.x, 1100, 1e-9, 'clockwise x');
    near(segmentOn(cw, 3).end.y, 1000, 1e-9, 'clockwise y');
    near(segmentOn(ccw, 4).end.x, 900, 1e-9, 'counterclockwise x');
    near(segmentOn(ccw, 4).end.y, 1000, 1e-9, 'counterclockwise y');
  });

  it('a negative drive backs up; length units scale bare numbers', () => {
    const r = check(['units cm', 'wheel 5.6', 'track 16', 'start (100, 100) heading 0', 'drive -25']);
    const s = segmentOn(r, 4);
    // 100 cm = 1000 mm; −25 cm backwards along −y: spec sections 1 and 5.
    near(s.end.x, 1000, 1e-9, 'x');
    near(s.end.y, 750, 1e-9, 'y');
    near(s.distance, 250, 1e-9, 'distance');
    near(s.wheelDeg!.left, -wheelDegreesFor(250, 56), 1e-9, 'wheel degrees backwards');
  });

  it('a pivot turns about the still wheel\'s contact point', () => {
    // Facing +y, the left wheel sits at x − W/2: spec sections 2 and 5 (hand-derived).
    const r = check(['wheel 56', 'track 160', 'start (1000, 1000) heading 0', 'turn 90 pivot left', 'run "r"', 'start (1000, 1000) heading 0', 'turn -90 pivot right']);
    const left = r.runs[0].segments[1];
    const right = r.runs[1].segments[1];
    near(left.center!.x, 920, 1e-9, 'pivot left centre');
    // Rotating (1000, 1000) clockwise 90° about (920, 1000) gives (920, 920).
    near(left.end.x, 920, 1e-9, 'pivot left end x');
    near(left.end.y, 920, 1e-9, 'pivot left end y');
    near(left.radius, 80, 1e-9, 'pivot radius W/2');
    near(right.center!.x, 1080, 1e-9, 'pivot right centre');
    // Rotating (1000, 1000) counterclockwise 90° about (1080, 1000) gives (1080, 920).
    near(right.end.x, 1080, 1e-9, 'pivot right end x');
    near(right.end.y, 920, 1e-9, 'pivot right end y');
  });
});

describe('kinematics: square against walls', () => {
  const field = ['wheel 56', 'track 160', 'field 2000 by 1200'];
  const body = 'body 150 by 190 axle -30';

  it('squares against a field edge: drives along its heading to first contact, then turns square there', () => {
    const r = check([...field, body, 'start (500, 400) heading 10', 'square front', 'square back']);
    assert.deepEqual(errors(r), []);
    const front = segmentOn(r, 5);
    // Front edge 190/2 + 30 = 125 mm ahead of the axle, so the axle ends 1200 − 125 = 1075 (spec section 5, hand-derived).
    near(front.end.y, 1075, 1e-9, 'front y');
    // First contact: the front-left corner, 125·cos 10° + 75·sin 10° above the axle, travels along cos 10°
    // until y 1200; the axle keeps its x from that moment (hand-derived plane geometry).
    const travel = (1200 - 400 - 125 * Math.cos(10 * Math.PI / 180) - 75 * Math.sin(10 * Math.PI / 180)) / Math.cos(10 * Math.PI / 180);
    near(front.distance, travel, 1e-9, 'front travel');
    near(front.end.x, 500 + travel * Math.sin(10 * Math.PI / 180), 1e-9, 'front x');
    near(front.end.heading, 0, 1e-9, 'front heading');
    near(front.turned, -10, 1e-9, 'turned square');
    const back = segmentOn(r, 6);
    // Back edge 95 − 30 = 65 mm behind the axle: the axle ends at y = 65.
    near(back.end.y, 65, 1e-9, 'back y');
    near(back.end.heading, 0, 1e-9, 'back heading');
    // Backing from y 1075 to 65.
    near(back.distance, 1010, 1e-6, 'back distance');
  });

  it('squares against a box side and does not call the wall a collision', () => {
    const r = check([...field, body, 'box "crate" (400, 700) to (900, 900)', 'start (600, 300) heading 0', 'square front']);
    assert.deepEqual(plannedOnly(r.diagnostics).map((d) => d.code), []);
    const s = segmentOn(r, 6);
    // Bottom side of the box at y = 700, front edge 125 ahead: 575 (hand-derived).
    near(s.end.y, 575, 1e-9, 'y against the box');
    near(s.distance, 275, 1e-9, 'travel');
  });

  it('without a body, the footprint circle of diameter = track meets the wall', () => {
    const r = check([...field, 'start (1000, 600) heading 90', 'square front']);
    // Circle radius 80: the axle ends at 2000 − 80 = 1920 (spec section 3, `body` default).
    near(segmentOn(r, 4).end.x, 1920, 1e-9, 'x');
  });

  it('meeting no wall, or more than 30° off square, is no-wall', () => {
    const none = check(['wheel 56', 'track 160', 'start (500, 400) heading 0', 'square front']);
    assert.deepEqual(none.diagnostics.map((d) => [d.range.start.line, d.code]), [[3, 'no-wall']]);
    const skew = check([...field, 'start (500, 400) heading 40', 'square front']);
    // 40° > 30° off square: spec section 5.
    assert.deepEqual(skew.diagnostics.map((d) => [d.range.start.line, d.code]), [[4, 'no-wall']]);
  });
});

describe('kinematics: the spec\'s section-9 example', () => {
  const example = SPEC_EXAMPLE;

  it('checks clean and gives the values of the spec\'s formulas', () => {
    const doc = toJsonDocument('example.veer', checkPlan(example));
    assert.deepEqual(plannedOnly(doc.diagnostics), []);
    const [run] = doc.runs;
    const byLine = (line: number) => run.segments.find((s) => s.line === line)!;
    const fullSpeed = (900 * Math.PI * 62) / 360; // mm/s at 100 % power: spec section 5 (power × motor speed / gear × circumference)

    const first = byLine(15);
    near(first.end.y_mm, 950, 1e-3, 'first drive ends at y 950 (200 + 3 × 250)');
    // Wheel degrees: 750 / (π · 62) · 360.
    near(first.wheel_deg!.left, wheelDegreesFor(750, 62), 1e-3, 'first drive wheel degrees');
    // |D| / v, v = 60 % of full speed: spec section 8.
    near(first.duration_s, 750 / (0.6 * fullSpeed), 1e-3, 'first drive time');

    const spin = byLine(16);
    assert.deepEqual(spin.start, { x_mm: 200, y_mm: 950, heading_deg: 0 });
    assert.deepEqual(spin.end, { x_mm: 200, y_mm: 950, heading_deg: 90 });
    // 185.8 wheel degrees: the spec's JSON example; = 64 · π/2 / (π · 62) · 360.
    near(spin.wheel_deg!.left, 185.8, 0.05, 'spec wheel_deg');
    near(spin.wheel_deg!.left, wheelDegreesFor(64 * Math.PI / 2, 62), 1e-3, 'spin wheel degrees');
    near(spin.wheel_deg!.right, -wheelDegreesFor(64 * Math.PI / 2, 62), 1e-3, 'spin wheel degrees, right');
    assert.equal(spin.yaw_target_deg, 90);

    const second = byLine(17);
    const v = 0.5 * fullSpeed;
    // Trapezoidal profile t = D/v + v/a (D ≥ v²/a): the standard constant-acceleration kinematics.
    near(second.duration_s, 1450 / v + v / 800, 1e-3, 'ramped drive time');
    near(second.end.x_mm, 1650, 1e-3, 'second drive x');

    const pivot = byLine(18);
    // Pivot left facing +x: left wheel at (1650, 1014); −90° (counterclockwise) about it: (1714, 1014) (hand-derived).
    assert.deepEqual(pivot.end, { x_mm: 1714, y_mm: 1014, heading_deg: 0 });
    near(pivot.wheel_deg!.right, wheelDegreesFor(128 * Math.PI / 2, 62), 1e-3, 'pivot outer wheel, measured track');
    near(pivot.motor_deg!.right, wheelDegreesFor(130 * Math.PI / 2, 62), 1e-3, 'pivot outer motor, effective track');
    near(pivot.motor_deg!.left, 0, 1e-9, 'pivot still wheel');
    // Encoder turn: the outer wheel's commanded travel / its speed (spec section 8); the
    // wheels must turn the commanded degrees, which use the effective track (130 mm).
    near(pivot.duration_s, (130 * Math.PI / 2) / v, 1e-3, 'pivot time');
    assert.equal(run.wrap_crossings, 0);
  });
});
