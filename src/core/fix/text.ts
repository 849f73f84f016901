// Text edits on a plan: applying them, and following a line through them.
import type { Pos, TextEdit } from '../types';
import { fmt } from '../units/evaluate';
import { lineStartOffsets } from '../text';

/** Line start offsets (lines end in \n, \r\n or \r, as the parser reads them). */
const lineStarts = lineStartOffsets;

/** Applies non-overlapping edits (positions in the original text); the last first, so offsets stay valid. */
export function applyEdits(text: string, edits: readonly TextEdit[]): string {
  const starts = lineStarts(text);
  const offset = (p: Pos) => Math.min((starts[p.line] ?? text.length) + p.character, text.length);
  const sorted = [...edits].sort((a, b) => offset(b.range.start) - offset(a.range.start) || offset(b.range.end) - offset(a.range.end));
  let out = text;
  for (const e of sorted) out = out.slice(0, offset(e.range.start)) + e.newText + out.slice(offset(e.range.end));
  return out;
}

/**
 * Where the end of a line of the original text is after the edits: every edit
 * that ends on or before that line moves it by the lines it adds or removes
 * (a statement split into several lines ends on the last of them).
 */
export function lineMapper(edits: readonly TextEdit[]): (line: number) => number {
  const shifts = edits.map((e) => ({
    endLine: e.range.end.line,
    delta: (e.newText.match(/\r\n|\r|\n/g)?.length ?? 0) - (e.range.end.line - e.range.start.line),
  }));
  return (line: number) => {
    let moved = line;
    for (const s of shifts) if (s.endLine <= line) moved += s.delta;
    return moved;
  };
}

/** A number written into a plan by a fix: exact enough to keep the path, short when it is round. */
export function writeNumber(v: number): string {
  return fmt(v, 6);
}

/** An edit inserting whole lines before line `line`. */
export function insertLinesBefore(line: number, lines: string[], eol = '\n'): TextEdit {
  return { range: { start: { line, character: 0 }, end: { line, character: 0 } }, newText: lines.map((l) => `${l}${eol}`).join('') };
}

/** The line end a file uses most (new lines are written the same way). */
export function lineEndOf(text: string): string {
  const crlf = text.split('\r\n').length - 1;
  const lf = text.split('\n').length - 1 - crlf;
  const cr = text.split('\r').length - 1 - crlf;
  return crlf > lf && crlf >= cr ? '\r\n' : cr > lf ? '\r' : '\n';
}
