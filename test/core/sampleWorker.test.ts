// The Monte Carlo worker of "Veer: Sample the Runs" (dist/sampleWorker.js,
// built by `npm run build`) and its runner (src/extension/sampleRunner.ts),
// outside the editor: the cloud it sends is the in-process one, progress
// comes in steps, cancelling stops the thread mid-sample, and the calling
// thread stays free while it samples.
import { strict as assert } from 'assert';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Worker } from 'node:worker_threads';
import { checkPlan } from '../../src/core';
import { sampleCloud } from '../../src/core/render/cloud';
import { runWorker, type Cancellation } from '../../src/extension/sampleRunner';

const ROOT = join(__dirname, '..', '..');
const SCRIPT = join(ROOT, 'dist', 'sampleWorker.js');
const PLAN = readFileSync(join(ROOT, 'examples', 'parcel-table.veer'), 'utf8');

/** A cancellation the test fires by hand (the shape of vscode.CancellationToken the runner uses). */
function cancellation(): Cancellation & { cancel(): void } {
  const listeners: (() => void)[] = [];
  const token = {
    isCancellationRequested: false,
    onCancellationRequested(listener: () => void) {
      listeners.push(listener);
      return { dispose: () => listeners.splice(listeners.indexOf(listener), 1) };
    },
    cancel() {
      token.isCancellationRequested = true;
      for (const l of [...listeners]) l();
    },
  };
  return token;
}

describe('sampling worker', function () {
  this.timeout(60000);
  before(() => {
    if (!existsSync(SCRIPT)) throw new Error('dist/sampleWorker.js is missing: run `npm run build` first (npm test does)');
  });

  it('sends the same cloud as sampling in-process, with progress in whole-percent steps up to 100', async () => {
    const steps: number[] = [];
    const reply = await runWorker(SCRIPT, { text: PLAN, fileName: 'parcel-table.veer', count: 400, seed: 1 }, cancellation(),
      (step) => steps.push(step.increment));
    assert.notEqual(reply, 'cancelled');
    if (reply === 'cancelled') return;
    const here = sampleCloud(checkPlan(PLAN, { fileName: 'parcel-table.veer' }), 400, 1);
    assert.deepEqual(reply.cloud, here);
    assert.ok(steps.every((s) => Number.isInteger(s) && s > 0));
    assert.equal(steps.reduce((a, b) => a + b, 0), 100);
  });

  it('cancelling stops the worker thread mid-sample and settles at once', async () => {
    const token = cancellation();
    let worker: Worker | undefined;
    let exited = false;
    const reply = runWorker(SCRIPT, { text: PLAN, fileName: 'parcel-table.veer', count: 1_000_000, seed: 1 }, token,
      () => token.cancel(), // at the first progress step: the worker is sampling
      (w) => { worker = w; w.on('exit', () => { exited = true; }); });
    assert.equal(await reply, 'cancelled');
    assert.ok(worker);
    if (!exited) await new Promise((resolve) => worker!.once('exit', resolve));
    assert.ok(exited || worker!.threadId === -1);
  });

  it('leaves the calling thread free: its timer keeps ticking while the worker samples', async () => {
    let last = performance.now();
    let worst = 0;
    const timer = setInterval(() => {
      const now = performance.now();
      worst = Math.max(worst, now - last);
      last = now;
    }, 5);
    const began = performance.now();
    const reply = await runWorker(SCRIPT, { text: PLAN, fileName: 'parcel-table.veer', count: 40000, seed: 2 }, cancellation(), () => {});
    const took = performance.now() - began;
    clearInterval(timer);
    assert.notEqual(reply, 'cancelled');
    // In the calling thread the sampling would stop the timer for all of its time; in a worker the timer's longest
    // pause is a small part of it. A relation, not a time limit, so that a busy machine cannot fail it (the speed
    // itself is the benchmark's: mc_1k_x_100_ms).
    assert.ok(worst < took / 4, `the timer stopped for ${worst.toFixed(0)} ms while sampling took ${took.toFixed(0)} ms`);
  });

  it('a text with no runs gives an empty cloud, not a failure', async () => {
    // Not a plan at all: the core still answers (with diagnostics), and a run-less result has no cloud.
    const reply = await runWorker(SCRIPT, { text: 'nothing to see', fileName: 'x.veer', count: 10, seed: 1 }, cancellation(), () => {});
    assert.notEqual(reply, 'cancelled');
    if (reply !== 'cancelled') assert.deepEqual(reply.cloud.spots, []);
  });
});
