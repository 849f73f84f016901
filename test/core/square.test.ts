import { strict as assert } from 'node:assert';
import Flatten from '@flatten-js/core';
import { checkPlan, renderSvg, toJsonDocument } from '../../src/core';
import type { CheckResult, Diagnostic, Point, Pose, Segment } from '../../src/core/types';
import { footprintCorners, forwardVector } from '../../src/core/solve/frame';
import { mulberry32 } from '../support/random';

// `square`: the robot drives straight along its heading until its footprint
// first touches a wall (a field edge or a box side), then turns square there.
// First contact is computed here independently: for the body rectangle by
// conservative advancement on @flatten-js/core's exact polygon-to-segment
// distance (the shape moves at unit speed, so it can advance by the distance
// without passing through the wall); for the circle of diameter `track`,
// analytically (a circle first touches a line when its centre is r from it,
// and a point when |c + m t − q| = r).

const RAD = Math.PI / 180;

interface Body { width: number; length: number; axle: number }
interface WallSegment { a: Point; b: Point }

function rectAt(body: Body, pose: Pose, turns: 'clockwise' | 'counterclockwise' = 'clockwise'): Flatten.Polygon {
  const c = footprintCorners(body, pose, turns);
  return new Flatten.Polygon(c.map((p) => new Flatten.Point(p.x, p.y)));
}

/** First contact of the body driving along m from pose with any of the segments (conservative advancement on flatten's distance). */
function oracleRect(body: Body, pose: Pose, m: Point, walls: WallSegment[], maxTravel = 20000): { t: number; wall: number } | undefined {
  let best: { t: number; wall: number } | undefined;
  walls.forEach((w, i) => {
    const seg = new Flatten.Segment(new Flatten.Point(w.a.x, w.a.y), new Flatten.Point(w.b.x, w.b.y));
    let t = 0;
    for (let k = 0; k < 100000 && t < maxTravel; k++) {
      const poly = rectAt(body, { x: pose.x + m.x * t, y: pose.y + m.y * t, heading: pose.heading });
      const [d] = poly.distanceTo(seg);
      if (d < 1e-9) {
        if (!best || t < best.t) best = { t, wall: i };
        return;
      }
      t += d;
    }
  });
  return best;
}

/** First contact of a circle (centre p, radius r) moving along unit m with a segment: analytic. */
function oracleCircle(p: Point, r: number, m: Point, w: WallSegment): number | undefined {
  let best: number | undefined;
  const take = (t: number) => { if (t >= -1e-9 && (best === undefined || t < best)) best = t; };
  const dx = w.b.x - w.a.x;
  const dy = w.b.y - w.a.y;
  const len = Math.hypot(dx, dy);
  const n = { x: -dy / len, y: dx / len };
  for (const sign of [1, -1]) {
    const nx = n.x * sign;
    const ny = n.y * sign;
    const d0 = (p.x - w.a.x) * nx + (p.y - w.a.y) * ny;
    const closing = -(m.x * nx + m.y * ny);
    if (d0 < r || closing <= 0) continue;
    const t = (d0 - r) / closing;
    const foot = { x: p.x + m.x * t - r * nx, y: p.y + m.y * t - r * ny };
    const s = ((foot.x - w.a.x) * dx + (foot.y - w.a.y) * dy) / (len * len);
    if (s >= 0 && s <= 1) take(t);
  }
  for (const q of [w.a, w.b]) {
    const wx = p.x - q.x;
    const wy = p.y - q.y;
    const b = wx * m.x + wy * m.y;
    const disc = b * b - (wx * wx + wy * wy - r * r);
    if (disc >= 0) take(-b - Math.sqrt(disc));
  }
  return best;
}

function boxSides(x1: number, y1: number, x2: number, y2: number): WallSegment[] {
  return [
    { a: { x: x1, y: y1 }, b: { x: x1, y: y2 } }, { a: { x: x2, y: y1 }, b: { x: x2, y: y2 } },
    { a: { x: x1, y: y1 }, b: { x: x2, y: y1 } }, { a: { x: x1, y: y2 }, b: { x: x2, y: y2 } },
  ];
}

function squareOf(result: CheckResult, line: number): Segment {
  const seg = result.runs.flatMap((r) => r.segments).find((s) => s.line === line && s.kind === 'square');
  assert.ok(seg, `no square on line ${line}`);
  return seg;
}

const codesOn = (result: CheckResult, line: number) => result.diagnostics.filter((d) => d.range.start.line === line).map((d) => d.code).sort();

