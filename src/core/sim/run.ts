// Every motion of a run simulated in order, the state carried from one into
// the next (the robot model, section 2): what the real robot does with the
// plan, next to what the plan says.
import type { DriveStmt, PathPiece, Pose, PlanSetup, Prediction, Segment, SquareStmt, TurnStmt } from '../types';
import type { EvaluatedMotion } from '../solve/runs';
import type { Wall } from '../solve/square';
import type { TraceColumns } from '../../shared/messages';
import type { Footprint } from '../solve/frame';
import { squareUp } from '../solve/square';
import {
  coastedHeading, copyState, readingOf, restState, simRobot, simulateMotion, MOTION_CAP_S,
  type EncoderMotion, type MotionOutcome, type PoseSink, type SimMotion, type SimRobot, type SimState, type TraceSink,
} from './motion';
import { PoseBuffer, poseDifference, rigidPiece, simplify } from './path';

/** The predicted path is drawn and checked where it leaves the planned one by more than this. */
export const DIFFERS_MM = 2;
export const DIFFERS_DEG = 0.5;

/** What the simulation needs to run one motion again (for its trace, or with other settings for a fix). */
export interface SimRecord {
  state: SimState;
  motion: SimMotion;
  robot: SimRobot;
  /** A square: its drive to the wall and where it ends, from another start (the sampled runs). */
  again?: (s: SimState) => { motion: SimMotion; end: Pose } | undefined;
}

/**
 * A check's record of one motion (one entry per segment). Where the predicted
 * path leaves the planned one, its pieces are simulated again from `state`
 * (the pose the motion really started from) when first asked for.
 */
interface RunRecord extends SimRecord {
  differs?: boolean;
  /** A square's end, pressed against the wall. */
  pathEnd?: Pose;
  pieces?: PathPiece[];
}

const records = new WeakMap<Segment, RunRecord>();

/** How a motion was simulated, for its trace and for fixes. */
export function simRecordOf(seg: Segment): SimRecord | undefined {
  return records.get(seg);
}

/** The robot as the simulation sees it; undefined while the wheel (or, for turns, the track) is unknown. */
export function simRobotOf(setup: PlanSetup): SimRobot | undefined {
  const r = setup.robot;
  // Without the track no heading can be predicted (a drive turns a little on unequal wheels).
  const track = r.effectiveTrack ?? r.track;
  if (r.wheelDiameter === undefined || r.motorSpeed === undefined || r.gear === undefined || track === undefined || !(track > 0)) return undefined;
  if (!(r.wheelDiameter > 0) || !(r.motorSpeed > 0) || !(r.gear > 0)) return undefined;
  const fullSpeed = ((r.motorSpeed / r.gear) * Math.PI * r.wheelDiameter) / 360;
  return simRobot({
    fullSpeed,
    lag: r.motorLag ?? 0,
    stall: r.stall ?? 0,
    mismatch: r.mismatch ?? 1,
    track,
    sample: setup.gyro.sample,
    delay: setup.gyro.delay,
    scale: setup.gyro.scale,
    turns: setup.turns,
    yawLo: setup.yawRange.lo,
    circumference: Math.PI * r.wheelDiameter,
    gear: r.gear,
  });
}

/** A motion's settings the fixes may change. */
export interface GyroSettings {
  stop: number;
  min: number;
  gain: number;
  power: number;
  ramp: boolean;
}

export interface MotionEvent {
  seg: Segment;
  kind: 'overshoot' | 'stall' | 'capped';
}

export interface RunPrediction {
  /** Predicted seconds (Infinity when a motion never ends); undefined when nothing could be simulated. */
  duration?: number;
  events: MotionEvent[];
  /** The first segment left unsimulated because the check's budget ran out. */
  budgetStop?: Segment;
}

/**
 * Simulated time one check spends at most, over all its runs, seconds: about
 * 25,000 typical motions. A plan longer than that (a generated one, or a
 * hostile one) is predicted up to there, so that a check never takes long.
 */
export const SIMULATION_BUDGET_S = 20_000;

/** What is left of a check's simulation budget, shared by its runs. */
export interface SimBudget {
  seconds: number;
}

/**
 * Simulates the run's motions in order. `motionOf` gives each segment's
 * evaluated statement. Fills each segment's `predicted`; stops at a motion
 * that never ends (what follows cannot be predicted).
 */
