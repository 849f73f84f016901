import { strict as assert } from 'node:assert';
import type { CheckResult, Diagnostic, RunResult, Segment, Statement } from '../../src/core/types';
import {
  completionsAt, documentSymbols, formatHeading, formatLength, hoverAt, inlayHints, statusSummary, type CompletionInfo,
} from '../../src/core/insight';
import { checkPlan, renderSvg, runSummaryLine } from '../../src/core';

// Hand-built check results: these tests pin the insight helpers' own
// behaviour, independent of the solver.

const range = (line: number, start: number, end: number) => ({
  start: { line, character: start }, end: { line, character: end },
});

function statementOn(lines: string[], line: number, extra: Record<string, unknown>): Statement {
  const text = lines[line];
  const start = text.length - text.trimStart().length;
  const code = text.split('#')[0].trimEnd();
  const keywordEnd = text.indexOf(' ', start) < 0 ? code.length : text.indexOf(' ', start);
  return {
    line, range: range(line, start, code.length), keywordRange: range(line, start, keywordEnd), optionRanges: {}, ...extra,
  } as Statement;
}

function segment(line: number, kind: Segment['kind'], extra: Partial<Segment> = {}): Segment {
  return {
    line, kind, start: { x: 0, y: 0, heading: 0 }, end: { x: 0, y: 0, heading: 0 }, turned: 0,
    yawStart: 0, yawEnd: 0, duration: 0, distance: 0, path: [], complete: true, ...extra,
  };
}

function result(
  lines: string[], statements: Statement[], runs: RunResult[], extra: Partial<CheckResult> = {},
): CheckResult {
  return {
    ast: { statements, lineCount: lines.length },
    setup: {
      title: 't', lengthUnit: 'mm', turns: 'clockwise', yawRange: { lo: -180, hi: 180 }, robot: {},
      noise: { drive: 0.01, turn: 0.015, gyro: 1, drift: 0.5 / 60 }, gyro: { sample: 0.01, delay: 0, scale: 1 }, obstacles: [], zones: [],
    },
    runs, diagnostics: [], names: {}, values: [], ...extra,
  };
}

function run(name: string, line: number, segments: Segment[], extra: Partial<RunResult> = {}): RunResult {
  return {
    name, line, range: range(line, 4, 4 + name.length + 2), segments,
    duration: segments.reduce((t, s) => t + s.duration, 0), distance: segments.reduce((t, s) => t + s.distance, 0),
    turns: segments.filter((s) => s.kind === 'turn').length, wrapCrossings: 0, ...extra,
  };
}

// A spin of 90° by encoders on wheels of 62 mm with a 128 mm track (effective 130 mm):
// each wheel travels the arc s = (W/2)·θ (arc length formula), i.e. s/(π·D)·360 wheel degrees,
// = W·θ/D = 128·90/62 = 185.806° measured, 130·90/62 = 188.710° with the effective track.
const SPIN_WHEEL_DEG = (128 * 90) / 62;
const SPIN_MOTOR_DEG = (130 * 90) / 62;

const PLAN = [
  'units cm', //                         0
  'let lane = 25 cm', //                 1
  'zone "dock" (170, 90) to (195, 115)', // 2
  'run "out"', //                        3
  'start (20, 20) heading 0', //         4
  'drive 3 * lane hold 0  # along', //   5
  'turn 90 by encoders', //              6
  'turn -180', //                        7
  'mark "parked" in "dock"', //          8
  'run "back"', //                       9
  'start (20, 20) heading 90', //        10
];

