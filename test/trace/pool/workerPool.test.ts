import { describe, it, expect, afterAll } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { sunVisibility } from '../../../src/trace/queries/sunVisibility.ts';
import { skyVisibility } from '../../../src/trace/queries/skyVisibility.ts';
import { surfaceViews } from '../../../src/trace/queries/surfaceViews.ts';
import { createInProcessExecutor, createWorkerPool, MAX_CHUNK_ATTEMPTS } from '../../../src/trace/pool/workerPool.ts';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { createNodeWorkerPool } from '../../../src/trace/pool/nodeWorkers.ts';
import { TraceChunkError, type AsyncTraceApi, type TraceExecutor, type WorkerFactory } from '../../../src/trace/pool/types.ts';
import { withSharedBuffers } from '../../../src/trace/pool/shareBuffers.ts';
import { createTraceApi } from '../../../src/trace/api.ts';
import { directionFromAltAz, MeshBuilder, testRandom } from '../../helpers/bruteTracer.ts';

function smallScene() {
  const rnd = testRandom(2024);
  const m = new MeshBuilder();
  let tag = 0;
  for (let b = 0; b < 15; b++) {
    const x = rnd() * 30, y = rnd() * 30, w = 2 + rnd() * 5, h = 3 + rnd() * 12;
    m.box(x, y, 0, x + w, y + w, h, tag++);
  }
  const bvh = buildBvh(m.positions(), m.indices(), { shared: false });
  const R = 37; // not a multiple of the chunk sizes used
  const points = new Float32Array(R * 3);
  const normals = new Float32Array(R * 3);
  for (let i = 0; i < R; i++) {
    points.set([rnd() * 35, rnd() * 35, 0.1 + rnd() * 2], i * 3);
    normals.set(i % 3 === 0 ? [0, 0, 1] : [Math.cos(i), Math.sin(i), 0], i * 3);
  }
  const suns = new Float32Array(6 * 3);
  for (let s = 0; s < 6; s++) suns.set(directionFromAltAz(10 + 12 * s, 60 + 40 * s), s * 3);
  return { m, bvh, points, normals, suns, patchCount: tag };
}

const bytes = (a: ArrayBufferView) => Array.from(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));

const pools: TraceExecutor[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
});

