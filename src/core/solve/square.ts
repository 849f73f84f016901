// `square front|back`: drive straight along the heading until the footprint
// first touches a wall (a field edge or a box side), then turn square to it
// there: heading on the wall's normal, the leading edge flush with the wall,
// the axle midpoint's position along the wall as it was at the contact.
//
// First contact is exact: the translating footprint (a rectangle, or the
// circle of diameter `track`) against every wall segment, both ways round
// (each corner of the footprint against the segment; each end of the segment
// against the footprint's edges), and for the circle the tangent to the
// wall line and the circle meeting a segment's end.
import type { Field, Obstacle, Point, Pose, TurnDirection } from '../types';
import { footprintCorners, forwardVector, turnSign, type Footprint } from './frame';

export interface Wall {
  /** 'x': the wall is the line x = at (vertical); 'y': y = at. */
  axis: 'x' | 'y';
  at: number;
  /** Extent along the wall. */
  from: number;
  to: number;
  /** Unit normal pointing to the side the robot may come from: +1 or -1 along `axis`. */
  normal: 1 | -1;
  /** The box it belongs to; absent for field edges. */
  obstacle?: Obstacle;
  label: string;
}

export function wallsOf(field: Field | undefined, obstacles: readonly Obstacle[]): Wall[] {
  const walls: Wall[] = [];
  if (field) {
    walls.push({ axis: 'x', at: 0, from: 0, to: field.height, normal: 1, label: 'the left field edge' });
    walls.push({ axis: 'x', at: field.width, from: 0, to: field.height, normal: -1, label: 'the right field edge' });
    walls.push({ axis: 'y', at: 0, from: 0, to: field.width, normal: 1, label: 'the bottom field edge' });
    walls.push({ axis: 'y', at: field.height, from: 0, to: field.width, normal: -1, label: 'the top field edge' });
  }
  for (const o of obstacles) {
    if (o.kind !== 'box' || !o.min || !o.max) continue;
    const { min, max } = o;
    walls.push({ axis: 'x', at: min.x, from: min.y, to: max.y, normal: -1, obstacle: o, label: `the left side of "${o.name}"` });
    walls.push({ axis: 'x', at: max.x, from: min.y, to: max.y, normal: 1, obstacle: o, label: `the right side of "${o.name}"` });
    walls.push({ axis: 'y', at: min.y, from: min.x, to: max.x, normal: -1, obstacle: o, label: `the bottom side of "${o.name}"` });
    walls.push({ axis: 'y', at: max.y, from: min.x, to: max.x, normal: 1, obstacle: o, label: `the top side of "${o.name}"` });
  }
  return walls;
}

export interface SquareOutcome {
  wall: Wall;
  /** Angle between the direction of travel and the wall's normal, degrees. */
  offSquare: number;
  /** Distance driven before the footprint first touches the wall, mm. */
  travel: number;
  /** Where the robot first touches the wall. */
  contact: Point;
  /** The pose at first contact (the heading of the start). */
  atContact: Pose;
  /** The squared pose. */
  end: Pose;
  /**
   * How it went: 'square' (the leading edge met the wall), 'side' (a side of
   * the footprint met a box or field corner first: the robot catches it), or
   * 'slips' (the leading edge met only a corner and, squared, would not rest
   * on the wall's extent).
   */
  outcome: 'square' | 'side' | 'slips';
}

/** Relative tolerance of "the same moment" and "at a segment's end". */
const EPS = 1e-9;
const RAD = Math.PI / 180;

interface Contact {
  t: number;
  point: Point;
  wall: Wall;
  /** The contact is at an end of the wall's segment (a corner). */
  atEnd: boolean;
  /** A leading corner or the leading edge of the footprint touches. */
  leading: boolean;
}

const cross = (ax: number, ay: number, bx: number, by: number) => ax * by - ay * bx;

function segmentOf(w: Wall): [Point, Point] {
  return w.axis === 'x' ? [{ x: w.at, y: w.from }, { x: w.at, y: w.to }] : [{ x: w.from, y: w.at }, { x: w.to, y: w.at }];
}

/** The wall's normal as a vector (pointing to the side the robot comes from). */
function normalOf(w: Wall): Point {
  return w.axis === 'x' ? { x: w.normal, y: 0 } : { x: 0, y: w.normal };
}

