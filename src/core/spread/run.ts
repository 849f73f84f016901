// Where the robot really ends up: the linear-Gaussian model of the robot
// model, section 3, propagated along a run's planned motions.
//
// State (x, y, heading, yawRef, distScale, trackScale, driftRate): the pose's
// error, the error of the yaw sensor's reference (the true heading at which
// the reading was zeroed, plus the drift since), and three per-run constants.
// Headings here are in the compass convention (clockwise from +y, radians);
// a counterclockwise file's heading covariances change sign on the way out.
import type { NoiseModel, PathPiece, Pose, Segment, SegmentSpread, TurnDirection } from '../types';
import { ellipse95, type Cov2 } from './gaussian';
import { MAX_STEP_MM } from './propagate';

const N = 7;
const X = 0;
const Y = 1;
const H = 2;
const REF = 3;
const DIST = 4;
const TRACK = 5;
const DRIFT = 6;
const RAD = Math.PI / 180;

/** Defaults of the error values the plan language does not (yet) set: robot model, section 3. */
export const SPREAD_DEFAULTS = {
  /** Random wheel travel error: variance k·|travel|, mm. */
  wheel: 0.01,
  /** After a `square`: sd of the heading (degrees) and of the position across the wall (mm). */
  squareHeading: 0.5,
  squareAcross: 1,
} as const;


/** The pose's spread at a segment's end (mm and degrees, field frame, the file's heading sign). */
export type Spread = SegmentSpread;

class Cov {
  readonly m = new Float64Array(N * N);

  get(i: number, j: number): number {
    return this.m[i * N + j];
  }

  add(i: number, j: number, v: number): void {
    this.m[i * N + j] += v;
    if (i !== j) this.m[j * N + i] += v;
  }

  /** P ← J P Jᵀ for J = I + a·e_i·e_jᵀ (one entry; apply several in turn for a J with entries in distinct rows and columns' sources). */
  applyOne(i: number, j: number, a: number): void {
    if (a === 0) return;
    const m = this.m;
    // Rows: R = J P (row i gains a × row j); then columns: R Jᵀ (column i gains a × column j of R).
    for (let k = 0; k < N; k++) m[i * N + k] += a * m[j * N + k];
    for (let k = 0; k < N; k++) m[k * N + i] += a * m[k * N + j];
  }

  /** Row and column `i` become those of `j` plus independent noise of variance v (a copy: x_i ← x_j + n). */
  copy(i: number, j: number, v = 0): void {
    const m = this.m;
    for (let k = 0; k < N; k++) m[i * N + k] = m[j * N + k];
    for (let k = 0; k < N; k++) m[k * N + i] = m[k * N + j];
    m[i * N + i] = m[j * N + j] + v;
  }

  /** Row and column `i` become independent noise of variance v. */
  replace(i: number, v: number): void {
    for (let k = 0; k < N; k++) {
      this.m[i * N + k] = 0;
      this.m[k * N + i] = 0;
    }
    this.m[i * N + i] = v;
  }
}

/** What the propagation leaves per segment, by segment. */
export interface RunSpread {
  bySegment: Map<Segment, Spread>;
}

/**
 * Propagates the model along a run's planned segments. Encoder travel carries
 * the distance scale and random wheel error; encoder turns the track scale; a
 * gyro motion ends at the reference's error plus gyro noise; `reset yaw`
 * copies the heading's error into the reference; `square` replaces the
 * heading's error and the error across the wall; time adds drift to the
 * reference.
 */
