// Exact footprint sweep: which obstacles the robot's footprint touches, and
// whether it leaves the field, at any moment of one path piece. Nothing is
// sampled, so a spin that clears a wall by a millimetre is told apart from a
// pivot that does not.
//
// Method. Every shape is a "rounded rectangle": an oriented rectangle (possibly
// of zero size) grown by a radius. A body rectangle and a box have radius 0; a
// circular footprint and a circle obstacle are zero-size rectangles grown by
// their radius. Touching (within TOUCH mm) counts as a hit.
//
// Translation by d, t in [0, 1]:
// - rectangle vs rectangle: separating axes over time. Translation keeps the
//   four edge normals fixed, and on each normal the projections overlap for an
//   interval of t (their gap is linear in t); the shapes touch at some moment
//   iff those intervals and [0, 1] share a point.
// - a round shape vs anything: relative to the other shape the round one's
//   centre moves on a segment; they touch iff the segment comes within the
//   radius of the other's rectangle (segment-to-rectangle distance: zero if the
//   segment enters it, else attained at a segment end or at a corner's
//   projection on the segment).
// Rotation about c by an angle a:
// - round footprint: its centre moves on an arc, which must come within the
//   radius sum of the obstacle's rectangle.
// - rectangle footprint vs circle obstacle: seen from the footprint, the
//   obstacle's centre moves on the reverse arc (angle -a); the same arc test
//   against the footprint's start rectangle.
// - rectangle vs rectangle: two convex shapes touch at some moment iff they
//   touch at the start or, at their first contact, a vertex of one meets the
//   other: a footprint vertex's arc reaches the box, or a box vertex's reverse
//   arc reaches the start footprint.
// "An arc comes within R of a rectangle" iff its start point is within R, or it
// crosses the boundary of the rectangle grown by R: an edge pushed out by R
// (circle-line intersection in the rectangle's own axes, then an
// angle-in-sweep test) or the circle of radius R about a corner (point-to-arc
// distance).
// Field: the bounding box of the swept region is exact. For a rotation each
// vertex's arc contributes its end points and the axis extremes inside the
// swept angle; for a translation, the vertices at both ends. Lying flush with
// an edge (a squared robot) is still on the field; sticking out by more than
// TOUCH is not.
// Markers: the contact point is placed on the footprint at the fraction of the
// motion where the contact was found (a point in the overlap of the two shapes).
import type { Field, Obstacle, PathPiece, Point, Pose, TurnDirection } from '../types';
import { forwardVector, rotateAbout, turnSign, type Footprint } from './frame';

/** sqrt(x² + y²): Math.hypot allocates its arguments on every call, and this runs per corner per obstacle. */
function len2(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}

export interface SweepHit {
  /** 'obstacle': touches `obstacle`; 'field': leaves the field rectangle. */
  kind: 'obstacle' | 'field';
  obstacle?: Obstacle;
  /** A point of the contact / the part outside (field frame, mm), for a marker in the drawing. */
  at: Point;
  /** Where the robot is at the first contact with an obstacle, for drawing its footprint there. */
  pose?: Pose;
}

/** Distances up to this many mm count as touching. */
const TOUCH = 1e-6;
const TWO_PI = 2 * Math.PI;
const RAD = Math.PI / 180;
/** Below this, a length is treated as zero (an arc of this radius is a point). */
const TINY = 1e-12;
const NO_HIT = -1;

/**
 * An oriented rectangle centred on (x, y) with unit axis u and v = u turned a
 * quarter counterclockwise, half sizes hu along u and hv along v, grown by r.
 * The shapes met here never have both a size and a radius.
 */
interface Shape {
  x: number;
  y: number;
  ux: number;
  uy: number;
  hu: number;
  hv: number;
  r: number;
}

type Motion =
  | { kind: 'line'; dx: number; dy: number }
  /** `alpha`: mathematical (counterclockwise) angle in radians, within [-2π, 2π]. */
  | { kind: 'rotate'; cx: number; cy: number; alpha: number };