export function predictRun(
  segments: readonly Segment[], motionOf: (seg: Segment) => EvaluatedMotion | undefined, setup: PlanSetup,
  footprint: Footprint, walls: readonly Wall[], budget: SimBudget = { seconds: SIMULATION_BUDGET_S },
): RunPrediction {
  const robot = simRobotOf(setup);
  const events: MotionEvent[] = [];
  if (!robot) return { events };
  let state: SimState | undefined;
  const bounds = new BoundsSink();
  for (const seg of segments) {
    const m = motionOf(seg);
    if (!m) continue;
    if (seg.kind === 'start') {
      state = restState(seg.start.x, seg.start.y, seg.start.heading);
      seg.predicted = { start: 0, duration: 0, end: { ...seg.start }, reading: readingOf(state, robot), peakRate: 0 };
      continue;
    }
    if (!state) return { events };
    if (!seg.complete && seg.kind !== 'mark' && seg.kind !== 'reset') return { events, duration: undefined };
    if (state.t >= budget.seconds) {
      budget.seconds = 0;
      return { events, budgetStop: seg };
    }
    const before: Pose = { x: state.x, y: state.y, heading: state.h };
    const startT = state.t;
    bounds.reset(state.x, state.y);
    let outcome: MotionOutcome = STILL;
    let motion: SimMotion | undefined;
    let pathEnd: Pose | undefined;
    let rec: RunRecord | undefined;
    if (seg.kind === 'reset') state.zero = state.h;
    else if (seg.kind === 'mark') { /* no time, no motion */ } else if (seg.kind === 'square') {
      const squared = squareFrom(state, seg, m.stmt as SquareStmt, setup, footprint, walls);
      if (!squared) return { events };
      motion = squared.motion;
      const stmt = m.stmt as SquareStmt;
      rec = { state: copyState(state), motion, robot, again: (st) => squareFrom(st, seg, stmt, setup, footprint, walls) };
      records.set(seg, rec);
      outcome = simulateMotion(state, robot, motion, undefined, bounds);
      if (outcome.finished) {
        // Pressed against the wall, the robot turns square to it and stops.
        state.x = squared.end.x;
        state.y = squared.end.y;
        state.h = squared.end.heading;
        state.vL = 0;
        state.vR = 0;
        pathEnd = squared.end;
      }
    } else {
      if (seg.kind === 'turn' && (m.stmt as TurnStmt).reset) state.zero = state.h;
      motion = motionFor(seg, m, state, robot);
      if (!motion) return { events };
      rec = { state: copyState(state), motion, robot };
      records.set(seg, rec);
      outcome = simulateMotion(state, robot, motion, undefined, bounds);
    }
    const end: Pose = { x: state.x, y: state.y, heading: state.h };
    const p: Prediction = {
      start: startT,
      duration: outcome.finished ? state.t - startT : outcome.capped ? MOTION_CAP_S : Infinity,
      end,
      reading: readingOf(state, robot),
      peakRate: outcome.peakRate,
    };
    if (outcome.stalled) p.stalled = true;
    if (outcome.capped) p.capped = true;
    if (motion?.kind === 'gyro-turn') {
      const gm = motion;
      p.settle = outcome.finished ? p.duration : undefined;
      // Degrees past the target once the wheels have run down, on the reading's own scale.
      p.overshoot = overshootOf(rec!.state, state, robot, gm.target);
      if (outcome.finished && p.overshoot > gm.stop) events.push({ seg, kind: 'overshoot' });
    }
    if (outcome.stalled) events.push({ seg, kind: 'stall' });
    if (outcome.capped) events.push({ seg, kind: 'capped' });
    const diffStart = poseDifference(before, seg.start);
    const diffEnd = poseDifference(end, seg.end);
    if (diffStart.mm > DIFFERS_MM || diffStart.deg > DIFFERS_DEG || diffEnd.mm > DIFFERS_MM || diffEnd.deg > DIFFERS_DEG) {
      // The pieces are worked out when first asked for (the drawing, or a check near an obstacle or the field's edge).
      p.bounds = { minX: bounds.minX, minY: bounds.minY, maxX: bounds.maxX, maxY: bounds.maxY };
      if (rec) {
        rec.differs = true;
        rec.pathEnd = pathEnd;
      } else lazyPaths.set(seg, { pathEnd, before, robot });
    }
    seg.predicted = p;
    if (!outcome.finished) {
      budget.seconds -= state.t;
      return { events, duration: Infinity };
    }
  }
  let last: Prediction | undefined;
  for (let i = segments.length - 1; i >= 0 && !last; i--) last = segments[i].predicted;
  budget.seconds -= state?.t ?? 0;
  return { events, duration: last ? last.start + last.duration : undefined };
}

