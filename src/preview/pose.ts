// The robot's predicted pose at a moment of the run, and its outline there,
// for the scrubber's footprint. The preview may not import the core's geometry,
// so the few lines of the field frame's vector maths are repeated here (the
// core's solve/frame.ts is the reference): origin lower-left, x right, y up,
// heading 0 faces +y, positive headings clockwise under `turns clockwise`.
import type { FootprintShape, TimelineBlock, TimelineRun } from '../shared/messages';

export interface Pose {
  x: number;
  y: number;
  heading: number;
}

type Turns = 'clockwise' | 'counterclockwise';
type Poses = TimelineRun['poses'];

const RAD = Math.PI / 180;

/** Index of the last element of the ascending array `values` that is ≤ `v` (-1 when none is). */
function lastAtOrBefore(values: readonly number[], v: number): number {
  let lo = 0;
  let hi = values.length - 1;
  let found = -1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (values[mid]! <= v) {
      found = mid;
      lo = mid + 1;
    } else {
      hi = mid - 1;
    }
  }
  return found;
}

/** The pose at time `t`, linear between samples (headings are unwrapped, so they interpolate as numbers); held at either end. */
export function poseAt(poses: Poses, t: number): Pose | undefined {
  const n = Math.min(poses.t.length, poses.x.length, poses.y.length, poses.heading.length);
  if (n === 0) return undefined;
  const i = lastAtOrBefore(poses.t, t);
  if (i < 0) return { x: poses.x[0]!, y: poses.y[0]!, heading: poses.heading[0]! };
  if (i >= n - 1) return { x: poses.x[n - 1]!, y: poses.y[n - 1]!, heading: poses.heading[n - 1]! };
  const t0 = poses.t[i]!;
  const t1 = poses.t[i + 1]!;
  const u = t1 > t0 ? (t - t0) / (t1 - t0) : 0;
  const mix = (a: readonly number[]): number => a[i]! + (a[i + 1]! - a[i]!) * u;
  return { x: mix(poses.x), y: mix(poses.y), heading: mix(poses.heading) };
}

/** The block running at time `t`: the last that started at or before it (the first before the run starts). */
export function blockAt(blocks: readonly TimelineBlock[], t: number, starts: readonly number[] = blocks.map((b) => b.start)): TimelineBlock | undefined {
  if (blocks.length === 0) return undefined;
  const i = lastAtOrBefore(starts, t);
  return blocks[Math.max(0, i)];
}

/** Unit vector the robot faces at `heading` degrees. */
export function forward(heading: number, turns: Turns): { x: number; y: number } {
  const s = turns === 'clockwise' ? 1 : -1;
  return { x: s * Math.sin(heading * RAD), y: Math.cos(heading * RAD) };
}

/** Unit vector to the robot's right. */
export function right(heading: number, turns: Turns): { x: number; y: number } {
  const s = turns === 'clockwise' ? 1 : -1;
  return { x: Math.cos(heading * RAD), y: -s * Math.sin(heading * RAD) };
}

/** What to draw for the footprint at `pose`, in field millimetres. */
export type Outline =
  | { kind: 'polygon'; points: { x: number; y: number }[]; nose: { x: number; y: number } }
  | { kind: 'circle'; centre: { x: number; y: number }; radius: number; nose: { x: number; y: number } };

/**
 * The footprint's outline at `pose`: a rectangle's corners (front-left,
 * front-right, back-right, back-left, as the core orders them) or a circle; and
 * the point at the middle of its front, for a heading tick from the axle midpoint.
 */
export function outlineAt(footprint: FootprintShape, pose: Pose, turns: Turns): Outline {
  const f = forward(pose.heading, turns);
  if (footprint.kind === 'circle') {
    const r = footprint.radius;
    return { kind: 'circle', centre: { x: pose.x, y: pose.y }, radius: r, nose: { x: pose.x + r * f.x, y: pose.y + r * f.y } };
  }
  const r = right(pose.heading, turns);
  // The axle midpoint sits `axle` ahead of the footprint's centre.
  const cx = pose.x - footprint.axle * f.x;
  const cy = pose.y - footprint.axle * f.y;
  const hl = footprint.length / 2;
  const hw = footprint.width / 2;
  const at = (along: number, across: number) => ({ x: cx + along * f.x + across * r.x, y: cy + along * f.y + across * r.y });
  return { kind: 'polygon', points: [at(hl, -hw), at(hl, hw), at(-hl, hw), at(-hl, -hw)], nose: at(hl, 0) };
}
