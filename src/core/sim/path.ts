// The predicted path as pieces the sweep and the renderer already know: the
// simulated poses (one per step) merged into rigid motions (a slide, or a
// rotation about the point it leaves fixed) wherever one such motion passes
// every pose between within a tolerance.
import type { PathPiece, Pose, TurnDirection } from '../types';
import { rotateAbout } from '../solve/frame';

/** Growable columns of poses. */
export class PoseBuffer {
  t: number[] = [];
  x: number[] = [];
  y: number[] = [];
  h: number[] = [];

  /** With `thin`, a pose is kept only a key pose's distance from the last one kept (the last pose given is kept by `close`). */
  constructor(private readonly thin = false) {}
  private held = false;
  // The pose held back (read only while `held`). Doubles from the start (NaN): a field that starts as a small integer
  // and later holds a fraction makes V8 replace the buffer's hidden class, and the code that has seen the old one is
  // then thrown away at each full garbage collection.
  private ht = NaN;
  private hx = NaN;
  private hy = NaN;
  private hh = NaN;
  private lastDir = 0;

  pose(t: number, x: number, y: number, h: number): void {
    if (this.thin && this.x.length > 0) {
      const n = this.x.length - 1;
      const dir = Math.sign(h - (this.held ? this.hh : this.h[n]));
      const reversed = dir !== 0 && this.lastDir !== 0 && dir !== this.lastDir;
      if (dir !== 0) this.lastDir = dir;
      if (reversed && this.held) this.keep(this.ht, this.hx, this.hy, this.hh);
      const m = this.x.length - 1;
      const dx = x - this.x[m];
      const dy = y - this.y[m];
      if (!(reversed || Math.abs(h - this.h[m]) >= KEY_DEG / 4 || dx * dx + dy * dy >= (KEY_MM / 4) ** 2)) {
        this.held = true;
        this.ht = t;
        this.hx = x;
        this.hy = y;
        this.hh = h;
        return;
      }
    }
    this.keep(t, x, y, h);
  }

  /** Keeps the last pose given, if it was held back. */
  close(): void {
    if (this.held) this.keep(this.ht, this.hx, this.hy, this.hh);
  }

  private keep(t: number, x: number, y: number, h: number): void {
    this.held = false;
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
    this.held = false;
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
  if (Math.abs(turned) < 1e-12) return { type: 'line', from: a, to: b };
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
  // A hair of a turn has its fixed point far away: it is the slide it nearly is.
  if (!Number.isFinite(center.x) || !Number.isFinite(center.y) || Math.hypot(center.x - a.x, center.y - a.y) > 1e5) {
    return { type: 'line', from: a, to: b };
  }
  return { type: 'rotate', from: a, to: b, center, turned };
}

/** How far (mm, degrees) a merged piece may pass from a kept pose. */
const TOLERANCE_MM = 1;
const TOLERANCE_DEG = 0.5;

/** Whether the piece passes within the tolerance of pose `p`. */
function passesNear(piece: PathPiece, p: Pose, turns: TurnDirection): boolean {
  if (piece.type === 'line') {
    const dx = piece.to.x - piece.from.x;
    const dy = piece.to.y - piece.from.y;
    const len2 = dx * dx + dy * dy;
    const f = len2 > 0 ? Math.max(0, Math.min(1, ((p.x - piece.from.x) * dx + (p.y - piece.from.y) * dy) / len2)) : 0;
    const ex = piece.from.x + f * dx - p.x;
    const ey = piece.from.y + f * dy - p.y;
    return ex * ex + ey * ey <= TOLERANCE_MM * TOLERANCE_MM && Math.abs(p.heading - piece.from.heading) <= TOLERANCE_DEG;
  }
  const f = (p.heading - piece.from.heading) / piece.turned;
  if (f < 0 || f > 1) return false;
  const q = rotateAbout(piece.from, piece.center, f * piece.turned, turns);
  const ex = q.x - p.x;
  const ey = q.y - p.y;
  return ex * ex + ey * ey <= TOLERANCE_MM * TOLERANCE_MM;
}

/**
 * Pieces through the poses from index `from` to `to` (inclusive): each piece
 * the rigid motion from one kept pose to a later one, grown while it still
 * passes near the poses between (checked at the newest and the middle one)
 * and the robot keeps turning one way.
 */
export function simplify(poses: PoseBuffer, from: number, to: number, turns: TurnDirection): PathPiece[] {
  const out: PathPiece[] = [];
  let k = from;
  while (k < to) {
    let j = k + 1;
    let piece = rigidPiece(poses.at(k), poses.at(j), turns);
    const dir = Math.sign(poses.h[j] - poses.h[k]);
    while (j < to) {
      const next = j + 1;
      const step = Math.sign(poses.h[next] - poses.h[j]);
      if (step !== 0 && dir !== 0 && step !== dir) break;
      const candidate = rigidPiece(poses.at(k), poses.at(next), turns);
      if (!passesNear(candidate, poses.at(j), turns) || !passesNear(candidate, poses.at((k + next) >> 1), turns)) break;
      piece = candidate;
      j = next;
    }
    out.push(piece);
    k = j;
  }
  return out;
}

/** Largest distance (mm) and heading difference (degrees, modulo 360) between two poses. */
export function poseDifference(a: Pose, b: Pose): { mm: number; deg: number } {
  const d = ((((a.heading - b.heading) % 360) + 540) % 360) - 180;
  return { mm: Math.hypot(a.x - b.x, a.y - b.y), deg: Math.abs(d) };
}
