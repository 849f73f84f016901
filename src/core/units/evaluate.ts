// Expressions and units: one sandboxed math.js instance, compiled expressions
// cached by their text so a re-check after a keystroke only compiles what
// changed.
import { create, all, type MathNode, type EvalFunction, type Unit } from 'mathjs';
import type { Dimension, LengthUnitName } from '../types';
import { showText } from '../text';

type MathInstance = ReturnType<typeof create>;

interface Sandbox {
  math: MathInstance;
  parseExpression: (text: string) => MathNode;
  isValuelessUnit: (name: string) => boolean;
}

const DISABLED_PREFIX = 'the function ';
let sandbox: Sandbox | undefined;

/**
 * The one math.js instance, made on first use: building it (units above all)
 * costs a few hundred milliseconds, which the editor should not pay while
 * activating.
 */
function getSandbox(): Sandbox {
  if (sandbox) return sandbox;
  const math = create(all, {});
  math.createUnit('rpm', '360 deg/min');
  // Kept before the sandbox below replaces them on the instance.
  const parseExpression = math.parse.bind(math) as (text: string) => MathNode;
  const UnitClass = math.Unit;
  // Sandbox, as math.js's security notes recommend: plan text may not alter the
  // instance or parse/compile new expressions from strings at run time.
  const disabled = (name: string) => () => {
    throw new Error(`${DISABLED_PREFIX}\`${name}\` is not available in plan files`);
  };
  math.import(
    Object.fromEntries(
      ['import', 'createUnit', 'evaluate', 'parse', 'compile', 'simplify', 'derivative', 'resolve', 'reviver', 'replacer', 'chain', 'parser', 'splitUnit']
        .map((n) => [n, disabled(n)]),
    ),
    { override: true },
  );
  sandbox = { math, parseExpression, isValuelessUnit: (name) => UnitClass.isValuelessUnit(name) };
  return sandbox;
}

/** Names that plan text may not bind with `let`: math.js functions, constants and units. */
export function isMathName(name: string): boolean {
  if (isUnitName(name)) return true;
  const { math } = getSandbox();
  return Object.prototype.hasOwnProperty.call(math, name) || name in math;
}

/** Answers by name, kept here: math.js's own memo of this slows down with many distinct names. */
const unitNames = new Map<string, boolean>();

export function isUnitName(name: string): boolean {
  const known = unitNames.get(name);
  if (known !== undefined) return known;
  let answer: boolean;
  try {
    answer = getSandbox().isValuelessUnit(name);
  } catch {
    answer = false;
  }
  if (unitNames.size > 50_000) unitNames.clear();
  unitNames.set(name, answer);
  return answer;
}

export const LENGTH_UNIT_MM: Record<LengthUnitName, number> = { mm: 1, cm: 10, m: 1000, in: 25.4 };

type MathValue = number | Unit;

interface Compiled {
  ok: true;
  /** Compiled on first evaluation: an expression whose names are unknown is never compiled. */
  code?: EvalFunction;
  node: MathNode;
  /** Free names that are neither units nor math.js names: must come from `let`. */
  freeNames: string[];
  /** Free names written right after a number, so meant as units. */
  unitLike: string[];
  percent: boolean;
  /** The value of an expression with no free names, kept after its first evaluation: it cannot change. */
  constant?: MathValue;
}
interface CompileError {
  ok: false;
  message: string;
}

/**
 * Compiled expressions by source text. Keep one per document (the editor) or
 * share one across files (the command line); it only grows with distinct
 * texts, and is bounded.
 */
export class ExpressionCache {
  private readonly map = new Map<string, Compiled | CompileError>();
  hits = 0;
  misses = 0;
  constructor(private readonly capacity = 20000) {}

  get(text: string): Compiled | CompileError {
    const found = this.map.get(text);
    if (found) {
      this.hits++;
      return found;
    }
    this.misses++;
    const made = compileExpression(text);
    if (this.map.size >= this.capacity) this.map.clear();
    this.map.set(text, made);
    return made;
  }
}

/** Longest expression a plan may write; far beyond any real one, short enough that nothing deep or slow can hide in it. */
export const MAX_EXPRESSION_CHARS = 400;
/** Deepest nesting of parentheses. */
export const MAX_EXPRESSION_DEPTH = 24;

/**
 * What a plan may compute: numbers, units, arithmetic and scalar functions.
 * Everything else math.js offers (matrices, ranges, random numbers, strings,
 * objects, settings, parsing) is refused before anything runs, so no
 * expression can change another check or cost more than a few microseconds.
 */
