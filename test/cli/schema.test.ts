import { strict as assert } from 'node:assert';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import Ajv2020 from 'ajv/dist/2020';
import { runVeer } from '../support/cli';
import type { JsonDocument } from '../../src/core/report';

// The JSON the command line prints, validated against the schemas in schema/
// with Ajv (an independent, general-purpose JSON Schema validator), so robot
// code in any language can rely on them. Every fixture, example and a few
// plans with errors.

const root = join(__dirname, '..', '..');
const ajv = new Ajv2020({ allErrors: true, strict: true });
const checkSchema = ajv.compile(JSON.parse(readFileSync(join(root, 'schema', 'check.schema.json'), 'utf8')));
const targetsSchema = ajv.compile(JSON.parse(readFileSync(join(root, 'schema', 'targets.schema.json'), 'utf8')));

const run = (args: string[]): string => runVeer(args).out;

const plans = [
  ...readdirSync(join(root, 'test', 'fixtures')).filter((f) => f.endsWith('.veer')).map((f) => join(root, 'test', 'fixtures', f)),
  ...readdirSync(join(root, 'examples')).filter((f) => f.endsWith('.veer')).map((f) => join(root, 'examples', f)),
];

describe('JSON schemas', () => {
  it('there are plans to validate', () => assert.ok(plans.length >= 7));

  for (const plan of plans) {
    it(`check --json and targets --json of ${plan.replace(root, '').slice(1)} follow their schemas`, () => {
      const doc = JSON.parse(run(['check', '--json', plan]));
      assert.ok(checkSchema(doc), ajv.errorsText(checkSchema.errors));
      const targets = JSON.parse(run(['targets', '--json', plan]));
      assert.ok(targetsSchema(targets), ajv.errorsText(targetsSchema.errors));
    });
  }

  it('several files give an array that follows the schema', () => {
    const docs = JSON.parse(run(['check', '--json', ...plans.slice(0, 3)]));
    assert.ok(Array.isArray(docs) && docs.length === 3);
    assert.ok(checkSchema(docs), ajv.errorsText(checkSchema.errors));
  });

  it('check --json --trace adds each motion\'s samples, ending where the prediction says', () => {
    const plan = join(root, 'test', 'fixtures', 'yaw-lab.veer');
    const doc = JSON.parse(run(['check', '--json', '--trace', plan])) as JsonDocument;
    assert.ok(checkSchema(doc), ajv.errorsText(checkSchema.errors));
    const turn = doc.runs[0].segments.find((s) => s.kind === 'turn' && s.sensing === 'gyro' && s.trace)!;
    assert.ok(turn, 'a gyro turn with a trace');
    const trace = turn.trace!;
    const predicted = turn.predicted!;
    const last = trace[trace.length - 1];
    // The last row is the moment the code moves on: the prediction's end (both rounded to 0.001).
    assert.equal(last.t_s, Math.round((predicted.start_s + predicted.duration_s!) * 1000) / 1000);
    assert.equal(last.yaw_deg, predicted.yaw_end_deg);
    assert.ok(trace.every((r) => r.target_deg !== null));
  });

  it('check --json --samples N: each mark\'s sampled share agrees with the linear model\'s probability (3 binomial σ), repeatably', () => {
    const plan = join(root, 'test', 'fixtures', 'parcel-round.veer');
    const doc = JSON.parse(run(['check', '--json', '--samples', '2000', '--seed', '7', plan])) as JsonDocument;
    assert.ok(checkSchema(doc), ajv.errorsText(checkSchema.errors));
    const marks = doc.runs.flatMap((r) => r.segments.filter((s) => s.kind === 'mark' && s.hit_probability !== undefined));
    assert.ok(marks.length >= 2);
    for (const m of marks) {
      const p = m.hit_probability!;
      // The binomial sampling error of a share from 2,000 runs: √(p(1−p)/2000).
      assert.ok(Math.abs(m.sampled_hit_probability! - p) <= 3 * Math.sqrt((p * (1 - p)) / 2000) + 1e-9, `${m.label}: ${m.sampled_hit_probability} vs ${p}`);
    }
    // The same seed gives the same samples.
    assert.equal(run(['check', '--json', '--samples', '2000', '--seed', '7', plan]), JSON.stringify(doc, null, 2) + '\n');
  });

  it('the schemas reject what they should (a heading of 360, a missing field)', () => {
    const doc = JSON.parse(run(['check', '--json', plans[0]]));
    const seg = doc.runs[0].segments[0];
    seg.end.heading_deg = 360;
    assert.equal(checkSchema(doc), false);
    delete seg.end;
    assert.equal(checkSchema(doc), false);
  });
});
