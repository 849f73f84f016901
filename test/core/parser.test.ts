import { strict as assert } from 'node:assert';
import { parsePlan } from '../../src/core/syntax/parser';
import { OPTIONS, RESERVED_WORDS, STATEMENT_KEYWORDS, suggestWord } from '../../src/core/syntax/keywords';
import type {
  Diagnostic, DriveStmt, ExprNode, MarkStmt, Range, Statement, TurnStmt,
} from '../../src/core/types';
import { SPEC_EXAMPLE } from '../support/spec-example';

// Every column below was counted by hand in the source line it refers to.

function parseOne(line: string): Statement {
  const { ast, diagnostics } = parsePlan(line);
  assert.deepEqual(diagnostics.map((d) => d.message), [], `no diagnostics for: ${line}`);
  assert.equal(ast.statements.length, 1, 'one statement per line'); // one line of input
  return ast.statements[0];
}

function parseBad(line: string): Diagnostic {
  const { ast, diagnostics } = parsePlan(line);
  assert.equal(ast.statements.length, 0, `a bad line is left out: ${line}`); // the only line is bad
  assert.equal(diagnostics.length, 1, `exactly one diagnostic for: ${line}`); // one per bad line
  assert.equal(diagnostics[0].code, 'syntax');
  assert.equal(diagnostics[0].severity, 'error');
  return diagnostics[0];
}

function span(line: number, start: number, end: number): Range {
  return { start: { line, character: start }, end: { line, character: end } };
}

function texts(node: Record<string, unknown>, ...keys: string[]): (string | undefined)[] {
  return keys.map((key) => (node[key] as ExprNode | undefined)?.text);
}

/** Checks the contract the editor relies on: every range inside the document and ordered. */
function assertRangesValid(text: string, result: ReturnType<typeof parsePlan>): void {
  const lines = text.split(/\r\n|\r|\n/); // \n, \r\n and a lone \r end a line, as in the editor
  assert.equal(result.ast.lineCount, lines.length);
  const check = (range: Range, what: string): void => {
    for (const pos of [range.start, range.end]) {
      assert.ok(Number.isInteger(pos.line) && pos.line >= 0 && pos.line < lines.length, `${what}: line ${pos.line}`);
      assert.ok(Number.isInteger(pos.character) && pos.character >= 0, `${what}: character ${pos.character}`);
      assert.ok(pos.character <= lines[pos.line].length, `${what}: character ${pos.character} past the line end`);
    }
    const ordered = range.end.line > range.start.line
      || (range.end.line === range.start.line && range.end.character >= range.start.character);
    assert.ok(ordered, `${what}: end before start`);
  };
  for (const diagnostic of result.diagnostics) {
    check(diagnostic.range, 'diagnostic');
    for (const related of diagnostic.related ?? []) check(related.range, 'related');
    for (const fix of diagnostic.fixes ?? []) for (const edit of fix.edits) check(edit.range, 'fix edit');
  }
  const visit = (value: unknown, what: string): void => {
    if (!value || typeof value !== 'object') return;
    const record = value as Record<string, unknown>;
    if ('start' in record && 'end' in record && typeof record.start === 'object') {
      check(record as unknown as Range, what);
      return;
    }
    for (const [key, child] of Object.entries(record)) visit(child, `${what}.${key}`);
  };
  result.ast.statements.forEach((statement, index) => visit(statement, `statement ${index}`));
}

