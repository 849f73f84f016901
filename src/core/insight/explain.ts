// What the language's words mean, for hovers on them, with the values they
// lead to in this plan where that helps (a student's first question about
// `effective` or `axle` is "what does it do to my numbers?").
import type { CheckResult, Statement } from '../types';
import { formatLength, formatNumber } from './format';

/** The statement is the one on the hovered line: a word may mean different things in different statements (`gyro`). */
type Explain = (result: CheckResult, statement: Statement) => string;

/** A time in milliseconds, as the gyro's times are written. */
function ms(seconds: number): string {
  return `${formatNumber(seconds * 1000, 3)} ms`;
}

const RAD = Math.PI / 180;

/** A 90° spin's wheel degrees on a track, for showing what the track does. */
function quarterSpin(result: CheckResult, track: number): string | undefined {
  const d = result.setup.robot.wheelDiameter;
  if (d === undefined) return undefined;
  return `${formatNumber((((track / 2) * 90 * RAD) / (Math.PI * d)) * 360, 1)}°`;
}

export const WORD_EXPLANATIONS: Record<string, Explain> = {
  wheel: (r, s) => s.kind === 'noise'
    ? '**noise wheel**: each wheel\'s random travel error, as its variance per millimetre driven (about 0.01 mm for small rubber wheels): it spreads the heading, and so where the robot ends, more the farther it drives by encoders.'
    : `**wheel**: the wheel's diameter, measured across the tyre. Every wheel and motor degree comes from it: one wheel turn drives π × diameter` +
      (r.setup.robot.wheelDiameter !== undefined ? ` (here ${formatLength(Math.PI * r.setup.robot.wheelDiameter, r.setup.lengthUnit)}).` : '.'),
  track: (r) => {
    const t = r.setup.robot.track;
    const spin = t !== undefined ? quarterSpin(r, t) : undefined;
    return `**track**: the distance between the two wheels, from the middle of one tyre to the middle of the other. Turns and footprints use it` +
      (spin ? `; a 90° spin turns each wheel ${spin}.` : '.');
  },
  effective: (r) => {
    const { track, effectiveTrack } = r.setup.robot;
    const spin = effectiveTrack !== undefined ? quarterSpin(r, effectiveTrack) : undefined;
    return '**effective**: the track that turns by encoders really need. The tyres scrub as the robot turns, so it turns a little less than the wheel degrees say; measure it by turning ten times by encoders and correcting. ' +
      (effectiveTrack !== undefined && track !== undefined ? `Here ${formatLength(effectiveTrack, r.setup.lengthUnit)} (measured ${formatLength(track, r.setup.lengthUnit)})` : '') +
      (spin ? `: a 90° encoder spin commands ${spin} per motor.` : '.');
  },
  axle: () => '**axle**: how far the point midway between the wheels (the axle midpoint) sits ahead of the middle of the footprint; negative when it sits behind. Positions in the plan are of that point.',
  body: () => '**body**: the robot\'s footprint seen from above, width across by length along its heading, used to find collisions and walls. Without it Veer uses a circle as wide as the track.',
  gear: (r) => `**gear**: motor degrees per wheel degree (1 when the wheels sit on the motors). Here ${formatNumber(r.setup.robot.gear ?? 1, 3)}.`,
  motor: () => '**motor**: how fast the motor turns at full power (e.g. `900 deg/s` or `150 rpm`), and with `lag` how long it takes to get up to speed. Times come from it.',
  lag: () => '**lag**: the motor\'s time constant: about how long it takes to reach two thirds of a new speed.',
  stall: (r) => `**stall**: the lowest power that moves the wheels: below it static friction holds them still, so a gyro turn that asks for less near its target stops short. Measure it by raising the power until the robot just creeps. Here ${formatNumber((r.setup.robot.stall ?? 0.05) * 100, 2)} % (default 5 %).`,
  mismatch: (r) => {
    const e = r.setup.robot.mismatch ?? 1;
    return `**mismatch**: the right wheel's diameter over the left wheel's (1 for two equal wheels). With unequal wheels equal wheel degrees do not drive straight: the larger wheel rolls further, so the robot curves away from it. Here ${formatNumber(e, 6)}` +
      (e !== 1 ? `: the right wheel is ${formatNumber(Math.abs(e - 1) * 100, 2)} % ${e > 1 ? 'larger' : 'smaller'}.` : '.');
  },
  sample: (r) => `**sample**: how often the robot's control loop reads the gyro and sets the motors (its period). Here ${ms(r.setup.gyro.sample)} (default 10 ms).`,
  delay: (r) => `**delay**: how old a gyro reading is when the code acts on it (filtering, the sensor's own update, the bus). Here ${ms(r.setup.gyro.delay)} (default 0 ms).`,
  scale: (r) => `**scale**: the gyro's reading over the true angle turned (1 for a perfect sensor). A sensor that reads 2 % high stops a gyro turn 2 % short. Here ${formatNumber(r.setup.gyro.scale, 6)} (default 1).`,
  field: () => '**field**: the size of the board (width by height, from its lower-left corner); with `grid`, the spacing of the drawn grid.',
  limit: (r) => `**limit**: the time allowed for each run${r.setup.limit !== undefined ? ` (here ${formatNumber(r.setup.limit, 1)} s)` : ''}; Veer warns when a run takes longer.`,
  units: (r) => `**units**: the unit of bare lengths (here ${r.setup.lengthUnit}); write a unit after any number to use another.`,
  turns: (r) => `**turns**: which way positive headings and turns go (here ${r.setup.turns}).`,
  hold: () => '**hold**: the gyro keeps the yaw reading at this value while driving (the robot steers back when it drifts).',
  step: () => '**step**: the held heading is meant to differ from the current one: the robot turns onto it while driving.',
  gain: () => '**gain**: how hard the robot steers per degree of error, in % power per degree.',
  min: () => '**min**: the lowest power of a gyro turn near its target, so the robot still moves.',
  stop: () => '**stop**: how close to the target reading the robot stops (the reading never equals it exactly).',
  ramp: () => '**ramp**: speed up and slow down gently instead of jumping to full speed.',
  reset: () => '**reset**: the yaw sensor reads zero just before this turn, so its target is the turn\'s own angle.',
  spin: () => '**spin**: both wheels turn opposite ways; the robot turns on the spot.',
  pivot: () => '**pivot**: one wheel stays still and the robot turns about it: the other wheel sweeps a wider circle than a spin.',
  arc: () => '**arc**: the point midway between the wheels follows a circle of this radius.',
  ratio: () => '**ratio**: the inner wheel\'s speed as a share of the outer wheel\'s: -100 % is a spin, 0 % a pivot.',
  gyro: (r, s) => {
    if (s.kind === 'gyro') {
      const g = r.setup.gyro;
      return `**gyro**: the yaw sensor as the robot's control loop reads it: \`sample\` (how often the loop runs), \`delay\` (how old each reading is) and \`scale\` (reading over the true angle). Here sample ${ms(g.sample)}, delay ${ms(g.delay)}, scale ${formatNumber(g.scale, 6)}.`;
    }
    if (s.kind === 'noise') return '**noise gyro**: the spread (standard deviation) of the final heading of a gyro turn or held drive.';
    return '**by gyro**: turn until the yaw sensor reads the target. Mind the wrap point of the sensor\'s range.';
  },
  encoders: () => '**by encoders**: turn each wheel by computed degrees; the yaw sensor is not used.',
  square: (_r, s) => s.kind === 'noise'
    ? '**noise square**: the spread (standard deviation) of the heading after a `square` (about 0.5° for a flat bumper); `across` gives the spread of the position across the wall (about 1 mm).'
    : '**square**: drive until the front (or back) meets a wall, and end square to it.',
  across: () => '**across**: after a `square`, the spread (standard deviation) of the robot\'s position across the wall (about 1 mm).',
  level: () => '**level**: the share of runs that must meet this mark (95 % when absent): Veer warns (`miss`) when fewer would, e.g. `level 80%` for a mark that may fail now and then.',
};
