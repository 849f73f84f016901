// `veer render` with the spread: --spread marks|all|off, --no-spread, and the
// Monte Carlo cloud with --samples N [--seed S].
import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runVeer } from '../support/cli';

const example = join(__dirname, '..', '..', 'examples', 'parcel-table.veer');

const run = runVeer;

function rendered(...options: string[]): string {
  const out = join(mkdtempSync(join(tmpdir(), 'veer-spread-')), 'plan.svg');
  const r = run(['render', example, '-o', out, ...options]);
  assert.equal(r.status, 0, r.err);
  return readFileSync(out, 'utf8');
}

const count = (svg: string, re: RegExp) => (svg.match(re) ?? []).length;

describe('veer render: the spread', () => {
  it('draws the marks\' ovals and chances by default, every motion\'s with --spread all, none with --no-spread or --spread off', () => {
    const plain = rendered();
    assert.equal(count(plain, /<ellipse class="spread"/g), 1, 'the one mark of the example');
    assert.match(plain, /parked · (&gt; 99|\d+) %/);
    const every = rendered('--spread', 'all');
    assert.ok(count(every, /class="spread-end"/g) >= 2, 'ovals after the motions too');
    for (const off of [rendered('--no-spread'), rendered('--spread', 'off')]) {
      assert.equal(count(off, /class="spread|class="heading-band/g), 0);
      assert.doesNotMatch(off, /parked · /);
    }
    assert.equal(rendered('--spread', 'marks'), plain);
  });

  it('--samples N draws N dots at each mark and at the run\'s end (the example ends on its mark: one place), the same for the same --seed', () => {
    const svg = rendered('--samples', '300', '--seed', '5');
    const clouds = [...svg.matchAll(/<g class="cloud [^>]*>.*?<path d="([^"]*)"/g)];
    assert.equal(clouds.length, 1, 'the mark, where the run ends');
    for (const [, d] of clouds) assert.equal(count(d, /M/g), 300);
    assert.match(svg, />sampled (&gt; 99|&lt; 1|\d+) %</);
    assert.equal(rendered('--samples', '300', '--seed', '5'), svg);
    assert.notEqual(rendered('--samples', '300', '--seed', '6'), svg);
  });

  it('says when --samples has nothing to sample', () => {
    const plan = join(mkdtempSync(join(tmpdir(), 'veer-spread-')), 'empty.veer');
    writeFileSync(plan, 'field 1000 by 1000\n');
    const r = run(['render', plan, '-o', `${plan}.svg`, '--samples', '10']);
    assert.equal(r.status, 0, r.err);
    assert.match(r.err, /no sampled end points to draw: the plan needs `track` and a run with a start and a motion/);
  });

  it('refuses spread options it cannot follow, saying what to write', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'veer-spread-')), 'x.svg');
    const cases: [string[], RegExp][] = [
      [['render', example, '-o', out, '--spread', 'some'], /unknown `--spread some`: use marks \(ovals at marks\), all \(after every motion too\) or off/],
      [['render', example, '-o', out, '--spread', 'all', '--no-spread'], /choose one of `--spread` and `--no-spread`/],
      [['check', '--spread', 'all', example], /`--spread` and `--no-spread` belong to `veer render`/],
      [['targets', '--no-spread', example], /belong to `veer render`/],
      [['render', example, '-o', out, '--samples', '1'], /`--samples` takes a whole number of runs from 2 to 1000000/],
      [['render', example, '-o', out, '--seed', '4'], /`--seed` goes with `--samples N`/],
    ];
    for (const [args, message] of cases) {
      const r = run(args);
      assert.equal(r.status, 2, args.join(' '));
      assert.match(r.err, message);
    }
  });

  it('--help names the options', () => {
    const help = run(['--help']).out;
    assert.match(help, /--spread S/);
    assert.match(help, /--no-spread/);
    assert.match(help, /\[--spread marks\|all\|off\] \[--no-spread\] \[--samples N \[--seed S\]\]/);
  });
});
