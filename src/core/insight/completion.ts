// Completion while typing a plan line: statement keywords at the start of a
// line, then only what may follow on that statement (its unused options, the
// closed set of words after `by`/`pivot`/`units`..., units after a number,
// `let` names bound above, zone names after `in`).
import type { CheckResult, LetStmt, Pos, ZoneStmt } from '../types';
import { EXCLUSIVE_OPTIONS, OPTION_REQUIRES, STATEMENTS, UNITS, type StatementWords } from './vocabulary';
import { codeOfLine, splitLines } from './text';

export interface CompletionInfo {
  label: string;
  kind: 'keyword' | 'option' | 'word' | 'unit' | 'name' | 'zone';
  detail?: string;
  /** Text to insert when it differs from the label. */
  insertText?: string;
  /** Orders groups: lower first. */
  sortGroup: number;
}

/** Keywords written as two words; the first word alone does not name a statement. */
const TWO_WORD_KEYWORDS: Record<string, string> = { yaw: 'range', reset: 'yaw' };

export function completionsAt(text: string, pos: Pos, result?: CheckResult): CompletionInfo[] {
  const lineText = splitLines(text)[pos.line] ?? '';
  const before = lineText.slice(0, pos.character);
  const code = codeOfLine(before);
  if (code.length < before.length) return []; // in a comment
  if (insideString(before)) return zoneNamesInString(code, text, result);

  const partial = /[A-Za-z_]*$/.exec(code)?.[0] ?? '';
  const words = code.slice(0, code.length - partial.length).trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return statementKeywords();

  const first = words[0];
  if (TWO_WORD_KEYWORDS[first] && words.length === 1) {
    return [{ label: TWO_WORD_KEYWORDS[first], kind: 'keyword', sortGroup: 0 }];
  }
  const keyword = TWO_WORD_KEYWORDS[first] ? `${first} ${TWO_WORD_KEYWORDS[first]}` : first;
  const statement = STATEMENTS.find((s) => s.keyword === keyword);
  if (!statement) return [];
  const previous = words[words.length - 1];
  const argumentWords = words.slice(keyword.split(' ').length);

  if (argumentWords.length === 0 && statement.firstWords) {
    return statement.firstWords.map((w) => ({ label: w, kind: 'word', sortGroup: 0 }));
  }
  const closedSet = statement.optionWords?.[previous];
  if (closedSet) return closedSet.map((w) => ({ label: w, kind: 'word', sortGroup: 0 }));
  if (statement.keyword === 'mark' && previous === 'in') return zoneNames(text, result, true);

  const items: CompletionInfo[] = [];
  if (/[0-9.)]$/.test(previous)) items.push(...unitItems());
  if (statement.keyword === 'turn' && argumentWords.length === 0) {
    items.push({ label: 'to', kind: 'keyword', detail: 'turn until the yaw reading is this value', sortGroup: 1 });
  }
  if (argumentWords.length > 0) items.push(...optionItems(statement, argumentWords));
  items.push(...letNames(pos, result));
  return items;
}

function insideString(before: string): boolean {
  let inString = false;
  for (let i = 0; i < before.length; i++) {
    if (inString && before[i] === '\\') i++;
    else if (before[i] === '"') inString = !inString;
  }
  return inString;
}

function statementKeywords(): CompletionInfo[] {
  const groupOrder = { motion: 0, run: 1, setup: 2 };
  return STATEMENTS.map((s) => ({ label: s.keyword, kind: 'keyword', detail: s.summary, sortGroup: groupOrder[s.group] }));
}

function optionItems(statement: StatementWords, argumentWords: string[]): CompletionInfo[] {
  const used = new Set(argumentWords);
  return statement.options
    .filter((option) => !used.has(option))
    .filter((option) => !EXCLUSIVE_OPTIONS.some((group) => group.includes(option) && group.some((o) => used.has(o))))
    .filter((option) => !OPTION_REQUIRES[option] || OPTION_REQUIRES[option].some((o) => used.has(o)))
    .map((option) => ({ label: option, kind: 'option', detail: `${statement.keyword} option`, sortGroup: 1 }));
}

function unitItems(): CompletionInfo[] {
  return UNITS.map((u) => ({ label: u.name, kind: 'unit', detail: u.dimension, sortGroup: 0 }));
}

function letNames(pos: Pos, result: CheckResult | undefined): CompletionInfo[] {
  if (!result) return [];
  return result.ast.statements
    .filter((s): s is LetStmt => s.kind === 'let' && s.line < pos.line)
    .map((s) => ({ label: s.name, kind: 'name', detail: result.names[s.name]?.display, sortGroup: 2 }));
}

function zoneNames(text: string, result: CheckResult | undefined, quoted: boolean): CompletionInfo[] {
  const names = result
    ? result.ast.statements.filter((s): s is ZoneStmt => s.kind === 'zone').map((s) => s.name.value)
    : [...text.matchAll(/^\s*zone\s+"((?:[^"\\]|\\.)*)"/gm)].map((m) => m[1].replace(/\\(.)/g, '$1'));
  return [...new Set(names)].map((name) => {
    const escaped = name.replace(/[\\"]/g, '\\$&');
    return { label: quoted ? `"${escaped}"` : escaped, kind: 'zone', detail: 'zone', sortGroup: 0 };
  });
}

function zoneNamesInString(code: string, text: string, result: CheckResult | undefined): CompletionInfo[] {
  // `code` has the open string blanked to its opening quote: look at the word before it.
  const words = code.replace(/"[^"]*$/, '').trim().split(/\s+/);
  if (words[0] !== 'mark' || words[words.length - 1] !== 'in') return [];
  return zoneNames(text, result, false);
}
