// The robot as a controller sees it, in discrete time (the robot model,
// section 2): each wheel a first-order lag toward its commanded speed, with a
// stall power below which it does not move, stepped exactly over a sample
// period with the power held (zero-order hold); the pose moved by the exact
// arc of the two wheel travels; the yaw reading sampled, scaled, delayed and
// wrapped as the robot's code sees it.
//
// Not yet wired into the checker: the motions' predicted paths and times
// come in the next step (issue 9).
import type { Pose, TurnDirection } from '../types';
import { forwardVector } from '../solve/frame';

export interface PlantParams {
  /** Wheel surface speed at full power, mm/s (left wheel; the right is `mismatch` times it). */
  fullSpeed: number;
  /** First-order time constant of the motors, s (0: instant). */
  lag: number;
  /** Below this power (fraction) a wheel does not move. */
  stall: number;
  /** The track the robot turns on, mm (the effective track). */
  track: number;
  /** Right wheel diameter over left. */
  mismatch: number;
  /** The control loop's sample period, s. */
  sample: number;
  turns: TurnDirection;
}

export interface PlantState {
  pose: Pose;
  /** Wheel surface speeds, mm/s. */
  vLeft: number;
  vRight: number;
  time: number;
}

/** Exact zero-order-hold step of one wheel: returns the new speed and the travel during the step. */
export function wheelStep(v: number, command: number, lag: number, dt: number): { v: number; travel: number } {
  if (lag <= 0) return { v: command, travel: command * dt };
  const a = Math.exp(-dt / lag);
  return { v: a * v + (1 - a) * command, travel: lag * (1 - a) * v + command * (dt - lag * (1 - a)) };
}

/** The power a wheel really gets: none below the stall power. */
export function effectivePower(u: number, stall: number): number {
  return Math.abs(u) < stall ? 0 : u;
}

/**
 * The pose after the wheels travel sL and sR (mm): the exact arc, moved along
 * the chord at the mean heading. Headings in degrees, positive in the file's
 * direction (clockwise files turn positive when the left wheel travels more).
 */
export function arcStep(pose: Pose, sL: number, sR: number, track: number, turns: TurnDirection): Pose {
  const sign = turns === 'clockwise' ? 1 : -1;
  const dTheta = (sign * (sL - sR)) / track; // radians, file direction
  const ds = (sL + sR) / 2;
  const half = dTheta / 2;
  const chord = Math.abs(half) < 1e-9 ? ds : (ds * Math.sin(half)) / half;
  const mid = forwardVector(pose.heading + (half * 180) / Math.PI, turns);
  return { x: pose.x + mid.x * chord, y: pose.y + mid.y * chord, heading: pose.heading + (dTheta * 180) / Math.PI };
}

/** One sample period with wheel powers uL, uR held. */
export function plantStep(state: PlantState, uL: number, uR: number, p: PlantParams): PlantState {
  const left = wheelStep(state.vLeft, effectivePower(uL, p.stall) * p.fullSpeed, p.lag, p.sample);
  const right = wheelStep(state.vRight, effectivePower(uR, p.stall) * p.fullSpeed * p.mismatch, p.lag, p.sample);
  return {
    pose: arcStep(state.pose, left.travel, right.travel, p.track, p.turns),
    vLeft: left.v,
    vRight: right.v,
    time: state.time + p.sample,
  };
}