describe('parsePlan', () => {
  describe('the spec example (section 9)', () => {
    const example = SPEC_EXAMPLE + '\n';

    it('parses with no diagnostics and the right statement kinds', () => {
      const { ast, diagnostics } = parsePlan(example);
      assert.deepEqual(diagnostics, []);
      assert.deepEqual(ast.statements.map((s) => s.kind), [
        'plan', 'units', 'wheel', 'track', 'body', 'field', 'box', 'zone', 'limit', 'let', 'run', 'start',
        'drive', 'turn', 'drive', 'turn', 'mark',
      ]);
      assert.equal(ast.lineCount, 20); // 19 lines plus the empty one after the final line break
    });

    it('keeps every expression as its source text', () => {
      const statements = parsePlan(example).ast.statements;
      const byLine = new Map(statements.map((s) => [s.line, s]));
      const s = (line: number) => byLine.get(line) as unknown as Record<string, unknown>;
      assert.deepEqual(texts(s(2), 'diameter'), ['62 mm']); // line 2: `wheel 62 mm`
      assert.deepEqual(texts(s(3), 'width', 'effective'), ['128 mm', '130 mm']);
      assert.deepEqual(texts(s(4), 'width', 'length', 'axle'), ['150', '190', '-30']);
      assert.deepEqual(texts(s(5), 'width', 'height', 'grid'), ['2000', '1200', '100']);
      assert.deepEqual(texts(s(8), 'time'), ['150 s']);
      assert.deepEqual(texts(s(10), 'value'), ['250 mm']);
      assert.deepEqual(texts(s(14), 'distance', 'speed', 'hold'), ['3 * lane', '60%', '0']);
      assert.deepEqual(texts(s(15), 'angle', 'min', 'gain'), ['90', '12%', '1.2']);
      assert.deepEqual(texts(s(16), 'distance', 'hold', 'ramp'), ['1450', '90', '800 mm/s^2']);
      const turn = byLine.get(17) as TurnStmt; // line 17: `turn -90 pivot left`
      assert.equal(turn.angle?.text, '-90');
      assert.deepEqual(turn.shape, { kind: 'pivot', side: 'left' });
      assert.equal((byLine.get(15) as TurnStmt).sensing, 'gyro');
      assert.equal((byLine.get(18) as MarkStmt).inZone?.value, 'dock');
    });
  });

  describe('setup statements', () => {
    it('reads plan, run and their strings', () => {
      const plan = parseOne('plan "Crate yard"');
      assert.equal(plan.kind === 'plan' && plan.title.value, 'Crate yard');
      const run = parseOne('run "second lap"');
      assert.equal(run.kind === 'run' && run.name.value, 'second lap');
    });

    it('reads units and turns as words', () => {
      for (const unit of ['mm', 'cm', 'm', 'in']) {
        const statement = parseOne(`units ${unit}`);
        assert.equal(statement.kind === 'units' && statement.unit.value, unit);
      }
      for (const direction of ['clockwise', 'counterclockwise']) {
        const statement = parseOne(`turns ${direction}`);
        assert.equal(statement.kind === 'turns' && statement.direction.value, direction);
      }
      assert.match(parseBad('units furlong').message, /`units` takes mm, cm, m or in/);
    });

    it('reads yaw range with both keyword words in the keyword range', () => {
      const statement = parseOne('yaw range -180 to 180');
      assert.equal(statement.kind, 'yawRange');
      assert.deepEqual(texts(statement as unknown as Record<string, unknown>, 'lo', 'hi'), ['-180', '180']);
      assert.deepEqual(statement.keywordRange, span(0, 0, 9)); // `yaw range` is columns 0..9
      assert.deepEqual(parseOne('yaw range 0 deg to 360 deg').kind, 'yawRange');
    });

    it('reads the single-value setup lines', () => {
      assert.deepEqual(texts(parseOne('wheel 5.6 cm') as unknown as Record<string, unknown>, 'diameter'), ['5.6 cm']);
      assert.deepEqual(texts(parseOne('gear 12 / 20') as unknown as Record<string, unknown>, 'ratio'), ['12 / 20']);
      assert.deepEqual(texts(parseOne('limit 2 minutes') as unknown as Record<string, unknown>, 'time'), ['2 minutes']);
      assert.deepEqual(texts(parseOne('track 11.2 cm') as unknown as Record<string, unknown>, 'width', 'effective'), ['11.2 cm', undefined]);
      const motor = parseOne('motor 150 rpm lag 0.1 s') as unknown as Record<string, unknown>;
      assert.deepEqual(texts(motor, 'speed', 'lag'), ['150 rpm', '0.1 s']);
      assert.deepEqual(texts(parseOne('motor 900 deg/s') as unknown as Record<string, unknown>, 'speed', 'lag'), ['900 deg/s', undefined]);
    });

    it('reads body and field with their separator words', () => {
      const body = parseOne('body 15 cm by 19 cm');
      assert.deepEqual(texts(body as unknown as Record<string, unknown>, 'width', 'length', 'axle'), ['15 cm', '19 cm', undefined]);
      const field = parseOne('field 2 m by 1.2 m');
      assert.deepEqual(texts(field as unknown as Record<string, unknown>, 'width', 'height', 'grid'), ['2 m', '1.2 m', undefined]);
      assert.match(parseBad('body 150 190').message, /`body` needs a width and a length, e\.g\. `body 150 by 190`/);
    });

    it('reads box, zone and circle', () => {
      const box = parseOne('box "pallet" (0, 0) to (10 cm, 2 * 5 cm)');
      assert.ok(box.kind === 'box');
      assert.equal(box.name.value, 'pallet');
      assert.deepEqual([box.a.x.text, box.a.y.text, box.b.x.text, box.b.y.text], ['0', '0', '10 cm', '2 * 5 cm']);
      assert.deepEqual(box.b.range, span(0, 23, 40)); // `(10 cm, 2 * 5 cm)` spans columns 23..40
      const zone = parseOne('zone "ramp" (1, 2) to (3, 4)');
      assert.ok(zone.kind === 'zone');
      assert.deepEqual([zone.a.x.text, zone.b.y.text], ['1', '4']);
      const circle = parseOne('circle "post" (600, 400) radius 5 cm');
      assert.ok(circle.kind === 'circle');
      assert.deepEqual([circle.center.x.text, circle.center.y.text, circle.radius.text], ['600', '400', '5 cm']);
      assert.deepEqual(circle.optionRanges.radius, span(0, 25, 31)); // `radius` is columns 25..31
    });

    it('reads noise options in any order', () => {
      const noise = parseOne('noise gyro 1 deg drift 0.5 deg/min drive 1% turn 1.5%');
      assert.deepEqual(texts(noise as unknown as Record<string, unknown>, 'drive', 'turn', 'gyro', 'drift'),
        ['1%', '1.5%', '1 deg', '0.5 deg/min']);
      assert.equal(parseOne('noise').kind, 'noise');
    });

    it('reads `stall` on motor, before or after `lag`', () => {
      const both = parseOne('motor 900 deg/s lag 60 ms stall 6%') as unknown as Record<string, unknown>;
      assert.deepEqual(texts(both, 'speed', 'lag', 'stall'), ['900 deg/s', '60 ms', '6%']);
      const swapped = parseOne('motor 150 rpm stall 4 lag 0.1 s') as unknown as Record<string, unknown>;
      assert.deepEqual(texts(swapped, 'speed', 'lag', 'stall'), ['150 rpm', '0.1 s', '4']);
      const stallOnly = parseOne('motor 900 stall 2 * 3%');
      assert.ok(stallOnly.kind === 'motor');
      assert.deepEqual(stallOnly.optionRanges.stall, span(0, 10, 22)); // `stall 2 * 3%` is columns 10..22
      assert.equal(stallOnly.lag, undefined);
    });

    it('reads `mismatch` on wheel, and none when absent', () => {
      const wheel = parseOne('wheel 56 mm mismatch 1.004');
      assert.ok(wheel.kind === 'wheel');
      assert.deepEqual(texts(wheel as unknown as Record<string, unknown>, 'diameter', 'mismatch'), ['56 mm', '1.004']);
      assert.deepEqual(wheel.mismatch?.range, span(0, 21, 26)); // `1.004` is columns 21..26
      const plain = parseOne('wheel 56 mm');
      assert.equal(plain.kind === 'wheel' && plain.mismatch, undefined);
    });

    it('reads the gyro statement with any of its options, in any order', () => {
      const full = parseOne('gyro sample 10 ms delay 5 ms scale 1.02');
      assert.ok(full.kind === 'gyro');
      assert.deepEqual(texts(full as unknown as Record<string, unknown>, 'sample', 'delay', 'scale'), ['10 ms', '5 ms', '1.02']);
      assert.deepEqual(full.keywordRange, span(0, 0, 4)); // `gyro` is columns 0..4
      assert.deepEqual(full.optionRanges.delay, span(0, 18, 28)); // `delay 5 ms` is columns 18..28
      const swapped = parseOne('gyro scale 0.98 sample 0.02');
      assert.deepEqual(texts(swapped as unknown as Record<string, unknown>, 'sample', 'delay', 'scale'), ['0.02', undefined, '0.98']);
      assert.deepEqual(texts(parseOne('gyro delay 3 ms') as unknown as Record<string, unknown>, 'sample', 'delay', 'scale'), [undefined, '3 ms', undefined]);
    });

    it('keeps `by gyro` and `noise gyro` as they were: `gyro` is the statement only at the start of a line', () => {
      const turn = parseOne('turn 90 by gyro') as TurnStmt;
      assert.equal(turn.sensing, 'gyro');
      const held = parseOne('turn to 45 by gyro min 12% gain 1.2') as TurnStmt;
      assert.deepEqual([held.sensing, held.min?.text, held.gain?.text], ['gyro', '12%', '1.2']);
      const noise = parseOne('noise gyro 2 deg drift 1 deg/min');
      assert.equal(noise.kind, 'noise');
      assert.deepEqual(texts(noise as unknown as Record<string, unknown>, 'gyro', 'drift'), ['2 deg', '1 deg/min']);
      const { ast, diagnostics } = parsePlan('noise gyro 1 deg\ngyro sample 10 ms\nturn 90 by gyro');
      assert.deepEqual(diagnostics, []);
      assert.deepEqual(ast.statements.map((st) => st.kind), ['noise', 'gyro', 'turn']);
    });

    it('reads let with the name and its range', () => {
      const statement = parseOne('let approach_gap = 2 * 40 cm');
      assert.ok(statement.kind === 'let');
      assert.equal(statement.name, 'approach_gap');
      assert.deepEqual(statement.nameRange, span(0, 4, 16)); // `approach_gap` is columns 4..16
      assert.equal(statement.value.text, '2 * 40 cm');
      assert.match(parseBad('let gap 40 cm').message, /expected `=` after `gap`/);
      assert.match(parseBad('let = 4').message, /`let` needs a name and a value/);
    });
  });

  describe('motion statements', () => {
    it('reads start with a point and a heading', () => {
      const statement = parseOne('start (200, 150) heading -90');
      assert.ok(statement.kind === 'start');
      assert.deepEqual([statement.at.x.text, statement.at.y.text, statement.heading.text], ['200', '150', '-90']);
      assert.deepEqual(statement.optionRanges.heading, span(0, 17, 28)); // `heading -90` is columns 17..28
    });

    it('reads every drive option', () => {
      const drive = parseOne('drive -40 cm speed 300 mm/s hold 90 step gain 1.5 ramp 2 m/s^2') as DriveStmt;
      assert.deepEqual(texts(drive as unknown as Record<string, unknown>, 'distance', 'speed', 'hold', 'gain', 'ramp'),
        ['-40 cm', '300 mm/s', '90', '1.5', '2 m/s^2']);
      assert.equal(drive.step, true);
      assert.equal((parseOne('drive 300') as DriveStmt).step, false);
    });

    it('reads turn by angle and turn to a reading', () => {
      const byAngle = parseOne('turn -45') as TurnStmt;
      assert.equal(byAngle.angle?.text, '-45');
      assert.equal(byAngle.to, undefined);
      assert.deepEqual(byAngle.shape, { kind: 'spin' });
      assert.equal(byAngle.sensing, 'encoders');
      assert.deepEqual([byAngle.reverse, byAngle.ramp, byAngle.reset], [false, false, false]);
      const toReading = parseOne('turn to 180 by gyro') as TurnStmt;
      assert.equal(toReading.to?.text, '180');
      assert.equal(toReading.angle, undefined);
      assert.deepEqual(toReading.keywordRange, span(0, 0, 7)); // `turn to` is columns 0..7
    });

    it('reads every turn shape and option', () => {
      assert.deepEqual((parseOne('turn 90 spin') as TurnStmt).shape, { kind: 'spin' });
      assert.deepEqual((parseOne('turn 90 pivot right') as TurnStmt).shape, { kind: 'pivot', side: 'right' });
      const arc = parseOne('turn 90 arc 20 cm reverse') as TurnStmt;
      assert.equal(arc.shape.kind === 'arc' && arc.shape.radius.text, '20 cm');
      assert.equal(arc.reverse, true);
      const ratio = parseOne('turn 90 ratio -50% reverse') as TurnStmt;
      assert.equal(ratio.shape.kind === 'ratio' && ratio.shape.ratio.text, '-50%');
      const full = parseOne('turn 90 by gyro speed 40% min 10% gain 1 stop 0.5 deg ramp reset') as TurnStmt;
      assert.deepEqual(texts(full as unknown as Record<string, unknown>, 'speed', 'min', 'gain', 'stop'),
        ['40%', '10%', '1', '0.5 deg']);
      assert.deepEqual([full.sensing, full.ramp, full.reset], ['gyro', true, true]);
      assert.equal((parseOne('turn 90 by encoders') as TurnStmt).sensing, 'encoders');
    });

    it('reads reset yaw, square, wait and mark', () => {
      const reset = parseOne('reset yaw');
      assert.equal(reset.kind, 'resetYaw');
      assert.deepEqual(reset.keywordRange, span(0, 0, 9)); // `reset yaw` is columns 0..9
      const square = parseOne('square back speed 30%');
      assert.ok(square.kind === 'square');
      assert.equal(square.side, 'back');
      assert.equal(square.speed?.text, '30%');
      assert.equal((parseOne('square front') as Statement & { side: string }).side, 'front');
      assert.deepEqual(texts(parseOne('wait 0.5 s') as unknown as Record<string, unknown>, 'time'), ['0.5 s']);
      const mark = parseOne('mark "drop" at (1800, 1000) heading 90 within 3 cm') as MarkStmt;
      assert.deepEqual([mark.at?.x.text, mark.at?.y.text, mark.heading?.text, mark.within?.text], ['1800', '1000', '90', '3 cm']);
      assert.equal(mark.name.value, 'drop');
    });
  });

  describe('ranges', () => {
    it('marks statement, keyword, option and value ranges exactly', () => {
      //          0         1         2         3
      //          0123456789012345678901234567890123456789
      const line = '  drive 3 * lane speed 60% hold 0   # go';
      const drive = parseOne(line) as DriveStmt;
      assert.equal(drive.line, 0); // first line
      assert.deepEqual(drive.range, span(0, 2, 33)); // `drive` starts at 2, `0` ends at 33; comment excluded
      assert.deepEqual(drive.keywordRange, span(0, 2, 7)); // `drive`
      assert.deepEqual(drive.distance.range, span(0, 8, 16)); // `3 * lane`
      assert.deepEqual(drive.optionRanges.speed, span(0, 17, 26)); // `speed 60%`
      assert.deepEqual(drive.speed?.range, span(0, 23, 26)); // `60%`
      assert.deepEqual(drive.optionRanges.hold, span(0, 27, 33)); // `hold 0`
    });

    it('uses UTF-16 columns on lines with characters outside ASCII', () => {
      //             0123456 7 8901
      const mark = parseOne('mark "Ⅱ😀" in "dock"') as MarkStmt;
      assert.equal(mark.name.value, 'Ⅱ😀');
      // `"Ⅱ😀"`: quote, one unit for Ⅱ, two for the emoji, quote: columns 5..10
      assert.deepEqual(mark.name.range, span(0, 5, 10));
      assert.deepEqual(mark.inZone?.range, span(0, 14, 20)); // `"dock"` after ` in `
    });

    it('reads a lone CR as a line end (old Mac files), as the editor does', () => {
      const { ast, diagnostics } = parsePlan('units mm\rwheel 62 mm\r\rwait 1 s');
      assert.deepEqual(diagnostics, []);
      assert.equal(ast.lineCount, 4);
      assert.deepEqual(ast.statements.map((s) => s.line), [0, 1, 3]);
      assert.deepEqual(ast.statements[1].range, span(1, 0, 11));
    });

    it('keeps line numbers and columns right with CRLF line ends', () => {
      const text = 'units mm\r\nwheel 62 mm\r\n\r\nwait 1 s\r\n';
      const { ast, diagnostics } = parsePlan(text);
      assert.deepEqual(diagnostics, []);
      assert.equal(ast.lineCount, 5); // four CRLF line ends make five lines
      const [units, wheel, wait] = ast.statements;
      assert.deepEqual(units.range, span(0, 0, 8)); // `units mm` without the `\r`
      assert.equal(wheel.kind === 'wheel' && wheel.diameter.text, '62 mm');
      assert.deepEqual(wheel.range, span(1, 0, 11)); // `wheel 62 mm` on line 1
      assert.deepEqual(wait.range, span(3, 0, 8)); // `wait 1 s` on line 3
      const bad = parsePlan('units mm\r\nwheel\r\n');
      assert.deepEqual(bad.diagnostics[0].range, span(1, 0, 5)); // `wheel` on line 1, its value missing
    });
  });

  describe('expressions and option words', () => {
    it('keeps `deg/min` and `2 * speed` inside the expression', () => {
      const turn = parseOne('turn 90 by gyro stop 0.1 deg/min min 10%') as TurnStmt;
      assert.deepEqual([turn.stop?.text, turn.min?.text], ['0.1 deg/min', '10%']);
      assert.equal((parseOne('drive 2 * speed') as DriveStmt).distance.text, '2 * speed');
      const drive = parseOne('drive 100 speed 2 * x hold 3 - gain') as DriveStmt;
      assert.deepEqual([drive.speed?.text, drive.hold?.text, drive.gain], ['2 * x', '3 - gain', undefined]);
    });

    it('takes option words only as whole identifiers', () => {
      const turn = parseOne('turn 90 by gyro stop 0.001 minutes gain 2') as TurnStmt;
      assert.deepEqual([turn.stop?.text, turn.gain?.text, turn.min], ['0.001 minutes', '2', undefined]);
    });

    it('reads a function call as a value even when named like an option', () => {
      const turn = parseOne('turn to 90 by gyro speed min(50%, top) min 5%') as TurnStmt;
      assert.deepEqual([turn.speed?.text, turn.min?.text], ['min(50%, top)', '5%']);
    });

    it('splits a point only at a comma at its own depth', () => {
      const start = parseOne('start (atan2(1, 2), 3) heading 0');
      assert.ok(start.kind === 'start');
      assert.deepEqual([start.at.x.text, start.at.y.text], ['atan2(1, 2)', '3']);
      assert.deepEqual(start.at.x.range, span(0, 7, 18)); // `atan2(1, 2)`
      const nested = parseOne('box "b" ((1 + 2) * 3, max(4, (5))) to (6, 7)');
      assert.ok(nested.kind === 'box');
      assert.deepEqual([nested.a.x.text, nested.a.y.text], ['(1 + 2) * 3', 'max(4, (5))']);
    });

    it('tells `within 2 in` (a unit) from `in "ZONE"`', () => {
      const mark = parseOne('mark "gate" within 2 in in "dock"') as MarkStmt;
      assert.equal(mark.within?.text, '2 in');
      assert.equal(mark.inZone?.value, 'dock');
    });
  });

  describe('comments and strings', () => {
    it('drops comments, but not a `#` inside a string', () => {
      const drive = parseOne('drive 300 # speed 50%') as DriveStmt;
      assert.equal(drive.speed, undefined);
      assert.equal(drive.distance.text, '300');
      const plan = parseOne('plan "Run #2" # the second');
      assert.equal(plan.kind === 'plan' && plan.title.value, 'Run #2');
      const { ast, diagnostics } = parsePlan('# only a comment\n   \n\t# indented comment');
      assert.deepEqual([ast.statements, diagnostics], [[], []]);
    });

    it('unescapes `\\"` and `\\\\` in strings', () => {
      const plan = parseOne(String.raw`plan "say \"go\" C:\\robot"`);
      assert.equal(plan.kind === 'plan' && plan.title.value, 'say "go" C:\\robot');
    });

    it('reports an unterminated string at the string', () => {
      const diagnostic = parseBad('run "to the dock');
      assert.deepEqual(diagnostic.range, span(0, 4, 16)); // from the quote at 4 to the line end at 16
      assert.match(diagnostic.message, /not closed/);
    });

    it('reports an unknown escape', () => {
      const diagnostic = parseBad(String.raw`plan "a\nb"`);
      assert.deepEqual(diagnostic.range, span(0, 7, 9)); // the two characters `\n`
      assert.match(diagnostic.message, /unknown escape/);
    });
  });

  describe('error recovery', () => {
    it('leaves out a bad line and reads the lines around it', () => {
      const { ast, diagnostics } = parsePlan('wheel 62 mm\ndrive (300 speed 50%\ntrack 128 mm');
      assert.deepEqual(ast.statements.map((s) => [s.kind, s.line]), [['wheel', 0], ['track', 2]]);
      assert.equal(diagnostics.length, 1); // only line 1 is bad
      assert.equal(diagnostics[0].range.start.line, 1); // the bad line
      assert.deepEqual(diagnostics[0].range, span(1, 6, 7)); // the unclosed `(`
      assert.match(diagnostics[0].message, /never closed/);
    });

    it('gives one diagnostic per bad line', () => {
      const { ast, diagnostics } = parsePlan('trun 90 pivto left sped\nwait 1 s\n)))\n"x"\n');
      assert.deepEqual(diagnostics.map((d) => d.range.start.line), [0, 2, 3]); // lines 0, 2 and 3 are bad
      assert.deepEqual(ast.statements.map((s) => s.kind), ['wait']);
    });
  });

  describe('misspelt and wrongly cased words', () => {
    const cases: [string, string, string, number, number][] = [
      // line, the word, the suggestion, its start and end columns (counted by hand)
      ['trun 90', 'trun', 'turn', 0, 4],
      ['Turn 90', 'Turn', 'turn', 0, 4],
      ['DRIVE 300', 'DRIVE', 'drive', 0, 5],
      ['turn 90 pivto left', 'pivto', 'pivot', 8, 13],
      ['drive 300 sped 50%', 'sped', 'speed', 10, 14],
      ['drive 300 speed 50% hold 0 gian 2', 'gian', 'gain', 27, 31],
      ['turn 90 pivot lfet', 'lfet', 'left', 14, 18],
      ['turn 90 by gyr', 'gyr', 'gyro', 11, 14],
      ['turn 90 spin Ramp', 'Ramp', 'ramp', 13, 17],
      ['start (0, 0) headng 90', 'headng', 'heading', 13, 19],
      ['box "b" (0, 0) too (1, 1)', 'too', 'to', 15, 18],
      ['reset yaww', 'yaww', 'yaw', 6, 10],
      ['square frnt', 'frnt', 'front', 7, 11],
      ['units Mm', 'Mm', 'mm', 6, 8],
      ['gyr sample 10 ms', 'gyr', 'gyro', 0, 3],
      ['Gyro scale 1', 'Gyro', 'gyro', 0, 4],
      ['gyro sampel 10 ms', 'sampel', 'sample', 5, 11],
      ['gyro sample 10 ms dealy 5 ms', 'dealy', 'delay', 18, 23],
      ['gyro sacle 1.01', 'sacle', 'scale', 5, 10],
      ['motor 900 stal 5%', 'stal', 'stall', 10, 14],
      ['motor 900 deg/s lag 80 ms Stall 5%', 'Stall', 'stall', 26, 31],
      ['wheel 56 mm mismath 1.004', 'mismath', 'mismatch', 12, 19],
    ];
    for (const [line, word, suggestion, start, end] of cases) {
      it(`suggests \`${suggestion}\` for \`${word}\` in \`${line}\``, () => {
        const diagnostic = parseBad(line);
        assert.equal(diagnostic.message, `unknown word \`${word}\`: did you mean \`${suggestion}\`?`);
        assert.deepEqual(diagnostic.range, span(0, start, end));
        // A change of case alone needs no choice by a person (`veer fix` applies it).
        assert.deepEqual(diagnostic.fixes, [{
          title: `Change to "${suggestion}"`,
          edits: [{ range: span(0, start, end), newText: suggestion }],
          preferred: true,
          ...(suggestion.toLowerCase() === word.toLowerCase() ? { safe: true } : {}),
        }]);
      });
    }

    it('does not take math.js units and functions, or bound names, for misspelt options', () => {
      parseOne('drive 300 mm speed 50%');
      parseOne('turn 90 by gyro stop 1 deg min 10%');
      parseOne('noise drift 0.5 deg/hour gyro 1 deg');
      parseOne('mark "gate" within 2 in');
      const { diagnostics } = parsePlan('let sped = 50%\ndrive 300 sped');
      assert.deepEqual(diagnostics, []);
    });

    it('reports a word that is nothing like a keyword without a fix', () => {
      const diagnostic = parseBad('hover 3');
      assert.equal(diagnostic.fixes, undefined);
      assert.match(diagnostic.message, /unknown word `hover`/);
      const afterFlag = parseBad('turn 90 spin sideways');
      assert.equal(afterFlag.fixes, undefined);
      assert.match(afterFlag.message, /^unexpected `sideways`; options here: `spin`, `pivot`/);
    });
  });

  describe('statements that are incomplete or too long', () => {
    const cases: [string, RegExp, number, number][] = [
      // line, expected message, start and end of the range (counted by hand)
      ['drive', /^`drive` needs a distance, e\.g\. `drive 300 mm`$/, 0, 5],
      ['wheel', /^`wheel` needs a diameter, e\.g\. `wheel 62 mm`$/, 0, 5],
      ['start (200, 200)', /^`start` needs a position and a heading, e\.g\. `start \(200, 200\) heading 0`$/, 0, 5],
      ['start heading 0', /^`start` needs a position and a heading/, 6, 13],
      ['start (200, 200) heading', /^`start` needs a position and a heading/, 17, 24],
      ['drive 300 speed', /^`speed` needs a value, e\.g\. `speed 50%`$/, 10, 15],
      ['drive 300 speed 50% speed 20%', /^`speed` is given twice; keep one$/, 20, 25],
      ['turn 90 pivot left arc 20', /^a turn has one shape, but `arc` comes after `pivot`/, 19, 22],
      ['turn 90 by', /^`by` takes `encoders` or `gyro`, e\.g\. `by gyro`$/, 8, 10],
      ['turn 90 reverse', /^`reverse` drives an arc backwards, so it needs `arc` or `ratio`/, 8, 15],
      ['drive 300 step', /^`step` belongs to `hold`/, 10, 14],
      ['drive 300 )', /^unexpected `\)`/, 10, 11],
      ['plan "a" "b"', /^unexpected `"b"` after the end of the statement$/, 9, 12],
      ['reset yaw now', /^unexpected `now` after the end of the statement$/, 10, 13],
      ['units mm cm', /^unexpected `cm` after the end of the statement$/, 9, 11],
      ['box "b" (0, 0) (1, 1)', /^`box` needs a name and two corners/, 15, 16],
      ['circle "c" (0, 0)', /^`circle` needs a name, a centre and a radius/, 16, 17],
      ['start (200 200) heading 0', /^a point is written `\(x, y\)`/, 14, 15],
      ['mark "m" in', /^`in` needs a value, e\.g\. `in "dock"`$/, 9, 11],
      ['42', /^a line starts with a keyword/, 0, 2],
      ['gyro', /^`gyro` needs at least one of `sample`, `delay` or `scale`, e\.g\. `gyro sample 10 ms delay 5 ms`$/, 0, 4],
      ['gyro 10 ms', /^`gyro` needs at least one of `sample`, `delay` or `scale`/, 5, 7],
      ['gyro sample', /^`sample` needs a value, e\.g\. `sample 10 ms`$/, 5, 11],
      ['gyro sample 10 ms sample 5 ms', /^`sample` is given twice; keep one$/, 18, 24],
      ['motor 900 stall', /^`stall` needs a value, e\.g\. `stall 6%`$/, 10, 15],
      ['wheel 56 mm mismatch', /^`mismatch` needs a value, e\.g\. `mismatch 1\.004`$/, 12, 20],
    ];
    for (const [line, message, start, end] of cases) {
      it(`rejects \`${line}\``, () => {
        const diagnostic = parseBad(line);
        assert.match(diagnostic.message, message);
        assert.deepEqual(diagnostic.range, span(0, start, end));
      });
    }

    it('points at the first copy of a duplicate option as related information', () => {
      const diagnostic = parseBad('mark "m" heading 0 heading 90');
      assert.deepEqual(diagnostic.related?.map((r) => r.range), [span(0, 9, 18)]); // `heading 0`
    });
  });

  describe('robustness', () => {
    /** A small deterministic generator (mulberry32), so a failure can be reproduced. */
    function random(seed: number): () => number {
      let state = seed >>> 0;
      return () => {
        state = (state + 0x6d2b79f5) >>> 0;
        let t = state;
        t = Math.imul(t ^ (t >>> 15), t | 1);
        t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
        return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
      };
    }

    const pieces = [
      ...STATEMENT_KEYWORDS, ...RESERVED_WORDS, '(', ')', ',', '"', '\\', '#', '=', '%', '*', '/', '^', '-',
      ' ', ' ', ' ', '\n', '\r\n', '\r', '\t', '12', '3.5e2', 'deg', 'mm', 'x', 'min(', '😀', '\u0000', 'Ⅱ',
    ];

    it('never throws and keeps every range inside the document on random input', () => {
      const next = random(20261201);
      for (let round = 0; round < 400; round++) {
        let text = '';
        const length = Math.floor(next() * 60);
        if (round % 2 === 0) {
          for (let i = 0; i < length; i++) text += String.fromCharCode(Math.floor(next() * 0x10000));
        } else {
          for (let i = 0; i < length; i++) text += pieces[Math.floor(next() * pieces.length)];
        }
        const result = parsePlan(text);
        assertRangesValid(text, result);
        for (const diagnostic of result.diagnostics) {
          assert.equal(diagnostic.code, 'syntax');
          assert.ok(diagnostic.message.length > 0);
        }
      }
    });

    it('never throws on random byte strings read as UTF-8', () => {
      const next = random(7);
      for (let round = 0; round < 200; round++) {
        const bytes = Buffer.from(Array.from({ length: Math.floor(next() * 80) }, () => Math.floor(next() * 256)));
        const text = bytes.toString('utf8');
        assertRangesValid(text, parsePlan(text));
      }
    });

    it('reads many lines, and a very long line of junk', () => {
      const line = 'drive 3 * lane speed 60% hold 0 # comment\n';
      const text = line.repeat(5000);
      const { ast, diagnostics } = parsePlan(text);
      assert.equal(ast.statements.length, 5000); // one statement per repeated line
      assert.deepEqual(diagnostics, []);
      const bad = 'Drive '.repeat(100000) + '('.repeat(100000);
      assertRangesValid(bad, parsePlan(bad));
    });
  });
});

