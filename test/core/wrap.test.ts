import { strict as assert } from 'node:assert';
import { applyEdits, checkPlan, lineMapper } from '../../src/core';
import type { CheckResult, Diagnostic, DiagnosticCode, TextEdit } from '../../src/core/types';

// The yaw sensor's wrap point (spec sections 2 and 6). Each case is a small
// plan whose readings are worked out by hand from the spec's rules: the
// reading is the heading turned since the last reset, wrapped into [lo, hi);
// the code's target is reading + A (`turn A by gyro`), A (with `reset`), or H
// (`turn to H`, `hold H`).

const robot = ['wheel 56', 'track 160'];

function codesByLine(result: CheckResult, codes: readonly DiagnosticCode[] = WRAP_CODES): [number, DiagnosticCode][] {
  return sortPairs(result.diagnostics.filter((d) => codes.includes(d.code)).map((d) => [d.range.start.line, d.code]));
}

function sortPairs(pairs: [number, DiagnosticCode][]): [number, DiagnosticCode][] {
  return [...pairs].sort((a, b) => a[0] - b[0] || a[1].localeCompare(b[1]));
}

const WRAP_CODES: readonly DiagnosticCode[] = ['wrap-cross', 'wrap-edge', 'long-way', 'heading-jump'];

/** Where line `line` of the old text is after the edits (the core's mapper, tested in fixEngine.test.ts). */
function movedLine(line: number, edits: readonly TextEdit[]): number {
  return lineMapper(edits)(line);
}

interface WrapCase {
  name: string;
  lines: string[];
  expected: [number, DiagnosticCode][];
}

// Line numbers below are 0-based, counted in `lines` (the robot's two lines come first).
const cases: WrapCase[] = [
  {
    name: 'turn A by gyro: the second 120° turn aims at 240°, outside [-180, 180)',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'turn 120 by gyro'],
    expected: [[4, 'wrap-cross']],
  },
  {
    name: 'turn A by gyro with reset: the target is A itself',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'turn 120 by gyro reset'],
    expected: [],
  },
  {
    name: 'a `reset yaw` line before the turn',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'reset yaw', 'turn 120 by gyro'],
    expected: [],
  },
  {
    name: 'an encoder turn ignores the wrap point',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 120', 'turn 120', 'turn 120'],
    expected: [],
  },
  {
    name: 'counterclockwise files read the same signed angles',
    lines: ['turns counterclockwise', ...robot, 'start (500, 500) heading 0', 'turn -120 by gyro', 'turn -120 by gyro'],
    expected: [[5, 'wrap-cross']],
  },
  {
    name: 'yaw range 0 to 360: any negative gyro turn from 0 crosses at 0',
    lines: ['yaw range 0 to 360', ...robot, 'start (500, 500) heading 0', 'turn -30 by gyro', 'turn 30 by gyro reset', 'turn 300 by gyro'],
    expected: [[4, 'wrap-cross']],
  },
  {
    name: 'yaw range 0 to 360: 330° then 40° more aims at 370°',
    lines: ['yaw range 0 to 360', ...robot, 'start (500, 500) heading 0', 'turn 330 by gyro', 'turn 40 by gyro'],
    expected: [[5, 'wrap-cross']],
  },
  {
    // One root cause, one problem: the turn cannot finish, so the long way is not reported as well.
    name: 'turn to H out of range (200 − 0 = 200: no long-way warning on top of the crossing)',
    lines: [...robot, 'start (500, 500) heading 0', 'turn to 200'],
    expected: [[3, 'wrap-cross']],
  },
  {
    name: 'turn to H the long way: from 170 to −170 the code turns −340°',
    lines: [...robot, 'start (500, 500) heading 0', 'turn to 170', 'turn to -170'],
    expected: [[4, 'long-way']],
  },
  {
    name: 'long way under 0 to 360: from 0 to 350 is +350°, from 350 to 10 is −340°',
    lines: ['yaw range 0 to 360', ...robot, 'start (500, 500) heading 0', 'turn to 350', 'turn to 10'],
    expected: [[4, 'long-way'], [5, 'long-way']],
  },
  {
    name: 'wrap-edge: targets within 5° of either end of [-180, 180)',
    lines: [...robot, 'start (500, 500) heading 0', 'turn to 176', 'turn to 175', 'turn to 174', 'turn to -175', 'turn to -174'],
    expected: [[3, 'wrap-edge'], [4, 'wrap-edge'], [6, 'long-way'], [6, 'wrap-edge']],
  },
  {
    name: 'wrap-edge under 0 to 360 (3 and 357 the long way round, then 0)',
    lines: ['yaw range 0 to 360', ...robot, 'start (500, 500) heading 0', 'turn to 3', 'turn to 357', 'turn to 0'],
    expected: [[4, 'wrap-edge'], [5, 'long-way'], [5, 'wrap-edge'], [6, 'long-way'], [6, 'wrap-edge']],
  },
  {
    name: 'hold out of range: wrap-cross, and the jump from the reading',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 170 by gyro', 'drive 100 hold 190'],
    expected: [[4, 'wrap-cross'], [4, 'heading-jump']],
  },
  {
    name: 'hold at the current reading: nothing',
    lines: [...robot, 'start (500, 500) heading 0', 'turn 90 by gyro', 'drive 100 hold 90', 'drive 100 hold 91.5'],
    expected: [],
  },
  {
    name: 'heading-jump: a hold more than 2° from the reading; `step` says it is meant',
    lines: [...robot, 'start (500, 500) heading 0', 'drive 100 hold 10', 'drive 100 hold 10 step', 'drive 100 hold 12.5 step'],
    expected: [[3, 'heading-jump']],
  },
  {
    name: 'hold under 0 to 360 with a negative target crosses',
    lines: ['yaw range 0 to 360', ...robot, 'start (500, 500) heading 0', 'drive 100 hold -1'],
    expected: [[4, 'wrap-cross']],
  },
];