/** First contact of a rectangle translating along m with a wall segment. */
function rectContact(corners: Point[], leadingCorners: [number, number], m: Point, w: Wall): Contact | undefined {
  const [a, b] = segmentOf(w);
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len = Math.hypot(dx, dy);
  let best: Contact | undefined;
  const consider = (c: Contact) => {
    if (c.t < -1e-6 * Math.max(1, len)) return;
    if (!best || c.t < best.t - EPS * Math.max(1, Math.abs(best.t)) ||
      (Math.abs(c.t - best.t) <= EPS * Math.max(1, Math.abs(best.t)) && c.leading && !best.leading)) best = c;
  };
  // Each corner of the footprint against the segment.
  const denom = cross(m.x, m.y, dx, dy);
  if (Math.abs(denom) > EPS) {
    corners.forEach((p, i) => {
      const t = cross(a.x - p.x, a.y - p.y, dx, dy) / denom;
      const s = cross(a.x - p.x, a.y - p.y, m.x, m.y) / denom;
      if (s < -EPS || s > 1 + EPS) return;
      consider({ t, point: { x: a.x + s * dx, y: a.y + s * dy }, wall: w, atEnd: s < EPS || s > 1 - EPS, leading: leadingCorners.includes(i) });
    });
  }
  // Each end of the segment against the footprint's edges (moving the other way).
  for (const q of [a, b]) {
    for (let j = 0; j < 4; j++) {
      const c0 = corners[j];
      const c1 = corners[(j + 1) % 4];
      const ex = c1.x - c0.x;
      const ey = c1.y - c0.y;
      const d = cross(-m.x, -m.y, ex, ey);
      if (Math.abs(d) < EPS) continue;
      const t = cross(c0.x - q.x, c0.y - q.y, ex, ey) / d;
      const u = cross(c0.x - q.x, c0.y - q.y, -m.x, -m.y) / d;
      if (u < -EPS || u > 1 + EPS) continue;
      const leadingEdge = (j === leadingCorners[0] && (j + 1) % 4 === leadingCorners[1]) || (j === leadingCorners[1] && (j + 1) % 4 === leadingCorners[0]);
      consider({ t, point: { x: q.x, y: q.y }, wall: w, atEnd: true, leading: leadingEdge });
    }
  }
  return best;
}

/** First contact of a circle (centre p, radius r) translating along m with a wall segment. */
function circleContact(p: Point, r: number, m: Point, w: Wall): Contact | undefined {
  const [a, b] = segmentOf(w);
  const n = normalOf(w);
  let best: Contact | undefined;
  const consider = (c: Contact) => {
    if (c.t < -1e-6) return;
    if (!best || c.t < best.t) best = c;
  };
  // Tangent to the wall line, with the touching point inside the segment.
  const approach = -(m.x * n.x + m.y * n.y);
  const d0 = (p.x - a.x) * n.x + (p.y - a.y) * n.y;
  if (approach > EPS && d0 >= r - 1e-6) {
    const t = (d0 - r) / approach;
    const touch = { x: p.x + m.x * t - r * n.x, y: p.y + m.y * t - r * n.y };
    const along = w.axis === 'x' ? touch.y : touch.x;
    if (along >= w.from - 1e-9 && along <= w.to + 1e-9) consider({ t, point: touch, wall: w, atEnd: false, leading: true });
  }
  // The circle meeting an end of the segment: |p + m t − q| = r.
  for (const q of [a, b]) {
    const wx = p.x - q.x;
    const wy = p.y - q.y;
    const wm = wx * m.x + wy * m.y;
    const disc = wm * wm - (wx * wx + wy * wy - r * r);
    if (disc < 0) continue;
    const t = -wm - Math.sqrt(disc);
    consider({ t, point: { x: q.x, y: q.y }, wall: w, atEnd: true, leading: true });
  }
  return best;
}

/**
 * Drives straight forwards (`front`) or backwards (`back`) until the
 * footprint first touches a wall; undefined when no wall lies ahead. At a
 * corner (a contact at an end of a wall), the robot squares against the wall
 * there that it drives into most squarely.
 */
