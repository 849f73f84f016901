// A recorded run (robot model, section 5) after import: the shapes the log reader
// produces and the reconstruction, the comparison and the fit read.

/** One row of a recorded run, in Veer's units, after the log's own units are converted. */
export interface RecordedSample {
  /** Seconds since the log's first row. */
  t: number;
  /** Left and right wheel travel since the log's first row, in mm (signed; forward positive). */
  left: number;
  right: number;
  /**
   * The yaw reading in degrees, in the plan's yaw convention (the sign and range the plan's
   * `yaw` setup gives), or undefined where the log has no yaw column.
   */
  yaw?: number;
  /** Commanded powers as fractions in [-1, 1], where the log has them. */
  powerLeft?: number;
  powerRight?: number;
  /** The 1-based plan line being executed, where the log has that column. */
  line?: number;
}

/** A whole recorded run: its rows in time order, and what the log had. */
export interface RecordedRun {
  samples: RecordedSample[];
  hasYaw: boolean;
  hasPower: boolean;
  hasLine: boolean;
  /** Where the log came from, for messages (a file name). */
  source: string;
  /** The file's 1-based line of each sample, for messages (set by the reader). */
  fileLines?: number[];
  /** The 1-based column of each quantity in the file, for messages (set by the reader). */
  columns?: { time?: number; left?: number; right?: number; yaw?: number; powerLeft?: number; powerRight?: number; line?: number };
}