function planResult(): CheckResult {
  const statements = [
    statementOn(PLAN, 0, { kind: 'units', unit: { kind: 'word', value: 'cm', range: range(0, 6, 8) } }),
    statementOn(PLAN, 1, { kind: 'let', name: 'lane', nameRange: range(1, 4, 8), value: { kind: 'expr', text: '25 cm', range: range(1, 11, 16) } }),
    statementOn(PLAN, 2, { kind: 'zone', name: { kind: 'string', value: 'dock', range: range(2, 5, 11) } }),
    statementOn(PLAN, 3, { kind: 'run', name: { kind: 'string', value: 'out', range: range(3, 4, 9) } }),
    statementOn(PLAN, 4, { kind: 'start' }),
    statementOn(PLAN, 5, { kind: 'drive', step: false }),
    statementOn(PLAN, 6, { kind: 'turn', shape: { kind: 'spin' }, sensing: 'encoders', reverse: false, ramp: false, reset: false }),
    statementOn(PLAN, 7, { kind: 'turn', shape: { kind: 'spin' }, sensing: 'encoders', reverse: false, ramp: false, reset: false }),
    statementOn(PLAN, 8, { kind: 'mark', name: { kind: 'string', value: 'parked', range: range(8, 5, 13) } }),
    statementOn(PLAN, 9, { kind: 'run', name: { kind: 'string', value: 'back', range: range(9, 4, 10) } }),
    statementOn(PLAN, 10, { kind: 'start' }),
  ];
  const out = run('out', 3, [
    segment(4, 'start', { start: { x: 200, y: 200, heading: 0 }, end: { x: 200, y: 200, heading: 0 } }),
    segment(5, 'drive', {
      start: { x: 200, y: 200, heading: 0 }, end: { x: 200, y: 950, heading: 0 }, yawTarget: 0,
      distance: 750, duration: 2.5, wheelDeg: { left: 1386.5, right: 1386.5 }, motorDeg: { left: 1386.5, right: 1386.5 },
    }),
    segment(6, 'turn', {
      shape: 'spin', sensing: 'encoders', start: { x: 200, y: 950, heading: 0 }, end: { x: 200, y: 950, heading: 90 },
      turned: 90, yawEnd: 90, radius: 0, duration: 1.21,
      wheelDeg: { left: SPIN_WHEEL_DEG, right: -SPIN_WHEEL_DEG }, motorDeg: { left: SPIN_MOTOR_DEG, right: -SPIN_MOTOR_DEG },
    }),
    segment(7, 'turn', {
      shape: 'spin', sensing: 'encoders', start: { x: 200, y: 950, heading: 90 }, end: { x: 200, y: 950, heading: -90 },
      turned: -180, yawStart: 90, yawEnd: -90, radius: 0, duration: 2,
      motorDeg: { left: -2 * SPIN_MOTOR_DEG, right: 2 * SPIN_MOTOR_DEG },
    }),
    segment(8, 'mark', { label: 'parked' }),
  ]);
  const back = run('back', 9, [segment(10, 'start', { start: { x: 200, y: 200, heading: 90 }, end: { x: 200, y: 200, heading: 90 } })]);
  return result(PLAN, statements, [out, back], {
    setup: { ...result([], [], []).setup, lengthUnit: 'cm' },
    names: { lane: { line: 1, range: range(1, 4, 8), value: 250, dimension: 'length', display: '25 cm' } },
    values: [
      { range: range(5, 6, 14), value: 750, dimension: 'length', display: '75 cm' },
      { range: range(5, 10, 14), value: 250, dimension: 'length', display: '25 cm' },
    ],
  });
}

const TEXT = PLAN.join('\n');

describe('insight: formatting', () => {
  it('shows lengths in the file unit', () => {
    // 1 cm = 10 mm and 1 in = 25.4 mm exactly (SI prefixes; international inch, 1959).
    assert.equal(formatLength(750, 'cm'), '75 cm');
    assert.equal(formatLength(25.4, 'in'), '1 in');
    assert.equal(formatLength(1234.5, 'm'), '1.2345 m');
  });
  it('shows headings in [0, 360), rounding before wrapping', () => {
    // -90 ≡ 270 and 720 ≡ 0 modulo a full turn of 360° (definition of the degree).
    assert.equal(formatHeading(-90), '270°');
    assert.equal(formatHeading(720), '0°');
    assert.equal(formatHeading(-0.01), '0°'); // rounds to 0.0 first, so never "360°"
  });
});

describe('insight: hover', () => {
  it('gives a let name its value', () => {
    const hover = hoverAt(planResult(), TEXT, { line: 5, character: 12 });
    assert.ok(hover);
    assert.match(hover.markdown, /`lane` = \*\*25 cm\*\*/);
    assert.deepEqual(hover.range, range(5, 10, 14));
  });
  it('gives an expression its value in the file units', () => {
    const hover = hoverAt(planResult(), TEXT, { line: 5, character: 7 });
    assert.ok(hover);
    assert.match(hover.markdown, /\*\*75 cm\*\* \(length\)/);
  });
  it('describes a motion line: poses, yaw, wheel and motor degrees, radius, time', () => {
    const hover = hoverAt(planResult(), TEXT, { line: 6, character: 1 });
    assert.ok(hover);
    assert.match(hover.markdown, /\*\*turn\*\* · spin · by encoders/);
    assert.match(hover.markdown, /\| heading \| 0° \| 90° \|/);
    assert.match(hover.markdown, /\| yaw reading \| 0° \| 90° \|/);
    assert.match(hover.markdown, /\| position \| \(20 cm, 95 cm\) \| \(20 cm, 95 cm\) \|/); // 200 mm = 20 cm, 950 mm = 95 cm (SI)
    assert.match(hover.markdown, /wheel degrees: L 185\.8°, R -185\.8°/); // SPIN_WHEEL_DEG, 1 decimal
    assert.match(hover.markdown, /motor degrees: L 188\.7°, R -188\.7°/); // SPIN_MOTOR_DEG, 1 decimal
    assert.match(hover.markdown, /turn radius: 0 cm/);
    assert.match(hover.markdown, /time: 1\.21 s/);
  });
  it('shows the yaw target of a held drive and says nothing inside a comment', () => {
    const hover = hoverAt(planResult(), TEXT, { line: 5, character: 1 });
    assert.ok(hover);
    assert.match(hover.markdown, /yaw target: 0°/);
    assert.match(hover.markdown, /distance: 75 cm/); // 750 mm = 75 cm (SI)
    assert.equal(hoverAt(planResult(), TEXT, { line: 5, character: 26 }), undefined);
  });
});

