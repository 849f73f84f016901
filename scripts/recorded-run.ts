// Writes examples/parcel-table.log.csv (and the real-editor test's copies of the
// plan and the log in test/editor/workspace/recorded-check.*): a recorded run of the demo plan made by
// Veer's own controller simulation, run on a "true" robot that differs from
// the plan's (smaller wheels, a wider track, unequal wheels, a slower and lazier
// motor, a gyro that reads a little high and drifts), with sensor noise. Not a
// real robot: the file's header says so.
//   node --import tsx scripts/recorded-run.ts
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan, type Pose } from '../src/core';
import { copyState, readingOf, restState, simRobot, simulateMotion, type SimMotion, type SimRobot, type SimState } from '../src/core/sim/motion';
import { simRecordOf, simRobotOf } from '../src/core/sim/run';

/** How the simulated "true" robot differs from the plan, and the noise on its sensors. */
export interface TrueRobot {
  /** True wheel diameter over the plan's (both wheels). */
  wheelScale: number;
  /** True right wheel over true left wheel. */
  mismatch: number;
  /** True effective track over the plan's. */
  trackScale: number;
  /** True full speed over the plan's. */
  speedScale: number;
  lag: number;
  stall: number;
  gyroScale: number;
  gyroDelay: number;
  /** Gyro drift, degrees per second. */
  drift: number;
  /** Standard deviations: the yaw reading's noise (deg) and the sample time's jitter (s). */
  yawNoise: number;
  timeJitter: number;
  /** Encoder resolution, wheel degrees per count. */
  encoderStep: number;
  /** Seconds logged at rest after the last motion. */
  tail: number;
  seed: number;
}

export const DEMO_TRUE_ROBOT: TrueRobot = {
  wheelScale: 0.99, mismatch: 1.008, trackScale: 1.02, speedScale: 0.95, lag: 0.1, stall: 0.07,
  gyroScale: 1.01, gyroDelay: 0.01, drift: 0.4 / 60, yawNoise: 0.05, timeJitter: 0.0003, encoderStep: 1, tail: 0.3, seed: 11,
};

interface Row { t: number; x: number; y: number; h: number; reading: number; uL: number; uR: number; line: number }

/** A seeded generator (mulberry32) and normal deviates (Box–Muller). */
function random(seed: number): { uniform: () => number; normal: () => number } {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  return { uniform, normal };
}

/**
 * Simulates run `runIndex` of the plan on the true robot, as the robot's code
 * runs it (the targets its code computes from the plan), and returns the log's
 * text and where the true robot ended.
 */
