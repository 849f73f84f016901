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
  /** Orders within a group (the language's own order); the label when absent. */
  sortIndex?: number;
}

/** Keywords written as two words; the first word alone does not name a statement. */
const TWO_WORD_KEYWORDS: Record<string, string> = { yaw: 'range', reset: 'yaw' };

/**
 * The kinds of unit that fit a value, by what the value follows: the
 * statement's keyword (its first value) or an option's name. Units are offered
 * only while one is being typed after a number, and only units that fit.
 */
const VALUE_UNITS: Record<string, readonly string[]> = {
  wheel: ['length'], track: ['length'], effective: ['length'], body: ['length'], by: ['length'], axle: ['length'],
  field: ['length'], grid: ['length'], radius: ['length'], drive: ['length'], arc: ['length'], within: ['length'],
  turn: ['angle'], to: ['angle', 'length'], hold: ['angle'], stop: ['angle'], heading: ['angle'], range: ['angle'],
  wait: ['time'], limit: ['time'], lag: ['time'], sample: ['time'], delay: ['time'],
  speed: ['fraction', 'speed'], min: ['fraction'], ratio: ['fraction'], stall: ['fraction'], level: ['fraction'], across: ['length'],
  // Plain numbers: no unit fits (and the statement's own unit must not be offered).
  mismatch: [], scale: [],
  gyro: ['angle'], drift: ['angular speed'],
  ramp: ['acceleration'], motor: ['angular speed'],
  let: ['length', 'angle', 'time', 'fraction', 'speed', 'angular speed', 'acceleration'],
};

/** Setup first while a plan has none yet, in the order a plan is written; motions first inside a run. */
const SETUP_ORDER = ['plan', 'units', 'wheel', 'track', 'body', 'gear', 'motor', 'gyro', 'field', 'box', 'circle', 'zone', 'limit', 'let', 'turns', 'yaw range', 'noise'];
const MOTION_ORDER = ['drive', 'turn', 'mark', 'wait', 'square', 'reset yaw', 'start'];

export function completionsAt(text: string, pos: Pos, result?: CheckResult): CompletionInfo[] {
  const lineText = splitLines(text)[pos.line] ?? '';
  const before = lineText.slice(0, pos.character);
  const code = codeOfLine(before);
  if (code.length < before.length) return []; // in a comment
  if (insideString(before)) return zoneNamesInString(code, text, result);

  const partial = /[A-Za-z_%/^]*$/.exec(code)?.[0] ?? '';
  const head = code.slice(0, code.length - partial.length);
  const words = head.trim().split(/\s+/).filter(Boolean);
  const items = candidates(text, pos, result, words, head, partial);
  // A word already complete on the line: offering it again would only make
  // Enter accept it instead of starting a new line.
  if (partial && items.some((i) => (i.insertText ?? i.label) === partial)) return [];
  return items;
}

function candidates(text: string, pos: Pos, result: CheckResult | undefined, words: string[], head: string, partial: string): CompletionInfo[] {
  if (words.length === 0) return statementKeywords(text, pos);

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
    return statement.firstWords.map((w, i) => ({ label: w, kind: 'word', sortGroup: 0, sortIndex: i }));
  }
  const closedSet = statement.optionWords?.[previous];
  if (closedSet) return closedSet.map((w, i) => ({ label: w, kind: 'word', sortGroup: 0, sortIndex: i }));
  if (statement.keyword === 'mark' && previous === 'in') return zoneNames(text, result, true);

  const items: CompletionInfo[] = [];
  // A unit only while one is being typed right after a number, and only units that fit.
  const afterNumber = /[0-9.)]$/.test(previous) && /\s$/.test(head);
  if (afterNumber && partial) {
    const slot = words.length >= 2 ? words[words.length - 2].replace(/^.*[(,]/, '') : '';
    const insidePoint = /\([^)]*$/.test(head);
    const fits = insidePoint ? ['length'] : VALUE_UNITS[slot] ?? VALUE_UNITS[statement.keyword.split(' ').pop()!] ?? [];
    items.push(...unitItems(fits));
  }
  if (statement.keyword === 'turn' && argumentWords.length === 0) {
    items.push({ label: 'to', kind: 'keyword', detail: 'turn until the yaw reading is this value', sortGroup: 1 });
  }
  if ((argumentWords.length > 0 || statement.optionsOnly) && afterValue(previous)) items.push(...optionItems(statement, argumentWords));
  if (!afterNumber || !partial) items.push(...letNames(pos, result));
  return items;
}

/** Whether the last word ends a value (a number, a unit, a name, a closing parenthesis or a flag), so an option may follow. */
function afterValue(previous: string): boolean {
  return !/[-+*/^(,]$/.test(previous);
}

function insideString(before: string): boolean {
  let inString = false;
  for (let i = 0; i < before.length; i++) {
    if (inString && before[i] === '\\') i++;
    else if (before[i] === '"') inString = !inString;
  }
  return inString;
}

function statementKeywords(text: string, pos: Pos): CompletionInfo[] {
  // Before the first `run` or `start` (or in a file without a `wheel` yet), setup comes first.
  const above = splitLines(text).slice(0, pos.line).map((l) => codeOfLine(l).trim().split(/\s+/)[0]);
  const inRun = above.some((w) => w === 'run' || w === 'start') && above.includes('wheel');
  return STATEMENTS.map((s) => {
    const setupIndex = SETUP_ORDER.indexOf(s.keyword);
    const motionIndex = MOTION_ORDER.indexOf(s.keyword);
    const isSetup = s.group === 'setup';
    const group = s.keyword === 'run' ? 1 : (isSetup !== inRun ? 0 : 2);
    return { label: s.keyword, kind: 'keyword', detail: s.summary, sortGroup: group, sortIndex: isSetup ? setupIndex : motionIndex };
  });
}

function optionItems(statement: StatementWords, argumentWords: string[]): CompletionInfo[] {
  const used = new Set(argumentWords);
  return statement.options
    .filter((option) => !used.has(option))
    .filter((option) => !EXCLUSIVE_OPTIONS.some((group) => group.includes(option) && group.some((o) => used.has(o))))
    .filter((option) => !OPTION_REQUIRES[option] || OPTION_REQUIRES[option].some((o) => used.has(o)))
    .map((option) => ({ label: option, kind: 'option', detail: `${statement.keyword} option`, sortGroup: 1, sortIndex: statement.options.indexOf(option) }));
}

function unitItems(dimensions: readonly string[]): CompletionInfo[] {
  return UNITS.filter((u) => dimensions.includes(u.dimension))
    .map((u, i) => ({ label: u.name, kind: 'unit', detail: u.dimension, sortGroup: 0, sortIndex: i }));
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
