// checkPlan: text in, solved runs and diagnostics out.
//
// One pass in file order evaluates every expression (so `let` names are bound
// before use) and collects the setup; setup values then apply to the whole
// file wherever they stand. A second pass solves each run.
import type {
  CheckResult, Diagnostic, DiagnosticCode, Dimension, EvaluatedExpr, ExprNode, LengthUnitName, MotionStmt, NameInfo,
  Obstacle, PlanSetup, Point, PointNode, Range, RelatedInfo, Robot, Severity, Statement, TurnDirection, Zone,
} from './types';
import { parsePlan } from './syntax/parser';
import { RESERVED_WORDS, suggestWord } from './syntax/keywords';
import {
  ExpressionCache, displayValue, evaluateExpr, fmt, isMathName, type EvalContext, type EvalOutcome, type Expected,
} from './units/evaluate';
import { solveRuns, type EvaluatedMotion, type RunInput } from './solve/runs';
import { attachFixes } from './fix/candidates';
import { showText } from './text';

export interface CheckOptions {
  /** Used for the default plan title. */
  fileName?: string;
  /** Compiled expressions kept across checks (one per document in the editor). */
  cache?: ExpressionCache;
  /** Called now and then with the fraction done, for progress on long files. */
  onProgress?: (fraction: number) => void;
  /** Run the controller simulation (default true); without it no motion has `predicted` and gyro turns keep the closed-form time. */
  simulate?: boolean;
}

/** Plans longer than this are refused with one diagnostic rather than checked. */
export const MAX_PLAN_CHARS = 2_000_000;

const defaultCache = new ExpressionCache();

/** "Did you mean" suggestions per check. */
const MAX_NAME_SUGGESTIONS = 50;

/**
 * The largest magnitude of each kind of value a plan may write: far beyond
 * any small robot's run (a field is a few metres, a run a few minutes), and
 * small enough that nothing downstream (drawing, sweeping, timing) can be
 * made to run away.
 */
const MAGNITUDE_LIMITS: Record<Dimension, { max: number; why?: string }> = {
  length: { max: 1e6, why: 'one kilometre' },
  angle: { max: 3600, why: 'ten full turns' },
  time: { max: 1e5, why: 'more than a day' },
  speed: { max: 1e5, why: '100 m/s' },
  angularSpeed: { max: 1e6 },
  acceleration: { max: 1e7 },
  fraction: { max: 100 },
  number: { max: 1e6 },
};

export const DEFAULTS = {
  yawRange: { lo: -180, hi: 180 },
  gear: 1,
  motorSpeed: 900,
  motorLag: 0.08,
  stall: 0.05,
  mismatch: 1,
  gyro: { sample: 0.01, delay: 0, scale: 1 },
  noise: { drive: 0.01, turn: 0.015, gyro: 1, drift: 0.5 / 60 },
  grid: 100,
} as const;

/** Right wheel diameter over left: outside this, not two wheels of one size. */
const MISMATCH_RANGE = { lo: 0.8, hi: 1.25 } as const;

/** The largest sample period and delay (seconds) of a working control loop, and the scale factors of a working yaw sensor. */
const GYRO_LIMITS = { sample: 0.5, delay: 1, scale: { lo: 0.5, hi: 2 } } as const;

/** A short time as people write it: `10 ms`, `0.5 s`. */
function showSeconds(t: number): string {
  return Math.abs(t) < 1 ? `${fmt(t * 1000, 3)} ms` : `${fmt(t, 3)} s`;
}

/** The start of the one diagnostic a check gives when Veer itself fails (never on the fuzz corpus: a test says so). */
export const INTERNAL_FAILURE = 'Veer could not check this plan: an internal error';

/**
 * Checks a plan. Never throws: whatever the text, the answer is a result, in
 * the worst case one diagnostic saying Veer itself failed.
 */
