/**
 * `npm run bench -- trace [flags]`: ray-tracing throughput of the Sunfacet BVH kernel against
 * three-mesh-bvh's `raycastFirst` and the plain three `Raycaster`, on invented city-block scenes,
 * or on given work (`--obj scene.obj --rays file.rays --query any-hit|closest-hit`).
 * One JSON line per measurement on stdout (medians over --reps); logs on stderr.
 *
 * Tracers: `sunfacet` is the JavaScript kernel, `sunfacet-wasm` the WebAssembly SIMD kernel
 * (src/trace/wasm), both through the same batch API (occludedBatch / closestBatch).
 *
 * Flags: --sizes 20k,200k,1m   --reps N (default 5)   --quick (20k scene, 100k rays, 3 reps)
 *        --rays-count N (rays per set, default 1M)
 *        --tracers sunfacet,sunfacet-wasm,three-mesh-bvh,three-raycaster
 *        --workers 1,2   --export DIR (write scene-<N>.obj, shadow-<N>.rays, hemi-<N>.rays)
 */
import { Worker } from 'node:worker_threads';
import { readFileSync, mkdirSync, openSync, writeSync, closeSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { BufferGeometry, BufferAttribute, Ray, Vector3, DoubleSide, Mesh, MeshBasicMaterial, Raycaster } from 'three';
import { MeshBVH, SAH } from 'three-mesh-bvh';
import { buildBvh } from '../../src/trace/bvh/build.ts';
import type { BvhData } from '../../src/trace/bvh/build.ts';
import { occludedBatch, closestBatch } from '../../src/trace/bvh/batch.ts';
import { setRayKernel } from '../../src/trace/wasm/loader.ts';
import { generateCity, generateRays } from './sceneGen.ts';

type Query = 'any-hit' | 'closest-hit';
type Tracer = 'sunfacet' | 'sunfacet-wasm' | 'three-mesh-bvh' | 'three-raycaster';
interface Line {
  bench: 'trace'; triangles: number; rays: string; query: Query; tracer: Tracer; workers: number;
  mraysPerS: number; hitFraction: number; buildMs: number; [extra: string]: unknown;
}

const log = (s: string): void => { process.stderr.write(s + '\n'); };
const emit = (l: Line): void => { process.stdout.write(JSON.stringify(l) + '\n'); };
const median = (xs: number[]): number => { const s = [...xs].sort((a, b) => a - b); const m = s.length >> 1; return s.length % 2 ? (s[m] as number) : ((s[m - 1] as number) + (s[m] as number)) / 2; };

function parseSize(s: string): number {
  const m = /^(\d+(?:\.\d+)?)([km]?)$/i.exec(s.trim());
  if (m === null) throw new Error(`--sizes: "${s}" is not a size like 20k, 200k, 1m`);
  const mult = (m[2] ?? '').toLowerCase() === 'k' ? 1e3 : (m[2] ?? '').toLowerCase() === 'm' ? 1e6 : 1;
  return Math.round(Number(m[1]) * mult);
}

interface Opts {
  sizes: number[]; reps: number; raysCount: number; tracers: Tracer[]; workers: number[];
  obj?: string; raysFile?: string; query?: Query; exportDir?: string;
}

function parseOpts(args: string[]): Opts {
  const o: Opts = { sizes: [20_000, 200_000, 1_000_000], reps: 5, raysCount: 1_000_000, tracers: ['sunfacet', 'sunfacet-wasm', 'three-mesh-bvh', 'three-raycaster'], workers: [1, 2] };
  for (let i = 0; i < args.length; i++) {
    const a = args[i] as string;
    const val = (): string => { const v = args[++i]; if (v === undefined) throw new Error(`${a} needs a value`); return v; };
    if (a === '--sizes') o.sizes = val().split(',').map(parseSize);
    else if (a === '--reps') o.reps = Math.max(1, parseInt(val(), 10));
    else if (a === '--rays-count') o.raysCount = parseSize(val());
    else if (a === '--quick') { o.sizes = [20_000]; o.raysCount = 100_000; o.reps = 3; }
    else if (a === '--tracers') o.tracers = val().split(',') as Tracer[];
    else if (a === '--workers') o.workers = val().split(',').map((s) => parseInt(s, 10));
    else if (a === '--obj') o.obj = val();
    else if (a === '--rays') o.raysFile = val();
    else if (a === '--query') { const q = val(); if (q !== 'any-hit' && q !== 'closest-hit') throw new Error('--query: any-hit or closest-hit'); o.query = q; }
    else if (a === '--export') o.exportDir = val();
    else throw new Error(`unknown flag ${a}`);
  }
  return o;
}

/** Tiny OBJ reader: `v x y z` and `f a b c ...` (fan-triangulated, `a/b/c` and negative indices). */
export function readObj(text: string): { positions: Float32Array; indices: Uint32Array } {
  const pos: number[] = [], idx: number[] = [];
  let lineNo = 0;
  for (const line of text.split('\n')) {
    lineNo++;
    const p = line.trim().split(/\s+/);
    if (p[0] === 'v') {
      pos.push(Number(p[1]), Number(p[2]), Number(p[3]));
    } else if (p[0] === 'f') {
      const nv = pos.length / 3;
      const ids = p.slice(1).map((s) => { const k = parseInt(s.split('/')[0] as string, 10); return k < 0 ? nv + k : k - 1; });
      if (ids.length < 3 || ids.some((k) => !(k >= 0))) throw new Error(`OBJ line ${lineNo}: bad face`);
      for (let k = 1; k + 1 < ids.length; k++) idx.push(ids[0] as number, ids[k] as number, ids[k + 1] as number);
    }
  }
  return { positions: new Float32Array(pos), indices: new Uint32Array(idx) };
}

function exportScene(dir: string, name: string, positions: Float32Array, indices: Uint32Array): void {
  const fd = openSync(join(dir, name), 'w');
  let buf = '';
  const flush = (): void => { writeSync(fd, buf); buf = ''; };
  for (let i = 0; i < positions.length; i += 3) { buf += `v ${positions[i]} ${positions[i + 1]} ${positions[i + 2]}\n`; if (buf.length > 1 << 20) flush(); }
  for (let i = 0; i < indices.length; i += 3) { buf += `f ${(indices[i] as number) + 1} ${(indices[i + 1] as number) + 1} ${(indices[i + 2] as number) + 1}\n`; if (buf.length > 1 << 20) flush(); }
  flush();
  closeSync(fd);
}

function toShared(a: Float32Array): Float32Array {
  const s = new Float32Array(new SharedArrayBuffer(a.byteLength));
  s.set(a);
  return s;
}

function timeSunfacet(bvh: BvhData, rays: Float32Array, query: Query, reps: number): { mrays: number; hitFraction: number } {
  const n = rays.length / 6;
  const occ = new Uint8Array(n), outT = new Float32Array(n), outTri = new Int32Array(n);
  const times: number[] = [];
  let hits = 0;
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    hits = query === 'any-hit' ? occludedBatch(bvh, rays, 0, Infinity, occ) : closestBatch(bvh, rays, 0, Infinity, outT, outTri);
    times.push(performance.now() - t0);
  }
  return { mrays: n / median(times) / 1000, hitFraction: hits / n };
}

