// The model-fit benchmark: fitting the robot model (src/core/record/fit.ts) to
// a realistic log, the demo plan's run (examples/parcel-table.veer) at 10 ms
// samples (the controller simulation's powers replayed through the plant,
// with sensor noise, 2 s standing still at each end), and to a 100,000-row
// log (about 17 minutes at 10 ms). Target for the realistic log: at most 200 ms.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan } from '../src/core';
import { currentFromSetup, fitRobot } from '../src/core/record/fit';
import { calibrationSchedule, plannedSchedule, simulatedLog, TRUTH, type PowerStep } from '../test/support/simulatedLog';
import { round } from './stats';
import { medianTime } from './timing';

export const FIT_TARGET_MS = 200;

/** Median milliseconds of one fit: the demo plan's run, and 100,000 rows. */
export function fitFigures(): { fit_ms: number; fit_rows: number; fit_100k_ms: number } {
  // From the source (bench/) or its bundle (bench/.bundle/).
  const root = join(__dirname, __dirname.endsWith('.bundle') ? '../..' : '..');
  const text = readFileSync(join(root, 'examples/parcel-table.veer'), 'utf8');
  const plan = currentFromSetup(checkPlan(text).setup);
  const still: PowerStep = { uL: 0, uR: 0, duration: 2 };
  const demo = simulatedLog(TRUTH, [still, ...plannedSchedule(text), still], { seed: 1, travel: 0.1, yaw: 0.1, planMismatch: plan.mismatch });
  const fit = medianTime(() => fitRobot(demo, plan), 5, 21);
  const long: PowerStep[] = [];
  let seconds = 0;
  while (seconds < 1000) for (const s of calibrationSchedule()) { long.push(s); seconds += s.duration; }
  const big = simulatedLog(TRUTH, long, { seed: 2, travel: 0.1, yaw: 0.1, planMismatch: plan.mismatch });
  const rows = 100_000;
  big.samples = big.samples.slice(0, rows);
  const fit100k = medianTime(() => fitRobot(big, plan), 1, 5);
  return { fit_ms: round(fit), fit_rows: demo.samples.length, fit_100k_ms: round(fit100k) };
}