function travelDir(heading: number, side: 'front' | 'back'): Point {
  const f = forwardVector(heading, 'clockwise');
  return side === 'front' ? f : { x: -f.x, y: -f.y };
}

describe('square: the cases that were wrong', () => {
  it('an obstacle on the way to the wall is a collision (the drive follows the heading)', () => {
    const text = ['wheel 56 mm', 'track 112 mm', 'field 3000 by 3000', 'circle "C" (1410, 1628) radius 60', 'start (1000, 500) heading 20', 'square front'].join('\n');
    const r = checkPlan(text);
    // After 1200 mm along heading 20 the axle midpoint is at (1000 + 1200 sin 20°, 500 + 1200 cos 20°) = (1410.4, 1627.6): on C.
    assert.ok(Math.hypot(1000 + 1200 * Math.sin(20 * RAD) - 1410, 500 + 1200 * Math.cos(20 * RAD) - 1628) < 1);
    const hits = r.diagnostics.filter((d) => d.code === 'collision' && d.range.start.line === 5);
    assert.equal(hits.length, 1);
    assert.match(hits[0].message, /"C"/);
  });

  it('leaving the field on the way is reported on the square line, as for a plain drive', () => {
    const setup = ['wheel 56 mm', 'track 112 mm', 'body 150 by 190 axle -30', 'field 2000 by 1500', 'start (50, 700) heading 0'];
    const square = checkPlan([...setup, 'square front'].join('\n'));
    const drive = checkPlan([...setup, 'drive 100'].join('\n'));
    assert.deepEqual(codesOn(drive, 5), ['off-field']);
    assert.deepEqual(codesOn(square, 5), ['off-field']);
    // It still squares on the top edge: 1500 − (95 + 30) = 1375.
    assert.ok(Math.abs(squareOf(square, 5).end.y - 1375) < 1e-9);
  });

  it('the round footprint meets the wall when the circle touches it, not when its front point reaches the line', () => {
    const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'field 3000 by 3000', 'start (500, 700) heading 10', 'square front'].join('\n'));
    const seg = squareOf(r, 4);
    // Analytic: the centre must come to 56 mm from y = 3000: t = (3000 − 56 − 700) / cos 10° = 2278.617.
    const expected = (3000 - 56 - 700) / Math.cos(10 * RAD);
    assert.ok(Math.abs(seg.distance - expected) < 1e-9, `${seg.distance} vs ${expected}`);
    assert.ok(Math.abs(seg.distance - 2278.617) < 1e-3);
    const oracle = oracleCircle({ x: 500, y: 700 }, 56, travelDir(10, 'front'), { a: { x: 0, y: 3000 }, b: { x: 3000, y: 3000 } })!;
    assert.ok(Math.abs(seg.distance - oracle) < 1e-9);
    assert.deepEqual(r.diagnostics, []);
  });

  it('a circle whose side meets a box side 75° off square is no-wall, not a square on the field edge beyond', () => {
    const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'field 3000 by 3000', 'box "shelf" (600, 800) to (2000, 1000)', 'start (500, 700) heading 75', 'square front'].join('\n'));
    const seg = squareOf(r, 5);
    // The centre comes to 56 mm below y = 800 after (800 − 56 − 700) / cos 75° = 170.0 mm, touching at x ≈ 664, on the shelf's bottom side.
    const expected = oracleCircle({ x: 500, y: 700 }, 56, travelDir(75, 'front'), { a: { x: 600, y: 800 }, b: { x: 2000, y: 800 } })!;
    assert.ok(Math.abs(seg.distance - expected) < 1e-9, `${seg.distance} vs ${expected}`);
    const noWall = r.diagnostics.filter((d) => d.code === 'no-wall');
    assert.equal(noWall.length, 1);
    assert.match(noWall[0].message, /75° off square/);
  });

  it('the body\'s front edge meets a box corner: first contact at 400 mm, at the corner', () => {
    const body: Body = { width: 150, length: 190, axle: -30 };
    const start: Pose = { x: 996.4008, y: 1191.3698, heading: 110 };
    const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'body 150 by 190 axle -30', 'box "K" (1500, 1000) to (1700, 1040)', `start (${start.x}, ${start.y}) heading ${start.heading}`, 'square front'].join('\n'));
    const seg = squareOf(r, 5);
    const oracle = oracleRect(body, start, travelDir(110, 'front'), boxSides(1500, 1000, 1700, 1040))!;
    assert.ok(Math.abs(oracle.t - 400) < 1e-3, `oracle ${oracle.t}`);
    assert.ok(Math.abs(seg.distance - oracle.t) < 1e-6, `${seg.distance} vs ${oracle.t}`);
    // 20° off square against K's left side (the side it drives into most squarely): it squares there.
    assert.deepEqual(r.diagnostics.filter((d) => d.severity === 'error').map((d) => d.message), []);
    assert.equal(((seg.end.heading % 360) + 360) % 360, 90);
    assert.ok(Math.abs(seg.end.x - (1500 - 125)) < 1e-9);
  });

  it('headings are normalised into [0, 360): a back square from 8.34 reads 0, never 360', () => {
    const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'field 2000 by 1500', 'start (1000, 700) heading 8.34', 'square back', 'drive 100'].join('\n'));
    const doc = toJsonDocument('x.veer', r);
    const headings = doc.runs[0].segments.slice(1).map((s) => s.end.heading_deg);
    assert.deepEqual(headings, [0, 0]);
  });
});

