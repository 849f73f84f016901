// Plain data shared by every part of the core and by its users (command line,
// editor adapters, preview, tests). Nothing here depends on an editor, the DOM
// or the file system.

/** A position in the document: 0-based line and 0-based UTF-16 column. */
export interface Pos {
  line: number;
  character: number;
}

/** A half-open range [start, end) in the document. */
export interface Range {
  start: Pos;
  end: Pos;
}

// ---------------------------------------------------------------------------
// Syntax tree

/** The source text of one math.js expression, kept verbatim. */
export interface ExprNode {
  kind: 'expr';
  text: string;
  range: Range;
}

export interface PointNode {
  kind: 'point';
  x: ExprNode;
  y: ExprNode;
  range: Range;
}

export interface StringNode {
  kind: 'string';
  /** The unescaped value. */
  value: string;
  range: Range;
}

/** A bare word taken from a closed set (a unit name, `left`, `clockwise`, ...). */
export interface WordNode<T extends string = string> {
  kind: 'word';
  value: T;
  range: Range;
}

interface StatementBase {
  /** 0-based line of the statement. */
  line: number;
  /** From the first keyword to the end of the last token (comments excluded). */
  range: Range;
  /** The leading keyword (for `reset yaw`, `yaw range`, `turn to`: both words). */
  keywordRange: Range;
  /**
   * Range of each option written on the line, from the option's name to the end
   * of its value, keyed by option name (`speed`, `hold`, `step`, `pivot`, ...).
   * Editor features use it to place edits; checks use it to point at a value.
   */
  optionRanges: Record<string, Range>;
}

export type LengthUnitName = 'mm' | 'cm' | 'm' | 'in';

export interface PlanStmt extends StatementBase { kind: 'plan'; title: StringNode }
export interface UnitsStmt extends StatementBase { kind: 'units'; unit: WordNode<LengthUnitName> }
export interface TurnsStmt extends StatementBase { kind: 'turns'; direction: WordNode<'clockwise' | 'counterclockwise'> }
export interface YawRangeStmt extends StatementBase { kind: 'yawRange'; lo: ExprNode; hi: ExprNode }
export interface WheelStmt extends StatementBase { kind: 'wheel'; diameter: ExprNode; mismatch?: ExprNode }
export interface TrackStmt extends StatementBase { kind: 'track'; width: ExprNode; effective?: ExprNode }
export interface GearStmt extends StatementBase { kind: 'gear'; ratio: ExprNode }
export interface MotorStmt extends StatementBase { kind: 'motor'; speed: ExprNode; lag?: ExprNode; stall?: ExprNode }
export interface BodyStmt extends StatementBase { kind: 'body'; width: ExprNode; length: ExprNode; axle?: ExprNode }
export interface FieldStmt extends StatementBase { kind: 'field'; width: ExprNode; height: ExprNode; grid?: ExprNode }
export interface BoxStmt extends StatementBase { kind: 'box'; name: StringNode; a: PointNode; b: PointNode }
export interface CircleStmt extends StatementBase { kind: 'circle'; name: StringNode; center: PointNode; radius: ExprNode }
export interface ZoneStmt extends StatementBase { kind: 'zone'; name: StringNode; a: PointNode; b: PointNode }
export interface NoiseStmt extends StatementBase {
  kind: 'noise';
  drive?: ExprNode;
  turn?: ExprNode;
  gyro?: ExprNode;
  drift?: ExprNode;
  wheel?: ExprNode;
  square?: ExprNode;
  across?: ExprNode;
}
/** `gyro [sample T] [delay T] [scale F]`: the yaw sensor as the robot's control loop reads it (at least one option). */
export interface GyroStmt extends StatementBase { kind: 'gyro'; sample?: ExprNode; delay?: ExprNode; scale?: ExprNode }
export interface LimitStmt extends StatementBase { kind: 'limit'; time: ExprNode }
export interface LetStmt extends StatementBase { kind: 'let'; name: string; nameRange: Range; value: ExprNode }

export interface RunStmt extends StatementBase { kind: 'run'; name: StringNode }
export interface StartStmt extends StatementBase { kind: 'start'; at: PointNode; heading: ExprNode }

