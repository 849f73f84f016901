// `square front|back`: drive until the footprint's front (back) edge meets a
// wall (a field edge or a box side), then end square to it.
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
  /** Distance driven before the edge meets the wall, mm. */
  travel: number;
  /** Where the robot first touches the wall. */
  contact: Point;
  end: Pose;
}

const along = (p: Point, axis: 'x' | 'y') => (axis === 'x' ? p.y : p.x);
const across = (p: Point, axis: 'x' | 'y') => (axis === 'x' ? p.x : p.y);

/**
 * The first wall the footprint's leading edge meets when driving straight
 * forwards (`front`) or backwards (`back`), or undefined when none is met.
 * The end pose keeps the axle midpoint's position along the wall from the
 * start of the move, puts the edge flush with the wall and the heading on the
 * wall's normal.
 */
export function squareUp(
  pose: Pose, side: 'front' | 'back', fp: Footprint, turns: TurnDirection, walls: readonly Wall[],
): SquareOutcome | undefined {
  const f = forwardVector(pose.heading, turns);
  const m = side === 'front' ? f : { x: -f.x, y: -f.y }; // direction of travel
  // Points of the footprint that lead, and how far ahead of the axle the edge sits.
  let leading: Point[];
  let edgeOffset: number;
  if (fp.kind === 'rect') {
    const c = footprintCorners(fp, pose, turns);
    leading = side === 'front' ? [c[0], c[1]] : [c[2], c[3]];
    edgeOffset = side === 'front' ? fp.length / 2 - fp.axle : fp.length / 2 + fp.axle;
  } else {
    leading = [{ x: pose.x + m.x * fp.radius, y: pose.y + m.y * fp.radius }];
    edgeOffset = fp.radius;
  }
  let best: SquareOutcome | undefined;
  for (const w of walls) {
    const mn = w.axis === 'x' ? m.x : m.y; // travel along the wall's axis
    if (mn * w.normal >= -1e-9) continue; // moving away from or parallel to this face
    // The robot must come from the face's side.
    if ((across(pose, w.axis) - w.at) * w.normal < -1e-6) continue;
    let travel = Infinity;
    let contact: Point | undefined;
    for (const p of leading) {
      const t = (w.at - across(p, w.axis)) / mn;
      if (t < travel) {
        travel = t;
        contact = { x: p.x + m.x * t, y: p.y + m.y * t };
      }
    }
    if (!contact || travel < -1e-6) continue;
    // The leading edge must overlap the wall's extent when it arrives.
    const span = leading.map((p) => along(p, w.axis) + (w.axis === 'x' ? m.y : m.x) * travel);
    const lo = Math.min(...span) - (fp.kind === 'circle' ? fp.radius : 0);
    const hi = Math.max(...span) + (fp.kind === 'circle' ? fp.radius : 0);
    if (hi < w.from - 1e-6 || lo > w.to + 1e-6) continue;
    if (best && travel >= best.travel) continue;
    const offSquare = (Math.acos(Math.min(1, Math.abs(mn))) * 180) / Math.PI;
    // Final heading: the nearest heading whose travel direction is -normal.
    const targetTravel = w.axis === 'x' ? { x: -w.normal, y: 0 } : { x: 0, y: -w.normal };
    const targetFacing = side === 'front' ? targetTravel : { x: -targetTravel.x, y: -targetTravel.y };
    const s = turnSign(turns);
    const facingHeading = (Math.atan2(s * targetFacing.x, targetFacing.y) * 180) / Math.PI;
    const delta = ((((facingHeading - pose.heading) % 360) + 540) % 360) - 180;
    const endAcross = w.at + w.normal * edgeOffset;
    const end: Pose = w.axis === 'x'
      ? { x: endAcross, y: pose.y, heading: pose.heading + delta }
      : { x: pose.x, y: endAcross, heading: pose.heading + delta };
    best = { wall: w, offSquare, travel: Math.max(0, travel), contact, end };
  }
  return best;
}
