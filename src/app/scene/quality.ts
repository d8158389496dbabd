/**
 * How much the view draws for a model of a given size. The software renderers of headless and
 * GPU-less machines shade every pixel on the CPU, so above a triangle count the view drops the
 * shadow pass (it draws the whole model a second time into the shadow map), uses a cheaper
 * material, caps the pixel ratio and lowers it while the camera moves.
 */

/** Above this many model triangles the view switches to the light settings [triangles]. */
export const LARGE_MODEL_TRIANGLES = 100_000;

export interface RenderQuality {
  large: boolean;
  /** Sun shadows drawn. */
  shadows: boolean;
  /** Side of the shadow map [px]. */
  shadowMapSizePx: number;
  /** 'standard' = physically based shading; 'lambert' = diffuse only (per-vertex lighting cost). */
  material: 'standard' | 'lambert';
  /** Largest device pixel ratio when still. */
  maxDpr: number;
  /** Pixel ratio while orbiting / panning / zooming. */
  movingDpr: number;
}

/** Settings for a model of `triangles` triangles (0 when no model). */
export function renderQuality(triangles: number): RenderQuality {
  if (triangles > LARGE_MODEL_TRIANGLES) return { large: true, shadows: false, shadowMapSizePx: 1024, material: 'lambert', maxDpr: 1, movingDpr: 0.5 };
  return { large: false, shadows: true, shadowMapSizePx: 2048, material: 'standard', maxDpr: 2, movingDpr: 1 };
}

/** Triangles of the model shown (0 without one). */
export function modelTriangles(model: { indices: { length: number } } | null): number {
  return model ? model.indices.length / 3 : 0;
}
