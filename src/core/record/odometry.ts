// The path of a recorded run, reconstructed from its samples (robot model,
// section 5): by wheel odometry alone (the exact arc of each step's two wheel
// travels), and by the wheels' distance with the yaw sensor's heading.
import type { Pose, TurnDirection } from '../types';
import { LogError } from './log';
import type { RecordedRun } from './types';

const RAD = Math.PI / 180;

/** A reconstructed path: one pose per sample (heading unwrapped, degrees, the plan's sign). */
export interface ReconstructedPath {
  t: Float64Array;
  x: Float64Array;
  y: Float64Array;
  heading: Float64Array;
}

export interface OdometryRobot {
  /** The track the wheels really turn on (the plan's effective track), mm. */
  track: number;
  turns: TurnDirection;
  /** The yaw sensor's reading over the true angle turned (`gyro scale`). */
  gyroScale: number;
}

export interface Reconstruction {
  /** Wheel odometry alone. */
  wheels: ReconstructedPath;
  /** The wheels' distance with the yaw's heading; undefined without a yaw column. */
  fused?: ReconstructedPath;
  /** Samples (indices) where the yaw reading jumped while the wheels did not turn: a zeroing of the sensor. */
  zeroings: number[];
}

/** A jump of the reading this much larger than the wheels' turn, within one sample, is the sensor being zeroed. */
export const ZEROING_JUMP_DEG = 10;
/** Within ZEROING_HINT_ROWS rows of where the plan zeroes the sensor (a `reset yaw`, a turn with `reset`), a jump of this much is the zeroing. */
export const ZEROING_NEAR_DEG = 0.5;
export const ZEROING_HINT_ROWS = 3;

/**
 * One step of the exact arc update: the pose after the left and right wheels
 * travel `dl` and `dr` (mm) along one arc. Heading in degrees, positive in the
 * plan's `turns` direction; heading 0 faces +y, clockwise headings turn to +x.
 * The textbook update (Siegwart & Nourbakhsh, Introduction to Autonomous
 * Mobile Robots, ch. 5, eq. 5.7) moves the distance along the mid heading;
 * the exact arc moves its chord, `ds · sin(dθ/2)/(dθ/2)`, along the same mid
 * heading: the two agree to second order in dθ.
 */
export function arcStep(pose: Pose, dl: number, dr: number, track: number, turns: TurnDirection): Pose {
  const sign = turns === 'clockwise' ? 1 : -1;
  const dTheta = (sign * (dl - dr)) / track;
  return chordStep(pose, (dl + dr) / 2, dTheta / RAD, turns);
}

/** The chord of an arc of length `ds` that turns by 2·`half` radians: ds·sin(half)/half (ds itself for a straight step). */
function chordOf(ds: number, half: number): number {
  return Math.abs(half) < 1e-9 ? ds : (ds * Math.sin(half)) / half;
}

/** Moves `ds` (mm) along an arc that turns the heading by `dHeading` degrees. */
export function chordStep(pose: Pose, ds: number, dHeading: number, turns: TurnDirection = 'clockwise'): Pose {
  const sign = turns === 'clockwise' ? 1 : -1;
  const half = (dHeading * RAD) / 2;
  const chord = chordOf(ds, half);
  const mid = pose.heading * RAD + half;
  return { x: pose.x + sign * Math.sin(mid) * chord, y: pose.y + Math.cos(mid) * chord, heading: pose.heading + dHeading };
}

/**
 * Reconstructs the run's path from `start` (the plan's start pose): wheels
 * alone, and wheels with the yaw. Also checks the yaw column against the
 * wheels (a reading in radians taken for degrees, a reversed sign), and
 * throws a LogError naming the column when they disagree.
 */