/** Where a segment with no record (a reset or a mark the prediction sees move) started: its predicted pieces are worked out from it when first asked for. */
interface LazyPath {
  pathEnd?: Pose;
  before: Pose;
  robot: SimRobot;
  pieces?: PathPiece[];
}

const lazyPaths = new WeakMap<Segment, LazyPath>();

/** The outcome of a motion that takes no time (a reset, a mark). */
const STILL: MotionOutcome = Object.freeze({ finished: true, stalled: false, capped: false, peakRate: 0 });

/**
 * The predicted pieces of a segment whose predicted path leaves the planned
 * one (by more than 2 mm or 0.5°); undefined where the two agree.
 */
export function predictedPath(seg: Segment): PathPiece[] | undefined {
  const rec = records.get(seg);
  if (rec) return rec.differs ? (rec.pieces ??= predictedPieces(rec, rec.pathEnd, rec.state.x, rec.state.y, rec.state.h, rec.robot)) : undefined;
  const lazy = lazyPaths.get(seg);
  if (!lazy) return undefined;
  return (lazy.pieces ??= predictedPieces(undefined, lazy.pathEnd, lazy.before.x, lazy.before.y, lazy.before.heading, lazy.robot));
}

/**
 * Keeps the box the axle midpoint passes through during a motion (`reset`
 * before each). Its fields hold doubles from the start (NaN, never read): a
 * field that starts as a small integer and later holds a fraction makes V8
 * replace the object's hidden class, and at each full garbage collection it
 * then throws away the optimized motion loops that have seen the old one.
 */
class BoundsSink implements PoseSink {
  minX = NaN;
  minY = NaN;
  maxX = NaN;
  maxY = NaN;

  reset(x: number, y: number): void {
    this.minX = this.maxX = x;
    this.minY = this.maxY = y;
  }

  pose(_t: number, x: number, y: number): void {
    if (x < this.minX) this.minX = x; else if (x > this.maxX) this.maxX = x;
    if (y < this.minY) this.minY = y; else if (y > this.maxY) this.maxY = y;
  }
}

/** The predicted pieces of a motion, simulated again from its recorded start (at x, y, heading). */
function predictedPieces(rec: SimRecord | undefined, pathEnd: Pose | undefined, x: number, y: number, heading: number, robot: SimRobot): PathPiece[] {
  const poses = new PoseBuffer(true);
  poses.pose(rec?.state.t ?? 0, x, y, heading);
  if (rec) simulateMotion(copyState(rec.state), rec.robot, rec.motion, undefined, poses);
  poses.close();
  const pieces = poses.length > 1 ? simplify(poses, 0, poses.length - 1, robot.turns) : [];
  if (pathEnd && poses.length > 0) pieces.push(rigidPiece(poses.at(poses.length - 1), pathEnd, robot.turns));
  return pieces;
}

/** The simulated motion a segment's statement commands, from the state it really starts in. */
export function motionFor(seg: Segment, m: EvaluatedMotion, state: SimState, robot: SimRobot): SimMotion | undefined {
  const s = m.stmt;
  if (s.kind === 'wait') return { kind: 'wait', time: Math.max(0, seg.duration) };
  if (s.kind === 'drive') {
    const dm = m as Extract<EvaluatedMotion, { stmt: DriveStmt }>;
    if (dm.distance === undefined || seg.power === undefined) return undefined;
    const accel = dm.ramp !== undefined && dm.ramp > 0 ? dm.ramp : undefined;
    if (s.hold && dm.hold !== undefined) {
      return { kind: 'hold', target: dm.hold, gain: (dm.gain ?? 2) / 100, distance: dm.distance, power: seg.power, accel };
    }
    return { kind: 'encoders', left: dm.distance, right: dm.distance, power: seg.power, accel };
  }
  if (s.kind === 'turn') {
    const tm = m as Extract<EvaluatedMotion, { stmt: TurnStmt }>;
    if (!seg.wheelDeg || !seg.motorDeg || seg.power === undefined || !Number.isFinite(robot.track)) return undefined;
    if (seg.sensing === 'gyro') {
      const outer = Math.max(Math.abs(seg.wheelDeg.left), Math.abs(seg.wheelDeg.right));
      if (!(outer > 0)) return undefined;
      const way = Math.sign(seg.turned) || 1;
      const reading = readingOf(state, robot);
      const target = s.to !== undefined ? tm.to : tm.angle !== undefined ? reading + tm.angle : undefined; // after a reset the reading is the range's zero
      if (target === undefined) return undefined;
      return {
        kind: 'gyro-turn', target,
        gain: (tm.gain ?? 1) / 100,
        min: seg.minPower ?? 0.1,
        power: seg.power,
        stop: tm.stop ?? 1,
        ramp: s.ramp,
        shareL: (way * seg.wheelDeg.left) / outer,
        shareR: (way * seg.wheelDeg.right) / outer,
      };
    }
    // Encoder turn: each wheel to its commanded degrees (the calibrated track), as its encoder counts them.
    const left = (seg.motorDeg.left / robot.gear / 360) * robot.circumference;
    const right = (seg.motorDeg.right / robot.gear / 360) * robot.circumference;
    const turn: EncoderMotion = { kind: 'encoders', left, right, power: seg.power };
    if (s.ramp) turn.rampMin = seg.minPower ?? 0.1;
    return turn;
  }
  return undefined;
}

