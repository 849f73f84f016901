// The spread in the drawing: the 95 % ovals at marks and (on request) at every
// motion end, the heading's band as a wedge, and the Monte Carlo cloud with
// each mark's sampled share (src/core/render/spreadLayer.ts, cloud.ts).
import { strict as assert } from 'assert';
import { DOMParser, type Element } from '@xmldom/xmldom';
import { checkPlan } from '../../src/core';
import { renderSvg } from '../../src/core/render/svg';
import { MAX_DRAWN_POINTS, sampleCloud } from '../../src/core/render/cloud';
import { ALLOWED_ATTRIBUTES, ALLOWED_ELEMENTS } from '../../src/shared/svgAllowList';
import { meetsMark } from '../../src/core/spread/gaussian';
import { sampleRun } from '../../src/core/spread/sample';
import type { CheckResult } from '../../src/core/types';

// An invented bench run: three encoder drives and two turns, then a mark in a bay (no motor: the planned path is sampled).
const PLAN = [
  'wheel 56 mm', 'track 120 mm', 'noise drive 2% turn 2%', 'field 3000 by 3000', 'zone "bay" (1200, 1300) to (1500, 1700)',
  'start (500, 500) heading 0', 'drive 600', 'turn 90', 'drive 800', 'turn -90', 'drive 400', 'mark "bay" in "bay"',
].join('\n');
// 0-based lines of the spins and of the mark above, read off PLAN.
const SPIN_LINES = [7, 9];
const MARK_LINE = 11;

/** χ² with two degrees of freedom at 95 %: its distribution function is 1 − e^(−x/2), so x = −2 ln 0.05. */
const CHI2_95 = -2 * Math.log(0.05);
/** The standard normal's 97.5 % point (two-sided 95 %), from the normal tables: 1.959964. */
const Z95 = 1.959964;

function parse(svg: string) {
  return new DOMParser().parseFromString(svg, 'image/svg+xml');
}

function all(root: ReturnType<typeof parse>, pred: (e: Element) => boolean): Element[] {
  const out: Element[] = [];
  const walk = (e: Element) => {
    if (pred(e)) out.push(e);
    for (let c = e.firstChild; c; c = c.nextSibling) if (c.nodeType === 1) walk(c as Element);
  };
  walk(root.documentElement as unknown as Element);
  return out;
}

const hasClass = (cls: string) => (e: Element) => (e.getAttribute('class') ?? '').split(' ').includes(cls);

/** Field ↔ SVG: the renderer's data-frame says field x = user x + a, field y = b − user y. */
function frameOf(doc: ReturnType<typeof parse>): { a: number; b: number } {
  const [a, b] = (doc.documentElement!.getAttribute('data-frame') ?? '').split(' ').map(Number);
  return { a, b };
}