describe('wrap: verdicts per case', () => {
  for (const c of cases) {
    it(c.name, () => {
      const result = checkPlan(c.lines.join('\n'));
      assert.deepEqual(result.diagnostics.filter((d) => d.severity === 'error' && !WRAP_CODES.includes(d.code)).map((d) => d.message), []);
      assert.deepEqual(codesByLine(result), sortPairs(c.expected));
    });
  }

  it('the wrap-cross count per run matches the diagnostics', () => {
    const r = checkPlan([...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'turn 120 by gyro', 'turn 120 by gyro', 'drive 10 hold 400'].join('\n'));
    // Hand-derived (docs/language.md, 'The reading the plan means'): targets 120, 240 (crosses);
    // the plan is then read unwrapped, so the third turn aims at 360 and crosses too, and
    // would still cross after the first one's fix (120 + 120 = 240); the hold's 400 is 40°
    // past the reading 360 and would be 160 after a zero at line 5, so it follows from line 5.
    const crossings = r.diagnostics.filter((d) => d.code === 'wrap-cross');
    assert.equal(r.runs[0].wrapCrossings, crossings.length);
    assert.deepEqual(codesByLine(r, ['wrap-cross']), [[4, 'wrap-cross'], [5, 'wrap-cross']]);
    assert.deepEqual(crossings[1].related?.map((x) => x.range.start.line), [6]);
  });

  it('the reading after a crossing turn is the wrapped one', () => {
    const r = checkPlan([...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'turn 120 by gyro'].join('\n'));
    const seg = r.runs[0].segments[2];
    // 240 wrapped into [-180, 180) is −120 (spec section 2); the target stays the code's raw 240.
    assert.equal(seg.yawEnd, -120);
    assert.equal(seg.yawTarget, 240);
  });
});

describe('wrap: every fix removes its diagnostic', () => {
  const fixable = cases.filter((c) => c.expected.length > 0);
  for (const c of fixable) {
    it(c.name, () => {
      const text = c.lines.join('\n');
      const result = checkPlan(text);
      const withFixes: Diagnostic[] = result.diagnostics.filter((d) => d.fixes?.length);
      for (const d of withFixes) {
        for (const fix of d.fixes!) {
          const fixed = checkPlan(applyEdits(text, fix.edits));
          const line = movedLine(d.range.start.line, fix.edits);
          const still = fixed.diagnostics.filter((x) => x.code === d.code && x.range.start.line === line);
          assert.deepEqual(still.map((x) => x.message), [], `fix "${fix.title}" for ${d.code} on line ${d.range.start.line}`);
          assert.deepEqual(fixed.diagnostics.filter((x) => x.code === 'syntax').map((x) => x.message), [], 'a fix must keep the plan readable');
        }
      }
    });
  }

  it('wrap-cross, wrap-edge and heading-jump all offer at least one fix where one exists', () => {
    const r = checkPlan([...robot, 'start (500, 500) heading 0', 'turn 90 by gyro', 'turn to 178', 'drive 10 hold 150', 'turn 100 by gyro'].join('\n'));
    assert.deepEqual(codesByLine(r), [[4, 'wrap-edge'], [5, 'heading-jump'], [6, 'wrap-cross']]);
    const lacking = r.diagnostics.filter((d) => ['wrap-cross', 'wrap-edge', 'heading-jump'].includes(d.code) && !d.fixes?.length);
    assert.deepEqual(lacking.map((d) => `${d.range.start.line} ${d.code}`), []);
  });

  it('a fix that turns the same way with `reset` keeps the path', () => {
    const text = [...robot, 'start (500, 500) heading 0', 'turn 120 by gyro', 'turn 120 by gyro'].join('\n');
    const r = checkPlan(text);
    const d = r.diagnostics.find((x) => x.code === 'wrap-cross')!;
    const fixed = checkPlan(applyEdits(text, d.fixes!.find((f) => f.preferred)!.edits));
    const before = r.runs[0].segments.at(-1)!.end;
    const after = fixed.runs[0].segments.at(-1)!.end;
    assert.ok(Math.abs(before.x - after.x) < 1e-9 && Math.abs(before.y - after.y) < 1e-9 && Math.abs(before.heading - after.heading) < 1e-9);
  });
});
