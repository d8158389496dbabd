/**
 * The results as a glTF 2.0 binary: the audit's own patch triangles (one node per model surface,
 * named as in the model, its material named by the preset id), each triangle coloured (COLOR_0,
 * linear RGBA) by one surface metric at one time step on a perceptually uniform scale, with the
 * values in `extras` so a viewer or CAD tool can read the numbers, not only the colours.
 *
 * Layout of `extras`:
 * - document: `{ sunfacet: 1, project, metric, unit, time, stepIndex, scale, range: {min, max},
 *   modelHashFnv1a32, caution }`; the range is over every patch and step of the period, so
 *   exports of different steps share one colour key;
 * - node: `{ patchIds: string[], values: number[] (null where not finite), firstTriangle: number[] }`,
 *   patch k of the node owning triangles firstTriangle[k] … firstTriangle[k+1]−1 of its primitive.
 *
 * Vertices are not shared between triangles, so every patch is one flat colour. Pure: returns bytes.
 */
import type { Results, SurfaceResult } from '../audit/results.ts';
import type { Patches } from '../geometry/patches.ts';
import { InputError } from '../physics/errors.ts';
import { writeGlb, type GltfMeshInput } from './gltfWriter.ts';
import { sampleScale, srgbToLinear, type ScaleId } from './palette.ts';
import { CAUTIONS } from './html.ts';

export type SurfaceMetricId = 'surfaceTempC' | 'incidentShortwaveWm2' | 'longwaveEmissionWm2';

export const SURFACE_METRICS: Record<SurfaceMetricId, { label: string; unit: string }> = {
  surfaceTempC: { label: 'surface temperature', unit: '°C' },
  incidentShortwaveWm2: { label: 'incident shortwave', unit: 'W/m²' },
  longwaveEmissionWm2: { label: 'emitted longwave', unit: 'W/m²' },
};

export interface ResultsGlbOptions {
  metric: SurfaceMetricId;
  /** Index into Results.times. */
  stepIndex: number;
  scale?: ScaleId;
}

/**
 * The step to export: the one whose label is `time` (same instant, any offset), or, when `time` is
 * undefined, the step with the highest area-weighted mean of the metric.
 * @throws InputError when `time` is given and matches no step.
 */
export function pickStep(results: Results, metric: SurfaceMetricId, time?: string): number {
  if (time !== undefined) {
    const ms = Date.parse(time);
    const i = results.times.findIndex((t) => t === time || (Number.isFinite(ms) && Date.parse(t) === ms));
    if (i < 0) {
      throw new InputError({ place: '--time', problem: 'no step of the results at this time', value: time, expected: `one of the audit's times, ${results.times[0]} … ${results.times[results.times.length - 1]}` });
    }
    return i;
  }
  let best = 0, bestMean = -Infinity;
  for (let t = 0; t < results.times.length; t++) {
    let s = 0, a = 0;
    for (const p of results.surfaces) {
      const v = p[metric][t] ?? NaN;
      if (Number.isFinite(v)) { s += v * p.areaM2; a += p.areaM2; }
    }
    const m = a > 0 ? s / a : -Infinity;
    if (m > bestMean) { bestMean = m; best = t; }
  }
  return best;
}

/**
 * Builds the results glTF from the re-created patches and the results.
 * @param patches The audit's patches (`prepareModel(project).patches`), in results order.
 * @throws InputError when the patches do not match the results (another model or project).
 */
