// The predicted path as pieces the sweep and the renderer already know: the
// simulated poses (one per step) merged into rigid motions (a slide, or a
// rotation about the point it leaves fixed) wherever one such motion passes
// every pose between within a tolerance.
import type { PathPiece, Pose, TurnDirection } from '../types';
import { forwardVector, rotateAbout } from '../solve/frame';

/** Growable columns of poses. */
export class PoseBuffer {
  t: number[] = [];
  x: number[] = [];
  y: number[] = [];
  h: number[] = [];

  pose(t: number, x: number, y: number, h: number): void {
    this.t.push(t);
    this.x.push(x);
    this.y.push(y);
    this.h.push(h);
  }

  get length(): number {
    return this.x.length;
  }

  at(i: number): Pose {
    return { x: this.x[i], y: this.y[i], heading: this.h[i] };
  }

  clear(): void {
    this.t.length = 0;
    this.x.length = 0;
    this.y.length = 0;
    this.h.length = 0;
  }
}

/** How far (mm, degrees) a merged piece may pass from a simulated pose. */
const TOLERANCE_MM = 0.5;
const TOLERANCE_DEG = 0.25;

/** The rigid motion from `a` to `b`: a rotation about its fixed point, or a slide. */
export function rigidPiece(a: Pose, b: Pose, turns: TurnDirection): PathPiece {
  const turned = b.heading - a.heading;
  if (Math.abs(turned) < 1e-9) return { type: 'line', from: a, to: b };
  // The fixed point c solves b − c = R(a − c): (I − R) c = b − R a.
  const ang = (turns === 'clockwise' ? -1 : 1) * turned * (Math.PI / 180);
  const cos = Math.cos(ang);
  const sin = Math.sin(ang);
  const rx = b.x - (cos * a.x - sin * a.y);
  const ry = b.y - (sin * a.x + cos * a.y);
  const m11 = 1 - cos;
  const m12 = sin;
  const det = m11 * m11 + m12 * m12;
  const center = { x: (rx * m11 - m12 * ry) / det, y: (m11 * ry + m12 * rx) / det };
  if (!Number.isFinite(center.x) || !Number.isFinite(center.y) || Math.hypot(center.x - a.x, center.y - a.y) > 1e5) {
    return { type: 'line', from: a, to: b };
  }
  return { type: 'rotate', from: a, to: b, center, turned };
}

/** The pose a piece passes through nearest to `p` (by its turn, or along a slide), and how far it is. */
function deviation(piece: PathPiece, p: Pose, turns: TurnDirection): number {
  if (piece.type === 'line') {
    const dx = piece.to.x - piece.from.x;
    const dy = piece.to.y - piece.from.y;
    const len2 = dx * dx + dy * dy;
    const f = len2 > 0 ? Math.max(0, Math.min(1, ((p.x - piece.from.x) * dx + (p.y - piece.from.y) * dy) / len2)) : 0;
    const dh = Math.abs(p.heading - piece.from.heading);
    return Math.max(Math.hypot(piece.from.x + f * dx - p.x, piece.from.y + f * dy - p.y) / TOLERANCE_MM, dh / TOLERANCE_DEG);
  }
  const f = (p.heading - piece.from.heading) / piece.turned;
  if (f < -1e-6 || f > 1 + 1e-6) return Infinity; // the heading went back: not one rotation
  const q = rotateAbout(piece.from, piece.center, f * piece.turned, turns);
  return Math.hypot(q.x - p.x, q.y - p.y) / TOLERANCE_MM;
}

/** Pieces through the poses from index `from` to `to` (inclusive), within the tolerance. */
export function simplify(poses: PoseBuffer, from: number, to: number, turns: TurnDirection): PathPiece[] {
  const out: PathPiece[] = [];
  const stack: [number, number][] = [[from, to]];
  const done: [number, PathPiece][] = [];
  while (stack.length) {
    const [i, j] = stack.pop()!;
    const a = poses.at(i);
    const b = poses.at(j);
    if (j - i <= 1) {
      if (a.x !== b.x || a.y !== b.y || a.heading !== b.heading) done.push([i, rigidPiece(a, b, turns)]);
      continue;
    }
    const piece = rigidPiece(a, b, turns);
    let worst = 0;
    let at = -1;
    for (let k = i + 1; k < j; k++) {
      const d = deviation(piece, poses.at(k), turns);
      if (d > worst) { worst = d; at = k; }
    }
    if (worst <= 1) {
      if (a.x !== b.x || a.y !== b.y || a.heading !== b.heading) done.push([i, piece]);
    } else {
      stack.push([at, j], [i, at]);
    }
  }
  done.sort((p, q) => p[0] - q[0]);
  for (const [, piece] of done) out.push(piece);
  return out;
}

/** Largest distance (mm) and heading difference (degrees, modulo 360) between two poses. */
export function poseDifference(a: Pose, b: Pose): { mm: number; deg: number } {
  const d = ((((a.heading - b.heading) % 360) + 540) % 360) - 180;
  return { mm: Math.hypot(a.x - b.x, a.y - b.y), deg: Math.abs(d) };
}

/** The unit vector a pose faces (re-exported for the run's checks). */
export { forwardVector };
