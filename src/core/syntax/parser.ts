// Reads plan text into statements, one line at a time. A line that cannot be
// read gives exactly one `syntax` diagnostic and is left out; the others are
// still read, so the editor can keep checking the rest of the file while the
// user types. Expressions stay source text: math.js evaluates them later.
import { isMathName } from '../units/evaluate';
import type {
  BodyStmt, BoxStmt, CircleStmt, Diagnostic, DriveStmt, ExprNode, FieldStmt, Fix, GearStmt, GyroStmt, LengthUnitName,
  LetStmt, LimitStmt, MarkStmt, MotorStmt, NoiseStmt, PlanAst, PlanStmt, PointNode, Range, RelatedInfo,
  ResetYawStmt, RunStmt, SquareStmt, StartStmt, Statement, StringNode, TrackStmt, TurnShapeNode, TurnStmt,
  TurnsStmt, UnitsStmt, WaitStmt, WheelStmt, WordNode, YawRangeStmt, ZoneStmt,
} from '../types';
import { lexLine, type Token } from './lexer';
import { invisibleIn, nextLineBreak, showText } from '../text';
import { OPTIONS, STATEMENT_KEYWORDS, suggestWord } from './keywords';

/** Longest `let` name. */
export const MAX_IDENT_CHARS = 64;
/** Longest title or name in quotes. */
export const MAX_NAME_CHARS = 120;

export function parsePlan(text: string): { ast: PlanAst; diagnostics: Diagnostic[] } {
  const document = String(text);
  const statements: Statement[] = [];
  const diagnostics: Diagnostic[] = [];
  const letNames = new Set<string>();
  let lineIndex = 0;
  let lineStart = 0;
  // Lines are cut one at a time so that a large file is not held twice.
  for (;;) {
    const lineBreak = nextLineBreak(document, lineStart);
    const source = document.slice(lineStart, lineBreak ? lineBreak.end : document.length);
    try {
      const statement = parseLine(lineIndex, source, letNames);
      if (statement) {
        statements.push(statement);
        if (statement.kind === 'let') letNames.add(statement.name);
      }
    } catch (problem) {
      diagnostics.push(toDiagnostic(problem, lineIndex, source));
    }
    if (!lineBreak) break;
    lineStart = lineBreak.next;
    lineIndex++;
  }
  return { ast: { statements, lineCount: lineIndex + 1 }, diagnostics };
}

/** Thrown (without a stack, so bad lines stay cheap) to abandon the current line. */
class LineProblem {
  constructor(
    readonly start: number,
    readonly end: number,
    readonly message: string,
    readonly fixes?: Fix[],
    readonly related?: { start: number; end: number; message: string },
  ) {}
}

function toDiagnostic(problem: unknown, line: number, source: string): Diagnostic {
  if (!(problem instanceof LineProblem)) {
    // A defect in this parser must not stop the rest of the file from being read.
    return {
      range: span(line, 0, source.length),
      severity: 'error',
      code: 'syntax',
      message: 'this line could not be read',
    };
  }
  const diagnostic: Diagnostic = {
    range: span(line, problem.start, problem.end),
    severity: 'error',
    code: 'syntax',
    message: problem.message,
  };
  if (problem.fixes) diagnostic.fixes = problem.fixes;
  if (problem.related) {
    const related: RelatedInfo = {
      range: span(line, problem.related.start, problem.related.end),
      message: problem.related.message,
    };
    diagnostic.related = [related];
  }
  return diagnostic;
}

function span(line: number, start: number, end: number): Range {
  return { start: { line, character: start }, end: { line, character: end } };
}

/** Each must be met by a word or a symbol token ending in one of them. */
const OPERATOR_ENDINGS = new Set(['*', '/', '^', '+', '-', '(', ',', '=', '<', '>', '&', '|', '?', ':', '~']);


type OptionValue =
  | { kind: 'expr' }
  | { kind: 'flag' }
  | { kind: 'point' }
  | { kind: 'string' }
  | { kind: 'word'; words: readonly string[] };

interface OptionSpec {
  value: OptionValue;
  /** Shown when the value is missing or wrong. */
  example: string;
  /** Options of one group exclude each other (the turn shapes). */
  group?: 'shape';
}

type OptionSpecs = Readonly<Record<string, OptionSpec>>;

const stopSets = new WeakMap<OptionSpecs, ReadonlySet<string>>();

const EXPR: OptionValue = { kind: 'expr' };
const FLAG: OptionValue = { kind: 'flag' };

