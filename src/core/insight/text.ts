// Small position helpers over plain text, shared by the insight helpers.
import type { Pos, Range } from '../types';

export function splitLines(text: string): string[] {
  return text.split(/\r\n|\r|\n/); // the editor's line breaks, as the parser reads them
}

export function comparePos(a: Pos, b: Pos): number {
  return a.line - b.line || a.character - b.character;
}

/** Inclusive at both ends: a cursor just after a word still counts as on it. */
export function rangeContains(range: Range, pos: Pos): boolean {
  return comparePos(range.start, pos) <= 0 && comparePos(pos, range.end) <= 0;
}

/** Compares by length in characters; ranges here never span lines that matter. */
export function rangeSize(range: Range): number {
  return (range.end.line - range.start.line) * 1e6 + (range.end.character - range.start.character);
}

/**
 * The part of a line that is code: everything before a `#` that is not inside a
 * string. Strings are returned blanked (same length) so words inside them are
 * never taken for keywords or names.
 */
export function codeOfLine(line: string): string {
  let out = '';
  let inString = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (inString) {
      if (ch === '\\' && i + 1 < line.length) {
        out += '  ';
        i++;
        continue;
      }
      if (ch === '"') inString = false;
      out += inString ? ' ' : '"';
      continue;
    }
    if (ch === '#') break;
    if (ch === '"') inString = true;
    out += ch;
  }
  return out;
}

const WORD_CHAR = /[A-Za-z0-9_]/;

/** The identifier (letter or `_` first) under or just before the cursor, with its range. */
export function identifierAt(lineText: string, pos: Pos): { word: string; range: Range } | undefined {
  const code = codeOfLine(lineText);
  if (pos.character > code.length) return undefined;
  let start = pos.character;
  while (start > 0 && WORD_CHAR.test(code[start - 1])) start--;
  let end = pos.character;
  while (end < code.length && WORD_CHAR.test(code[end])) end++;
  const word = code.slice(start, end);
  if (!/^[A-Za-z_]/.test(word)) return undefined;
  return { word, range: { start: { line: pos.line, character: start }, end: { line: pos.line, character: end } } };
}
