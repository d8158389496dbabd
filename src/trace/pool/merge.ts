/** Puts chunk results (in receiver order) together into one result per query. */
import type { TraceChunkResult } from '../api.ts';
import type { SkyVisibilityResult } from '../queries/skyVisibility.ts';
import type { SurfaceViewsResult } from '../queries/surfaceViews.ts';

type Of<K extends TraceChunkResult['kind']> = Extract<TraceChunkResult, { kind: K }>;

/** `offset`: the first receiver of the merged range (0 for a full run). */
export function mergeSunVisibility(chunks: readonly Of<'sunVisibility'>[], receiverCount: number, sunCount: number, offset = 0): Uint8Array {
  const out = new Uint8Array(receiverCount * sunCount);
  for (const c of chunks) out.set(c.visible, (c.start - offset) * sunCount);
  return out;
}

export function mergeSkyVisibility(chunks: readonly Of<'skyVisibility'>[], receiverCount: number, offset = 0, patchCount?: number): SkyVisibilityResult {
  const K = chunks[0]?.patchCount ?? patchCount ?? 0;
  const out: SkyVisibilityResult = {
    patchCount: K,
    patchProjectedSr: new Float32Array(receiverCount * K),
    skyViewFactor: new Float32Array(receiverCount),
    groundViewFactor: new Float32Array(receiverCount),
  };
  for (const c of chunks) {
    out.patchProjectedSr.set(c.patchProjectedSr, (c.start - offset) * K);
    out.skyViewFactor.set(c.skyViewFactor, c.start - offset);
    out.groundViewFactor.set(c.groundViewFactor, c.start - offset);
  }
  return out;
}

/** Chunks must be in receiver order and cover [0, receiverCount) without gaps. */
export function mergeSurfaceViews(chunks: readonly Of<'surfaceViews'>[], receiverCount: number, directions: number, offset = 0): SurfaceViewsResult {
  const rows = receiverCount * directions;
  let nnz = 0;
  for (const c of chunks) nnz += c.patchIndex.length;
  const out: SurfaceViewsResult = {
    directionsPerReceiver: directions,
    rowStart: new Uint32Array(rows + 1),
    patchIndex: new Uint32Array(nnz),
    fraction: new Float32Array(nnz),
    skyFraction: new Float32Array(rows),
    groundFraction: new Float32Array(rows),
    otherFraction: new Float32Array(rows),
  };
  let at = 0;
  for (const c of chunks) {
    const row0 = (c.start - offset) * directions;
    const n = (c.end - c.start) * directions;
    for (let r = 0; r < n; r++) out.rowStart[row0 + r] = c.rowStart[r]! + at;
    out.patchIndex.set(c.patchIndex, at);
    out.fraction.set(c.fraction, at);
    out.skyFraction.set(c.skyFraction, row0);
    out.groundFraction.set(c.groundFraction, row0);
    out.otherFraction.set(c.otherFraction, row0);
    at += c.patchIndex.length;
  }
  out.rowStart[rows] = at;
  return out;
}
