// The words of the plan language, shared by the parser (to recognise and to
// suggest) and by editor features (completion, and `let` refusing to bind them).
import type { Statement } from '../types';

/**
 * First words of statements. Motion statements come first so that a misspelling
 * equally close to two keywords (`turnn`: `turn` or `turns`) suggests the one
 * written most often.
 */
export const STATEMENT_KEYWORDS: readonly string[] = [
  'drive', 'turn', 'start', 'run', 'mark', 'wait', 'reset', 'square',
  'let', 'plan', 'units', 'turns', 'yaw', 'wheel', 'track', 'gear', 'motor', 'gyro',
  'body', 'field', 'box', 'circle', 'zone', 'noise', 'limit',
];

/** Second words that belong to a two-word keyword (`yaw range`, `reset yaw`, `turn to`). */
const SECOND_KEYWORDS: readonly string[] = ['range', 'yaw', 'to'];

/**
 * Words that may follow a statement's leading keyword, per statement: options,
 * flags, turn shapes and the separator words (`to`, `by`, `radius`) that sit
 * between its values.
 */
export const OPTIONS: Record<Statement['kind'], readonly string[]> = {
  plan: [],
  units: [],
  turns: [],
  yawRange: ['to'],
  wheel: ['mismatch'],
  track: ['effective'],
  gear: [],
  motor: ['lag', 'stall'],
  body: ['by', 'axle'],
  field: ['by', 'grid'],
  box: ['to'],
  circle: ['radius'],
  zone: ['to'],
  noise: ['drive', 'turn', 'gyro', 'drift', 'wheel', 'square', 'across'],
  gyro: ['sample', 'delay', 'scale'],
  limit: [],
  let: [],
  run: [],
  start: ['heading'],
  drive: ['speed', 'hold', 'step', 'gain', 'ramp'],
  turn: ['spin', 'pivot', 'arc', 'ratio', 'reverse', 'by', 'speed', 'min', 'gain', 'stop', 'ramp', 'reset'],
  resetYaw: [],
  square: ['speed'],
  wait: [],
  mark: ['at', 'heading', 'within', 'in', 'level'],
};

export const RESERVED_WORDS: ReadonlySet<string> = new Set([
  ...STATEMENT_KEYWORDS,
  ...SECOND_KEYWORDS,
  ...Object.values(OPTIONS).flat(),
]);

/**
 * The candidate `word` was most likely meant to be: one that differs only in
 * case, else the nearest within two edits (insert, delete, substitute, swap two
 * neighbours) for words of three or more characters. Ties go to the earlier
 * candidate. Undefined when `word` is itself a candidate or nothing is close.
 */
export function suggestWord(word: string, candidates: readonly string[]): string | undefined {
  if (candidates.includes(word)) return undefined;
  const lower = word.toLowerCase();
  const sameLetters = candidates.find((candidate) => candidate.toLowerCase() === lower);
  if (sameLetters !== undefined) return sameLetters;
  if (word.length < 3) return undefined;
  let best: string | undefined;
  let bestDistance = 3;
  for (const candidate of candidates) {
    if (Math.abs(candidate.length - lower.length) >= bestDistance) continue;
    const distance = editDistance(lower, candidate.toLowerCase(), bestDistance);
    if (distance >= 1 && distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best;
}

/**
 * Damerau-Levenshtein distance in its optimal-string-alignment form (a swap of
 * neighbours counts as one edit, no substring is edited twice). Returns `limit`
 * as soon as the distance is known to reach it, which keeps very long words cheap.
 */
function editDistance(a: string, b: string, limit: number): number {
  if (Math.abs(a.length - b.length) >= limit) return limit;
  let twoBack: number[] = [];
  let previous: number[] = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current: number[] = [i];
    let rowMinimum = i;
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let value = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
        value = Math.min(value, twoBack[j - 2] + 1);
      }
      current.push(value);
      rowMinimum = Math.min(rowMinimum, value);
    }
    if (rowMinimum >= limit) return limit;
    twoBack = previous;
    previous = current;
  }
  return Math.min(previous[b.length], limit);
}
