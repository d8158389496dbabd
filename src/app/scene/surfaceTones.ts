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

/**
 * Per-vertex colours (3 vertices per triangle, non-indexed) for the model view or the assignments
 * view; sRGB, or linear (what three.js reads from a colour attribute) with `linear`. Each
 * surface's colour is worked out once, then copied to its triangles.
 */
export function modelColours(model: ModelView, perSurface: readonly string[], mode: 'model' | 'materials', selected: number | null, linear = false): Float32Array {
  const used = presetsInUse(perSurface);
  const nSurf = model.surfaceNames.length;
  const surfRgb = new Float32Array(Math.max(1, nSurf + 1) * 3);
  for (let s = 0; s <= nSurf; s++) {
    const p = perSurface[s] ?? '';
    let c = mode === 'materials' ? categoryColour(used.indexOf(p)) : neutralTone(p);
    if (selected === s) c = [Math.min(1, c[0] * 0.5 + 0.5), Math.min(1, c[1] * 0.5 + 0.45), Math.min(1, c[2] * 0.3 + 0.1)];
    for (let k = 0; k < 3; k++) surfRgb[s * 3 + k] = linear ? srgbChannelToLinear(c[k]!) : c[k]!;
  }
  const tri = model.indices.length / 3;
  const out = new Float32Array(tri * 9);
  for (let t = 0; t < tri; t++) {
    // Surface ids past the names (none expected) take the '' preset's colour, as before.
    const s = Math.min(model.surfaceIds[t]!, nSurf) * 3;
    const r = surfRgb[s]!, g = surfRgb[s + 1]!, b = surfRgb[s + 2]!;
    for (let k = 0; k < 3; k++) {
      out[t * 9 + k * 3] = r;
      out[t * 9 + k * 3 + 1] = g;
      out[t * 9 + k * 3 + 2] = b;
    }
  }
  return out;
}

/** sRGB → linear for one channel (IEC 61966-2-1 transfer function). */
function srgbChannelToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** Flat normals (one per triangle, on its 3 vertices) of non-indexed positions (9 floats per triangle). */
export function flatNormals(positions: Float32Array): Float32Array {
  const out = new Float32Array(positions.length);
  for (let i = 0; i + 8 < positions.length; i += 9) {
    const ax = positions[i + 3]! - positions[i]!, ay = positions[i + 4]! - positions[i + 1]!, az = positions[i + 5]! - positions[i + 2]!;
    const bx = positions[i + 6]! - positions[i]!, by = positions[i + 7]! - positions[i + 1]!, bz = positions[i + 8]! - positions[i + 2]!;
    let nx = ay * bz - az * by, ny = az * bx - ax * bz, nz = ax * by - ay * bx;
    const len = Math.hypot(nx, ny, nz);
    if (len > 0) {
      nx /= len;
      ny /= len;
      nz /= len;
    }
    for (let k = 0; k < 9; k += 3) {
      out[i + k] = nx;
      out[i + k + 1] = ny;
      out[i + k + 2] = nz;
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
