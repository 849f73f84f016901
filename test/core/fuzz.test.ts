import { strict as assert } from 'node:assert';
import { checkPlan, INTERNAL_FAILURE, MAX_PLAN_CHARS, renderSvg } from '../../src/core';
import { generator } from '../support/random';

// Generated and mutated plans: the checker never throws, every diagnostic
// range lies inside the document, and no input takes long (a hang guard, not
// a speed target). Seeded, so a failure is reproducible; VEER_FUZZ_RUNS raises
// the count for a longer local run (`npm run fuzz:long`).

const RUNS = Math.max(20_000, Number(process.env.VEER_FUZZ_RUNS) || 0);
const SEED = Number(process.env.VEER_FUZZ_SEED) || 0x5eed;
/** Per input; generous on purpose: a slow machine must not fail, a hang must. */
const MAX_MS_PER_INPUT = 2000;

type Rng = ReturnType<typeof generator>;

const NUMBERS = ['0', '1', '-1', '90', '-90', '180', '-180', '360', '0.5', '1e3', '1e308', '1e400', '-0', '12.5'];
const UNITS = ['', ' mm', ' cm', ' m', ' in', ' deg', ' rad', ' s', ' ms', ' mm/s', ' deg/s', ' deg/min', ' rpm', ' mm/s^2', '%'];

function number(r: Rng): string {
  return r.next() < 0.5 ? String(r.int(-400, 2000)) : r.pick(NUMBERS);
}

function value(r: Rng): string {
  const v = number(r) + r.pick(UNITS);
  return r.next() < 0.1 ? `(${v} + ${number(r)}) * 2` : r.next() < 0.05 ? `lane${r.pick(['', ' * 2', ' + 1 mm'])}` : v;
}

const point = (r: Rng) => `(${value(r)}, ${value(r)})`;