const DRIVE_OPTIONS: OptionSpecs = {
  speed: { value: EXPR, example: 'speed 50%' },
  hold: { value: EXPR, example: 'hold 0' },
  step: { value: FLAG, example: 'hold 90 step' },
  gain: { value: EXPR, example: 'gain 2' },
  ramp: { value: EXPR, example: 'ramp 800 mm/s^2' },
};

const TURN_OPTIONS: OptionSpecs = {
  spin: { value: FLAG, example: 'spin', group: 'shape' },
  pivot: { value: { kind: 'word', words: ['left', 'right'] }, example: 'pivot left', group: 'shape' },
  arc: { value: EXPR, example: 'arc 200 mm', group: 'shape' },
  ratio: { value: EXPR, example: 'ratio 0%', group: 'shape' },
  reverse: { value: FLAG, example: 'arc 200 mm reverse' },
  by: { value: { kind: 'word', words: ['encoders', 'gyro'] }, example: 'by gyro' },
  speed: { value: EXPR, example: 'speed 50%' },
  min: { value: EXPR, example: 'min 10%' },
  gain: { value: EXPR, example: 'gain 1' },
  stop: { value: EXPR, example: 'stop 1 deg' },
  ramp: { value: FLAG, example: 'ramp' },
  reset: { value: FLAG, example: 'reset' },
};

const MARK_OPTIONS: OptionSpecs = {
  at: { value: { kind: 'point' }, example: 'at (1800, 1000)' },
  heading: { value: EXPR, example: 'heading 90' },
  within: { value: EXPR, example: 'within 20 mm' },
  in: { value: { kind: 'string' }, example: 'in "dock"' },
  level: { value: EXPR, example: 'level 90%' },
};

const NOISE_OPTIONS: OptionSpecs = {
  drive: { value: EXPR, example: 'drive 1%' },
  turn: { value: EXPR, example: 'turn 1.5%' },
  gyro: { value: EXPR, example: 'gyro 1 deg' },
  drift: { value: EXPR, example: 'drift 0.5 deg/min' },
  wheel: { value: EXPR, example: 'wheel 0.01 mm' },
  square: { value: EXPR, example: 'square 0.5 deg' },
  across: { value: EXPR, example: 'square 0.5 deg across 1 mm' },
};

const SQUARE_OPTIONS: OptionSpecs = { speed: { value: EXPR, example: 'speed 30%' } };
const TRACK_OPTIONS: OptionSpecs = { effective: { value: EXPR, example: 'effective 130 mm' } };
const MOTOR_OPTIONS: OptionSpecs = {
  lag: { value: EXPR, example: 'lag 80 ms' },
  stall: { value: EXPR, example: 'stall 6%' },
};
const WHEEL_OPTIONS: OptionSpecs = { mismatch: { value: EXPR, example: 'mismatch 1.004' } };
const GYRO_OPTIONS: OptionSpecs = {
  sample: { value: EXPR, example: 'sample 10 ms' },
  delay: { value: EXPR, example: 'delay 5 ms' },
  scale: { value: EXPR, example: 'scale 1.01' },
};
const BODY_OPTIONS: OptionSpecs = { axle: { value: EXPR, example: 'axle -30' } };
const FIELD_OPTIONS: OptionSpecs = { grid: { value: EXPR, example: 'grid 100' } };

const NEEDS = {
  plan: '`plan` needs a title in double quotes, e.g. `plan "Practice run"`',
  units: '`units` takes mm, cm, m or in, e.g. `units mm`',
  turns: '`turns` takes clockwise or counterclockwise, e.g. `turns clockwise`',
  yawRange: '`yaw range` needs two angles, e.g. `yaw range -180 to 180`',
  wheel: '`wheel` needs a diameter, e.g. `wheel 62 mm`',
  track: '`track` needs a width, e.g. `track 128 mm`',
  gear: '`gear` needs a ratio (motor degrees per wheel degree), e.g. `gear 1`',
  motor: '`motor` needs its speed at full power, e.g. `motor 900 deg/s`',
  gyro: '`gyro` needs at least one of `sample`, `delay` or `scale`, e.g. `gyro sample 10 ms delay 5 ms`',
  body: '`body` needs a width and a length, e.g. `body 150 by 190`',
  field: '`field` needs a width and a height, e.g. `field 2000 by 1200`',
  box: '`box` needs a name and two corners, e.g. `box "shelf" (900, 500) to (1100, 800)`',
  circle: '`circle` needs a name, a centre and a radius, e.g. `circle "post" (600, 400) radius 50`',
  zone: '`zone` needs a name and two corners, e.g. `zone "dock" (1700, 900) to (1950, 1150)`',
  limit: '`limit` needs a time, e.g. `limit 150 s`',
  let: '`let` needs a name and a value, e.g. `let lane = 250 mm`',
  run: '`run` needs a name in double quotes, e.g. `run "to the dock"`',
  start: '`start` needs a position and a heading, e.g. `start (200, 200) heading 0`',
  drive: '`drive` needs a distance, e.g. `drive 300 mm`',
  turn: '`turn` needs an angle, e.g. `turn 90` or `turn to 0`',
  resetYaw: '`reset` is written `reset yaw`',
  square: '`square` needs a side, e.g. `square front` or `square back`',
  wait: '`wait` needs a time, e.g. `wait 0.5 s`',
  mark: '`mark` needs a name in double quotes, e.g. `mark "parked" in "dock"`',
} as const;