describe('insight: inlay hints', () => {
  it('puts the end facing, the yaw reading and the motor degrees (whole degrees) at the end of motion lines, within the editor\'s hint width', () => {
    const hints = inlayHints(planResult());
    const byLine = new Map(hints.map((h) => [h.position.line, h]));
    assert.deepEqual([...byLine.keys()], [4, 5, 6, 7, 10]);
    assert.deepEqual(byLine.get(5)?.position, { line: 5, character: 21 }); // end of `drive 3 * lane hold 0`, before the comment
    assert.equal(byLine.get(5)?.label, '→ 0° · yaw 0° · L 1387° R 1387°'); // the drive's motor degrees, from the segment built above
    assert.equal(byLine.get(6)?.label, '→ 90° · yaw 90° · L 189° R -189°');
    // -90 field heading shown as 270 (mod 360); motor degrees 2 × 188.71 = 377.4, so 377 (SPIN_MOTOR_DEG).
    assert.equal(byLine.get(7)?.label, '→ 270° · yaw -90° · L -377° R 377°');
    // The editor shows at most 43 characters of a hint by default (editor.inlayHints.maximumLength).
    for (const h of hints) assert.ok(h.label.length <= 43, h.label);
    assert.match(byLine.get(6)!.tooltip!, /motor degrees/);
  });
  it('limits hints to the requested lines', () => {
    assert.deepEqual(inlayHints(planResult(), { from: 6, to: 7 }).map((h) => h.position.line), [6, 7]);
  });
});

describe('insight: outline', () => {
  it('lists runs with their motion lines and marks', () => {
    const symbols = documentSymbols(planResult(), TEXT);
    assert.deepEqual(symbols.map((s) => s.name), ['out', 'back']);
    assert.deepEqual(symbols[0].children.map((c) => [c.kind, c.name]), [
      ['motion', 'start (20, 20) heading 0'],
      ['motion', 'drive 3 * lane hold 0'],
      ['motion', 'turn 90 by encoders'],
      ['motion', 'turn -180'],
      ['mark', 'parked'],
    ]);
    assert.deepEqual(symbols[0].range, { start: { line: 3, character: 0 }, end: { line: 8, character: 23 } });
    assert.equal(symbols[0].detail, '5.7 s · 0.75 m'); // 2.5 + 1.21 + 2 s and 750 mm, the segments above
  });
});