export function checkPlan(text: string, options: CheckOptions = {}): CheckResult {
  try {
    return checkPlanUnguarded(String(text), options);
  } catch (e) {
    const detail = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
    return emptyResult(`${INTERNAL_FAILURE} (${showText(detail, 120)}). The rest of the editor keeps working; please report this with the plan attached.`);
  }
}

function checkPlanUnguarded(text: string, options: CheckOptions): CheckResult {
  const cache = options.cache ?? defaultCache;
  if (text.length > MAX_PLAN_CHARS) return refuseTooLarge(text);
  const { ast, diagnostics: parseDiagnostics } = parsePlan(text);
  options.onProgress?.(0.3);
  const diagnostics: Diagnostic[] = [...parseDiagnostics];
  const report = (range: Range, severity: Severity, code: DiagnosticCode, message: string, related?: RelatedInfo[]) => {
    const d: Diagnostic = { range, severity, code, message };
    if (related?.length) d.related = related;
    diagnostics.push(d);
    return d;
  };

  const statements = ast.statements;
  const first = <K extends Statement['kind']>(kind: K) =>
    statements.find((s) => s.kind === kind) as Extract<Statement, { kind: K }> | undefined;
  const lengthUnit: LengthUnitName = first('units')?.unit.value ?? 'mm';
  const turns: TurnDirection = first('turns')?.direction.value ?? 'clockwise';

  const baseName = options.fileName ? options.fileName.replace(/^.*[\\/]/, '').replace(/\.veer$/i, '') : 'plan';
  const setup: PlanSetup = {
    title: first('plan')?.title.value ?? baseName,
    lengthUnit,
    turns,
    yawRange: { ...DEFAULTS.yawRange },
    robot: { gear: DEFAULTS.gear, motorSpeed: DEFAULTS.motorSpeed, motorLag: DEFAULTS.motorLag, stall: DEFAULTS.stall, mismatch: DEFAULTS.mismatch },
    noise: { ...DEFAULTS.noise },
    gyro: { ...DEFAULTS.gyro },
    obstacles: [],
    zones: [],
  };

  const ctx: EvalContext = { lengthUnit, scope: new Map(), memo: [] };
  const values: EvaluatedExpr[] = [];
  const names: Record<string, NameInfo> = {};
  let suggestionsLeft = MAX_NAME_SUGGESTIONS;
  let nameList: string[] | undefined;
  /** Each evaluation's text for hovers, worked out once per outcome (the check's memo gives repeated expressions one outcome). */
  const displays = new Map<EvalOutcome, string>();
  const evFull = (expr: ExprNode | undefined, expected: Expected): { value: number; dimension: Dimension } | undefined => {
    if (!expr) return undefined;
    const out = evaluateExpr(cache, expr.text, expected, ctx);
    if (out.ok) {
      let display = displays.get(out);
      if (display === undefined) {
        display = displayValue(out.value, out.dimension, lengthUnit);
        displays.set(out, display);
      }
      const bound = MAGNITUDE_LIMITS[out.dimension];
      if (Math.abs(out.value) > bound.max) {
        report(expr.range, 'error', 'setup', `${display} is far beyond anything a small robot's plan can mean (the limit is ${displayValue(bound.max, out.dimension, lengthUnit)}${bound.why ? `, ${bound.why}` : ''}): check the value and its unit.`);
        return undefined;
      }
      values.push({ range: expr.range, value: out.value, dimension: out.dimension, display });
      return out;
    }
    const d = report(narrowTo(expr, out.name), 'error', out.code, out.message);
    if (out.code === 'name' && out.name && !out.message.startsWith('the function') && suggestionsLeft > 0) {
      // Each suggestion compares the name with every bound one: a plan full of
      // unknown names gets the first few, not a search that grows with the square of its size.
      suggestionsLeft--;
      nameList ??= Object.keys(names);
      const guess = suggestWord(out.name, nameList);
      if (guess) {
        d.message += `: did you mean \`${guess}\`?`;
        d.fixes = [{ title: `Change to "${guess}"`, edits: [{ range: d.range, newText: guess }], preferred: true }];
      } else {
        d.message += `; bind it first with \`let ${out.name} = ...\``;
      }
    }
    return undefined;
  };
  const ev = (expr: ExprNode | undefined, expected: Expected) => evFull(expr, expected)?.value;
  const evPoint = (p: PointNode | undefined): Point | undefined => {
    if (!p) return undefined;
    const x = ev(p.x, 'length');
    const y = ev(p.y, 'length');
    return x === undefined || y === undefined ? undefined : { x, y };
  };

  /** Shows a setup value in its hover with the digits it needs (`1.004`, `5 ms`), not the two decimals of other values. */
  const showPrecisely = (expr: ExprNode, display: string): void => {
    for (let i = values.length - 1; i >= 0; i--) {
      if (values[i].range === expr.range) {
        values[i].display = display;
        return;
      }
    }
  };

  // Setup values set twice: the second is an error pointing at the first.
  const seen = new Map<string, Statement>();
  const once = (key: string, s: Statement, what: string): boolean => {
    const prev = seen.get(key);
    if (prev) {
      report(s.range, 'error', 'setup', `${what} is already set on line ${prev.line + 1}; a plan sets it once. Remove one of the two lines.`,
        [{ range: prev.range, message: `${what} first set here` }]);
      return false;
    }
    seen.set(key, s);
    return true;
  };
  const namedThings = new Map<string, Statement>();
  const uniqueName = (name: string, s: Statement & { name: { range: Range } }): boolean => {
    const prev = namedThings.get(name);
    if (prev) {
      report(s.name.range, 'error', 'name', `"${name}" is already the name of something on line ${prev.line + 1}; give each obstacle and zone its own name.`,
        [{ range: prev.range, message: `"${name}" first named here` }]);
      return false;
    }
    namedThings.set(name, s);
    return true;
  };

  const robot = setup.robot as Partial<Robot>;
  const setupLines: Partial<Record<keyof Robot | 'field' | 'limit', number>> = {};
  const runs: RunInput[] = [];
  let current: RunInput | undefined;

  const progressEvery = options.onProgress ? Math.max(1000, Math.floor(statements.length / 20)) : Infinity;
  for (let i = 0; i < statements.length; i++) {
    const s = statements[i];
    if (i % progressEvery === 0 && i > 0) options.onProgress!(0.3 + (0.4 * i) / statements.length);
    switch (s.kind) {
      case 'plan': once('plan', s, 'The plan title'); break;
      case 'units': once('units', s, 'The length unit'); break;
      case 'turns': once('turns', s, 'The turn direction'); break;
      case 'yawRange': {
        if (!once('yawRange', s, 'The yaw range')) break;
        const lo = ev(s.lo, 'angle');
        const hi = ev(s.hi, 'angle');
        if (lo === undefined || hi === undefined) break;
        if (Math.abs(hi - lo - 360) > 1e-9) {
          report(s.range, 'error', 'setup', `the yaw range must be 360° wide (it is ${fmt(hi - lo, 1)}°): a yaw sensor reads one full turn, e.g. \`yaw range -180 to 180\` or \`yaw range 0 to 360\`.`);
        } else setup.yawRange = { lo, hi };
        break;
      }
      case 'wheel': {
        if (!once('wheel', s, 'The wheel diameter')) break;
        const d = ev(s.diameter, 'length');
        if (d !== undefined && positive(d, s.diameter, 'the wheel diameter', 'wheel 56 mm')) {
          if (d < 1 || d > 2000) report(s.diameter.range, 'error', 'setup', `a wheel of ${fmt(d, 3)} mm across is not a small robot's wheel: wheel and motor degrees and times would be meaningless. Measure the wheel (a ruler across it, in mm), e.g. \`wheel 56 mm\`.`);
          else robot.wheelDiameter = d;
        }
        const e = ev(s.mismatch, 'number');
        if (e !== undefined && s.mismatch) {
          showPrecisely(s.mismatch, fmt(e, 6));
          if (e <= 0) {
            report(s.mismatch.range, 'error', 'setup', `the wheel mismatch must be greater than zero (it is ${fmt(e, 6)}): it is the right wheel's diameter over the left wheel's, 1 for two equal wheels, e.g. \`wheel 56 mm mismatch 1.004\`.`);
          } else if (e < MISMATCH_RANGE.lo || e > MISMATCH_RANGE.hi) {
            report(s.mismatch.range, 'error', 'setup', `a mismatch of ${fmt(e, 6)} makes the right wheel ${fmt(Math.abs(e - 1) * 100, 1)} % ${e > 1 ? 'larger' : 'smaller'} than the left: not two wheels of one size, and the robot would curve hard to one side on every drive. It is the right wheel's diameter over the left wheel's, between ${MISMATCH_RANGE.lo} and ${MISMATCH_RANGE.hi} and usually within a few thousandths of 1 (measure both wheels, or drive 2 m and see which way the robot drifts), e.g. \`wheel 56 mm mismatch 1.004\`.`);
          } else robot.mismatch = e;
        }
        setupLines.wheelDiameter = s.line;
        break;
      }
      case 'track': {
        if (!once('track', s, 'The track width')) break;
        const w = ev(s.width, 'length');
        const we = ev(s.effective, 'length');
        if (w !== undefined && positive(w, s.width, 'the track width', 'track 120 mm')) robot.track = w;
        if (we !== undefined && s.effective && positive(we, s.effective, 'the effective track', 'track 120 mm effective 122 mm')) robot.effectiveTrack = we;
        setupLines.track = s.line;
        break;
      }
      case 'gear': {
        if (!once('gear', s, 'The gear ratio')) break;
        const g = ev(s.ratio, 'number');
        if (g !== undefined && positive(g, s.ratio, 'the gear ratio', 'gear 1')) robot.gear = g;
        break;
      }
      case 'motor': {
        if (!once('motor', s, 'The motor')) break;
        const sp = ev(s.speed, 'angularSpeed');
        const lag = ev(s.lag, 'time');
        if (sp !== undefined && positive(sp, s.speed, 'the motor speed', 'motor 900 deg/s')) robot.motorSpeed = sp;
        if (lag !== undefined && s.lag) {
          if (lag < 0) report(s.lag.range, 'error', 'setup', 'the motor lag cannot be negative; it is the time the motor takes to reach about 63 % of a new speed, e.g. `lag 80 ms`.');
          else robot.motorLag = lag;
        }
        const stall = ev(s.stall, 'fraction');
        if (stall !== undefined && s.stall) {
          if (stall < 0) {
            report(s.stall.range, 'error', 'setup', `the stall power cannot be negative (it is ${fmt(stall * 100, 2)} %): it is the power below which static friction holds the wheels still. Measure it by raising the power until the robot just creeps, e.g. \`motor 900 deg/s stall 6%\`.`);
          } else if (stall >= 1) {
            report(s.stall.range, 'error', 'setup', `a stall power of ${fmt(stall * 100, 2)} % means the wheels would never move, not even at full power: it is the power below which static friction holds them still, and must be below 100 %. Measure it by raising the power until the robot just creeps, e.g. \`motor 900 deg/s stall 6%\`.`);
          } else robot.stall = stall;
        }
        break;
      }
      case 'gyro': {
        if (!once('gyro', s, 'The gyro')) break;
        const sample = ev(s.sample, 'time');
        const delay = ev(s.delay, 'time');
        const scale = ev(s.scale, 'number');
        if (sample !== undefined && s.sample) {
          showPrecisely(s.sample, showSeconds(sample));
          if (sample <= 0) {
            report(s.sample.range, 'error', 'setup', `the gyro sample period must be greater than zero (it is ${showSeconds(sample)}): it is how often the robot's control loop reads the gyro and sets the motors, usually every 5 to 20 ms, e.g. \`gyro sample 10 ms\`.`);
          } else if (sample > GYRO_LIMITS.sample) {
            report(s.sample.range, 'error', 'setup', `a sample period of ${showSeconds(sample)} is too slow for a control loop: the robot would read the gyro and set its motors only every ${showSeconds(sample)} and swing far past its targets. It is how often the control loop runs, at most ${showSeconds(GYRO_LIMITS.sample)} and usually 5 to 20 ms, e.g. \`gyro sample 10 ms\`.`);
          } else setup.gyro.sample = sample;
        }
        if (delay !== undefined && s.delay) {
          showPrecisely(s.delay, showSeconds(delay));
          if (delay < 0) {
            report(s.delay.range, 'error', 'setup', `the gyro delay cannot be negative (it is ${showSeconds(delay)}): a reading cannot arrive before the robot turns. It is how old a reading is when the code uses it, 0 for a fresh one, e.g. \`gyro delay 5 ms\`.`);
          } else if (delay > GYRO_LIMITS.delay) {
            report(s.delay.range, 'error', 'setup', `a gyro delay of ${showSeconds(delay)} is not a working sensor: the robot would act on readings more than ${showSeconds(GYRO_LIMITS.delay)} old and swing far past every target. It is how old a reading is when the code uses it, usually a few milliseconds, e.g. \`gyro delay 5 ms\`.`);
          } else setup.gyro.delay = delay;
        }
        if (scale !== undefined && s.scale) {
          showPrecisely(s.scale, fmt(scale, 6));
          if (scale <= 0) {
            report(s.scale.range, 'error', 'setup', `the gyro scale must be greater than zero (it is ${fmt(scale, 6)}): a sensor that reads no turn, or the opposite turn, would never let a gyro turn reach its target, so the robot would spin on. It is the reading over the true angle turned, 1 for a perfect sensor, e.g. \`gyro scale 1.01\`.`);
          } else if (scale < GYRO_LIMITS.scale.lo || scale > GYRO_LIMITS.scale.hi) {
            report(s.scale.range, 'error', 'setup', `a gyro scale of ${fmt(scale, 6)} means the sensor reads ${fmt(scale, 6)} times the angle turned, so a 90° gyro turn would really turn ${fmt(90 / scale, 1)}°: no working sensor is that far off. It is the reading over the true angle turned, between ${GYRO_LIMITS.scale.lo} and ${GYRO_LIMITS.scale.hi} and usually within a percent or two of 1 (turn the robot ten full turns by hand and compare the reading), e.g. \`gyro scale 1.01\`.`);
          } else setup.gyro.scale = scale;
        }
        break;
      }
      case 'body': {
        if (!once('body', s, 'The body size')) break;
        const w = ev(s.width, 'length');
        const l = ev(s.length, 'length');
        const a = s.axle ? ev(s.axle, 'length') : 0;
        if (w !== undefined && l !== undefined && a !== undefined &&
          positive(w, s.width, 'the body width', 'body 150 by 190') && positive(l, s.length, 'the body length', 'body 150 by 190')) {
          if (Math.abs(a) > l / 2) report(s.axle?.range ?? s.range, 'error', 'setup', `the axle (${fmt(a, 1)} mm from the body's centre) lies outside the ${fmt(l, 1)} mm long body; \`axle\` is how far the axle sits ahead of the footprint's centre (negative: behind).`);
          else robot.body = { width: w, length: l, axle: a };
        }
        break;
      }
      case 'field': {
        if (!once('field', s, 'The field size')) break;
        const w = ev(s.width, 'length');
        const h = ev(s.height, 'length');
        const g = s.grid ? ev(s.grid, 'length') : DEFAULTS.grid;
        if (w !== undefined && h !== undefined && g !== undefined &&
          positive(w, s.width, 'the field width', 'field 2000 by 1200') && positive(h, s.height, 'the field height', 'field 2000 by 1200') &&
          (!s.grid || positive(g, s.grid, 'the grid spacing', 'grid 100'))) {
          setup.field = { width: w, height: h, grid: g };
        }
        break;
      }
      case 'box':
      case 'zone': {
        const a = evPoint(s.a);
        const b = evPoint(s.b);
        if (!uniqueName(s.name.value, s) || !a || !b) break;
        const min = { x: Math.min(a.x, b.x), y: Math.min(a.y, b.y) };
        const max = { x: Math.max(a.x, b.x), y: Math.max(a.y, b.y) };
        if (min.x === max.x || min.y === max.y) {
          report(s.range, 'error', 'setup', `"${s.name.value}" has no area: its two corners share an x or a y. Give two opposite corners, e.g. \`(900, 500) to (1100, 800)\`.`);
          break;
        }
        if (s.kind === 'box') setup.obstacles.push({ kind: 'box', name: s.name.value, line: s.line, min, max });
        else setup.zones.push({ name: s.name.value, line: s.line, min, max } satisfies Zone);
        break;
      }
      case 'circle': {
        const c = evPoint(s.center);
        const r = ev(s.radius, 'length');
        if (!uniqueName(s.name.value, s) || !c || r === undefined) break;
        if (positive(r, s.radius, 'the radius', 'radius 60')) setup.obstacles.push({ kind: 'circle', name: s.name.value, line: s.line, center: c, radius: r } satisfies Obstacle);
        break;
      }
      case 'noise': {
        if (!once('noise', s, 'The error model')) break;
        const drive = ev(s.drive, 'fraction');
        const turn = ev(s.turn, 'fraction');
        const gyro = ev(s.gyro, 'angle');
        const drift = ev(s.drift, 'angularSpeed');
        const wheel = ev(s.wheel, 'length');
        const square = ev(s.square, 'angle');
        const across = ev(s.across, 'length');
        if (wheel !== undefined && s.wheel && (wheel < 0 || wheel > 10)) {
          report(s.wheel.range, 'error', 'setup', `a wheel noise of ${fmt(wheel, 3)} mm is ${wheel < 0 ? 'negative' : 'far beyond any wheel on a table (a metre of driving would spread the heading by tens of degrees)'}: it is the variance, per millimetre driven, of each wheel's random travel error, about 0.01 mm for small rubber wheels, e.g. \`noise wheel 0.01 mm\`.`);
        } else if (wheel !== undefined) setup.noise.wheel = wheel;
        for (const [v, e, what] of [[drive, s.drive, 'drive'], [turn, s.turn, 'turn'], [gyro, s.gyro, 'gyro'], [drift, s.drift, 'drift'], [square, s.square, 'square'], [across, s.across, 'across']] as const) {
          if (v !== undefined && e && v < 0) report(e.range, 'error', 'setup', `the ${what} noise cannot be negative.`);
        }
        if (square !== undefined && s.square && square > 10) {
          report(s.square.range, 'error', 'setup', `a square noise of ${fmt(square, 2)}° is far beyond a robot pressed flat against a wall: it is the spread (standard deviation) of the heading after a \`square\`, about 0.5° for a flat bumper, e.g. \`noise square 0.5 deg across 1 mm\`.`);
        } else if (square !== undefined && square >= 0) setup.noise.square = square;
        if (across !== undefined && s.across && across > 50) {
          report(s.across.range, 'error', 'setup', `an across noise of ${fmt(across, 1)} mm is far beyond a robot pressed against a wall: it is the spread (standard deviation) of the position across the wall after a \`square\`, about 1 mm, e.g. \`noise square 0.5 deg across 1 mm\`.`);
        } else if (across !== undefined && across >= 0) setup.noise.squareAcross = across;
        if (drive !== undefined && drive >= 0) setup.noise.drive = drive;
        if (turn !== undefined && turn >= 0) setup.noise.turn = turn;
        if (gyro !== undefined && gyro >= 0) setup.noise.gyro = gyro;
        if (drift !== undefined && drift >= 0) setup.noise.drift = drift;
        break;
      }
      case 'limit': {
        if (!once('limit', s, 'The time limit')) break;
        const t = ev(s.time, 'time');
        if (t !== undefined && positive(t, s.time, 'the time limit', 'limit 150 s')) setup.limit = t;
        break;
      }
      case 'let': {
        let bindable = true;
        if (RESERVED_WORDS.has(s.name)) {
          report(s.nameRange, 'error', 'name', `\`${s.name}\` is a word of the plan language and cannot be a name; choose another, e.g. \`${s.name}_len\`.`);
          bindable = false;
        } else if (isMathName(s.name)) {
          report(s.nameRange, 'error', 'name', `\`${s.name}\` is already a unit or function in expressions and cannot be rebound; choose another name.`);
          bindable = false;
        } else if (names[s.name]) {
          const prev = names[s.name];
          report(s.nameRange, 'error', 'name', `\`${s.name}\` is already bound on line ${prev.line + 1}; a name is bound once. Use a new name.`,
            [{ range: prev.range, message: `\`${s.name}\` first bound here` }]);
          bindable = false;
        }
        // Evaluate as whatever it is (any dimension), then bind the raw value.
        const raw = anyValue(s.value, ev, cache, ctx);
        if (bindable) {
          nameList = undefined;
          names[s.name] = { line: s.line, range: s.nameRange, ...raw.info, display: raw.info?.display ?? '?' };
          if (raw.value !== undefined) ctx.scope.set(s.name, raw.value);
          if (raw.info?.dimension === 'fraction') (ctx.percentNames ??= new Set()).add(s.name);
        }
        break;
      }
      case 'run': {
        current = { name: s.name.value, line: s.line, range: s.name.range, motions: [] };
        runs.push(current);
        break;
      }
      default: {
        if (!current) {
          current = { name: setup.title, line: s.line, range: s.range, motions: [], implicit: true };
          runs.push(current);
        }
        current.motions.push(evaluateMotion(s, ev, evFull, evPoint));
      }
    }
  }

  function positive(v: number, e: ExprNode, what: string, example: string): boolean {
    if (v > 0) return true;
    report(e.range, 'error', 'setup', `${what} must be greater than zero (it is ${fmt(v, 1)}), e.g. \`${example}\`.`);
    return false;
  }

  if (robot.track !== undefined && robot.effectiveTrack === undefined) robot.effectiveTrack = robot.track;

  const solved = solveRuns(runs, setup, diagnostics, { simulate: options.simulate !== false });
  options.onProgress?.(1);

  diagnostics.sort(compareDiagnostics);
  // Every message reads as a sentence (a message that opens with quoted plan text keeps it as written).
  for (const d of diagnostics) d.message = sentenceCase(d.message);
  const result: CheckResult = { ast, setup, runs: solved, diagnostics, names, values };
  attachFixes(result, text);
  return result;
}