export function squareUp(
  pose: Pose, side: 'front' | 'back', fp: Footprint, turns: TurnDirection, walls: readonly Wall[],
): SquareOutcome | undefined {
  const f = forwardVector(pose.heading, turns);
  const m = side === 'front' ? f : { x: -f.x, y: -f.y }; // direction of travel
  const corners = fp.kind === 'rect' ? footprintCorners(fp, pose, turns) : [];
  const leadingCorners: [number, number] = side === 'front' ? [0, 1] : [2, 3];

  let first: Contact | undefined;
  for (const w of walls) {
    const n = normalOf(w);
    if (m.x * n.x + m.y * n.y >= -EPS) continue; // moving away from or along this face: it cannot stop the robot
    const c = fp.kind === 'rect' ? rectContact(corners, leadingCorners, m, w) : circleContact(pose, fp.radius, m, w);
    if (!c) continue;
    const tieBand = EPS * Math.max(1, Math.abs(first?.t ?? 0));
    if (!first || c.t < first.t - tieBand || (Math.abs(c.t - first.t) <= tieBand && prefer(c, first, m))) first = c;
  }
  if (!first) return undefined;

  // At a corner, the wall there that faces the travel most squarely.
  let wall = first.wall;
  if (first.atEnd) {
    const there = walls.filter((w) => w.obstacle === first!.wall.obstacle && touchesEnd(w, first!.point));
    for (const w of there) if (facing(w, m) > facing(wall, m)) wall = w;
  }
  const travel = Math.max(0, first.t);
  const atContact: Pose = { x: pose.x + m.x * travel, y: pose.y + m.y * travel, heading: pose.heading };
  const offSquare = Math.acos(Math.min(1, Math.max(-1, facing(wall, m)))) / RAD;

  // Squared: heading on the normal, the leading edge flush, the axle where it was along the wall.
  const targetTravel = wall.axis === 'x' ? { x: -wall.normal, y: 0 } : { x: 0, y: -wall.normal };
  const targetFacing = side === 'front' ? targetTravel : { x: -targetTravel.x, y: -targetTravel.y };
  const s = turnSign(turns);
  const facingHeading = (Math.atan2(s * targetFacing.x, targetFacing.y) * 180) / Math.PI;
  const delta = ((((facingHeading - pose.heading) % 360) + 540) % 360) - 180;
  const edgeOffset = fp.kind === 'rect' ? (side === 'front' ? fp.length / 2 - fp.axle : fp.length / 2 + fp.axle) : fp.radius;
  const halfWidth = fp.kind === 'rect' ? fp.width / 2 : fp.radius;
  const endAcross = wall.at + wall.normal * edgeOffset;
  const end: Pose = wall.axis === 'x'
    ? { x: endAcross, y: atContact.y, heading: pose.heading + delta }
    : { x: atContact.x, y: endAcross, heading: pose.heading + delta };

  let outcome: SquareOutcome['outcome'] = 'square';
  if (!first.leading) outcome = 'side';
  else {
    // Squared, the leading edge must rest on the wall's extent.
    const along = wall.axis === 'x' ? end.y : end.x;
    if (along + halfWidth < wall.from - 1e-6 || along - halfWidth > wall.to + 1e-6) outcome = 'slips';
  }
  return { wall, offSquare, travel, contact: first.point, atContact, end, outcome };
}

/** cos of the angle between the travel and the wall's inward normal (1: straight into it). */
function facing(w: Wall, m: Point): number {
  const n = normalOf(w);
  return -(m.x * n.x + m.y * n.y);
}

function touchesEnd(w: Wall, p: Point): boolean {
  const across = w.axis === 'x' ? p.x : p.y;
  const along = w.axis === 'x' ? p.y : p.x;
  const tol = 1e-6 * Math.max(1, Math.abs(across), Math.abs(along));
  return Math.abs(across - w.at) <= tol && (Math.abs(along - w.from) <= tol || Math.abs(along - w.to) <= tol);
}

/** Of two contacts at the same moment: the leading part, then a wall's inside over its end, then the squarer wall. */
function prefer(a: Contact, b: Contact, m: Point): boolean {
  if (a.leading !== b.leading) return a.leading;
  if (a.atEnd !== b.atEnd) return !a.atEnd;
  return facing(a.wall, m) > facing(b.wall, m);
}
