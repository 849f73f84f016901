// The calibration runs for a plan's robot: a plan (text) with a straight
// drive, ten spins by encoders, ten spins for the gyro, and one clockwise and
// one counter-clockwise lap of the square test, sized to the plan's field, with
// what to measure and how to record it written as comments.
import type { CheckResult, PlanSetup } from '../types';
import { MIN_TRIALS } from './compute';
import { checkPlan } from '../check';
import { RAMP_FLOOR } from '../sim/motion';

export interface CalibrationRuns {
  /** The plan text, or undefined when the plan lacks what the runs need. */
  text?: string;
  /** Why no runs could be written (each a sentence for a person). */
  problems: string[];
  /** The layout chosen, mm: the drive's length and the square's side. */
  drive?: number;
  side?: number;
}

export interface CalibrationRunsOptions {
  /** The plan's file name, for the comments (`parcel-table.veer`). */
  planName?: string;
  /** The record's file name the comments tell the student to write (default: the plan's name with `.calib`). */
  recordName?: string;
}

/** Whole turns of the spin tests (the plan language allows up to ten turns in one motion). */
export const SPIN_TURNS = 10;
/** Laps each way (Borenstein & Feng drive five). */
export const LAPS = 5;
/** Repeats of the drive and of each spin test. */
export const REPEATS = 3;
/** Room between the footprint's reach and the field's edge, mm. */
const SPARE = 50;
/** A square or drive shorter than this shows too little error to measure with a tape. */
const SHORTEST = 300;
/** Longer is better, but a table is a few metres. */
const LONGEST = 2000;
/** Without a `field`, the runs assume a clear area this big, mm. */
const DEFAULT_AREA = 1200;