export function resultsGlb(patches: Patches, results: Results, opts: ResultsGlbOptions): Uint8Array {
  const surfaces = results.surfaces;
  if (patches.count !== surfaces.length) {
    throw new InputError({ place: 'model', problem: `the model gives ${patches.count} patches but the results have ${surfaces.length}`, expected: 'the project and model the results were computed from' });
  }
  for (let i = 0; i < patches.count; i++) {
    if (patches.ids[i] !== surfaces[i]!.id) {
      throw new InputError({ place: `patch ${i}`, problem: `the model's patch is "${patches.ids[i]}" but the results have "${surfaces[i]!.id}"`, expected: 'the project and model the results were computed from' });
    }
  }
  const T = results.times.length;
  const t = opts.stepIndex;
  if (!(Number.isInteger(t) && t >= 0 && t < T)) {
    throw new InputError({ place: 'stepIndex', problem: 'outside the results', value: t, expected: `an integer in [0, ${T - 1}]` });
  }
  const scale = opts.scale ?? 'magma';
  const metric = opts.metric;
  let min = Infinity, max = -Infinity;
  for (const s of surfaces) for (const v of s[metric]) if (Number.isFinite(v)) { if (v < min) min = v; if (v > max) max = v; }
  if (!Number.isFinite(min)) { min = 0; max = 1; }
  const span = max > min ? max - min : 1;

  // Group patches by surface (node), keeping patch order.
  const bySurface = new Map<number, number[]>();
  for (let p = 0; p < patches.count; p++) {
    const sid = patches.surfaceIds[p]!;
    const l = bySurface.get(sid);
    if (l) l.push(p);
    else bySurface.set(sid, [p]);
  }
  const pos = patches.scene.positions;
  const idx = patches.scene.indices;
  const rgb = [0, 0, 0];
  const meshes: GltfMeshInput[] = [];
  for (const [sid, list] of bySurface) {
    let tris = 0;
    for (const p of list) tris += patches.triangleOffsets[p + 1]! - patches.triangleOffsets[p]!;
    const positions = new Float32Array(tris * 9);
    const colors = new Float32Array(tris * 12);
    const indices = new Uint32Array(tris * 3);
    const patchIds: string[] = [];
    const values: (number | null)[] = [];
    const firstTriangle: number[] = [];
    const materials = new Set<string>();
    let tri = 0;
    for (const p of list) {
      const s = surfaces[p] as SurfaceResult;
      const v = s[metric][t] ?? NaN;
      materials.add(s.material);
      patchIds.push(s.id);
      values.push(Number.isFinite(v) ? v : null);
      firstTriangle.push(tri);
      if (Number.isFinite(v)) {
        sampleScale(scale, (v - min) / span, rgb);
        for (let k = 0; k < 3; k++) rgb[k] = srgbToLinear(rgb[k]!);
      } else {
        rgb[0] = rgb[1] = rgb[2] = 0.25;
      }
      for (let q = patches.triangleOffsets[p]!; q < patches.triangleOffsets[p + 1]!; q++, tri++) {
        for (let c = 0; c < 3; c++) {
          const vi = idx[3 * q + c]! * 3;
          const o = tri * 3 + c;
          positions[3 * o] = pos[vi]!;
          positions[3 * o + 1] = pos[vi + 1]!;
          positions[3 * o + 2] = pos[vi + 2]!;
          colors[4 * o] = rgb[0]!;
          colors[4 * o + 1] = rgb[1]!;
          colors[4 * o + 2] = rgb[2]!;
          colors[4 * o + 3] = 1;
          indices[o] = o;
        }
      }
    }
    const name = patches.scene.surfaceNames[sid] ?? `surface-${sid}`;
    meshes.push({
      name,
      materialName: [...materials].join('+'),
      positions,
      indices,
      colors,
      baseColor: [1, 1, 1, 1],
      extras: { patchIds, values, firstTriangle },
    });
  }
  const info = SURFACE_METRICS[metric];
  return writeGlb(meshes, {
    generator: `${String(results.run.software ?? 'sunfacet')} report`,
    extras: {
      sunfacet: 1,
      project: results.project,
      metric,
      label: info.label,
      unit: info.unit,
      time: results.times[t],
      stepIndex: t,
      scale,
      range: { min, max },
      modelHashFnv1a32: results.run.modelHashFnv1a32 ?? null,
      caution: CAUTIONS.join(' '),
    },
  });
}
