// Hover text for a plan: a `let` name's value, an expression's value in the
// file's units, or everything computed for a motion line.
import { propagateRun, spreadCentre } from '../spread/run';
import { markProbability } from '../spread/gaussian';
import type { CheckResult, LengthUnitName, MotionStmt, Pos, Range, Segment, Statement } from '../types';
import { formatAngle, formatHeading, formatLength, formatNumber, formatTime, formatWheels } from './format';
import { identifierAt, rangeContains, rangeSize, splitLines } from './text';
import { WORD_EXPLANATIONS } from './explain';

export interface HoverInfo {
  /** Markdown. */
  markdown: string;
  range: Range;
}

const MOTION_KINDS = new Set<Statement['kind']>(['start', 'drive', 'turn', 'resetYaw', 'square', 'wait', 'mark']);

export function hoverAt(result: CheckResult, text: string, pos: Pos): HoverInfo | undefined {
  const word = wordHover(result, text, pos);
  const motion = motionHover(result, pos);
  if (motion && word) return { markdown: `${motion.markdown}\n\n---\n\n${word.markdown}`, range: motion.range };
  return nameHover(result, text, pos) ?? valueHover(result, pos) ?? motion ?? word;
}

/** A word of the language under the cursor (`track`, `effective`, `pivot`, ...), explained with this plan's values. */
function wordHover(result: CheckResult, text: string, pos: Pos): HoverInfo | undefined {
  const lineText = splitLines(text)[pos.line];
  if (lineText === undefined) return undefined;
  const word = identifierAt(lineText, pos);
  if (!word || Object.prototype.hasOwnProperty.call(result.names, word.word)) return undefined;
  const statement = result.ast.statements.find((s) => s.line === pos.line);
  if (!statement || !rangeContains(statement.range, pos)) return undefined;
  const explain = Object.prototype.hasOwnProperty.call(WORD_EXPLANATIONS, word.word) ? WORD_EXPLANATIONS[word.word] : undefined;
  return explain ? { markdown: explain(result, statement), range: word.range } : undefined;
}

function nameHover(result: CheckResult, text: string, pos: Pos): HoverInfo | undefined {
  const lineText = splitLines(text)[pos.line];
  if (lineText === undefined) return undefined;
  const word = identifierAt(lineText, pos);
  if (!word || !Object.prototype.hasOwnProperty.call(result.names, word.word)) return undefined;
  const info = result.names[word.word];
  return {
    markdown: `\`${word.word}\` = **${info.display}**` + `\n\n(bound on line ${info.line + 1})`,
    range: word.range,
  };
}

function valueHover(result: CheckResult, pos: Pos): HoverInfo | undefined {
  // Innermost first: a point's coordinate wins over anything enclosing it.
  const hit = result.values
    .filter((v) => rangeContains(v.range, pos))
    .sort((a, b) => rangeSize(a.range) - rangeSize(b.range))[0];
  if (!hit) return undefined;
  return { markdown: `**${hit.display}** (${hit.dimension})`, range: hit.range };
}

function motionHover(result: CheckResult, pos: Pos): HoverInfo | undefined {
  const statement = result.ast.statements.find(
    (s): s is MotionStmt => s.line === pos.line && MOTION_KINDS.has(s.kind) && rangeContains(s.range, pos),
  );
  if (!statement) return undefined;
  const segments = result.runs.flatMap((run) => run.segments).filter((segment) => segment.line === pos.line);
  if (segments.length === 0) return undefined;
  const markdown = describeSegments(segments, result.setup.lengthUnit, robotNotes(result, segments));
  const reset = statement.kind === 'resetYaw' || (statement.kind === 'turn' && statement.reset);
  return { markdown: reset ? `${markdown}\n\n${resetEffect(result, segments[0])}` : markdown, range: statement.range };
}

/**
 * What a zero of the yaw does to where the robot ends up: the 95 % spread at
 * the run's end and the chance of meeting each later mark, with the zero and
 * without it (the spread model, robot model section 3).
 */
function resetEffect(result: CheckResult, seg: Segment): string {
  const run = result.runs.find((r) => r.segments.includes(seg));
  const width = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
  if (!run || width === undefined) return '';
  const withIt = propagateRun(run.segments, result.setup.noise, width, result.setup.turns);
  const without = propagateRun(run.segments, result.setup.noise, width, result.setup.turns, { without: seg });
  const last = run.segments[run.segments.length - 1];
  const size = (sp: { ellipse95: { a: number } } | undefined) => (sp ? formatLength(sp.ellipse95.a, result.setup.lengthUnit) : '?');
  const lines = [`**this zero of the yaw** (19 runs in 20 end within the oval): at the run's end ${size(withIt.bySegment.get(last))} with it, ${size(without.bySegment.get(last))} without it`];
  const heading = (sp: { headingSd: number } | undefined) => (sp ? formatAngle(2 * sp.headingSd) : '?');
  lines.push(`heading at the end (±2 sd): ${heading(withIt.bySegment.get(last))} with it, ${heading(without.bySegment.get(last))} without it`);
  // Each later mark's chance, both ways.
  const from = run.segments.indexOf(seg);
  for (const mark of run.segments.slice(from).filter((s) => s.kind === 'mark').slice(0, 3)) {
    const chance = (sp: Segment['spread']) => (sp && mark.markTarget ? markProbability(mark.markTarget, spreadCentre(mark), { xx: sp.cov[0][0], xy: sp.cov[0][1], yy: sp.cov[1][1] }) : undefined);
    const a = chance(withIt.bySegment.get(mark));
    const b = chance(without.bySegment.get(mark));
    if (a !== undefined && b !== undefined) lines.push(`"${mark.label}" met in ${Math.round(a * 100)} % of runs with it, ${Math.round(b * 100)} % without it`);
  }
  return lines.join('  \n');
}

