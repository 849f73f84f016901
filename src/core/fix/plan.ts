// `veer fix`: every fix that needs no choice by a person and keeps every
// motion the plan describes, applied to the whole file.
import type { CheckResult, TextEdit } from '../types';
import { checkPlan, type CheckOptions } from '../check';
import { fewestResets } from './resets';
import { proveFix } from './prove';
import { applyEdits } from './text';

export interface PlanFixResult {
  /** The fixed plan (the same text when nothing needed fixing). */
  text: string;
  /** What changed, one sentence each, in the order applied. */
  changes: string[];
  /** The check of the fixed plan. */
  result: CheckResult;
  /** Fixes that were not applied because their re-check failed (a defect in Veer, reported rather than applied). */
  refused: string[];
}

export function fixPlan(text: string, options: CheckOptions = {}): PlanFixResult {
  const changes: string[] = [];
  const refused: string[] = [];
  let current = text;
  let result = checkPlan(current, options);

  // 1. Wrongly cased keywords: the line then says what it was meant to say.
  const caseEdits: TextEdit[] = [];
  for (const d of result.diagnostics) {
    const fix = d.fixes?.find((f) => f.safe);
    if (!fix) continue;
    caseEdits.push(...fix.edits);
    changes.push(`line ${d.range.start.line + 1}: ${fix.edits.map((e) => `wrote \`${e.newText}\``).join(', ')} (${d.message})`);
  }
  if (caseEdits.length) {
    current = applyEdits(current, caseEdits);
    result = checkPlan(current, options);
  }

  // 2. The fewest yaw resets, proven to keep the path.
  const resets = fewestResets(result, current);
  if (resets) {
    const proof = proveFix(current, result, resets, undefined, options);
    if (proof.ok) {
      const inserted = resets.edits.filter((e) => /^\s*reset yaw(\r\n|\r|\n)$/.test(e.newText)).length;
      const rewritten = resets.edits.length - inserted;
      const removed = countCrossings(result) - countCrossings(proof.after);
      changes.push(`inserted ${inserted} \`reset yaw\` line${inserted === 1 ? '' : 's'}${rewritten ? ` and rewrote ${rewritten} later target${rewritten === 1 ? '' : 's'}` : ''}, removing ${removed} wrap crossing${removed === 1 ? '' : 's'}; every motion ends where it did`);
      current = proof.text;
      result = proof.after;
    } else {
      refused.push(`the fewest-resets fix was not applied: ${proof.reason}`);
    }
  }
  return { text: current, changes, result, refused };
}

function countCrossings(result: CheckResult): number {
  return result.diagnostics.filter((d) => d.code === 'wrap-cross').length;
}
