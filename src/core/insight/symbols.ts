// The plan's outline: each run, with its motion lines and marks as children.
import { formatRunDistance, formatRunTime } from '../format';
import type { CheckResult, Range, Statement } from '../types';
import { formatTime } from './format';
import { splitLines } from './text';

export interface PlanSymbol {
  name: string;
  detail: string;
  kind: 'run' | 'motion' | 'mark';
  /** The whole construct (for a run: its first to its last statement). */
  range: Range;
  /** What to reveal and highlight: the run's name, the line's keyword, the mark's name. */
  selectionRange: Range;
  children: PlanSymbol[];
}

const MOTION_KINDS = new Set<Statement['kind']>(['start', 'drive', 'turn', 'resetYaw', 'square', 'wait']);

export function documentSymbols(result: CheckResult, text: string): PlanSymbol[] {
  const lines = splitLines(text);
  const runs = [...result.runs].sort((a, b) => a.line - b.line);
  return runs.map((run, index) => {
    const nextRunLine = runs[index + 1]?.line ?? Number.POSITIVE_INFINITY;
    const statements = result.ast.statements.filter((s) => s.line >= run.line && s.line < nextRunLine);
    const lastStatement = statements[statements.length - 1];
    const children = statements.flatMap((statement): PlanSymbol[] => {
      const duration = run.segments.filter((s) => s.line === statement.line).reduce((t, s) => t + s.duration, 0);
      if (statement.kind === 'mark') {
        return [{
          name: statement.name.value, detail: 'mark', kind: 'mark',
          range: statement.range, selectionRange: statement.name.range, children: [],
        }];
      }
      if (!MOTION_KINDS.has(statement.kind)) return [];
      const source = lines[statement.line]?.slice(statement.range.start.character, statement.range.end.character).trim();
      return [{
        name: source || statement.kind, detail: formatTime(duration), kind: 'motion',
        range: statement.range, selectionRange: statement.keywordRange, children: [],
      }];
    });
    return {
      name: run.name,
      detail: `${formatRunTime(run.duration)} · ${formatRunDistance(run.distance)}`,
      kind: 'run',
      range: { start: { line: run.line, character: 0 }, end: lastStatement && lastStatement.line >= run.line ? lastStatement.range.end : run.range.end },
      selectionRange: run.range,
      children,
    };
  });
}