export function propagateRun(segments: readonly Segment[], noise: NoiseModel, track: number, turns: TurnDirection,
  options: { wheel?: number; squareSpread?: boolean; without?: Segment; zeroBefore?: ReadonlySet<Segment> } = {}): RunSpread {
  const wheel = options.wheel ?? noise.wheel ?? SPREAD_DEFAULTS.wheel;
  const squareSpread = options.squareSpread ?? true;
  const P = new Cov();
  const bySegment = new Map<Segment, Spread>();
  const flip = turns === 'clockwise' ? 1 : -1;
  const compass = (fileHeadingDeg: number) => flip * fileHeadingDeg * RAD;
  const gyroVar = (noise.gyro * RAD) ** 2;
  let started = false;
  for (const seg of segments) {
    if (seg.kind === 'start') {
      P.m.fill(0);
      P.add(DIST, DIST, noise.drive ** 2);
      P.add(TRACK, TRACK, noise.turn ** 2);
      P.add(DRIFT, DRIFT, (noise.drift * RAD) ** 2);
      started = true;
      bySegment.set(seg, spreadOf(P, flip));
      continue;
    }
    if (!started) continue;
    // The sensor's reference drifts while time passes.
    if (seg.duration > 0 && Number.isFinite(seg.duration)) P.applyOne(REF, DRIFT, seg.duration);
    if ((zeroes(seg) && seg !== options.without) || options.zeroBefore?.has(seg)) P.copy(REF, H);
    const gyro = seg.sensing === 'gyro';
    if (seg.kind === 'drive' && gyro) {
      // The hold steers the heading to the reference's error (and the sensor's noise) at once.
      P.copy(H, REF, gyroVar);
    }
    if (seg.kind === 'drive' || seg.kind === 'turn' || seg.kind === 'square') {
      // A gyro motion steers its heading all along: the wheels' random error then moves it along its path only.
      for (const piece of seg.path) travel(P, piece, flip, track, seg.kind === 'turn' && !gyro, seg.kind !== 'turn' || !gyro, wheel, gyro);
    }
    // A gyro motion ends on its target as the sensor reads it: the heading's error is the reference's, plus the sensor's noise
    // (a hold keeps correcting it all along the drive).
    if (gyro && (seg.kind === 'turn' || seg.kind === 'drive')) P.copy(H, REF, gyroVar);
    if (seg.kind === 'square') {
      P.replace(H, squareSpread ? ((noise.square ?? SPREAD_DEFAULTS.squareHeading) * RAD) ** 2 : 0);
      // The robot faces the wall: the error along its heading is the error across the wall.
      const h = compass(seg.end.heading);
      P.replace(Math.abs(Math.sin(h)) > Math.abs(Math.cos(h)) ? X : Y, squareSpread ? (noise.squareAcross ?? SPREAD_DEFAULTS.squareAcross) ** 2 : 0);
    }
    bySegment.set(seg, spreadOf(P, flip));
  }
  return { bySegment };
}

/**
 * One piece of the planned path as wheel travel, in sub-steps: the odometry
 * Jacobians carry the heading's error into the position; the distance scale
 * (drives) and the track scale (encoder turns) add their share; each wheel's
 * random error adds k·|travel|.
 */
function travel(P: Cov, piece: PathPiece, flip: number, track: number, encoderTurn: boolean, scaled: boolean, k: number,
  steered: boolean): void {
  const h0 = flip * piece.from.heading * RAD;
  const { ds, dTheta } = pieceTravel(piece, flip);
  const sL = ds + (dTheta * track) / 2;
  const sR = ds - (dTheta * track) / 2;
  const n = Math.max(1, Math.ceil(Math.max(Math.abs(sL), Math.abs(sR)) / MAX_STEP_MM));
  let h = h0;
  for (let i = 0; i < n; i++) {
    const l = sL / n;
    const rr = sR / n;
    const step = (l + rr) / 2;
    const turn = (l - rr) / track;
    const m = h + turn / 2;
    const sin = Math.sin(m);
    const cos = Math.cos(m);
    // J = I + the heading's and the scales' shares of this step (the heading's track error last: the
    // position moves on the heading the step starts from).
    P.applyOne(X, H, step * cos);
    P.applyOne(Y, H, -step * sin);
    if (scaled) {
      // A wheel a little larger or smaller scales every travel, a turn's too.
      P.applyOne(X, DIST, step * sin);
      P.applyOne(Y, DIST, step * cos);
      P.applyOne(H, DIST, turn);
    }
    if (encoderTurn) P.applyOne(H, TRACK, -turn);
    // Random wheel error (Chong & Kleeman): variance k·|travel| per wheel, through the step's Jacobian.
    if (steered) {
      // Along the path only: each wheel's error moves the midpoint by half of it.
      addWheelNoise(P, k * Math.abs(l), sin / 2, cos / 2, 0);
      addWheelNoise(P, k * Math.abs(rr), sin / 2, cos / 2, 0);
    } else {
      addWheelNoise(P, k * Math.abs(l), sin / 2 + (step * cos) / (2 * track), cos / 2 - (step * sin) / (2 * track), 1 / track);
      addWheelNoise(P, k * Math.abs(rr), sin / 2 - (step * cos) / (2 * track), cos / 2 + (step * sin) / (2 * track), -1 / track);
    }
    h += turn;
  }
}

