/** Which WebGL renderer the browser gives this page: asked once, before the view's own context is made. */
import { isSoftwareRendererName, modelTriangles, renderQuality, type RenderQuality } from './quality.ts';

let software: boolean | null = null;

/**
 * True when WebGL shades on the CPU (SwiftShader, llvmpipe...). Asks a throwaway WebGL2 context
 * for its unmasked renderer name and releases it; false when the name is hidden or there is no
 * DOM (tests).
 */
export function softwareRenderer(): boolean {
  if (software !== null) return software;
  software = false;
  if (typeof document === 'undefined') return software;
  try {
    const gl = document.createElement('canvas').getContext('webgl2', { antialias: false, depth: false, powerPreference: 'high-performance' });
    if (gl) {
      const info = gl.getExtension('WEBGL_debug_renderer_info');
      const name = info ? String(gl.getParameter(info.UNMASKED_RENDERER_WEBGL)) : '';
      software = isSoftwareRendererName(name);
      gl.getExtension('WEBGL_lose_context')?.loseContext();
    }
  } catch {
    software = false;
  }
  return software;
}

/** The view's settings for a model (null: none) on this page's renderer. */
export function viewQuality(model: { indices: { length: number } } | null): RenderQuality {
  return renderQuality(modelTriangles(model), softwareRenderer());
}