export interface DriveStmt extends StatementBase {
  kind: 'drive';
  distance: ExprNode;
  speed?: ExprNode;
  hold?: ExprNode;
  step: boolean;
  gain?: ExprNode;
  ramp?: ExprNode;
}

export type TurnShapeNode =
  | { kind: 'spin' }
  | { kind: 'pivot'; side: 'left' | 'right' }
  | { kind: 'arc'; radius: ExprNode }
  | { kind: 'ratio'; ratio: ExprNode };

export interface TurnStmt extends StatementBase {
  kind: 'turn';
  /** `turn A`: the signed angle. Exactly one of `angle` and `to` is set. */
  angle?: ExprNode;
  /** `turn to H`: the yaw reading to reach. */
  to?: ExprNode;
  shape: TurnShapeNode;
  reverse: boolean;
  sensing: 'encoders' | 'gyro';
  speed?: ExprNode;
  min?: ExprNode;
  gain?: ExprNode;
  stop?: ExprNode;
  ramp: boolean;
  reset: boolean;
}

export interface ResetYawStmt extends StatementBase { kind: 'resetYaw' }
export interface SquareStmt extends StatementBase { kind: 'square'; side: 'front' | 'back'; speed?: ExprNode }
export interface WaitStmt extends StatementBase { kind: 'wait'; time: ExprNode }
export interface MarkStmt extends StatementBase {
  kind: 'mark';
  name: StringNode;
  at?: PointNode;
  heading?: ExprNode;
  within?: ExprNode;
  inZone?: StringNode;
  /** The share of runs that must meet the mark (`level P`; 95 % when absent). */
  level?: ExprNode;
}

export type SetupStmt =
  | PlanStmt | UnitsStmt | TurnsStmt | YawRangeStmt | WheelStmt | TrackStmt | GearStmt
  | MotorStmt | BodyStmt | FieldStmt | BoxStmt | CircleStmt | ZoneStmt | NoiseStmt
  | GyroStmt | LimitStmt | LetStmt;

export type MotionStmt =
  | StartStmt | DriveStmt | TurnStmt | ResetYawStmt | SquareStmt | WaitStmt | MarkStmt;

export type Statement = SetupStmt | RunStmt | MotionStmt;

export interface PlanAst {
  /** Statements in file order; lines that could not be read are absent. */
  statements: Statement[];
  /** Number of lines in the document. */
  lineCount: number;
}

// ---------------------------------------------------------------------------
// Diagnostics

export type Severity = 'error' | 'warning' | 'information';

export type DiagnosticCode =
  | 'syntax' | 'unit' | 'name' | 'setup'
  | 'wrap-cross' | 'wrap-edge' | 'long-way' | 'heading-jump'
  | 'off-field' | 'collision' | 'no-wall' | 'over-time' | 'miss'
  /** From the controller simulation: past the stop band, stopped short for want of power, or never ending. */
  | 'overshoot' | 'stall' | 'endless'
  /** Information only: something drawn or timed approximately (e.g. `hold ... step`). */
  | 'approximate';

/** A text edit in the plan document. */
export interface TextEdit {
  range: Range;
  newText: string;
}

/** A fix the editor can offer as a quick fix; applied as one undoable edit. */
export interface Fix {
  title: string;
  edits: TextEdit[];
  /** The fix the user most likely wants. */
  preferred?: boolean;
  /** The fix changes the robot's path on purpose (its title says how). */
  changesPath?: boolean;
  /** Needs no choice by a person (a wrongly cased keyword): `veer fix` applies it. */
  safe?: boolean;
}

export interface RelatedInfo {
  range: Range;
  message: string;
}

export interface Diagnostic {
  range: Range;
  severity: Severity;
  code: DiagnosticCode;
  message: string;
  related?: RelatedInfo[];
  fixes?: Fix[];
  /** Where in the field the problem happens, for markers in the drawing. */
  at?: Point;
  /** Where the robot is when the problem starts (a collision's first contact), for drawing its footprint there. */
  pose?: Pose;
}

// ---------------------------------------------------------------------------
// Model: robot and field, with every quantity in canonical units
// (mm, degrees, seconds, fractions 0..1).

export interface Point {
  x: number;
  y: number;
}

export type TurnDirection = 'clockwise' | 'counterclockwise';