/** One statement from the plan language's grammar, with random values. */
function statement(r: Rng): string {
  const templates: ((r: Rng) => string)[] = [
    () => `plan "${r.pick(['Trial', 'Bench \\"B\\"', ''])}"`,
    () => `units ${r.pick(['mm', 'cm', 'm', 'in', 'ft'])}`,
    () => `turns ${r.pick(['clockwise', 'counterclockwise'])}`,
    () => `yaw range ${r.pick(['-180 to 180', '0 to 360', '-90 to 270', '0 to 300'])}`,
    () => `wheel ${value(r)}${r.next() < 0.5 ? ` mismatch ${value(r)}` : ''}`,
    () => `track ${value(r)}${r.next() < 0.5 ? ` effective ${value(r)}` : ''}`,
    () => `gear ${number(r)}`,
    () => `motor ${value(r)}${r.next() < 0.5 ? ` lag ${value(r)}` : ''}${r.next() < 0.5 ? ` stall ${value(r)}` : ''}`,
    () => `gyro${r.next() < 0.7 ? ` sample ${value(r)}` : ''}${r.next() < 0.5 ? ` delay ${value(r)}` : ''}${r.next() < 0.5 ? ` scale ${value(r)}` : ''}`,
    () => `body ${value(r)} by ${value(r)}${r.next() < 0.5 ? ` axle ${value(r)}` : ''}`,
    () => `field ${value(r)} by ${value(r)}${r.next() < 0.5 ? ` grid ${value(r)}` : ''}`,
    () => `box "b${r.int(0, 3)}" ${point(r)} to ${point(r)}`,
    () => `circle "c${r.int(0, 3)}" ${point(r)} radius ${value(r)}`,
    () => `zone "z${r.int(0, 2)}" ${point(r)} to ${point(r)}`,
    () => `noise drive ${value(r)} turn ${value(r)} gyro ${value(r)} drift ${value(r)}`,
    () => `limit ${value(r)}`,
    () => `let ${r.pick(['lane', 'gap', 'turn', 'sqrt', 'x1'])} = ${value(r)}`,
    () => `run "r${r.int(0, 3)}"`,
    () => `start ${point(r)} heading ${value(r)}`,
    () => `drive ${value(r)}${r.next() < 0.3 ? ` speed ${value(r)}` : ''}${r.next() < 0.3 ? ` hold ${value(r)}${r.next() < 0.5 ? ' step' : ''}` : ''}${r.next() < 0.2 ? ` gain ${value(r)}` : ''}${r.next() < 0.2 ? ` ramp ${value(r)}` : ''}`,
    () => `turn ${r.next() < 0.3 ? 'to ' : ''}${value(r)}${r.pick(['', ' spin', ' pivot left', ' pivot right', ` arc ${value(r)}`, ` ratio ${value(r)}`])}${r.next() < 0.2 ? ' reverse' : ''}${r.pick(['', ' by gyro', ' by encoders'])}${r.next() < 0.2 ? ` speed ${value(r)} min ${value(r)}` : ''}${r.next() < 0.1 ? ` gain ${value(r)} stop ${value(r)}` : ''}${r.next() < 0.2 ? ' ramp' : ''}${r.next() < 0.2 ? ' reset' : ''}`,
    () => 'reset yaw',
    () => `square ${r.pick(['front', 'back'])}${r.next() < 0.3 ? ` speed ${value(r)}` : ''}`,
    () => `wait ${value(r)}`,
    () => `mark "m" ${r.pick([`at ${point(r)}`, `heading ${value(r)}`, `in "z${r.int(0, 2)}"`, `at ${point(r)} within ${value(r)}`])}`,
    () => `# ${r.pick(['note', 'drive 100', '"'])}`,
    // Hostile shapes: long operator chains, long names, huge numbers and angles, the rest of math.js.
    () => `drive ${Array.from({ length: r.int(2, 5000) }, () => '1').join(r.pick(['+', '*', '-', '^', ' + ']))}`,
    () => `drive ${r.pick(['x', 'lane_', 'é'])}${'q'.repeat(r.int(10, 40_000))}`,
    () => `let ${'n'.repeat(r.int(60, 5000))} = 1`,
    () => r.pick([`start (0, ${r.pick(['2e18', '1e9', '-1e300', '1e6'])}) heading 0`, `turn ${r.pick(['1e9', '1e10', '1e300', '3600', '3601', '-1e5'])} ${r.pick(['pivot left', 'arc 100', 'spin', 'ratio 50%'])}`,
      `field ${r.pick(['1e7', '1e6', '3'])} by ${r.pick(['1e7', '1', '2000'])} grid ${r.pick(['1e-6', '0.001', '1', '100'])}`, `wheel ${r.pick(['1e-320', '0.0001', '5000', '56'])}`]),
    () => `wait ${r.pick(HOSTILE_CALLS)}`,
    () => `drive ${r.pick(['300; 500', 'f(x) = x', 'a = 1', '[1, 2]', '{a: 1}', '1:1e9', '"text"', 'lane.x', 'x ? 1 : 2', '2 > 1', '5!'])}`,
  ];
  const indent = r.next() < 0.1 ? '  ' : '';
  const comment = r.next() < 0.1 ? '  # why' : '';
  return indent + r.pick(templates)(r) + comment;
}

/** A plausible plan: the robot set up, then runs of motions. */
function plan(r: Rng): string {
  const lines = ['wheel 56 mm', 'track 160 mm'];
  if (r.next() < 0.5) lines.push('field 2000 by 1200', `box "b9" (${r.int(0, 1800)}, ${r.int(0, 1000)}) to (${r.int(0, 1800)}, ${r.int(0, 1000)})`);
  if (r.next() < 0.3) lines.push('body 150 by 190 axle -30');
  lines.push(`start (${r.int(100, 1900)}, ${r.int(100, 1100)}) heading ${r.int(-180, 360)}`);
  const n = r.int(0, 25);
  for (let i = 0; i < n; i++) lines.push(statement(r));
  return lines.join(r.next() < 0.1 ? '\r\n' : '\n');
}

