/**
 * The WebAssembly SIMD ray kernel (source: ./as/kernel.ts, AssemblyScript, built by
 * `npm run build:wasm` into the embedded ./kernelBytes.ts) behind the batch API of ../bvh/batch.ts.
 * The JavaScript kernel (../bvh/query.ts) stays the oracle: the wasm kernel gives the same answers
 * bit for bit (occlusion, t, triangle; see the kernel's file comment for why) and the tests compare
 * the two ray by ray.
 *
 * Use: `occludedBatch` / `occludedBatchMasked` / `closestBatch` call `wasmKernelFor(bvh)` and use
 * the wasm kernel when it returns one. `setRayKernel('js' | 'wasm' | 'auto')` picks the kernel for
 * this thread (each worker has its own setting and its own wasm instance); 'auto' (the default)
 * uses wasm whenever it compiles here (WebAssembly with SIMD) and the scene fits its limits,
 * JavaScript otherwise. The scalar per-ray queries (isOccluded, intersectClosest...) stay JavaScript.
 *
 * Memory: the BVH is converted once per scene into wasm memory (one 64-byte record per interior
 * node holding both children's boxes, then the triangles and the slot -> triangle index); the
 * scene is recognised by its buffers, so the same BVH posted again to a worker (same
 * SharedArrayBuffer) is not copied again. Rays are copied in and results out in chunks of
 * `CHUNK_RAYS`; each chunk of at least `SORT_MIN_RAYS` rays is traced in the same coherent order
 * as the JavaScript batch (octant, then Morton code of the origin). Wasm memory only grows.
 * A BVH must not be changed after it was built (it never is: buildBvh returns fresh arrays).
 */
import type { BvhData } from '../bvh/build.ts';
import { KERNEL_WASM_BASE64 } from './kernelBytes.ts';

/** Which kernel the batch queries use on this thread. */
export type RayKernelMode = 'auto' | 'js' | 'wasm';

/** Rays per copy-in / trace / copy-out chunk. */
export const CHUNK_RAYS = 1 << 18;
/** Chunks with fewer rays are traced in the given order (same value as bvh/batch.ts). */
const SORT_MIN_RAYS = 2048;
/** Leaves are encoded as ~(firstSlot << 8 | count), so slots must stay below 2^23. */
const MAX_TRIANGLES = 1 << 23;
const PAGE_BYTES = 65536;
const NODE_RECORD_BYTES = 64;
const TRI_BYTES = 36;
const HISTOGRAM_BYTES = 65536 * 4;

interface KernelExports {
  memory: WebAssembly.Memory;
  heapBase(): number;
  setScene(nodes: number, tris: number, triIndex: number, stack: number, stackT: number, root: number): void;
  occludedRange(rays: number, n: number, tMin: number, tMax: number, out: number, order: number, skip: number): number;
  closestRange(rays: number, n: number, tMin: number, tMax: number, outT: number, outTri: number, order: number): number;
  sortRays(rays: number, n: number, keys: number, perm: number, keysTmp: number, permTmp: number, hist: number,
    x0: number, y0: number, z0: number, sx: number, sy: number, sz: number): void;
}

const align64 = (x: number): number => (x + 63) & ~63;

function kernelBytes(): Uint8Array<ArrayBuffer> {
  const s = atob(KERNEL_WASM_BASE64);
  const b = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) b[i] = s.charCodeAt(i);
  return b;
}

/** One wasm instance with at most one scene loaded at a time. */
export class WasmRayKernel {
  private readonly x: KernelExports;
  private readonly heapBase: number;
  // scene identity (buffers + offsets) and regions [byte addresses in wasm memory]
  private sceneNodes: ArrayBufferLike | null = null;
  private sceneNodesOffset = -1;
  private sceneTris: ArrayBufferLike | null = null;
  private sceneTrisOffset = -1;
  private sceneCount = -1;
  private triangleCount = 0;
  private skipPtr = 0;
  private histPtr = 0;
  private rayBase = 0;

  constructor(module: WebAssembly.Module) {
    const inst = new WebAssembly.Instance(module, {});
    this.x = inst.exports as unknown as KernelExports;
    this.heapBase = align64(this.x.heapBase());
  }

  /** True when this kernel can trace `bvh` (at most 2^23 triangles). */
  supports(bvh: BvhData): boolean {
    return bvh.triangleCount < MAX_TRIANGLES;
  }

  private ensureBytes(bytes: number): void {
    const mem = this.x.memory;
    const need = Math.ceil(bytes / PAGE_BYTES) - mem.buffer.byteLength / PAGE_BYTES;
    if (need > 0) mem.grow(need);
  }

