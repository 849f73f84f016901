// The predicted path as pieces the sweep and the renderer already know: the
// simulated poses (one per step) merged into rigid motions (a slide, or a
// rotation about the point it leaves fixed) wherever one such motion passes
// every pose between within a tolerance.
import type { PathPiece, Pose, TurnDirection } from '../types';
import { forwardVector } from '../solve/frame';

/** Growable columns of poses. */
export class PoseBuffer {
  t: number[] = [];
  x: number[] = [];
  y: number[] = [];
  h: number[] = [];

  /** With `thin`, a pose is kept only a key pose's distance from the last one kept (the last pose given is kept by `close`). */
  constructor(private readonly thin = false) {}
  private pending?: [number, number, number, number];
  private lastDir = 0;

  pose(t: number, x: number, y: number, h: number): void {
    if (this.thin && this.x.length > 0) {
      const n = this.x.length - 1;
      const dir = Math.sign(h - (this.pending ? this.pending[3] : this.h[n]));
      const reversed = dir !== 0 && this.lastDir !== 0 && dir !== this.lastDir;
      if (dir !== 0) this.lastDir = dir;
      if (reversed && this.pending) this.keep(...this.pending);
      if (!(reversed || Math.abs(h - this.h[this.x.length - 1]) >= KEY_DEG / 4 || Math.hypot(x - this.x[this.x.length - 1], y - this.y[this.x.length - 1]) >= KEY_MM / 4)) {
        this.pending = [t, x, y, h];
        return;
      }
    }
    this.keep(t, x, y, h);
  }

  /** Keeps the last pose given, if it was held back. */
  close(): void {
    if (this.pending) this.keep(...this.pending);
  }

  private keep(t: number, x: number, y: number, h: number): void {
    this.pending = undefined;
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
    this.pending = undefined;
    this.lastDir = 0;
    this.t.length = 0;
    this.x.length = 0;
    this.y.length = 0;
    this.h.length = 0;
  }
}

/** A new piece starts once the robot has turned this much or moved this far since the last one began. */
const KEY_DEG = 8;
const KEY_MM = 50;

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

/**
 * Pieces through the poses from index `from` to `to` (inclusive): a rigid
 * motion between key poses, a new one each time the robot has turned
 * KEY_DEG or moved KEY_MM, or its turning reverses. Between two key poses a
 * smooth simulated path stays within a fraction of a millimetre of the piece.
 */
export function simplify(poses: PoseBuffer, from: number, to: number, turns: TurnDirection): PathPiece[] {
  const out: PathPiece[] = [];
  const { x, y, h } = poses;
  let k = from;
  let dir = 0;
  for (let i = from + 1; i <= to; i++) {
    const step = Math.sign(h[i] - h[i - 1]);
    const reversed = step !== 0 && dir !== 0 && step !== dir;
    if (step !== 0 && dir === 0) dir = step;
    const far = Math.abs(h[i] - h[k]) >= KEY_DEG || Math.hypot(x[i] - x[k], y[i] - y[k]) >= KEY_MM;
    if (i === to || far || reversed) {
      const end = reversed ? i - 1 : i;
      if (end > k) {
        out.push(rigidPiece(poses.at(k), poses.at(end), turns));
        k = end;
      }
      dir = reversed ? step : 0;
      if (reversed && i === to) out.push(rigidPiece(poses.at(k), poses.at(i), turns));
    }
  }
  return out;
}

/** Largest distance (mm) and heading difference (degrees, modulo 360) between two poses. */
export function poseDifference(a: Pose, b: Pose): { mm: number; deg: number } {
  const d = ((((a.heading - b.heading) % 360) + 540) % 360) - 180;
  return { mm: Math.hypot(a.x - b.x, a.y - b.y), deg: Math.abs(d) };
}

/** The unit vector a pose faces (re-exported for the run's checks). */
export { forwardVector };
