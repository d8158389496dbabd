import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import * as vm from 'node:vm';
import { build } from 'esbuild';
import { importModel } from '../../../src/geometry/import/index.ts';
import { InputError } from '../../../src/physics/errors.ts';
import { boxGltfDocument, boxObj, memoryReader, surfaceAreas, triangleSet, writeGlb, writeGltfJson } from '../../helpers/models.ts';
import { FIXTURE_BOX_SIZE, FIXTURE_DIR } from '../../helpers/writeModelFixtures.ts';

const SIZE: [number, number, number] = [2, 3, 4];
const ORIGIN: [number, number, number] = [1.5, -2, 0.25];

async function threeFormats(opts: { unitsPerMeter?: number; northDeg?: number } = {}, scale = 1) {
  const size = SIZE.map((v) => v * scale) as [number, number, number];
  const origin = ORIGIN.map((v) => v * scale) as [number, number, number];
  const doc = boxGltfDocument(size, origin);
  const glb = await importModel(await writeGlb(doc), 'box.glb', opts);
  const { gltf, resources } = await writeGltfJson(doc);
  const gltfScene = await importModel(gltf, 'box.gltf', { ...opts, readExternal: memoryReader(resources).read });
  const obj = await importModel(new TextEncoder().encode(boxObj(size, origin)), 'box.obj', opts);
  return { glb, gltf: gltfScene, obj };
}

describe('importModel: the same box from .glb, .gltf + .bin and .obj gives the same Scene', () => {
  it('same triangle count, same triangles (positions and winding) after transform, same areas', async () => {
    const { glb, gltf, obj } = await threeFormats();
    for (const s of [glb, gltf, obj]) expect(s.indices.length / 3).toBe(12);
    const ref = triangleSet(obj.positions, obj.indices);
    expect(triangleSet(glb.positions, glb.indices)).toEqual(ref);
    expect(triangleSet(gltf.positions, gltf.indices)).toEqual(ref);
    expect(surfaceAreas(glb)['box']).toBeCloseTo(52, 9);
    expect(surfaceAreas(gltf)['box']).toBeCloseTo(surfaceAreas(obj)['box']!, 9);
    expect(glb.materialNames).toEqual(obj.materialNames);
  });

  it('a box in millimetres with unitsPerMeter 1000 is the same metre box', async () => {
    const mm = await threeFormats({ unitsPerMeter: 1000 }, 1000);
    const ref = await threeFormats();
    for (const k of ['glb', 'gltf', 'obj'] as const) {
      expect(triangleSet(mm[k].positions, mm[k].indices, 4)).toEqual(triangleSet(ref[k].positions, ref[k].indices, 4));
      expect(surfaceAreas(mm[k])['box']).toBeCloseTo(52, 4);
    }
  });

  it('northDeg 90 turns the model clockwise: model +y → engine +x, model +x → engine −y, in every format', async () => {
    const turned = await threeFormats({ northDeg: 90 });
    // Box x ∈ [1.5, 3.5], y ∈ [−2, 1] turned clockwise by 90° ((x, y) → (y, −x)): x ∈ [−2, 1], y ∈ [−3.5, −1.5].
    for (const k of ['glb', 'gltf', 'obj'] as const) {
      const p = turned[k].positions;
      const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
      for (let i = 0; i < p.length; i++) {
        lo[i % 3] = Math.min(lo[i % 3]!, p[i]!);
        hi[i % 3] = Math.max(hi[i % 3]!, p[i]!);
      }
      expect(lo).toEqual([-2, -3.5, 0.25]);
      expect(hi).toEqual([1, -1.5, 4.25]);
    }
    expect(triangleSet(turned.glb.positions, turned.glb.indices)).toEqual(triangleSet(turned.obj.positions, turned.obj.indices));
  });

  it('the fixture files on disk match the helper and import through a file reader (the CLI route)', async () => {
    const dir = FIXTURE_DIR;
    const readExternal = async (uri: string) => new Uint8Array(readFileSync(join(dir, uri)));
    const fromDisk = await Promise.all(
      ['box.glb', 'box.gltf', 'box.obj'].map(async (f) => importModel(new Uint8Array(readFileSync(join(dir, f))), f, { readExternal })),
    );
    expect(readFileSync(join(dir, 'box.obj'), 'utf8')).toBe(boxObj(FIXTURE_BOX_SIZE));
    const ref = triangleSet(fromDisk[2]!.positions, fromDisk[2]!.indices);
    for (const s of fromDisk) {
      expect(s.indices.length / 3).toBe(12);
      expect(triangleSet(s.positions, s.indices)).toEqual(ref);
    }
  });

  it('refuses an unknown extension', async () => {
    await expect(importModel(new Uint8Array(4), 'model.fbx')).rejects.toThrow(InputError);
    await expect(importModel(new Uint8Array(4), 'model.fbx')).rejects.toThrow(/model\.fbx: file extension: unknown model file type/);
  });
});

describe('the importers need no Node-only API', () => {
  it('src/geometry bundles for the browser and imports bytes in a bare JS realm (no process, Buffer, require, fs)', async () => {
    // esbuild with platform "browser" fails on any node: import or Node built-in.
    const out = await build({
      entryPoints: [join(import.meta.dirname, '../../../src/geometry/index.ts')],
      bundle: true,
      platform: 'browser',
      format: 'iife',
      globalName: 'geometry',
      write: false,
      logLevel: 'silent',
    });
    const code = out.outputFiles[0]!.text;
    expect(code).not.toMatch(/\brequire\(|node:/);
    // A fresh realm with only TextDecoder (a web API) beside the language built-ins.
    const realm = vm.createContext({ TextDecoder });
    vm.runInContext(code, realm);
    const api = vm.runInContext('geometry', realm) as typeof import('../../../src/geometry/index.ts');
    expect(vm.runInContext('typeof process + typeof Buffer + typeof require', realm)).toBe('undefinedundefinedundefined');
    const glb = await api.importGltf(await writeGlb(boxGltfDocument(SIZE)), 'box.glb', {});
    expect(glb.indices.length / 3).toBe(12);
    const { gltf, resources } = await writeGltfJson(boxGltfDocument(SIZE));
    const fromJson = await api.importModel(gltf, 'box.gltf', { readExternal: memoryReader(resources).read });
    expect(fromJson.indices.length / 3).toBe(12);
    const obj = api.importObj(boxObj(SIZE), 'box.obj', {});
    expect(triangleSet(obj.positions, obj.indices)).toEqual(triangleSet(glb.positions, glb.indices));
    const patches = api.buildPatches(obj);
    expect(patches.count).toBeGreaterThan(6);
  });
});
