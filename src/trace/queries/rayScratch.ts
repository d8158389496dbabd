/**
 * Module-scope scratch for the batch-traced paths of the queries (`batchRays: true`): the rays of
 * one receiver (or a small block of receivers) are generated here, traced with one call of
 * ../bvh/batch.ts, then accumulated. Arrays only grow (by doubling), never per ray.
 *
 * Layout: `rays` 6 floats per ray (ox oy oz dx dy dz, float32 as the batch API takes them);
 * `dirs` the same directions in float64 (3 per ray, for crown transmittance and re-traces);
 * `weight` and `tMax` one float64 per ray; `flags`, `hitT`, `hitTri` the batch outputs.
 */

/** Receivers' rays per batch call for queries with few rays per receiver (sun visibility). */
export const BLOCK_RAYS = 8192;

export const scratch = {
  capacity: 0,
  rays: new Float32Array(0),
  dirs: new Float64Array(0),
  weight: new Float64Array(0),
  tMax: new Float64Array(0),
  target: new Int32Array(0),
  flags: new Uint8Array(0),
  hitT: new Float32Array(0),
  hitTri: new Int32Array(0),
};

/** Makes every scratch array hold at least `rays` rays (keeps nothing on growth). */
export function ensureRayScratch(rays: number): void {
  if (scratch.capacity >= rays) return;
  let cap = Math.max(1024, scratch.capacity);
  while (cap < rays) cap *= 2;
  scratch.capacity = cap;
  scratch.rays = new Float32Array(cap * 6);
  scratch.dirs = new Float64Array(cap * 3);
  scratch.weight = new Float64Array(cap);
  scratch.tMax = new Float64Array(cap);
  scratch.target = new Int32Array(cap);
  scratch.flags = new Uint8Array(cap);
  scratch.hitT = new Float32Array(cap);
  scratch.hitTri = new Int32Array(cap);
}
