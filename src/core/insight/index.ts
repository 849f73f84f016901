// Editor-free help computed from a checked plan: hovers, inlay hints, outline,
// completion and the status summary. Every editor adapter converts these.
export { hoverAt, describeSegments, type HoverInfo } from './hover';
export { inlayHints, type InlayHintInfo } from './inlayHints';
export { documentSymbols, type PlanSymbol } from './symbols';
export { completionsAt, type CompletionInfo } from './completion';
export { statusSummary, type StatusSummary } from './status';
export { formatAngle, formatHeading, formatLength, formatNumber, formatTime } from './format';
