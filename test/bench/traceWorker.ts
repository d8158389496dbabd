/**
 * Bench-only worker for `trace` with workers > 1: receives the shared BVH and rays once, then on
 * each {go} message traces its range and replies with its hit count.
 */
import { parentPort } from 'node:worker_threads';
import type { BvhData } from '../../src/trace/bvh/build.ts';
import { occludedBatch, closestBatch } from '../../src/trace/bvh/batch.ts';
import { setRayKernel } from '../../src/trace/wasm/loader.ts';

interface Setup { bvh: BvhData; rays: Float32Array; start: number; end: number; query: 'any-hit' | 'closest-hit'; kernel?: 'js' | 'wasm' }

const port = parentPort;
if (port === null) throw new Error('traceWorker must run in a worker thread');
let setup: Setup | null = null;
let outOcc = new Uint8Array(0), outT = new Float32Array(0), outTri = new Int32Array(0);
port.on('message', (msg: { setup?: Setup; go?: boolean; quit?: boolean }) => {
  if (msg.setup !== undefined) {
    setup = msg.setup;
    setRayKernel(setup.kernel ?? 'auto');
    const n = setup.rays.length / 6;
    outOcc = new Uint8Array(n); outT = new Float32Array(n); outTri = new Int32Array(n);
    port.postMessage({ ready: true });
  } else if (msg.go === true && setup !== null) {
    const s = setup;
    const hits = s.query === 'any-hit'
      ? occludedBatch(s.bvh, s.rays, 0, Infinity, outOcc, s.start, s.end)
      : closestBatch(s.bvh, s.rays, 0, Infinity, outT, outTri, s.start, s.end);
    port.postMessage({ hits });
  } else if (msg.quit === true) {
    port.close();
  }
});
port.postMessage({ loaded: true });
