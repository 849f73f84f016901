import { strict as assert } from 'node:assert';
import fc from 'fast-check';
import { checkPlan } from '../../src/core';
import type { Pose } from '../../src/core/types';
import { plannedOnly } from '../support/planned';

// Properties that hold for any numbers: geometric identities (a rotation
// undone returns the pose; a full circle closes) and the wrap verdict against
// a brute-force walk of the sensor reading.

const turnsArb = fc.constantFrom('clockwise', 'counterclockwise');
const setup = (turns: string) => [`turns ${turns}`, 'wheel 56', 'track 160'];

function samePose(a: Pose, b: Pose, what: string): void {
  const ok = Math.abs(a.x - b.x) < 1e-6 && Math.abs(a.y - b.y) < 1e-6 && Math.abs(a.heading - b.heading) < 1e-9;
  assert.ok(ok, `${what}: ${JSON.stringify(a)} vs ${JSON.stringify(b)}`);
}

function lastPose(lines: string[]): { start: Pose; end: Pose } {
  const r = checkPlan(lines.join('\n'));
  assert.deepEqual(plannedOnly(r.diagnostics).filter((d) => d.severity === 'error').map((d) => d.message), []);
  const segs = r.runs[0].segments;
  return { start: segs[0].end, end: segs[segs.length - 1].end };
}

describe('properties: turns undone', () => {
  // The opposite of each shape: spin and pivot by −A on the same wheel; a
  // forward arc (or ratio) by −A driven in reverse retraces the same circle.
  const shapes = fc.oneof(
    fc.constant({ there: 'spin', back: 'spin' }),
    fc.constantFrom('left', 'right').map((side) => ({ there: `pivot ${side}`, back: `pivot ${side}` })),
    fc.integer({ min: 0, max: 800 }).map((r) => ({ there: `arc ${r}`, back: `arc ${r} reverse` })),
    fc.integer({ min: -100, max: 90 }).map((q) => ({ there: `ratio ${q}%`, back: `ratio ${q}% reverse` })),
    fc.integer({ min: 0, max: 800 }).map((r) => ({ there: `arc ${r} reverse`, back: `arc ${r}` })),
  );

  it('a turn followed by its opposite returns the pose, for every shape', () => {
    fc.assert(fc.property(turnsArb, fc.integer({ min: 0, max: 359 }), fc.double({ min: -400, max: 400, noNaN: true }), shapes,
      (turns, heading, angle, shape) => {
        const a = angle.toFixed(3);
        const { start, end } = lastPose([...setup(turns), `start (5000, 5000) heading ${heading}`,
          `turn ${a} ${shape.there}`, `turn ${-Number(a)} ${shape.back}`]);
        samePose(end, start, `${shape.there} by ${a}`);
      }), { numRuns: 400, seed: 31 });
  });

  it('four 90° spins return the heading (plus 360) and never move the axle', () => {
    fc.assert(fc.property(turnsArb, fc.integer({ min: -720, max: 720 }), fc.constantFrom(90, -90), fc.boolean(),
      (turns, heading, quarter, byGyro) => {
        const turn = `turn ${quarter}${byGyro ? ' by gyro reset' : ''}`;
        const { start, end } = lastPose([...setup(turns), `start (1000, 1000) heading ${heading}`, turn, turn, turn, turn]);
        samePose(end, { ...start, heading: start.heading + 4 * quarter }, 'four quarter spins');
      }), { numRuns: 100, seed: 32 });
  });

  it('a 360° arc comes back to its start', () => {
    fc.assert(fc.property(turnsArb, fc.integer({ min: 0, max: 359 }), fc.integer({ min: 0, max: 900 }), fc.constantFrom(360, -360), fc.boolean(),
      (turns, heading, radius, full, reverse) => {
        const { start, end } = lastPose([...setup(turns), `start (5000, 5000) heading ${heading}`, `turn ${full} arc ${radius}${reverse ? ' reverse' : ''}`]);
        samePose(end, { ...start, heading: start.heading + full }, 'full circle');
      }), { numRuns: 100, seed: 33 });
  });

  it('drives there and back cancel along any heading', () => {
    fc.assert(fc.property(turnsArb, fc.double({ min: -720, max: 720, noNaN: true }), fc.double({ min: -3000, max: 3000, noNaN: true }),
      (turns, heading, d) => {
        const { start, end } = lastPose([...setup(turns), `start (5000, 5000) heading ${heading.toFixed(4)}`, `drive ${d.toFixed(4)}`, `drive ${(-Number(d.toFixed(4))).toFixed(4)}`]);
        samePose(end, start, 'there and back');
      }), { numRuns: 100, seed: 34 });
  });
});

