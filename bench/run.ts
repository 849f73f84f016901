// The core's benchmark: check+solve time of generated plans of 100, 1,000 and
// 10,000 segments on a field with 20 obstacles, how it scales, and the
// re-check after a one-line edit with and without the expression cache.
// Prints the figures and merges them into bench/results.json.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan, ExpressionCache, fewestResets, MAX_PLAN_CHARS } from '../src/core';
import { round } from './stats';
import { medianTime } from './timing';
import { propagateRun } from '../src/core/spread/run';
import { sampleRun } from '../src/core/spread/sample';
import { replayFigures, REPLAY_TARGET_MS } from './replay';
import { fitFigures, FIT_TARGET_MS } from './fit';

// Run from a bundle in bench/.bundle/ (as the product runs: one bundled file) or from the source.
const RESULTS = join(__dirname, __dirname.endsWith('.bundle') ? '..' : '.', 'results.json');
const TARGET_1K_MS = 16;

/**
 * A plan of `segments` motions (drives, and turns of every shape and both
 * sensings) on a large field with 20 obstacles.
 */
function generatePlan(segments: number): string {
  const lines = [
    'plan "Benchmark"',
    'wheel 56 mm',
    'track 160 mm effective 162.4 mm',
    'body 150 by 190 axle -30',
    'field 40000 by 40000 grid 500',
    'let lane = 120 mm',
  ];
  for (let i = 0; i < 20; i++) {
    const x = 2000 + (i % 5) * 8000;
    const y = 30000 + Math.floor(i / 5) * 2000;
    lines.push(i % 2 === 0 ? `box "crate ${i}" (${x}, ${y}) to (${x + 400}, ${y + 300})` : `circle "post ${i}" (${x}, ${y}) radius 150`);
  }
  lines.push('run "long run"', 'start (20000, 10000) heading 0');
  // The cycle ends where it began (pose and yaw reading), so any number of
  // segments stays on the field and clear of the obstacles.
  const cycle = [
    'drive lane * 2 speed 60%',
    'turn 90 arc 200',
    'turn -90 arc 200 reverse',
    'drive -2 * lane hold 0 ramp 800 mm/s^2',
    'turn 90 by gyro reset',
    'turn -90 pivot left',
    'turn 90 pivot left',
    'turn -90 by gyro',
  ];
  for (let i = 0; i < segments; i++) lines.push(cycle[i % cycle.length]);
  return lines.join('\n');
}

/** Median milliseconds of `repetitions` runs, after up to 8 warm-up runs. */
function time(fn: () => void, repetitions: number): number {
  return medianTime(fn, Math.min(repetitions, 8), repetitions);
}

function solveTime(segments: number, repetitions: number, simulate = true): number {
  const text = generatePlan(segments);
  const check = checkPlan(text);
  const motions = check.runs[0]?.segments.length ?? 0;
  if (motions !== segments + 1) throw new Error(`the generated plan has ${motions} segments, not ${segments + 1}`);
  const errors = check.diagnostics.filter((d) => d.severity === 'error');
  if (errors.length) throw new Error(`the generated plan has errors: ${errors.slice(0, 3).map((d) => `${d.range.start.line + 1}: ${d.message}`).join('; ')}`);
  // One cache, warmed by the first run, as the editor and the command line
  // keep one: the figure is the check and solve, not math.js compiling the
  // same few expression texts again (the re-check figures show that cost).
  const cache = new ExpressionCache();
  return time(() => checkPlan(text, { cache, simulate }), repetitions);
}

/** One keystroke-sized edit: a drive's length changes on one line in the middle. */
function recheckTimes(segments: number, repetitions: number): { cached: number; uncached: number } {
  const text = generatePlan(segments);
  const lines = text.split('\n');
  const editLine = lines.findIndex((l, i) => i > lines.length / 2 && l.startsWith('drive lane * 2'));
  let k = 0;
  const edited = () => {
    k++;
    const copy = [...lines];
    copy[editLine] = `drive lane * 2 + ${k % 7} mm speed 60%`;
    return copy.join('\n');
  };
  const shared = new ExpressionCache();
  checkPlan(text, { cache: shared });
  const cached = time(() => checkPlan(edited(), { cache: shared }), repetitions);
  const uncached = time(() => checkPlan(edited(), { cache: new ExpressionCache() }), repetitions);
  return { cached, uncached };
}

