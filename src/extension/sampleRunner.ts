// Runs one sampling request in a fresh worker thread (dist/sampleWorker.js)
// and settles with its cloud, or 'cancelled' the moment the cancellation
// fires (the worker is terminated mid-sample). No editor API here, so a unit
// test drives it with a plain cancellation stand-in.
import { Worker } from 'node:worker_threads';
import { isSpreadCloud, type SpreadCloud } from '../core/render/cloud';
import type { SampleReply, SampleRequest } from './sampleWorker';

/** The worker's heap limit, MB: a runaway plan cannot take the editor's memory with it. */
const WORKER_HEAP_MB = 1024;

/** What the runner needs of a cancellation token (vscode.CancellationToken has it). */
export interface Cancellation {
  readonly isCancellationRequested: boolean;
  onCancellationRequested(listener: () => void): { dispose(): void };
}

/**
 * Runs one request in a fresh worker; resolves with its cloud, or 'cancelled'
 * when the user cancels (the worker is terminated at once, mid-sample).
 * `report` gets the progress in whole percent steps; `started` the worker.
 */
export function runWorker(script: string, request: SampleRequest, token: Cancellation,
  report: (step: { increment: number; message: string }) => void, started?: (worker: Worker) => void): Promise<{ cloud: SpreadCloud; ms: number } | 'cancelled'> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(script, { resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB } });
    started?.(worker);
    let settled = false;
    let shown = 0;
    const finish = (settle: () => void) => {
      if (settled) return;
      settled = true;
      cancelled.dispose();
      void worker.terminate();
      settle();
    };
    const cancelled = token.onCancellationRequested(() => finish(() => resolve('cancelled')));
    if (token.isCancellationRequested) finish(() => resolve('cancelled'));
    worker.on('message', (reply: SampleReply) => {
      if (reply.type === 'progress') {
        const pct = Math.floor(reply.done * 100);
        if (pct > shown) {
          report({ increment: pct - shown, message: `${pct} %` });
          shown = pct;
        }
      } else if (reply.type === 'done') {
        finish(() => (isSpreadCloud(reply.cloud) ? resolve({ cloud: reply.cloud, ms: reply.ms }) : reject(new Error('the worker sent no cloud'))));
      } else {
        finish(() => reject(new Error(reply.message)));
      }
    });
    worker.on('error', (e) => finish(() => reject(e)));
    worker.on('exit', (code) => finish(() => reject(new Error(`the sampling stopped before it finished (exit code ${code})`))));
    worker.postMessage(request);
  });
}