describe('properties: wrap verdict against a brute-force walk of the reading', () => {
  /** Wraps like the sensor: into [lo, lo + 360). */
  const wrap = (v: number, lo: number) => ((((v - lo) % 360) + 360) % 360) + lo;

  /**
   * Steps the reading 0.1° at a time from `from` towards `to` (the code's
   * target, which it chases without wrapping), wrapping each step as the
   * sensor does. The reading jumps by about 360 somewhere iff the robot
   * passes the wrap point before reaching the target.
   */
  function walkCrosses(from: number, to: number, lo: number): boolean {
    const steps = Math.max(1, Math.ceil(Math.abs(to - from) / 0.1));
    let previous = wrap(from, lo);
    for (let k = 1; k <= steps; k++) {
      const reading = wrap(from + ((to - from) * k) / steps, lo);
      if (Math.abs(reading - previous) > 180) return true;
      previous = reading;
    }
    return false;
  }

  const step = fc.oneof(
    fc.integer({ min: -200, max: 200 }).map((a) => ({ text: `turn ${a} by gyro`, kind: 'turn' as const })),
    fc.integer({ min: -200, max: 200 }).map((a) => ({ text: `turn ${a} by gyro reset`, kind: 'turn' as const })),
    fc.integer({ min: -400, max: 400 }).map((h) => ({ text: `turn to ${h}`, kind: 'turn' as const })),
    fc.integer({ min: -400, max: 400 }).map((h) => ({ text: `drive 10 hold ${h} step`, kind: 'hold' as const })),
    fc.integer({ min: -200, max: 200 }).map((a) => ({ text: `turn ${a}`, kind: 'encoder' as const })),
    fc.constant({ text: 'reset yaw', kind: 'reset' as const }),
  );

  it('the walk crosses the wrap point iff the checker says wrap-cross', () => {
    fc.assert(fc.property(fc.constantFrom(-180, 0), turnsArb, fc.array(step, { minLength: 1, maxLength: 8 }), (lo, turns, steps) => {
      const lines = [`yaw range ${lo} to ${lo + 360}`, ...setup(turns), 'start (5000, 5000) heading 0', ...steps.map((s) => s.text)];
      const r = checkPlan(lines.join('\n'));
      // A crossing that follows from an earlier one is listed in that one's related information.
      const crossings = r.diagnostics.filter((d) => d.code === 'wrap-cross');
      const crossLines = new Set([
        ...crossings.map((d) => d.range.start.line),
        ...crossings.flatMap((d) => (d.related ?? []).filter((x) => x.message.includes('follows from this crossing')).map((x) => x.range.start.line)),
      ]);
      const segs = r.runs[0].segments;
      steps.forEach((s, i) => {
        const line = 5 + i;
        const seg = segs.find((g) => g.line === line)!;
        if (s.kind === 'encoder' || s.kind === 'reset') {
          assert.ok(!crossLines.has(line), `line ${line} (${s.text}) uses no yaw target`);
          return;
        }
        // The reading before the segment, after its own `reset` if it has one.
        const from = s.text.endsWith(' reset') ? 0 : seg.yawStart;
        assert.ok(seg.yawTarget !== undefined, `line ${line} has a target`);
        assert.equal(walkCrosses(from, seg.yawTarget!, lo), crossLines.has(line), `${s.text} from reading ${from} to ${seg.yawTarget} (range from ${lo})`);
      });
    }), { numRuns: 300, seed: 35 });
  });
});
