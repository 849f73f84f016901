// The yaw reading wrapped into the sensor's range: the shortcut for a value
// already inside it must give exactly what the defining formula gives, bit for
// bit (-0, the two ends, the neighbours of each end), since every sample of
// the controller simulation goes through it.
import { strict as assert } from 'node:assert';
import { wrapReading } from '../../src/core/solve/frame';

/**
 * The defining formula, as the robot model writes it: value − 360·⌊(value − lo)/360⌋,
 * moved down by 360 where rounding lands on the open end lo + 360.
 */
function byFormula(value: number, lo: number): number {
  const r = value - 360 * Math.floor((value - lo) / 360);
  return r >= lo + 360 ? r - 360 : r;
}

/** The next double above and below `x`. */
function neighbours(x: number): number[] {
  const buf = new DataView(new ArrayBuffer(8));
  const out: number[] = [];
  for (const step of [1n, -1n]) {
    buf.setFloat64(0, x);
    const bits = buf.getBigInt64(0);
    buf.setBigInt64(0, x >= 0 ? bits + step : bits - step);
    out.push(buf.getFloat64(0));
  }
  return out;
}

describe('wrapReading', () => {
  const ranges = [-180, 0, -90, -179.5, 12.345678, -360];

  it('gives exactly the defining formula at the ends of the range, their neighbouring doubles, and -0', () => {
    for (const lo of ranges) {
      const values = [0, -0, lo, lo + 360, lo + 180, lo - 360, lo + 720, 1e-320, -1e-320];
      for (const v of [lo, lo + 360, 0]) values.push(...neighbours(v));
      for (const v of values) {
        // Expected: the formula above (Object.is tells -0 from 0).
        assert.ok(Object.is(wrapReading(v, lo), byFormula(v, lo)), `wrapReading(${v}, ${lo})`);
      }
    }
  });

  it('gives exactly the defining formula on many values in and out of the range, and on NaN and the infinities', () => {
    let seed = 12345;
    const next = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (const lo of ranges) {
      for (const v of [NaN, Infinity, -Infinity]) assert.ok(Object.is(wrapReading(v, lo), byFormula(v, lo)));
      for (let i = 0; i < 20_000; i++) {
        const v = (next() - 0.5) * [1, 400, 800, 1e4][i % 4];
        // Expected: the formula above.
        assert.ok(Object.is(wrapReading(v, lo), byFormula(v, lo)), `wrapReading(${v}, ${lo})`);
      }
    }
  });

  it('reads a value inside the range as itself and one full turn out as the same reading', () => {
    // Hand calculation: 190 − 360·⌊(190 + 180)/360⌋ = 190 − 360 = −170; 45 lies inside [−180, 180).
    assert.equal(wrapReading(190, -180), -170);
    assert.equal(wrapReading(45, -180), 45);
    // The open end belongs to the other side: 180 − 360·⌊360/360⌋ = −180.
    assert.equal(wrapReading(180, -180), -180);
  });
});
