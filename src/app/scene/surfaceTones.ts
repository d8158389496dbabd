/**
 * Colours of the model when no results are shown: a neutral grey whose lightness follows the
 * assigned preset's visible reflectance (glazing a cool grey), or, in the assignments view, one
 * categorical colour per preset. Pure: returns per-vertex colours for the drawn triangles.
 */
import { MATERIAL_PRESETS } from '../../physics/materials.ts';
import { categoryColour } from '../colour/scales.ts';
import { assignedPreset, type ProjectDoc } from '../state/projectDoc.ts';
import type { ModelView } from '../compute/auditApi.ts';

/** Neutral tone of a preset: sRGB grey from its visible reflectance (glazing: a cool grey). */
export function neutralTone(presetId: string): [number, number, number] {
  const m = MATERIAL_PRESETS[presetId];
  if (!m) return [0.7, 0.7, 0.7];
  if (m.transmittanceVisible > 0.05) return [0.62, 0.7, 0.76];
  const g = 0.28 + 0.62 * Math.sqrt(Math.min(1, Math.max(0, m.reflectanceVisible)));
  return [g, g, g * 0.98];
}

/** Preset id per surface of the model (surfaceNames order), using its first triangle's material. */
export function presetPerSurface(doc: ProjectDoc, model: ModelView): string[] {
  const firstMat = new Array<number>(model.surfaceNames.length).fill(-1);
  for (let t = 0; t < model.surfaceIds.length; t++) {
    const s = model.surfaceIds[t]!;
    if (firstMat[s] === -1) firstMat[s] = model.materialIds[t]!;
  }
  return model.surfaceNames.map((name, s) => assignedPreset(doc, name, model.materialNames[firstMat[s]!] ?? '').preset);
}

/** The presets in use, in first-use order (the assignments legend). */
export function presetsInUse(perSurface: readonly string[]): string[] {
  return [...new Set(perSurface)];
}

/** Per-vertex colours (3 vertices per triangle, non-indexed) for the model view or the assignments view. */
export function modelColours(model: ModelView, perSurface: readonly string[], mode: 'model' | 'materials', selected: number | null): Float32Array {
  const used = presetsInUse(perSurface);
  const tri = model.indices.length / 3;
  const out = new Float32Array(tri * 9);
  for (let t = 0; t < tri; t++) {
    const s = model.surfaceIds[t]!;
    const p = perSurface[s] ?? '';
    let c = mode === 'materials' ? categoryColour(used.indexOf(p)) : neutralTone(p);
    if (selected === s) c = [Math.min(1, c[0] * 0.5 + 0.5), Math.min(1, c[1] * 0.5 + 0.45), Math.min(1, c[2] * 0.3 + 0.1)];
    for (let k = 0; k < 3; k++) {
      out[t * 9 + k * 3] = c[0];
      out[t * 9 + k * 3 + 1] = c[1];
      out[t * 9 + k * 3 + 2] = c[2];
    }
  }
  return out;
}

/** Non-indexed positions (9 floats per triangle) of an indexed model. */
export function unindexedPositions(model: ModelView): Float32Array {
  const tri = model.indices.length / 3;
  const out = new Float32Array(tri * 9);
  for (let t = 0; t < tri; t++) {
    for (let k = 0; k < 3; k++) {
      const v = model.indices[t * 3 + k]! * 3;
      out[t * 9 + k * 3] = model.positions[v]!;
      out[t * 9 + k * 3 + 1] = model.positions[v + 1]!;
      out[t * 9 + k * 3 + 2] = model.positions[v + 2]!;
    }
  }
  return out;
}