const NO_STOPS: ReadonlySet<string> = new Set();
const YAW_LOW_STOPS: ReadonlySet<string> = new Set(['to']);
const BODY_WIDTH_STOPS: ReadonlySet<string> = new Set(['by', 'axle']);
const FIELD_WIDTH_STOPS: ReadonlySet<string> = new Set(['by', 'grid']);

function parseLine(line: number, source: string, letNames: ReadonlySet<string>): Statement | undefined {
  const lexed = lexLine(source);
  if (lexed.error) {
    // A misspelt keyword is the more useful report than a string problem later on the line.
    const { start, end, message } = lexed.error;
    if (lexed.tokens.length === 0 || isKnownKeyword(lexed.tokens[0])) throw new LineProblem(start, end, message);
    new LineReader(line, source, lexed.tokens, letNames).checkFirstWord();
    throw new LineProblem(start, end, message);
  }
  if (lexed.tokens.length === 0) return undefined;
  return new LineReader(line, source, lexed.tokens, letNames).statement();
}

const KEYWORD_SET: ReadonlySet<string> = new Set(STATEMENT_KEYWORDS);

function isKnownKeyword(token: Token): boolean {
  return token.kind === 'ident' && KEYWORD_SET.has(token.text);
}

/** Error messages that need building are built only when the line is bad. */
type Message = string | (() => string);

type SharedFields = Pick<Statement, 'line' | 'range' | 'keywordRange' | 'optionRanges'>;
/** A statement before the shared fields are added (distributes over unions such as `BoxStmt | ZoneStmt`). */
type StatementFields<S extends Statement> = S extends Statement ? Omit<S, keyof SharedFields> : never;

/** A parsed option value, by kind. */
interface OptionResult {
  expr?: ExprNode;
  point?: PointNode;
  string?: StringNode;
  word?: WordNode;
}

class LineReader {
  private pos = 0;
  private optionRanges: Record<string, Range> = {};
  /** Option names of the statement being read, for misspelling checks inside expressions. */
  private optionWords: readonly string[] = [];

  constructor(
    private readonly line: number,
    private readonly source: string,
    private readonly tokens: readonly Token[],
    private readonly letNames: ReadonlySet<string>,
  ) {}

  checkFirstWord(): void {
    const first = this.tokens[0];
    if (first.kind !== 'ident') {
      this.fail(first, 'a line starts with a keyword, e.g. `drive 300 mm` or `turn 90`');
    }
    if (!KEYWORD_SET.has(first.text)) this.unknownWord(first, STATEMENT_KEYWORDS, () =>
      `unknown word \`${abbreviate(first.text)}\`: a line starts with a keyword such as \`drive\`, \`turn\`, \`start\` or \`let\``);
  }

  statement(): Statement {
    this.checkFirstWord();
    const keyword = this.next();
    switch (keyword.text) {
      case 'plan': return this.plan(keyword);
      case 'units': return this.units(keyword);
      case 'turns': return this.turns(keyword);
      case 'yaw': return this.yawRange(keyword);
      case 'wheel': return this.wheel(keyword);
      case 'gear': return this.gear(keyword);
      case 'limit': return this.limit(keyword);
      case 'wait': return this.wait(keyword);
      case 'track': return this.track(keyword);
      case 'motor': return this.motor(keyword);
      case 'body': return this.body(keyword);
      case 'field': return this.field(keyword);
      case 'box': return this.twoCorners(keyword, 'box');
      case 'zone': return this.twoCorners(keyword, 'zone');
      case 'circle': return this.circle(keyword);
      case 'noise': return this.noise(keyword);
      case 'gyro': return this.gyro(keyword);
      case 'let': return this.let(keyword);
      case 'run': return this.run(keyword);
      case 'start': return this.start(keyword);
      case 'drive': return this.drive(keyword);
      case 'turn': return this.turn(keyword);
      case 'reset': return this.resetYaw(keyword);
      case 'square': return this.square(keyword);
      case 'mark': return this.mark(keyword);
      default: return this.fail(keyword, 'this line could not be read');
    }
  }

