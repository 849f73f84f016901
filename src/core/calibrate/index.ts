// Calibration (the robot model, section 4): the runs to measure, the record of
// what the real robot did, the setup values with their uncertainty, and the
// edits of the plan's setup lines. Pure: text and check results in, plain data out.
import type { CheckResult } from '../types';
import { calibrate, planRobotOf, type CalibrationResult } from './compute';
import { setupEdits, type SetupEdits } from './edits';
import { parseRecord, type CalibrationRecord } from './record';

export { calibrate, planRobotOf, MIN_TRIALS, type CalibrationResult, type PlanRobot } from './compute';
export { parseRecord, MAX_RECORD_CHARS, type CalibrationRecord, type RecordEntry, type RecordProblem } from './record';
export { solveSquare, type SquareSolution } from './square';
export { estimateOf, propagate, tQuantile, tCdf, type Estimate } from './stats';
export { writeCalibrationRuns, SPIN_TURNS, LAPS, REPEATS, type CalibrationRuns } from './runs';
export { setupEdits, type SetupEdits } from './edits';
export { calibrationText, calibrationJson, planCalibrationHover, recordHover, problemLine, describe, INTERVAL_NOTE } from './report';

export interface PlanCalibration {
  record: CalibrationRecord;
  /** Undefined when the plan has no usable wheel (nothing can be computed). */
  calibration?: CalibrationResult;
  edits: SetupEdits;
}

/** Reads a record and computes everything for a checked plan. */
export function calibratePlan(result: CheckResult, planText: string, recordText: string): PlanCalibration {
  const record = parseRecord(recordText);
  const plan = planRobotOf(result.setup);
  if (!plan) {
    return {
      record: { ...record, problems: [...record.problems, { range: { start: { line: 0, character: 0 }, end: { line: 0, character: 0 } }, severity: 'error', message: 'line 1: the plan has no usable `wheel D` line, so no measurement can be turned into a setup value: fix the plan first' }] },
      edits: { fixes: [], lines: [] },
    };
  }
  const calibration = calibrate(plan, record);
  return { record, calibration, edits: setupEdits(result, planText, calibration) };
}
