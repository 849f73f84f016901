import { strict as assert } from 'node:assert';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan } from '../../src/core';
import type { DiagnosticCode, Segment } from '../../src/core/types';

// Plans in test/fixtures (invented scenarios) against their expected files.
// Each expected number in a fixture's JSON carries a `source` naming where it
// comes from; lines are 1-based, as in the command line's JSON.

interface ExpectedFile {
  about: string;
  diagnostics: { line: number; code: DiagnosticCode }[];
  messages?: { line: number; includes: string }[];
  segments?: ({ line: number; source: string } & Record<string, unknown>)[];
  runs?: { name: string; duration?: number; distance?: number; source: string }[];
}

const FIXTURES = join(__dirname, '..', 'fixtures');
const TOLERANCE = 1e-3;

const ALL_CODES: DiagnosticCode[] = [
  'syntax', 'unit', 'name', 'setup', 'wrap-cross', 'wrap-edge', 'long-way', 'heading-jump',
  'off-field', 'collision', 'no-wall', 'over-time', 'miss',
];

const plans = readdirSync(FIXTURES).filter((f) => f.endsWith('.veer')).sort();

/** Compares every number in `expected` (recursively) with the same path in `actual`. */
function compareNumbers(actual: unknown, expected: unknown, path: string): void {
  if (typeof expected === 'number') {
    assert.equal(typeof actual, 'number', `${path}: expected a number, got ${JSON.stringify(actual)}`);
    assert.ok(Math.abs((actual as number) - expected) <= TOLERANCE, `${path}: expected ${expected}, got ${actual}`);
    return;
  }
  if (expected && typeof expected === 'object') {
    for (const [key, value] of Object.entries(expected)) {
      compareNumbers((actual as Record<string, unknown> | undefined)?.[key], value, `${path}.${key}`);
    }
  }
}

describe('fixtures', () => {
  it('there are 6 to 10 plans, each with an expected file', () => {
    assert.ok(plans.length >= 6 && plans.length <= 10, `${plans.length} plans`);
    for (const p of plans) assert.ok(readdirSync(FIXTURES).includes(p.replace(/\.veer$/, '.expected.json')), p);
  });

  it('together they cover every diagnostic code of spec section 6', () => {
    const seen = new Set<DiagnosticCode>();
    for (const p of plans) for (const d of checkPlan(readFileSync(join(FIXTURES, p), 'utf8')).diagnostics) seen.add(d.code);
    assert.deepEqual(ALL_CODES.filter((c) => !seen.has(c)), []);
  });

  for (const plan of plans) {
    describe(plan, () => {
      const text = readFileSync(join(FIXTURES, plan), 'utf8');
      const expected = JSON.parse(readFileSync(join(FIXTURES, plan.replace(/\.veer$/, '.expected.json')), 'utf8')) as ExpectedFile;
      const result = checkPlan(text, { fileName: plan });
      const segments = result.runs.flatMap((r) => r.segments);

      it('gives the expected diagnostics (code and line)', () => {
        const actual = result.diagnostics.filter((d) => d.code !== 'approximate')
          .map((d) => `${d.range.start.line + 1} ${d.code}`).sort();
        assert.deepEqual(actual, expected.diagnostics.map((d) => `${d.line} ${d.code}`).sort());
      });

      if (expected.messages?.length) {
        it('says what the expected messages say', () => {
          for (const m of expected.messages!) {
            const onLine = result.diagnostics.filter((d) => d.range.start.line + 1 === m.line).map((d) => d.message);
            assert.ok(onLine.some((msg) => msg.includes(m.includes)), `line ${m.line}: none of ${JSON.stringify(onLine)} includes "${m.includes}"`);
          }
        });
      }

      if (expected.segments?.length) {
        it('gives the expected segment values', () => {
          for (const e of expected.segments!) {
            const seg: Segment | undefined = segments.find((s) => s.line + 1 === e.line);
            assert.ok(seg, `no segment on line ${e.line}`);
            assert.ok(e.source, `line ${e.line}: every expected value names its source`);
            const { line: _line, source: _source, ...values } = e;
            compareNumbers(seg, values, `line ${e.line}`);
          }
        });
      }

      if (expected.runs?.length) {
        it('gives the expected run totals', () => {
          for (const e of expected.runs!) {
            const run = result.runs.find((r) => r.name === e.name);
            assert.ok(run, `no run "${e.name}"`);
            const { name: _name, source: _source, ...values } = e;
            compareNumbers(run, values, `run ${e.name}`);
          }
        });
      }

      it('keeps every diagnostic range inside the document', () => {
        const lines = text.split('\n');
        for (const d of result.diagnostics) {
          assert.ok(d.range.start.line < lines.length && d.range.end.line < lines.length);
          assert.ok(d.range.end.character <= lines[d.range.end.line].length);
        }
      });
    });
  }
});
