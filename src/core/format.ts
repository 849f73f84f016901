// The one way numbers read on every surface a person reads: the status bar,
// the outline, hovers, hints, the preview's legend, tooltips and targets
// table, and the command line's summaries and text tables. (JSON and CSV keep
// three decimals for programs.)

/** Decimals per kind of value a person reads. */
export const DIGITS = { angle: 1, length: 1, time: 2, speed: 1, power: 1 } as const;

/** Up to `digits` decimals, without trailing zeros, and never "-0". */
export function formatNumber(value: number, digits = 1): string {
  if (!Number.isFinite(value)) return String(value);
  const text = value.toFixed(digits).replace(/\.?0+$/, '');
  return text === '-0' ? '0' : text;
}

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

/** Three decimals, for programs (JSON, CSV): enough for motor degrees and millimetres, and stable in files. */
export function round3(v: number): number {
  const r = Math.round(v * 1000) / 1000;
  return Object.is(r, -0) ? 0 : r;
}
