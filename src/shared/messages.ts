// The messages between the preview's host (extension side) and its webview.
// Every message names the document (URI string) and the document version it
// belongs to, so either side can drop what arrives late for an older text.
import type { CheckResult, RunResult, SegmentKind, TurnDirection, TurnShape, WheelPair } from '../core/types';
import type { TargetTable } from '../core/targets';
import { footprintOf, normaliseHeading } from '../core/solve/frame';
import type { SpreadShown } from '../core/render/cloud';

/** The preview's spread choices (render/cloud.ts): 95 % ovals at marks, after every motion too, or none. */
export const SPREAD_SHOWN: readonly SpreadShown[] = ['marks', 'all', 'off'];

function isSpreadShown(value: unknown): value is SpreadShown {
  return typeof value === 'string' && (SPREAD_SHOWN as readonly string[]).includes(value);
}

export interface DocumentStamp {
  uri: string;
  version: number;
}

/** What the tooltip of one drawn segment shows; `id` matches the element's `data-segment`. */
export interface SegmentSummary {
  id: string;
  line: number;
  kind: SegmentKind;
  shape?: TurnShape;
  /** Axle midpoint at the end, mm; heading normalised into [0, 360). */
  endX: number;
  endY: number;
  endHeading: number;
  yawEnd: number;
  motorDeg?: WheelPair;
  /** Seconds. */
  duration: number;
  complete: boolean;
}

// ---------------------------------------------------------------------------
// Host -> webview

export interface RenderMessage extends DocumentStamp {
  type: 'render';
  /** Shown in the toolbar and used for export file names. */
  title: string;
  /** The core's SVG fragment (already escaped by the core's renderer). */
  svg: string;
  runNames: string[];
  /** Index into `runNames` of the run drawn, or -1 when every run is drawn. */
  run: number;
  segments: SegmentSummary[];
  /** The targets table of every run (the table shows the run drawn, or all). */
  targets: TargetTable[];
  /** The width in CSS pixels the drawing's text and strokes were sized for. */
  width: number;
  errorCount: number;
  warningCount: number;
  /** Per run drawn (same order as the drawn runs): the predicted timeline, for the timeline strip and the scrubber. */
  timeline: TimelineRun[];
  /** The robot's footprint in its own frame, and the file's turn direction, for drawing it at a scrubbed pose. */
  footprint: FootprintShape;
  turns: TurnDirection;
  /** Where the drawing shows the 95 % ovals (absent: at marks). */
  spread?: SpreadShown;
  /** Present when the drawing holds a Monte Carlo cloud: runs sampled per plan run, the dots drawn, and the cloud's number (echoed in `cloudShown`). */
  cloud?: { count: number; dots: number; id: number };
}

/** The robot's outline: a rectangle (`axle` mm ahead of its centre sits the axle midpoint) or a circle about the axle midpoint. */
export type FootprintShape =
  | { kind: 'rect'; width: number; length: number; axle: number }
  | { kind: 'circle'; radius: number };

/** One motion on the timeline, at its predicted time. */
export interface TimelineBlock {
  /** 0-based plan line. */
  line: number;
  kind: SegmentKind;
  /** Seconds from the run's start (predicted). */
  start: number;
  duration: number;
  /** Short text, e.g. "turn 90° gyro". */
  label: string;
  /** The worst problem on this motion's line, if any. */
  problem?: 'error' | 'warning';
}

/** A run's predicted timeline and the predicted path sampled in time (at most MAX_TIMELINE_POSES samples). */
export interface TimelineRun {
  /** Index into the render message's `runNames`. */
  runIndex: number;
  name: string;
  /** Predicted seconds for the whole run (Infinity is sent as -1: a motion never ends). */
  total: number;
  /** The plan's `limit`, seconds. */
  limit?: number;
  blocks: TimelineBlock[];
  /** Predicted axle-midpoint poses in the field frame (mm, heading degrees unwrapped), by time. */
  poses: { t: number[]; x: number[]; y: number[]; heading: number[] };
}

export const MAX_TIMELINE_POSES = 2000;

/** The controller simulation's samples of one motion, one column per quantity, all of one length. */
export interface TraceColumns {
  /** Seconds from the run's start. */
  t: number[];
  /** The yaw reading the robot's code sees, degrees (NaN-free; the reading even for encoder motions). */
  reading: number[];
  /** The yaw target, degrees; null where the motion steers to none (encoder motions). */
  target: (number | null)[];
  /** target − reading, degrees; null where there is no target. */
  error: (number | null)[];
  /** Commanded power, percent (-100..100). */
  powerLeft: number[];
  powerRight: number[];
  /** Wheel surface speeds, mm/s. */
  speedLeft: number[];
  speedRight: number[];
}

