// What the editor and the preview show of the controller simulation: a run's
// predicted timeline (motions as blocks, the predicted path sampled in time
// for the scrubber) and the trace of the motion on one line.
import type { CheckResult } from '../types';
import type { TimelineRun, TraceMessage } from '../../shared/messages';

/** A trace as the preview receives it, without the document stamp. */
export type TraceView = Omit<TraceMessage, 'type' | 'uri' | 'version'>;

/** The timeline of each run drawn: `run` is an index into `result.runs`, or -1 for every run. */
export function buildTimeline(result: CheckResult, run: number): TimelineRun[] {
  void result; void run;
  return [];
}

/** The trace of the motion on `line` (0-based), or a note saying why there is none. */
export function traceForLine(result: CheckResult, line: number): TraceView {
  void result;
  return { line, title: '', note: 'not simulated yet' };
}