/** The square's drive to the wall from where the robot really is, and where it ends up squared. */
function squareFrom(state: SimState, seg: Segment, s: SquareStmt, setup: PlanSetup, footprint: Footprint, walls: readonly Wall[]):
  { motion: SimMotion; end: Pose } | undefined {
  const out = squareUp({ x: state.x, y: state.y, heading: state.h }, s.side, footprint, setup.turns, walls);
  if (!out || seg.power === undefined) return undefined;
  const d = out.travel * (s.side === 'front' ? 1 : -1);
  return { motion: { kind: 'encoders', left: d, right: d, power: seg.power }, end: out.outcome === 'side' ? out.atContact : out.end };
}

/** The rows of one motion's trace (the robot model's outputs), simulated again from its recorded start. */
export interface TraceRows extends TraceColumns {
  x: number[];
  y: number[];
  heading: number[];
}

export function traceOf(seg: Segment): TraceRows | undefined {
  const rec = records.get(seg);
  if (!rec) return undefined;
  const rows: TraceRows = { t: [], reading: [], target: [], error: [], powerLeft: [], powerRight: [], speedLeft: [], speedRight: [], x: [], y: [], heading: [] };
  const sink: TraceSink = {
    row(s, reading, target, uL, uR) {
      rows.t.push(s.t);
      rows.reading.push(reading);
      rows.target.push(target);
      rows.error.push(target === null ? null : target - reading);
      rows.powerLeft.push(uL);
      rows.powerRight.push(uR);
      rows.speedLeft.push(s.vL);
      rows.speedRight.push(s.vR);
      rows.x.push(s.x);
      rows.y.push(s.y);
      rows.heading.push(s.h);
    },
  };
  const state = copyState(rec.state);
  simulateMotion(state, rec.robot, rec.motion, sink);
  // The last row: where the code moves on.
  const reading = readingOf(state, rec.robot);
  const target = rec.motion.kind === 'gyro-turn' || rec.motion.kind === 'hold' ? rec.motion.target : null;
  sink.row(state, reading, target, 0, 0);
  return rows;
}

/** The motion simulated again from its recorded start with other gyro-turn settings (for fixes). */
export function retryGyroTurn(seg: Segment, patch: Partial<GyroSettings>): { outcome: MotionOutcome; duration: number; overshoot: number } | undefined {
  const rec = records.get(seg);
  if (!rec || rec.motion.kind !== 'gyro-turn') return undefined;
  const motion = { ...rec.motion, ...patch };
  const state = copyState(rec.state);
  const outcome = simulateMotion(state, rec.robot, motion);
  return { outcome, duration: state.t - rec.state.t, overshoot: overshootOf(rec.state, state, rec.robot, motion.target) };
}

/**
 * Signed degrees past a gyro turn's target once the wheels have run down
 * (positive: beyond it), on the reading's own scale, from the state the turn
 * started in and the one it ended in.
 */
function overshootOf(start: SimState, end: SimState, robot: SimRobot, target: number): number {
  const first = readingOf(start, robot);
  const rest = first + robot.scale * (coastedHeading(end, robot) - start.h);
  return (Math.sign(target - first) || 1) * (rest - target);
}

