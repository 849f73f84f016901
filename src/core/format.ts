// The one way a run's totals read, on every surface: the status bar, the
// outline, the preview's legend, the command line's summary and exports.

/** A run's time: one decimal, in seconds ("17.2 s"); "time unknown" when it cannot be computed. */
export function formatRunTime(seconds: number): string {
  return Number.isFinite(seconds) ? `${seconds.toFixed(1)} s` : 'time unknown';
}

/** A run's distance: metres with two decimals ("3.09 m"). */
export function formatRunDistance(mm: number): string {
  return `${(mm / 1000).toFixed(2)} m`;
}

/** "1 error", "2 warnings", "no problems": errors first, then warnings. */
export function formatProblemCount(errors: number, warnings: number): string {
  const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
  if (errors && warnings) return `${plural(errors, 'error')}, ${plural(warnings, 'warning')}`;
  if (errors) return plural(errors, 'error');
  if (warnings) return plural(warnings, 'warning');
  return 'no problems';
}
