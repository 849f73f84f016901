// What may be written where, for completion. Mirrors sections 3-5 of the plan
// language; kept apart from the parser so editor help can be offered on lines
// the parser rejects (a half-typed line is the normal case while typing).

export interface StatementWords {
  keyword: string;
  /** Setup, run structure or motion: drives the completion item's kind and sort order. */
  group: 'setup' | 'run' | 'motion';
  summary: string;
  /** Option names that may follow the statement's first value, in the order the spec lists them. */
  options: string[];
  /** Words that must come right after the keyword (a closed set). */
  firstWords?: string[];
  /** The statement has no value of its own: options follow the keyword at once (`noise`, `gyro`). */
  optionsOnly?: boolean;
  /** Words that must follow one of the options (a closed set), keyed by option. */
  optionWords?: Record<string, string[]>;
}

export const STATEMENTS: StatementWords[] = [
  { keyword: 'plan', group: 'setup', summary: 'title shown in the preview and reports', options: [] },
  { keyword: 'units', group: 'setup', summary: 'unit of bare lengths', options: [], firstWords: ['mm', 'cm', 'm', 'in'] },
  { keyword: 'turns', group: 'setup', summary: 'positive direction of headings and turns', options: [], firstWords: ['clockwise', 'counterclockwise'] },
  { keyword: 'yaw range', group: 'setup', summary: "the yaw sensor's output interval (360 wide)", options: ['to'] },
  { keyword: 'wheel', group: 'setup', summary: 'wheel diameter; `mismatch` for right over left', options: ['mismatch'] },
  { keyword: 'track', group: 'setup', summary: 'distance between the wheels; `effective` for calibrated turns', options: ['effective'] },
  { keyword: 'gear', group: 'setup', summary: 'motor degrees per wheel degree', options: [] },
  { keyword: 'motor', group: 'setup', summary: 'motor speed at 100 % power, its lag, and the power below which the wheels stall', options: ['lag', 'stall'] },
  { keyword: 'gyro', group: 'setup', summary: "the yaw sensor as the control loop reads it: sample period, delay, scale", options: ['sample', 'delay', 'scale'], optionsOnly: true },
  { keyword: 'body', group: 'setup', summary: 'robot footprint: width by length', options: ['by', 'axle'] },
  { keyword: 'field', group: 'setup', summary: 'field size and grid spacing', options: ['by', 'grid'] },
  { keyword: 'box', group: 'setup', summary: 'a rectangular obstacle', options: ['to'] },
  { keyword: 'circle', group: 'setup', summary: 'a round obstacle', options: ['radius'] },
  { keyword: 'zone', group: 'setup', summary: 'a named area (not an obstacle)', options: ['to'] },
  { keyword: 'noise', group: 'setup', summary: 'error model', options: ['drive', 'turn', 'gyro', 'drift', 'wheel'], optionsOnly: true },
  { keyword: 'limit', group: 'setup', summary: 'time allowed for each run', options: [] },
  { keyword: 'let', group: 'setup', summary: 'bind a name to a value', options: [] },
  { keyword: 'run', group: 'run', summary: 'begin a run', options: [] },
  { keyword: 'start', group: 'motion', summary: 'starting pose of the run', options: ['heading'] },
  { keyword: 'drive', group: 'motion', summary: 'straight drive of a signed length', options: ['speed', 'hold', 'step', 'gain', 'ramp'] },
  {
    keyword: 'turn', group: 'motion', summary: 'turn by an angle, or `turn to` a yaw reading',
    options: ['spin', 'pivot', 'arc', 'ratio', 'reverse', 'by', 'speed', 'min', 'gain', 'stop', 'ramp', 'reset'],
    optionWords: { pivot: ['left', 'right'], by: ['encoders', 'gyro'] },
  },
  { keyword: 'reset yaw', group: 'motion', summary: 'the yaw sensor reads 0 from here on', options: [] },
  { keyword: 'square', group: 'motion', summary: 'drive until an edge meets a wall, ending square to it', options: ['speed'], firstWords: ['front', 'back'] },
  { keyword: 'wait', group: 'motion', summary: 'stand still for a time', options: [] },
  { keyword: 'mark', group: 'motion', summary: 'a named checkpoint', options: ['at', 'heading', 'within', 'in', 'level'] },
];

/** Options of which only one may be written on a line (a turn's shape). */
export const EXCLUSIVE_OPTIONS: string[][] = [['spin', 'pivot', 'arc', 'ratio']];

/** Options that only make sense after one of some other options. */
export const OPTION_REQUIRES: Record<string, string[]> = { step: ['hold'], reverse: ['arc', 'ratio'] };

export interface UnitWord {
  name: string;
  dimension: string;
}

export const UNITS: UnitWord[] = [
  { name: 'mm', dimension: 'length' },
  { name: 'cm', dimension: 'length' },
  { name: 'm', dimension: 'length' },
  { name: 'in', dimension: 'length' },
  { name: 'deg', dimension: 'angle' },
  { name: 'rad', dimension: 'angle' },
  { name: 's', dimension: 'time' },
  { name: 'ms', dimension: 'time' },
  { name: 'min', dimension: 'time' },
  { name: '%', dimension: 'fraction' },
  { name: 'mm/s', dimension: 'speed' },
  { name: 'cm/s', dimension: 'speed' },
  { name: 'm/s', dimension: 'speed' },
  { name: 'deg/s', dimension: 'angular speed' },
  { name: 'deg/min', dimension: 'angular speed' },
  { name: 'rpm', dimension: 'angular speed' },
  { name: 'mm/s^2', dimension: 'acceleration' },
];