/** Calls that reach beyond numbers and units: every one must end in a diagnostic, never run. */
const HOSTILE_CALLS = [
  'config({relTol: 10, absTol: 1000}).absTol', "config({number: 'BigNumber'})", 'zeros(1e5, 1e5)', 'ones(1e4, 1e4)', 'range(0, 1e9)',
  'bellNumbers(1e4)', 'random()', 'randomInt(5)', 'import({x: 1})', 'createUnit("foo")', 'evaluate("1")', 'parse("1")',
  'compile("1")', 'simplify("x")', 'derivative("x^2", "x")', 'chain(1)', 'reviver()', 'typed("f", {})', 'factory("a", [], () => 1)',
  'identity(1e4)', 'matrix([[1]])', 'sort([3, 1])', 'format(1)', 'print("$a", {a: 1})', 'Unit.prototype', 'cos.constructor("return 1")()',
  '__proto__', 'constructor', 'toString()', 'isPrime(2^53)', 'factorial(1e6)', 'gamma(1e6)', 'lgamma(5)', 'combinations(1e6, 5e5)',
];

const ODD = ['\u0000', '\u00e9', '\u4e2d', '\ud83d\ude80', '\ud83d', '\u202e', '\ufeff', '\t', '\r\n', '\n', '"', '(', ')', ',', '#', '\\', '%', '^', '=', 'NaN', 'Infinity', '-Infinity', 'undefined', 'null', '1e999999', '9'.repeat(400), '0x1F', '1/0', '((((((((((', '))))', '"unterminated', '\\"', 'import', 'evaluate', '__proto__', 'constructor'];

/** One random edit of the text. */
function mutate(r: Rng, text: string): string {
  const at = r.int(0, text.length);
  switch (r.int(0, 7)) {
    case 0: return text.slice(0, at) + text.slice(at + r.int(1, 8));
    case 1: return text.slice(0, at) + String.fromCharCode(r.int(0, 0xffff)) + text.slice(at);
    case 2: {
      const len = r.int(1, 30);
      return text.slice(0, at) + text.slice(at, at + len) + text.slice(at);
    }
    case 3: {
      const tokens = text.split(/(\s+)/);
      const i = r.int(0, tokens.length - 1);
      const j = r.int(0, tokens.length - 1);
      [tokens[i], tokens[j]] = [tokens[j], tokens[i]];
      return tokens.join('');
    }
    case 4: return text.slice(0, at) + r.pick(ODD) + text.slice(at);
    case 5: return text.slice(0, at) + r.pick(['"', '(', ')', '((', '"("']) + text.slice(at);
    case 6: return text.replace(/\d+(\.\d+)?/, r.pick(['1e308', '1e400', '9'.repeat(50), 'NaN', '-0', '0.0000000001']));
    default: {
      const lines = text.split('\n');
      lines.splice(r.int(0, lines.length), 0, lines[r.int(0, lines.length - 1)]);
      return lines.join('\n');
    }
  }
}

function assertRangesInside(text: string, input: number): void {
  const result = checkPlan(text);
  // No input reaches the top-level guard: every problem is a diagnostic of its own.
  const internal = result.diagnostics.find((d) => d.message.startsWith(INTERNAL_FAILURE));
  assert.equal(internal, undefined, `input ${input}: ${internal?.message}`);
  // The drawing's work is bounded whatever the plan (a few per cent of inputs, to keep the run short).
  if (input % 25 === 0) {
    const svg = renderSvg(result, { standalone: true });
    assert.ok(svg.length < 5_000_000, `input ${input}: a ${svg.length}-character drawing`);
  }
  // Lines end at `\n` (a `\r` before it belongs to the line end): spec section 1.
  const lines = text.split(/\r\n|\r|\n/); // the editor's line breaks, as the parser reads them
  for (const d of result.diagnostics) {
    const { start, end } = d.range;
    const where = `input ${input}, ${d.code} at ${JSON.stringify(d.range)}`;
    assert.ok(Number.isInteger(start.line) && Number.isInteger(start.character) && Number.isInteger(end.line) && Number.isInteger(end.character), where);
    assert.ok(start.line >= 0 && start.character >= 0, where);
    assert.ok(end.line < lines.length, `${where}: line past the end (${lines.length} lines)`);
    assert.ok(start.character <= lines[start.line].length && end.character <= lines[end.line].length, `${where}: column past the end of the line`);
    assert.ok(start.line < end.line || (start.line === end.line && start.character <= end.character), `${where}: start after end`);
    assert.ok(d.message.length > 0, where);
  }
  for (const run of result.runs) {
    for (const s of run.segments) assert.ok(!Number.isNaN(s.duration), `input ${input}: NaN duration on line ${s.line}`);
  }
}