  // -------------------------------------------------------------------------
  // Statements

  private plan(keyword: Token): PlanStmt {
    const title = this.string(NEEDS.plan);
    return this.finish<PlanStmt>(keyword, keyword, { kind: 'plan', title });
  }

  private run(keyword: Token): RunStmt {
    const name = this.string(NEEDS.run);
    return this.finish<RunStmt>(keyword, keyword, { kind: 'run', name });
  }

  private units(keyword: Token): UnitsStmt {
    const unit = this.word(['mm', 'cm', 'm', 'in'], NEEDS.units) as WordNode<LengthUnitName>;
    return this.finish<UnitsStmt>(keyword, keyword, { kind: 'units', unit });
  }

  private turns(keyword: Token): TurnsStmt {
    const direction = this.word(['clockwise', 'counterclockwise'], NEEDS.turns) as WordNode<'clockwise' | 'counterclockwise'>;
    return this.finish<TurnsStmt>(keyword, keyword, { kind: 'turns', direction });
  }

  private yawRange(keyword: Token): YawRangeStmt {
    const second = this.secondWord('range', '`yaw` is written `yaw range LO to HI`, e.g. `yaw range -180 to 180`');
    this.optionWords = OPTIONS.yawRange;
    const lo = this.expr(NEEDS.yawRange, YAW_LOW_STOPS);
    this.separator('to', NEEDS.yawRange);
    const hi = this.expr(NEEDS.yawRange, NO_STOPS);
    return this.finish<YawRangeStmt>(keyword, second, { kind: 'yawRange', lo, hi });
  }

  private wheel(keyword: Token): WheelStmt {
    this.optionWords = OPTIONS.wheel;
    const diameter = this.expr(NEEDS.wheel, stopsOf(WHEEL_OPTIONS));
    const options = this.options(WHEEL_OPTIONS);
    const fields: StatementFields<WheelStmt> = { kind: 'wheel', diameter };
    copyExprs(fields, options, ['mismatch']);
    return this.finish<WheelStmt>(keyword, keyword, fields);
  }

  private gear(keyword: Token): GearStmt {
    const ratio = this.expr(NEEDS.gear, NO_STOPS);
    return this.finish<GearStmt>(keyword, keyword, { kind: 'gear', ratio });
  }

  private limit(keyword: Token): LimitStmt {
    const time = this.expr(NEEDS.limit, NO_STOPS);
    return this.finish<LimitStmt>(keyword, keyword, { kind: 'limit', time });
  }

  private wait(keyword: Token): WaitStmt {
    const time = this.expr(NEEDS.wait, NO_STOPS);
    return this.finish<WaitStmt>(keyword, keyword, { kind: 'wait', time });
  }

  private track(keyword: Token): TrackStmt {
    this.optionWords = OPTIONS.track;
    const width = this.expr(NEEDS.track, stopsOf(TRACK_OPTIONS));
    const options = this.options(TRACK_OPTIONS);
    const fields: StatementFields<TrackStmt> = { kind: 'track', width };
    copyExprs(fields, options, ['effective']);
    return this.finish<TrackStmt>(keyword, keyword, fields);
  }

  private motor(keyword: Token): MotorStmt {
    this.optionWords = OPTIONS.motor;
    const speed = this.expr(NEEDS.motor, stopsOf(MOTOR_OPTIONS));
    const options = this.options(MOTOR_OPTIONS);
    const fields: StatementFields<MotorStmt> = { kind: 'motor', speed };
    copyExprs(fields, options, ['lag', 'stall']);
    return this.finish<MotorStmt>(keyword, keyword, fields);
  }

  private body(keyword: Token): BodyStmt {
    this.optionWords = OPTIONS.body;
    const width = this.expr(NEEDS.body, BODY_WIDTH_STOPS);
    this.separator('by', NEEDS.body);
    const length = this.expr(NEEDS.body, stopsOf(BODY_OPTIONS));
    const options = this.options(BODY_OPTIONS);
    const fields: StatementFields<BodyStmt> = { kind: 'body', width, length };
    copyExprs(fields, options, ['axle']);
    return this.finish<BodyStmt>(keyword, keyword, fields);
  }