describe('worker pool', () => {
  const sc = smallScene();
  const sunInput = { points: sc.points, normals: sc.normals, sunDirections: sc.suns, ground: { z: 0 } };
  const skyInput = { points: sc.points, normals: sc.normals, ground: { z: 0 }, samplesPerPatch: 4, groundSamples: 16, seed: 11 };
  const viewInput = { points: sc.points, trianglePatch: sc.m.trianglePatch(), patchCount: sc.patchCount, ground: { z: 0 }, samplesPerDirection: 16 };
  const directSun = sunVisibility(sc.bvh, sunInput);
  const directSky = skyVisibility(sc.bvh, skyInput);
  const directViews = surfaceViews(sc.bvh, viewInput);

  it('in-process executor: same bytes as a direct call, for any chunk size; progress reaches the total', async () => {
    const ex = createInProcessExecutor();
    for (const chunkSize of [1, 5, 100]) {
      const seen: [number, number][] = [];
      const sun = await ex.sunVisibility(sc.bvh, sunInput, { chunkSize, onProgress: (d, t) => seen.push([d, t]), progressIntervalMs: 0 });
      expect(bytes(sun)).toEqual(bytes(directSun));
      expect(seen.at(-1)).toEqual([37, 37]);
      for (let j = 1; j < seen.length; j++) expect(seen[j]![0]).toBeGreaterThanOrEqual(seen[j - 1]![0]);
      const sky = await ex.skyVisibility(sc.bvh, skyInput, { chunkSize });
      expect(bytes(sky.patchProjectedSr)).toEqual(bytes(directSky.patchProjectedSr));
      expect(bytes(sky.groundViewFactor)).toEqual(bytes(directSky.groundViewFactor));
      const views = await ex.surfaceViews(sc.bvh, viewInput, { chunkSize });
      expect(bytes(views.rowStart)).toEqual(bytes(directViews.rowStart));
      expect(bytes(views.patchIndex)).toEqual(bytes(directViews.patchIndex));
      expect(bytes(views.fraction)).toEqual(bytes(directViews.fraction));
      expect(bytes(views.skyFraction)).toEqual(bytes(directViews.skyFraction));
    }
    await ex.close();
  });

  it('1 and 2 Node workers give byte-identical results to the in-process run', async () => {
    for (const workers of [1, 2]) {
      const pool = createNodeWorkerPool({ workers });
      pools.push(pool);
      let last: [number, number] = [0, 0];
      const sun = await pool.sunVisibility(sc.bvh, sunInput, { chunkSize: 4, onProgress: (d, t) => (last = [d, t]) });
      expect(last).toEqual([37, 37]);
      expect(bytes(sun)).toEqual(bytes(directSun));
      const sky = await pool.skyVisibility(sc.bvh, skyInput, { chunkSize: 3 });
      expect(bytes(sky.patchProjectedSr)).toEqual(bytes(directSky.patchProjectedSr));
      expect(bytes(sky.skyViewFactor)).toEqual(bytes(directSky.skyViewFactor));
      expect(bytes(sky.groundViewFactor)).toEqual(bytes(directSky.groundViewFactor));
      const views = await pool.surfaceViews(sc.bvh, viewInput, { chunkSize: 7 });
      expect(bytes(views.patchIndex)).toEqual(bytes(directViews.patchIndex));
      expect(bytes(views.fraction)).toEqual(bytes(directViews.fraction));
      expect(bytes(views.rowStart)).toEqual(bytes(directViews.rowStart));
      await pool.close();
    }
  });

  it('cancellation rejects promptly and the pool still works afterwards', async () => {
    const pool = createNodeWorkerPool({ workers: 2 });
    pools.push(pool);
    // warm up (worker start-up is not what we time)
    await pool.sunVisibility(sc.bvh, sunInput);
    const R = 4000;
    const points = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) points.set([(i % 60) * 0.6, Math.floor(i / 60) * 0.6, 0.5], i * 3);
    const big = { points, ground: { z: 0 }, samplesPerPatch: 16 }; // ~9 M rays: many seconds
    const ac = new AbortController();
    let abortedAt = 0;
    let progressed = 0;
    const job = pool.skyVisibility(sc.bvh, big, {
      chunkSize: 20,
      signal: ac.signal,
      progressIntervalMs: 0,
      onProgress: (done) => {
        progressed = done;
        if (done > 0 && abortedAt === 0) {
          abortedAt = performance.now();
          ac.abort();
        }
      },
    });
    await expect(job).rejects.toMatchObject({ name: 'AbortError' });
    const lag = performance.now() - abortedAt;
    expect(abortedAt).toBeGreaterThan(0);
    expect(progressed).toBeLessThan(R);
    expect(lag).toBeLessThan(200); // the promise rejects at the abort, not at the end of a chunk
    // already-aborted signal: rejects without starting
    await expect(pool.sunVisibility(sc.bvh, sunInput, { signal: ac.signal })).rejects.toMatchObject({ name: 'AbortError' });
    // fresh workers are started for the next job
    expect(bytes(await pool.sunVisibility(sc.bvh, sunInput))).toEqual(bytes(directSun));
    await pool.close();
  });

  it('two jobs at once share the workers; aborting one does not fail the other (its chunks move to fresh workers)', async () => {
    const pool = createNodeWorkerPool({ workers: 2 });
    pools.push(pool);
    const [a, b] = await Promise.all([
      pool.sunVisibility(sc.bvh, sunInput, { chunkSize: 2 }),
      pool.skyVisibility(sc.bvh, skyInput, { chunkSize: 2 }),
    ]);
    expect(bytes(a)).toEqual(bytes(directSun));
    expect(bytes(b.patchProjectedSr)).toEqual(bytes(directSky.patchProjectedSr));
    const ac = new AbortController();
    const many = { ...skyInput, samplesPerPatch: 64 };
    const other = pool.skyVisibility(sc.bvh, many, { chunkSize: 1 });
    const aborted = pool.skyVisibility(sc.bvh, many, {
      chunkSize: 1,
      signal: ac.signal,
      progressIntervalMs: 0,
      onProgress: (done) => done > 0 && ac.abort(),
    });
    await expect(aborted).rejects.toMatchObject({ name: 'AbortError' });
    const otherResult = await other;
    expect(bytes(otherResult.patchProjectedSr)).toEqual(bytes(skyVisibility(sc.bvh, many).patchProjectedSr));
    await pool.close();
  });

  /** In-process workers with an injected fault: `fault(workerNumber, chunkStart)` says what goes wrong. */
  function faultyFactory(fault: (worker: number, start: number) => 'throw' | 'die' | 'none') {
    const made = { workers: 0, terminated: 0 };
    const factory: WorkerFactory = () => {
      const n = made.workers++;
      const api = createTraceApi();
      let die: (e: Error) => void = () => undefined;
      const failed = new Promise<never>((_, reject) => (die = reject));
      const asyncApi: AsyncTraceApi = {
        ping: async () => api.ping(),
        putBvh: async (id, b) => api.putBvh(id, b),
        dropBvh: async (id) => api.dropBvh(id),
        putTask: async (id, t) => api.putTask(id, t),
        dropTask: async (id) => api.dropTask(id),
        runChunk: async (id, s, e) => {
          const f = fault(n, s);
          if (f === 'throw') throw new Error('worker fell over');
          if (f === 'die') {
            setTimeout(() => die(new Error('exit code 1')), 5);
            return new Promise(() => undefined); // never answers
          }
          return api.runChunk(id, s, e);
        },
      };
      return { api: asyncApi, failed, terminate: () => void made.terminated++ };
    };
    return { factory, made };
  }

  it('a chunk that throws is re-run on a replacement worker; the result equals the fault-free run', async () => {
    // Worker 0 throws on the chunk at receiver 20 (its third chunk); the replacement succeeds.
    const { factory, made } = faultyFactory((w, s) => (w === 0 && s === 20 ? 'throw' : 'none'));
    const pool = createWorkerPool(factory, { workers: 1 });
    const sun = await pool.sunVisibility(sc.bvh, sunInput, { chunkSize: 10 });
    expect(bytes(sun)).toEqual(bytes(directSun));
    expect(made.workers).toBe(2);
    expect(made.terminated).toBe(1);
    const sky = await pool.skyVisibility(sc.bvh, skyInput, { chunkSize: 10 });
    expect(bytes(sky.patchProjectedSr)).toEqual(bytes(directSky.patchProjectedSr));
    await pool.close();
  });

  it('a worker that dies on its first chunk is replaced and the chunk re-run (2 workers, all three queries)', async () => {
    const { factory, made } = faultyFactory((w) => (w === 1 ? 'die' : 'none'));
    const pool = createWorkerPool(factory, { workers: 2 });
    let last: [number, number] = [0, 0];
    const sun = await pool.sunVisibility(sc.bvh, sunInput, { chunkSize: 4, onProgress: (d, t) => (last = [d, t]) });
    expect(bytes(sun)).toEqual(bytes(directSun));
    expect(last).toEqual([37, 37]); // no receiver counted twice
    expect(made.workers).toBe(3);
    const views = await pool.surfaceViews(sc.bvh, viewInput, { chunkSize: 5 });
    expect(bytes(views.patchIndex)).toEqual(bytes(directViews.patchIndex));
    expect(bytes(views.fraction)).toEqual(bytes(directViews.fraction));
    expect(bytes(views.rowStart)).toEqual(bytes(directViews.rowStart));
    await pool.close();
  });

  it('a chunk that fails on every worker rejects the job with a TraceChunkError naming the receivers', async () => {
    const { factory, made } = faultyFactory((_w, s) => (s === 20 ? 'throw' : 'none'));
    const pool = createWorkerPool(factory, { workers: 1 });
    const err = await pool.sunVisibility(sc.bvh, sunInput, { chunkSize: 10 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TraceChunkError);
    expect((err as TraceChunkError).start).toBe(20);
    expect((err as TraceChunkError).end).toBe(30);
    expect(String((err as Error).message)).toMatch(/sunVisibility: receivers 20\.\.29 .*worker fell over/);
    expect(made.workers).toBe(MAX_CHUNK_ATTEMPTS); // tried on a fresh worker each time, then given up
  });

  it('workers that always die fail the job instead of hanging', async () => {
    const { factory } = faultyFactory(() => 'die');
    const pool = createWorkerPool(factory, { workers: 2 });
    await expect(pool.sunVisibility(sc.bvh, sunInput)).rejects.toBeInstanceOf(TraceChunkError);
  });

  it('a real Node worker thread that exits mid-run is replaced; the result equals the fault-free run', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunfacet-pool-'));
    process.env.SUNFACET_TEST_DIE_AT = '8';
    process.env.SUNFACET_TEST_DIE_MARKER = path.join(dir, 'died');
    try {
      const pool = createNodeWorkerPool({ workers: 2, workerUrl: new URL('./dyingWorker.ts', import.meta.url) });
      pools.push(pool);
      const sky = await pool.skyVisibility(sc.bvh, skyInput, { chunkSize: 4 });
      expect(existsSync(path.join(dir, 'died'))).toBe(true); // the fault did happen
      expect(bytes(sky.patchProjectedSr)).toEqual(bytes(directSky.patchProjectedSr));
      expect(bytes(sky.skyViewFactor)).toEqual(bytes(directSky.skyViewFactor));
      expect(bytes(sky.groundViewFactor)).toEqual(bytes(directSky.groundViewFactor));
      await pool.close();
    } finally {
      delete process.env.SUNFACET_TEST_DIE_AT;
      delete process.env.SUNFACET_TEST_DIE_MARKER;
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('bad input throws an InputError before any worker starts', async () => {
    let started = 0;
    const pool = createWorkerPool(() => {
      started++;
      throw new Error('should not start');
    }, { workers: 1 });
    await expect(pool.skyVisibility(sc.bvh, { points: sc.points, samplesPerPatch: 3 })).rejects.toMatchObject({ name: 'InputError' });
    expect(started).toBe(0);
  });

  it('moves BVH arrays onto SharedArrayBuffer keeping views of one buffer together', () => {
    const shared = withSharedBuffers(sc.bvh);
    expect(shared.nodes.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(shared.nodes.buffer).toBe(shared.nodeInts.buffer);
    expect(shared.triIndex.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(bytes(shared.tris)).toEqual(bytes(sc.bvh.tris));
    expect(withSharedBuffers(shared)).toBe(shared); // already shared: unchanged
    expect(bytes(sunVisibility(shared, sunInput))).toEqual(bytes(directSun));
  });
});
