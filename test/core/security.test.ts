import { strict as assert } from 'node:assert';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { all, create } from 'mathjs';
import { checkPlan, ExpressionCache, INTERNAL_FAILURE, renderSvg, toJsonDocument } from '../../src/core';
import type { CheckResult, DiagnosticCode } from '../../src/core/types';
import { runCli } from '../../src/cli/main';

// A plan is data. Whatever a hostile or careless plan says, the check ends in
// diagnostics on the offending lines, quickly, with the rest of the file, the
// other files and the process unharmed. Each case below was once a crash, a
// hang, a corruption or a silent wrong answer.

/** A hang guard, not a speed target: a case that takes longer is broken, not slow. */
const MAX_MS = 2000;

const ROBOT = ['wheel 56 mm', 'track 112 mm'];

function timedCheck(lines: string[], cache?: ExpressionCache): { result: CheckResult; ms: number } {
  const started = performance.now();
  const result = checkPlan(lines.join('\n'), cache ? { cache } : {});
  return { result, ms: performance.now() - started };
}

/** Checks the plan and asserts a diagnostic of `code` on 0-based `line` (and no internal failure), within the time guard. */
function expectProblem(lines: string[], line: number, code: DiagnosticCode, message?: RegExp, cache?: ExpressionCache): CheckResult {
  const { result, ms } = timedCheck(lines, cache);
  assert.ok(ms < MAX_MS, `took ${ms.toFixed(0)} ms`);
  assert.equal(result.diagnostics.find((d) => d.message.startsWith(INTERNAL_FAILURE)), undefined);
  const found = result.diagnostics.filter((d) => d.range.start.line === line && d.code === code);
  assert.ok(found.length > 0, `no ${code} on line ${line}: ${JSON.stringify(result.diagnostics.map((d) => [d.range.start.line, d.code, d.message.slice(0, 100)]))}`);
  if (message) assert.ok(found.some((d) => message.test(d.message)), `${found.map((d) => d.message).join(' | ')} does not match ${message}`);
  for (const d of result.diagnostics) assert.ok(d.message.length <= 600, `a ${d.message.length}-character message`);
  return result;
}

/** A clean plan whose numbers depend on math settings: `max`, tolerances, number type. */
const REFERENCE = [...ROBOT, 'let a = max(100, 300) * 1 mm', 'let b = 0.1 + 0.2', 'start (1000, 1000) heading 0', 'drive a', 'turn 45.5 by gyro', 'wait b'];

function referenceDoc(cache?: ExpressionCache): string {
  return JSON.stringify(toJsonDocument('reference.veer', checkPlan(REFERENCE.join('\n'), cache ? { cache } : {})));
}

describe('security: shared state', () => {
  const hostile = [
    'config({relTol: 10, absTol: 1000}).absTol', "config({number: 'BigNumber'})", 'import({max: 1}, {override: true})',
    'createUnit("mm", "2 m", {override: true})', 'evaluate("max = 1")', 'cos.constructor("return process")()', 'typed.addConversion({})',
  ];

  it('refuses every route to the math settings, and the next plan computes max(100, 300) = 300', () => {
    const before = referenceDoc();
    for (const expr of hostile) expectProblem([...ROBOT, `let k = ${expr}`], 2, 'syntax');
    const after = referenceDoc();
    assert.equal(after, before);
    // 300 mm: the larger of the two (the definition of max).
    assert.equal(JSON.parse(after).runs[0].segments[1].end.y_mm, 1300);
  });

  it('no expression, whatever math.js function it calls, changes the result of another check', () => {
    // Every name math.js knows, called a few ways and used bare: each ends in a
    // diagnostic or a value, and the reference plan checks the same after all of them.
    const names = Object.keys(create(all)).filter((n) => /^[A-Za-z_][A-Za-z0-9_]*$/.test(n));
    assert.ok(names.length > 300, `${names.length} names`);
    const cache = new ExpressionCache();
    const before = referenceDoc(cache);
    for (const name of names) {
      for (const call of [`${name}`, `${name}(2)`, `${name}(2, 3)`, `${name}("x")`, `${name}({a: 1})`]) {
        const { result, ms } = timedCheck([...ROBOT, `wait ${call}`, 'start (0, 0) heading 0'], cache);
        assert.ok(ms < MAX_MS, `${call}: ${ms} ms`);
        assert.equal(result.diagnostics.find((d) => d.message.startsWith(INTERNAL_FAILURE)), undefined, call);
      }
    }
    assert.equal(referenceDoc(cache), before);
    assert.equal(referenceDoc(), before);
  });
});