const ALLOWED_FUNCTIONS = new Set([
  'abs', 'sqrt', 'cbrt', 'exp', 'log', 'log10', 'log2', 'log1p', 'expm1', 'square', 'cube', 'pow', 'nthRoot', 'hypot',
  'sin', 'cos', 'tan', 'sec', 'csc', 'cot', 'asin', 'acos', 'atan', 'atan2', 'sinh', 'cosh', 'tanh', 'asinh', 'acosh', 'atanh',
  'min', 'max', 'round', 'floor', 'ceil', 'fix', 'sign', 'mod',
]);
const ALLOWED_CONSTANTS = new Set(['pi', 'e', 'tau', 'phi']);
const ALLOWED_OPERATORS = new Set(['add', 'subtract', 'multiply', 'divide', 'pow', 'unaryMinus', 'unaryPlus', 'mod', 'to']);
const MAX_ARGUMENTS = 16;

/** Why an expression's text is refused before it is parsed, or undefined. */
function refuseText(text: string): string | undefined {
  if (text.length > MAX_EXPRESSION_CHARS) {
    return `this expression has ${text.length} characters; a plan's expressions may have at most ${MAX_EXPRESSION_CHARS}: bind parts of it with \`let\``;
  }
  if (text.includes(';')) return '`;` cannot separate values: a plan line holds one statement, with one value per option';
  let depth = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 40 || c === 91 || c === 123) {
      if (++depth > MAX_EXPRESSION_DEPTH) return `parentheses nest more than ${MAX_EXPRESSION_DEPTH} deep: bind parts of the expression with \`let\``;
    } else if (c === 41 || c === 93 || c === 125) depth--;
  }
  return undefined;
}

