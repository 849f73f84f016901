// `veer calibrate PLAN`: the runs that measure the plan's robot (--runs), and
// the setup values computed from the measurements recorded next to the plan
// (PLAN.calib, or --record FILE), as text or JSON (docs/calibration.md).
import { basename, dirname, join, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { checkPlan, ExpressionCache } from '../core';
import { calibratePlan, calibrationJson, calibrationText, MAX_RECORD_CHARS, writeCalibrationRuns } from '../core/calibrate';
import { FileError, readTextFile, writeAtomically, type CliIo } from './main';

export const CALIBRATE_HELP = `  veer calibrate PLAN --runs OUT.veer      write the calibration runs for the plan's robot (a straight drive,
                                           spins by encoders, spins for the gyro, the square test), sized to
                                           its field, with what to measure written as comments
  veer calibrate PLAN [--record FILE] [--json]
                                           the setup values from the measurements in FILE (default: the
                                           plan's name ending .calib): wheel, effective track, gyro scale,
                                           wheel mismatch, each with its 95 % interval, and the setup lines
`;

const USAGE = 'Usage: veer calibrate PLAN --runs OUT.veer | veer calibrate PLAN [--record FILE] [--json]   (docs/calibration.md)';

class CalibrateUsage extends Error {}
class ReadError extends Error {}

/** `veer calibrate ...` (argv after the command word); returns the exit status. */
export function calibrateCommand(argv: string[], io: CliIo, readPlan: (file: string) => string): number {
  try {
    return calibrate(argv, io, readPlan);
  } catch (e) {
    if (e instanceof CalibrateUsage) {
      io.err(`veer calibrate: ${e.message}\n${USAGE}\n`);
      return 2;
    }
    if (e instanceof ReadError) {
      io.err(`veer calibrate: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
}

/** The record's default name: the plan's, ending `.calib`. */
export function recordNameFor(plan: string): string {
  return plan.replace(/\.veer$/i, '') + '.calib';
}

function calibrate(argv: string[], io: CliIo, readPlan: (file: string) => string): number {
  let parsed;
  try {
    parsed = parseArgs({ args: argv, allowPositionals: true, options: { runs: { type: 'string' }, record: { type: 'string' }, json: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } } });
  } catch (e) {
    throw new CalibrateUsage((e as Error).message.replace(/\. To specify.*$/s, ''));
  }
  const { values, positionals } = parsed;
  if (values.help) {
    io.out(`${USAGE}\n\n${CALIBRATE_HELP}\nSee docs/calibration.md for what to do on the table and how to write the record.\n`);
    return 0;
  }
  if (positionals.length !== 1) throw new CalibrateUsage(positionals.length ? `takes one plan file, not ${positionals.length} files` : 'needs the plan file');
  const planFile = positionals[0];
  if (values.runs !== undefined && (values.record !== undefined || values.json)) throw new CalibrateUsage('`--runs` writes the runs to measure; `--record` and `--json` read the measurements afterwards: use one or the other');
  const text = readPlan(planFile);
  const result = checkPlan(text, { fileName: planFile, cache: new ExpressionCache(), simulate: false });

  if (values.runs !== undefined) {
    const out = values.runs;
    if (out === '') throw new CalibrateUsage('`--runs` needs a file name, e.g. `--runs calibration.veer`');
    const record = recordNameFor(basename(planFile));
    if (out !== '-' && resolve(out) === resolve(planFile)) throw new CalibrateUsage(`\`--runs ${out}\` is the plan itself: writing the runs there would destroy the plan. Choose another name, e.g. \`--runs ${basename(planFile).replace(/\.veer$/i, '')}-calibration.veer\``);
    if (out !== '-' && resolve(out) === resolve(recordNameFor(planFile))) throw new CalibrateUsage(`\`--runs ${out}\` is the plan's calibration record: writing the runs there would destroy the measurements. Choose a name ending .veer, e.g. \`--runs calibration.veer\``);
    const runs = writeCalibrationRuns(result, { planName: basename(planFile), recordName: record });
    if (!runs.text) {
      for (const p of runs.problems) io.err(`${planFile}: ${p}\n`);
      return 1;
    }
    if (out === '-') io.out(runs.text);
    else {
      const content = runs.text;
      asOwn(() => writeAtomically(out, content));
      io.err(`wrote ${out}: a ${runs.drive} mm straight drive, spins, and laps of a ${runs.side} mm square; measure them as its comments say and write the results into ${join(dirname(planFile), record)}\n`);
    }
    return 0;
  }

  const recordFile = values.record ?? recordNameFor(planFile);
  const recordText = readRecord(recordFile, values.record === undefined, planFile);
  const { record, calibration, edits } = calibratePlan(result, text, recordText);
  const problems = [...record.problems, ...(calibration?.problems ?? [])];
  if (values.json) {
    if (calibration) io.out(`${JSON.stringify(calibrationJson(planFile, recordFile, calibration, record, edits), null, 2)}\n`);
    else io.out(`${JSON.stringify({ file: planFile, record: recordFile, problems: problems.map((p) => ({ line: p.range.start.line + 1, column: p.range.start.character + 1, severity: p.severity, message: p.message })) }, null, 2)}\n`);
  } else if (calibration) io.out(calibrationText(planFile, recordFile, calibration, record, edits, result.setup.lengthUnit));
  else for (const p of problems) io.err(`${recordFile}: ${p.message}\n`);
  return problems.some((p) => p.severity === 'error') ? 1 : 0;
}

function readRecord(file: string, byDefault: boolean, planFile: string): string {
  return asOwn(() => readTextFile(file, MAX_RECORD_CHARS * 4, {
    missing: `no such file${byDefault ? ` (the record next to the plan). Write the calibration runs with \`veer calibrate ${planFile} --runs calibration.veer\`, drive them, and write what you measure into ${file}; or name the record with \`--record FILE\`` : ''}`,
    notFile: 'is not a regular file',
    tooLarge: (bytes) => `too large to be a calibration record (${bytes} bytes; a record is a few dozen lines)`,
    notUtf8: 'is not UTF-8 text; save the record as UTF-8',
  }));
}

/** The shared file helpers' errors, worded as this command's own (`veer calibrate: ...`). */
function asOwn<T>(f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof FileError) throw new ReadError(e.message);
    throw e;
  }
}