  /** Converts and copies `bvh` into wasm memory unless it is the scene already loaded. */
  private useScene(bvh: BvhData): void {
    if (this.sceneNodes === bvh.nodes.buffer && this.sceneNodesOffset === bvh.nodes.byteOffset
      && this.sceneTris === bvh.tris.buffer && this.sceneTrisOffset === bvh.tris.byteOffset
      && this.sceneCount === bvh.nodeCount && this.triangleCount === bvh.triangleCount) return;
    const ni = bvh.nodeInts, nf = bvh.nodes, count = bvh.nodeCount, triCount = bvh.triangleCount;
    const rank = new Int32Array(count);
    let interior = 0;
    for (let j = 0; j < count; j++) rank[j] = (ni[j * 8 + 7] as number) < 0 ? interior++ : -1;
    const nodesPtr = this.heapBase;
    const trisPtr = align64(nodesPtr + interior * NODE_RECORD_BYTES);
    const triIndexPtr = align64(trisPtr + triCount * TRI_BYTES);
    const skipPtr = align64(triIndexPtr + triCount * 4);
    const stackPtr = align64(skipPtr + Math.max(1, triCount));
    const stackEntries = bvh.depth + 16;
    const stackTPtr = align64(stackPtr + stackEntries * 4);
    const histPtr = align64(stackTPtr + stackEntries * 4);
    const rayBase = align64(histPtr + HISTOGRAM_BYTES);
    this.ensureBytes(rayBase);
    const buf = this.x.memory.buffer;
    const f32 = new Float32Array(buf), i32 = new Int32Array(buf);
    const ref = (c: number): number => {
      const w = ni[c * 8 + 7] as number;
      return w >= 0 ? ~(((ni[c * 8 + 6] as number) << 8) | w) : (rank[c] as number);
    };
    for (let j = 0; j < count; j++) {
      const k = rank[j] as number;
      if (k < 0) continue;
      const l = ni[j * 8 + 6] as number, r = l + 1;
      const q = (nodesPtr >> 2) + k * 16, lo = l * 8, ro = r * 8;
      for (let a = 0; a < 3; a++) {
        f32[q + a * 4] = nf[lo + a] as number; f32[q + a * 4 + 1] = nf[ro + a] as number;
        f32[q + a * 4 + 2] = nf[lo + 3 + a] as number; f32[q + a * 4 + 3] = nf[ro + 3 + a] as number;
      }
      i32[q + 12] = ref(l); i32[q + 13] = ref(r); i32[q + 14] = -1 - (ni[j * 8 + 7] as number); i32[q + 15] = 0;
    }
    f32.set(bvh.tris.subarray(0, triCount * 9), trisPtr >> 2);
    new Uint32Array(buf).set(bvh.triIndex.subarray(0, triCount), triIndexPtr >> 2);
    this.x.setScene(nodesPtr, trisPtr, triIndexPtr, stackPtr, stackTPtr, count > 0 ? ref(0) : -1);
    this.sceneNodes = bvh.nodes.buffer; this.sceneNodesOffset = bvh.nodes.byteOffset;
    this.sceneTris = bvh.tris.buffer; this.sceneTrisOffset = bvh.tris.byteOffset;
    this.sceneCount = count; this.triangleCount = triCount;
    this.skipPtr = skipPtr; this.histPtr = histPtr; this.rayBase = rayBase;
  }

  /** Lays out one chunk of `m` rays after the scene; returns its regions. */
  private chunk(m: number): { rays: number; keys: number; perm: number; keysTmp: number; permTmp: number; out: number; outT: number; outTri: number } {
    const rays = this.rayBase;
    const keys = align64(rays + m * 24), perm = align64(keys + m * 4), keysTmp = align64(perm + m * 4), permTmp = align64(keysTmp + m * 4);
    const out = align64(permTmp + m * 4), outT = align64(out + m), outTri = align64(outT + m * 4);
    this.ensureBytes(outTri + m * 4);
    return { rays, keys, perm, keysTmp, permTmp, out, outT, outTri };
  }

  /** Copies rays [s, s + m) in and, for a big enough chunk, sorts them; returns the order address (0 = none). */
  private loadRays(bvh: BvhData, rays: Float32Array, s: number, m: number, c: ReturnType<WasmRayKernel['chunk']>): number {
    new Float32Array(this.x.memory.buffer).set(rays.subarray(s * 6, (s + m) * 6), c.rays >> 2);
    if (m < SORT_MIN_RAYS) return 0;
    const nf = bvh.nodes;
    const x0 = nf[0] as number, y0 = nf[1] as number, z0 = nf[2] as number;
    const ex = (nf[3] as number) - x0, ey = (nf[4] as number) - y0, ez = (nf[5] as number) - z0;
    this.x.sortRays(c.rays, m, c.keys, c.perm, c.keysTmp, c.permTmp, this.histPtr, x0, y0, z0,
      ex > 0 ? 1023 / ex : 0, ey > 0 ? 1023 / ey : 0, ez > 0 ? 1023 / ez : 0);
    return c.perm;
  }

