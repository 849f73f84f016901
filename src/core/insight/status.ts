// The one-line summary of a plan for the status bar: total run time and
// distance, and how many yaw-wrap problems the checker found.
import type { CheckResult } from '../types';
import { formatLength, formatTime } from './format';

export interface StatusSummary {
  /** Run count, time, distance, wrap problems: the adapter puts icons between them. */
  parts: [string, string, string, string];
  /** The parts joined, without editor icons. */
  text: string;
  /** One line per run. */
  tooltip: string;
  duration: number;
  distance: number;
  wrapProblems: number;
  errors: number;
}

const WRAP_CODES = new Set(['wrap-cross', 'wrap-edge', 'long-way']);

export function statusSummary(result: CheckResult): StatusSummary {
  const unit = result.setup.lengthUnit;
  const duration = result.runs.reduce((t, run) => t + run.duration, 0);
  const distance = result.runs.reduce((t, run) => t + run.distance, 0);
  const wrapProblems = result.diagnostics.filter((d) => WRAP_CODES.has(d.code)).length;
  const errors = result.diagnostics.filter((d) => d.severity === 'error').length;
  const runWord = result.runs.length === 1 ? 'run' : 'runs';
  const wrapText = wrapProblems === 0 ? 'no wrap problems' : `${wrapProblems} wrap problem${wrapProblems === 1 ? '' : 's'}`;
  const parts: StatusSummary['parts'] = [`${result.runs.length} ${runWord}`, formatTime(duration), formatLength(distance, unit), wrapText];
  const text = parts.join(' · ');
  const tooltip = result.runs
    .map((run) => `${run.name}: ${formatTime(run.duration)}, ${formatLength(run.distance, unit)}, ${run.turns} turns`)
    .join('\n');
  return { parts, text, tooltip, duration, distance, wrapProblems, errors };
}