/** Every obstacle touched (once each) and whether the footprint leaves the field, during one path piece. */
export function sweepPiece(piece: PathPiece, footprint: Footprint, turns: TurnDirection,
                           obstacles: readonly Obstacle[], field?: Field): SweepHit[] {
  const hits: SweepHit[] = [];
  const start = footprintShape(footprint, piece.from, turns);
  const motion = motionOf(piece, turns);
  if (!start || !motion) return hits;

  const bound = motionBound(start, motion);
  const obstacle: Shape = { x: 0, y: 0, ux: 1, uy: 0, hu: 0, hv: 0, r: 0 };
  for (const o of obstacles) {
    if (!fillObstacleShape(o, obstacle)) continue;
    const reach = bound.r + len2(obstacle.hu, obstacle.hv) + obstacle.r + TOUCH;
    if (distSq(bound.x, bound.y, obstacle.x, obstacle.y) > reach * reach) continue;
    const s = sweptContact(start, motion, obstacle);
    if (s === NO_HIT) continue;
    hits.push({ kind: 'obstacle', obstacle: o, at: contactPoint(shapeAt(start, motion, s), obstacle), pose: poseAt(piece, motion, s, turns) });
  }
  // A motion whose bounding circle lies inside the field cannot leave it.
  if (field && !(bound.x - bound.r > TOUCH && bound.y - bound.r > TOUCH && bound.x + bound.r < field.width - TOUCH && bound.y + bound.r < field.height - TOUCH)) {
    const outside = farthestOutside(start, motion, field);
    if (outside) hits.push({ kind: 'field', at: outside });
  }
  return hits;
}

/** The robot's pose a fraction `s` of the way through a piece (of its rotation, at most one full turn). */
function poseAt(piece: PathPiece, motion: Motion, s: number, turns: TurnDirection): Pose {
  if (piece.type === 'line' || motion.kind === 'line') {
    return { x: piece.from.x + (piece.to.x - piece.from.x) * s, y: piece.from.y + (piece.to.y - piece.from.y) * s, heading: piece.from.heading };
  }
  const turned = (-motion.alpha / turnSign(turns) / RAD) * s;
  const p = rotateAbout(piece.from, piece.center, turned, turns);
  return { x: p.x, y: p.y, heading: piece.from.heading + turned };
}

/** Same test for a robot standing still at a pose (used at `start`). */
export function overlapsAt(pose: Pose, footprint: Footprint, turns: TurnDirection,
                           obstacles: readonly Obstacle[], field?: Field): SweepHit[] {
  return sweepPiece({ type: 'line', from: pose, to: pose }, footprint, turns, obstacles, field);
}

// ---------------------------------------------------------------------------
// Shapes and motions

function footprintShape(fp: Footprint, pose: Pose, turns: TurnDirection): Shape | null {
  if (!Number.isFinite(pose.x) || !Number.isFinite(pose.y) || !Number.isFinite(pose.heading)) return null;
  if (fp.kind === 'circle') {
    if (!Number.isFinite(fp.radius)) return null;
    return { x: pose.x, y: pose.y, ux: 1, uy: 0, hu: 0, hv: 0, r: Math.abs(fp.radius) };
  }
  if (!Number.isFinite(fp.width) || !Number.isFinite(fp.length) || !Number.isFinite(fp.axle)) return null;
  const f = forwardVector(pose.heading, turns);
  // The axle midpoint sits `axle` ahead of the footprint's centre (frame.ts).
  return {
    x: pose.x - fp.axle * f.x,
    y: pose.y - fp.axle * f.y,
    ux: f.x,
    uy: f.y,
    hu: Math.abs(fp.length) / 2,
    hv: Math.abs(fp.width) / 2,
    r: 0,
  };
}

/** Writes the obstacle's shape into `out`; false for an obstacle with missing or non-finite values. */
function fillObstacleShape(o: Obstacle, out: Shape): boolean {
  out.ux = 1;
  out.uy = 0;
  if (o.kind === 'box') {
    if (!o.min || !o.max) return false;
    out.x = (o.min.x + o.max.x) / 2;
    out.y = (o.min.y + o.max.y) / 2;
    out.hu = Math.abs(o.max.x - o.min.x) / 2;
    out.hv = Math.abs(o.max.y - o.min.y) / 2;
    out.r = 0;
  } else {
    if (!o.center || o.radius === undefined) return false;
    out.x = o.center.x;
    out.y = o.center.y;
    out.hu = 0;
    out.hv = 0;
    out.r = Math.abs(o.radius);
  }
  return Number.isFinite(out.x) && Number.isFinite(out.y) && Number.isFinite(out.hu)
    && Number.isFinite(out.hv) && Number.isFinite(out.r);
}

