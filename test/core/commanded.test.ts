import { strict as assert } from 'node:assert';
import { checkPlan } from '../../src/core';
import type { Pose, Segment } from '../../src/core/types';

// The commanded motor degrees, the drawn path and the time must describe the
// same motion. The robot turns as if its wheels were the effective (calibrated)
// track apart, so the independent check integrates the differential-drive
// equations (Siegwart & Nourbakhsh, Introduction to Autonomous Mobile Robots,
// ch. 3: v = (vL + vR) / 2, omega = (vL − vR) / b, here with b the effective
// track) numerically, driven by the commanded motor degrees, and compares
// where that robot ends with the drawn end pose.

const RAD = Math.PI / 180;

function segmentOn(text: string, line: number): Segment {
  const r = checkPlan(text);
  assert.deepEqual(r.diagnostics.filter((d) => d.severity === 'error').map((d) => d.message), []);
  const seg = r.runs[0].segments.find((s) => s.line === line);
  assert.ok(seg, `no segment on line ${line}`);
  return seg;
}

/**
 * RK4 over the wheel equations: each wheel turns its commanded degrees at a
 * constant rate over unit time (the ratio of the two is what shapes the path).
 * Heading in degrees, positive clockwise (`turns clockwise`), 0 facing +y.
 */
function integrate(start: Pose, motorDeg: { left: number; right: number }, wheel: number, gear: number, track: number, steps = 20000): Pose {
  const travel = (deg: number) => (deg / gear / 360) * Math.PI * wheel;
  const vL = travel(motorDeg.left);
  const vR = travel(motorDeg.right);
  const v = (vL + vR) / 2;
  const w = (vL - vR) / track; // rad per unit time, clockwise
  const f = (s: [number, number, number]): [number, number, number] => [v * Math.sin(s[2]), v * Math.cos(s[2]), w];
  let s: [number, number, number] = [start.x, start.y, start.heading * RAD];
  const h = 1 / steps;
  for (let i = 0; i < steps; i++) {
    const k1 = f(s);
    const k2 = f([s[0] + (h / 2) * k1[0], s[1] + (h / 2) * k1[1], s[2] + (h / 2) * k1[2]]);
    const k3 = f([s[0] + (h / 2) * k2[0], s[1] + (h / 2) * k2[1], s[2] + (h / 2) * k2[2]]);
    const k4 = f([s[0] + h * k3[0], s[1] + h * k3[1], s[2] + h * k3[2]]);
    s = [0, 1, 2].map((j) => s[j] + (h / 6) * (k1[j] + 2 * k2[j] + 2 * k3[j] + k4[j])) as [number, number, number];
  }
  return { x: s[0], y: s[1], heading: s[2] / RAD };
}

function closeTo(a: Pose, b: Pose, what: string): void {
  const d = Math.hypot(a.x - b.x, a.y - b.y);
  assert.ok(d < 0.01 && Math.abs(a.heading - b.heading) < 0.001, `${what}: (${a.x}, ${a.y}, ${a.heading}) vs (${b.x}, ${b.y}, ${b.heading}), ${d} mm apart`);
}

const setup = ['wheel 56 mm', 'track 112 mm effective 114 mm', 'start (1000, 1000) heading 0'];

describe('commanded degrees, drawn path and time agree', () => {
  it('an encoder spin is timed on the commanded motor travel (effective track)', () => {
    const seg = segmentOn([...setup, 'turn 90'].join('\n'), 3);
    // Motor degrees: a quarter turn of the 114 mm circle over the 56 mm wheel, (π/2 · 57) / (π · 56) · 360 = 183.214.
    assert.ok(Math.abs(seg.motorDeg!.left - 183.2142857) < 1e-6);
    assert.ok(Math.abs(seg.motorDeg!.right + 183.2142857) < 1e-6);
    // Time: the motors turn 183.214° at 50 % of 900 deg/s (the defaults): 183.214 / 450 = 0.40714 s
    // (spec section 8: the faster wheel's travel over its speed).
    assert.ok(Math.abs(seg.duration - 183.2142857 / 450) < 1e-9, `${seg.duration}`);
  });

  it('`ratio 25%`: the drawn radius comes from the effective track, and the commanded degrees drive the drawn path', () => {
    const seg = segmentOn([...setup, 'turn 90 ratio 25%'].join('\n'), 3);
    // R = (b/2)(1 + Q)/(1 − Q) with b = 114: 57 · 1.25 / 0.75 = 95 (the ratio's definition, spec section 5).
    assert.ok(Math.abs(seg.radius! - 95) < 1e-9, `${seg.radius}`);
    // 488.571 / 122.143: (π/2)(95 ± 57) / (π · 56) · 360.
    assert.ok(Math.abs(seg.motorDeg!.left - 488.5714286) < 1e-6);
    assert.ok(Math.abs(seg.motorDeg!.right - 122.1428571) < 1e-6);
    // Inner over outer is the ratio.
    assert.ok(Math.abs(seg.motorDeg!.right / seg.motorDeg!.left - 0.25) < 1e-12);
    closeTo(integrate(seg.start, seg.motorDeg!, 56, 1, 114), seg.end, 'integrated wheels vs drawn end');
  });

  it('`arc R` and the equivalent `ratio Q` command the same degrees and draw the same path', () => {
    const viaRatio = segmentOn([...setup, 'turn -135 ratio 40%'].join('\n'), 3);
    const R = (114 / 2) * (1.4 / 0.6);
    const viaArc = segmentOn([...setup, `turn -135 arc ${R}`].join('\n'), 3);
    closeTo(viaArc.end, viaRatio.end, 'arc vs ratio end');
    assert.ok(Math.abs(viaArc.motorDeg!.left - viaRatio.motorDeg!.left) < 1e-9);
    assert.ok(Math.abs(viaArc.motorDeg!.right - viaRatio.motorDeg!.right) < 1e-9);
    closeTo(integrate(viaArc.start, viaArc.motorDeg!, 56, 1, 114), viaArc.end, 'integrated wheels vs drawn arc');
  });

  it('an encoder arc, with a gear: the commanded degrees drive the drawn arc', () => {
    const seg = segmentOn(['wheel 62 mm', 'gear 1.5', 'track 128 mm effective 131 mm', 'start (1000, 1000) heading 30', 'turn 120 arc 300'].join('\n'), 4);
    closeTo(integrate(seg.start, seg.motorDeg!, 62, 1.5, 131), seg.end, 'geared arc');
  });
});
