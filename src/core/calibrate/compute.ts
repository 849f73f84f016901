// From a calibration record to setup values (the robot model, section 4),
// each with the mean, standard error and Student's t 95 % interval of its
// trials.
//
// How the tests combine (every commanded wheel degree comes from the plan's
// `wheel D`, every encoder turn's from its effective track WE):
// - drive: the mean of the two wheels is D × measured/commanded. With a
//   mismatch E (recorded by the square test, or the plan's), `wheel` is the
//   left wheel: 2 × mean/(1 + E).
// - spins by encoders: the robot turned WE·D_true/(D·b) of what it was told;
//   the effective track that makes the next turns come out right on the new
//   wheel value D' is WE × commanded/measured × D'/D.
// - square test: the mismatch is the paper's E_d; the track WE × E_b × D'/D.
// - gyro: scale = total reading / true angle.
import type { PlanSetup } from '../types';
import type { CalibrationRecord, LapDirection, RecordEntry, RecordProblem, Trial } from './record';
import { refineSquare, solveSquare } from './square';
import { estimateOf, exact, propagate, type Estimate } from './stats';

/** The robot values the plan had when the calibration runs were written from it. */
export interface PlanRobot {
  /** `wheel D`, mm (the left wheel's diameter). */
  wheel: number;
  /** `wheel ... mismatch E`. */
  mismatch: number;
  /** `track W`, mm, where the plan has one. */
  track?: number;
  /** The effective track, mm (the track where no `effective` is written). */
  effectiveTrack?: number;
  /** `gyro ... scale F`. */
  gyroScale: number;
}

export function planRobotOf(setup: PlanSetup): PlanRobot | undefined {
  const r = setup.robot;
  if (r.wheelDiameter === undefined) return undefined;
  return { wheel: r.wheelDiameter, mismatch: r.mismatch ?? 1, track: r.track, effectiveTrack: r.effectiveTrack ?? r.track, gyroScale: setup.gyro.scale };
}

export interface WheelResult {
  /** Measured over commanded distance, per trial. */
  ratio: Estimate;
  /** The mean of the two wheels' diameters, mm. */
  mean: Estimate;
  /** The value for `wheel D` (the left wheel's diameter when a mismatch is set), mm. */
  diameter: Estimate;
  /** The mismatch the diameter is split with. */
  mismatch: number;
  lines: number[];
}

export interface SpinResult {
  /** Commanded over measured angle, per trial. */
  ratio: Estimate;
  /** The effective track, mm. */
  track: Estimate;
  /** The new wheel value over the plan's (1 when no drive was recorded). */
  wheelFactor: number;
  lines: number[];
}

export interface GyroResult {
  scale: Estimate;
  lines: number[];
}

export interface SquareResult {
  /** The square's side, mm. */
  side: number;
  /** The track b of the formulas (the plan's effective track), mm. */
  b: number;
  /** Centres of gravity of the laps' return errors, mm: ahead (x) and, where recorded, left (y). */
  xCw: Estimate;
  xCcw: Estimate;
  yCw?: Estimate;
  yCcw?: Estimate;
  /** Each 90° turn's error, degrees (positive: turns too little). */
  alphaDeg: Estimate;
  /** Each leg's heading change from unequal wheels, degrees (positive: curves left). */
  betaDeg: Estimate;
  /** Right wheel over left, from the exact laps (the paper's formulas refined, see `refineSquare`). */
  mismatch: Estimate;
  /** Actual over commanded track, the same way. */
  trackFactor: Estimate;
  /** The paper's first-order formulas alone, for comparison. */
  formula: { mismatch: number; trackFactor: number };
  /** The effective track the track factor gives, mm. */
  track: Estimate;
  lines: number[];
}

export interface CalibrationResult {
  plan: PlanRobot;
  wheel?: WheelResult;
  spin?: SpinResult;
  gyro?: GyroResult;
  square?: SquareResult;
  /** Problems of the computation (too few trials, a missing direction, a missing plan value), with the record lines they concern. */
  problems: RecordProblem[];
}

/** At least this many trials per test: their spread is the uncertainty. */
export const MIN_TRIALS = 2;

const RAD = Math.PI / 180;

