import { strict as assert } from 'node:assert';
import { checkPlan, ExpressionCache } from '../../src/core';
import type { CheckResult, Dimension } from '../../src/core/types';
import { evaluateExpr, type EvalContext, type Expected } from '../../src/core/units/evaluate';

// Units and expressions (spec section 1): math.js behind a sandbox, canonical
// units inside (mm, deg, s, mm/s, deg/s, mm/s², fractions).

function value(text: string, expected: Expected, ctx: Partial<EvalContext> = {}): { value: number; dimension: Dimension } {
  const out = evaluateExpr(new ExpressionCache(), text, expected, { lengthUnit: 'mm', scope: new Map(), ...ctx });
  assert.ok(out.ok, `${text}: ${out.ok ? '' : out.message}`);
  return { value: out.value, dimension: out.dimension };
}

function problem(text: string, expected: Expected): { code: string; message: string } {
  const out = evaluateExpr(new ExpressionCache(), text, expected, { lengthUnit: 'mm', scope: new Map() });
  assert.ok(!out.ok, `${text} should not evaluate`);
  return { code: out.code, message: out.message };
}

function near(actual: number, expected: number, what: string): void {
  assert.ok(Math.abs(actual - expected) <= 1e-9 * Math.max(1, Math.abs(expected)), `${what}: expected ${expected}, got ${actual}`);
}

function diagnosticsOf(lines: string[]): [number, string][] {
  const r: CheckResult = checkPlan(lines.join('\n'));
  return r.diagnostics.map((d) => [d.range.start.line, d.code]);
}

describe('evaluate: units', () => {
  it('`deg/min` is a rate although `min` is also a function', () => {
    // 60 deg/min = 1 deg/s (unit definitions: 1 min = 60 s).
    near(value('60 deg/min', 'angularSpeed').value, 1, 'deg/min');
    // And `min` still works as a function where it is called.
    near(value('min(3, 4) cm', 'length').value, 30, 'min() as a function');
  });

  it('`rpm` is a revolution per minute', () => {
    // 150 rpm = 150 · 360 / 60 deg/s = 900 deg/s (unit definition).
    near(value('150 rpm', 'angularSpeed').value, 900, 'rpm');
  });

  it('`50%` is 0.5, and a bare number where a power belongs is read as percent', () => {
    // 50 % = 0.5 (definition of percent).
    assert.deepEqual(value('50%', 'fraction'), { value: 0.5, dimension: 'fraction' });
    assert.deepEqual(value('60', 'fraction'), { value: 0.6, dimension: 'fraction' });
    assert.deepEqual(value('25%', 'power|speed'), { value: 0.25, dimension: 'fraction' });
  });

  it('bare numbers are in the file\'s length unit, and in degrees for angles', () => {
    // Unit definitions: 1 cm = 10 mm, 1 in = 25.4 mm, 1 m = 1000 mm.
    near(value('12', 'length', { lengthUnit: 'cm' }).value, 120, 'cm');
    near(value('2', 'length', { lengthUnit: 'in' }).value, 50.8, 'in');
    near(value('1.5', 'length', { lengthUnit: 'm' }).value, 1500, 'm');
    near(value('3 mm', 'length', { lengthUnit: 'm' }).value, 3, 'explicit unit wins');
    near(value('90', 'angle').value, 90, 'bare angle');
    // π rad = 180° (definition of the radian).
    near(value('pi rad', 'angle').value, 180, 'radians');
    near(value('2', 'acceleration', { lengthUnit: 'cm' }).value, 20, 'bare acceleration in file units per s²');
    near(value('0.8 m/s^2', 'acceleration').value, 800, 'acceleration');
    near(value('30 cm/s', 'power|speed').value, 300, 'linear speed');
    near(value('250 ms', 'time').value, 0.25, 'time');
  });

  it('a value of the wrong dimension is an error naming both dimensions', () => {
    const lengthForAngle = problem('10 cm', 'angle');
    assert.equal(lengthForAngle.code, 'unit');
    assert.match(lengthForAngle.message, /an angle/);
    assert.match(lengthForAngle.message, /is a length/);
    const speedWithoutTime = problem('100 mm', 'power|speed');
    assert.match(speedWithoutTime.message, /a speed/);
    assert.match(speedWithoutTime.message, /is a length/);
    const timeForLength = problem('2 s', 'length');
    assert.match(timeForLength.message, /a length/);
    assert.match(timeForLength.message, /is a time/);
  });

  it('numbers that are not finite are refused', () => {
    assert.equal(problem('1e400', 'length').code, 'unit');
    assert.equal(problem('1/0', 'length').code, 'unit');
  });

  it('in a plan, each problem sits on its own line and the rest is still checked', () => {
    assert.deepEqual(diagnosticsOf(['wheel 56', 'track 160', 'start (0, 0) heading 10 cm', 'drive 100 speed 100 mm', 'drive 100']), [
      [2, 'unit'], [3, 'unit'],
    ]);
  });
});

