// The benchmarks' one timer: the median of repeated runs after a warm-up.
import { median } from './stats';

/** Median milliseconds of `reps` runs of `fn`, after `warm` runs (the JIT optimises the hot paths only after several). */
export function medianTime(fn: () => void, warm: number, reps: number): number {
  for (let i = 0; i < warm; i++) fn();
  const times: number[] = [];
  for (let i = 0; i < reps; i++) {
    const started = performance.now();
    fn();
    times.push(performance.now() - started);
  }
  return median(times);
}