  private field(keyword: Token): FieldStmt {
    this.optionWords = OPTIONS.field;
    const width = this.expr(NEEDS.field, FIELD_WIDTH_STOPS);
    this.separator('by', NEEDS.field);
    const height = this.expr(NEEDS.field, stopsOf(FIELD_OPTIONS));
    const options = this.options(FIELD_OPTIONS);
    const fields: StatementFields<FieldStmt> = { kind: 'field', width, height };
    copyExprs(fields, options, ['grid']);
    return this.finish<FieldStmt>(keyword, keyword, fields);
  }

  private twoCorners(keyword: Token, kind: 'box' | 'zone'): BoxStmt | ZoneStmt {
    const name = this.string(NEEDS[kind]);
    const a = this.point(NEEDS[kind]);
    this.separator('to', NEEDS[kind]);
    const b = this.point(NEEDS[kind]);
    return this.finish<BoxStmt | ZoneStmt>(keyword, keyword, { kind, name, a, b });
  }

  private circle(keyword: Token): CircleStmt {
    const name = this.string(NEEDS.circle);
    const center = this.point(NEEDS.circle);
    this.separator('radius', NEEDS.circle);
    const radius = this.expr(NEEDS.circle, NO_STOPS);
    return this.finish<CircleStmt>(keyword, keyword, { kind: 'circle', name, center, radius });
  }

  private noise(keyword: Token): NoiseStmt {
    this.optionWords = OPTIONS.noise;
    const options = this.options(NOISE_OPTIONS);
    const fields: StatementFields<NoiseStmt> = { kind: 'noise' };
    copyExprs(fields, options, ['drive', 'turn', 'gyro', 'drift', 'wheel', 'square', 'across']);
    return this.finish<NoiseStmt>(keyword, keyword, fields);
  }

  private gyro(keyword: Token): GyroStmt {
    this.optionWords = OPTIONS.gyro;
    // Only options follow the keyword, and at least one: a bare value (`gyro 10 ms`) says what is needed.
    const first = this.peek();
    if (!first) return this.fail(keyword, NEEDS.gyro);
    if (first.kind !== 'ident') return this.fail(first, NEEDS.gyro);
    const options = this.options(GYRO_OPTIONS);
    const fields: StatementFields<GyroStmt> = { kind: 'gyro' };
    copyExprs(fields, options, ['sample', 'delay', 'scale']);
    return this.finish<GyroStmt>(keyword, keyword, fields);
  }