/** The trace of the motion on the cursor's line (sent after each cursor move and each render). */
export interface TraceMessage extends DocumentStamp {
  type: 'trace';
  /** 0-based line of the motion traced, or the cursor's line when there is none. */
  line: number;
  /** A heading for the chart, e.g. "Line 12: turn by gyro, predicted 1.32 s, overshoot +0.8°". */
  title: string;
  /** Absent when the line has no simulated motion; `note` says why. */
  columns?: TraceColumns;
  /** The stop band of a gyro turn, degrees (drawn about the target). */
  stop?: number;
  note?: string;
}

/** The 0-based line of the editor's cursor in the previewed document. */
export interface CursorMessage extends DocumentStamp {
  type: 'cursor';
  line: number;
}

export type HostMessage = RenderMessage | CursorMessage | TraceMessage;

// ---------------------------------------------------------------------------
// Webview -> host

/** Sent once the script runs; `uri` is the restored document or '' when unknown; `spread` the restored choice, when one was made. */
export interface ReadyMessage extends DocumentStamp {
  type: 'ready';
  spread?: SpreadShown;
}

/** The spread choice in the toolbar changed. */
export interface SetSpreadMessage extends DocumentStamp {
  type: 'setSpread';
  spread: SpreadShown;
}

/** The webview drew a drawing with the Monte Carlo cloud numbered `id`: `dots` sampled end points are on screen. */
export interface CloudShownMessage extends DocumentStamp {
  type: 'cloudShown';
  id: number;
  dots: number;
}

/** A click on the drawing: show and select that plan line in the editor. */
export interface RevealMessage extends DocumentStamp {
  type: 'reveal';
  line: number;
}

/** The run selector changed; -1 draws every run. */
export interface SelectRunMessage extends DocumentStamp {
  type: 'selectRun';
  run: number;
}

/** Export the current run as a standalone SVG, drawn by the host with the core's renderer. */
export interface ExportSvgMessage extends DocumentStamp {
  type: 'exportSvg';
}

/** Export the drawing as the webview rasterised it: a PNG file, base64 without a data: prefix. */
export interface ExportPngMessage extends DocumentStamp {
  type: 'exportPng';
  base64: string;
}

/** The drawing area's width in CSS pixels, so the host sizes text and strokes for it. */
export interface ViewSizeMessage extends DocumentStamp {
  type: 'viewSize';
  width: number;
}

/** Copy the targets table of the run shown (or of every run) to the clipboard. */
export interface CopyTargetsMessage extends DocumentStamp {
  type: 'copyTargets';
  format: 'csv' | 'markdown';
}

/** The scrubber or the play button reached this line (or -1 when stopped): the host marks it in the editor. */
export interface ScrubMessage extends DocumentStamp {
  type: 'scrub';
  line: number;
}

export type PreviewMessage = SetSpreadMessage | CloudShownMessage | ScrubMessage | ReadyMessage | RevealMessage | SelectRunMessage | ExportSvgMessage | ExportPngMessage | CopyTargetsMessage | ViewSizeMessage;

/** Drawing widths the host accepts (CSS pixels). */
export const MIN_VIEW_WIDTH = 200;
export const MAX_VIEW_WIDTH = 4000;

/** Largest PNG the host accepts from the webview (base64 characters), so a runaway canvas cannot fill memory. */
export const MAX_PNG_BASE64 = 64 * 1024 * 1024;

const MAX_LINE = 10_000_000;

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function isIndex(value: unknown, min: number): value is number {
  return typeof value === 'number' && Number.isInteger(value) && value >= min && value <= MAX_LINE;
}

function hasStamp(value: Record<string, unknown>): boolean {
  return typeof value.uri === 'string' && value.uri.length < 4096 && isIndex(value.version, -1);
}

/**
 * The webview runs page content we do not fully control, so the host treats
 * everything it posts as untrusted: returns the message only when its shape
 * and types are exactly as declared.
 */
