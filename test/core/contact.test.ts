import { strict as assert } from 'node:assert';
import { checkPlan } from '../../src/core';

// After `square`, the robot is flush against the wall: leaving it is not a
// collision, pressing into it is.
const base = `wheel 56 mm
track 112 mm
body 120 by 140
field 1500 by 1000
box "bench" (600, 600) to (900, 800)
start (750, 300) heading 0
square front
`;

const codesOn = (text: string, line: number) =>
  checkPlan(text).diagnostics.filter((d) => d.range.start.line === line).map((d) => d.code);

describe('contact with the wall squared against', () => {
  it('squares flush: the front edge ends on the box side (y = 600)', () => {
    const r = checkPlan(base);
    const sq = r.runs[0].segments.find((s) => s.kind === 'square')!;
    // Front edge = axle + length/2 (axle at the body's centre): 600 − 70 = 530 (plain geometry).
    assert.ok(Math.abs(sq.end.y - 530) < 1e-9, String(sq.end.y));
    assert.deepEqual(r.diagnostics, []);
  });

  it('backing away from it is not a collision', () => {
    assert.deepEqual(codesOn(base + 'drive -100\n', 7), []);
  });

  it('a spin while flush swings the front corners into it', () => {
    assert.deepEqual(codesOn(base + 'turn 30\n', 7), ['collision']);
  });

  it('driving on into it is a collision', () => {
    assert.deepEqual(codesOn(base + 'drive 20\n', 7), ['collision']);
  });

  it('only the next move is let off: a later return to the wall is checked', () => {
    assert.deepEqual(codesOn(base + 'drive -100\ndrive 150\n', 8), ['collision']);
  });
});