/** Why motor degrees differ from wheel degrees, when they do: the gear and the effective track. */
function robotNotes(result: CheckResult, segments: Segment[]): string[] {
  const robot = result.setup.robot;
  const notes: string[] = [];
  if (robot.gear !== undefined && robot.gear !== 1 && segments.some((s) => s.motorDeg)) {
    notes.push(`motor degrees include the gear: ${formatNumber(robot.gear, 3)} motor degrees per wheel degree`);
  }
  const encoderTurn = segments.some((s) => s.kind === 'turn' && s.sensing === 'encoders' && s.motorDeg);
  if (encoderTurn && robot.effectiveTrack !== undefined && robot.track !== undefined && robot.effectiveTrack !== robot.track) {
    notes.push(`this encoder turn's motor degrees use the effective track, ${formatLength(robot.effectiveTrack, result.setup.lengthUnit)} (measured: ${formatLength(robot.track, result.setup.lengthUnit)}), which is what the robot really needs to turn; the wheel degrees use the measured track`);
  }
  return notes;
}

/**
 * A line may give more than one segment (a stepped hold is drawn as a turn in
 * place, then the drive): the hover spans from the first one's start to the
 * last one's end and adds up what adds up.
 */
export function describeSegments(segments: Segment[], unit: LengthUnitName, notes: string[] = []): string {
  const first = segments[0];
  const last = segments[segments.length - 1];
  const sum = (pick: (s: Segment) => number | undefined) => segments.reduce((total, s) => total + (pick(s) ?? 0), 0);
  const sumPairs = (pick: (s: Segment) => { left: number; right: number } | undefined) =>
    segments.some((s) => pick(s) !== undefined)
      ? { left: sum((s) => pick(s)?.left), right: sum((s) => pick(s)?.right) }
      : undefined;

  const title = [`**${first.kind}**`, first.shape, first.sensing && `by ${first.sensing}`].filter(Boolean).join(' · ');
  const place = (x: number, y: number) => `(${formatLength(x, unit)}, ${formatLength(y, unit)})`;
  // The numbers the robot's code needs come first, on one line.
  const motorsFirst = sumPairs((s) => s.motorDeg);
  const targetFirst = segments.find((s) => s.yawTarget !== undefined)?.yawTarget;
  const needs = [
    motorsFirst && `motors ${formatWheels(motorsFirst)}`,
    targetFirst !== undefined && `yaw target ${formatAngle(targetFirst)}`,
    `time ${formatTime(sum((s) => s.duration))}`,
  ].filter(Boolean);
  const lines = [
    `${title}: ${needs.join(' · ')}`,
    '',
    '| | start | end |',
    '|---|---|---|',
    `| position | ${place(first.start.x, first.start.y)} | ${place(last.end.x, last.end.y)} |`,
    `| heading | ${formatHeading(first.start.heading)} | ${formatHeading(last.end.heading)} |`,
    `| yaw reading | ${formatAngle(first.yawStart)} | ${formatAngle(last.yawEnd)} |`,
    '',
  ];
  const facts: string[] = [];
  const turned = sum((s) => s.turned);
  if (turned !== 0) facts.push(`turned: ${formatAngle(turned)}`);
  const target = segments.find((s) => s.yawTarget !== undefined)?.yawTarget;
  if (target !== undefined) facts.push(`yaw target: ${formatAngle(target)}`);
  const wheels = sumPairs((s) => s.wheelDeg);
  if (wheels) facts.push(`wheel degrees: ${formatWheels(wheels)}`);
  const motors = sumPairs((s) => s.motorDeg);
  if (motors) facts.push(`motor degrees: ${formatWheels(motors)}`);
  const radius = segments.find((s) => s.radius !== undefined)?.radius;
  if (radius !== undefined) facts.push(`turn radius: ${formatLength(radius, unit)}`);
  const distance = sum((s) => s.distance);
  if (distance > 0) facts.push(`distance: ${formatLength(distance, unit)}`);
  facts.push(`time: ${formatTime(sum((s) => s.duration))}`);
  if (segments.some((s) => !s.complete)) facts.push('_some values of this line could not be computed_');
  lines.push(facts.join('  \n'));
  // What the real robot is predicted to do (the controller simulation).
  const p = last.predicted;
  if (p && last.kind !== 'start' && last.kind !== 'mark' && last.kind !== 'reset') {
    const off = Math.hypot(p.end.x - last.end.x, p.end.y - last.end.y);
    const headingOff = ((((p.end.heading - last.end.heading) % 360) + 540) % 360) - 180;
    const predicted = [
      Number.isFinite(p.duration) && !p.capped ? `time ${formatTime(p.duration)}` : p.capped ? 'never ends (cut off after 20 s)' : 'stalls: waits for ever',
      p.overshoot !== undefined && `${p.overshoot >= 0 ? 'overshoot' : 'short by'} ${formatAngle(Math.abs(p.overshoot))}`,
      `ends ${formatLength(off, unit)} and ${formatAngle(Math.abs(headingOff))} from the plan`,
      p.peakRate >= 0.5 && `peak rate ${formatAngle(p.peakRate)}/s`,
    ].filter(Boolean);
    lines.push('', `**predicted** (motor lag, stall, control loop): ${predicted.join(' · ')}`);
  }
  if (notes.length) lines.push('', ...notes.map((n) => `_${n}_`));
  return lines.join('\n');
}
