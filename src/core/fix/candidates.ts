// The fixes offered on the checker's diagnostics. Every fix keeps the path
// the plan means (each motion's change of heading), unless its title says it
// changes the path: a zero inserted for one target rewrites the later
// absolute targets (`turn to`, `hold`) up to the next zero, as the whole-file
// fix does. `proveFix` re-checks any of them.
import type { CheckResult, Diagnostic, DriveStmt, Fix, MotionStmt, RunResult, TextEdit, TurnStmt } from '../types';
import { MOTION_DEFAULTS } from '../solve/runs';
import { shortWay, YawReadings } from '../solve/readings';
import { motionStatements, readingItems, replay, replayKeepsPath, retargetEdits, stretchAround, type ReadingItem, type ReplayChanges } from './replay';
import { insertLinesBefore, lineEndOf, writeNumber } from './text';

interface Located {
  run: RunResult;
  index: number;
  item?: ReadingItem;
}

/** Adds the path-keeping fixes to the wrap, heading and long-way diagnostics of a check result. */
export function attachFixes(result: CheckResult, text: string): void {
  const wanted = result.diagnostics.filter((d) => d.code === 'wrap-cross' || d.code === 'wrap-edge' || d.code === 'heading-jump' || d.code === 'long-way');
  if (wanted.length === 0) return;
  const ctx = new FixContext(result, text);
  for (const d of wanted) {
    const fixes = ctx.fixesFor(d);
    if (fixes.length) d.fixes = [...(d.fixes ?? []), ...fixes];
  }
}

class FixContext {
  private readonly where = new Map<number, Located>();
  private readonly itemsByRun = new Map<RunResult, ReadingItem[]>();
  private readonly lines: string[];
  private readonly eol: string;
  private readonly yaw: YawReadings;
  /** Lines with a crossing of their own (not one that follows from another). */
  private readonly reported: Set<number>;
  readonly stmtAt: (line: number) => MotionStmt | undefined;

  constructor(private readonly result: CheckResult, text: string) {
    this.stmtAt = motionStatements(result);
    for (const run of result.runs) run.segments.forEach((seg, index) => { if (!this.where.has(seg.line)) this.where.set(seg.line, { run, index }); });
    this.lines = text.split(/\r\n|\r|\n/);
    this.eol = lineEndOf(text);
    this.yaw = new YawReadings(result.setup.yawRange.lo, result.setup.yawRange.hi);
    this.reported = new Set(result.diagnostics.filter((d) => d.code === 'wrap-cross').map((d) => d.range.start.line));
  }

  private items(run: RunResult): ReadingItem[] {
    let items = this.itemsByRun.get(run);
    if (!items) this.itemsByRun.set(run, (items = readingItems(run, this.stmtAt)));
    return items;
  }

  private locate(d: Diagnostic): Located | undefined {
    const at = this.where.get(d.range.start.line);
    if (!at) return undefined;
    return { ...at, item: this.items(at.run).find((it) => it.index === at.index) };
  }

  fixesFor(d: Diagnostic): Fix[] {
    const at = this.locate(d);
    if (!at?.item) return [];
    switch (d.code) {
      case 'wrap-cross': return this.wrapFixes(at as Required<Located>, 'cross');
      case 'wrap-edge': return this.wrapFixes(at as Required<Located>, 'edge');
      case 'heading-jump': return this.headingJumpFixes(at as Required<Located>);
      case 'long-way': return this.longWayFixes(at as Required<Located>);
      default: return [];
    }
  }

  /**
   * Rewrites of later absolute targets (and of this one) for a change at
   * segment i; undefined when the change would make a target cross the wrap
   * point that does not cross now (such a fix is not offered).
   */
  private rewrites(at: Located, changes: ReplayChanges, skip?: number): TextEdit[] | undefined {
    const { lo, hi } = this.result.setup.yawRange;
    const [from, to] = stretchAround(at.run, at.index, this.stmtAt);
    const replayed = replay(at.run, this.items(at.run), this.stmtAt, lo, hi, changes, from, to);
    if (!replayKeepsPath(replayed, at.run, this.reported, at.index)) return undefined;
    return retargetEdits(replayed, at.index, skip);
  }

  private indent(stmt: MotionStmt): string {
    return this.lines[stmt.line]?.slice(0, stmt.range.start.character) ?? '';
  }

  private laterNote(edits: TextEdit[], own: number): string {
    const later = edits.length - own;
    return later > 0 ? `; ${later} later target${later === 1 ? '' : 's'} rewritten so the path stays` : '';
  }