/** Starts `count` workers via the tsx eval bootstrap (TOOLCHAIN §2), each with its ray range. */
async function startWorkers(count: number, bvh: BvhData, rays: Float32Array, query: Query, kernel: 'js' | 'wasm'): Promise<Worker[]> {
  const tsxApi = import.meta.resolve('tsx/esm/api');
  const entry = new URL('./traceWorker.ts', import.meta.url).href;
  const code = `import(${JSON.stringify(tsxApi)}).then(m => { m.register(); return import(${JSON.stringify(entry)}); })`;
  const n = rays.length / 6;
  const ws: Worker[] = [];
  for (let k = 0; k < count; k++) {
    const w = new Worker(code, { eval: true });
    const start = Math.floor((n * k) / count), end = Math.floor((n * (k + 1)) / count);
    const next = (): Promise<unknown> => new Promise((resolve, reject) => { w.once('error', reject); w.once('message', resolve); });
    await next(); // {loaded}: the worker module is running
    const ready = next();
    w.postMessage({ setup: { bvh, rays, start, end, query, kernel } });
    await ready;
    ws.push(w);
  }
  return ws;
}

async function timeWorkers(ws: Worker[], n: number, reps: number): Promise<{ mrays: number; hitFraction: number }> {
  const times: number[] = [];
  let hits = 0;
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    const counts = await Promise.all(ws.map((w) => new Promise<number>((resolve) => { w.once('message', (m: { hits: number }) => resolve(m.hits)); w.postMessage({ go: true }); })));
    times.push(performance.now() - t0);
    hits = counts.reduce((a, b) => a + b, 0);
  }
  return { mrays: n / median(times) / 1000, hitFraction: hits / n };
}