/** `n` let names and `n` lines using names one letter off each (the "did you mean" search). */
function unknownNamesPlan(n: number): string {
  const lines = ['wheel 56 mm', 'track 160 mm', 'start (1000, 1000) heading 0'];
  for (let i = 0; i < n; i++) lines.push(`let name_${i} = ${i} mm`);
  for (let i = 0; i < n; i++) lines.push(`drive nmae_${i}`);
  return lines.join('\n');
}

/** One wrap crossing followed by `n` drives: the fewest-resets fix on a long plan. */
function crossingThenDrivesPlan(n: number): string {
  const lines = ['wheel 56 mm', 'track 160 mm', 'start (20000, 20000) heading 0', 'turn 90 by gyro', 'turn 90 by gyro', 'drive 10 hold 180'];
  for (let i = 0; i < n; i++) lines.push(i % 2 === 0 ? 'drive 10' : 'drive -10');
  return lines.join('\n');
}

/** The largest plan the size limit allows, made of the benchmark's cycle (about 90,000 motions). */
function largestPlan(): string {
  let segments = 1000;
  let text = generatePlan(segments);
  const perSegment = text.length / segments;
  segments = Math.floor((MAX_PLAN_CHARS - 2000) / perSegment);
  text = generatePlan(segments);
  while (text.length > MAX_PLAN_CHARS) text = generatePlan((segments -= 100));
  return text;
}

function hostileFigures(): Record<string, number> {
  const once = (fn: () => void) => time(fn, 3);
  const names10k = unknownNamesPlan(5_000);
  const names20k = unknownNamesPlan(10_000);
  const resets10k = crossingThenDrivesPlan(10_000);
  const resets20k = crossingThenDrivesPlan(20_000);
  const check10 = checkPlan(resets10k);
  const check20 = checkPlan(resets20k);
  if (!fewestResets(check10, resets10k)) throw new Error('the fewest-resets benchmark plan needs no reset');
  const largest = largestPlan();
  return {
    unknown_names_10k_lines_ms: round(once(() => checkPlan(names10k))),
    unknown_names_20k_lines_ms: round(once(() => checkPlan(names20k))),
    fewest_resets_10k_ms: round(once(() => fewestResets(check10, resets10k))),
    fewest_resets_20k_ms: round(once(() => fewestResets(check20, resets20k))),
    largest_plan_chars: largest.length,
    largest_plan_check_ms: round(once(() => checkPlan(largest))),
  };
}