  /**
   * Any-hit for rays [start, end) (range already checked by the caller): out[i] = 1 if blocked at
   * t in [tMin, tMax], else 0; `skip` null or a flag per ORIGINAL triangle (non-zero = ignored).
   * @returns the number of blocked rays
   */
  occluded(bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, out: Uint8Array, start: number, end: number, skip: Uint8Array | null): number {
    this.useScene(bvh);
    if (skip !== null) {
      const mem = new Uint8Array(this.x.memory.buffer, this.skipPtr, this.triangleCount);
      const n = Math.min(skip.length, this.triangleCount);
      mem.set(skip.subarray(0, n));
      mem.fill(1, n); // beyond the flags: skipped, as the JavaScript kernel reads undefined !== 0
    }
    let hits = 0;
    for (let s = start; s < end; s += CHUNK_RAYS) {
      const m = Math.min(CHUNK_RAYS, end - s);
      const c = this.chunk(m);
      const order = this.loadRays(bvh, rays, s, m, c);
      hits += this.x.occludedRange(c.rays, m, tMin, tMax, c.out, order, skip !== null ? this.skipPtr : 0);
      out.set(new Uint8Array(this.x.memory.buffer, c.out, m), s);
    }
    return hits;
  }

  /**
   * Closest hit for rays [start, end): outT[i] = t (Infinity if none), outTri[i] = ORIGINAL
   * triangle index (-1 if none). @returns the number of rays that hit
   */
  closest(bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, outT: Float32Array, outTri: Int32Array, start: number, end: number): number {
    this.useScene(bvh);
    let hits = 0;
    for (let s = start; s < end; s += CHUNK_RAYS) {
      const m = Math.min(CHUNK_RAYS, end - s);
      const c = this.chunk(m);
      const order = this.loadRays(bvh, rays, s, m, c);
      hits += this.x.closestRange(c.rays, m, tMin, tMax, c.outT, c.outTri, order);
      const buf = this.x.memory.buffer;
      outT.set(new Float32Array(buf, c.outT, m), s);
      outTri.set(new Int32Array(buf, c.outTri, m), s);
    }
    return hits;
  }
}

let mode: RayKernelMode = 'auto';
let kernel: WasmRayKernel | null = null;
let loadError: unknown = null;

/**
 * Compiles and instantiates the kernel synchronously (Node, worker_threads, Web Workers; the
 * module is ≈ 5 kB, so the page's main thread accepts it too). Cached per thread.
 * @throws Error when this runtime has no WebAssembly SIMD
 */
export function loadWasmKernel(): WasmRayKernel {
  if (kernel !== null) return kernel;
  const bytes = kernelBytes();
  if (typeof WebAssembly === 'undefined' || !WebAssembly.validate(bytes)) {
    throw new Error('wasm ray kernel: this runtime has no WebAssembly with SIMD (fixed-width SIMD, 2021); use setRayKernel("js")');
  }
  kernel = new WasmRayKernel(new WebAssembly.Module(bytes));
  return kernel;
}

/** As `loadWasmKernel`, compiling asynchronously. */
export async function loadWasmKernelAsync(): Promise<WasmRayKernel> {
  if (kernel !== null) return kernel;
  const bytes = kernelBytes();
  if (typeof WebAssembly === 'undefined' || !WebAssembly.validate(bytes)) return loadWasmKernel(); // throws
  const module = await WebAssembly.compile(bytes);
  kernel ??= new WasmRayKernel(module);
  return kernel;
}

/** Picks the kernel the batch queries use on this thread (see the file comment). */
export function setRayKernel(m: RayKernelMode): void {
  if (m !== 'auto' && m !== 'js' && m !== 'wasm') throw new Error(`setRayKernel: "${String(m)}" is not auto, js or wasm`);
  mode = m;
}

/** The current mode on this thread. */
export function getRayKernel(): RayKernelMode {
  return mode;
}

/**
 * The wasm kernel to trace `bvh` with, or null for JavaScript. In 'wasm' mode a kernel that cannot
 * load or a scene beyond its limits throws instead of falling back.
 */
export function wasmKernelFor(bvh: BvhData): WasmRayKernel | null {
  if (mode === 'js') return null;
  let k = kernel;
  if (k === null) {
    if (mode === 'auto' && loadError !== null) return null;
    try { k = loadWasmKernel(); } catch (err) {
      loadError = err;
      if (mode === 'wasm') throw err;
      return null;
    }
  }
  if (!k.supports(bvh)) {
    if (mode === 'wasm') throw new Error(`wasm ray kernel: ${bvh.triangleCount} triangles is beyond its limit of ${MAX_TRIANGLES - 1}`);
    return null;
  }
  return k;
}