export function reconstruct(run: RecordedRun, start: Pose, robot: OdometryRobot, zeroHints: readonly number[] = []): Reconstruction {
  const s = run.samples;
  const n = s.length;
  // Rows where the plan zeroes the sensor (found by the log's line column): there a smaller jump is a zeroing too.
  const near = new Uint8Array(n);
  for (const h of zeroHints) for (let k = h; k < Math.min(n, h + ZEROING_HINT_ROWS); k++) near[k] = 1;
  const sign = robot.turns === 'clockwise' ? 1 : -1;
  const b = robot.track;
  if (!(b > 0)) throw new LogError('the plan has no track: add a `track` line so the wheels\' travel can be turned into a heading');
  const wheels = alloc(n);
  put(wheels, 0, s[0].t, start.x, start.y, start.heading);
  const fused = run.hasYaw ? alloc(n) : undefined;
  if (fused) put(fused, 0, s[0].t, start.x, start.y, start.heading);
  const zeroings: number[] = [];
  const scale = robot.gyroScale > 0 ? robot.gyroScale : 1;
  let wheelTurn = 0;
  let yawTurn = 0;
  let dot = 0;
  let sumW2 = 0;
  let sumY2 = 0;
  let x = start.x;
  let y = start.y;
  let h = start.heading * RAD;
  let fx = start.x;
  let fy = start.y;
  let fh = start.heading;
  for (let i = 1; i < n; i++) {
    const dl = s[i].left - s[i - 1].left;
    const dr = s[i].right - s[i - 1].right;
    const ds = (dl + dr) / 2;
    const dTheta = (sign * (dl - dr)) / b; // radians
    // The exact arc (arcStep's, with the pose in locals: this loop runs once per sample).
    const half = dTheta / 2;
    const chord = chordOf(ds, half);
    const mid = h + half;
    x += sign * Math.sin(mid) * chord;
    y += Math.cos(mid) * chord;
    h += dTheta;
    put(wheels, i, s[i].t, x, y, h / RAD);
    if (fused) {
      const wDeg = dTheta / RAD;
      let dYaw = s[i].yaw! - s[i - 1].yaw!;
      dYaw -= 360 * Math.round(dYaw / 360); // across the wrap point
      dYaw /= scale;
      if (Math.abs(dYaw - wDeg) > (near[i] ? ZEROING_NEAR_DEG : ZEROING_JUMP_DEG)) {
        zeroings.push(i);
        dYaw = wDeg;
      } else {
        wheelTurn += Math.abs(wDeg);
        yawTurn += Math.abs(dYaw);
        dot += wDeg * dYaw;
        sumW2 += wDeg * wDeg;
        sumY2 += dYaw * dYaw;
      }
      const fHalf = (dYaw * RAD) / 2;
      const fChord = chordOf(ds, fHalf);
      const fMid = fh * RAD + fHalf;
      fx += sign * Math.sin(fMid) * fChord;
      fy += Math.cos(fMid) * fChord;
      fh += dYaw;
      put(fused, i, s[i].t, fx, fy, fh);
    }
  }
  if (fused) checkYaw(run, { wheelTurn, yawTurn, dot, sumW2, sumY2, zeroings: zeroings.length, n });
  return { wheels, ...(fused ? { fused } : {}), zeroings };
}

/** The yaw column against the wheels: the same amount of turning, the same way round. */
function checkYaw(run: RecordedRun, st: { wheelTurn: number; yawTurn: number; dot: number; sumW2: number; sumY2: number; zeroings: number; n: number }): void {
  const col = run.columns?.yaw;
  const where = col ? `column ${col} (yaw)` : 'the yaw column';
  // Too many zeroings: the reading jumps all the time (radians read as degrees jump little; degrees read as radians jump a lot).
  if (st.zeroings > Math.max(5, st.n / 100)) {
    throw new LogError(`${where}: the reading jumps by more than ${ZEROING_JUMP_DEG}° within one sample ${st.zeroings} times while the wheels do not turn so: is the yaw in degrees (yaw-units=deg), and is this the yaw column?`, undefined, col);
  }
  if (st.wheelTurn < 30) return; // too little turning to judge
  const ratio = st.yawTurn / st.wheelTurn;
  if (ratio < 1 / 3 || ratio > 3) {
    const hint = ratio < 0.05 ? ': if the yaw is in radians, set yaw-units=rad' : ratio > 20 ? ': if the yaw is in degrees, set yaw-units=deg' : '; check the plan\'s track and the wheel units';
    throw new LogError(`${where}: the yaw turned ${Math.round(st.yawTurn * 10) / 10}° in all, the wheels ${Math.round(st.wheelTurn)}°${hint}`, undefined, col);
  }
  const correlation = st.dot / Math.sqrt(st.sumW2 * st.sumY2);
  if (correlation < -0.5) {
    throw new LogError(`${where}: the yaw turns the other way from the wheels: if the sensor counts the other way round, set yaw-sign=reversed; otherwise the left and right columns may be swapped`, undefined, col);
  }
}

function alloc(n: number): ReconstructedPath {
  return { t: new Float64Array(n), x: new Float64Array(n), y: new Float64Array(n), heading: new Float64Array(n) };
}

/** Sets sample `i` of a path. */
function put(path: ReconstructedPath, i: number, t: number, x: number, y: number, heading: number): void {
  path.t[i] = t;
  path.x[i] = x;
  path.y[i] = y;
  path.heading[i] = heading;
}

/** The pose of a path at sample `i`. */
export function poseAt(path: ReconstructedPath, i: number): Pose {
  return { x: path.x[i], y: path.y[i], heading: path.heading[i] };
}
