// Monte Carlo of where the robot ends up: the error model of the robot
// model's section 3, sampled run by run with the full nonlinear kinematics
// (each piece of the path driven with its errors and integrated exactly),
// seeded so that a run of it can be repeated. It checks the linear model
// (spread/run.ts) and gives the cloud of end points.
import type { NoiseModel, PathPiece, Segment, TurnDirection } from '../types';
import { SPREAD_DEFAULTS, zeroes } from './run';

const RAD = Math.PI / 180;
/** Pieces of wheel travel (mm) each sampled with its own random error. */
const PIECE_MM = 50;

/** A small, fast, seedable generator (mulberry32), and normal deviates from it (Box–Muller). */
export function normalSource(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    const u = 1 - uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
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

/**
 * Samples `count` runs; `onProgress` is called now and then with the share done.
 */
export function sampleRun(segments: readonly Segment[], noise: NoiseModel, track: number, turns: TurnDirection, count: number, seed: number,
  onProgress?: (done: number) => void): RunSamples {
  const flip = turns === 'clockwise' ? 1 : -1;
  const n = segments.length;
  const out: RunSamples = {
    x: segments.map(() => new Float64Array(count)), y: segments.map(() => new Float64Array(count)), heading: segments.map(() => new Float64Array(count)),
  };
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
            drive(pose, piece, planned, track, seg.kind === 'turn' && !gyro ? trackScale : 0, seg.kind !== 'turn' || !gyro ? dist : 0, gyro, k, gauss);
          }
          x = pose.x;
          y = pose.y;
          h = pose.h;
        }
        if (gyro && (seg.kind === 'turn' || seg.kind === 'drive')) h = planned(seg.end.heading) + refErr + noise.gyro * RAD * gauss();
        if (seg.kind === 'square') {
          h = planned(seg.end.heading) + SPREAD_DEFAULTS.squareHeading * RAD * gauss();
          // Flush against the wall: across it, the planned position and a small error.
          const across = Math.abs(Math.sin(h)) > Math.abs(Math.cos(h)) ? 'x' : 'y';
          if (across === 'x') x = seg.end.x + SPREAD_DEFAULTS.squareAcross * gauss();
          else y = seg.end.y + SPREAD_DEFAULTS.squareAcross * gauss();
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
function drive(pose: { x: number; y: number; h: number }, piece: PathPiece, planned: (deg: number) => number, track: number,
  trackScale: number, dist: number, steered: boolean, k: number, gauss: () => number): void {
  let { x, y, h } = pose;
  const h0 = planned(piece.from.heading);
  let ds: number;
  let dTheta: number;
  if (piece.type === 'line') {
    const len = Math.hypot(piece.to.x - piece.from.x, piece.to.y - piece.from.y);
    ds = (piece.to.x - piece.from.x) * Math.sin(h0) + (piece.to.y - piece.from.y) * Math.cos(h0) >= 0 ? len : -len;
    dTheta = 0;
  } else {
    dTheta = planned(piece.turned);
    const r = Math.hypot(piece.from.x - piece.center.x, piece.from.y - piece.center.y);
    const mid = h0 + dTheta / 2;
    ds = r * Math.abs(dTheta) * ((piece.to.x - piece.from.x) * Math.sin(mid) + (piece.to.y - piece.from.y) * Math.cos(mid) >= 0 ? 1 : -1);
  }
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
