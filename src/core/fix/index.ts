// The one fix engine: fixes as text edits, and the re-check that proves them.
export { attachFixes } from './candidates';
export { fewestResets, segmentAtLine, FEWEST_RESETS_TITLE } from './resets';
export { bestReset, type BestReset } from './bestReset';
export { proveFix, comparePaths, PATH_TOLERANCE, type FixProof } from './prove';
export { fixPlan, type PlanFixResult } from './plan';
export { applyEdits, lineMapper } from './text';
