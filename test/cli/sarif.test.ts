import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import AjvDraft04 from 'ajv-draft-04';
import addFormats from 'ajv-formats';
import { applyEdits, checkPlan } from '../../src/core';
import { runCli } from '../../src/cli/main';

// `veer check --format sarif`, validated against the published SARIF 2.1.0
// schema (OASIS; the rtm.5 JSON Schema file as shipped in the
// @microsoft/jest-sarif package) with Ajv, and its fixes applied as a
// SARIF consumer would apply them.

const schema = JSON.parse(readFileSync(require.resolve('@microsoft/jest-sarif/lib/schemas/sarif-2.1.0-rtm.5.json'), 'utf8'));
// The published schema has a pattern that is not valid under the `u` flag: compiled without it.
const ajv = new AjvDraft04({ allErrors: true, strict: false, unicodeRegExp: false });
addFormats(ajv);
const compiled = ajv.compile(schema);
// Not a type guard here: the log stays `any` for the checks that follow.
const validate = Object.assign((data: unknown): boolean => compiled(data), { get errors() { return compiled.errors; } });

function sarifOf(text: string): { log: any; file: string; status: number } {
  const dir = mkdtempSync(join(tmpdir(), 'veer-sarif-'));
  const file = join(dir, 'plan.veer');
  writeFileSync(file, text);
  let out = '';
  const status = runCli(['check', '--format', 'sarif', file], { out: (s) => { out += s; }, err: () => {}, isTTY: false });
  return { log: JSON.parse(out), file, status };
}

const WRAPPING = ['wheel 60 mm', 'track 130 mm', 'start (150, 150) heading 0', 'turn 90 by gyro', 'turn 90 by gyro', 'drive 300 hold 180', 'Drive 100',
  'run "long way"', 'start (150, 150) heading 0', 'turn to 170', 'turn to -170'].join('\n');

describe('SARIF output', () => {
  it('is a valid SARIF 2.1.0 log', () => {
    const { log, status } = sarifOf(WRAPPING);
    assert.equal(status, 1);
    assert.ok(validate(log), ajv.errorsText(validate.errors));
    assert.equal(log.version, '2.1.0');
  });

  it('has one rule per code with help links, and results with 1-based regions', () => {
    const { log } = sarifOf(WRAPPING);
    const run = log.runs[0];
    const rules = run.tool.driver.rules;
    assert.ok(rules.some((r: any) => r.id === 'wrap-cross' && /diagnostics\.md#wrap-cross$/.test(r.helpUri)));
    const wrap = run.results.find((r: any) => r.ruleId === 'wrap-cross');
    assert.equal(rules[wrap.ruleIndex].id, 'wrap-cross');
    assert.deepEqual(wrap.locations[0].physicalLocation.region, { startLine: 5, startColumn: 1, endLine: 5, endColumn: 16 });
    // The hold that follows from the crossing is a related location.
    assert.equal(wrap.relatedLocations[0].physicalLocation.region.startLine, 6);
    const levels = new Set(run.results.map((r: any) => r.level));
    assert.ok(levels.has('error') && levels.has('warning'));
  });

  it('carries the path-keeping fixes, which applied give a plan without that problem; never a fix that changes the path', () => {
    const { log } = sarifOf(WRAPPING);
    const results = log.runs[0].results;
    const wrap = results.find((r: any) => r.ruleId === 'wrap-cross');
    assert.ok(wrap.fixes.length >= 1);
    const longWay = results.find((r: any) => r.ruleId === 'long-way');
    assert.equal(longWay.fixes, undefined, 'the short-way fix changes the path, so it is not offered here');
    for (const fix of wrap.fixes) {
      const edits = fix.artifactChanges[0].replacements.map((rep: any) => ({
        range: {
          start: { line: rep.deletedRegion.startLine - 1, character: rep.deletedRegion.startColumn - 1 },
          end: { line: rep.deletedRegion.endLine - 1, character: rep.deletedRegion.endColumn - 1 },
        },
        newText: rep.insertedContent.text,
      }));
      const fixed = checkPlan(applyEdits(WRAPPING, edits));
      assert.ok(!fixed.diagnostics.some((d) => d.code === 'wrap-cross'), fix.description.text);
    }
    const caseFix = results.find((r: any) => r.ruleId === 'syntax');
    assert.equal(caseFix.fixes[0].artifactChanges[0].replacements[0].insertedContent.text, 'drive');
  });

  it('a clean plan gives a valid log with no results', () => {
    const { log, status } = sarifOf(['wheel 56', 'track 112', 'start (0, 0) heading 0', 'drive 100'].join('\n'));
    assert.equal(status, 0);
    assert.ok(validate(log), ajv.errorsText(validate.errors));
    assert.deepEqual(log.runs[0].results, []);
  });
});