describe('fuzz', function () {
  this.timeout(600_000);

  it(`checks ${RUNS} generated and mutated plans without throwing, with ranges inside the document`, () => {
    const r = generator(SEED);
    let slowest = 0;
    let slowestInput = '';
    for (let i = 0; i < RUNS; i++) {
      let text = plan(r);
      const mutations = r.next() < 0.2 ? 0 : r.int(1, 6);
      for (let m = 0; m < mutations; m++) text = mutate(r, text);
      const started = performance.now();
      try {
        assertRangesInside(text, i);
      } catch (e) {
        throw new Error(`input ${i} (seed ${SEED}): ${(e as Error).message}\n--- plan ---\n${text}`);
      }
      const ms = performance.now() - started;
      if (ms > slowest) {
        slowest = ms;
        slowestInput = text;
      }
    }
    assert.ok(slowest < MAX_MS_PER_INPUT, `slowest input took ${slowest.toFixed(0)} ms:\n${slowestInput}`);
    console.log(`      fuzz: ${RUNS} inputs, slowest ${slowest.toFixed(1)} ms`);
  });

  it('a plan at the size limit with very long lines is checked without hanging', () => {
    // Long lines are where a parser goes quadratic: 10,000-character comments,
    // sums, strings and unbalanced parentheses, between ordinary motions.
    const long = [
      `# ${'note '.repeat(2_000)}`,
      `drive ${'1 + '.repeat(2_500)}1`,
      `plan "${'x'.repeat(10_000)}`,
      `turn ${'('.repeat(5_000)}90`,
      `mark "${'m'.repeat(10_000)}" at (1, 1)`,
    ];
    const lines = ['wheel 56', 'track 160', 'start (50000, 50000) heading 0'];
    let size = 0;
    for (let i = 0; size < MAX_PLAN_CHARS - 20_000; i++) {
      const line = i % 2 === 0 ? long[(i / 2) % long.length] : 'turn 90 by gyro reset';
      lines.push(line);
      size += line.length + 1;
    }
    const text = lines.join('\n');
    assert.ok(text.length >= MAX_PLAN_CHARS - 20_000 && text.length <= MAX_PLAN_CHARS);
    const started = performance.now();
    const result = checkPlan(text);
    const ms = performance.now() - started;
    assert.ok(result.runs[0].segments.length > 100);
    // A hang guard: minutes would be a hang; seconds is a large file.
    assert.ok(ms < 30_000, `${ms} ms`);
    console.log(`      ${(text.length / 1e6).toFixed(1)} MB of long lines: ${ms.toFixed(0)} ms`);
  });

  it('a plan over the size limit (a 10 MB file) is refused at once with a clear message', () => {
    const text = 'drive 10\n'.repeat(Math.ceil(10_000_000 / 9));
    assert.ok(text.length > MAX_PLAN_CHARS);
    const started = performance.now();
    const result = checkPlan(text);
    assert.ok(performance.now() - started < 1000);
    assert.equal(result.diagnostics.length, 1);
    assert.match(result.diagnostics[0].message, /million characters/);
    assert.deepEqual(result.runs, []);
  });
});
