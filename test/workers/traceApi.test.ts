// The worker API object, called in-process (no Worker): STYLE §10.
import { describe, it, expect } from 'vitest';
import { createTraceApi, chunkBuffers } from '../../src/trace/api.ts';
import { buildBvh } from '../../src/trace/bvh/build.ts';
import { sunVisibility } from '../../src/trace/queries/sunVisibility.ts';
import { skyVisibility } from '../../src/trace/queries/skyVisibility.ts';
import { surfaceViews } from '../../src/trace/queries/surfaceViews.ts';
import { MeshBuilder } from '../helpers/bruteTracer.ts';

function scene() {
  const m = new MeshBuilder();
  m.box(-1, -1, 0, 1, 1, 4, 0);
  m.quad([-5, 3, 0], [5, 3, 0], [5, 3, 3], [-5, 3, 3], 1);
  return { m, bvh: buildBvh(m.positions(), m.indices()) };
}

describe('trace API object', () => {
  it('answers ping and runs each query kind on a stored BVH and task, equal to a direct call', () => {
    const { m, bvh } = scene();
    const api = createTraceApi();
    expect(api.ping()).toBe('ready');
    api.putBvh(7, bvh);
    const points = Float32Array.of(0, -2, 0.5, 0, 2, 0.5, 3, 0, 1, 0, 5, 1);
    const sun = { points, sunDirections: Float32Array.of(0, -0.5, 0.866, 0.7, 0, 0.7, 0, 0.9, 0.43) };
    api.putTask(1, { kind: 'sunVisibility', bvhId: 7, input: sun });
    const r1 = api.runChunk(1, 1, 3);
    expect(r1.kind).toBe('sunVisibility');
    if (r1.kind !== 'sunVisibility') throw new Error('kind');
    expect([r1.start, r1.end]).toEqual([1, 3]);
    expect(Array.from(r1.visible)).toEqual(Array.from(sunVisibility(bvh, sun, 1, 3)));

    const sky = { points, ground: { z: 0 }, samplesPerPatch: 4, seed: 3 };
    api.putTask(2, { kind: 'skyVisibility', bvhId: 7, input: sky });
    const r2 = api.runChunk(2, 0, 4);
    if (r2.kind !== 'skyVisibility') throw new Error('kind');
    expect(Array.from(r2.skyViewFactor)).toEqual(Array.from(skyVisibility(bvh, sky).skyViewFactor));

    const views = { points, trianglePatch: m.trianglePatch(), patchCount: 2, samplesPerDirection: 16 };
    api.putTask(3, { kind: 'surfaceViews', bvhId: 7, input: views });
    const r3 = api.runChunk(3, 2, 4);
    if (r3.kind !== 'surfaceViews') throw new Error('kind');
    const direct = surfaceViews(bvh, views, 2, 4);
    expect(Array.from(r3.patchIndex)).toEqual(Array.from(direct.patchIndex));
    expect(Array.from(r3.fraction)).toEqual(Array.from(direct.fraction));
    // every result buffer is listed for transfer
    expect(chunkBuffers(r3).length).toBe(6);
  });

  it('refuses unknown task and BVH ids, and forgets dropped ones', () => {
    const { bvh } = scene();
    const api = createTraceApi();
    const input = { points: Float32Array.of(0, 0, 1), sunDirections: Float32Array.of(0, 0, 1) };
    expect(() => api.putTask(1, { kind: 'sunVisibility', bvhId: 5, input })).toThrow(/unknown BVH id/);
    api.putBvh(5, bvh);
    api.putTask(1, { kind: 'sunVisibility', bvhId: 5, input });
    expect(() => api.runChunk(2, 0, 1)).toThrow(/unknown task id/);
    api.dropBvh(5);
    expect(() => api.runChunk(1, 0, 1)).toThrow(/BVH was dropped/);
    api.dropTask(1);
    expect(() => api.runChunk(1, 0, 1)).toThrow(/unknown task id/);
  });
});
