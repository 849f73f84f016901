// The calibration record: a small text file next to the plan (`NAME.calib`)
// with what the real robot did in the calibration runs, one line per test:
//
//   units mm                                   (optional: the unit of bare lengths, as in a plan)
//   drive 1000 mm measured 985, 987, 984       (commanded distance, then each trial's measured distance)
//   spin 10 turns measured 3588, 3591          (commanded angle, then the angle really turned)
//   gyro 10 turns reads 3612, 3609             (true angle turned, then the gyro's total reading)
//   lap clockwise 800 mm ahead -20 left 4      (one square lap: side, then where it stopped)
//
// Bare lengths are in the record's `units` (millimetres unless set), bare
// angles in degrees. The reader returns the entries in canonical units (mm,
// degrees) and a problem, with its range, for every line it cannot use.
import type { LengthUnitName, Pos, Range } from '../types';
import { suggestWord } from '../syntax/keywords';
import { showText } from '../text';

export interface Trial {
  /** Canonical value: mm or degrees. */
  value: number;
  range: Range;
}

export type LapDirection = 'clockwise' | 'counterclockwise';

export type RecordEntry =
  | { kind: 'drive'; line: number; range: Range; commanded: number; commandedRange: Range; trials: Trial[] }
  | { kind: 'spin'; line: number; range: Range; commanded: number; commandedRange: Range; trials: Trial[] }
  | { kind: 'gyro'; line: number; range: Range; turned: number; commandedRange: Range; trials: Trial[] }
  | { kind: 'lap'; line: number; range: Range; direction: LapDirection; side: number; sideRange: Range; ahead: Trial; left?: Trial };

export interface RecordProblem {
  range: Range;
  severity: 'error' | 'warning';
  message: string;
}

export interface CalibrationRecord {
  unit: LengthUnitName;
  entries: RecordEntry[];
  problems: RecordProblem[];
  lineCount: number;
}

/** Records longer than this are refused: a record is a few dozen lines. */
export const MAX_RECORD_CHARS = 200_000;

const KEYWORDS = ['units', 'drive', 'spin', 'gyro', 'lap'] as const;
const LENGTH_UNITS: Record<string, number> = { mm: 1, cm: 10, m: 1000, in: 25.4 };
const ANGLE_UNITS: Record<string, number> = { deg: 1, degree: 1, degrees: 1, '°': 1, rad: 180 / Math.PI, turn: 360, turns: 360 };

interface Token {
  text: string;
  kind: 'number' | 'word' | 'comma';
  start: number;
  end: number;
}

const NUMBER = /[-+\u2212]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?/y;
const WORD = /[A-Za-z]+/y;

/** Sticky expressions from the current position: linear in the line's length. */
function tokenize(code: string): Token[] | { bad: number } {
  const tokens: Token[] = [];
  let i = 0;
  while (i < code.length) {
    const ch = code[i];
    if (ch === ' ' || ch === '\t') { i++; continue; }
    if (ch === ',') { tokens.push({ text: ',', kind: 'comma', start: i, end: i + 1 }); i++; continue; }
    if (ch === '°') { tokens.push({ text: '°', kind: 'word', start: i, end: i + 1 }); i++; continue; }
    NUMBER.lastIndex = i;
    const num = NUMBER.exec(code);
    if (num) {
      tokens.push({ text: num[0].replace('\u2212', '-'), kind: 'number', start: i, end: i + num[0].length });
      i += num[0].length;
      continue;
    }
    WORD.lastIndex = i;
    const word = WORD.exec(code);
    if (word) {
      tokens.push({ text: word[0], kind: 'word', start: i, end: i + word[0].length });
      i += word[0].length;
      continue;
    }
    return { bad: i };
  }
  return tokens;
}

type Kind = 'length' | 'angle';