describe('keywords', () => {
  it('suggests a case change first, then the nearest word within two edits', () => {
    assert.equal(suggestWord('TURN', ['turns', 'turn']), 'turn');
    assert.equal(suggestWord('trun', ['drive', 'turn']), 'turn'); // one swap of neighbours
    assert.equal(suggestWord('speeed', ['speed']), 'speed'); // one deletion
    assert.equal(suggestWord('sped', ['speed']), 'speed'); // one insertion
    assert.equal(suggestWord('grd', ['grid', 'gyro']), 'grid'); // one insertion vs two edits
    assert.equal(suggestWord('hlod', ['hold', 'gold']), 'hold'); // a swap (1) beats two substitutions
    assert.equal(suggestWord('revrse', ['reverse', 'reset']), 'reverse');
  });

  it('suggests nothing for exact, far or short words', () => {
    assert.equal(suggestWord('turn', ['turn']), undefined);
    assert.equal(suggestWord('zzzz', ['turn', 'drive']), undefined);
    assert.equal(suggestWord('ab', ['at']), undefined); // too short for an edit
    assert.equal(suggestWord('At', ['at']), 'at'); // but a case change is always offered
    assert.equal(suggestWord('x'.repeat(100000), ['turn']), undefined);
  });

  it('lists options per statement and reserves every keyword and option', () => {
    assert.ok(OPTIONS.drive.includes('hold') && OPTIONS.turn.includes('pivot') && OPTIONS.mark.includes('in'));
    assert.deepEqual([OPTIONS.motor, OPTIONS.wheel, OPTIONS.gyro], [['lag', 'stall'], ['mismatch'], ['sample', 'delay', 'scale']]);
    assert.ok(STATEMENT_KEYWORDS.includes('gyro'));
    for (const word of ['drive', 'turn', 'let', 'yaw', 'range', 'speed', 'step', 'effective', 'radius', 'within',
      'gyro', 'stall', 'mismatch', 'sample', 'delay', 'scale']) {
      assert.ok(RESERVED_WORDS.has(word), word);
    }
    assert.ok(!RESERVED_WORDS.has('lane'));
  });
});
