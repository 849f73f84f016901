// The proof of a fix: apply it, check the result again, and compare.
import type { CheckResult, Diagnostic, Fix, Pose } from '../types';
import { checkPlan, type CheckOptions } from '../check';
import { applyEdits, lineMapper } from './text';

/** Findings of the controller simulation (not of the planned path). */
const SIMULATION_CODES: ReadonlySet<string> = new Set(['overshoot', 'stall', 'endless']);

/** How close the end poses of a path-keeping fix must stay. */
export const PATH_TOLERANCE = { mm: 0.01, deg: 0.001 } as const;

export interface FixProof {
  ok: boolean;
  /** Why the fix failed its proof, in words. */
  reason?: string;
  /** The plan after the fix, and its check. */
  text: string;
  after: CheckResult;
}

/**
 * Applies `fix` to `text` (whose check is `before`), checks the result and
 * tells whether the fix keeps its promises: every motion of the plan ends
 * where it did (unless the fix says it changes the path), the diagnostic it
 * targets is gone, and no error appears that was not there.
 */
export function proveFix(text: string, before: CheckResult, fix: Fix, target?: Diagnostic, options: CheckOptions = {}): FixProof {
  const fixed = applyEdits(text, fix.edits);
  const after = checkPlan(fixed, options);
  const moved = lineMapper(fix.edits);
  const fail = (reason: string): FixProof => ({ ok: false, reason, text: fixed, after });

  // A fix of a line that could not be read (a misspelt word or name) makes
  // the line say what it meant: a motion it adds to the path and that
  // motion's own problems are its consequence, not the fix's.
  const repairsUnreadable = target !== undefined && (target.code === 'syntax' || target.code === 'name' || target.code === 'unit');
  if (!fix.changesPath && !repairsUnreadable) {
    const problem = comparePaths(before, after, moved);
    if (problem) return fail(problem);
  }
  if (target) {
    const line = moved(target.range.start.line);
    if (after.diagnostics.some((d) => d.code === target.code && d.range.start.line === line)) return fail(`the ${target.code} problem on line ${line + 1} is still there`);
  }
  const errorsBefore = new Map<string, number>();
  for (const d of before.diagnostics) {
    if (d.severity !== 'error') continue;
    // An error's related lines (a crossing that follows from an earlier one) were problems before the fix too: a
    // fix that changes the path may make such a line's problem stand on its own.
    for (const line of [d.range.start.line, ...(d.related ?? []).map((r) => r.range.start.line)]) {
      const key = `${d.code}@${moved(line)}`;
      errorsBefore.set(key, (errorsBefore.get(key) ?? 0) + 1);
    }
  }
  // A fix of the planned path is judged on the planned path: what the
  // controller simulation predicts after it (a coasting robot, a stall) is
  // shown as its own finding once the fix is applied. A fix of a simulation
  // finding must not bring another.
  const judgeSimulation = target !== undefined && SIMULATION_CODES.has(target.code);
  for (const d of after.diagnostics) {
    if (d.severity !== 'error' || (repairsUnreadable && d.code !== 'syntax')) continue;
    if (SIMULATION_CODES.has(d.code) && !judgeSimulation) continue;
    const key = `${d.code}@${d.range.start.line}`;
    const left = errorsBefore.get(key) ?? 0;
    if (left === 0) return fail(`it adds a ${d.code} error on line ${d.range.start.line + 1}: ${d.message}`);
    errorsBefore.set(key, left - 1);
  }
  return { ok: true, text: fixed, after };
}

/** The first motion whose end pose differs, in words; undefined when every motion ends where it did. */
export function comparePaths(before: CheckResult, after: CheckResult, moved: (line: number) => number = (l) => l): string | undefined {
  if (before.runs.length !== after.runs.length) return `the plan has ${after.runs.length} runs instead of ${before.runs.length}`;
  for (let r = 0; r < before.runs.length; r++) {
    const byLine = new Map<number, Pose>();
    for (const seg of after.runs[r].segments) byLine.set(seg.line, seg.end);
    for (const seg of before.runs[r].segments) {
      if (seg.kind === 'reset') continue;
      const line = moved(seg.line);
      const end = byLine.get(line);
      if (!end) return `line ${seg.line + 1} is no longer a motion`;
      if (!samePose(seg.end, end)) {
        return `the motion on line ${seg.line + 1} now ends at (${end.x.toFixed(2)}, ${end.y.toFixed(2)}) heading ${end.heading.toFixed(3)}° instead of (${seg.end.x.toFixed(2)}, ${seg.end.y.toFixed(2)}) heading ${seg.end.heading.toFixed(3)}°`;
      }
    }
  }
  return undefined;
}

function samePose(a: Pose, b: Pose): boolean {
  return Math.hypot(a.x - b.x, a.y - b.y) <= PATH_TOLERANCE.mm && Math.abs(a.heading - b.heading) <= PATH_TOLERANCE.deg;
}