export function simulateLog(planText: string, fileName: string, truth: TrueRobot = DEMO_TRUE_ROBOT, runIndex = 0): { csv: string; trueEnd: Pose; rows: number } {
  const result = checkPlan(planText, { fileName });
  const nominal = simRobotOf(result.setup);
  if (!nominal) throw new Error('the plan needs a wheel and a track to be simulated');
  const diameter = result.setup.robot.wheelDiameter!;
  // Simulated in the left encoder's millimetres (the plan's wheel): the true path is these displacements times wheelScale.
  const robot: SimRobot = simRobot({
    ...nominal,
    fullSpeed: nominal.fullSpeed * truth.speedScale,
    lag: truth.lag,
    stall: truth.stall,
    mismatch: truth.mismatch,
    track: (nominal.track * truth.trackScale) / truth.wheelScale,
    scale: truth.gyroScale,
    delay: truth.gyroDelay,
  });
  const lines = planText.split(/\r\n|\n|\r/);
  const run = result.runs[runIndex];
  const rows: Row[] = [];
  let state: SimState | undefined;
  let line = 0;
  const sink = {
    row(s: SimState, reading: number, _target: number | null, uL: number, uR: number) {
      rows.push({ t: s.t, x: s.x, y: s.y, h: s.h, reading, uL, uR, line });
    },
  };
  for (const seg of run.segments) {
    // The robot's code logs the line it is executing: marks and resets take no time and never show.
    if (seg.kind !== 'mark' && seg.kind !== 'reset') line = seg.line + 1;
    if (seg.kind === 'start') {
      state = restState(seg.start.x, seg.start.y, seg.start.heading);
      continue;
    }
    if (!state) throw new Error('the run has no start');
    if (seg.kind === 'reset' || seg.zeroesYaw) state.zero = state.h;
    if (seg.kind === 'reset' || seg.kind === 'mark') continue;
    const record = simRecordOf(seg);
    if (!record) throw new Error(`line ${line} was not simulated`);
    let motion: SimMotion = record.motion;
    if (motion.kind === 'gyro-turn' && !/^\s*turn\s+to\b/.test(lines[seg.line])) {
      // `turn A by gyro`: the code adds A to the reading it has now.
      motion = { ...motion, target: readingOf(state, robot) + (motion.target - readingOf(record.state, record.robot)) };
    }
    const outcome = simulateMotion(state, robot, motion, sink);
    if (!outcome.finished) throw new Error(`line ${line} does not finish on the true robot`);
  }
  if (!state) throw new Error('the run has no start');
  // The logger runs on a moment after the last motion, the wheels coasting to rest.
  const end = state.t + truth.tail;
  const rest = copyState(state);
  while (rest.t < end) simulateMotion(rest, robot, { kind: 'wait', time: robot.sample }, sink);
  sink.row(rest, readingOf(rest, robot), null, 0, 0);

  const rnd = random(truth.seed);
  const sign = result.setup.turns === 'clockwise' ? 1 : -1;
  const RAD = Math.PI / 180;
  const start = run.segments[0].start;
  let encL = 0;
  let encR = 0;
  const degPerMm = 360 / (Math.PI * diameter);
  const out: string[] = [
    `# A recorded run of examples/parcel-table.veer, run "${run.name}".`,
    '# GENERATED by scripts/recorded-run.ts with Veer\'s own controller simulation: not a real robot.',
    `# The simulated "true" robot differs from the plan: wheels ${pct(truth.wheelScale)} of the plan's diameter, the right wheel`,
    `# ${pct(truth.mismatch)} of the left, the effective track ${pct(truth.trackScale)} of the plan's, full speed ${pct(truth.speedScale)},`,
    `# motor lag ${truth.lag * 1000} ms, stall ${Number((truth.stall * 100).toFixed(2))} %, gyro scale ${truth.gyroScale}, delay ${truth.gyroDelay * 1000} ms, drift ${(truth.drift * 60).toFixed(1)} deg/min.`,
    `# Noise: encoders in whole steps of ${truth.encoderStep} wheel degree, yaw reading sd ${truth.yawNoise} deg, sample time jitter sd ${truth.timeJitter * 1000} ms (seed ${truth.seed}).`,
    '# veer: yaw-sign=plan',
    'time_s,left_deg,right_deg,yaw_deg,power_left_pct,power_right_pct,line',
  ];
  let lastT = -Infinity;
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    if (i > 0) {
      // The wheels' travel over the step, from the two poses (the exact arc update run backwards).
      const p = rows[i - 1];
      const dTheta = (r.h - p.h) * RAD;
      const half = dTheta / 2;
      const mid = p.h * RAD + half;
      const chord = sign * Math.sin(mid) * (r.x - p.x) + Math.cos(mid) * (r.y - p.y);
      const ds = Math.abs(half) < 1e-9 ? chord : (chord * half) / Math.sin(half);
      const diff = (sign * dTheta * robot.track) / 2;
      encL += ds + diff;
      encR += (ds - diff) / robot.mismatch;
    }
    let t = r.t + truth.timeJitter * rnd.normal();
    if (t <= lastT) t = lastT + 1e-4;
    lastT = t;
    const yaw = r.reading + truth.drift * r.t + truth.yawNoise * rnd.normal();
    const q = (mm: number) => Math.round((mm * degPerMm) / truth.encoderStep) * truth.encoderStep;
    out.push([t.toFixed(4), q(encL), q(encR), yaw.toFixed(2), (r.uL * 100).toFixed(1), (r.uR * 100).toFixed(1), r.line].join(','));
  }
  const last = rows[rows.length - 1];
  const trueEnd = {
    x: start.x + truth.wheelScale * (last.x - start.x),
    y: start.y + truth.wheelScale * (last.y - start.y),
    heading: last.h,
  };
  out.splice(6, 0, `# Where the true robot came to rest: (${trueEnd.x.toFixed(1)}, ${trueEnd.y.toFixed(1)}) heading ${trueEnd.heading.toFixed(2)} deg.`);
  return { csv: out.join('\n') + '\n', trueEnd, rows: rows.length };
}

function pct(f: number): string {
  return `${Number((f * 100).toFixed(2))} %`;
}

if (require.main === module) {
  const root = join(__dirname, '..');
  const plan = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
  const { csv, rows, trueEnd } = simulateLog(plan, 'parcel-table.veer');
  writeFileSync(join(root, 'examples', 'parcel-table.log.csv'), csv);
  // The real-editor test's copies of the plan and its log.
  writeFileSync(join(root, 'test', 'editor', 'workspace', 'recorded-check.veer'), plan);
  writeFileSync(join(root, 'test', 'editor', 'workspace', 'recorded-check.log.csv'), csv);
  console.log(`wrote examples/parcel-table.log.csv and the editor test's copies (${rows} rows; the true robot ends at ${trueEnd.x.toFixed(1)}, ${trueEnd.y.toFixed(1)}, ${trueEnd.heading.toFixed(2)}°)`);
}