function threeGeometry(positions: Float32Array, indices: Uint32Array): BufferGeometry {
  const g = new BufferGeometry();
  g.setAttribute('position', new BufferAttribute(positions, 3));
  g.setIndex(new BufferAttribute(indices.slice(), 1)); // three-mesh-bvh reorders the index in place
  return g;
}

function timeThreeMeshBvh(bvh: MeshBVH, rays: Float32Array, count: number, reps: number): { mrays: number; hitFraction: number } {
  const ray = new Ray(new Vector3(), new Vector3());
  const times: number[] = [];
  let hits = 0;
  for (let r = 0; r < reps; r++) {
    hits = 0;
    const t0 = performance.now();
    for (let i = 0; i < count; i++) {
      const o = i * 6;
      ray.origin.set(rays[o] as number, rays[o + 1] as number, rays[o + 2] as number);
      ray.direction.set(rays[o + 3] as number, rays[o + 4] as number, rays[o + 5] as number);
      if (bvh.raycastFirst(ray, DoubleSide, 0, Infinity) !== null) hits++;
    }
    times.push(performance.now() - t0);
  }
  return { mrays: count / median(times) / 1000, hitFraction: hits / count };
}

function timeRaycaster(geom: BufferGeometry, rays: Float32Array, count: number): { mrays: number; hitFraction: number } {
  const mesh = new Mesh(geom, new MeshBasicMaterial({ side: DoubleSide }));
  mesh.updateMatrixWorld(true);
  const rc = new Raycaster();
  const hitsArr: unknown[] = [];
  let hits = 0;
  const t0 = performance.now();
  for (let i = 0; i < count; i++) {
    const o = i * 6;
    rc.ray.origin.set(rays[o] as number, rays[o + 1] as number, rays[o + 2] as number);
    rc.ray.direction.set(rays[o + 3] as number, rays[o + 4] as number, rays[o + 5] as number);
    hitsArr.length = 0;
    if (rc.intersectObject(mesh, false, hitsArr as never[]).length > 0) hits++;
  }
  const ms = performance.now() - t0;
  return { mrays: count / ms / 1000, hitFraction: hits / count };
}

interface Work { triangles: number; raysName: string; rays: Float32Array; queries: Query[] }

async function traceAll(o: Opts, positions: Float32Array, indices: Uint32Array, works: Work[]): Promise<void> {
  const triangles = indices.length / 3;
  // --- sunfacet (JavaScript kernel) and sunfacet-wasm (WebAssembly SIMD kernel) ---
  const kernels = (['sunfacet', 'sunfacet-wasm'] as const).filter((k) => o.tracers.includes(k));
  if (kernels.length > 0) {
    const buildTimes: number[] = [];
    let bvh: BvhData | null = null;
    for (let r = 0; r < Math.min(o.reps, 3); r++) {
      bvh = null;
      const t0 = performance.now();
      bvh = buildBvh(positions, indices, { shared: true });
      buildTimes.push(performance.now() - t0);
    }
    const b = bvh as BvhData;
    const buildMs = median(buildTimes);
    log(`sunfacet build ${triangles} tris: ${buildMs.toFixed(0)} ms, ${b.nodeCount} nodes, depth ${b.depth}`);
    for (const w of works) {
      const shared = o.workers.some((k) => k > 1) ? toShared(w.rays) : w.rays;
      for (const q of w.queries) {
        for (const tracer of kernels) for (const nw of o.workers) {
          const kernel = tracer === 'sunfacet' ? 'js' : 'wasm';
          let res: { mrays: number; hitFraction: number };
          if (nw === 1) {
            setRayKernel(kernel);
            if (kernel === 'wasm') timeSunfacet(b, w.rays, q, 1); // warm-up: compile, copy the scene in
            res = timeSunfacet(b, w.rays, q, o.reps);
            setRayKernel('auto');
          } else {
            const ws = await startWorkers(nw, b, shared, q, kernel);
            await timeWorkers(ws, w.rays.length / 6, 1); // warm-up
            res = await timeWorkers(ws, w.rays.length / 6, o.reps);
            await Promise.all(ws.map((x) => x.terminate()));
          }
          emit({ bench: 'trace', triangles, rays: w.raysName, query: q, tracer, workers: nw, mraysPerS: +res.mrays.toFixed(4), hitFraction: +res.hitFraction.toFixed(4), buildMs: +buildMs.toFixed(1), build: 'binned SAH' });
        }
      }
    }
  }
  // --- three-mesh-bvh raycastFirst (SAH build), on a subsample ---
  if (o.tracers.includes('three-mesh-bvh')) {
    const geom = threeGeometry(positions, indices);
    const t0 = performance.now();
    const tmb = new MeshBVH(geom, { strategy: SAH });
    const buildMs = performance.now() - t0;
    log(`three-mesh-bvh SAH build: ${buildMs.toFixed(0)} ms`);
    for (const w of works) {
      const count = Math.min(w.rays.length / 6, 200_000);
      for (const q of w.queries) {
        const res = timeThreeMeshBvh(tmb, w.rays, count, Math.min(o.reps, 3));
        emit({ bench: 'trace', triangles, rays: w.raysName, query: q, tracer: 'three-mesh-bvh', workers: 1, mraysPerS: +res.mrays.toFixed(4), hitFraction: +res.hitFraction.toFixed(4), buildMs: +buildMs.toFixed(1), build: 'SAH', raysTimed: count });
      }
    }
  }
  // --- plain three Raycaster, tiny subsample ---
  if (o.tracers.includes('three-raycaster')) {
    const geom = threeGeometry(positions, indices);
    for (const w of works) {
      const count = Math.max(20, Math.min(2000, Math.round(2e7 / Math.max(1, triangles))));
      for (const q of w.queries) {
        const res = timeRaycaster(geom, w.rays, Math.min(count, w.rays.length / 6));
        emit({ bench: 'trace', triangles, rays: w.raysName, query: q, tracer: 'three-raycaster', workers: 1, mraysPerS: +res.mrays.toFixed(6), hitFraction: +res.hitFraction.toFixed(4), buildMs: 0, raysTimed: count });
      }
    }
  }
}

