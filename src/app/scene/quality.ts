/**
 * How much the view draws for a model of a given size and a given renderer. The software
 * renderers of headless and GPU-less machines shade every pixel on the CPU, and the browser then
 * copies each drawn frame back to the page on the main thread (software compositing), so the page
 * waits for the whole frame. There the view draws without multisampling and with a smaller shadow
 * map; above a triangle count it also drops the shadow pass (it draws the whole model a second
 * time into the shadow map), uses a cheaper material, caps the pixel ratio and lowers it while the
 * camera moves.
 */

/** Above this many model triangles the view switches to the light settings [triangles]. */
export const LARGE_MODEL_TRIANGLES = 100_000;

export interface RenderQuality {
  large: boolean;
  /** Multisampled edges (decided when the WebGL context is made). */
  antialias: boolean;
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

/**
 * Settings for a model of `triangles` triangles (0 when no model); `software` when the WebGL
 * renderer shades on the CPU (see `renderer.ts`).
 */
export function renderQuality(triangles: number, software = false): RenderQuality {
  if (triangles > LARGE_MODEL_TRIANGLES) return { large: true, antialias: false, shadows: false, shadowMapSizePx: 1024, material: 'lambert', maxDpr: 1, movingDpr: 0.5 };
  if (software) return { large: false, antialias: false, shadows: true, shadowMapSizePx: 1024, material: 'lambert', maxDpr: 1, movingDpr: 1 };
  return { large: false, antialias: true, shadows: true, shadowMapSizePx: 2048, material: 'standard', maxDpr: 2, movingDpr: 1 };
}

/** Triangles of the model shown (0 without one). */
export function modelTriangles(model: { indices: { length: number } } | null): number {
  return model ? model.indices.length / 3 : 0;
}

/** True when a WebGL renderer name (UNMASKED_RENDERER_WEBGL) is a CPU rasteriser. */
export function isSoftwareRendererName(name: string): boolean {
  return /swiftshader|llvmpipe|softpipe|software|basic render/i.test(name);
}