export function calibrate(plan: PlanRobot, record: CalibrationRecord): CalibrationResult {
  const problems: RecordProblem[] = [];
  const of = <K extends RecordEntry['kind']>(kind: K) => record.entries.filter((e): e is Extract<RecordEntry, { kind: K }> => e.kind === kind);
  const tooFew = (entries: ReadonlyArray<{ line: number; range: RecordEntry['range'] }>, count: number, what: string, example: string) => {
    problems.push({
      range: entries[0].range, severity: 'error',
      message: `line ${entries[0].line + 1}: too few trials for ${what}: ${count === 1 ? 'one' : count} recorded, at least ${MIN_TRIALS} needed (their spread is the uncertainty; 3 to 5 are better). Repeat the run and add each result, e.g. ${example}`,
    });
  };

  const result: CalibrationResult = { plan, problems };

  // The square test first: its mismatch splits the wheel's mean diameter.
  const laps = of('lap');
  let squareParts: { xCw: Estimate; xCcw: Estimate; yCw?: Estimate; yCcw?: Estimate; side: number; lines: number[] } | undefined;
  if (laps.length) {
    const side = laps[0].side;
    const other = laps.find((l) => Math.abs(l.side - side) > 1e-9 * side);
    const byDir = (d: LapDirection) => laps.filter((l) => l.direction === d);
    const cw = byDir('clockwise');
    const ccw = byDir('counterclockwise');
    if (other) {
      problems.push({ range: other.sideRange, severity: 'error', message: `line ${other.line + 1}: every lap of the square test must have the same side (line ${laps[0].line + 1} has ${round(side)} mm, this one ${round(other.side)} mm): the formulas take one side L. Drive all laps on one square, or remove the laps of the other` });
    } else if (!cw.length || !ccw.length) {
      const missing = cw.length ? 'counterclockwise' : 'clockwise';
      problems.push({ range: laps[0].range, severity: 'error', message: `line ${laps[0].line + 1}: missing measurements: the square test needs laps both ways, and no ${missing} lap is recorded. Drive the ${missing} laps too and add a line for each, e.g. \`lap ${missing} ${round(side)} mm ahead 12 left -3\`` });
    } else if (cw.length < MIN_TRIALS || ccw.length < MIN_TRIALS) {
      const few = cw.length < MIN_TRIALS ? cw : ccw;
      tooFew(few, few.length, `the ${few[0].direction} laps`, `one line per lap: \`lap ${few[0].direction} ${round(side)} mm ahead -18 left 5\``);
    } else {
      const lefts = (ls: typeof laps) => (ls.every((l) => l.left) ? estimateOf(ls.map((l) => l.left!.value)) : undefined);
      squareParts = {
        xCw: estimateOf(cw.map((l) => l.ahead.value)), xCcw: estimateOf(ccw.map((l) => l.ahead.value)),
        yCw: lefts(cw), yCcw: lefts(ccw), side, lines: laps.map((l) => l.line),
      };
    }
  }
  const b = plan.effectiveTrack;
  let squareMismatch: Estimate | undefined;
  let squareTrackFactor: Estimate | undefined;
  if (squareParts) {
    if (b === undefined) {
      problems.push({ range: laps[0].range, severity: 'error', message: `line ${laps[0].line + 1}: the square test needs the plan's track (its formulas use it): add \`track W\` to the plan` });
    } else {
      const { xCw, xCcw, side } = squareParts;
      const paper = (cwX: number, ccwX: number) => solveSquare(cwX, ccwX, side, b);
      const exactLaps = (cwX: number, ccwX: number) => refineSquare(cwX, ccwX, side, b);
      const at = paper(xCw.value, xCcw.value);
      const refined = exactLaps(xCw.value, xCcw.value);
      if (!refined) {
        problems.push({ range: laps[0].range, severity: 'error', message: `line ${laps[0].line + 1}: the laps' errors (${round(xCw.value)} mm clockwise, ${round(xCcw.value)} mm counterclockwise) fit no pair of wheel mismatch and track: check that \`ahead\` is measured along the first leg and that the laps are labelled with the way they turned` });
      } else {
        // First-order propagation with central differences (the solutions are smooth near the means).
        const h = Math.max(1e-4 * side, 1e-3);
        const est = (value: number, f: (cwX: number, ccwX: number) => number | undefined) => {
          const dCw = ((f(xCw.value + h, xCcw.value) ?? NaN) - (f(xCw.value - h, xCcw.value) ?? NaN)) / (2 * h);
          const dCcw = ((f(xCw.value, xCcw.value + h) ?? NaN) - (f(xCw.value, xCcw.value - h) ?? NaN)) / (2 * h);
          return propagate(value, [{ of: xCw, derivative: dCw }, { of: xCcw, derivative: dCcw }]);
        };
        squareMismatch = est(refined.mismatch, (a, c) => exactLaps(a, c)?.mismatch);
        squareTrackFactor = est(refined.trackFactor, (a, c) => exactLaps(a, c)?.trackFactor);
        result.square = {
          ...squareParts, b,
          alphaDeg: est(at.alpha / RAD, (a, c) => paper(a, c).alpha / RAD), betaDeg: est(at.beta / RAD, (a, c) => paper(a, c).beta / RAD),
          mismatch: squareMismatch, trackFactor: squareTrackFactor,
          formula: { mismatch: at.mismatch, trackFactor: at.trackFactor },
          track: squareTrackFactor, // replaced below, once the wheel is known
        };
      }
    }
  }

  // Drive: the wheels' mean diameter, split by the mismatch.
  const drives = of('drive');
  if (drives.length) {
    const ratios = drives.flatMap((e) => e.trials.map((t) => t.value / e.commanded));
    if (ratios.length < MIN_TRIALS) tooFew(drives, ratios.length, 'the straight drive', `\`drive ${round(drives[0].commanded)} mm measured ${round(drives[0].trials[0]?.value ?? 985)}, 987, 984\``);
    else {
      const ratio = estimateOf(ratios);
      const mean = propagate(plan.wheel * ratio.value, [{ of: ratio, derivative: plan.wheel }]);
      const e = squareMismatch ?? exact(plan.mismatch);
      const diameter = propagate((2 * mean.value) / (1 + e.value), [
        { of: mean, derivative: 2 / (1 + e.value) },
        { of: e, derivative: (-2 * mean.value) / (1 + e.value) ** 2 },
      ]);
      result.wheel = { ratio, mean, diameter, mismatch: e.value, lines: drives.map((d) => d.line) };
    }
  }
  const wheelNew = result.wheel?.diameter ?? exact(plan.wheel);
  const wheelFactor = wheelNew.value / plan.wheel;

  // A track scaled from the plan's effective track, on the new wheel value.
  const scaledTrack = (factor: Estimate): Estimate => {
    const we = b ?? NaN;
    return propagate(we * factor.value * wheelFactor, [
      { of: factor, derivative: we * wheelFactor },
      { of: wheelNew, derivative: (we * factor.value) / plan.wheel },
    ]);
  };
  if (result.square && squareTrackFactor) result.square.track = scaledTrack(squareTrackFactor);

  const spins = of('spin');
  if (spins.length) {
    const ratios = spins.flatMap((e) => e.trials.map((t) => e.commanded / t.value));
    if (b === undefined) problems.push({ range: spins[0].range, severity: 'error', message: `line ${spins[0].line + 1}: the spins give the effective track as a share of the plan's: add \`track W\` to the plan` });
    else if (ratios.length < MIN_TRIALS) tooFew(spins, ratios.length, 'the spins by encoders', `\`spin ${round(spins[0].commanded / 360)} turns measured 3588, 3591, 3585\``);
    else {
      const ratio = estimateOf(ratios);
      result.spin = { ratio, track: scaledTrack(ratio), wheelFactor, lines: spins.map((s) => s.line) };
    }
  }

  const gyros = of('gyro');
  if (gyros.length) {
    const ratios = gyros.flatMap((e) => e.trials.map((t: Trial) => t.value / e.turned));
    if (ratios.length < MIN_TRIALS) tooFew(gyros, ratios.length, 'the gyro spins', `\`gyro ${round(gyros[0].turned / 360)} turns reads 3612, 3609, 3615\``);
    else result.gyro = { scale: estimateOf(ratios), lines: gyros.map((g) => g.line) };
  }
  return result;
}

function round(v: number): number {
  return Number(v.toPrecision(6));
}
