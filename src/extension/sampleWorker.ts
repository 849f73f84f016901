// The Monte Carlo behind "Veer: Sample the Runs", in a worker thread of its
// own (bundled to dist/sampleWorker.js): the extension host only posts the
// plan's text and waits, so sampling never holds up typing. The worker checks
// the text with the core (the same result the editor has for that version)
// and samples each run (render/cloud.ts), reporting progress as it goes.
import { parentPort } from 'node:worker_threads';
import { checkPlan } from '../core/check';
import { sampleCloud, type SpreadCloud } from '../core/render/cloud';

export interface SampleRequest {
  text: string;
  fileName: string;
  count: number;
  seed: number;
}

export type SampleReply =
  | { type: 'progress'; done: number }
  | { type: 'done'; cloud: SpreadCloud; ms: number }
  | { type: 'error'; message: string };

const port = parentPort;
port?.once('message', (request: SampleRequest) => {
  const post = (reply: SampleReply) => port.postMessage(reply);
  try {
    const began = performance.now();
    const result = checkPlan(request.text, { fileName: request.fileName });
    let last = -1;
    const cloud = sampleCloud(result, request.count, request.seed, (done) => {
      const pct = Math.floor(done * 100);
      if (pct === last) return;
      last = pct;
      post({ type: 'progress', done });
    });
    post({ type: 'done', cloud, ms: performance.now() - began });
  } catch (e) {
    post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
  }
});