export function parsePreviewMessage(value: unknown): PreviewMessage | undefined {
  if (!isRecord(value) || !hasStamp(value)) return undefined;
  const stamp = { uri: value.uri as string, version: value.version as number };
  switch (value.type) {
    case 'ready':
      return { type: 'ready', ...stamp, ...(isSpreadShown(value.spread) ? { spread: value.spread } : {}) };
    case 'setSpread':
      return isSpreadShown(value.spread) ? { type: 'setSpread', ...stamp, spread: value.spread } : undefined;
    case 'cloudShown':
      return isIndex(value.dots, 0) && isIndex(value.id, 0) ? { type: 'cloudShown', ...stamp, id: value.id, dots: value.dots } : undefined;
    case 'scrub':
      return isIndex(value.line, -1) ? { type: 'scrub', ...stamp, line: value.line } : undefined;
    case 'reveal':
      return isIndex(value.line, 0) ? { type: 'reveal', ...stamp, line: value.line } : undefined;
    case 'selectRun':
      return isIndex(value.run, -1) ? { type: 'selectRun', ...stamp, run: value.run } : undefined;
    case 'exportSvg':
      return { type: 'exportSvg', ...stamp };
    case 'viewSize':
      return typeof value.width === 'number' && Number.isInteger(value.width) && value.width >= MIN_VIEW_WIDTH && value.width <= MAX_VIEW_WIDTH
        ? { type: 'viewSize', ...stamp, width: value.width }
        : undefined;
    case 'copyTargets':
      return value.format === 'csv' || value.format === 'markdown' ? { type: 'copyTargets', ...stamp, format: value.format } : undefined;
    case 'exportPng':
      return typeof value.base64 === 'string' && value.base64.length > 0 && value.base64.length <= MAX_PNG_BASE64
        && /^[A-Za-z0-9+/]+={0,2}$/.test(value.base64)
        ? { type: 'exportPng', ...stamp, base64: value.base64 }
        : undefined;
    default:
      return undefined;
  }
}

/** The webview's check of what the host posts (the host is trusted; this guards against stray window messages). */
export function parseHostMessage(value: unknown): HostMessage | undefined {
  if (!isRecord(value) || !hasStamp(value)) return undefined;
  if (value.type === 'cursor') return isIndex(value.line, 0) ? (value as unknown as CursorMessage) : undefined;
  if (value.type === 'trace') {
    return isIndex(value.line, -1) && typeof value.title === 'string'
      && (value.columns === undefined || (isRecord(value.columns) && Array.isArray(value.columns.t)))
      ? (value as unknown as TraceMessage)
      : undefined;
  }
  if (value.type === 'render') {
    return typeof value.svg === 'string' && typeof value.title === 'string' && Array.isArray(value.runNames)
      && Array.isArray(value.segments) && Array.isArray(value.targets) && isIndex(value.run, -1)
      && typeof value.width === 'number' && value.width > 0 && Array.isArray(value.timeline)
      ? (value as unknown as RenderMessage)
      : undefined;
  }
  return undefined;
}

/** The key the renderer writes into `data-segment` for segment `segIndex` of run `runIndex`. */
export function segmentId(runIndex: number, segIndex: number): string {
  return `${runIndex}:${segIndex}`;
}

/** Tooltip data for every segment of every run (the drawing may show one run or all). */
export function summariseSegments(runs: readonly RunResult[]): SegmentSummary[] {
  return runs.flatMap((run, runIndex) => run.segments.map((seg, segIndex): SegmentSummary => ({
    id: segmentId(runIndex, segIndex),
    line: seg.line,
    kind: seg.kind,
    ...(seg.shape ? { shape: seg.shape } : {}),
    endX: seg.end.x,
    endY: seg.end.y,
    endHeading: normaliseHeading(seg.end.heading),
    yawEnd: seg.yawEnd,
    ...(seg.motorDeg ? { motorDeg: seg.motorDeg } : {}),
    duration: seg.duration,
    complete: seg.complete,
  })));
}

/**
 * The render message for `result`, whose drawing `svg` the caller made with the
 * core's renderer (kept out of here so the webview bundle never pulls in the core).
 */
export function buildRenderMessage(result: CheckResult, stamp: DocumentStamp, run: number, svg: string, targets: TargetTable[], width = 1000,
  timeline: TimelineRun[] = []): RenderMessage {
  const severities = result.diagnostics.map((d) => d.severity);
  return {
    type: 'render',
    ...stamp,
    title: result.setup.title,
    svg,
    runNames: result.runs.map((r) => r.name),
    run,
    segments: summariseSegments(result.runs),
    targets,
    width,
    errorCount: severities.filter((s) => s === 'error').length,
    warningCount: severities.filter((s) => s === 'warning').length,
    timeline,
    footprint: footprintOf(result.setup.robot),
    turns: result.setup.turns,
  };
}