describe('insight: completion', () => {
  const labels = (line: string, res?: CheckResult, extraLines: string[] = []) => {
    const lines = [...extraLines, line];
    return completionsAt(lines.join('\n'), { line: lines.length - 1, character: line.length }, res).map((c) => c.label);
  };
  it('offers statement keywords at the start of a line', () => {
    const items = labels('  dr');
    assert.ok(items.includes('drive') && items.includes('reset yaw') && items.includes('yaw range'));
  });
  it('offers the unused options of the statement', () => {
    const items = labels('turn 90 ');
    assert.ok(items.includes('pivot') && items.includes('by') && items.includes('reset'));
    assert.ok(!items.includes('step') && !items.includes('reverse') && !items.includes('hold'));
    const afterShape = labels('turn 90 spin by gyro ');
    assert.ok(!afterShape.includes('arc') && !afterShape.includes('by') && afterShape.includes('min'));
    assert.ok(labels('turn 90 arc 100 ').includes('reverse'));
    assert.ok(labels('drive 400 hold 0 ').includes('step'));
  });
  it('offers closed sets after keywords and options', () => {
    assert.deepEqual(labels('turn 90 pivot '), ['left', 'right']);
    assert.deepEqual(labels('turn 90 by '), ['encoders', 'gyro']);
    assert.deepEqual(labels('units '), ['mm', 'cm', 'm', 'in']);
    assert.deepEqual(labels('reset '), ['yaw']);
    assert.ok(labels('turn ').includes('to'));
  });
  it('offers units only while one is typed after a number, and only those that fit the value', () => {
    assert.deepEqual(labels('drive 40 c').filter((l) => ['mm', 'cm', 'm', 'in', 'deg', 's', 'mm/s^2'].includes(l)), ['mm', 'cm', 'm', 'in']);
    assert.deepEqual(labels('turn 90 d').filter((l) => ['deg', 'rad', 'mm', 's'].includes(l)), ['deg', 'rad']);
    assert.ok(labels('drive 40 speed 30 c').includes('mm/s') && !labels('drive 40 speed 30 c').includes('mm'));
    assert.ok(labels('box "b" (10 c').includes('mm'), 'a point holds lengths');
    // Right after the space: the statement's options, not a list of units.
    const afterSpace = labels('turn 90 ');
    assert.ok(afterSpace.includes('pivot') && !afterSpace.includes('mm') && !afterSpace.includes('deg'));
  });
  it('offers nothing at the end of a complete line, so Enter starts a new line', () => {
    assert.deepEqual(labels('limit 30 s'), []);
    assert.deepEqual(labels('wheel 56 mm'), []);
    assert.deepEqual(labels('let leg = 550 mm'), []);
    assert.deepEqual(labels('turn 90 pivot left'), []);
  });
  it('ranks by context: setup first in a new file, motions first inside a run', () => {
    const inOrder = (items: CompletionInfo[]) => [...items].sort((a, b) => a.sortGroup - b.sortGroup || (a.sortIndex ?? 0) - (b.sortIndex ?? 0)).map((i) => i.label);
    const empty = inOrder(completionsAt('', { line: 0, character: 0 }));
    assert.deepEqual(empty.slice(0, 4), ['plan', 'units', 'wheel', 'track']);
    const plan = 'wheel 56\ntrack 112\nstart (0, 0) heading 0\n';
    const inRun = inOrder(completionsAt(plan, { line: 3, character: 0 }));
    assert.deepEqual(inRun.slice(0, 3), ['drive', 'turn', 'mark']);
  });
  it('offers let names bound above, and zone names after `in`', () => {
    const res = planResult();
    assert.ok(labels('drive ', res, PLAN.slice(0, 5)).includes('lane'));
    assert.ok(!labels('drive ', res, PLAN.slice(0, 1)).includes('lane'));
    assert.deepEqual(labels('mark "x" in ', res, PLAN), ['"dock"']);
    assert.deepEqual(labels('mark "x" in "', res, PLAN), ['dock']);
  });
  it('offers nothing inside a comment', () => {
    assert.deepEqual(labels('drive 40 # turn '), []);
  });
  it('offers the simulation options: `stall`, `mismatch`, and the gyro\'s own options right after `gyro`', () => {
    assert.deepEqual(labels('gyro '), ['sample', 'delay', 'scale']);
    assert.deepEqual(labels('gyro sample 10 ms '), ['delay', 'scale']);
    assert.deepEqual(labels('noise '), ['drive', 'turn', 'gyro', 'drift', 'wheel']);
    assert.deepEqual(labels('motor 900 deg/s '), ['lag', 'stall']);
    assert.deepEqual(labels('wheel 56 mm '), ['mismatch']);
    assert.ok(labels('g').includes('gyro'));
  });
  it('offers the units that fit the new values, and none for plain numbers', () => {
    const units = (line: string) => labels(line).filter((l) => ['mm', 'cm', 'm', 's', 'ms', 'min', '%', 'deg'].includes(l));
    assert.deepEqual(units('gyro sample 10 m'), ['s', 'ms', 'min']);
    assert.deepEqual(units('gyro delay 5 m'), ['s', 'ms', 'min']);
    assert.deepEqual(units('motor 900 stall 5 m'), ['%']);
    assert.deepEqual(units('wheel 56 mm mismatch 1 m'), [], 'not the wheel\'s length units');
    assert.deepEqual(units('gyro scale 1 m'), []);
  });
});