function motionOf(piece: PathPiece, turns: TurnDirection): Motion | null {
  if (piece.type === 'line') {
    const dx = piece.to.x - piece.from.x;
    const dy = piece.to.y - piece.from.y;
    return Number.isFinite(dx) && Number.isFinite(dy) ? { kind: 'line', dx, dy } : null;
  }
  const { center, turned } = piece;
  if (!Number.isFinite(center.x) || !Number.isFinite(center.y) || !Number.isFinite(turned)) return null;
  if (turned === 0) return { kind: 'line', dx: 0, dy: 0 };
  // Same sign rule as frame.ts rotateAbout; beyond one full turn nothing new is swept.
  const alpha = -turnSign(turns) * turned * RAD;
  return { kind: 'rotate', cx: center.x, cy: center.y, alpha: Math.max(-TWO_PI, Math.min(TWO_PI, alpha)) };
}

function isRound(s: Shape): boolean {
  return s.hu === 0 && s.hv === 0;
}

/** The moving shape after fraction `s` of the motion. */
function shapeAt(start: Shape, motion: Motion, s: number): Shape {
  if (motion.kind === 'line') return { ...start, x: start.x + s * motion.dx, y: start.y + s * motion.dy };
  const a = s * motion.alpha;
  const c = Math.cos(a);
  const sn = Math.sin(a);
  const px = start.x - motion.cx;
  const py = start.y - motion.cy;
  return {
    ...start,
    x: motion.cx + c * px - sn * py,
    y: motion.cy + sn * px + c * py,
    ux: c * start.ux - sn * start.uy,
    uy: sn * start.ux + c * start.uy,
  };
}

/** A circle holding the whole swept region, for quick rejection. */
function motionBound(start: Shape, motion: Motion): { x: number; y: number; r: number } {
  const own = len2(start.hu, start.hv) + start.r;
  if (motion.kind === 'line') {
    return { x: start.x + motion.dx / 2, y: start.y + motion.dy / 2, r: len2(motion.dx, motion.dy) / 2 + own };
  }
  return { x: motion.cx, y: motion.cy, r: len2(start.x - motion.cx, start.y - motion.cy) + own };
}

/** Corner k (0..3) of a shape's rectangle, in field coordinates. */
function cornerX(s: Shape, k: number): number {
  return s.x + cornerU(k) * s.hu * s.ux - cornerV(k) * s.hv * s.uy;
}
function cornerY(s: Shape, k: number): number {
  return s.y + cornerU(k) * s.hu * s.uy + cornerV(k) * s.hv * s.ux;
}
function cornerU(k: number): number {
  return k === 0 || k === 3 ? 1 : -1;
}
function cornerV(k: number): number {
  return k < 2 ? 1 : -1;
}
/** A zero-size rectangle has one distinct corner. */
function cornerCount(s: Shape): number {
  return isRound(s) ? 1 : 4;
}

function distSq(ax: number, ay: number, bx: number, by: number): number {
  const dx = ax - bx;
  const dy = ay - by;
  return dx * dx + dy * dy;
}

// ---------------------------------------------------------------------------
// Contact during a motion

/** Fraction of the motion (0..1) at which the moving shape touches `b`, or NO_HIT. */
function sweptContact(a: Shape, motion: Motion, b: Shape): number {
  if (motion.kind === 'line') {
    if (isRound(a)) return segmentNear(b, a.x, a.y, motion.dx, motion.dy, a.r);
    if (isRound(b)) return segmentNear(a, b.x, b.y, -motion.dx, -motion.dy, b.r);
    return translatingBoxes(a, motion.dx, motion.dy, b);
  }
  const { cx, cy, alpha } = motion;
  if (isRound(a)) return arcNear(b, cx, cy, a.x, a.y, alpha, a.r);
  if (isRound(b)) return arcNear(a, cx, cy, b.x, b.y, -alpha, b.r);
  if (boxGap(a, b) <= TOUCH) return 0;
  let best = NO_HIT;
  for (let k = 0; k < 4; k++) {
    best = earlier(best, arcNear(b, cx, cy, cornerX(a, k), cornerY(a, k), alpha, 0));
    best = earlier(best, arcNear(a, cx, cy, cornerX(b, k), cornerY(b, k), -alpha, 0));
  }
  return best;
}

