// The yaw reading as the plan means it.
//
// The robot's code sees the sensor's reading, wrapped into [lo, hi). While no
// gyro target has crossed the wrap point, the plan means exactly that reading.
// A target outside the range is an error (the real robot spins on). Where a
// reset at that motion would bring its target into range, the plan is read
// from there as its author wrote it: as if the sensor did not wrap, until the
// reading it means is back inside the range or zeroed. That is what the
// error's fix (a reset at the crossing, later absolute targets rewritten)
// makes true, so the drawn path, the later
// targets and the later checks all describe the run the plan means, and one
// crossing does not turn into a cascade of swerves and follow-on errors.
//
// The same tracker replays a run with other zero points: the fix engine uses
// it to rewrite `turn to` and `hold` targets so the path stays the same.
import { wrapReading } from './frame';

export class YawReadings {
  /** Field heading at which the sensor was zeroed. */
  private ref = 0;
  private tainted = false;
  private taintReading = 0;
  private taintHeading = 0;

  constructor(readonly lo: number, readonly hi: number) {}

  /** The reading just after a zero (0 wrapped into the range: -360 for `yaw range -360 to 0`). */
  get zeroReading(): number {
    return wrapReading(0, this.lo);
  }

  inRange(target: number): boolean {
    return target >= this.lo && target < this.hi;
  }

  /** Within `edge` degrees of either end of the range, where sensor noise flips the reading. */
  nearWrapPoint(target: number, edge: number): boolean {
    return target - this.lo <= edge || this.hi - target <= edge;
  }

  /** `start`, `reset yaw`, or a turn's `reset`: the sensor reads zero at this heading. */
  zero(heading: number): void {
    this.ref = heading;
    this.tainted = false;
  }

  /**
   * At the end of every motion: once the reading the plan means is back
   * inside the range it is the sensor's own again (the two differ by whole
   * turns only), and the plan is read as the robot reads it.
   */
  settle(heading: number): void {
    if (this.tainted && this.inRange(this.reading(heading))) this.tainted = false;
  }

  /** The reading the plan means at a heading: the sensor's, or unwrapped after a crossing. */
  reading(heading: number): number {
    return this.tainted ? this.taintReading + (heading - this.taintHeading) : wrapReading(heading - this.ref, this.lo);
  }

  /** What the sensor reports at a heading. */
  sensor(heading: number): number {
    return wrapReading(heading - this.ref, this.lo);
  }

  /** Whether absolute targets are read as the change nearest zero here (after a crossing, reading out of range). */
  nearestChange(heading: number): boolean {
    return this.tainted && !this.inRange(this.reading(heading));
  }

  /**
   * The change of heading an absolute target (`turn to H`, `hold H`) means
   * from this heading. On the sensor's own reading it is the code's raw error
   * H − reading (long way round included); after a crossing, where the author
   * counts unwrapped, the equivalent change nearest zero.
   */
  absoluteChange(target: number, heading: number): number {
    const raw = target - this.reading(heading);
    return this.nearestChange(heading) ? shortWay(raw) : raw;
  }

  /**
   * A gyro motion from `heading` whose code aims at `target`: true when the
   * target lies outside the range (a crossing). Where a zero just before the
   * motion would bring the target into range, the plan is then read
   * unwrapped from here on (what that fix makes true); where no zero can (a
   * turn too big for the range by itself), its fix is an encoder turn, and
   * the sensor's own reading follows.
   */
  gyroMotion(target: number, heading: number): boolean {
    if (this.inRange(target)) return false;
    if (!this.inRange(this.zeroReading + target - this.reading(heading))) return true;
    if (!this.tainted) {
      this.taintReading = this.reading(heading);
      this.taintHeading = heading;
      this.tainted = true;
    }
    return true;
  }
}

/**
 * The same change of heading the short way round, in [-180, 180]. A half
 * turn either way keeps the sign of the change (within the rounding of
 * targets written with six decimals).
 */
export function shortWay(change: number): number {
  const c = wrapReading(change, -180);
  if (180 - Math.abs(c) < 1e-6) return change > 0 ? 180 : -180;
  return c;
}
