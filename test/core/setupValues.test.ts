import { strict as assert } from 'node:assert';
import { checkPlan } from '../../src/core';
import type { CheckResult, Diagnostic, Range, TurnStmt } from '../../src/core/types';

// The setup values of the controller simulation: `motor ... stall P`,
// `wheel ... mismatch E` and `gyro [sample T] [delay T] [scale F]`. Expected
// values are the values as written, converted to the core's units (power as a
// fraction of full power, times in seconds); defaults are those of the robot
// model's section 1 (stall 5 %, mismatch 1, sample 10 ms, delay 0, scale 1).

function check(lines: string[]): CheckResult {
  return checkPlan(lines.join('\n'));
}

function problems(result: CheckResult): Diagnostic[] {
  return result.diagnostics.filter((d) => d.severity === 'error');
}

/** Exactly one error, of this code, on this line; returns it. */
function oneError(lines: string[], line: number, code: Diagnostic['code']): { result: CheckResult; diagnostic: Diagnostic } {
  const result = check(lines);
  const errors = problems(result);
  assert.deepEqual(errors.map((d) => [d.range.start.line, d.code]), [[line, code]], errors.map((d) => d.message).join('\n'));
  return { result, diagnostic: errors[0] };
}

function span(line: number, start: number, end: number): Range {
  return { start: { line, character: start }, end: { line, character: end } };
}

const DEFAULT_GYRO = { sample: 0.01, delay: 0, scale: 1 }; // robot model section 1: 10 ms, 0 ms, 1

describe('setup: defaults of the simulation values', () => {
  it('a plan without them gets stall 5 %, mismatch 1 and the default gyro', () => {
    const r = check(['wheel 56 mm', 'motor 900 deg/s lag 80 ms']);
    assert.deepEqual(problems(r), []);
    assert.equal(r.setup.robot.stall, 0.05); // 5 % of full power
    assert.equal(r.setup.robot.mismatch, 1);
    assert.deepEqual(r.setup.gyro, DEFAULT_GYRO);
  });

  it('an empty plan has them too', () => {
    const r = checkPlan('');
    assert.deepEqual([r.setup.robot.stall, r.setup.robot.mismatch, r.setup.gyro], [0.05, 1, DEFAULT_GYRO]);
  });

  it('setting one gyro option keeps the defaults of the others', () => {
    const r = check(['gyro delay 4 ms']);
    assert.deepEqual(problems(r), []);
    assert.deepEqual(r.setup.gyro, { sample: 0.01, delay: 0.004, scale: 1 }); // 4 ms as written, in seconds
  });
});

