// The `veer` command: the core's checker and renderer for terminals and CI.
import { closeSync, existsSync, openSync, readFileSync, readSync, realpathSync, renameSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { checkPlan, fixPlan, proveFix, renderSvg, targetsCsv, targetsDocument, targetsText, toSarif, ExpressionCache, MAX_PLAN_CHARS, type CheckResult, type Diagnostic, type Fix } from '../core';
import { pathToFileURL } from 'node:url';
import { diagnosticLine, runSummaryLine, toJsonDocument } from '../core/report';
import { sampleRun, sampleStats } from '../core/spread/sample';
import { shareMeeting } from '../core/spread/gaussian';
import { sampleCloud, SPREAD_CHOICES, type SpreadShown } from '../core/render/cloud';
import { version } from '../../package.json';
import { LOG_OPTIONS, overlayForRender, replayCommand, REPLAY_HELP } from './replay';
import { calibrateCommand, CALIBRATE_HELP } from './calibrate';

const HELP = `veer ${version}: check and draw plans for two-wheeled robot runs

Usage:
  veer check [--json [--trace]] [--strict] FILE...
                                           check plans; one line per problem, a summary per run
  veer check --format sarif FILE...        the problems as a SARIF 2.1.0 log, with the path-keeping fixes
  veer render FILE -o OUT.svg [--run NAME] draw the field, the path and the problems as SVG
        [--spread marks|all|off] [--no-spread] [--samples N [--seed S]]
                                           with where the real robot ends up: the 95 % ovals, heading
                                           wedges and each mark's chance, and a cloud of sampled end points
        [--log LOG [--wheel-units U ...]]  and a recorded run's path, reconstructed from its log (the
                                           log options of \`replay\`)
  veer targets FILE [--run NAME] [--csv|--json]
                                           the numbers the robot's code needs, one row per motion:
                                           start time, time, wheel and motor degrees, yaw target, power
${REPLAY_HELP}${CALIBRATE_HELP}  veer fix FILE [--write]                  apply the fixes that need no choice and keep every motion
                                           (the fewest yaw resets, wrongly cased keywords); print the
                                           fixed plan, or rewrite FILE with --write; a summary on stderr
  veer --help | --version

Options:
  --json       print a JSON document (one file: an object; several: an array); schema/check.schema.json
  --format F   \`check\` output: text (default), json, or sarif
  --strict     count warnings as errors
  --trace      with \`check --json\`: each motion's simulated samples (time, yaw reading, target, error,
               powers, wheel speeds, pose), one row per control-loop sample
  --samples N  with \`check --json\`: sample each run N times on the error model (\`noise\`) and add each
               motion's sampled mean and covariance, and each mark's share of runs that meet it
               with \`render\`: draw the N sampled end points of each run (at its end and its marks)
               as dots, and each mark's sampled share beside its chance
  --seed S     the sampling's seed (default 1): the same seed gives the same samples
  --spread S   \`render\`: where to draw the 95 % ovals (the real robot ends inside in 19 runs out of 20)
               and heading wedges: marks (default, with each mark's chance), all (after every motion
               too), or off
  --no-spread  \`render\`: no ovals, wedges or chances (the same as \`--spread off\`)
  -o, --output where \`render\` writes the SVG
  --run NAME   draw (or list the targets of) only this run (name or 1-based number)
  --csv        \`targets\` as CSV (RFC 4180, a header row)
  --write      \`fix\` rewrites the file in place instead of printing it

Exit status: 0 no errors (warnings allowed), 1 errors found, 2 usage error or unreadable file.
Lengths are in millimetres, angles in degrees, times in seconds.
Safety: test every run at low speed first, keep hands and people clear of a moving robot, and follow your
venue's rules.
`;

class UsageError extends Error {}

export interface CliIo {
  out: (s: string) => void;
  err: (s: string) => void;
  /** Whether stderr is a terminal (progress is shown only then). */
  isTTY: boolean;
}

/** Runs the command; returns the exit status. Never throws for bad input. */
export function runCli(argv: string[], io: CliIo): number {
  try {
    return dispatch(argv, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`veer: ${e.message}\nRun \`veer --help\` for usage.\n`);
      return 2;
    }
    if (e instanceof FileError) {
      io.err(`veer: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
}

function dispatch(argv: string[], io: CliIo): number {
  if (argv[0] === 'replay') return replayCommand(argv.slice(1), io, readPlan);
  if (argv[0] === 'calibrate') return calibrateCommand(argv.slice(1), io, readPlan);
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: {
        help: { type: 'boolean', short: 'h' },
        version: { type: 'boolean', short: 'v' },
        json: { type: 'boolean' },
        strict: { type: 'boolean' },
        output: { type: 'string', short: 'o' },
        run: { type: 'string' },
        write: { type: 'boolean' },
        csv: { type: 'boolean' },
        format: { type: 'string' },
        trace: { type: 'boolean' },
        samples: { type: 'string' },
        seed: { type: 'string' },
        spread: { type: 'string' },
        'no-spread': { type: 'boolean' },
        log: { type: 'string' },
        ...LOG_OPTIONS,
      },
    });
  } catch (e) {
    throw new UsageError((e as Error).message.replace(/\. To specify.*$/s, ''));
  }
  const { values, positionals } = parsed;
  if (values.help) {
    io.out(HELP);
    return 0;
  }
  if (values.version) {
    io.out(`${version}\n`);
    return 0;
  }
  const [command, ...files] = positionals;
  if (!command) throw new UsageError('no command given: use `veer check FILE` or `veer render FILE -o OUT.svg`');
  if (command !== 'fix' && values.write) throw new UsageError('`--write` belongs to `veer fix`');
  if (command !== 'targets' && values.csv) throw new UsageError('`--csv` belongs to `veer targets`');
  if (command !== 'check' && values.format !== undefined) throw new UsageError('`--format` belongs to `veer check`');
  if (command !== 'check' && values.trace) throw new UsageError('`--trace` belongs to `veer check --json`');
  if (command !== 'check' && command !== 'render' && (values.samples !== undefined || values.seed !== undefined)) throw new UsageError('`--samples` and `--seed` belong to `veer check --json` and `veer render`');
  if (command !== 'render' && (values.spread !== undefined || values['no-spread'])) throw new UsageError('`--spread` and `--no-spread` belong to `veer render`');
  if (command !== 'render' && (values.log !== undefined || Object.keys(LOG_OPTIONS).some((k) => (values as Record<string, unknown>)[k] !== undefined))) throw new UsageError('`--log` and the log options belong to `veer render` (and `veer replay PLAN LOG`)');
  if (command === 'targets') {
    if (values.output !== undefined || values.strict) throw new UsageError('`veer targets` takes a plan file, `--run`, and `--csv` or `--json`');
    if (values.csv && values.json) throw new UsageError('choose one of `--csv` and `--json`');
    if (files.length !== 1) throw new UsageError('`veer targets` takes exactly one plan file');
    return targets(files[0], values.run, values.csv ? 'csv' : values.json ? 'json' : 'text', io);
  }
  if (command === 'fix') {
    if (values.json || values.strict || values.output !== undefined || values.run !== undefined) throw new UsageError('`veer fix` takes only a plan file and `--write`');
    if (files.length !== 1) throw new UsageError('`veer fix` takes exactly one plan file');
    return fix(files[0], !!values.write, io);
  }
  if (command === 'check') {
    if (values.output !== undefined || values.run !== undefined) throw new UsageError('`-o` and `--run` belong to `veer render`');
    if (files.length === 0) throw new UsageError('`veer check` needs at least one plan file');
    const format = values.format ?? (values.json ? 'json' : 'text');
    if (!['text', 'json', 'sarif'].includes(format)) throw new UsageError(`unknown format \`${format}\`: use text, json or sarif`);
    if (values.json && format !== 'json') throw new UsageError('choose one of `--json` and `--format`');
    if (values.trace && format !== 'json') throw new UsageError('`--trace` adds the simulation\'s samples to the JSON document: use it with `--json`');
    const samples = values.samples === undefined ? undefined : Number(values.samples);
    const seed = values.seed === undefined ? 1 : Number(values.seed);
    if (samples !== undefined && (!Number.isInteger(samples) || samples < 2 || samples > 1_000_000)) throw new UsageError('`--samples` takes a whole number of runs from 2 to 1000000, e.g. `--samples 1000`');
    if (values.seed !== undefined && (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff)) throw new UsageError('`--seed` takes a whole number from 0 to 4294967295');
    if (values.seed !== undefined && samples === undefined) throw new UsageError('`--seed` goes with `--samples N`');
    if (samples !== undefined && format !== 'json') throw new UsageError('`--samples` adds the sampled runs to the JSON document: use it with `--json`');
    return check(files, { format: format as 'text' | 'json' | 'sarif', strict: !!values.strict, trace: !!values.trace, samples, seed }, io);
  }
  if (command === 'render') {
    if (values.json) throw new UsageError('`--json` belongs to `veer check`');
    if (files.length !== 1) throw new UsageError('`veer render` takes exactly one plan file');
    if (!values.output) throw new UsageError('`veer render` needs `-o OUT.svg`');
    return render(files[0], values.output, values.run, !!values.strict, io, renderSpread(values), values.log !== undefined ? { file: values.log, values } : undefined);
  }
  throw new UsageError(`unknown command \`${command}\`: use \`check\`, \`render\`, \`targets\`, \`replay\`, \`calibrate\` or \`fix\``);
}

/** A file that cannot be read or written; exported for the commands in their own files. */
export class FileError extends Error {}

function readPlan(file: string): string {
  let stat;
  try {
    stat = statSync(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new FileError(code === 'ENOENT' ? `${file}: no such file` : `${file}: cannot read (${code ?? (e as Error).message})`);
  }
  if (stat.isDirectory()) throw new FileError(`${file}: is a directory, not a plan file`);
  // A pipe, a device or a socket could block or never end: plans are files.
  if (!stat.isFile()) throw new FileError(`${file}: is not a regular file (a pipe, device or socket); save the plan to a file first`);
  const maxBytes = MAX_PLAN_CHARS * 4;
  if (stat.size > maxBytes) throw new FileError(`${file}: too large to be a plan (${(stat.size / 1e6).toFixed(1)} MB; the limit is ${(MAX_PLAN_CHARS / 1e6).toFixed(0)} million characters)`);
  let bytes: Buffer;
  try {
    bytes = readAtMost(file, maxBytes + 1);
  } catch (e) {
    throw new FileError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
  if (bytes.length > maxBytes) throw new FileError(`${file}: too large to be a plan (it grew while being read; the limit is ${(MAX_PLAN_CHARS / 1e6).toFixed(0)} million characters)`);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new FileError(`${file}: is not UTF-8 text; save the plan as UTF-8`);
  }
  if (text.length > MAX_PLAN_CHARS) throw new FileError(`${file}: too large to be a plan (${(text.length / 1e6).toFixed(1)} million characters; the limit is ${(MAX_PLAN_CHARS / 1e6).toFixed(0)} million)`);
  return text;
}

/** How a text file's refusals end, by what the file should be (`FILE: ...`). */
export interface FileWords {
  missing: string;
  notFile: string;
  tooLarge: (bytes: number) => string;
  notUtf8: string;
}

/** A regular file's UTF-8 text, at most `maxBytes` bytes; throws a FileError worded by `say`. */
export function readTextFile(file: string, maxBytes: number, say: FileWords): string {
  let stat;
  try {
    stat = statSync(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new FileError(code === 'ENOENT' ? `${file}: ${say.missing}` : `${file}: cannot read (${code ?? (e as Error).message})`);
  }
  if (!stat.isFile()) throw new FileError(`${file}: ${say.notFile}`);
  if (stat.size > maxBytes) throw new FileError(`${file}: ${say.tooLarge(stat.size)}`);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(readFileSync(file));
  } catch (e) {
    if (e instanceof TypeError) throw new FileError(`${file}: ${say.notUtf8}`);
    throw new FileError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

/** Reads at most `limit` bytes, so a file that grows while it is read cannot exhaust memory. */
function readAtMost(file: string, limit: number): Buffer {
  const fd = openSync(file, 'r');
  try {
    const chunks: Buffer[] = [];
    let total = 0;
    for (;;) {
      const chunk = Buffer.allocUnsafe(Math.min(1 << 20, limit - total));
      if (chunk.length === 0) break;
      const n = readSync(fd, chunk, 0, chunk.length, null);
      if (n === 0) break;
      chunks.push(chunk.subarray(0, n));
      total += n;
    }
    return Buffer.concat(chunks, total);
  } finally {
    closeSync(fd);
  }
}

/** Whether two paths name the same file (through links too); false when `output` does not exist yet. */
function sameFile(input: string, output: string): boolean {
  try {
    const a = statSync(input);
    const b = statSync(output);
    return a.dev === b.dev && a.ino === b.ino;
  } catch {
    try {
      return realpathSync(input) === join(realpathSync(dirname(output)), basename(output));
    } catch {
      return false;
    }
  }
}

function progressReporter(io: CliIo, label: string): ((fraction: number) => void) | undefined {
  if (!io.isTTY) return undefined;
  let last = -1;
  return (fraction: number) => {
    const pct = Math.floor(fraction * 100);
    if (pct === last) return;
    last = pct;
    io.err(`\r${label} ${pct}%${pct >= 100 ? '\r\x1b[K' : ''}`);
  };
}

function checkOne(file: string, cache: ExpressionCache, io: CliIo): { result: CheckResult; text: string } {
  const text = readPlan(file);
  const onProgress = text.length > 200_000 ? progressReporter(io, `checking ${file}`) : undefined;
  return { result: checkPlan(text, { fileName: file, cache, onProgress }), text };
}

/**
 * `--samples N`: each run sampled N times on the error model with the full
 * kinematics (seeded); each segment gets the samples' mean and covariance,
 * each mark the share of samples that meet it.
 */
function addSamples(doc: ReturnType<typeof toJsonDocument>, result: CheckResult, count: number, seed: number, onProgress?: (f: number) => void): void {
  const width = result.setup.robot.effectiveTrack ?? result.setup.robot.track;
  if (width === undefined) return;
  result.runs.forEach((run, r) => {
    const samples = sampleRun(run.segments, result.setup.noise, width, result.setup.turns, count, seed + r,
      onProgress && ((f) => onProgress((r + f) / result.runs.length)));
    run.segments.forEach((seg, i) => {
      const { mean, cov } = sampleStats(samples, i);
      const r6 = (v: number) => Math.round(v * 1e6) / 1e6;
      const out = doc.runs[r].segments[i];
      out.sampled = { count, mean: { x_mm: r6(mean[0]), y_mm: r6(mean[1]), heading_deg: r6(mean[2]) }, cov: cov.map((row) => row.map(r6)) };
      if (seg.markTarget) out.sampled_hit_probability = shareMeeting(seg.markTarget, samples.x[i], samples.y[i]);
    });
  });
  onProgress?.(1);
}

function failed(result: CheckResult, strict: boolean): boolean {
  return result.diagnostics.some((d) => d.severity === 'error' || (strict && d.severity === 'warning'));
}

function check(files: string[], opts: { format: 'text' | 'json' | 'sarif'; strict: boolean; trace?: boolean; samples?: number; seed?: number }, io: CliIo): number {
  // Read every file first, so an unreadable one stops the command before any output.
  const cache = new ExpressionCache();
  const results: Array<{ file: string; result: CheckResult; text: string }> = [];
  for (const file of files) results.push({ file, ...checkOne(file, cache, io) });
  let status = 0;
  if (opts.format === 'json') {
    const docs = results.map(({ file, result }) => {
      const doc = toJsonDocument(file, result, opts.trace);
      if (opts.samples !== undefined) addSamples(doc, result, opts.samples, opts.seed ?? 1, progressReporter(io, `sampling ${opts.samples} runs of ${file}`));
      return doc;
    });
    io.out(JSON.stringify(docs.length === 1 ? docs[0] : docs, null, 2) + '\n');
  } else if (opts.format === 'sarif') {
    // The reference beside the installed command (dist/ in a package, src/cli/ in the repository).
    const docs = [join(__dirname, '..', 'docs', 'diagnostics.md'), join(__dirname, '..', '..', 'docs', 'diagnostics.md')].find((p) => existsSync(p));
    const log = toSarif(results.map(({ file, result, text }) => ({
      file, result,
      // Only fixes that keep the path, each proven by checking its result again.
      fixesFor: (d: Diagnostic): Fix[] => (d.fixes ?? []).filter((f) => !f.changesPath && proveFix(text, result, f, d, { fileName: file }).ok),
    })), { toolVersion: version, ...(docs ? { helpBase: pathToFileURL(docs).href } : {}) });
    io.out(JSON.stringify(log, null, 2) + '\n');
  }
  for (const { file, result } of results) {
    if (failed(result, opts.strict)) status = 1;
    if (opts.format !== 'text') continue;
    for (const d of result.diagnostics) io.out(diagnosticLine(file, d) + '\n');
    for (const r of result.runs) io.out(`${file}: ${runSummaryLine(r)}\n`);
  }
  return status;
}

/** `render`'s spread options: which ovals to draw, and how many runs to sample for the cloud (none without `--samples`). */
function renderSpread(values: { spread?: string; 'no-spread'?: boolean; samples?: string; seed?: string }): { spread: SpreadShown; samples?: number; seed: number } {
  if (values.spread !== undefined && values['no-spread']) throw new UsageError('choose one of `--spread` and `--no-spread`');
  const spread = values['no-spread'] ? 'off' : values.spread ?? 'marks';
  if (!(SPREAD_CHOICES as readonly string[]).includes(spread)) throw new UsageError(`unknown \`--spread ${spread}\`: use marks (ovals at marks), all (after every motion too) or off`);
  const samples = values.samples === undefined ? undefined : Number(values.samples);
  const seed = values.seed === undefined ? 1 : Number(values.seed);
  if (samples !== undefined && (!Number.isInteger(samples) || samples < 2 || samples > 1_000_000)) throw new UsageError('`--samples` takes a whole number of runs from 2 to 1000000, e.g. `--samples 1000`');
  if (values.seed !== undefined && (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff)) throw new UsageError('`--seed` takes a whole number from 0 to 4294967295');
  if (values.seed !== undefined && samples === undefined) throw new UsageError('`--seed` goes with `--samples N`');
  return { spread: spread as SpreadShown, ...(samples !== undefined ? { samples } : {}), seed };
}

function render(file: string, output: string, run: string | undefined, strict: boolean, io: CliIo,
  spread: { spread: SpreadShown; samples?: number; seed: number } = { spread: 'marks', seed: 1 }, log?: { file: string; values: Record<string, unknown> }): number {
  if (sameFile(file, output)) throw new UsageError(`\`-o ${output}\` is the plan itself: writing the drawing there would destroy the plan. Choose another name, e.g. \`-o ${basename(file).replace(/\.veer$/i, '')}.svg\``);
  const { result } = checkOne(file, new ExpressionCache(), io);
  const runSel = selectRun(file, result, run);
  const cloud = spread.samples !== undefined
    ? sampleCloud(result, spread.samples, spread.seed, progressReporter(io, `sampling ${spread.samples} runs of ${file}`))
    : undefined;
  if (cloud && cloud.spots.length === 0) io.err(`${file}: no sampled end points to draw: the plan needs \`track\` and a run with a start and a motion\n`);
  // `--log`: the recorded run's reconstructed path over the plan (docs/recorded-runs.md).
  const recorded = log ? overlayForRender(result, log.file, log.values, runSel) : undefined;
  if (recorded && 'error' in recorded) throw new FileError(recorded.error);
  const svg = renderSvg(result, { run: runSel, standalone: true, spread: spread.spread, ...(cloud ? { cloud } : {}), ...(recorded ? { recorded: recorded.overlay } : {}) });
  writeAtomically(output, svg);
  for (const d of result.diagnostics) io.err(diagnosticLine(file, d) + '\n');
  io.err(`wrote ${output}\n`);
  return failed(result, strict) ? 1 : 0;
}

function fix(file: string, write: boolean, io: CliIo): number {
  const text = readPlan(file);
  const out = fixPlan(text, { fileName: file, cache: new ExpressionCache() });
  if (write) {
    if (out.text !== text) writeAtomically(file, out.text);
  } else io.out(out.text);
  for (const change of out.changes) io.err(`${file}: ${change}\n`);
  for (const refused of out.refused) io.err(`${file}: ${refused}\n`);
  if (out.changes.length === 0) io.err(`${file}: nothing to fix without a choice by a person\n`);
  else if (write) io.err(`${file}: rewritten\n`);
  const errors = out.result.diagnostics.filter((d) => d.severity === 'error');
  if (errors.length) {
    io.err(`${file}: ${errors.length} error${errors.length === 1 ? '' : 's'} remain; \`veer check ${file}\` lists them, and the editor offers the fixes that need a choice\n`);
    return 1;
  }
  return 0;
}

/** Writes through a temporary file in the same folder and a rename, so a failed write never leaves half a file. */
export function writeAtomically(path: string, content: string): void {
  let existing;
  try { existing = statSync(path); } catch { existing = undefined; }
  if (existing?.isDirectory()) throw new FileError(`${path}: is a directory; give a file name`);
  if (existing && !existing.isFile()) {
    // A device or pipe such as /dev/stdout: written as it is, never replaced.
    try {
      writeFileSync(path, content);
      return;
    } catch (e) {
      throw new FileError(`${path}: cannot write (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
    }
  }
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    writeFileSync(temporary, content);
    renameSync(temporary, path);
  } catch (e) {
    try { unlinkSync(temporary); } catch { /* already gone */ }
    throw new FileError(`${path}: cannot write (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

/** The 0-based index of a run given by name or 1-based number; undefined for all runs. */
function selectRun(file: string, result: CheckResult, run: string | undefined): number | undefined {
  if (run === undefined) return undefined;
  const byName = result.runs.findIndex((r) => r.name === run);
  if (byName >= 0) return byName;
  const byNumber = /^\d+$/.test(run) ? Number(run) - 1 : -1;
  if (byNumber >= 0 && byNumber < result.runs.length) return byNumber;
  const names = result.runs.map((r) => `"${r.name}"`).join(', ') || 'none';
  throw new UsageError(`${file} has no run "${run}" (runs: ${names})`);
}

function targets(file: string, run: string | undefined, format: 'text' | 'csv' | 'json', io: CliIo): number {
  const text = readPlan(file);
  const result = checkPlan(text, { fileName: file, cache: new ExpressionCache() });
  const doc = targetsDocument(file, result, text, selectRun(file, result, run));
  if (format === 'json') io.out(`${JSON.stringify(doc, null, 2)}\n`);
  else if (format === 'csv') io.out(targetsCsv(doc.runs));
  else io.out(targetsText(doc.runs));
  // The numbers of a plan with errors may be wrong: say so where a person reads, and in the status.
  const errors = result.diagnostics.filter((d) => d.severity === 'error');
  for (const d of errors) io.err(diagnosticLine(file, d) + '\n');
  if (errors.length) io.err(`${file}: ${errors.length} error${errors.length === 1 ? '' : 's'}: some targets may be missing or wrong until they are fixed\n`);
  return errors.length ? 1 : 0;
}

/** Entry point used by bin/veer.js. */
export function main(): void {
  // A reader that stops early (\`veer check plan.veer | head\`) closes the pipe: stop quietly, as other commands do.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw e;
  });
  process.exitCode = runCli(process.argv.slice(2), {
    out: (s) => process.stdout.write(s),
    err: (s) => process.stderr.write(s),
    isTTY: !!process.stderr.isTTY,
  });
}