/** Reads a calibration record. Never throws; every line it cannot use gives a problem. */
export function parseRecord(text: string): CalibrationRecord {
  const problems: RecordProblem[] = [];
  const entries: RecordEntry[] = [];
  const lines = String(text).split(/\r\n|\r|\n/);
  if (text.length > MAX_RECORD_CHARS) {
    problems.push({ range: at(0, 0, 0), severity: 'error', message: `this record is too long (${text.length} characters; a record is a few dozen lines, at most ${MAX_RECORD_CHARS})` });
    return { unit: 'mm', entries, problems, lineCount: lines.length };
  }
  let unit: LengthUnitName = 'mm';
  let unitLine: number | undefined;
  lines.forEach((raw, line) => {
    const hash = raw.indexOf('#');
    const code = hash >= 0 ? raw.slice(0, hash) : raw;
    if (code.trim() === '') return;
    const toks = tokenize(code);
    const fail = (start: number, end: number, message: string) => { problems.push({ range: at(line, start, end), severity: 'error', message }); };
    if (!Array.isArray(toks)) {
      fail(toks.bad, toks.bad + 1, `line ${line + 1}: unexpected \`${showText(code[toks.bad], 4)}\`: a record line holds words, numbers with units, and commas between trials`);
      return;
    }
    const lineRange = at(line, toks[0].start, toks[toks.length - 1].end);
    const head = toks[0];
    if (head.kind !== 'word' || !(KEYWORDS as readonly string[]).includes(head.text)) {
      const guess = head.kind === 'word' ? suggestWord(head.text, KEYWORDS) : undefined;
      fail(head.start, head.end, `line ${line + 1}: \`${showText(head.text, 20)}\` is not a record line${guess ? `: did you mean \`${guess}\`?` : ''}; a line starts with \`drive\`, \`spin\`, \`gyro\`, \`lap\` or \`units\` (see the calibration guide)`);
      return;
    }
    const reader = new LineReader(toks, line, fail, () => unit);
    try {
      switch (head.text) {
        case 'units': {
          const w = reader.word('a length unit: mm, cm, m or in');
          if (!(w.text in LENGTH_UNITS)) throw reader.error(w, `\`units\` takes mm, cm, m or in, not \`${showText(w.text, 12)}\``);
          if (unitLine !== undefined) throw reader.error(head, `the units are already set on line ${unitLine + 1}; write \`units\` once`);
          if (entries.length) throw reader.error(head, `write \`units\` above the first measurement, so that every bare length reads the same way`);
          reader.end();
          unit = w.text as LengthUnitName;
          unitLine = line;
          break;
        }
        case 'drive': {
          const cmd = reader.quantity('length', 'the commanded distance, e.g. `drive 1000 mm measured 985, 987, 984`');
          if (!(cmd.value > 0)) throw reader.error(cmd, 'the commanded distance must be above zero (drive forwards)');
          reader.expect('measured', 'after the commanded distance comes `measured` and each trial\'s measured distance, e.g. `drive 1000 mm measured 985, 987, 984`');
          const trials = reader.list('length', 'a measured distance');
          trials.forEach((t) => {
            if (!(t.value > 0)) throw reader.error(t, `a measured distance must be above zero (it is ${showMm(t.value)})`);
            const ratio = t.value / cmd.value;
            if (ratio < 0.5 || ratio > 2) throw reader.error(t, `${showMm(t.value)} for a ${showMm(cmd.value)} drive is ${ratio < 1 ? 'less than half' : 'more than twice'} the distance: check the unit (bare lengths are ${unit}) and the number`);
          });
          entries.push({ kind: 'drive', line, range: lineRange, commanded: cmd.value, commandedRange: cmd.range, trials });
          break;
        }
        case 'spin':
        case 'gyro': {
          const isGyro = head.text === 'gyro';
          const example = isGyro ? '`gyro 10 turns reads 3612, 3609, 3615`' : '`spin 10 turns measured 3588, 3591, 3585`';
          const cmd = reader.quantity('angle', `the ${isGyro ? 'true angle turned' : 'commanded angle'}, e.g. ${example}`);
          if (!(cmd.value >= 360)) throw reader.error(cmd, `turn at least one full turn (it is ${showDeg(cmd.value)}); ten turns make a small error ten times easier to see, e.g. ${example}`);
          reader.expect(isGyro ? 'reads' : 'measured', `after the ${isGyro ? 'angle' : 'commanded angle'} comes \`${isGyro ? 'reads' : 'measured'}\` and each trial's ${isGyro ? 'total reading' : 'measured angle'}, e.g. ${example}`);
          const trials = reader.list('angle', isGyro ? 'a reading' : 'a measured angle');
          trials.forEach((t) => {
            const ratio = t.value / cmd.value;
            if (isGyro && Math.abs(t.value) < cmd.value / 2) {
              throw reader.error(t, `the reading ${showDeg(t.value)} is far from the ${showDeg(cmd.value)} turned: write the total the gyro counted. If the robot's code shows only the reading within its range, add the whole turns: ${showDeg(cmd.value)} + ${showDeg(t.value)} = ${showDeg(cmd.value + t.value)}`);
            }
            if (ratio < 0) throw reader.error(t, `${showDeg(t.value)} has the opposite sign of the ${showDeg(cmd.value)} turned: ${isGyro ? 'the gyro counts the other way than the plan\'s `turns` direction; write its reading as a positive total, and check the plan\'s `turns` line' : 'write the angle the robot really turned, positive, in the direction it was told to turn'}`);
            if (ratio < 0.5 || ratio > 2) throw reader.error(t, `${showDeg(t.value)} for ${showDeg(cmd.value)} is ${ratio < 1 ? 'less than half' : 'more than twice'} the angle: check the number (bare angles are degrees; \`10 turns\` is 3600°)`);
          });
          if (isGyro) entries.push({ kind: 'gyro', line, range: lineRange, turned: cmd.value, commandedRange: cmd.range, trials });
          else entries.push({ kind: 'spin', line, range: lineRange, commanded: cmd.value, commandedRange: cmd.range, trials });
          break;
        }
        case 'lap': {
          const dir = reader.word('`clockwise` or `counterclockwise`, e.g. `lap clockwise 800 mm ahead -20 left 4`');
          if (dir.text !== 'clockwise' && dir.text !== 'counterclockwise') {
            const guess = suggestWord(dir.text, ['clockwise', 'counterclockwise']);
            throw reader.error(dir, `a lap is \`clockwise\` or \`counterclockwise\` (seen from above), not \`${showText(dir.text, 20)}\`${guess ? `: did you mean \`${guess}\`?` : ''}`);
          }
          const side = reader.quantity('length', 'the square\'s side, e.g. `lap clockwise 800 mm ahead -20 left 4`');
          if (!(side.value > 0)) throw reader.error(side, 'the square\'s side must be above zero');
          reader.expect('ahead', 'after the side comes `ahead X`: how far ahead of the start mark the robot stopped (negative: behind it), e.g. `lap clockwise 800 mm ahead -20 left 4`');
          const ahead = reader.quantity('length', 'how far ahead of the start mark the robot stopped (negative: behind it)');
          let left: Trial | undefined;
          if (reader.peekWord('left')) {
            reader.expect('left', '');
            left = reader.quantity('length', 'how far to the left of the start mark the robot stopped (negative: to the right)');
          }
          reader.end();
          for (const t of [ahead, ...(left ? [left] : [])]) {
            if (Math.abs(t.value) > side.value / 4) throw reader.error(t, `${showMm(t.value)} off after a ${showMm(side.value)} lap is more than a quarter of the side: check the unit (bare lengths are ${unit}) and that the lap really went round the square`);
          }
          entries.push({ kind: 'lap', line, range: lineRange, direction: dir.text, side: side.value, sideRange: side.range, ahead, ...(left ? { left } : {}) });
          break;
        }
      }
    } catch (e) {
      if (!(e instanceof RecordLineError)) throw e;
    }
  });
  return { unit, entries, problems, lineCount: lines.length };
}

class RecordLineError extends Error {}

function at(line: number, start: number, end: number): Range {
  return { start: { line, character: start } as Pos, end: { line, character: Math.max(end, start) } as Pos };
}

function showMm(mm: number): string {
  return `${Number(mm.toPrecision(6))} mm`;
}

function showDeg(deg: number): string {
  return `${Number(deg.toPrecision(7))}°`;
}

/** Reads one line's tokens left to right; `error` records a problem and returns the exception that ends the line. */
class LineReader {
  private i = 1;

  constructor(
    private readonly toks: Token[],
    private readonly line: number,
    private readonly fail: (start: number, end: number, message: string) => void,
    private readonly unit: () => LengthUnitName,
  ) {}

  error(where: { start?: number; end?: number; range?: Range }, message: string): RecordLineError {
    const start = where.range ? where.range.start.character : where.start ?? 0;
    const end = where.range ? where.range.end.character : where.end ?? start;
    this.fail(start, end, `line ${this.line + 1}: ${message}`);
    return new RecordLineError(message);
  }

  private endOfLine(): { start: number; end: number } {
    const last = this.toks[this.toks.length - 1];
    return { start: last.end, end: last.end };
  }

  word(what: string): Token {
    const t = this.toks[this.i];
    if (!t) throw this.error(this.endOfLine(), `missing ${what}`);
    if (t.kind !== 'word') throw this.error(t, `expected ${what}, found \`${showText(t.text, 12)}\``);
    this.i++;
    return t;
  }

  peekWord(text: string): boolean {
    const t = this.toks[this.i];
    return t?.kind === 'word' && t.text === text;
  }

  expect(text: string, how: string): void {
    const t = this.toks[this.i];
    if (!t) throw this.error(this.endOfLine(), `missing \`${text}\`: ${how}`);
    if (t.kind !== 'word' || t.text !== text) {
      const guess = t.kind === 'word' ? suggestWord(t.text, [text]) : undefined;
      throw this.error(t, guess ? `did you mean \`${text}\`? ${how}` : `expected \`${text}\`, found \`${showText(t.text, 12)}\`: ${how}`);
    }
    this.i++;
  }

  end(): void {
    const t = this.toks[this.i];
    if (t) throw this.error({ start: t.start, end: this.toks[this.toks.length - 1].end }, `unexpected \`${showText(t.text, 12)}\` at the end of the line`);
  }

  /** A number with an optional unit of the expected kind; a unit of the other kind is an error naming both. */
  quantity(kind: Kind, what: string): Trial {
    const t = this.toks[this.i];
    if (!t) throw this.error(this.endOfLine(), `missing ${what}`);
    if (t.kind !== 'number') throw this.error(t, `expected ${what}, found \`${showText(t.text, 12)}\``);
    this.i++;
    let value = Number(t.text);
    let end = t.end;
    const u = this.toks[this.i];
    if (u?.kind === 'word' && (u.text in LENGTH_UNITS || u.text in ANGLE_UNITS)) {
      const isLength = u.text in LENGTH_UNITS;
      if ((kind === 'length') !== isLength) {
        throw this.error({ start: t.start, end: u.end }, `\`${t.text} ${u.text}\` is ${isLength ? 'a length' : 'an angle'}, but ${what} is ${kind === 'length' ? 'a length (mm, cm, m or in)' : 'an angle (deg, rad or turns)'}`);
      }
      value *= isLength ? LENGTH_UNITS[u.text] : ANGLE_UNITS[u.text];
      end = u.end;
      this.i++;
    } else if (u?.kind === 'word' && !['measured', 'reads', 'ahead', 'left'].includes(u.text)) {
      throw this.error(u, `\`${showText(u.text, 12)}\` is not a unit: ${kind === 'length' ? 'lengths take mm, cm, m or in' : 'angles take deg, rad or turns'}`);
    } else if (kind === 'length') value *= LENGTH_UNITS[this.unit()];
    if (!Number.isFinite(value) || Math.abs(value) > (kind === 'length' ? 1e6 : 36000)) throw this.error({ start: t.start, end }, `\`${showText(t.text, 20)}\` is too large for ${what}`);
    return { value, range: at(this.line, t.start, end) };
  }

  /** Trials separated by commas: at least one, each a quantity. */
  list(kind: Kind, what: string): Trial[] {
    const out: Trial[] = [];
    if (!this.toks[this.i]) throw this.error(this.endOfLine(), `no measurements: write each trial's value after it, separated by commas (at least two trials, so that their spread gives the uncertainty)`);
    for (;;) {
      out.push(this.quantity(kind, what));
      const t = this.toks[this.i];
      if (!t) break;
      if (t.kind !== 'comma') throw this.error(t, `expected a comma between trials, found \`${showText(t.text, 12)}\``);
      this.i++;
      if (!this.toks[this.i]) throw this.error(t, 'a comma at the end of the line: write the next trial after it, or remove it');
    }
    return out;
  }
}