describe('security: crashes and costly expressions', () => {
  it('a chain of 4,000 operators is refused with a clear message, not a stack overflow', () => {
    const chain = Array.from({ length: 4001 }, () => '1').join('+');
    const r = expectProblem([...ROBOT, 'start (0, 0) heading 0', `drive ${chain}`], 3, 'syntax', /at most 400/);
    // The message quotes the expression briefly, not all 8,000 characters.
    assert.ok(r.diagnostics[0].message.length < 400);
  });

  it('an unknown name of 32,768 characters is a clear diagnostic', () => {
    expectProblem([...ROBOT, 'start (0, 0) heading 0', `drive ${'q'.repeat(32_768)}`], 3, 'syntax', /at most 400/);
    expectProblem([...ROBOT, `let ${'n'.repeat(32_768)} = 5`], 2, 'syntax', /at most 64/);
  });

  it('parentheses nested thousands deep are refused', () => {
    expectProblem([...ROBOT, 'start (0, 0) heading 0', `turn ${'('.repeat(60)}90${')'.repeat(60)}`], 3, 'syntax', /nest more than/);
  });

  for (const expr of ['zeros(1e5, 1e5)', 'range(0, 1e9)', 'bellNumbers(1e4)', 'ones(1e4, 1e4)', 'random()', 'factorial(1e6)', 'identity(1e5)', 'combinations(1e6, 5e5)']) {
    it(`\`${expr}\` never runs: a diagnostic at once`, () => {
      expectProblem([...ROBOT, `let k = ${expr}`], 2, 'syntax', /not available in plan files/);
    });
  }

  it('a plan checks the same every time (nothing random can be written)', () => {
    const text = [...ROBOT, 'let k = random()', 'start (0, 0) heading 0', 'drive 100'].join('\n');
    assert.equal(JSON.stringify(toJsonDocument('x', checkPlan(text))), JSON.stringify(toJsonDocument('x', checkPlan(text))));
  });
});

describe('security: huge values and the drawing', () => {
  const cases: [string, string[], number][] = [
    ['a start 2e18 mm away, with no field', [...ROBOT, 'start (0, 2e18) heading 0', 'drive 100'], 2],
    ['a pivot of a billion degrees', [...ROBOT, 'start (0, 0) heading 0', 'turn 1e9 pivot left'], 3],
    ['a pivot of 1e10 degrees', [...ROBOT, 'start (0, 0) heading 0', 'turn 1e10 pivot left'], 3],
    ['an arc of 1e300 degrees', [...ROBOT, 'start (0, 0) heading 0', 'turn 1e300 arc 100'], 3],
    ['a field of 1e9 mm with a 1 mm grid', [...ROBOT, 'field 1e9 by 1e9 grid 1', 'start (0, 0) heading 0'], 2],
  ];
  for (const [what, lines, line] of cases) {
    it(`${what}: a diagnostic, and a small drawing made quickly`, () => {
      const r = expectProblem(lines, line, 'setup', /far beyond/);
      const started = performance.now();
      const svg = renderSvg(r, { standalone: true });
      assert.ok(performance.now() - started < MAX_MS);
      assert.ok(svg.length < 200_000, `${svg.length} characters`);
    });
  }

  it('a tiny grid on a large field draws a bounded number of lines', () => {
    const r = checkPlan([...ROBOT, 'field 900000 by 900000 grid 0.5', 'start (10, 10) heading 0'].join('\n'));
    const svg = renderSvg(r, { standalone: true });
    assert.ok(svg.length < 200_000, `${svg.length} characters`);
  });
});

