/**
 * Links the patches drawn in the viewer to the result surfaces of an audit: by patch id (the
 * discretiser is deterministic, so ids agree when the audit used the same settings), else to the
 * result patch of the same surface with the nearest centroid (so a different patch size still
 * shows sensible colours). Pure.
 */
import type { SurfaceResult } from '../../audit/results.ts';

export interface DisplayPatches {
  ids: readonly string[];
  /** Surface name per patch. */
  surfaces: readonly string[];
  /** xyz per patch [m], engine frame. */
  centroids: ArrayLike<number>;
}

/** For each display patch, the index into `resultSurfaces`, or −1 when nothing fits. */
export function matchPatchesToResults(display: DisplayPatches, resultSurfaces: readonly Pick<SurfaceResult, 'id' | 'surface' | 'centroid'>[]): Int32Array {
  const byId = new Map<string, number>();
  const bySurface = new Map<string, number[]>();
  resultSurfaces.forEach((s, i) => {
    byId.set(s.id, i);
    const list = bySurface.get(s.surface);
    if (list) list.push(i);
    else bySurface.set(s.surface, [i]);
  });
  const out = new Int32Array(display.ids.length).fill(-1);
  for (let p = 0; p < display.ids.length; p++) {
    const exact = byId.get(display.ids[p]!);
    const candidates = bySurface.get(display.surfaces[p]!);
    if (exact !== undefined && resultSurfaces[exact]!.surface === display.surfaces[p]) {
      out[p] = exact;
      continue;
    }
    if (!candidates) continue;
    const x = display.centroids[p * 3]!, y = display.centroids[p * 3 + 1]!, z = display.centroids[p * 3 + 2]!;
    let best = -1;
    let bestD = Infinity;
    for (const i of candidates) {
      const c = resultSurfaces[i]!.centroid;
      const d = (c[0] - x) ** 2 + (c[1] - y) ** 2 + (c[2] - z) ** 2;
      if (d < bestD) {
        bestD = d;
        best = i;
      }
    }
    out[p] = best;
  }
  return out;
}