describe('square: first contact against an independent computation', () => {
  const body: Body = { width: 150, length: 190, axle: -30 };
  const box = boxSides(1200, 1400, 1600, 1700);
  const fieldEdges = boxSides(0, 0, 3000, 2500);

  for (const side of ['front', 'back'] as const) {
    for (const heading of [29.5, 30.5, -29.5, -30.5, 0, 12.25]) {
      it(`body, ${side}, ${heading}° off the box's normal`, () => {
        // The box's bottom side faces −y; front squares drive up (heading 0), back squares face down (heading 180).
        const h = side === 'front' ? heading : 180 + heading;
        const start: Pose = { x: 1400, y: 800, heading: h };
        const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'body 150 by 190 axle -30', 'field 3000 by 2500', 'box "crate" (1200, 1400) to (1600, 1700)', `start (1400, 800) heading ${h}`, `square ${side}`].join('\n'));
        const seg = squareOf(r, 6);
        const oracle = oracleRect(body, start, travelDir(h, side), [...box, ...fieldEdges])!;
        assert.ok(Math.abs(seg.distance - oracle.t) < 1e-6, `${seg.distance} vs ${oracle.t}`);
        const noWall = r.diagnostics.some((d: Diagnostic) => d.code === 'no-wall');
        assert.equal(noWall, Math.abs(heading) > 30, 'no-wall beyond 30° off square (spec section 5)');
      });

      it(`circle, ${side}, ${heading}° off the box's normal`, () => {
        const h = side === 'front' ? heading : 180 + heading;
        const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'field 3000 by 2500', 'box "crate" (1200, 1400) to (1600, 1700)', `start (1400, 800) heading ${h}`, `square ${side}`].join('\n'));
        const seg = squareOf(r, 5);
        const m = travelDir(h, side);
        const times = [...box, ...fieldEdges].map((w) => oracleCircle({ x: 1400, y: 800 }, 56, m, w)).filter((t): t is number => t !== undefined);
        assert.ok(Math.abs(seg.distance - Math.min(...times)) < 1e-9, `${seg.distance} vs ${Math.min(...times)}`);
        assert.equal(r.diagnostics.some((d) => d.code === 'no-wall'), Math.abs(heading) > 30);
      });
    }
  }
});