describe('security: values that would give wrong results without a word', () => {
  const start = 'start (1000, 1000) heading 0';
  const cases: [string, string, RegExp][] = [
    ['a negative linear speed', 'drive 3000 speed -50 mm/s', /would not move the robot/],
    ['a zero linear speed', 'drive 3000 speed 0 mm/s', /would not move the robot/],
    ['a negative gyro gain', 'turn 90 by gyro gain -1', /away from its target/],
    ['a stop band wider than the turn', 'turn 90 by gyro stop 200', /would not turn at all/],
    ['a negative allowed miss', 'mark "m" at (0, 0) within -5', /could never be met/],
    ['a minimum power over 100 %', 'turn 90 by gyro min 150%', /more than full power/],
  ];
  for (const [what, line, message] of cases) {
    it(`${what}: \`${line}\``, () => {
      expectProblem([...ROBOT, start, line], 3, 'setup', message);
    });
  }

  it('a wheel of 1e-320 mm is refused, and the run\'s time is never silently short', () => {
    const r = expectProblem(['wheel 1e-320', 'track 112', 'limit 10 s', start, 'drive 3000'], 0, 'setup', /not a small robot's wheel/);
    // No wheel, so no time is claimed: the drive is incomplete rather than 0 s.
    assert.equal(r.runs[0].segments[1].complete, false);
  });

  it('an infinite time is an error and the run total is unknown, not dropped', () => {
    // A drive at 0 % power has no finite time, and says so.
    const r = expectProblem([...ROBOT, 'limit 10 s', start, 'drive 3000 speed 0%'], 4, 'setup', /would not move the robot/);
    assert.equal(r.runs[0].duration, Infinity);
    assert.equal(JSON.parse(JSON.stringify(toJsonDocument('x', r))).runs[0].duration_s, null);
    assert.ok(!r.diagnostics.some((d) => d.code === 'over-time'), 'no over-time claimed from an unknown total');
  });
});

describe('security: messages', () => {
  it('non-Latin let names: says which names are allowed', () => {
    expectProblem([...ROBOT, 'let längd = 250 mm'], 2, 'syntax', /letters a to z and A to Z, the digits 0 to 9 and `_`/);
    expectProblem([...ROBOT, 'let 距离 = 250 mm'], 2, 'syntax', /letters a to z/);
  });

  it('`drive 300; 500` says what `;` is, not "assignments are not allowed"', () => {
    const r = expectProblem([...ROBOT, 'start (0, 0) heading 0', 'drive 300; 500'], 3, 'syntax', /`;` cannot separate values/);
    assert.ok(!r.diagnostics.some((d) => /assignment/.test(d.message)));
  });

  it('quotes at most 80 characters of an expression', () => {
    const long = `${'lane_length_in_millimetres + '.repeat(12)}1`;
    const r = expectProblem([...ROBOT, 'start (0, 0) heading 0', `drive ${long}`], 3, 'name');
    const quoted = /`([^`]*)`/.exec(r.diagnostics.find((d) => d.range.start.line === 3)!.message)![1];
    assert.ok(quoted.length <= 80, quoted);
  });

  it('NUL and zero-width characters are shown escaped, never raw', () => {
    for (const ch of ['\u0000', '\u200b', '\u202e', '\ufeff']) {
      const r = checkPlan([...ROBOT, 'start (0, 0) heading 0', `drive 10${ch}0`, `zone "do${ch}ck" (0, 0) to (10, 10)`].join('\n'));
      for (const d of r.diagnostics) assert.ok(!d.message.includes(ch), `${JSON.stringify(ch)} raw in: ${d.message}`);
      assert.ok(r.diagnostics.some((d) => d.range.start.line === 4 && /invisible character \(U\+/.test(d.message)), JSON.stringify(r.diagnostics.map((d) => d.message)));
    }
  });

  it('CR-only line ends are read as line ends', () => {
    const r = checkPlan([...ROBOT, 'start (0, 0) heading 0', 'drive 100'].join('\r'));
    assert.deepEqual(r.diagnostics, []);
    assert.equal(r.runs[0].segments[1].end.y, 100);
  });
});

// ---------------------------------------------------------------------------
// The command line

function run(args: string[]) {
  let out = '';
  let err = '';
  const status = runCli(args, { out: (s) => { out += s; }, err: (s) => { err += s; }, isTTY: false });
  return { status, out, err };
}

describe('security: the command line', () => {
  const dir = () => mkdtempSync(join(tmpdir(), 'veer-sec-'));

  it('refuses to write the drawing over the plan, also through a link, and leaves the plan as it was', () => {
    const d = dir();
    const plan = join(d, 'plan.veer');
    const text = [...ROBOT, 'start (0, 0) heading 0', 'drive 100', ''].join('\n');
    writeFileSync(plan, text);
    symlinkSync(plan, join(d, 'link.svg'));
    for (const out of [plan, join(d, '.', 'plan.veer'), join(d, 'link.svg')]) {
      const r = run(['render', plan, '-o', out]);
      assert.equal(r.status, 2, out);
      assert.match(r.err, /is the plan itself/);
      assert.equal(readFileSync(plan, 'utf8'), text);
    }
  });

  it('writes the drawing whole, leaving no temporary file behind', () => {
    const d = dir();
    const plan = join(d, 'plan.veer');
    writeFileSync(plan, [...ROBOT, 'start (0, 0) heading 0', 'drive 100'].join('\n'));
    assert.equal(run(['render', plan, '-o', join(d, 'out.svg')]).status, 0);
    assert.deepEqual(readdirSync(d).sort(), ['out.svg', 'plan.veer']);
    assert.match(readFileSync(join(d, 'out.svg'), 'utf8'), /<\/svg>\s*$/);
  });

  it('refuses a FIFO and a device at once instead of blocking or reading for ever', () => {
    const d = dir();
    const fifo = join(d, 'pipe.veer');
    const made = spawnSync('mkfifo', [fifo]);
    assert.equal(made.status, 0, String(made.stderr));
    const r = run(['check', fifo]);
    assert.equal(r.status, 2);
    assert.match(r.err, /not a regular file/);
    if (existsSync('/dev/zero')) {
      const z = run(['check', '/dev/zero']);
      assert.equal(z.status, 2);
      assert.match(z.err, /not a regular file/);
    }
  });

  it('a process limited to 512 MB of heap survives every hostile plan (the built command)', function () {
    this.timeout(60_000);
    const cli = join(__dirname, '..', '..', 'dist', 'cli.js');
    if (!existsSync(cli)) throw new Error('dist/cli.js is missing: run `npm run build` first (npm test does)');
    const d = dir();
    const plan = join(d, 'hostile.veer');
    writeFileSync(plan, [...ROBOT, 'let a = zeros(1e5, 1e5)', 'let b = range(0, 1e9)', 'let c = ones(1e4, 1e4)', 'let d = bellNumbers(1e4)',
      'start (0, 2e18) heading 0', 'turn 1e10 pivot left', `drive ${Array.from({ length: 4001 }, () => '1').join('+')}`].join('\n'));
    for (const args of [['check', plan], ['render', plan, '-o', join(d, 'x.svg')]]) {
      const r = spawnSync(process.execPath, ['--max-old-space-size=512', join(__dirname, '..', '..', 'bin', 'veer.js'), ...args], { encoding: 'utf8', timeout: 30_000 });
      assert.equal(r.signal, null, `${args[0]} was killed: ${r.stderr}`);
      assert.equal(r.status, 1, `${args[0]}: ${r.stderr}`);
    }
  });
});