describe('setup: motor stall', () => {
  it('reads a power as written: `6%` and a bare `6` are both 6 % of full power', () => {
    assert.equal(check(['motor 900 deg/s lag 60 ms stall 6%']).setup.robot.stall, 0.06);
    assert.equal(check(['motor 900 stall 6']).setup.robot.stall, 0.06); // a bare power is per cent (docs/language.md)
    const r = check(['motor 900 stall 2 * 3%']);
    assert.deepEqual(problems(r), []);
    assert.ok(Math.abs(r.setup.robot.stall! - 0.06) < 1e-12); // 2 × 3 % as written
    assert.equal(r.setup.robot.motorLag, 0.08, 'lag keeps its default'); // 80 ms, DEFAULTS
  });

  it('accepts 0 % (no friction) and anything below 100 %', () => {
    assert.equal(check(['motor 900 stall 0%']).setup.robot.stall, 0);
    assert.equal(check(['motor 900 stall 99.5%']).setup.robot.stall, 0.995);
  });

  it('refuses a negative stall power, saying what it is', () => {
    const { result, diagnostic } = oneError(['motor 900 stall -2%'], 0, 'setup');
    assert.equal(diagnostic.message, 'The stall power cannot be negative (it is -2 %): it is the power below which static friction holds the wheels still. Measure it by raising the power until the robot just creeps, e.g. `motor 900 deg/s stall 6%`.');
    assert.deepEqual(diagnostic.range, span(0, 16, 19)); // `-2%` is columns 16..19
    assert.equal(result.setup.robot.stall, 0.05, 'the default stays');
  });

  it('refuses 100 % and more: the wheels would never move', () => {
    for (const [text, shown] of [['100%', '100'], ['120', '120']]) {
      const { result, diagnostic } = oneError([`motor 900 stall ${text}`], 0, 'setup');
      assert.equal(diagnostic.message, `A stall power of ${shown} % means the wheels would never move, not even at full power: it is the power below which static friction holds them still, and must be below 100 %. Measure it by raising the power until the robot just creeps, e.g. \`motor 900 deg/s stall 6%\`.`);
      assert.equal(result.setup.robot.stall, 0.05);
    }
  });

  it('a value of the wrong kind is a unit problem', () => {
    const { diagnostic } = oneError(['motor 900 stall 6 mm'], 0, 'unit');
    assert.equal(diagnostic.message, 'Expected a percentage such as `50%`, but `6 mm` is a length');
    assert.deepEqual(diagnostic.range, span(0, 16, 20)); // `6 mm`
  });

  it('a huge value is beyond any robot before it is out of range', () => {
    const { diagnostic } = oneError(['motor 900 stall 1e6%'], 0, 'setup');
    assert.match(diagnostic.message, /far beyond anything a small robot's plan can mean/);
  });
});

describe('setup: wheel mismatch', () => {
  it('reads the ratio as written', () => {
    const r = check(['wheel 56 mm mismatch 1.004']);
    assert.deepEqual(problems(r), []);
    assert.deepEqual([r.setup.robot.wheelDiameter, r.setup.robot.mismatch], [56, 1.004]);
    assert.equal(check(['wheel 56 mismatch 55.8 / 56']).setup.robot.mismatch, 55.8 / 56); // the two diameters as written
  });

  it('accepts the ends of its range, 0.8 and 1.25', () => {
    assert.equal(check(['wheel 56 mismatch 0.8']).setup.robot.mismatch, 0.8);
    assert.equal(check(['wheel 56 mismatch 1.25']).setup.robot.mismatch, 1.25);
  });

  it('refuses zero and negative ratios', () => {
    for (const [value, shown] of [['0', '0'], ['-1.004', '-1.004']]) {
      const { result, diagnostic } = oneError([`wheel 56 mm mismatch ${value}`], 0, 'setup');
      assert.equal(diagnostic.message, `The wheel mismatch must be greater than zero (it is ${shown}): it is the right wheel's diameter over the left wheel's, 1 for two equal wheels, e.g. \`wheel 56 mm mismatch 1.004\`.`);
      assert.deepEqual(diagnostic.range, span(0, 21, 21 + value.length)); // the value after `mismatch `
      assert.equal(result.setup.robot.mismatch, 1, 'the default stays');
      assert.equal(result.setup.robot.wheelDiameter, 56, 'the diameter is still set');
    }
  });

  it('refuses wheels that are not of one size', () => {
    const large = oneError(['wheel 56 mismatch 1.3'], 0, 'setup').diagnostic;
    assert.equal(large.message, "A mismatch of 1.3 makes the right wheel 30 % larger than the left: not two wheels of one size, and the robot would curve hard to one side on every drive. It is the right wheel's diameter over the left wheel's, between 0.8 and 1.25 and usually within a few thousandths of 1 (measure both wheels, or drive 2 m and see which way the robot drifts), e.g. `wheel 56 mm mismatch 1.004`.");
    const small = oneError(['wheel 56 mismatch 0.79'], 0, 'setup').diagnostic;
    assert.match(small.message, /^A mismatch of 0\.79 makes the right wheel 21 % smaller than the left: not two wheels of one size/); // 1 − 0.79 = 21 %
  });

  it('a value with a unit is a unit problem', () => {
    for (const value of ['2 mm', '100.4%']) {
      const { diagnostic } = oneError([`wheel 56 mismatch ${value}`], 0, 'unit');
      assert.match(diagnostic.message, /^Expected a plain number/);
    }
  });
});

describe('setup: the gyro statement', () => {
  it('reads all three values as written', () => {
    const r = check(['gyro sample 5 ms delay 20 ms scale 1.02']);
    assert.deepEqual(problems(r), []);
    assert.deepEqual(r.setup.gyro, { sample: 0.005, delay: 0.02, scale: 1.02 }); // 5 ms and 20 ms in seconds
    // Bare times are seconds (docs/language.md).
    assert.deepEqual(check(['gyro sample 0.02 delay 0.01']).setup.gyro, { sample: 0.02, delay: 0.01, scale: 1 });
  });

  it('accepts the ends of its ranges', () => {
    assert.deepEqual(check(['gyro sample 0.5 s delay 1 s scale 2']).setup.gyro, { sample: 0.5, delay: 1, scale: 2 });
    assert.deepEqual(check(['gyro sample 1 ms delay 0 ms scale 0.5']).setup.gyro, { sample: 0.001, delay: 0, scale: 0.5 });
  });

  const rangeCases: [string, string, string][] = [
    // the option as written, its columns in `gyro OPTION` (counted by hand), the message
    ['sample 0', '12..13', 'The gyro sample period must be greater than zero (it is 0 ms): it is how often the robot\'s control loop reads the gyro and sets the motors, usually every 5 to 20 ms, e.g. `gyro sample 10 ms`.'],
    ['sample -5 ms', '12..17', 'The gyro sample period must be greater than zero (it is -5 ms): it is how often the robot\'s control loop reads the gyro and sets the motors, usually every 5 to 20 ms, e.g. `gyro sample 10 ms`.'],
    ['sample 600 ms', '12..18', 'A sample period of 600 ms is too slow for a control loop: the robot would read the gyro and set its motors only every 600 ms and swing far past its targets. It is how often the control loop runs, at most 500 ms and usually 5 to 20 ms, e.g. `gyro sample 10 ms`.'],
    ['delay -1 ms', '11..16', 'The gyro delay cannot be negative (it is -1 ms): a reading cannot arrive before the robot turns. It is how old a reading is when the code uses it, 0 for a fresh one, e.g. `gyro delay 5 ms`.'],
    ['delay 2 s', '11..14', 'A gyro delay of 2 s is not a working sensor: the robot would act on readings more than 1 s old and swing far past every target. It is how old a reading is when the code uses it, usually a few milliseconds, e.g. `gyro delay 5 ms`.'],
    ['scale 0', '11..12', 'The gyro scale must be greater than zero (it is 0): a sensor that reads no turn, or the opposite turn, would never let a gyro turn reach its target, so the robot would spin on. It is the reading over the true angle turned, 1 for a perfect sensor, e.g. `gyro scale 1.01`.'],
    ['scale -1', '11..13', 'The gyro scale must be greater than zero (it is -1): a sensor that reads no turn, or the opposite turn, would never let a gyro turn reach its target, so the robot would spin on. It is the reading over the true angle turned, 1 for a perfect sensor, e.g. `gyro scale 1.01`.'],
    // 90 / 3 = 30° and 90 / 0.4 = 225°: the turn the robot makes when its reading is F times the true angle.
    ['scale 3', '11..12', 'A gyro scale of 3 means the sensor reads 3 times the angle turned, so a 90° gyro turn would really turn 30°: no working sensor is that far off. It is the reading over the true angle turned, between 0.5 and 2 and usually within a percent or two of 1 (turn the robot ten full turns by hand and compare the reading), e.g. `gyro scale 1.01`.'],
    ['scale 0.4', '11..14', 'A gyro scale of 0.4 means the sensor reads 0.4 times the angle turned, so a 90° gyro turn would really turn 225°: no working sensor is that far off. It is the reading over the true angle turned, between 0.5 and 2 and usually within a percent or two of 1 (turn the robot ten full turns by hand and compare the reading), e.g. `gyro scale 1.01`.'],
  ];
  for (const [option, columns, message] of rangeCases) {
    it(`refuses \`gyro ${option}\` and keeps the default`, () => {
      const { result, diagnostic } = oneError([`gyro ${option}`], 0, 'setup');
      assert.equal(diagnostic.message, message);
      const [start, end] = columns.split('..').map(Number);
      assert.deepEqual(diagnostic.range, span(0, start, end));
      assert.deepEqual(result.setup.gyro, DEFAULT_GYRO);
    });
  }

  it('keeps the good values of a line that also has a bad one', () => {
    const r = check(['gyro sample 20 ms delay 2 s scale 1.01']);
    assert.deepEqual(problems(r).map((d) => d.range), [span(0, 24, 27)]); // `2 s`
    assert.deepEqual(r.setup.gyro, { sample: 0.02, delay: 0, scale: 1.01 });
  });

  it('a value of the wrong kind is a unit problem', () => {
    const r = check(['gyro sample 10 mm delay 1 deg scale 50%']);
    assert.deepEqual(problems(r).map((d) => [d.code, d.message]), [
      ['unit', 'Expected a time such as `2 s`, but `10 mm` is a length'],
      ['unit', 'Expected a time such as `2 s`, but `1 deg` is an angle'],
      ['unit', 'Expected a plain number, but `50%` is a fraction or percentage'],
    ]);
    assert.deepEqual(r.setup.gyro, DEFAULT_GYRO);
  });

  it('is set once: a second `gyro` line is an error pointing at the first, and is not applied', () => {
    const r = check(['gyro sample 10 ms', 'wheel 56 mm', 'gyro scale 1.1']);
    const [diagnostic] = problems(r);
    assert.equal(problems(r).length, 1);
    assert.equal(diagnostic.code, 'setup');
    assert.equal(diagnostic.message, 'The gyro is already set on line 1; a plan sets it once. Remove one of the two lines.');
    assert.deepEqual(diagnostic.range, span(2, 0, 14)); // the whole second line
    assert.deepEqual(diagnostic.related?.map((x) => [x.range, x.message]), [[span(0, 0, 17), 'The gyro first set here']]);
    assert.equal(r.setup.gyro.scale, 1, 'the second line is not applied');
  });

  it('a bare `gyro` is a syntax problem that says what it needs', () => {
    const { diagnostic } = oneError(['gyro'], 0, 'syntax');
    assert.equal(diagnostic.message, '`gyro` needs at least one of `sample`, `delay` or `scale`, e.g. `gyro sample 10 ms delay 5 ms`');
  });
});

describe('setup: `gyro` keeps its other meanings', () => {
  const lines = [
    'wheel 56 mm mismatch 1.002', 'track 120 mm', 'motor 900 deg/s stall 4%',
    'gyro sample 10 ms delay 5 ms scale 1.01', 'noise gyro 2 deg',
    'start (500, 500) heading 0', 'turn 90 by gyro',
  ];

  it('`noise gyro`, `by gyro` and the gyro statement live side by side', () => {
    const r = check(lines);
    assert.deepEqual(problems(r), []);
    assert.equal(r.setup.noise.gyro, 2); // `noise gyro 2 deg` as written
    assert.deepEqual(r.setup.gyro, { sample: 0.01, delay: 0.005, scale: 1.01 });
    const turn = r.ast.statements.find((s) => s.kind === 'turn') as TurnStmt;
    assert.equal(turn.sensing, 'gyro');
    assert.equal(r.runs[0].segments.find((s) => s.line === 6)?.sensing, 'gyro');
  });

  it('`let gyro` and the new option words are refused as reserved', () => {
    for (const word of ['gyro', 'stall', 'mismatch', 'sample', 'delay', 'scale']) {
      const { diagnostic } = oneError([`let ${word} = 3`], 0, 'name');
      assert.equal(diagnostic.message, `\`${word}\` is a word of the plan language and cannot be a name; choose another, e.g. \`${word}_len\`.`);
    }
  });

  it('the values are listed for hovers, with the digits they need', () => {
    const r = check(lines);
    const shown = (line: number) => r.values.filter((v) => v.range.start.line === line).map((v) => `${v.display} (${v.dimension})`);
    assert.deepEqual(shown(0), ['56 mm (length)', '1.002 (number)']);
    assert.deepEqual(shown(2), ['900°/s (angularSpeed)', '4 % (fraction)']);
    assert.deepEqual(shown(3), ['10 ms (time)', '5 ms (time)', '1.01 (number)']);
  });
});
