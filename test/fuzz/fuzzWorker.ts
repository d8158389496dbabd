/**
 * Worker side of `npm run fuzz`: runs inputs [from, to) of a campaign and reports each one to the
 * main thread (which watches for hangs and crashes and restarts this worker after one).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { inputFor, judge } from './campaign.ts';

const { seed, from, to, auditEvery } = workerData as { seed: number; from: number; to: number; auditEvery: boolean };
const port = parentPort!;
for (let i = from; i < to; i++) {
  port.postMessage({ type: 'start', index: i });
  const input = inputFor(seed, i, auditEvery);
  const judged = await judge(input);
  port.postMessage({ type: 'done', index: i, target: input.target, depth: input.depth, judged });
}
port.postMessage({ type: 'end' });