describe('evaluate: names', () => {
  it('`let` names are usable later, in the file\'s units', () => {
    const r = checkPlan(['units cm', 'wheel 5.6', 'track 16', 'let lane = 25', 'let far = 2 * 25 cm + 1 m', 'start (lane, far) heading 0'].join('\n'));
    assert.deepEqual(r.diagnostics, []);
    const start = r.runs[0].segments[0].end;
    // A bare 25 bound by `let` is read in cm where a length is expected: 250 mm; 2 · 25 cm + 1 m = 1500 mm (unit definitions).
    near(start.x, 250, 'x');
    near(start.y, 1500, 'y');
  });

  it('an unknown name is a name error on the name itself, with a suggestion when close', () => {
    const r = checkPlan(['wheel 56', 'track 160', 'let lane = 250', 'start (0, 0) heading 0', 'drive 2 * lnae'].join('\n'));
    const d = r.diagnostics.find((x) => x.code === 'name')!;
    assert.equal(d.range.start.line, 4);
    assert.equal(d.range.start.character, 10);
    assert.equal(d.range.end.character, 14);
    assert.match(d.message, /lane/);
    assert.equal(d.fixes?.[0].edits[0].newText, 'lane');
  });

  it('rebinding a name is an error pointing at the first binding', () => {
    const r = checkPlan(['let a = 1', 'let a = 2'].join('\n'));
    const d = r.diagnostics.find((x) => x.code === 'name')!;
    assert.equal(d.range.start.line, 1);
    assert.equal(d.related?.[0].range.start.line, 0);
  });

  it('keywords, option names, math.js functions and units cannot be bound', () => {
    assert.deepEqual(diagnosticsOf(['let turn = 1', 'let speed = 2', 'let sqrt = 3', 'let cm = 4', 'let pi = 3', 'let okay = 5']), [
      [0, 'name'], [1, 'name'], [2, 'name'], [3, 'name'], [4, 'name'],
    ]);
  });

  it('assignments inside an expression are refused', () => {
    assert.deepEqual(diagnosticsOf(['wheel 56', 'start (0, 0) heading 0', 'drive x = 3']).map(([line]) => line), [2]);
  });
});

describe('evaluate: the sandbox', () => {
  const forbidden = ['import({}, {override: true})', 'evaluate("1")', 'createUnit("furlong2", "201 m")', 'parse("1")', 'compile("1")', 'simplify("x")'];
  for (const text of forbidden) {
    it(`\`${text}\` is unavailable to plan text`, () => {
      const r = checkPlan(['wheel 56', 'start (0, 0) heading 0', `drive ${text}`].join('\n'));
      assert.equal(r.diagnostics.length, 1);
      assert.equal(r.diagnostics[0].severity, 'error');
      assert.equal(r.diagnostics[0].range.start.line, 2);
    });
  }

  it('refusing them leaves the instance intact for later checks', () => {
    checkPlan('wheel 56\nstart (0, 0) heading 0\ndrive createUnit("zork", "1 m")\ndrive import({cm: 5}, {override: true})');
    // `zork` stays unknown (written after a number, it is reported as an unknown unit), and cm is still 10 mm (unit definition).
    assert.equal(problem('2 zork', 'length').code, 'unit');
    assert.equal(problem('zork', 'length').code, 'name');
    near(value('3 cm', 'length').value, 30, 'cm');
  });

  it('a cached compile gives the same value with a different scope', () => {
    const cache = new ExpressionCache();
    const a = evaluateExpr(cache, '2 * k', 'length', { lengthUnit: 'mm', scope: new Map([['k', 5]]) });
    const b = evaluateExpr(cache, '2 * k', 'length', { lengthUnit: 'mm', scope: new Map([['k', 7]]) });
    assert.ok(a.ok && b.ok);
    assert.equal(a.value, 10);
    assert.equal(b.value, 14);
    assert.equal(cache.misses, 1);
    assert.equal(cache.hits, 1);
  });
});

describe('evaluate: messages for mixed kinds', () => {
  it('a plain number added to a length says to give the number its unit', () => {
    const r = checkPlan('wheel 56\nlet lane = 250\nstart (0, 0) heading 0\ndrive lane + 10 cm');
    assert.equal(r.diagnostics.length, 1);
    assert.equal(r.diagnostics[0].code, 'unit');
    assert.match(r.diagnostics[0].message, /mixes a plain number with a quantity that has a unit/);
  });

  it('a length added to an angle says the kinds differ', () => {
    const r = checkPlan('wheel 56\nstart (0, 0) heading 0\ndrive 10 cm + 5 deg');
    assert.equal(r.diagnostics[0].code, 'unit');
    assert.match(r.diagnostics[0].message, /quantities of different kinds/);
  });
});

describe('a let name holding a percentage', () => {
  it('stays a percentage where a power is expected (`let top = 60%` then `speed top` is 60 %, not 0.6 %)', () => {
    const r = checkPlan(['wheel 56 mm', 'track 120 mm', 'let top = 60%', 'let two = 2', 'start (0, 0) heading 0',
      'drive 100 speed top', 'drive 100 speed top - 10%', 'drive 100 speed two', 'drive 100 speed 3% + 1%'].join('\n'));
    // The values as written: 60 %, 60 % − 10 % = 50 % (a percent is always a hundredth, never a share of
    // what stands before it), a bare 2 read as 2 % (docs/language.md, bare numbers), and 3 % + 1 % = 4 %.
    assert.deepEqual(r.runs[0].segments.slice(1).map((s) => Math.round(s.power! * 1e6) / 1e6), [0.6, 0.5, 0.02, 0.04]);
  });
});