function refuseTooLarge(text: string): CheckResult {
  return emptyResult(`this file has ${(text.length / 1e6).toFixed(1)} million characters, more than the ${MAX_PLAN_CHARS / 1e6} million a plan may have; it was not checked. Split it into several plans.`);
}

function emptyResult(message: string): CheckResult {
  const range = { start: { line: 0, character: 0 }, end: { line: 0, character: 0 } };
  return {
    ast: { statements: [], lineCount: 0 },
    setup: {
      title: 'plan', lengthUnit: 'mm', turns: 'clockwise', yawRange: { ...DEFAULTS.yawRange }, robot: {},
      noise: { ...DEFAULTS.noise }, gyro: { ...DEFAULTS.gyro }, obstacles: [], zones: [],
    },
    runs: [],
    diagnostics: [{ range, severity: 'error', code: 'syntax', message }],
    names: {},
    values: [],
  };
}

function anyValue(
  expr: ExprNode | undefined, ev: (e: ExprNode | undefined, x: Expected) => number | undefined,
  cache: ExpressionCache, ctx: EvalContext,
): { value?: number | import('mathjs').Unit; info?: Omit<NameInfo, 'line' | 'range'> } {
  if (!expr) return {};
  // A name may hold any of the plan's kinds of value: the first that fits names it.
  const kinds: Expected[] = ['number', 'length', 'angle', 'time', 'power|speed', 'angularSpeed', 'acceleration'];
  for (const k of kinds) {
    const out = evaluateExpr(cache, expr.text, k, ctx);
    if (out.ok || out.code !== 'unit') {
      ev(expr, k); // records the value for hovers, or reports the problem
      if (!out.ok) return {};
      return { value: out.raw, info: { value: out.value, dimension: out.dimension, display: displayValue(out.value, out.dimension, ctx.lengthUnit) } };
    }
  }
  ev(expr, 'number');
  return {};
}

