import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Ajv2020 from 'ajv/dist/2020';
import { runVeer } from '../support/cli';

// `veer replay PLAN LOG` and `veer render --log`: the recorded run of the demo
// plan (examples/parcel-table.log.csv, made by scripts/recorded-run.ts), its
// JSON validated with Ajv against schema/replay.schema.json.

const root = join(__dirname, '..', '..');
const plan = join(root, 'examples', 'parcel-table.veer');
const log = join(root, 'examples', 'parcel-table.log.csv');
const ajv = new Ajv2020({ allErrors: true, strict: true });
const schema = ajv.compile(JSON.parse(readFileSync(join(root, 'schema', 'replay.schema.json'), 'utf8')));

const run = runVeer;

describe('veer replay', () => {
  const dir = mkdtempSync(join(tmpdir(), 'veer-replay-'));

  it('--json follows schema/replay.schema.json, with every moving motion found by the log\'s line column and the fit', () => {
    const { out, status } = run(['replay', '--json', plan, log]);
    assert.equal(status, 0);
    const doc = JSON.parse(out) as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
    assert.ok(schema(doc), ajv.errorsText(schema.errors));
    assert.equal(doc.aligned_by, 'line');
    assert.equal(doc.reconstruction, 'wheels+yaw');
    assert.deepEqual(doc.motions.filter((m: { recorded?: unknown }) => m.recorded).map((m: { line: number }) => m.line), [16, 17, 18, 19]);
    const speed = doc.fit.params.find((p: { name: string }) => p.name === 'motorSpeed');
    // The simulated true robot's motor runs at 95 % of the plan's 900 deg/s = 855 deg/s (scripts/recorded-run.ts).
    // Within 5 deg/s: the fit of a noisy log, common practice, no published source.
    assert.ok(speed.found && Math.abs(speed.value - 855) < 5, `motor speed ${speed.value}`);
    // The first setup edit is the preferred one with every recommended value, on the plan's lines.
    assert.ok(doc.setup_edits.length >= 1 && doc.setup_edits[0].preferred);
    // Edits of the setup lines (1 to 12) or a new line after them (13), all above the run (line 14).
    assert.ok(doc.setup_edits[0].edits.every((e: { line: number }) => e.line >= 1 && e.line <= 13), JSON.stringify(doc.setup_edits[0].edits));
  });

  it('--json without the line column aligns by time and still follows the schema', () => {
    const text = readFileSync(log, 'utf8').replace(/,line\n/, '\n').replace(/,\d+\n/g, '\n');
    const file = join(dir, 'no-line.csv');
    writeFileSync(file, text);
    const doc = JSON.parse(run(['replay', '--json', plan, file]).out) as { aligned_by: string; time_scale: number };
    assert.ok(schema(doc), ajv.errorsText(schema.errors));
    assert.equal(doc.aligned_by, 'time');
    assert.ok(doc.time_scale > 1, 'the slower true robot stretches the run');
  });

  it('prints a table, the run end, the fit and the safety line', () => {
    const { out, status } = run(['replay', plan, log]);
    assert.equal(status, 0);
    // The log's data rows, counted: its lines other than the comments and the header.
    assert.match(out, /run "to the dock" against .*1257 rows/);
    assert.match(out, /^\s+18 {2}drive 1565 mm \(hold\)/m);
    assert.match(out, /Run end \(line 19\)/);
    // The log ends at (1847.5, 1030.9), inside the dock (1700..1950 × 900..1150).
    assert.match(out, /mark "parked" \(line 20\): the recorded run meets it/);
    // 95 % of the plan's 900 deg/s (scripts/recorded-run.ts), as in the JSON test above.
    assert.match(out, /motor speed\s+855 deg\/s/);
    assert.match(out, /Setup edits the fit suggests.*\n {2}\* Set the/);
    assert.match(out, /low speed/);
  });

  it('a bad log: exit 2 and a message naming the log, its line and column', () => {
    const file = join(dir, 'bad.csv');
    writeFileSync(file, 'time_s,left_deg,right_deg\n0,0,0\n0.01,1,1\n0.005,2,2\n');
    const { err, status } = run(['replay', plan, file]);
    assert.equal(status, 2);
    assert.match(err, /bad\.csv: line 4, column 1 \(time_s\): time 0\.005 is before/);
  });

  it('bad options and missing files are usage errors', () => {
    assert.equal(run(['replay', plan]).status, 2);
    const units = run(['replay', plan, log, '--wheel-units', 'inch']);
    assert.equal(units.status, 2);
    assert.match(units.err, /--wheel-units takes `deg`.*not `inch`/);
    const missing = run(['replay', plan, join(dir, 'none.csv')]);
    assert.equal(missing.status, 2);
    assert.match(missing.err, /none\.csv: no such file/);
    assert.equal(run(['check', '--log', log, plan]).status, 2);
  });

  it('render --log draws the recorded layer (solid: wheels and yaw; dashed: wheels alone)', () => {
    const out = join(dir, 'overlay.svg');
    const { status } = run(['render', plan, '-o', out, '--log', log]);
    assert.equal(status, 0);
    const svg = readFileSync(out, 'utf8');
    assert.match(svg, /<g class="recorded" data-line="13">/);
    assert.match(svg, /class="recorded-fused" d="M[\d.]+ [\d.]+L/);
    assert.match(svg, /class="recorded-wheels"[^>]*stroke-dasharray/);
    // The legend tells the two recorded paths (and the dotted predicted one) from the plan's.
    assert.match(svg, /<g class="legend-entry legend-key recorded-key"><path [^>]*\/><text [^>]*>recorded: wheels and yaw<\/text>/);
    assert.match(svg, /<g class="legend-entry legend-key recorded-key"><path [^>]*stroke-dasharray="[^"]+"\/><text [^>]*>wheels alone<\/text>/);
    assert.match(svg, /<g class="legend-entry legend-key predicted-key"><path [^>]*stroke-dasharray="[^"]+"\/><text [^>]*>predicted<\/text>/);
    const bad = run(['render', plan, '-o', out, '--log', log, '--yaw-units', 'rad']);
    assert.equal(bad.status, 2);
    assert.match(bad.err, /parcel-table\.log\.csv: line 9, column 4 \(yaw_deg\): the header says deg, the settings say rad/);
  });
});
