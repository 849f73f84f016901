// Monte Carlo of where the robot ends up: the error model of the robot
// model's section 3, sampled run by run with the full nonlinear kinematics
// (each piece of the path driven with its errors and integrated exactly),
// seeded so that a run of it can be repeated. It checks the linear model
// (spread/run.ts) and gives the cloud of end points.
import type { NoiseModel, PathPiece, Segment, TurnDirection } from '../types';
import { pieceTravel, SPREAD_DEFAULTS, zeroes } from './run';
import { propagateTravel, ZERO_COV } from './propagate';
import { simRecordOf, type SimRecord } from '../sim/run';
import { restState, simulateMotion, type SimMotion, type SimRobot, type SimState } from '../sim/motion';
import { prepareSampled, runPrepared, sampledPathFits, type SampledMotion } from '../sim/sampled';

const RAD = Math.PI / 180;
/** Pieces of wheel travel (mm) each sampled with its own random error. */
const PIECE_MM = 50;

/** A small, fast, seedable generator (mulberry32), and normal deviates from it (Box–Muller). */
export function normalSource(seed: number): () => number {
  // The state and the spare deviate live in typed arrays: a number kept in a closure is boxed (allocated) on each change.
  const state = new Uint32Array(1);
  state[0] = seed >>> 0;
  const uniform = () => {
    const a = (state[0] + 0x6d2b79f5) >>> 0;
    state[0] = a;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const spare = new Float64Array(1);
  let hasSpare = false;
  return () => {
    if (hasSpare) {
      hasSpare = false;
      return spare[0];
    }
    const u = 1 - uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare[0] = r * Math.sin(2 * Math.PI * v);
    hasSpare = true;
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** The sampled end poses of every segment of a run: x, y (mm) and heading (degrees, the file's sign), one row per sample. */
export interface RunSamples {
  /** By segment index: columns of the samples. */
  x: Float64Array[];
  y: Float64Array[];
  heading: Float64Array[];
}

/** For tests: `scalar` simulates every sampled motion through simulateMotion of sim/motion.ts instead of sim/sampled.ts. */
export interface SampleOptions {
  scalar?: boolean;
}

/**
 * Samples `count` runs; `onProgress` is called now and then with the share
 * done. Where the check simulated the run (a robot with its motor), every
 * sampled run is simulated too (the controllers, from where the previous
 * motion really ended); otherwise the planned path is driven with its errors.
 */
export function sampleRun(segments: readonly Segment[], noise: NoiseModel, track: number, turns: TurnDirection, count: number, seed: number,
  onProgress?: (done: number) => void, options: SampleOptions = {}): RunSamples {
  if (simulated(segments)) return sampleSimulated(segments, noise, track, turns, count, seed, onProgress, options.scalar === true);
  return samplePlanned(segments, noise, track, turns, count, seed, onProgress);
}

/**
 * Whether the check simulated the run: its first motion has a simulation
 * record. (The prediction stops at a motion that never ends; so do the
 * sampled runs.)
 */
function simulated(segments: readonly Segment[]): boolean {
  const first = segments.find((seg) => seg.kind !== 'start' && seg.kind !== 'mark' && seg.kind !== 'reset');
  return first !== undefined && simRecordOf(first) !== undefined;
}

/** The planned path driven with its errors (no controller simulation). */
function samplePlanned(segments: readonly Segment[], noise: NoiseModel, track: number, turns: TurnDirection, count: number, seed: number,
  onProgress?: (done: number) => void): RunSamples {
  const flip = turns === 'clockwise' ? 1 : -1;
  const n = segments.length;
  const out = emptySamples(n, count);
  const gauss = normalSource(seed);
  const k = noise.wheel ?? SPREAD_DEFAULTS.wheel;
  const planned = (deg: number) => flip * deg * RAD;
  const pose = { x: 0, y: 0, h: 0 };
  for (let s = 0; s < count; s++) {
    if (onProgress && s % 100 === 0) onProgress(s / count);
    // Per-run constants.
    const dist = noise.drive * gauss();
    const trackScale = noise.turn * gauss();
    const drift = noise.drift * RAD * gauss();
    // The true pose (compass heading, radians) and the reference's error.
    let x = 0;
    let y = 0;
    let h = 0;
    let refErr = 0;
    let started = false;
    for (let i = 0; i < n; i++) {
      const seg = segments[i];
      if (seg.kind === 'start') {
        x = seg.start.x;
        y = seg.start.y;
        h = flip * seg.start.heading * RAD;
        refErr = 0;
        started = true;
      } else if (started) {
        if (seg.duration > 0 && Number.isFinite(seg.duration)) refErr += drift * seg.duration;
        if (zeroes(seg)) refErr = h - flip * seg.start.heading * RAD;
        const gyro = seg.sensing === 'gyro';
        if (seg.kind === 'drive' && gyro) h = planned(seg.start.heading) + refErr + noise.gyro * RAD * gauss();
        if (seg.kind === 'drive' || seg.kind === 'turn' || seg.kind === 'square') {
          pose.x = x;
          pose.y = y;
          pose.h = h;
          for (const piece of seg.path) {
            drive(pose, piece, flip, track, seg.kind === 'turn' && !gyro ? trackScale : 0, seg.kind !== 'turn' || !gyro ? dist : 0, gyro, k, gauss);
          }
          x = pose.x;
          y = pose.y;
          h = pose.h;
        }
        if (gyro && (seg.kind === 'turn' || seg.kind === 'drive')) h = planned(seg.end.heading) + refErr + noise.gyro * RAD * gauss();
        if (seg.kind === 'square') {
          h = planned(seg.end.heading) + (noise.square ?? SPREAD_DEFAULTS.squareHeading) * RAD * gauss();
          // Flush against the wall: across it, the planned position and a small error.
          const across = Math.abs(Math.sin(h)) > Math.abs(Math.cos(h)) ? 'x' : 'y';
          if (across === 'x') x = seg.end.x + (noise.squareAcross ?? SPREAD_DEFAULTS.squareAcross) * gauss();
          else y = seg.end.y + (noise.squareAcross ?? SPREAD_DEFAULTS.squareAcross) * gauss();
        }
      }
      out.x[i][s] = x;
      out.y[i][s] = y;
      out.heading[i][s] = (flip * h) / RAD;
    }
  }
  onProgress?.(1);
  return out;
}

/**
 * Drives one piece of the planned path with its errors: the wheels' travel
 * scaled by the distance scale, a turn's rotation by the track scale, random
 * wheel error per PIECE_MM, integrated as exact arcs from the true pose. A
 * gyro-steered motion keeps its heading: its wheel errors move it along its
 * path only.
 */
function drive(pose: { x: number; y: number; h: number }, piece: PathPiece, flip: number, track: number,
  trackScale: number, dist: number, steered: boolean, k: number, gauss: () => number): void {
  let { x, y, h } = pose;
  const { ds, dTheta } = pieceTravel(piece, flip);
  const sL = (ds + (dTheta * track) / 2) * (1 + dist);
  const sR = (ds - (dTheta * track) / 2) * (1 + dist);
  const pieces = Math.max(1, Math.ceil(Math.max(Math.abs(sL), Math.abs(sR)) / PIECE_MM));
  for (let i = 0; i < pieces; i++) {
    const l = sL / pieces + Math.sqrt(k * Math.abs(sL / pieces)) * gauss();
    const r = sR / pieces + Math.sqrt(k * Math.abs(sR / pieces)) * gauss();
    // The track scale: the robot turns as if its wheels were (1 + t) times as far apart as planned.
    let turn = (l - r) / (track * (1 + trackScale));
    const step = (l + r) / 2;
    if (steered) turn = (sL - sR) / pieces / track; // the controller keeps the heading on its course
    const chord = Math.abs(turn) < 1e-12 ? step : (step * Math.sin(turn / 2)) / (turn / 2);
    x += chord * Math.sin(h + turn / 2);
    y += chord * Math.cos(h + turn / 2);
    h += turn;
  }
  pose.x = x;
  pose.y = y;
  pose.h = h;
}

/** Mean and covariance (x, y, heading) of a segment's samples. */
export function sampleStats(s: RunSamples, i: number): { mean: [number, number, number]; cov: number[][] } {
  const cols = [s.x[i], s.y[i], s.heading[i]];
  const n = cols[0].length;
  const mean = cols.map((c) => c.reduce((a, v) => a + v, 0) / n) as [number, number, number];
  const cov = cols.map((a, p) => cols.map((b, q) => {
    let sum = 0;
    for (let j = 0; j < n; j++) sum += (a[j] - mean[p]) * (b[j] - mean[q]);
    return sum / (n - 1);
  }));
  return { mean, cov };
}

/**
 * A segment's random wheel error as the lower triangle of its covariance's
 * Cholesky factor (x, y, heading in mm and file degrees), from the planned
 * travel in sub-steps: the sampled runs add L·z at the motion's end, which
 * has the sub-stepped model's second moments (the cross-track growth along a
 * long drive included). A gyro-steered motion's error moves it along its path only.
 */
function wheelFactor(seg: Segment, track: number, k: number, flip: number): Float64Array | undefined {
  if (k <= 0 || !(seg.kind === 'drive' || seg.kind === 'turn' || seg.kind === 'square')) return undefined;
  const steered = seg.sensing === 'gyro';
  let c = ZERO_COV;
  let along = { xx: 0, xy: 0, yy: 0 };
  for (const piece of seg.path) {
    const h0 = flip * piece.from.heading * RAD;
    const { ds, dTheta } = pieceTravel(piece, flip);
    const sL = ds + (dTheta * track) / 2;
    const sR = ds - (dTheta * track) / 2;
    if (steered) {
      // Each wheel's error moves the midpoint by half of it, along the heading.
      const q = (k * (Math.abs(sL) + Math.abs(sR))) / 4;
      const m = h0 + dTheta / 2;
      along = { xx: along.xx + q * Math.sin(m) ** 2, xy: along.xy + q * Math.sin(m) * Math.cos(m), yy: along.yy + q * Math.cos(m) ** 2 };
    } else c = propagateTravel(c, h0, sL, sR, track, k, k);
  }
  const m = steered
    ? [along.xx, along.xy, 0, along.xy, along.yy, 0, 0, 0, 0]
    : [c.xx, c.xy, flip * c.xh / RAD, c.xy, c.yy, flip * c.yh / RAD, flip * c.xh / RAD, flip * c.yh / RAD, c.hh / (RAD * RAD)];
  return cholesky3(m);
}

/** The lower-triangular L with L Lᵀ = m (3×3, row-major), zero columns where m is singular there. */
function cholesky3(m: number[]): Float64Array {
  const L = new Float64Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = m[i * 3 + j];
      for (let q = 0; q < j; q++) sum -= L[i * 3 + q] * L[j * 3 + q];
      if (i === j) L[i * 3 + i] = sum > 1e-18 ? Math.sqrt(sum) : 0;
      else L[i * 3 + j] = L[j * 3 + j] > 0 ? sum / L[j * 3 + j] : 0;
    }
  }
  return L;
}

/** The error model applied to a simulated robot: its motions as the check simulated them, with the run's errors. */
function sampleSimulated(segments: readonly Segment[], noise: NoiseModel, track: number, turns: TurnDirection, count: number, seed: number,
  onProgress: ((done: number) => void) | undefined, scalar: boolean): RunSamples {
  const flip = turns === 'clockwise' ? 1 : -1;
  const n = segments.length;
  const out = emptySamples(n, count);
  const gauss = normalSource(seed);
  const k = noise.wheel ?? SPREAD_DEFAULTS.wheel;
  const squareSd = noise.square ?? SPREAD_DEFAULTS.squareHeading;
  const squareAcross = noise.squareAcross ?? SPREAD_DEFAULTS.squareAcross;
  const records: (SimRecord | undefined)[] = segments.map((seg) => simRecordOf(seg));
  const factors = segments.map((seg) => wheelFactor(seg, track, k, flip));
  const base = records.find((r) => r)?.robot;
  if (!base) return out;
  const robot: SimRobot = { ...base };
  // The same steps without a trace, pose sink or outcome object (sim/sampled.ts), where the reading has no delay.
  const quick = !scalar && sampledPathFits(robot);
  const prepared: (SampledMotion | undefined)[] = records.map((rec) => (quick && rec ? prepareSampled(rec.motion) : undefined));
  for (let s = 0; s < count; s++) {
    if (onProgress && s % 50 === 0) onProgress(s / count);
    // Per-run constants: a wheel (1 + dist) times as large (its encoder's millimetres go further, at the same motor
    // speed), a track (1 + trackScale) times the calibrated one, and the gyro's drift rate (degrees per second).
    const dist = noise.drive * gauss();
    robot.fullSpeed = base.fullSpeed * (1 + dist);
    robot.track = base.track * (1 + noise.turn * gauss());
    const drift = noise.drift * gauss();
    let state: SimState | undefined;
    let zeroAt = 0;
    let zeroT = 0;
    let stopped = false;
    for (let i = 0; i < n; i++) {
      const seg = segments[i];
      if (seg.kind === 'start') {
        state = restState(seg.start.x, seg.start.y, seg.start.heading);
        zeroAt = state.h;
        zeroT = 0;
        stopped = false;
      } else if (state && !stopped) {
        if (zeroes(seg)) {
          zeroAt = state.h;
          zeroT = state.t;
        }
        const rec = records[i];
        // A motion the prediction never reached (after one that never ends): the robot is still where it stopped.
        if (!rec && seg.kind !== 'mark' && seg.kind !== 'reset') stopped = true;
        if (rec) {
          let motion: SimMotion = rec.motion;
          let quickMotion = prepared[i];
          let squaredEnd: { x: number; y: number; heading: number } | undefined;
          const gyro = motion.kind === 'gyro-turn' || motion.kind === 'hold';
          // The reading: scaled from the zero, with the drift since it and (in a gyro motion) the sensor's own error.
          const offset = drift * (state.t - zeroT) + (gyro ? noise.gyro * gauss() : 0);
          state.zero = zeroAt - offset / robot.scale;
          if (rec.again) {
            const again = rec.again(state);
            if (!again) {
              stopped = true;
              record(out, i, s, state);
              continue;
            }
            motion = again.motion;
            squaredEnd = again.end;
            if (quick) quickMotion = prepareSampled(motion);
          }
          // A gyro turn aims at the reading the prediction worked out (the targets table's yaw target): the
          // sampled runs differ in where the reference and the sensor put the robot, as the error model says.
          let finished: boolean;
          if (quickMotion) finished = runPrepared(state, robot, quickMotion, 1 + dist); // the travel scaled as below
          else {
            if (motion.kind === 'encoders' && dist !== 0) motion = { ...motion, left: motion.left * (1 + dist), right: motion.right * (1 + dist) };
            else if (motion.kind === 'hold' && dist !== 0) motion = { ...motion, distance: motion.distance * (1 + dist) };
            finished = simulateMotion(state, robot, motion).finished;
          }
          // The wheels' random error over the motion.
          const L = factors[i];
          let dx = 0;
          let dy = 0;
          if (L) {
            const z0 = gauss();
            const z1 = gauss();
            const z2 = gauss();
            dx = L[0] * z0;
            dy = L[3] * z0 + L[4] * z1;
            state.h += L[6] * z0 + L[7] * z1 + L[8] * z2;
          }
          if (!finished) stopped = true; // it waits (or spins) for ever: the rest of the run never happens
          if (squaredEnd && finished) {
            // Flush against the wall and square to it: the square's own small errors replace the heading's and the
            // position's across the wall; along the wall the robot keeps where it came (and its wheels' error).
            state.h = squaredEnd.heading + squareSd * gauss();
            const h = flip * squaredEnd.heading * RAD;
            if (Math.abs(Math.sin(h)) > Math.abs(Math.cos(h))) { state.x = squaredEnd.x + squareAcross * gauss(); state.y = squaredEnd.y + dy; } else { state.y = squaredEnd.y + squareAcross * gauss(); state.x = squaredEnd.x + dx; }
            state.vL = 0;
            state.vR = 0;
          } else {
            state.x += dx;
            state.y += dy;
          }
        }
      }
      if (state) record(out, i, s, state);
    }
  }
  onProgress?.(1);
  return out;
}

/** Columns of `count` samples for each of `n` segments, all zero. */
function emptySamples(n: number, count: number): RunSamples {
  const columns = () => Array.from({ length: n }, () => new Float64Array(count));
  return { x: columns(), y: columns(), heading: columns() };
}

function record(out: RunSamples, i: number, s: number, state: SimState): void {
  out.x[i][s] = state.x;
  out.y[i][s] = state.y;
  out.heading[i][s] = state.h;
}
