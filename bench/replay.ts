// The recorded-run benchmark: reading a 100,000-row log (seven columns: time,
// both wheels in degrees, yaw, both powers, plan line) and reconstructing its
// path by the wheels and by wheels plus yaw. Target: at most 300 ms.
import { readLog } from '../src/core/record/log';
import { reconstruct } from '../src/core/record/odometry';
import { round } from './stats';
import { medianTime } from './timing';

export const REPLAY_TARGET_MS = 300;

/** A log of `rows` samples, 10 ms apart, of a robot weaving along (the yaw agrees with the wheels). */
export function syntheticLog(rows: number): string {
  const out = ['time_s,left_deg,right_deg,yaw_deg,power_left_pct,power_right_pct,line'];
  const degPerMm = 360 / (Math.PI * 56);
  let left = 0;
  let right = 0;
  for (let i = 0; i < rows; i++) {
    const t = i * 0.01;
    const weave = 40 * Math.sin(t * 0.7);
    const vl = 250 + weave;
    const vr = 250 - weave;
    left += vl * 0.01;
    right += vr * 0.01;
    const heading = ((left - right) / 160) * (180 / Math.PI);
    const yaw = heading - 360 * Math.floor((heading + 180) / 360);
    out.push(`${t.toFixed(2)},${(left * degPerMm).toFixed(1)},${(right * degPerMm).toFixed(1)},${yaw.toFixed(2)},${(vl / 5).toFixed(1)},${(vr / 5).toFixed(1)},${10 + Math.floor(i / 1000)}`);
  }
  return out.join('\n') + '\n';
}

/** Median milliseconds of reading and reconstructing a 100,000-row log. */
export function replayFigures(): { replay_100k_ms: number } {
  const text = syntheticLog(100_000);
  const robot = { wheelDiameter: 56, mismatch: 1, yawLo: -180 };
  const once = () => {
    const { run } = readLog(text, 'bench.csv', robot);
    reconstruct(run, { x: 0, y: 0, heading: 0 }, { track: 160, turns: 'clockwise', gyroScale: 1 });
  };
  return { replay_100k_ms: round(medianTime(once, 3, 9)) };
}