export async function run(args: string[]): Promise<void> {
  const o = parseOpts(args);
  if (o.obj !== undefined || o.raysFile !== undefined) {
    if (o.obj === undefined || o.raysFile === undefined) throw new Error('--obj and --rays go together');
    const { positions, indices } = readObj(readFileSync(o.obj, 'utf8'));
    const buf = readFileSync(o.raysFile);
    if (buf.byteLength % 24 !== 0) throw new Error(`${o.raysFile}: size ${buf.byteLength} is not a multiple of 24 bytes (6 float32 per ray)`);
    const rays = new Float32Array(buf.byteLength / 4);
    const dv = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    for (let i = 0; i < rays.length; i++) rays[i] = dv.getFloat32(i * 4, true);
    log(`given work: ${indices.length / 3} triangles, ${rays.length / 6} rays`);
    await traceAll(o, positions, indices, [{ triangles: indices.length / 3, raysName: 'given', rays, queries: [o.query ?? 'any-hit'] }]);
    return;
  }
  for (const size of o.sizes) {
    const t0 = performance.now();
    const scene = generateCity(size, 0x5eed0000 + size);
    const shadow = generateRays(scene, o.raysCount, 'shadow', 101 + size);
    const hemi = generateRays(scene, o.raysCount, 'hemi', 202 + size);
    log(`scene ${scene.triangleCount} triangles, ${o.raysCount} rays per set, generated in ${(performance.now() - t0).toFixed(0)} ms`);
    if (o.exportDir !== undefined) {
      mkdirSync(o.exportDir, { recursive: true });
      exportScene(o.exportDir, `scene-${scene.triangleCount}.obj`, scene.positions, scene.indices);
      for (const [name, r] of [['shadow', shadow], ['hemi', hemi]] as const) {
        const bytes = new Uint8Array(r.byteLength);
        const dv = new DataView(bytes.buffer);
        for (let i = 0; i < r.length; i++) dv.setFloat32(i * 4, r[i] as number, true);
        writeFileSync(join(o.exportDir, `${name}-${scene.triangleCount}.rays`), bytes);
      }
      log(`exported to ${o.exportDir}`);
      continue;
    }
    await traceAll(o, scene.positions, scene.indices, [
      { triangles: scene.triangleCount, raysName: 'shadow', rays: shadow, queries: ['any-hit'] },
      { triangles: scene.triangleCount, raysName: 'hemi', rays: hemi, queries: ['any-hit', 'closest-hit'] },
    ]);
  }
}