function evaluateMotion(
  s: MotionStmt,
  ev: (e: ExprNode | undefined, x: Expected) => number | undefined,
  evFull: (e: ExprNode | undefined, x: Expected) => { value: number; dimension: Dimension } | undefined,
  evPoint: (p: PointNode | undefined) => Point | undefined,
): EvaluatedMotion {
  switch (s.kind) {
    case 'start':
      return { stmt: s, at: evPoint(s.at), heading: ev(s.heading, 'angle') };
    case 'drive': {
      const speed = evFull(s.speed, 'power|speed');
      return {
        stmt: s, distance: ev(s.distance, 'length'), speed: speed?.value,
        speedIsLinear: speed?.dimension === 'speed',
        hold: ev(s.hold, 'angle'), gain: ev(s.gain, 'gain'), ramp: ev(s.ramp, 'acceleration'),
      };
    }
    case 'turn':
      return {
        stmt: s, angle: ev(s.angle, 'angle'), to: ev(s.to, 'angle'),
        radius: s.shape.kind === 'arc' ? ev(s.shape.radius, 'length') : undefined,
        ratio: s.shape.kind === 'ratio' ? ev(s.shape.ratio, 'fraction') : undefined,
        speed: ev(s.speed, 'fraction'), min: ev(s.min, 'fraction'), gain: ev(s.gain, 'gain'), stop: ev(s.stop, 'angle'),
      };
    case 'square':
      return { stmt: s, speed: ev(s.speed, 'fraction') };
    case 'wait':
      return { stmt: s, time: ev(s.time, 'time') };
    case 'mark':
      return { stmt: s, at: evPoint(s.at), heading: ev(s.heading, 'angle'), within: ev(s.within, 'length'), level: ev(s.level, 'fraction') };
    case 'resetYaw':
      return { stmt: s };
  }
}

/** Narrows a diagnostic to the unknown name inside an expression, when there is one. */
function narrowTo(expr: ExprNode, name: string | undefined): Range {
  if (!name || expr.range.start.line !== expr.range.end.line) return expr.range;
  // The first whole-word occurrence (a plain search: no pattern is built from plan text).
  const isWordChar = (c: string | undefined) => c !== undefined && /[\p{L}\p{N}_$]/u.test(c);
  for (let at = expr.text.indexOf(name); at >= 0; at = expr.text.indexOf(name, at + 1)) {
    if (isWordChar(expr.text[at - 1]) || isWordChar(expr.text[at + name.length])) continue;
    const col = expr.range.start.character + at;
    return { start: { line: expr.range.start.line, character: col }, end: { line: expr.range.start.line, character: col + name.length } };
  }
  return expr.range;
}

function sentenceCase(message: string): string {
  const first = message.charAt(0);
  return first >= 'a' && first <= 'z' ? first.toUpperCase() + message.slice(1) : message;
}

export function compareDiagnostics(a: Diagnostic, b: Diagnostic): number {
  return a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character;
}