/** Half the width of a rectangle's projection on the unit axis n. */
function extent(s: Shape, nx: number, ny: number): number {
  return s.hu * Math.abs(s.ux * nx + s.uy * ny) + s.hv * Math.abs(s.ux * ny - s.uy * nx);
}

/** Largest gap between the projections of two rectangles on their edge normals (<= 0: overlapping). */
function boxGap(a: Shape, b: Shape): number {
  const gx = a.x - b.x;
  const gy = a.y - b.y;
  let gap = -Infinity;
  for (let k = 0; k < 4; k++) {
    const s = k < 2 ? a : b;
    const nx = k % 2 === 0 ? s.ux : -s.uy;
    const ny = k % 2 === 0 ? s.uy : s.ux;
    gap = Math.max(gap, Math.abs(gx * nx + gy * ny) - extent(a, nx, ny) - extent(b, nx, ny));
  }
  return gap;
}

/** First fraction t at which rectangle `a` moved by t*d touches rectangle `b`, or NO_HIT. */
function translatingBoxes(a: Shape, dx: number, dy: number, b: Shape): number {
  let lo = 0;
  let hi = 1;
  const gx = a.x - b.x;
  const gy = a.y - b.y;
  for (let k = 0; k < 4; k++) {
    const s = k < 2 ? a : b;
    const nx = k % 2 === 0 ? s.ux : -s.uy;
    const ny = k % 2 === 0 ? s.uy : s.ux;
    const reach = extent(a, nx, ny) + extent(b, nx, ny) + TOUCH;
    const g0 = gx * nx + gy * ny;
    const dn = dx * nx + dy * ny;
    if (Math.abs(dn) < TINY) {
      if (Math.abs(g0) > reach) return NO_HIT;
      continue;
    }
    const t1 = (-reach - g0) / dn;
    const t2 = (reach - g0) / dn;
    lo = Math.max(lo, Math.min(t1, t2));
    hi = Math.min(hi, Math.max(t1, t2));
    if (lo > hi) return NO_HIT;
  }
  return lo;
}

/** Distance from a point given in `s`'s own axes to its rectangle (radius not included). */
function localRectDist(s: Shape, lx: number, ly: number): number {
  return len2(Math.max(Math.abs(lx) - s.hu, 0), Math.max(Math.abs(ly) - s.hv, 0));
}

/**
 * Fraction t (0..1) at which the segment p + t*d comes within `radius` of the
 * shape `s` (its own radius added), at the closest approach; NO_HIT if never.
 */
function segmentNear(s: Shape, px: number, py: number, dx: number, dy: number, radius: number): number {
  const rx = px - s.x;
  const ry = py - s.y;
  const lpx = rx * s.ux + ry * s.uy;
  const lpy = ry * s.ux - rx * s.uy;
  const ldx = dx * s.ux + dy * s.uy;
  const ldy = dy * s.ux - dx * s.uy;
  const reach = radius + s.r + TOUCH;

  const entry = slabEntry(lpx, ldx, s.hu, lpy, ldy, s.hv);
  if (entry !== NO_HIT) return entry;

  let bestT = 0;
  let best = localRectDist(s, lpx, lpy);
  const len2 = ldx * ldx + ldy * ldy;
  if (len2 > 0) {
    // Candidates: the far end (k = -1), then each corner's projection on the segment.
    for (let k = -1; k < cornerCount(s); k++) {
      const t = k < 0 ? 1
        : Math.max(0, Math.min(1, ((cornerU(k) * s.hu - lpx) * ldx + (cornerV(k) * s.hv - lpy) * ldy) / len2));
      const d = localRectDist(s, lpx + t * ldx, lpy + t * ldy);
      if (d < best) {
        best = d;
        bestT = t;
      }
    }
  }
  return best <= reach ? bestT : NO_HIT;
}