function main(): void {
  // First, in a fresh heap, as the editor's sampling worker runs it (a thread of its own, this plan only).
  // Monte Carlo: 1,000 sampled runs of the 100-segment plan (the error model with the full kinematics).
  // With the controller simulation (every sampled run simulated), and without it (the planned path driven with its errors).
  const solved100 = checkPlan(generatePlan(100));
  const planned100 = checkPlan(generatePlan(100), { simulate: false });
  let seed = 1;
  const mc = time(() => sampleRun(solved100.runs[0].segments, solved100.setup.noise, 162.4, 'clockwise', 1000, seed++), 7);
  const mcPlanned = time(() => sampleRun(planned100.runs[0].segments, planned100.setup.noise, 162.4, 'clockwise', 1000, seed++), 7);
  const solve100 = solveTime(100, 31);
  const solve1k = solveTime(1_000, 21);
  const solve10k = solveTime(10_000, 7);
  const recheck = recheckTimes(1_000, 21);
  const planned1k = solveTime(1_000, 21, false);
  // The spread's share: the propagation alone over the solved 1,000-segment run.
  const solved = checkPlan(generatePlan(1_000), { simulate: false });
  const spread1k = time(() => propagateRun(solved.runs[0].segments, solved.setup.noise, 162.4, 'clockwise'), 21);
  const figures: Record<string, number> = {
    solve_100_ms: round(solve100),
    solve_1k_ms: round(solve1k),
    solve_1k_without_sim_ms: round(planned1k),
    sim_1k_ms: round(solve1k - planned1k),
    spread_1k_ms: round(spread1k),
    mc_1k_x_100_ms: round(mc),
    mc_1k_x_100_without_sim_ms: round(mcPlanned),
    solve_10k_ms: round(solve10k),
    scaling_10k_over_1k: round(solve10k / solve1k),
    recheck_edit_ms: round(recheck.cached),
    recheck_edit_nocache_ms: round(recheck.uncached),
  };
  console.log('check + solve + simulate (median):');
  console.log(`  100 segments     ${figures.solve_100_ms} ms`);
  console.log(`  1,000 segments   ${figures.solve_1k_ms} ms (target ≤ ${TARGET_1K_MS} ms: ${solve1k <= TARGET_1K_MS ? 'met' : 'MISSED'})`);
  console.log(`  10,000 segments  ${figures.solve_10k_ms} ms (10k/1k = ${figures.scaling_10k_over_1k}; target ≤ 11: ${solve10k / solve1k <= 11 ? 'met' : 'MISSED'})`);
  console.log(`  the simulation's share at 1,000 segments: ${figures.sim_1k_ms} ms (the check without it: ${figures.solve_1k_without_sim_ms} ms)`);
  console.log(`  the spread's propagation at 1,000 segments: ${figures.spread_1k_ms} ms (target ≤ 2 ms: ${spread1k <= 2 ? 'met' : 'MISSED'})`);
  console.log(`  Monte Carlo, 1,000 runs of 100 segments, each simulated: ${figures.mc_1k_x_100_ms} ms (target ≤ 150 ms: ${mc <= 150 ? 'met' : 'MISSED'}); the planned path driven with its errors instead: ${figures.mc_1k_x_100_without_sim_ms} ms`);
  console.log('re-check after a one-line edit, 1,000 segments (median):');
  console.log(`  with a warm expression cache  ${figures.recheck_edit_ms} ms`);
  console.log(`  with a fresh cache            ${figures.recheck_edit_nocache_ms} ms`);
  const hostile = hostileFigures();
  Object.assign(figures, hostile);
  console.log('hostile and careless plans (median of 3):');
  console.log(`  unknown names, 10,000 lines   ${hostile.unknown_names_10k_lines_ms} ms; 20,000 lines ${hostile.unknown_names_20k_lines_ms} ms`);
  console.log(`  fewest resets, 10,000 drives  ${hostile.fewest_resets_10k_ms} ms; 20,000 drives ${hostile.fewest_resets_20k_ms} ms`);
  console.log(`  the largest plan allowed (${(hostile.largest_plan_chars / 1e6).toFixed(2)} M characters): whole check ${hostile.largest_plan_check_ms} ms (target ≤ 2000 ms: ${hostile.largest_plan_check_ms <= 2000 ? 'met' : 'MISSED'})`);
  const replay = replayFigures();
  Object.assign(figures, replay);
  console.log(`recorded run: read and reconstruct a 100,000-row log  ${replay.replay_100k_ms} ms (target ≤ ${REPLAY_TARGET_MS} ms: ${replay.replay_100k_ms <= REPLAY_TARGET_MS ? 'met' : 'MISSED'})`);
  const fitted = fitFigures();
  Object.assign(figures, fitted);
  console.log(`recorded run: fit the robot model to the demo plan's run (${fitted.fit_rows} rows)  ${fitted.fit_ms} ms (target ≤ ${FIT_TARGET_MS} ms: ${fitted.fit_ms <= FIT_TARGET_MS ? 'met' : 'MISSED'}); 100,000 rows ${fitted.fit_100k_ms} ms`);

  const existing = existsSync(RESULTS) ? JSON.parse(readFileSync(RESULTS, 'utf8')) as Record<string, unknown> : {};
  writeFileSync(RESULTS, `${JSON.stringify({ ...existing, ...figures }, null, 2)}\n`);
  console.log(`merged into ${RESULTS}`);
}

main();