describe('render: the spread', () => {
  let result: CheckResult;
  before(() => {
    result = checkPlan(PLAN, { simulate: false });
    assert.deepEqual(result.diagnostics.filter((d) => d.severity === 'error'), []);
  });

  it('draws the 95 % oval and the chance at marks by default, at every motion end with spread "all", and nothing with "off"', () => {
    const marks = parse(renderSvg(result));
    assert.equal(all(marks, hasClass('spread')).length, 1, 'one oval: the mark');
    assert.equal(all(marks, hasClass('spread-end')).length, 0);
    assert.equal(all(marks, hasClass('heading-band')).length, 1, 'the mark\'s heading wedge');

    const every = parse(renderSvg(result, { spread: 'all' }));
    const ends = all(every, hasClass('spread-end'));
    // The spins' ends: each drive before a spin ends where the spin does (drawn once, by the spin), and the last
    // drive's end is the mark's (it draws its own oval there).
    assert.deepEqual(ends.map((e) => Number(e.getAttribute('data-line'))), SPIN_LINES);
    assert.equal(all(every, hasClass('spread')).length, SPIN_LINES.length + 1);
    assert.equal(all(every, hasClass('heading-band')).length, SPIN_LINES.length + 1);

    const off = renderSvg(result, { spread: 'off' });
    assert.doesNotMatch(off, /class="spread|heading-band| %</);
    // The sampled share is no part of the linear model's chance either.
    assert.doesNotMatch(off, /sampled/);
    assert.match(renderSvg(result), />bay · (&gt; 99|\d+) %</, 'the chance beside the mark by default');
  });

  it('each oval is the 95 % contour of the segment\'s covariance: every point on it lies at Mahalanobis distance² χ²₂(95 %) = 5.991', () => {
    const doc = parse(renderSvg(result, { spread: 'all' }));
    const { a: fa, b: fb } = frameOf(doc);
    const segs = result.runs[0].segments;
    const ovals = all(doc, (e) => e.tagName === 'ellipse' && hasClass('spread')(e));
    assert.equal(ovals.length, SPIN_LINES.length + 1);
    for (const el of ovals) {
      const owner = el.parentNode as Element;
      const line = Number(owner.getAttribute('data-line'));
      const seg = segs.filter((s) => s.line === line).pop()!;
      const [[xx, xy], [, yy]] = seg.spread!.cov;
      const det = xx * yy - xy * xy;
      const cx = Number(el.getAttribute('cx'));
      const cy = Number(el.getAttribute('cy'));
      const rx = Number(el.getAttribute('rx'));
      const ry = Number(el.getAttribute('ry'));
      const rot = Number(/rotate\(([-\d.e]+) /.exec(el.getAttribute('transform')!)![1]) * Math.PI / 180;
      // The centre is the planned end.
      assert.ok(Math.abs(cx + fa - seg.end.x) < 0.01 && Math.abs(fb - cy - seg.end.y) < 0.01, `line ${line + 1}: centre`);
      for (let k = 0; k < 8; k++) {
        const t = (k * Math.PI) / 4;
        // A point of the SVG ellipse (rotated on screen, y down), back in the field frame (y up).
        const ux = rx * Math.cos(t) * Math.cos(rot) - ry * Math.sin(t) * Math.sin(rot);
        const uy = rx * Math.cos(t) * Math.sin(rot) + ry * Math.sin(t) * Math.cos(rot);
        const dx = ux;
        const dy = -uy;
        const d2 = (yy * dx * dx - 2 * xy * dx * dy + xx * dy * dy) / det;
        // num() rounds the drawn values to 0.01 mm: a relative error of a few 1e-3 on ovals of a few mm.
        assert.ok(Math.abs(d2 - CHI2_95) < 0.05 * CHI2_95, `line ${line + 1}, point ${k}: d² = ${d2}`);
      }
    }
  });

  for (const turns of ['clockwise', 'counterclockwise'] as const) {
    it(`the heading wedge spans the planned heading ± 1.96 standard deviations (turns ${turns})`, () => {
      const r = turns === 'clockwise' ? result : checkPlan(`turns counterclockwise\n${PLAN.replace('turn 90', 'turn -90').replace('turn -90\ndrive 400', 'turn 90\ndrive 400')}`, { simulate: false });
      wedgesMatch(r, turns);
    });
  }

  function wedgesMatch(r: CheckResult, turns: 'clockwise' | 'counterclockwise'): void {
    const doc = parse(renderSvg(r, { spread: 'all' }));
    const { a: fa, b: fb } = frameOf(doc);
    const segs = r.runs[0].segments;
    const wedges = all(doc, hasClass('heading-band'));
    assert.equal(wedges.length, SPIN_LINES.length + 1);
    for (const el of wedges) {
      const owner = el.getAttribute('data-line') !== null ? el : el.parentNode as Element;
      const line = Number(owner.getAttribute('data-line'));
      const seg = segs.filter((s) => s.line === line).pop()!;
      const pts = [...el.getAttribute('d')!.matchAll(/[ML]([-\d.e]+) ([-\d.e]+)/g)].map((m) => ({ x: Number(m[1]) + fa, y: fb - Number(m[2]) }));
      const [apex, first, last] = [pts[0], pts[1], pts[pts.length - 1]];
      // The file's heading of a point seen from the apex: 0 up the field (+y), positive clockwise or counterclockwise.
      const sign = turns === 'clockwise' ? 1 : -1;
      const bearing = (p: { x: number; y: number }) => (sign * Math.atan2(p.x - apex.x, p.y - apex.y) * 180) / Math.PI;
      const half = Z95 * seg.spread!.headingSd;
      const wrap = (deg: number) => ((deg + 540) % 360) - 180;
      assert.ok(Math.abs(wrap(bearing(first) - (seg.end.heading - half))) < 0.05, `line ${line + 1}: ${bearing(first)} vs ${seg.end.heading - half}`);
      assert.ok(Math.abs(wrap(bearing(last) - (seg.end.heading + half))) < 0.05, `line ${line + 1}: ${bearing(last)} vs ${seg.end.heading + half}`);
      assert.ok(half > 0.1, `line ${line + 1}: a visible band (${half}°)`);
    }
  }

  it('writes only elements and attributes on the preview\'s allow-list, with every layer drawn', () => {
    const svg = renderSvg(result, { spread: 'all', cloud: sampleCloud(result, 200), standalone: false });
    const doc = parse(svg);
    const elements = new Set<string>();
    const attributes = new Set<string>();
    for (const e of all(doc, () => true)) {
      elements.add(e.tagName);
      for (let i = 0; i < e.attributes.length; i++) attributes.add(e.attributes[i].name.toLowerCase());
    }
    assert.deepEqual([...elements].filter((e) => !ALLOWED_ELEMENTS.has(e)), []);
    assert.deepEqual([...attributes].filter((a) => !ALLOWED_ATTRIBUTES.has(a) && !a.startsWith('xmlns')), []);
  });
});

describe('render: the spread about the predicted pose', () => {
  it('centres the oval and the wedge where the controller simulation predicts the robot ends, where the cloud gathers', () => {
    // An encoder spin with the default motor and no tuning: the simulation predicts the robot well off the planned pose.
    const text = ['wheel 56 mm', 'track 120 mm', 'noise drive 2% turn 2%', 'field 1600 by 1200', 'zone "bay" (1100, 780) to (1450, 1100)',
      'start (250, 200) heading 0', 'drive 500', 'turn 90', 'drive 800', 'mark "bay" in "bay"'].join('\n');
    const result = checkPlan(text);
    const segs = result.runs[0].segments;
    const mark = segs.find((s) => s.kind === 'mark')!;
    const predicted = mark.predicted!.end;
    assert.ok(Math.hypot(predicted.x - mark.end.x, predicted.y - mark.end.y) > 20, 'the prediction is off the plan here');
    const n = 2000;
    const cloud = sampleCloud(result, n, 4);
    const doc = parse(renderSvg(result, { cloud }));
    const { a: fa, b: fb } = frameOf(doc);
    const oval = all(doc, (e) => e.tagName === 'ellipse' && hasClass('spread')(e))[0];
    const cx = Number(oval.getAttribute('cx')) + fa;
    const cy = fb - Number(oval.getAttribute('cy'));
    assert.ok(Math.abs(cx - predicted.x) < 0.01 && Math.abs(cy - predicted.y) < 0.01, `oval at (${cx}, ${cy}), predicted (${predicted.x}, ${predicted.y})`);
    // The sampled runs (each simulated) scatter about the same pose: their mean is within 3 standard errors σ/√N of it,
    // plus the controllers' small nonlinearity (0.12 σ, as in spread.test.ts; common practice, no published source).
    const spot = cloud.spots.find((s) => s.kind === 'mark')!;
    const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
    for (const [k, got, want] of [[0, mean(spot.x), predicted.x], [1, mean(spot.y), predicted.y]] as const) {
      const sd = Math.sqrt(mark.spread!.cov[k][k]);
      assert.ok(Math.abs(got - want) <= 3 * sd / Math.sqrt(n) + 0.12 * sd + 0.3, `mean ${k}: ${got} vs predicted ${want} (sd ${sd})`);
    }
  });
});

describe('render: the Monte Carlo cloud', () => {
  let result: CheckResult;
  before(() => {
    result = checkPlan(PLAN, { simulate: false });
  });

  it('keeps each run\'s end and each mark, with the samples of spread/sample.ts (same seeds as veer check --samples)', () => {
    const cloud = sampleCloud(result, 500, 7);
    // The run ends on its mark: one place, not the same samples twice.
    assert.deepEqual(cloud.spots.map((s) => [s.kind, s.line]), [['mark', MARK_LINE]]);
    const longer = sampleCloud(checkPlan(`${PLAN}\ndrive 100`, { simulate: false }), 20, 7);
    assert.deepEqual(longer.spots.map((s) => [s.kind, s.line]), [['mark', MARK_LINE], ['end', MARK_LINE + 1]]);
    const segs = result.runs[0].segments;
    const direct = sampleRun(segs, result.setup.noise, 120, result.setup.turns, 500, 7);
    const mark = cloud.spots[0];
    assert.equal(mark.x.length, 500);
    for (let j = 0; j < 500; j += 37) {
      // Kept to 0.01 mm.
      assert.ok(Math.abs(mark.x[j] - direct.x[mark.segment][j]) <= 0.005 && Math.abs(mark.y[j] - direct.y[mark.segment][j]) <= 0.005);
    }
    const target = segs[mark.segment].markTarget!;
    const met = Array.from(direct.x[mark.segment]).filter((x, j) => meetsMark(target, x, direct.y[mark.segment][j])).length;
    assert.equal(mark.share, met / 500);
  });

  it('keeps at most MAX_DRAWN_POINTS points per place but counts every sample in the share', () => {
    const cloud = sampleCloud(result, MAX_DRAWN_POINTS + 500, 3);
    for (const s of cloud.spots) assert.equal(s.x.length, MAX_DRAWN_POINTS);
    const share = cloud.spots.find((s) => s.kind === 'mark')!.share!;
    // Binomial sampling error of a share from N runs: √(p(1−p)/N); three of them either side of the linear model's chance.
    const p = result.runs[0].segments.find((s) => s.kind === 'mark')!.hitProbability!;
    const n = MAX_DRAWN_POINTS + 500;
    assert.ok(Math.abs(share - p) <= 3 * Math.sqrt((p * (1 - p)) / n) + 1 / n, `sampled ${share} vs linear ${p}`);
  });

  it('about 95 % of the sampled end points lie inside the drawn 95 % oval (binomial, 3 σ)', () => {
    const n = 2000;
    const cloud = sampleCloud(result, n, 11);
    const end = cloud.spots[0];
    const seg = result.runs[0].segments[end.segment];
    const [[xx, xy], [, yy]] = seg.spread!.cov;
    const det = xx * yy - xy * xy;
    let inside = 0;
    for (let j = 0; j < n; j++) {
      const dx = end.x[j] - seg.end.x;
      const dy = end.y[j] - seg.end.y;
      if ((yy * dx * dx - 2 * xy * dx * dy + xx * dy * dy) / det <= CHI2_95) inside++;
    }
    // The binomial standard error of 0.95 from 2,000 runs: √(0.95 · 0.05 / 2000) = 0.0049.
    assert.ok(Math.abs(inside / n - 0.95) <= 3 * Math.sqrt((0.95 * 0.05) / n), `${inside} of ${n} inside`);
  });

  it('draws one dot per kept point, in the run\'s colour, and the sampled share under the mark\'s name', () => {
    const cloud = sampleCloud(result, 300, 1);
    const svg = renderSvg(result, { cloud });
    const doc = parse(svg);
    const groups = all(doc, hasClass('cloud'));
    assert.equal(groups.length, 1);
    for (const g of groups) {
      assert.ok(hasClass('run-0')(g));
      const path = all(doc, (e) => e.tagName === 'path' && (e.parentNode as Element).parentNode === g)[0];
      assert.equal(path.getAttribute('d')!.match(/M/g)!.length, 300);
    }
    const share = cloud.spots.find((s) => s.kind === 'mark')!.share!;
    const text = all(doc, hasClass('sampled-share'))[0];
    assert.ok(text, 'the sampled share is written');
    const pct = Math.round(share * 100);
    assert.match(text.textContent!, share > 0.995 && share < 1 ? /^sampled > 99 %$/ : new RegExp(`^sampled ${pct} %$`));
    // The cloud stays with --no-spread (asked for on its own), the ovals go.
    const off = renderSvg(result, { cloud, spread: 'off' });
    assert.match(off, /class="cloud /);
    assert.doesNotMatch(off, /class="spread/);
  });

  it('a plan without a robot or without runs has no cloud, and a selected run draws only its own', () => {
    assert.deepEqual(sampleCloud(checkPlan('field 1000 by 1000'), 100).spots, []);
    const two = checkPlan([PLAN, 'run "back"', 'start (500, 500) heading 0', 'drive 300'].join('\n'), { simulate: false });
    const cloud = sampleCloud(two, 50);
    assert.deepEqual(cloud.spots.map((s) => [s.run, s.kind]), [[0, 'mark'], [1, 'end']]);
    const svg = renderSvg(two, { cloud, run: 1 });
    assert.equal((svg.match(/class="cloud /g) ?? []).length, 1);
  });
});
