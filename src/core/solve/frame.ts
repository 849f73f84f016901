// The field frame and the file's sign convention, in one place.
//
// Field frame: origin at the lower-left corner, x right, y up. Heading 0 faces
// +y. Positive headings and turns go clockwise under `turns clockwise` and
// counterclockwise under `turns counterclockwise` (spec section 2).
import type { Point, Pose, Robot, TurnDirection } from '../types';

const RAD = Math.PI / 180;

/** +1 when positive turns are clockwise, -1 when counterclockwise. */
export function turnSign(turns: TurnDirection): 1 | -1 {
  return turns === 'clockwise' ? 1 : -1;
}

/** Unit vector the robot faces at `heading` (degrees). */
export function forwardVector(heading: number, turns: TurnDirection): Point {
  const s = turnSign(turns);
  return { x: s * Math.sin(heading * RAD), y: Math.cos(heading * RAD) };
}

/** Unit vector to the robot's right (as seen from behind, facing its heading). */
export function rightVector(heading: number, turns: TurnDirection): Point {
  const s = turnSign(turns);
  return { x: Math.cos(heading * RAD), y: -s * Math.sin(heading * RAD) };
}

/**
 * Rotates `p` about `center` by `turned` degrees, positive in the file's turn
 * direction (so a clockwise file turns clockwise on the drawing).
 */
export function rotateAbout(p: Point, center: Point, turned: number, turns: TurnDirection): Point {
  const a = -turnSign(turns) * turned * RAD; // mathematical (counterclockwise) angle
  const c = Math.cos(a);
  const s = Math.sin(a);
  const dx = p.x - center.x;
  const dy = p.y - center.y;
  return { x: center.x + c * dx - s * dy, y: center.y + s * dx + c * dy };
}

/** The pose after a rigid rotation of the robot about `center`. */
export function rotatePose(pose: Pose, center: Point, turned: number, turns: TurnDirection): Pose {
  const p = rotateAbout(pose, center, turned, turns);
  return { x: p.x, y: p.y, heading: pose.heading + turned };
}

/** Field heading normalised into [0, 360). */
export function normaliseHeading(h: number): number {
  const r = ((h % 360) + 360) % 360;
  return r === 360 || Object.is(r, -0) ? 0 : r;
}

/** A reading wrapped into the sensor's half-open range [lo, lo + 360). */
export function wrapReading(value: number, lo: number): number {
  const d = value - lo;
  // Inside the range already (the usual case, every control-loop sample), the formula below gives the value itself:
  // 0 < d < 360 makes the quotient round below 1. (d = 0 is left to it: it turns a reading of -0 into 0.)
  const r = d > 0 && d < 360 ? value : value - 360 * Math.floor(d / 360);
  // Floating error can land exactly on the open end.
  return r >= lo + 360 ? r - 360 : r;
}

/** The robot's footprint: a rectangle (with `body`) or a circle around the axle midpoint. */
export type Footprint =
  | { kind: 'rect'; width: number; length: number; axle: number }
  | { kind: 'circle'; radius: number };

export function footprintOf(robot: Partial<Robot>): Footprint {
  if (robot.body) return { kind: 'rect', ...robot.body };
  return { kind: 'circle', radius: (robot.track ?? 0) / 2 };
}

/**
 * Corners of a rectangular footprint at `pose`, in the order front-left,
 * front-right, back-right, back-left.
 */
export function footprintCorners(fp: { width: number; length: number; axle: number }, pose: Pose, turns: TurnDirection): Point[] {
  const f = forwardVector(pose.heading, turns);
  const r = rightVector(pose.heading, turns);
  // The axle midpoint sits `axle` ahead of the footprint's centre.
  const cx = pose.x - fp.axle * f.x;
  const cy = pose.y - fp.axle * f.y;
  const hl = fp.length / 2;
  const hw = fp.width / 2;
  const corner = (along: number, across: number): Point => ({
    x: cx + along * f.x + across * r.x,
    y: cy + along * f.y + across * r.y,
  });
  return [corner(hl, -hw), corner(hl, hw), corner(-hl, hw), corner(-hl, -hw)];
}