describe('insight: status summary', () => {
  it('adds up time and distance and counts the problems, errors first', () => {
    const res = planResult();
    const wrap: Diagnostic = { range: range(7, 0, 9), severity: 'error', code: 'wrap-cross', message: 'm' };
    res.diagnostics = [wrap, { ...wrap, code: 'wrap-edge', severity: 'warning' }, { ...wrap, code: 'collision' }];
    const summary = statusSummary(res);
    assert.equal(summary.errors, 2);
    assert.equal(summary.warnings, 1);
    // 2.5 + 1.21 + 2 s and 750 mm from the segments above, as the command line's summary writes them.
    assert.equal(summary.text, '2 runs · 5.7 s · 0.75 m · 2 errors, 1 warning');
    assert.match(summary.tooltip, /^out: 5\.7 s, 0\.75 m, 2 turns\nback: 0\.0 s, 0\.00 m, 0 turns$/);
  });

  it('says there are errors when a plan has errors but no wrap problem (no wheel)', () => {
    const summary = statusSummary(checkPlan('track 112\nstart (0, 0) heading 0\ndrive 100'));
    assert.match(summary.text, /1 error$/);
  });

  it('reads the same as the command line\'s summary and the drawing\'s legend', () => {
    const plan = 'wheel 56\ntrack 112\nstart (0, 0) heading 0\ndrive 3094.2\nturn 90';
    const r = checkPlan(plan);
    const summary = statusSummary(r);
    const line = runSummaryLine(r.runs[0]);
    const svg = renderSvg(r, { standalone: true });
    const [, time, distance] = summary.parts;
    assert.ok(line.includes(`${distance}, ${time}`), `${line} vs ${summary.text}`);
    assert.ok(svg.includes(`· ${time}`), 'the legend shows the same time');
  });
});

describe('insight: hovers on the words of the language', () => {
  const text = 'wheel 58 mm\ntrack 121 mm effective 123 mm\nbody 140 by 170 axle -25\nstart (0, 0) heading 0\nturn 90 pivot left';
  const res = checkPlan(text);
  const at = (line: number, character: number) => hoverAt(res, text, { line, character })?.markdown ?? '';

  it('explains `effective` with the motor degrees it leads to', () => {
    const md = at(1, 15);
    assert.match(md, /^\*\*effective\*\*/);
    // A 90° spin on the 123 mm effective track and 58 mm wheels: (123/2)(π/2) / (π · 58) · 360 = 190.9° (arc length over circumference).
    assert.ok(md.includes(`${(((123 / 2) * (Math.PI / 2)) / (Math.PI * 58) * 360).toFixed(1)}°`), md);
    assert.match(md, /measured 121 mm/);
  });

  it('explains `axle` in plain words first', () => {
    assert.match(at(2, 17), /point midway between the wheels \(the axle midpoint\)/);
  });

  it('explains `gyro` by where it stands: the statement, `noise gyro`, `by gyro`', () => {
    const plan = 'wheel 56 mm mismatch 1.004\nmotor 900 deg/s stall 6%\ngyro sample 5 ms delay 20 ms scale 1.02\nnoise gyro 2 deg\ntrack 112\nstart (0, 0) heading 0\nturn 90 by gyro';
    const r = checkPlan(plan);
    const hover = (line: number, character: number) => hoverAt(r, plan, { line, character })?.markdown ?? '';
    // The values shown are this plan's, as written above.
    assert.equal(hover(2, 2), '**gyro**: the yaw sensor as the robot\'s control loop reads it: `sample` (how often the loop runs), `delay` (how old each reading is) and `scale` (reading over the true angle). Here sample 5 ms, delay 20 ms, scale 1.02.');
    assert.match(hover(3, 8), /^\*\*noise gyro\*\*: the spread/);
    assert.match(hover(6, 13), /\*\*by gyro\*\*: turn until the yaw sensor reads the target/);
    assert.match(hover(0, 14), /^\*\*mismatch\*\*: the right wheel's diameter over the left wheel's.* Here 1\.004: the right wheel is 0\.4 % larger\.$/);
    assert.match(hover(1, 18), /^\*\*stall\*\*: the lowest power that moves the wheels.* Here 6 % \(default 5 %\)\.$/);
    assert.match(hover(2, 7), /^\*\*sample\*\*: .* Here 5 ms \(default 10 ms\)\.$/);
    assert.match(hover(2, 19), /^\*\*delay\*\*: .* Here 20 ms \(default 0 ms\)\.$/);
    assert.match(hover(2, 31), /^\*\*scale\*\*: .* Here 1\.02 \(default 1\)\.$/);
    // On the values themselves: the value, with the digits it needs.
    assert.equal(hover(0, 23), '**1.004** (number)');
    assert.equal(hover(2, 13), '**5 ms** (time)');
  });

  it('on a motion line, the numbers come first and the word\'s meaning after', () => {
    const md = at(4, 10);
    assert.ok(md.indexOf('motors L') < md.indexOf('**pivot**'), md);
    assert.match(md, /effective track, 123 mm \(measured: 121 mm\)/);
  });
});