describe('square: properties on random squares', () => {
  it('first contact matches the independent one, nothing crosses the wall met, and every obstacle on the way is reported', function () {
    this.timeout(120_000);
    const rnd = mulberry32(0x5a11);
    const body: Body = { width: 150, length: 190, axle: -30 };
    let squared = 0;
    for (let i = 0; i < 400; i++) {
      const useBody = rnd() < 0.6;
      const side = rnd() < 0.5 ? 'front' : 'back';
      const bx = 600 + rnd() * 1400;
      const by = 600 + rnd() * 1000;
      const bw = 80 + rnd() * 500;
      const bh = 80 + rnd() * 500;
      const cx = 300 + rnd() * 2400;
      const cy = 300 + rnd() * 1900;
      const start: Pose = { x: 200 + rnd() * 2600, y: 200 + rnd() * 2100, heading: Math.round(rnd() * 3600) / 10 };
      const lines = ['wheel 56 mm', 'track 112 mm', useBody ? 'body 150 by 190 axle -30' : '# round footprint', 'field 3000 by 2500',
        `box "B" (${bx.toFixed(3)}, ${by.toFixed(3)}) to (${(bx + bw).toFixed(3)}, ${(by + bh).toFixed(3)})`,
        `circle "C" (${cx.toFixed(3)}, ${cy.toFixed(3)}) radius 40`,
        `start (${start.x.toFixed(3)}, ${start.y.toFixed(3)}) heading ${start.heading}`, `square ${side}`];
      start.x = Number(start.x.toFixed(3));
      start.y = Number(start.y.toFixed(3));
      const r = checkPlan(lines.join('\n'));
      if (codesOn(r, 6).length) continue; // the start itself overlaps something: not a square to judge
      const seg = squareOf(r, 7);
      const m = travelDir(start.heading, side);
      const walls = [...boxSides(Number(bx.toFixed(3)), Number(by.toFixed(3)), Number((bx + bw).toFixed(3)), Number((by + bh).toFixed(3))), ...boxSides(0, 0, 3000, 2500)];
      const oracle = useBody
        ? oracleRect(body, start, m, walls)?.t
        : Math.min(...walls.map((w) => oracleCircle(start, 56, m, w)).filter((t): t is number => t !== undefined));
      assert.ok(oracle !== undefined);
      assert.ok(Math.abs(seg.distance - oracle) < 1e-5, `plan ${i}: travel ${seg.distance} vs ${oracle}\n${lines.join('\n')}`);
      squared++;

      // Before first contact the footprint never reaches into the box or out of the field.
      const reported = codesOn(r, 7);
      const circleHit = r.diagnostics.some((d) => d.range.start.line === 7 && d.code === 'collision' && d.message.includes('"C"'));
      let touchesCircle = false;
      for (let k = 0; k <= 40; k++) {
        const t = (seg.distance * k) / 40;
        const at: Pose = { x: start.x + m.x * t, y: start.y + m.y * t, heading: start.heading };
        const shape = useBody ? rectAt(body, at) : new Flatten.Circle(new Flatten.Point(at.x, at.y), 56);
        const boxShape = new Flatten.Polygon(new Flatten.Box(Number(bx.toFixed(3)), Number(by.toFixed(3)), Number((bx + bw).toFixed(3)), Number((by + bh).toFixed(3))));
        if (k < 40 && seg.distance > 1e-6) {
          // Strictly apart from the box, and wholly inside the field, until the contact.
          const [d] = (shape as Flatten.Polygon).distanceTo(boxShape);
          const inside = boxShape.contains(new Flatten.Point(at.x, at.y));
          assert.ok(d > 1e-12 && !inside, `plan ${i}: touches the box before contact at t = ${t} (d = ${d})`);
          const pts = useBody ? footprintCorners(body, at, 'clockwise') : [{ x: at.x - 56, y: at.y - 56 }, { x: at.x + 56, y: at.y + 56 }];
          assert.ok(pts.every((p) => p.x > 0 && p.x < 3000 && p.y > 0 && p.y < 2500), `plan ${i}: leaves the field before contact at t = ${t}`);
        }
        const circle = new Flatten.Circle(new Flatten.Point(cx, cy), 40);
        const [dc] = (shape as Flatten.Polygon).distanceTo(circle);
        const centreIn = useBody ? (shape as Flatten.Polygon).contains(new Flatten.Point(cx, cy)) : Math.hypot(at.x - cx, at.y - cy) < 96;
        if (dc < 1e-6 || centreIn) touchesCircle = true;
      }
      // An obstacle crossed by the drive to the wall is reported (sampled, so only clear crossings are required).
      if (touchesCircle) assert.ok(circleHit, `plan ${i}: the drive crosses "C" but ${JSON.stringify(reported)}\n${lines.join('\n')}`);
    }
    assert.ok(squared > 200, `only ${squared} squares judged`);
  });
});

describe('square: drawing', () => {
  it('a nearly square approach keeps the drawing the size of the field (the turn onto the wall has no far-off centre)', () => {
    const r = checkPlan(['wheel 56 mm', 'track 112 mm', 'body 150 by 190', 'field 2000 by 1500', 'start (1000, 700) heading 0.000001', 'square front'].join('\n'));
    const svg = renderSvg(r, { standalone: true });
    const [, , , w, h] = /viewBox="([-\d.]+) ([-\d.]+) ([\d.]+) ([\d.]+)"/.exec(svg)!.map(Number);
    // The field is 2000 × 1500 mm; a margin for labels is common practice, no published source.
    assert.ok(w < 4000 && h < 4000, `viewBox ${w} × ${h}`);
    assert.doesNotMatch(svg, /class="center"/);
  });
});