  private let(keyword: Token): LetStmt {
    const name = this.peek();
    if (!name || name.kind !== 'ident') return this.fail(name ?? keyword, NEEDS.let);
    if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name.text)) {
      this.fail(name, `\`${abbreviate(name.text)}\` cannot be a name: a name is made of the letters a to z and A to Z, the digits 0 to 9 and \`_\`, and does not start with a digit (e.g. \`lane_2\`)`);
    }
    if (name.text.length > MAX_IDENT_CHARS) this.fail(name, `a name may have at most ${MAX_IDENT_CHARS} characters (this one has ${name.text.length}): shorten it`);
    this.pos++;
    const equals = this.peek();
    if (!equals || equals.text !== '=') {
      return this.fail(equals ?? name, `expected \`=\` after \`${name.text}\`, e.g. \`let ${name.text} = 250 mm\``);
    }
    this.pos++;
    const value = this.expr(NEEDS.let, NO_STOPS);
    return this.finish<LetStmt>(keyword, keyword, {
      kind: 'let',
      name: name.text,
      nameRange: this.range(name.start, name.end),
      value,
    });
  }

  private start(keyword: Token): StartStmt {
    this.optionWords = OPTIONS.start;
    const at = this.point(NEEDS.start);
    const headingWord = this.peek();
    if (!headingWord || headingWord.kind !== 'ident' || headingWord.text !== 'heading') {
      if (headingWord?.kind === 'ident') this.unknownWord(headingWord, ['heading'], NEEDS.start);
      return this.fail(headingWord ?? keyword, NEEDS.start);
    }
    this.pos++;
    const heading = this.expr(NEEDS.start, NO_STOPS, headingWord);
    this.optionRanges.heading = this.range(headingWord.start, heading.range.end.character);
    return this.finish<StartStmt>(keyword, keyword, { kind: 'start', at, heading });
  }

  private drive(keyword: Token): DriveStmt {
    this.optionWords = OPTIONS.drive;
    const distance = this.expr(NEEDS.drive, stopsOf(DRIVE_OPTIONS));
    const options = this.options(DRIVE_OPTIONS);
    if (options.has('step') && !options.has('hold')) {
      this.failRange(this.optionRanges.step, '`step` belongs to `hold`: write the heading to turn onto, e.g. `hold 90 step`');
    }
    const fields: StatementFields<DriveStmt> = { kind: 'drive', distance, step: options.has('step') };
    copyExprs(fields, options, ['speed', 'hold', 'gain', 'ramp']);
    return this.finish<DriveStmt>(keyword, keyword, fields);
  }

  private turn(keyword: Token): TurnStmt {
    this.optionWords = OPTIONS.turn;
    const toWord = this.peek();
    const isTurnTo = toWord?.kind === 'ident' && toWord.text === 'to';
    if (isTurnTo) this.pos++;
    const value = this.expr(NEEDS.turn, stopsOf(TURN_OPTIONS));
    const options = this.options(TURN_OPTIONS);
    const arc = options.get('arc')?.expr;
    const ratio = options.get('ratio')?.expr;
    const pivot = options.get('pivot')?.word;
    if (options.has('reverse') && !arc && !ratio) {
      this.failRange(this.optionRanges.reverse, '`reverse` drives an arc backwards, so it needs `arc` or `ratio`, e.g. `turn 90 arc 200 mm reverse`');
    }
    let shape: TurnShapeNode = { kind: 'spin' };
    if (pivot) shape = { kind: 'pivot', side: pivot.value as 'left' | 'right' };
    else if (arc) shape = { kind: 'arc', radius: arc };
    else if (ratio) shape = { kind: 'ratio', ratio };
    const fields: StatementFields<TurnStmt> = {
      kind: 'turn',
      shape,
      reverse: options.has('reverse'),
      sensing: options.get('by')?.word?.value === 'gyro' ? 'gyro' : 'encoders',
      ramp: options.has('ramp'),
      reset: options.has('reset'),
    };
    if (isTurnTo) fields.to = value;
    else fields.angle = value;
    copyExprs(fields, options, ['speed', 'min', 'gain', 'stop']);
    return this.finish<TurnStmt>(keyword, isTurnTo ? toWord : keyword, fields);
  }

  private resetYaw(keyword: Token): ResetYawStmt {
    const second = this.secondWord('yaw', NEEDS.resetYaw);
    return this.finish<ResetYawStmt>(keyword, second, { kind: 'resetYaw' });
  }

  private square(keyword: Token): SquareStmt {
    this.optionWords = OPTIONS.square;
    const side = this.word(['front', 'back'], NEEDS.square);
    const options = this.options(SQUARE_OPTIONS);
    const fields: StatementFields<SquareStmt> = { kind: 'square', side: side.value as 'front' | 'back' };
    copyExprs(fields, options, ['speed']);
    return this.finish<SquareStmt>(keyword, keyword, fields);
  }

  private mark(keyword: Token): MarkStmt {
    this.optionWords = OPTIONS.mark;
    const name = this.string(NEEDS.mark);
    const options = this.options(MARK_OPTIONS);
    const fields: StatementFields<MarkStmt> = { kind: 'mark', name };
    const at = options.get('at')?.point;
    const zone = options.get('in')?.string;
    if (at) fields.at = at;
    copyExprs(fields, options, ['heading', 'within', 'level']);
    if (zone) fields.inZone = zone;
    return this.finish<MarkStmt>(keyword, keyword, fields);
  }

  // -------------------------------------------------------------------------
  // Pieces

  /** Adds the fields every statement shares; rejects anything left on the line. */
  private finish<S extends Statement>(keyword: Token, keywordEnd: Token, fields: StatementFields<S>): S {
    const last = this.tokens[this.tokens.length - 1];
    const stray = this.peek();
    if (stray) {
      throw new LineProblem(stray.start, last.end,
        `unexpected \`${abbreviate(this.source.slice(stray.start, last.end))}\` after the end of the statement`);
    }
    const statement = fields as StatementFields<S> & SharedFields;
    statement.line = this.line;
    statement.range = this.range(keyword.start, last.end);
    statement.keywordRange = this.range(keyword.start, keywordEnd.end);
    statement.optionRanges = this.optionRanges;
    return statement as unknown as S;
  }

  private secondWord(expected: string, message: Message): Token {
    const token = this.peek();
    if (!token || token.kind !== 'ident' || token.text !== expected) {
      if (token?.kind === 'ident') this.unknownWord(token, [expected], message);
      return this.fail(token ?? this.tokens[this.pos - 1], message);
    }
    this.pos++;
    return token;
  }

  private separator(expected: string, message: Message): void {
    const token = this.peek();
    if (!token || token.kind !== 'ident' || token.text !== expected) {
      if (token?.kind === 'ident') this.unknownWord(token, [expected], message);
      this.fail(token ?? this.tokens[this.pos - 1], message);
    }
    this.pos++;
    this.optionRanges[expected] = this.range(token.start, token.end);
  }

  private string(message: Message): StringNode {
    const token = this.peek();
    if (!token || token.kind !== 'string') return this.fail(token ?? this.tokens[this.pos - 1], message);
    this.pos++;
    const value = token.value ?? '';
    const hidden = invisibleIn(value);
    if (hidden) this.fail(token, `this name holds an invisible character (${hidden}), so it cannot be told apart from a name without it: delete that character`);
    if (value.length > MAX_NAME_CHARS) this.fail(token, `a name or title may have at most ${MAX_NAME_CHARS} characters (this one has ${value.length}): shorten it`);
    return { kind: 'string', value, range: this.range(token.start, token.end) };
  }

  private word(words: readonly string[], message: Message): WordNode {
    const token = this.peek();
    if (!token || token.kind !== 'ident' || !words.includes(token.text)) {
      if (token?.kind === 'ident') this.unknownWord(token, words, message);
      return this.fail(token ?? this.tokens[this.pos - 1], message);
    }
    this.pos++;
    return { kind: 'word', value: token.text, range: this.range(token.start, token.end) };
  }

  private point(message: Message): PointNode {
    const open = this.peek();
    if (!open || open.text !== '(') return this.fail(open ?? this.tokens[this.pos - 1], message);
    this.pos++;
    const pointMessage = 'a point is written `(x, y)`, e.g. `(200, 200)`';
    const x = this.expr(pointMessage, NO_STOPS, open, true);
    const comma = this.peek();
    if (!comma || comma.text !== ',') return this.fail(comma ?? open, pointMessage);
    this.pos++;
    const y = this.expr(pointMessage, NO_STOPS, comma, true);
    const close = this.peek();
    if (!close || close.text !== ')') {
      if (!close) this.fail(open, 'this `(` is never closed: add `)` after the point\'s y value');
      return this.fail(close, pointMessage);
    }
    this.pos++;
    return { kind: 'point', x, y, range: this.range(open.start, close.end) };
  }

  /**
   * An expression up to the next stop word at depth 0 (when it is not an operand
   * of an operator), a `,` or `)` at depth 0, a string, or the end of the line.
   * `before` is the token a missing value is reported on.
   */
  private expr(message: Message, stops: ReadonlySet<string>, before?: Token, inPoint = false): ExprNode {
    const first = this.pos;
    const openParens: Token[] = [];
    while (this.pos < this.tokens.length) {
      const token = this.tokens[this.pos];
      if (openParens.length === 0) {
        if (token.text === ')' || token.text === ',' || token.kind === 'string') break;
        if (token.kind === 'ident' && this.inOptionPlace(first)) {
          if (stops.has(token.text) && this.startsOption(first)) break;
          if (!inPoint && this.pos > first) this.checkMisspeltOption(token);
        }
      }
      if (token.text === '(') openParens.push(token);
      else if (token.text === ')') openParens.pop();
      this.pos++;
    }
    if (openParens.length > 0) {
      this.fail(openParens[openParens.length - 1], 'this `(` is never closed: add the matching `)`');
    }
    if (this.pos === first) {
      return this.fail(this.tokens[this.pos] ?? before ?? this.tokens[this.pos - 1], message);
    }
    const start = this.tokens[first].start;
    const end = this.tokens[this.pos - 1].end;
    return { kind: 'expr', text: this.source.slice(start, end), range: this.range(start, end) };
  }

  /** An identifier after an operator is an operand (`deg/min`, `2 * speed`), never an option. */
  private inOptionPlace(first: number): boolean {
    if (this.pos === first) return true;
    const previous = this.tokens[this.pos - 1];
    return !(previous.kind === 'symbol' && OPERATOR_ENDINGS.has(previous.text[previous.text.length - 1]));
  }

  private startsOption(first: number): boolean {
    const token = this.tokens[this.pos];
    const following = this.tokens[this.pos + 1];
    // An empty value followed by `min(...)` is a call, not a missing value.
    if (this.pos === first && following?.text === '(' && following.start === token.end) return false;
    // `within 2 in` ends in a unit; `in` as an option always names a zone.
    if (token.text === 'in') return following?.kind === 'string';
    return true;
  }

  private checkMisspeltOption(token: Token): void {
    // The math.js unit lookup is slow, so it only runs for the rare word that looks like a slip.
    if (suggestWord(token.text, this.optionWords) === undefined) return;
    if (this.letNames.has(token.text) || isMathName(token.text)) return;
    this.unknownWord(token, this.optionWords);
  }

  /** Reads the options (and flags and shapes) after a statement's fixed part. */
  private options(specs: OptionSpecs): Map<string, OptionResult> {
    const results = new Map<string, OptionResult>();
    const stops = stopsOf(specs);
    let shape: Token | undefined;
    while (this.pos < this.tokens.length) {
      const name = this.tokens[this.pos];
      const spec = name.kind === 'ident' && Object.prototype.hasOwnProperty.call(specs, name.text)
        ? specs[name.text] : undefined;
      if (!spec) {
        const known = Object.keys(specs);
        if (name.kind === 'ident') this.unknownWord(name, known);
        const takes = known.length > 0 ? `; options here: ${known.map((word) => `\`${word}\``).join(', ')}` : '';
        this.fail(name, `unexpected \`${abbreviate(name.text)}\`${takes}`);
      }
      const earlier = this.optionRanges[name.text];
      if (earlier) {
        throw new LineProblem(name.start, name.end, `\`${name.text}\` is given twice; keep one`, undefined,
          { start: earlier.start.character, end: earlier.end.character, message: `first \`${name.text}\` here` });
      }
      if (spec.group === 'shape') {
        if (shape) {
          throw new LineProblem(name.start, name.end,
            `a turn has one shape, but \`${name.text}\` comes after \`${shape.text}\`: keep one of spin, pivot left|right, arc R, ratio Q`,
            undefined, { start: shape.start, end: shape.end, message: `\`${shape.text}\` here` });
        }
        shape = name;
      }
      this.pos++;
      const needs = (): string => `\`${name.text}\` needs a value, e.g. \`${spec.example}\``;
      const result: OptionResult = {};
      switch (spec.value.kind) {
        case 'flag': break;
        case 'expr': result.expr = this.expr(needs, stops, name); break;
        case 'point': result.point = this.point(needs); break;
        case 'string': result.string = this.string(needs); break;
        case 'word': {
          const words = spec.value.words;
          result.word = this.word(words, () =>
            `\`${name.text}\` takes ${words.map((word) => `\`${word}\``).join(' or ')}, e.g. \`${spec.example}\``);
          break;
        }
      }
      results.set(name.text, result);
      this.optionRanges[name.text] = this.range(name.start, this.tokens[this.pos - 1].end);
    }
    return results;
  }

  /** Fails with a did-you-mean fix when `token` is a case change or a slip of the pen from a candidate. */
  private unknownWord(token: Token, candidates: readonly string[], otherwise?: Message): void {
    const suggestion = suggestWord(token.text, candidates);
    if (suggestion !== undefined) {
      throw new LineProblem(token.start, token.end,
        `unknown word \`${abbreviate(token.text)}\`: did you mean \`${suggestion}\`?`,
        [{
          title: `Change to "${suggestion}"`,
          edits: [{ range: this.range(token.start, token.end), newText: suggestion }],
          preferred: true,
          ...(suggestion.toLowerCase() === token.text.toLowerCase() ? { safe: true } : {}),
        }]);
    }
    if (otherwise) this.fail(token, otherwise);
  }

  private peek(): Token | undefined {
    return this.tokens[this.pos];
  }

  private next(): Token {
    return this.tokens[this.pos++];
  }

  private fail(token: Token, message: Message): never {
    throw new LineProblem(token.start, token.end, typeof message === 'string' ? message : message());
  }

  private failRange(range: Range | undefined, message: string): never {
    throw new LineProblem(range?.start.character ?? 0, range?.end.character ?? 0, message);
  }

  private range(start: number, end: number): Range {
    return span(this.line, start, end);
  }
}

function stopsOf(specs: OptionSpecs): ReadonlySet<string> {
  let stops = stopSets.get(specs);
  if (!stops) {
    stops = new Set(Object.keys(specs));
    stopSets.set(specs, stops);
  }
  return stops;
}

/** Copies the expression values of the named options that were written. */
function copyExprs<F extends object>(fields: F, options: Map<string, OptionResult>, names: readonly (keyof F & string)[]): void {
  for (const name of names) {
    const value = options.get(name)?.expr;
    if (value) (fields as Record<string, unknown>)[name] = value;
  }
}

/** Keeps messages readable when the offending text is a whole line of junk. */
function abbreviate(text: string): string {
  return showText(text, 40);
}