/**
 * A piece's signed travel of the axle midpoint (mm: forwards when it moves the
 * way the robot faces) and its turn (compass radians; `flip` -1 turns a
 * counterclockwise file's headings round).
 */
export function pieceTravel(piece: PathPiece, flip: number): { ds: number; dTheta: number } {
  const h0 = flip * piece.from.heading * RAD;
  if (piece.type === 'line') {
    const len = Math.hypot(piece.to.x - piece.from.x, piece.to.y - piece.from.y);
    return { ds: (piece.to.x - piece.from.x) * Math.sin(h0) + (piece.to.y - piece.from.y) * Math.cos(h0) >= 0 ? len : -len, dTheta: 0 };
  }
  const dTheta = flip * piece.turned * RAD;
  const r = Math.hypot(piece.from.x - piece.center.x, piece.from.y - piece.center.y);
  const mid = h0 + dTheta / 2;
  return { ds: r * Math.abs(dTheta) * ((piece.to.x - piece.from.x) * Math.sin(mid) + (piece.to.y - piece.from.y) * Math.cos(mid) >= 0 ? 1 : -1), dTheta };
}

/** Adds q·g gᵀ to the pose block, for one wheel's random error of variance q with the step's Jacobian column g. */
/**
 * Where a segment's spread is centred: where the robot is predicted to end
 * (the controller simulation; the sampled runs scatter about it), or the
 * planned pose where nothing is predicted.
 */
export function spreadCentre(seg: Segment): Pose {
  const p = seg.predicted?.end;
  return p && Number.isFinite(p.x) && Number.isFinite(p.y) && Number.isFinite(p.heading) ? p : seg.end;
}

/** Whether the yaw reads zero at this segment: a `reset yaw`, or a turn written with `reset`. */
export function zeroes(seg: Segment): boolean {
  return seg.kind === 'reset' || seg.zeroesYaw === true;
}

/** The sources of spread a plan's `noise` and the robot model name, for saying which one matters most. */
export type SpreadSource = 'drive' | 'turn' | 'gyro' | 'drift' | 'wheel';

/**
 * The position variance (mm², along its worst direction) each source alone
 * leaves at segment `at`: the model is linear, so the sources' shares add up.
 */
export function shares(segments: readonly Segment[], at: Segment, noise: NoiseModel, track: number, turns: TurnDirection,
): Record<SpreadSource, number> {
  const only = (src: SpreadSource): number => {
    const n: NoiseModel = { drive: 0, turn: 0, gyro: 0, drift: 0 };
    if (src !== 'wheel') n[src] = noise[src];
    const sp = propagateRun(segments, n, track, turns, { wheel: src === 'wheel' ? noise.wheel ?? SPREAD_DEFAULTS.wheel : 0, squareSpread: false }).bySegment.get(at);
    return sp ? (sp.ellipse95.a ** 2) / CHI2 : 0;
  };
  return { drive: only('drive'), turn: only('turn'), gyro: only('gyro'), drift: only('drift'), wheel: only('wheel') };
}

const CHI2 = -2 * Math.log(0.05);

function addWheelNoise(P: Cov, q: number, gx: number, gy: number, gh: number): void {
  if (q === 0) return;
  P.add(X, X, q * gx * gx);
  P.add(X, Y, q * gx * gy);
  P.add(X, H, q * gx * gh);
  P.add(Y, Y, q * gy * gy);
  P.add(Y, H, q * gy * gh);
  P.add(H, H, q * gh * gh);
}

function spreadOf(P: Cov, flip: number): Spread {
  const xx = P.get(X, X);
  const xy = P.get(X, Y);
  const yy = P.get(Y, Y);
  const xh = (flip * P.get(X, H)) / RAD;
  const yh = (flip * P.get(Y, H)) / RAD;
  const hh = P.get(H, H) / (RAD * RAD);
  const c2: Cov2 = { xx, xy, yy };
  return { cov: [[xx, xy, xh], [xy, yy, yh], [xh, yh, hh]], ellipse95: ellipse95(c2), headingSd: Math.sqrt(Math.max(0, hh)) };
}
