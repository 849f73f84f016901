// The one-line summary of a plan for the status bar: runs, total time and
// distance, and the problems the checker found (errors first).
import type { CheckResult } from '../types';
import { formatProblemCount, formatRunDistance, formatRunTime } from '../format';

export interface StatusSummary {
  /** Run count, time, distance, problems: the adapter puts icons between them. */
  parts: [string, string, string, string];
  /** The parts joined, without editor icons. */
  text: string;
  /** One line per run. */
  tooltip: string;
  duration: number;
  distance: number;
  errors: number;
  warnings: number;
}

export function statusSummary(result: CheckResult): StatusSummary {
  const duration = result.runs.reduce((t, run) => t + run.duration, 0);
  const distance = result.runs.reduce((t, run) => t + run.distance, 0);
  const errors = result.diagnostics.filter((d) => d.severity === 'error').length;
  const warnings = result.diagnostics.filter((d) => d.severity === 'warning').length;
  const runWord = result.runs.length === 1 ? 'run' : 'runs';
  const parts: StatusSummary['parts'] = [`${result.runs.length} ${runWord}`, formatRunTime(duration), formatRunDistance(distance), formatProblemCount(errors, warnings)];
  const text = parts.join(' · ');
  const tooltip = result.runs
    .map((run) => `${run.name}: ${formatRunTime(run.duration)}, ${formatRunDistance(run.distance)}, ${run.turns} turn${run.turns === 1 ? '' : 's'}`)
    .join('\n');
  return { parts, text, tooltip, duration, distance, errors, warnings };
}
