// The public surface of the Veer core. Pure: text in, plain data out.
export * from './types';
export { parsePlan } from './syntax/parser';
export { checkPlan, MAX_PLAN_CHARS, INTERNAL_FAILURE, type CheckOptions } from './check';
export * from './report';
export { renderSvg, type RenderOptions } from './render/svg';
export { ExpressionCache } from './units/evaluate';
export { fewestResets, segmentAtLine, FEWEST_RESETS_TITLE, proveFix, comparePaths, fixPlan, applyEdits, lineMapper, PATH_TOLERANCE, type FixProof, type PlanFixResult } from './fix';
export { targetTables, targetsDocument, targetsCsv, targetsMarkdown, targetsText, TARGET_COLUMNS, type TargetRow, type TargetTable, type TargetsDocument } from './targets';
export { toSarif, CODE_SUMMARIES, type SarifInput, type SarifOptions } from './sarif';