/** Fraction at which p + t*d (t in [0, 1]) enters the box [-hx, hx] x [-hy, hy], or NO_HIT. */
function slabEntry(px: number, dx: number, hx: number, py: number, dy: number, hy: number): number {
  let lo = 0;
  let hi = 1;
  for (let axis = 0; axis < 2; axis++) {
    const p = axis === 0 ? px : py;
    const d = axis === 0 ? dx : dy;
    const h = axis === 0 ? hx : hy;
    if (Math.abs(d) < TINY) {
      if (Math.abs(p) > h) return NO_HIT;
      continue;
    }
    const t1 = (-h - p) / d;
    const t2 = (h - p) / d;
    lo = Math.max(lo, Math.min(t1, t2));
    hi = Math.min(hi, Math.max(t1, t2));
    if (lo > hi) return NO_HIT;
  }
  return lo;
}

/**
 * Fraction (0..1) of the arc at which the point p, turned about c by `alpha`,
 * comes within `radius` of the shape `s` (its own radius added); NO_HIT if never.
 */
function arcNear(s: Shape, cx: number, cy: number, px: number, py: number, alpha: number, radius: number): number {
  // Work in the shape's own axes: the rectangle is then axis-aligned, and the
  // change of axes is a proper rotation, so the arc keeps its direction.
  const rcx = cx - s.x;
  const rcy = cy - s.y;
  const lcx = rcx * s.ux + rcy * s.uy;
  const lcy = rcy * s.ux - rcx * s.uy;
  const rpx = px - s.x;
  const rpy = py - s.y;
  const lpx = rpx * s.ux + rpy * s.uy;
  const lpy = rpy * s.ux - rpx * s.uy;
  const reach = radius + s.r + TOUCH;

  if (localRectDist(s, lpx, lpy) <= reach) return 0;
  const rho = len2(lpx - lcx, lpy - lcy);
  if (rho < TINY) return NO_HIT;
  const arc: Arc = { cx: lcx, cy: lcy, rho, phi0: Math.atan2(lpy - lcy, lpx - lcx), alpha };

  let best = NO_HIT;
  // Edges pushed out by `reach`: y = ±(hv + reach) for |x| <= hu, x = ±(hu + reach) for |y| <= hv.
  for (let side = 1; side >= -1; side -= 2) {
    if (s.hu > 0) best = earlier(best, arcCrossesEdge(arc, 1, side * (s.hv + reach), s.hu));
    if (s.hv > 0) best = earlier(best, arcCrossesEdge(arc, 0, side * (s.hu + reach), s.hv));
  }
  for (let k = 0; k < cornerCount(s); k++) {
    const qx = cornerU(k) * s.hu;
    const qy = cornerV(k) * s.hv;
    const t = arcClosest(arc, qx, qy);
    if (arcDistance(arc, qx, qy, t) <= reach) best = earlier(best, t);
  }
  return best;
}

/** An arc from angle phi0 (radians, counterclockwise from +x) turning by alpha, about (cx, cy). */
interface Arc {
  cx: number;
  cy: number;
  rho: number;
  phi0: number;
  alpha: number;
}

/** Earliest fraction at which the arc meets the edge {axis coordinate = at, other coordinate within ±half}. */
function arcCrossesEdge(arc: Arc, axis: 0 | 1, at: number, half: number): number {
  const across = axis === 1 ? at - arc.cy : at - arc.cx;
  const q = arc.rho * arc.rho - across * across;
  if (q < 0) return NO_HIT;
  const w = Math.sqrt(q);
  return earlier(circlePointOnEdge(arc, axis, across, -w, half), circlePointOnEdge(arc, axis, across, w, half));
}

/** Fraction at which the arc passes the circle point `across`/`along` from its centre, if that lies on the edge. */
function circlePointOnEdge(arc: Arc, axis: 0 | 1, across: number, along: number, half: number): number {
  const other = (axis === 1 ? arc.cx : arc.cy) + along;
  if (Math.abs(other) > half) return NO_HIT;
  return sweepFraction(arc, axis === 1 ? Math.atan2(across, along) : Math.atan2(along, across));
}

/** The earlier of two fractions, either of which may be NO_HIT. */
function earlier(a: number, b: number): number {
  if (a === NO_HIT) return b;
  return b === NO_HIT ? a : Math.min(a, b);
}