export function writeCalibrationRuns(result: CheckResult, options: CalibrationRunsOptions = {}): CalibrationRuns {
  const setup = result.setup;
  const r = setup.robot;
  const problems: string[] = [];
  if (r.wheelDiameter === undefined) problems.push('the plan has no usable `wheel D` line: the calibration runs need the wheel diameter (e.g. `wheel 56 mm`)');
  if (r.track === undefined) problems.push('the plan has no usable `track W` line: the spins and the square need the track (e.g. `track 120 mm`)');
  if (problems.length) return { problems };

  const planName = options.planName ?? `${setup.title}.veer`;
  const recordName = options.recordName ?? planName.replace(/\.veer$/i, '') + '.calib';
  const field = setup.field ?? { width: DEFAULT_AREA, height: DEFAULT_AREA, grid: 100 };
  const reach = reachOf(setup);
  const margin = Math.ceil(reach + SPARE);
  const floorTo = (v: number, step: number) => Math.floor(v / step) * step;
  const largestSide = Math.min(LONGEST, floorTo(Math.min(field.width, field.height) - 2 * margin, 50));
  const alongX = field.width > field.height;
  const longestDrive = Math.min(LONGEST, floorTo((alongX ? field.width : field.height) - 2 * margin, 100));
  const fieldText = `${num(field.width)} by ${num(field.height)}`;
  if (largestSide < SHORTEST) {
    problems.push(`the field (${fieldText} mm) is too small for the square test: with the robot's reach of ${num(reach)} mm and ${SPARE} mm to spare, the square's side would be ${num(Math.max(0, largestSide))} mm, and it needs at least ${SHORTEST} mm. Calibrate on a larger clear area (set its size with \`field\`)`);
  }
  if (Math.min(field.width, field.height) / 2 < margin) {
    problems.push(`the field (${fieldText} mm) is too small for the robot to spin in its middle with ${SPARE} mm to spare`);
  }
  if (problems.length) return { problems };

  // Whole turns and power for the spins: slow, yet inside the simulation's 20 s per motion (15 s here).
  const fullSpeed = ((r.motorSpeed ?? 900) / (r.gear ?? 1)) * Math.PI * r.wheelDiameter! / 360;
  const perTurn = Math.PI * (r.effectiveTrack ?? r.track!);
  // Low powers, but well above the stall power (a robot that needs more than 20 % to move gets more).
  const stallPct = Math.ceil((r.stall ?? 0.05) * 100);
  const slowest = Math.max(20, stallPct + 5);
  let spinPower = slowest / 100;
  let turns = Math.min(SPIN_TURNS, Math.floor((15 * spinPower * fullSpeed) / perTurn));
  while (turns < SPIN_TURNS && spinPower < Math.max(0.3, slowest / 100) - 1e-9) {
    spinPower += 0.05;
    turns = Math.min(SPIN_TURNS, Math.floor((15 * spinPower * fullSpeed) / perTurn));
  }
  if (turns < 1) {
    problems.push(`the robot turns too slowly for the spin tests: one turn at 30 % power takes ${num(perTurn / (0.3 * fullSpeed), 3)} s (check \`motor\` and \`gear\`)`);
    return { problems };
  }
  const spin = `${Math.round(spinPower * 100)}%`;
  // The turns of the laps end slowly (a ramp down to just above the stall power), so that they coast little.
  const turnMin = Math.min(slowest - 2, stallPct + 3);
  const turnSpeed = `${slowest}%`;
  // A ramped drive starts and ends at the ramp's floor power: only where the wheels move at that power.
  const driveSpeed = `${Math.max(30, slowest + 10)}%${(r.stall ?? 0.05) < RAMP_FLOOR ? ' ramp 300 mm/s^2' : ''}`;
  const cw = setup.turns === 'clockwise';
  const right = cw ? 90 : -90; // a turn to the right, in the plan's sign
  const facingX = cw ? 90 : 270; // the field heading that faces +x
  const mid = { x: field.width / 2, y: field.height / 2 };
  const driveStart = alongX ? { x: margin, y: mid.y, h: facingX } : { x: mid.x, y: margin, h: 0 };
  // The largest square and drive whose predicted paths (the controller simulation: the robot coasts a
  // little past each turn) stay on the field, 50 mm (100 mm) smaller at a time.
  let side = largestSide;
  let drive = longestDrive;
  for (;;) {
    const text = compose(side, drive);
    const offField = checkPlan(text, { fileName: 'calibration.veer' }).diagnostics.filter((d) => d.code === 'off-field' || d.code === 'collision');
    const inSquare = offField.some((d) => d.range.start.line > squareFrom(text));
    const inDrive = offField.some((d) => d.range.start.line < squareFrom(text));
    if ((!inSquare || side - 50 < SHORTEST) && (!inDrive || drive - 100 < SHORTEST)) return { text, problems: [], drive, side };
    if (inSquare && side - 50 >= SHORTEST) side -= 50;
    if (inDrive && drive - 100 >= SHORTEST) drive -= 100;
  }

  function compose(side: number, drive: number): string {
  // The square in the middle of the field: the room to spare is the same on every side.
  const corner = { x: Math.round((field.width - side) / 2), y: Math.round((field.height - side) / 2) };
  const L = [] as string[];
  const out = (...lines: string[]) => L.push(...lines);
  const title = setup.title.replace(/["\\]/g, '').slice(0, 90);

  out(
    `plan "Calibration runs for ${title}"`,
    `# Written by \`veer calibrate\` for ${planName}: the runs that measure this robot.`,
    `# Safety: run at the low speeds written here, keep hands and people clear of the robot while it`,
    `# moves, and stop it at once if it heads for the table's edge.`,
    `#`,
    `# Before you start: clear the table, charge the battery, and use the same robot code as for`,
    `# real runs (the same motor targets from \`veer targets\`). Mark one point on the robot, on its`,
    `# centre line right above the axle (a dot on a piece of tape), and mark each start spot and`,
    `# direction on the table with tape. Write what you measure into ${recordName}, next to the plan;`,
    `# \`veer calibrate ${planName}\` (or the hover on the plan's setup lines) then gives the values.`,
    '',
    'units mm',
    `turns ${setup.turns}`,
    ...(setup.yawRange.lo !== -180 ? [`yaw range ${num(setup.yawRange.lo)} to ${num(setup.yawRange.hi)}`] : []),
    `wheel ${num(r.wheelDiameter!)} mm${(r.mismatch ?? 1) !== 1 ? ` mismatch ${num(r.mismatch!, 8)}` : ''}`,
    `track ${num(r.track!)} mm${r.effectiveTrack !== undefined && r.effectiveTrack !== r.track ? ` effective ${num(r.effectiveTrack)} mm` : ''}`,
    ...((r.gear ?? 1) !== 1 ? [`gear ${num(r.gear!, 8)}`] : []),
    `motor ${num(r.motorSpeed ?? 900)} deg/s lag ${num((r.motorLag ?? 0.08) * 1000)} ms stall ${num((r.stall ?? 0.05) * 100)}%`,
    `gyro sample ${num(setup.gyro.sample * 1000)} ms delay ${num(setup.gyro.delay * 1000)} ms scale ${num(setup.gyro.scale, 8)}`,
    ...(r.body ? [`body ${num(r.body.width)} by ${num(r.body.length)} axle ${num(r.body.axle)}`] : []),
    `field ${fieldText}${setup.field ? '' : `    # the plan has no field: these runs assume a clear area of ${DEFAULT_AREA} by ${DEFAULT_AREA} mm`}`,
    '',
    `# 1. Straight drive: the wheels' real size.`,
    `# Put the robot on the start mark, facing along the tape, and run it. Measure how far the marked`,
    `# point moved along the drive's line (tape measure, to the millimetre). Do it ${REPEATS} times, and write`,
    `# the commanded distance, then each measured distance:`,
    `#   drive ${num(drive)} mm measured ___, ___, ___`,
    `run "straight drive"`,
    `start (${num(driveStart.x)}, ${num(driveStart.y)}) heading ${num(driveStart.h)}`,
    `drive ${num(drive)} speed ${driveSpeed}`,
    '',
    `# 2. Spins by encoders: the effective track.`,
    `# Lay a straight reference line of tape under the robot's middle, along its heading. The robot`,
    `# spins ${turns} turns on its encoders (turning ${cw ? 'clockwise' : 'counterclockwise'} seen from above). Count the whole turns, then`,
    `# measure how far it is past (or short of) the line with a protractor: ${turns} turns and 5° short is`,
    `# ${turns * 360 - 5}. Do it ${REPEATS} times, and write the commanded turns, then each angle it really turned:`,
    `#   spin ${turns} turns measured ___, ___, ___`,
    `run "spins by encoders"`,
    `start (${num(mid.x)}, ${num(mid.y)}) heading 0`,
    `turn ${turns * 360} by encoders speed ${spin}`,
    '',
    `# 3. Spins for the gyro: its scale.`,
    `# Zero the gyro with the robot on the reference line. The robot spins about ${turns} turns; when it has`,
    `# stopped, turn it gently by hand until it sits exactly on the line again, ${turns} whole turns from`,
    `# where it started, and read the gyro's total (if the code shows only the reading within its range,`,
    `# add the whole turns: ${turns * 360} + 12 = ${turns * 360 + 12}). Do it ${REPEATS} times, and write the turns, then each reading:`,
    `#   gyro ${turns} turns reads ___, ___, ___`,
    `run "spins for the gyro"`,
    `start (${num(mid.x)}, ${num(mid.y)}) heading 0`,
    `turn ${turns * 360} by encoders speed ${spin}`,
    '',
    `# 4. The square test (Borenstein & Feng, 1996): unequal wheels and the track, together.`,
    `# Each lap drives a ${num(side)} mm square and stops where it started, facing the way it started.`,
    `# Mark the start spot and direction of each lap. After each lap, measure where the marked point`,
    `# stopped, seen from behind the robot as it stood at the start: how far AHEAD of the start spot`,
    `# (negative: behind it) and how far to the LEFT (negative: to the right). Drive ${LAPS} laps each way`,
    `# (at least ${MIN_TRIALS}), and write one line per lap:`,
    `#   lap clockwise ${num(side)} mm ahead ___ left ___`,
    `#   lap counterclockwise ${num(side)} mm ahead ___ left ___`,
    `run "square, clockwise lap"`,
    `start (${num(corner.x)}, ${num(corner.y)}) heading 0`,
    ...lap(side, right, turnMin, turnSpeed, driveSpeed),
    '',
    `run "square, counterclockwise lap"`,
    `start (${num(corner.x + side)}, ${num(corner.y)}) heading 0`,
    ...lap(side, -right, turnMin, turnSpeed, driveSpeed),
    '',
  );
  return L.join('\n');
  }
}

/** The 0-based line where the square test's comments begin. */
function squareFrom(text: string): number {
  return text.split('\n').findIndex((l) => l.startsWith('# 4. '));
}

/** Four legs and four turns back to the start pose. */
function lap(side: number, turn: number, min: number, turnSpeed: string, driveSpeed: string): string[] {
  const lines: string[] = [];
  for (let i = 0; i < 4; i++) lines.push(`drive ${num(side)} speed ${driveSpeed}`, `turn ${turn} speed ${turnSpeed} min ${min}% ramp`);
  return lines;
}

/** How far the footprint reaches from the axle midpoint, mm (the body's farthest corner, or half the track). */
export function reachOf(setup: PlanSetup): number {
  const body = setup.robot.body;
  if (!body) return (setup.robot.track ?? 0) / 2;
  return Math.hypot(body.width / 2, body.length / 2 + Math.abs(body.axle));
}

/** A number as a plan writes it: up to `digits` significant digits, no exponent for ordinary sizes. */
function num(v: number, digits = 6): string {
  const r = Number(v.toPrecision(digits));
  return Object.is(r, -0) ? '0' : String(r);
}
