/** The cheaper model drawing paths give the same results as the general ones they replace, and the renderer-dependent settings. */
import { describe, it, expect } from 'vitest';
import { BufferAttribute, BufferGeometry } from 'three';
import { flatNormals, modelColours } from '../../src/app/scene/surfaceTones.ts';
import { srgbToLinearInPlace } from '../../src/app/scene/colourAttr.ts';
import { isSoftwareRendererName, renderQuality, LARGE_MODEL_TRIANGLES } from '../../src/app/scene/quality.ts';
import type { ModelView } from '../../src/app/compute/auditApi.ts';

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

describe('flatNormals', () => {
  it('matches three.js computeVertexNormals on non-indexed triangles', () => {
    const r = rng(3);
    const pos = new Float32Array(9 * 200);
    for (let i = 0; i < pos.length; i++) pos[i] = (r() - 0.5) * 20;
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(pos, 3));
    g.computeVertexNormals();
    const ref = g.getAttribute('normal').array as Float32Array;
    const mine = flatNormals(pos);
    let worst = 0;
    for (let i = 0; i < ref.length; i++) worst = Math.max(worst, Math.abs(ref[i]! - mine[i]!));
    expect(worst).toBeLessThan(1e-5); // float32 rounding only
  });
  it('gives +z for a counter-clockwise triangle seen from above', () => {
    expect(Array.from(flatNormals(new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0])).slice(0, 3))).toEqual([0, 0, 1]);
  });
});

describe('modelColours', () => {
  const model: ModelView = {
    fileName: 't.obj',
    positions: new Float32Array(12),
    indices: new Uint32Array([0, 1, 2, 1, 2, 3, 0, 2, 3]),
    surfaceIds: new Uint32Array([0, 1, 1]),
    materialIds: new Uint32Array([0, 0, 0]),
    surfaceNames: ['a', 'b'],
    materialNames: ['m'],
    warnings: [],
    bounds: [0, 0, 0, 1, 1, 1],
  };
  const per = ['concrete-light', 'glass-clear'];
  for (const mode of ['model', 'materials'] as const) {
    it(`linear output equals the sRGB output converted afterwards (${mode} view, a surface selected)`, () => {
      const srgb = modelColours(model, per, mode, 1);
      const lin = modelColours(model, per, mode, 1, true);
      const conv = srgbToLinearInPlace(srgb.slice());
      for (let i = 0; i < lin.length; i++) expect(lin[i]).toBeCloseTo(conv[i]!, 6);
      // The two surfaces differ; the three vertices of a triangle share its colour.
      expect(srgb.slice(0, 3)).not.toEqual(srgb.slice(9, 12));
      expect(srgb.slice(9, 12)).toEqual(srgb.slice(15, 18));
    });
  }
});

describe('render quality by renderer', () => {
  it('recognises CPU rasterisers by their WebGL renderer names', () => {
    expect(isSoftwareRendererName('ANGLE (Google, Vulkan 1.3.0 (SwiftShader Device (Subzero)), SwiftShader driver)')).toBe(true);
    expect(isSoftwareRendererName('llvmpipe (LLVM 15.0.6, 256 bits)')).toBe(true);
    expect(isSoftwareRendererName('ANGLE (NVIDIA, NVIDIA GeForce RTX 3060 Direct3D11 vs_5_0 ps_5_0, D3D11)')).toBe(false);
  });
  it('drops multisampling and halves the shadow map on a software renderer, keeps them on a GPU', () => {
    const gpu = renderQuality(1000, false);
    const cpu = renderQuality(1000, true);
    expect(gpu.antialias).toBe(true);
    expect(cpu.antialias).toBe(false);
    expect(cpu.shadows).toBe(true);
    expect(cpu.shadowMapSizePx).toBeLessThan(gpu.shadowMapSizePx);
    expect(renderQuality(LARGE_MODEL_TRIANGLES + 1, false).antialias).toBe(false);
  });
});

describe('whenModelShown', () => {
  it('waits for a frame of that model (not an older one), else gives up after its timeout', async () => {
    const { frameShown, whenModelShown } = await import('../../src/app/scene/framesShown.ts');
    let done = false;
    const p = whenModelShown(7, 10_000).then(() => (done = true));
    frameShown(6);
    await new Promise((ok) => setTimeout(ok, 20));
    expect(done).toBe(false);
    frameShown(7);
    await p;
    expect(done).toBe(true);
    const t0 = Date.now();
    await whenModelShown(99, 50);
    expect(Date.now() - t0).toBeGreaterThanOrEqual(45);
  });
});