/** Fraction of the sweep at which the arc passes angle phi, or NO_HIT if it never does. */
function sweepFraction(arc: Arc, phi: number): number {
  const turn = Math.abs(arc.alpha);
  let delta = (phi - arc.phi0) * Math.sign(arc.alpha || 1);
  delta -= TWO_PI * Math.floor(delta / TWO_PI);
  const slack = TOUCH / arc.rho;
  if (delta >= TWO_PI - slack) return 0;
  if (delta <= turn + slack) return turn === 0 ? 0 : Math.min(delta / turn, 1);
  return NO_HIT;
}

/** Fraction of the arc at its point closest to (qx, qy). */
function arcClosest(arc: Arc, qx: number, qy: number): number {
  const vx = qx - arc.cx;
  const vy = qy - arc.cy;
  if (len2(vx, vy) < TINY) return 0;
  const t = sweepFraction(arc, Math.atan2(vy, vx));
  if (t !== NO_HIT) return t;
  // Off the sweep, distance grows with the angle away from q, so an end is closest.
  const end = arc.phi0 + arc.alpha;
  const toStart = distSq(qx, qy, arc.cx + arc.rho * Math.cos(arc.phi0), arc.cy + arc.rho * Math.sin(arc.phi0));
  const toEnd = distSq(qx, qy, arc.cx + arc.rho * Math.cos(end), arc.cy + arc.rho * Math.sin(end));
  return toEnd < toStart ? 1 : 0;
}

function arcDistance(arc: Arc, qx: number, qy: number, t: number): number {
  const phi = arc.phi0 + t * arc.alpha;
  return len2(qx - arc.cx - arc.rho * Math.cos(phi), qy - arc.cy - arc.rho * Math.sin(phi));
}

// ---------------------------------------------------------------------------
// Field

/** The point of the swept footprint farthest outside the field, or null when it stays inside. */
function farthestOutside(start: Shape, motion: Motion, field: Field): Point | null {
  const out: Outside = { excess: TOUCH, x: 0, y: 0, found: false };
  for (let k = 0; k < cornerCount(start); k++) {
    const x = cornerX(start, k);
    const y = cornerY(start, k);
    considerDisc(out, field, x, y, start.r);
    if (motion.kind === 'line') {
      considerDisc(out, field, x + motion.dx, y + motion.dy, start.r);
      continue;
    }
    const rho = len2(x - motion.cx, y - motion.cy);
    if (rho < TINY) continue;
    const arc: Arc = { cx: motion.cx, cy: motion.cy, rho, phi0: Math.atan2(y - motion.cy, x - motion.cx), alpha: motion.alpha };
    const end = arc.phi0 + arc.alpha;
    considerDisc(out, field, motion.cx + rho * Math.cos(end), motion.cy + rho * Math.sin(end), start.r);
    // The arc's axis extremes (east, north, west, south) when the sweep passes them.
    for (let q = 0; q < 4; q++) {
      if (sweepFraction(arc, (q * Math.PI) / 2) === NO_HIT) continue;
      const dirX = q === 0 ? 1 : q === 2 ? -1 : 0;
      const dirY = q === 1 ? 1 : q === 3 ? -1 : 0;
      considerPoint(out, field, motion.cx + dirX * (rho + start.r), motion.cy + dirY * (rho + start.r));
    }
  }
  return out.found ? { x: out.x, y: out.y } : null;
}

/** The worst point outside the field found so far. */
interface Outside {
  excess: number;
  x: number;
  y: number;
  found: boolean;
}

/** The four axis extremes of a disc (a point when r = 0). */
function considerDisc(out: Outside, field: Field, x: number, y: number, r: number): void {
  considerPoint(out, field, x - r, y);
  considerPoint(out, field, x + r, y);
  considerPoint(out, field, x, y - r);
  considerPoint(out, field, x, y + r);
}

function considerPoint(out: Outside, field: Field, x: number, y: number): void {
  const excess = Math.max(-x, x - field.width, -y, y - field.height);
  if (excess > out.excess) {
    out.excess = excess;
    out.x = x;
    out.y = y;
    out.found = true;
  }
}

// ---------------------------------------------------------------------------
// Marker point

/** Corners nearer than this to the other shape count as lying on it when placing a marker. */
const ON_SHAPE = 4 * TOUCH;

