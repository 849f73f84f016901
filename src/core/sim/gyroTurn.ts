// A gyro spin turn as the robot's code runs it (the robot model, section 2):
// once per sample, on the delayed reading, power = sign(e) · clamp(gain·|e|,
// min, speed) with e = target − reading computed without wrapping; within the
// stop band the power goes to zero and the robot coasts on its motors' lag.
import type { PlantParams, PlantState } from './plant';
import { plantStep } from './plant';

export interface GyroTurnSettings {
  /** The reading the code steers to, degrees. */
  target: number;
  /** % power per degree of error, as a fraction per degree (gain 1 → 0.01). */
  gain: number;
  /** Lowest and top power (fractions). */
  min: number;
  speed: number;
  /** Stop band, degrees (0: never stops; for tests of the response itself). */
  stop: number;
}

export interface SensorSettings {
  /** Field heading at which the reading is zero. */
  zeroHeading: number;
  /** Reading = scale × heading turned. */
  scale: number;
  /** The reading's delay, in whole samples. */
  delaySamples: number;
}

export interface TraceRow {
  t: number;
  reading: number;
  error: number;
  powerLeft: number;
  powerRight: number;
  speedLeft: number;
  speedRight: number;
  x: number;
  y: number;
  heading: number;
}

export interface GyroTurnResult {
  /** Time until the reading entered the stop band (the code moves on then), s. */
  duration: number;
  /** Whether the stop band was reached before the cap. */
  settled: boolean;
  /** The state when the code moved on (the wheels still turning). */
  atStop: PlantState;
  /** The state after the coast, once the wheels have (nearly) stopped. */
  coasted: PlantState;
  /** Signed degrees past the target after the coast (positive: beyond it). */
  overshoot: number;
  /** Largest turning rate, deg/s. */
  peakRate: number;
  trace: TraceRow[];
}

/** Simulated time after which a motion is cut off and reported (the robot model's 20 s). */
export const MOTION_CAP_S = 20;

export function simulateGyroSpin(start: PlantState, plant: PlantParams, turn: GyroTurnSettings, sensor: SensorSettings,
  cap = MOTION_CAP_S): GyroTurnResult {
  const dir = plant.turns === 'clockwise' ? 1 : -1; // a positive (file) turn runs the left wheel forwards
  const readingOf = (heading: number) => sensor.scale * (heading - sensor.zeroHeading);
  const history: number[] = [];
  const trace: TraceRow[] = [];
  let state = start;
  let peakRate = 0;
  const startTarget = turn.target - readingOf(start.pose.heading);
  const steps = Math.ceil(cap / plant.sample);
  let settled = false;
  for (let k = 0; k < steps; k++) {
    history.push(readingOf(state.pose.heading));
    const reading = history[Math.max(0, history.length - 1 - sensor.delaySamples)];
    const e = turn.target - reading;
    if (turn.stop > 0 && Math.abs(e) < turn.stop) {
      settled = true;
      break;
    }
    const u = Math.sign(e) * Math.min(turn.speed, Math.max(turn.min, turn.gain * Math.abs(e)));
    trace.push(row(state, reading, e, dir * u, -dir * u));
    state = plantStep(state, dir * u, -dir * u, plant);
    peakRate = Math.max(peakRate, Math.abs(((state.vLeft - state.vRight) / plant.track) * (180 / Math.PI)));
  }
  const atStop = state;
  // The code has moved on; the wheels run down on their lag.
  let coasted = state;
  for (let k = 0; k < steps && (Math.abs(coasted.vLeft) > 1e-9 || Math.abs(coasted.vRight) > 1e-9); k++) {
    coasted = plantStep(coasted, 0, 0, plant);
    if (plant.lag > 0 && k * plant.sample > 20 * plant.lag) break;
  }
  const turned = coasted.pose.heading - start.pose.heading;
  const overshoot = Math.sign(startTarget || 1) * (turned * sensor.scale - startTarget);
  return { duration: atStop.time - start.time, settled, atStop, coasted, overshoot, peakRate, trace };
}

function row(s: PlantState, reading: number, error: number, uL: number, uR: number): TraceRow {
  return { t: s.time, reading, error, powerLeft: uL, powerRight: uR, speedLeft: s.vLeft, speedRight: s.vRight, x: s.pose.x, y: s.pose.y, heading: s.pose.heading };
}