  private wrapFixes(at: Required<Located>, problem: 'cross' | 'edge'): Fix[] {
    const { item, run, index } = at;
    const stmt = item.stmt;
    const fixes: Fix[] = [];
    const afterZero = this.yaw.zeroReading + item.change;
    const zeroHelps = this.yaw.inRange(afterZero) && (problem === 'cross' || !this.nearEdge(afterZero));
    const seg = run.segments[index];
    const zeroHere: ReplayChanges = { zeroBefore: new Map([[index, seg.start.heading]]) };
    const rewrittenForZero = zeroHelps ? this.rewrites(at, zeroHere) : undefined;
    if (zeroHelps && rewrittenForZero) {
      const rewritten = rewrittenForZero;
      const insert = insertLinesBefore(stmt.line, [`${this.indent(stmt)}reset yaw`], this.eol);
      if (stmt.kind === 'turn' && stmt.angle && !stmt.reset) {
        fixes.push({
          title: `Add reset to this turn, zeroing the yaw just before it${this.laterNote(rewritten, 0)}`,
          edits: [{ range: { start: stmt.range.end, end: stmt.range.end }, newText: ' reset' }, ...rewritten],
          preferred: true,
        });
        fixes.push({ title: `Insert "reset yaw" before this line${this.laterNote(rewritten, 0)}`, edits: [insert, ...rewritten] });
      } else if (stmt.kind === 'turn' || stmt.kind === 'drive') {
        const own = rewritten.some((e) => e.range.start.line === stmt.line) ? 1 : 0;
        const what = stmt.kind === 'turn' ? `turn to ${writeNumber(afterZero)}` : `hold ${writeNumber(afterZero)}`;
        fixes.push({ title: `Insert "reset yaw" before this line and ${what}${this.laterNote(rewritten, own)}`, edits: [insert, ...rewritten], preferred: true });
      }
      return fixes;
    }
    if (problem === 'edge' || stmt.kind !== 'turn') return fixes;
    // No zero brings this turn into range (it is too big, or of the wrong sign,
    // by itself), or a zero here would make a later target cross: turn by encoders.
    const encoders = this.toEncoders(stmt, item.change);
    const rewritten = this.rewrites(at, { encoders: new Set([index]) }, index);
    if (rewritten) {
      fixes.push({
        title: `Turn by encoders instead: the yaw sensor is not used, so the wrap point no longer matters${this.laterNote(rewritten, 0)}`,
        edits: [...encoders, ...rewritten],
        preferred: true,
      });
    }
    const split = this.split(at);
    if (split) fixes.push(split);
    return fixes;
  }

  private nearEdge(target: number): boolean {
    return this.yaw.nearWrapPoint(target, MOTION_DEFAULTS.wrapEdge);
  }

  /** Edits that make a turn an encoder turn of `change` degrees. */
  private toEncoders(stmt: TurnStmt, change: number): TextEdit[] {
    const edits: TextEdit[] = [];
    if (stmt.to) edits.push({ range: { start: stmt.keywordRange.start, end: stmt.to.range.end }, newText: `turn ${writeNumber(change)}` });
    const by = stmt.optionRanges.by;
    if (by) edits.push({ range: by, newText: 'by encoders' });
    return edits;
  }

  /** A turn split into equal gyro turns, each zeroing the yaw first, when that fits the range. */
  private split(at: Required<Located>): Fix | undefined {
    const { item, run, index } = at;
    const stmt = item.stmt as TurnStmt;
    const z = this.yaw.zeroReading;
    let n = 2;
    while (n <= 4 && !(this.yaw.inRange(z + item.change / n) && !this.nearEdge(z + item.change / n))) n++;
    if (n > 4) return undefined;
    const piece = item.change / n;
    const line = this.lines[stmt.line];
    const start = stmt.range.start.character;
    const body = line.slice(start, stmt.range.end.character);
    // The statement with its angle replaced, `by gyro` and `reset` ensured.
    const cut = (stmt.to ? stmt.to.range.end.character : stmt.angle!.range.end.character) - start;
    let rest = body.slice(cut);
    if (!stmt.optionRanges.by) rest += ' by gyro';
    if (!stmt.reset) rest += ' reset';
    const pieceText = `turn ${writeNumber(piece)}${rest}`;
    const seg = run.segments[index];
    const changes: ReplayChanges = { zeroBefore: new Map([[index, seg.end.heading - piece]]), encoders: new Set([index]) };
    const rewritten = this.rewrites(at, changes, index);
    if (!rewritten) return undefined;
    return {
      title: `Split into ${n} gyro turns of ${writeNumber(piece)}°, each zeroing the yaw first${this.laterNote(rewritten, 0)}`,
      // One edit: the statement becomes n lines (an insert at the same place would be ambiguous).
      edits: [{ range: stmt.range, newText: Array.from({ length: n }, () => pieceText).join(`${this.eol}${this.indent(stmt)}`) }, ...rewritten],
    };
  }

  private headingJumpFixes(at: Required<Located>): Fix[] {
    const stmt = at.item.stmt as DriveStmt;
    if (!stmt.hold) return [];
    const fixes: Fix[] = [{
      title: 'Add step: the change of heading is meant',
      edits: [{ range: { start: stmt.hold.range.end, end: stmt.hold.range.end }, newText: ' step' }],
      preferred: true,
    }];
    const hold = at.item.target;
    // Turning onto a target outside the range (or at its edge) first would itself cross the wrap point.
    if (this.yaw.inRange(hold) && !this.nearEdge(hold) && Math.abs(at.item.change) <= 180) {
      fixes.push({
        title: `Turn onto ${writeNumber(hold)}° first: insert "turn to ${writeNumber(hold)}" before the drive (the robot then turns in place and drives straight instead of swerving)`,
        edits: [insertLinesBefore(stmt.line, [`${this.indent(stmt)}turn to ${writeNumber(hold)}`], this.eol)],
        changesPath: true,
      });
    }
    return fixes;
  }

  private longWayFixes(at: Required<Located>): Fix[] {
    const stmt = at.item.stmt as TurnStmt;
    const long = at.item.change;
    const short = shortWay(long);
    return [{
      title: `Turn the short way by encoders instead (changes the path: ${writeNumber(short)}° instead of ${writeNumber(long)}°)`,
      edits: this.toEncoders(stmt, short),
      changesPath: true,
    }];
  }
}