/** A point where two touching shapes meet. */
function contactPoint(a: Shape, b: Shape): Point {
  if (isRound(a) || isRound(b)) {
    // The point of the other shape nearest to the round one's centre lies within its radius.
    const [round, other] = isRound(a) ? [a, b] : [b, a];
    const [x, y] = project(other, round.x, round.y);
    return { x, y };
  }
  // The overlap of two rectangles is a convex polygon whose vertices are
  // corners of one inside the other and crossings of their edges; the mean of
  // those lies in it.
  let sumX = 0;
  let sumY = 0;
  let count = 0;
  for (let k = 0; k < 8; k++) {
    const own = k < 4 ? a : b;
    const x = cornerX(own, k % 4);
    const y = cornerY(own, k % 4);
    if (pointShapeDist(k < 4 ? b : a, x, y) <= ON_SHAPE) {
      sumX += x;
      sumY += y;
      count++;
    }
  }
  for (let k = 0; k < 4; k++) {
    for (let j = 0; j < 4; j++) {
      const t = edgeCrossing(a, k, b, j);
      if (t === NO_HIT) continue;
      const n = (k + 1) % 4;
      sumX += cornerX(a, k) + t * (cornerX(a, n) - cornerX(a, k));
      sumY += cornerY(a, k) + t * (cornerY(a, n) - cornerY(a, k));
      count++;
    }
  }
  if (count > 0) return { x: sumX / count, y: sumY / count };
  // Only reached through rounding: the shapes are within TOUCH but no corner
  // was judged on the other shape; the nearest corner stands in.
  return nearestCorner(a, b);
}

function pointShapeDist(s: Shape, x: number, y: number): number {
  const rx = x - s.x;
  const ry = y - s.y;
  return localRectDist(s, rx * s.ux + ry * s.uy, ry * s.ux - rx * s.uy) - s.r;
}

/** Where edge k of `a` (from corner k to k + 1) crosses edge j of `b`, as a fraction along a's edge, or NO_HIT. */
function edgeCrossing(a: Shape, k: number, b: Shape, j: number): number {
  const ax = cornerX(a, k);
  const ay = cornerY(a, k);
  const adx = cornerX(a, (k + 1) % 4) - ax;
  const ady = cornerY(a, (k + 1) % 4) - ay;
  const bx = cornerX(b, j);
  const by = cornerY(b, j);
  const bdx = cornerX(b, (j + 1) % 4) - bx;
  const bdy = cornerY(b, (j + 1) % 4) - by;
  const denom = adx * bdy - ady * bdx;
  if (Math.abs(denom) < TINY) return NO_HIT;
  const t = ((bx - ax) * bdy - (by - ay) * bdx) / denom;
  const u = ((bx - ax) * ady - (by - ay) * adx) / denom;
  return t >= 0 && t <= 1 && u >= 0 && u <= 1 ? t : NO_HIT;
}

function nearestCorner(a: Shape, b: Shape): Point {
  let best: Point = { x: a.x, y: a.y };
  let bestDist = Infinity;
  for (let k = 0; k < 8; k++) {
    const own = k < 4 ? a : b;
    const d = pointShapeDist(k < 4 ? b : a, cornerX(own, k % 4), cornerY(own, k % 4));
    if (d < bestDist) {
      bestDist = d;
      best = { x: cornerX(own, k % 4), y: cornerY(own, k % 4) };
    }
  }
  return best;
}

/** The point of a shape (rectangle grown by its radius) nearest to (x, y). */
function project(s: Shape, x: number, y: number): [number, number] {
  const rx = x - s.x;
  const ry = y - s.y;
  const lx = rx * s.ux + ry * s.uy;
  const ly = ry * s.ux - rx * s.uy;
  const kx = Math.max(-s.hu, Math.min(s.hu, lx));
  const ky = Math.max(-s.hv, Math.min(s.hv, ly));
  const gap = len2(lx - kx, ly - ky);
  const pull = gap > s.r ? s.r / gap : 1;
  const ox = kx + (lx - kx) * pull;
  const oy = ky + (ly - ky) * pull;
  return [s.x + ox * s.ux - oy * s.uy, s.y + ox * s.uy + oy * s.ux];
}