/** A number written with a percent sign (`60%`, `2.5 %`, `1e1%`). */
const PERCENT_LITERAL = /((?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*%/g;

function compileExpression(text: string): Compiled | CompileError {
  const { math, parseExpression } = getSandbox();
  const refused = refuseText(text);
  if (refused) return { ok: false, message: refused };
  let node: MathNode;
  // A percent sign after a number is that number over 100, always: math.js
  // would read `a - 10%` as 10 % *of a* and `3% + 1%` as a remainder.
  const percentText = text.replace(PERCENT_LITERAL, '($1 / 100)');
  try {
    node = parseExpression(percentText);
  } catch (e) {
    return { ok: false, message: (e as Error).message };
  }
  const notAllowed = disallowed(node, math);
  if (notAllowed) return { ok: false, message: notAllowed };
  const freeNames = new Set<string>();
  // Names written right after a number (`10 furlongs`): read as units.
  const unitLike = new Set<string>();
  let percent = percentText !== text;
  // `min` is a function and a unit: where it is not called, it is the unit
  // (so `deg/min` works).
  const transformed = node.transform((n: MathNode, path: string) => {
    if ((n as { isPercentage?: boolean }).isPercentage) percent = true;
    if (n.type === 'OperatorNode') {
      const op = n as unknown as { implicit?: boolean; fn: string; args: MathNode[] };
      if (op.implicit && op.fn === 'multiply' && op.args[0]?.type === 'ConstantNode' && op.args[1]?.type === 'SymbolNode') {
        unitLike.add((op.args[1] as unknown as { name: string }).name);
      }
    }
    if (n.type === 'SymbolNode' && path !== 'fn') {
      const name = (n as unknown as { name: string }).name;
      if (isUnitName(name) && typeof (math as unknown as Record<string, unknown>)[name] === 'function') {
        return new math.ConstantNode(math.unit(1, name) as unknown as number);
      }
      if (!isUnitName(name) && !(name in math)) freeNames.add(name);
    }
    return n;
  });
  return { ok: true, node: transformed, freeNames: [...freeNames], unitLike: [...unitLike], percent };
}

/** Walks the parsed expression: the first thing a plan may not compute, in words, or undefined. */
function disallowed(root: MathNode, math: MathInstance): string | undefined {
  let problem: string | undefined;
  const mathNames = math as unknown as Record<string, unknown>;
  root.traverse((n: MathNode, path: string) => {
    if (problem) return;
    switch (n.type) {
      case 'ConstantNode':
        if (typeof (n as unknown as { value: unknown }).value !== 'number') problem = 'only numbers and units can be written here (no text in quotes)';
        return;
      case 'ParenthesisNode':
        return;
      case 'SymbolNode': {
        if (path === 'fn') return; // checked with its FunctionNode
        const name = (n as unknown as { name: string }).name;
        if (isUnitName(name) || ALLOWED_CONSTANTS.has(name)) return;
        if (ALLOWED_FUNCTIONS.has(name)) problem = `\`${name}\` is a function: give it a value, e.g. \`${name}(30 deg)\``;
        else if (name in mathNames) problem = `\`${name}\` is not available in plan files: an expression may use numbers, units, names bound with \`let\`, arithmetic and ${FUNCTION_LIST}`;
        return;
      }
      case 'OperatorNode': {
        const op = n as unknown as { fn: string; op: string; isPercentage?: boolean; args: MathNode[] };
        if (op.isPercentage) return;
        if (!ALLOWED_OPERATORS.has(op.fn)) problem = `the operator \`${op.op}\` is not available in plan files: use + - * / ^ and parentheses`;
        return;
      }
      case 'FunctionNode': {
        const fn = n as unknown as { fn: MathNode; args: MathNode[] };
        const name = fn.fn.type === 'SymbolNode' ? (fn.fn as unknown as { name: string }).name : '';
        if (!ALLOWED_FUNCTIONS.has(name)) {
          problem = name && !(name in mathNames)
            ? `\`${name}\` is not a function: an expression may call ${FUNCTION_LIST}`
            : `\`${name || 'this'}(...)\` is not available in plan files: an expression may call ${FUNCTION_LIST}`;
        } else if (fn.args.length > MAX_ARGUMENTS) problem = `\`${name}\` takes at most ${MAX_ARGUMENTS} values here`;
        return;
      }
      case 'AssignmentNode':
      case 'FunctionAssignmentNode':
        problem = 'assignments are not allowed in an expression: bind a name with `let NAME = value` on a line of its own';
        return;
      case 'BlockNode':
        problem = 'one value per option: a plan line holds one statement';
        return;
      default:
        problem = `${describeNode(n.type)} are not available in plan files: an expression may use numbers, units, names bound with \`let\`, arithmetic and ${FUNCTION_LIST}`;
    }
  });
  return problem;
}

const FUNCTION_LIST = 'functions such as sqrt, sin, cos, atan2, min, max, round and abs';

function describeNode(type: string): string {
  switch (type) {
    case 'ArrayNode': case 'IndexNode': return 'lists and matrices';
    case 'ObjectNode': return 'objects';
    case 'AccessorNode': return 'properties (`.name`)';
    case 'RangeNode': return 'ranges (`a:b`)';
    case 'ConditionalNode': return 'conditions (`a ? b : c`)';
    case 'RelationalNode': return 'comparisons';
    default: return 'such expressions';
  }
}

/** What a value position accepts, and how a bare number there is read. */
export type Expected =
  | 'length' | 'angle' | 'time' | 'acceleration' | 'angularSpeed' | 'number' | 'fraction' | 'gain'
  /** A power fraction or a linear speed (drive `speed`). */
  | 'power|speed';

export interface EvalContext {
  lengthUnit: LengthUnitName;
  scope: Map<string, MathValue>;
  /**
   * Outcomes of this check's evaluations by expected kind and text. A name is
   * bound once and never rebound, so once an expression evaluates, the same
   * text gives the same value for the rest of the check: plans repeat the
   * same few expressions (`lane * 2`, `90`) many times.
   */
  memo?: Map<string, EvalOutcome>[];
  /** `let` names bound to a percentage (`let top = 60%`): an expression of them is a percentage too. */
  percentNames?: Set<string>;
}

export type EvalOutcome =
  | { ok: true; value: number; dimension: Dimension; raw: MathValue }
  | { ok: false; code: 'unit' | 'name' | 'syntax'; message: string; name?: string };

const DIMENSION_LABEL: Record<Dimension, string> = {
  number: 'a plain number',
  length: 'a length',
  angle: 'an angle',
  time: 'a time',
  speed: 'a speed (length per time)',
  angularSpeed: 'an angular speed (angle per time)',
  acceleration: 'an acceleration (length per time squared)',
  fraction: 'a fraction or percentage',
};

/** Each expected kind's place in a check's memo (one map of texts per kind). */
const EXPECTED_INDEX: Record<Expected, number> = {
  length: 0, angle: 1, time: 2, acceleration: 3, angularSpeed: 4, number: 5, fraction: 6, gain: 7, 'power|speed': 8,
};

const EXPECTED_LABEL: Record<Expected, string> = {
  length: 'a length such as `300 mm`',
  angle: 'an angle such as `90 deg`',
  time: 'a time such as `2 s`',
  acceleration: 'an acceleration such as `800 mm/s^2`',
  angularSpeed: 'an angular speed such as `900 deg/s` or `150 rpm`',
  number: 'a plain number',
  fraction: 'a percentage such as `50%`',
  gain: 'a gain in % power per degree, such as `1.5`',
  'power|speed': 'a power such as `60%` or a speed such as `300 mm/s`',
};

/** The dimension of a math.js value, or undefined when the plan language has no name for it. */
export function dimensionOf(v: MathValue): Dimension | undefined {
  if (typeof v === 'number') return 'number';
  if (!v || typeof v !== 'object' || !('dimensions' in v)) return undefined;
  const d = (v as Unit).dimensions;
  const [mass, length, time, current, temp, lum, amount, angle, bit] = d;
  if (mass || current || temp || lum || amount || bit) return undefined;
  if (angle === 0 && length === 1 && time === 0) return 'length';
  if (angle === 0 && length === 1 && time === -1) return 'speed';
  if (angle === 0 && length === 1 && time === -2) return 'acceleration';
  if (angle === 0 && length === 0 && time === 1) return 'time';
  if (angle === 1 && length === 0 && time === 0) return 'angle';
  if (angle === 1 && length === 0 && time === -1) return 'angularSpeed';
  if (angle === 0 && length === 0 && time === -1) return 'angularSpeed'; // e.g. `1/s`? not an angle rate
  return undefined;
}

function unitNumber(v: Unit, unit: string): number {
  return (v as Unit).toNumber(unit);
}

/**
 * Evaluates `text` where a value of `expected` kind belongs, returning it in
 * canonical units (mm, deg, s, mm/s, deg/s, mm/s^2, fraction 0..1).
 */
export function evaluateExpr(cache: ExpressionCache, text: string, expected: Expected, ctx: EvalContext): EvalOutcome {
  const memo = ctx.memo ? (ctx.memo[EXPECTED_INDEX[expected]] ??= new Map()) : undefined;
  const known = memo?.get(text);
  if (known) return known;
  const outcome = evaluateUncached(cache, text, expected, ctx);
  if (outcome.ok) memo?.set(text, outcome);
  return outcome;
}

function evaluateUncached(cache: ExpressionCache, text: string, expected: Expected, ctx: EvalContext): EvalOutcome {
  const compiled = cache.get(text);
  if (!compiled.ok) return { ok: false, code: 'syntax', message: `cannot read the expression \`${showText(text)}\`: ${showText(compiled.message, 240)}` };
  for (const name of compiled.freeNames) {
    if (ctx.scope.has(name)) continue;
    if (compiled.unitLike.includes(name)) {
      return { ok: false, code: 'unit', name, message: `unknown unit \`${name}\` (lengths: mm, cm, m, in; angles: deg, rad; times: s, ms, min; speeds such as mm/s or rpm)` };
    }
    return { ok: false, code: 'name', name, message: `unknown name \`${name}\`` };
  }
  let raw: MathValue;
  try {
    compiled.code ??= compiled.node.compile();
    raw = compiled.constant ?? compiled.code.evaluate(ctx.scope) as MathValue;
    if (compiled.freeNames.length === 0) compiled.constant = raw;
  } catch (e) {
    const msg = (e as Error).message;
    if (msg.startsWith(DISABLED_PREFIX)) return { ok: false, code: 'name', message: msg };
    if (/Unexpected type of argument.*actual: Unit/.test(msg) || /actual: number.*index/.test(msg) && /Unit/.test(msg)) {
      return { ok: false, code: 'unit', message: `\`${showText(text)}\` mixes a plain number with a quantity that has a unit: give the number its unit (e.g. \`let lane = 250 mm\` rather than \`let lane = 250\`)` };
    }
    if (/Units do not match/.test(msg)) {
      return { ok: false, code: 'unit', message: `\`${showText(text)}\` adds or compares quantities of different kinds (e.g. a length and an angle)` };
    }
    if (/Unit|unit/.test(msg)) return { ok: false, code: 'unit', message: `\`${showText(text)}\`: ${showText(msg, 240)}` };
    return { ok: false, code: 'syntax', message: `cannot evaluate \`${showText(text)}\`: ${showText(msg, 240)}` };
  }
  if (typeof raw !== 'number' && !(raw && typeof raw === 'object' && 'dimensions' in raw)) {
    return { ok: false, code: 'unit', message: `\`${showText(text)}\` is not a single number or quantity` };
  }
  let dim = dimensionOf(raw);
  if (dim === 'number' && (compiled.percent || (ctx.percentNames?.size && compiled.freeNames.some((n) => ctx.percentNames!.has(n))))) dim = 'fraction';
  if (typeof raw === 'number' && !Number.isFinite(raw)) {
    return { ok: false, code: 'unit', message: `\`${showText(text)}\` is not a finite number` };
  }
  return coerce(raw, dim, expected, text, ctx);
}

function coerce(raw: MathValue, dim: Dimension | undefined, expected: Expected, text: string, ctx: EvalContext): EvalOutcome {
  const lenFactor = LENGTH_UNIT_MM[ctx.lengthUnit];
  const ok = (value: number, dimension: Dimension): EvalOutcome =>
    Number.isFinite(value) ? { ok: true, value, dimension, raw } : { ok: false, code: 'unit', message: `\`${showText(text)}\` is not a finite number` };
  const n = typeof raw === 'number' ? raw : NaN;
  switch (expected) {
    case 'length':
      if (dim === 'number') return ok(n * lenFactor, 'length');
      if (dim === 'length') return ok(unitNumber(raw as Unit, 'mm'), 'length');
      break;
    case 'angle':
      if (dim === 'number') return ok(n, 'angle');
      if (dim === 'angle') return ok(unitNumber(raw as Unit, 'deg'), 'angle');
      break;
    case 'time':
      if (dim === 'number') return ok(n, 'time');
      if (dim === 'time') return ok(unitNumber(raw as Unit, 's'), 'time');
      break;
    case 'acceleration':
      if (dim === 'number') return ok(n * lenFactor, 'acceleration');
      if (dim === 'acceleration') return ok(unitNumber(raw as Unit, 'mm/s^2'), 'acceleration');
      break;
    case 'angularSpeed':
      if (dim === 'number') return ok(n, 'angularSpeed');
      if (dim === 'angularSpeed' && (raw as Unit).dimensions[7] === 1) return ok(unitNumber(raw as Unit, 'deg/s'), 'angularSpeed');
      break;
    case 'number':
      if (dim === 'number') return ok(n, 'number');
      break;
    case 'gain':
      // `gain 2` and `gain 2%` both mean 2 % power per degree.
      if (dim === 'number') return ok(n, 'number');
      if (dim === 'fraction') return ok(n * 100, 'number');
      break;
    case 'fraction':
      if (dim === 'fraction') return ok(n, 'fraction');
      // A bare number where a power belongs is read as percent: `speed 60` is 60 %.
      if (dim === 'number') return ok(n / 100, 'fraction');
      break;
    case 'power|speed':
      if (dim === 'fraction') return ok(n, 'fraction');
      if (dim === 'number') return ok(n / 100, 'fraction');
      if (dim === 'speed') return ok(unitNumber(raw as Unit, 'mm/s'), 'speed');
      break;
  }
  const got = dim ? DIMENSION_LABEL[dim] : `a quantity of unit ${(raw as Unit).formatUnits?.() ?? '?'}`;
  return { ok: false, code: 'unit', message: `expected ${EXPECTED_LABEL[expected]}, but \`${showText(text)}\` is ${got}` };
}

/** A value in the file's own units, for hovers and messages. */
export function displayValue(value: number, dimension: Dimension, lengthUnit: LengthUnitName): string {
  const f = LENGTH_UNIT_MM[lengthUnit];
  switch (dimension) {
    case 'length': return `${fmt(value / f)} ${lengthUnit}`;
    case 'angle': return `${fmt(value)}°`;
    case 'time': return `${fmt(value)} s`;
    case 'speed': return `${fmt(value / f)} ${lengthUnit}/s`;
    case 'acceleration': return `${fmt(value / f)} ${lengthUnit}/s²`;
    case 'angularSpeed': return `${fmt(value)}°/s`;
    case 'fraction': return `${fmt(value * 100)} %`;
    case 'number': return fmt(value);
  }
}

/** Rounds for display: at most 2 decimals, no trailing zeros. */
export function fmt(v: number, decimals = 2): string {
  if (!Number.isFinite(v)) return String(v);
  const r = Number(v.toFixed(decimals));
  return String(Object.is(r, -0) ? 0 : r);
}