export interface Robot {
  wheelDiameter: number;
  track: number;
  effectiveTrack: number;
  gear: number;
  /** Motor speed at 100 % power, degrees per second of motor shaft. */
  motorSpeed: number;
  /** First-order time constant of the motor, seconds. */
  motorLag: number;
  /** Below this power (fraction) the wheels do not move: static friction (`motor ... stall P`). */
  stall: number;
  /** Right wheel diameter over left wheel diameter (`wheel D mismatch E`). */
  mismatch: number;
  /** Footprint rectangle; absent when the plan has no `body` (a circle of diameter = track is used). */
  body?: { width: number; length: number; axle: number };
}

export interface NoiseModel {
  drive: number;
  turn: number;
  gyro: number;
  /** degrees per second */
  drift: number;
  /** Random wheel travel error, mm: variance wheel·|travel| per wheel (`noise wheel K`; the robot model's 0.01 mm when absent). */
  wheel?: number;
  /** After a `square`: sd of the heading (degrees) and of the position across the wall (mm) (`noise square A [across D]`). */
  square?: number;
  squareAcross?: number;
}

export interface Obstacle {
  kind: 'box' | 'circle';
  name: string;
  line: number;
  /** box: min and max corners. */
  min?: Point;
  max?: Point;
  /** circle */
  center?: Point;
  radius?: number;
}

export interface Zone {
  name: string;
  line: number;
  min: Point;
  max: Point;
}

export interface Field {
  width: number;
  height: number;
  grid: number;
}

/** The yaw sensor as the robot's control loop sees it (`gyro sample T delay T scale F`). */
export interface GyroModel {
  /** The control loop's sample period, seconds. */
  sample: number;
  /** How late the reading is, seconds. */
  delay: number;
  /** Reading = scale × true angle turned. */
  scale: number;
}

export interface PlanSetup {
  title: string;
  lengthUnit: LengthUnitName;
  turns: TurnDirection;
  yawRange: { lo: number; hi: number };
  robot: Partial<Robot>;
  noise: NoiseModel;
  gyro: GyroModel;
  field?: Field;
  obstacles: Obstacle[];
  zones: Zone[];
  /** Time allowed for each run, seconds. */
  limit?: number;
}

// ---------------------------------------------------------------------------
// Solved runs

/**
 * A pose of the axle midpoint. `heading` is the field heading in degrees,
 * unwrapped (cumulative), positive in the file's `turns` direction.
 */
export interface Pose {
  x: number;
  y: number;
  heading: number;
}

/**
 * One piece of the path of the axle midpoint, in a form both the footprint
 * sweep and the renderer use.
 * - `line`: straight from `from` to `to`; heading stays `heading`
 *   (driving backwards when the robot moves against its heading).
 * - `rotate`: rigid rotation of the robot about `center` by `turned` degrees
 *   (positive in the file's `turns` direction), starting at pose `from`.
 *   A spin has its centre at the axle midpoint; a pivot at the still wheel; an
 *   arc at the turn centre.
 */
export type PathPiece =
  | { type: 'line'; from: Pose; to: Pose }
  | { type: 'rotate'; from: Pose; to: Pose; center: Point; turned: number };

export type SegmentKind = 'start' | 'drive' | 'turn' | 'reset' | 'square' | 'wait' | 'mark';
export type TurnShape = 'spin' | 'pivot left' | 'pivot right' | 'arc';

export interface WheelPair {
  left: number;
  right: number;
}

/** The pose's spread at a segment's end: covariance (mm, degrees, field frame), its 95 % ellipse and the heading's standard deviation. */
export interface SegmentSpread {
  cov: [[number, number, number], [number, number, number], [number, number, number]];
  ellipse95: { a: number; b: number; tilt: number };
  headingSd: number;
}

/** What the controller simulation predicts for one motion (the robot model, section 2). */
export interface Prediction {
  /** Predicted start time from the run's start, s. */
  start: number;
  /** Time until the robot's code moves on to the next line, s (Infinity: never). */
  duration: number;
  /** Where the robot really is when the code moves on (the next motion starts here). */
  end: Pose;
  /** The yaw reading then, wrapped as the sensor reports it. */
  reading: number;
  /** Gyro turns: signed degrees past the target once the wheels have coasted to rest (positive: beyond it). */
  overshoot?: number;
  /** Gyro turns: time until the reading entered the stop band, s. */
  settle?: number;
  /** Largest turning rate, deg/s. */
  peakRate: number;
  /** The motion stopped before its end because a wheel's power was below the stall power. */
  stalled?: boolean;
  /** The motion hit the 20 s cap of simulated time. */
  capped?: boolean;
  /**
   * Set where the predicted path differs from the planned one by more than
   * 2 mm or 0.5°: the box the axle midpoint passes through (the pieces come
   * from `predictedPath(segment)`, worked out on first use).
   */
  bounds?: { minX: number; minY: number; maxX: number; maxY: number };
}

export interface Segment {
  /** 0-based line of the statement. */
  line: number;
  kind: SegmentKind;
  shape?: TurnShape;
  sensing?: 'gyro' | 'encoders';
  start: Pose;
  end: Pose;
  /** Signed angle turned, degrees, positive in the file's `turns` direction. */
  turned: number;
  /** A turn written with `reset`: the yaw reads zero just before it. */
  zeroesYaw?: boolean;
  /** A `hold` drive's change of heading as the statement asks for it (its curve may end a little short of it). */
  asked?: number;
  /** Yaw readings (wrapped into the sensor range) before and after. */
  yawStart: number;
  yawEnd: number;
  /** The reading the robot's code steers to, for gyro-referenced segments. */
  yawTarget?: number;
  /** Radius of the axle midpoint's path (0 spin, W/2 pivot); absent for straight drives. */
  radius?: number;
  /** Centre of rotation for pivots and arcs (and spins: the axle midpoint). */
  center?: Point;
  wheelDeg?: WheelPair;
  motorDeg?: WheelPair;
  /** Estimated time in seconds. */
  duration: number;
  /** Top power commanded (fraction of full power), for drives, turns and squares. */
  power?: number;
  /** Lowest power of a gyro or ramped turn (fraction). */
  minPower?: number;
  /** Wheel surface speed at the top power, mm/s. */
  wheelSpeed?: number;
  /** Distance travelled by the axle midpoint, mm (unsigned). */
  distance: number;
  path: PathPiece[];
  /** False when some value of the statement could not be computed. */
  complete: boolean;
  /** Name of a `mark`, for the drawing and the outline. */
  label?: string;
  /** The controller simulation's prediction; absent when the motion could not be simulated (an earlier motion never ends, or a value is missing). */
  predicted?: Prediction;
  /** Where the robot really ends up: the pose's spread at the end of the segment (robot model, section 3). */
  spread?: SegmentSpread;
  /** A `mark`: the probability of meeting it (inside its zone, or within `within` of its point). */
  hitProbability?: number;
  /** A `mark` with a zone or a point: what it asks for. */
  markTarget?: import('./spread/gaussian').MarkTarget;
}

export interface RunResult {
  name: string;
  /** 0-based line of `run` (or of the first motion of an implicit run). */
  line: number;
  /** Range of the run's name (or its first statement) for the outline. */
  range: Range;
  segments: Segment[];
  duration: number;
  distance: number;
  turns: number;
  wrapCrossings: number;
  /** Predicted seconds for the whole run (Infinity when a motion never ends); undefined when not simulated. */
  predictedDuration?: number;
}

export interface CheckResult {
  ast: PlanAst;
  setup: PlanSetup;
  runs: RunResult[];
  /** Sorted by position. */
  diagnostics: Diagnostic[];
  /** Values of `let` names in canonical units, for hovers. */
  names: Record<string, NameInfo>;
  /** Every expression that was evaluated, in file order, for hovers on values. */
  values: EvaluatedExpr[];
}

export interface EvaluatedExpr {
  range: Range;
  /** Canonical value: mm, degrees, seconds, mm/s, deg/s, mm/s^2, or a fraction 0..1. */
  value: number;
  dimension: Dimension;
  /** The value in the file's units, e.g. "75 cm" or "90°" or "60 %". */
  display: string;
}

export interface NameInfo {
  line: number;
  range: Range;
  /** Canonical value (mm, deg, s, fraction...) */
  value?: number;
  dimension?: Dimension;
  /** Human-readable value as written after evaluation, e.g. "250 mm". */
  display: string;
}

/** Dimensions the plan language knows. */
export type Dimension =
  | 'number' | 'length' | 'angle' | 'time' | 'speed' | 'angularSpeed' | 'acceleration' | 'fraction';
