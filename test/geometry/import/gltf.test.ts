import { describe, it, expect } from 'vitest';
import { importGltf, checkExternalUri, decodeBase64 } from '../../../src/geometry/import/gltf.ts';
import { InputError } from '../../../src/physics/errors.ts';
import {
  RawGltf,
  assembleGlb,
  boxGltfDocument,
  memoryReader,
  surfaceAreas,
  writeGlb,
  writeGltfJson,
} from '../../helpers/models.ts';

/** Awaits a rejection and returns the InputError (fails the test otherwise). */
async function inputError(p: Promise<unknown>): Promise<InputError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError, got success');
}

/** A unit right triangle in the glTF x–y plane as a raw file: one node, one mesh. */
function oneTriangle(): RawGltf {
  const g = new RawGltf();
  const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
  const mesh = g.mesh([{ attributes: { POSITION: pos } }], 'tri');
  g.json.scenes.push({ nodes: [g.node({ mesh })] });
  return g;
}

describe('importGltf: box written by an independent writer', () => {
  it('reads a .glb box: 12 triangles, y-up converted to z-up, 6 faces of 2×3, 3×4, 2×4', async () => {
    const glb = await writeGlb(boxGltfDocument([2, 3, 4]));
    const scene = await importGltf(glb, 'box.glb');
    expect(scene.indices.length / 3).toBe(12);
    expect(scene.surfaceNames).toEqual(['box']);
    expect(scene.materialNames).toEqual(['concrete']);
    // Engine bounding box: x in [0,2], y in [0,3], z in [0,4] (z up).
    const p = scene.positions;
    const ext = [0, 1, 2].map((c) => {
      let lo = Infinity, hi = -Infinity;
      for (let i = c; i < p.length; i += 3) { lo = Math.min(lo, p[i]!); hi = Math.max(hi, p[i]!); }
      return [lo, hi];
    });
    expect(ext).toEqual([[0, 2], [0, 3], [0, 4]]);
    // Surface area 2(2·3 + 3·4 + 2·4) = 52 m².
    expect(surfaceAreas(scene)['box']).toBeCloseTo(52, 9);
    expect(scene.warnings).toEqual([]);
    expect(scene.droppedTriangleCount).toBe(0);
  });

  it('reads the same box as .gltf + external .bin through readExternal', async () => {
    const { gltf, resources } = await writeGltfJson(boxGltfDocument([2, 3, 4]));
    const reader = memoryReader(resources);
    const scene = await importGltf(gltf, 'models/box.gltf', { readExternal: reader.read });
    expect(reader.asked).toEqual(Object.keys(resources));
    expect(scene.indices.length / 3).toBe(12);
    expect(surfaceAreas(scene)['box']).toBeCloseTo(52, 9);
  });

  it('keeps outward normals: every triangle normal points away from the box centre', async () => {
    const scene = await importGltf(await writeGlb(boxGltfDocument([2, 3, 4])), 'box.glb');
    const p = scene.positions, ix = scene.indices;
    for (let t = 0; t < ix.length / 3; t++) {
      const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
      const e1 = [p[b]! - p[a]!, p[b + 1]! - p[a + 1]!, p[b + 2]! - p[a + 2]!];
      const e2 = [p[c]! - p[a]!, p[c + 1]! - p[a + 1]!, p[c + 2]! - p[a + 2]!];
      const n = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
      const cen = [(p[a]! + p[b]! + p[c]!) / 3 - 1, (p[a + 1]! + p[b + 1]! + p[c + 1]!) / 3 - 1.5, (p[a + 2]! + p[b + 2]! + p[c + 2]!) / 3 - 2];
      expect(n[0]! * cen[0]! + n[1]! * cen[1]! + n[2]! * cen[2]!).toBeGreaterThan(0);
    }
  });
});

describe('importGltf: structure', () => {
  it('applies a nested node transform (parent TRS, child matrix) and reuses a mesh by two nodes', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    const mesh = g.mesh([{ attributes: { POSITION: pos } }], 'shared');
    // Child: matrix = translation (0, 0, -5) in glTF (→ engine y = +5).
    const child = g.node({ name: 'child', mesh, matrix: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, -5, 1] });
    // Parent: translate x by 10, scale 2, rotate 90° about glTF y (x → −z).
    const s = Math.SQRT1_2;
    const parent = g.node({ name: 'parent', mesh, children: [child], translation: [10, 0, 0], rotation: [0, s, 0, s], scale: [2, 2, 2] });
    g.json.scenes.push({ nodes: [parent] });
    const scene = await importGltf(g.glb(), 'nested.glb', { upAxis: 'z' }); // no up conversion: check the node maths alone
    expect(scene.surfaceNames).toEqual(['parent', 'child']);
    const tri = (t: number): number[][] =>
      [0, 1, 2].map((k) => Array.from(scene.positions.subarray(scene.indices[t * 3 + k]! * 3, scene.indices[t * 3 + k]! * 3 + 3)));
    // Parent: R_y(90°) maps (1,0,0) → (0,0,−1), (0,1,0) → (0,1,0); then ×2, then +10 x.
    const near = (a: number[][], b: number[][]): void => a.forEach((v, i) => v.forEach((x, c) => expect(x).toBeCloseTo(b[i]![c]!, 5)));
    near(tri(0), [[10, 0, 0], [10, 0, -2], [10, 2, 0]]);
    // Child: first translate (0,0,−5), then the parent: (0,0,−5) → R → (−5,0,0) → ×2 → (−10,0,0) → +10 → (0,0,0).
    near(tri(1), [[0, 0, 0], [0, 0, -2], [0, 2, 0]]);
  });

  it('a mirroring node (negative scale) keeps the outward normal by reversing the winding', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]); // faces glTF +z
    const mesh = g.mesh([{ attributes: { POSITION: pos } }]);
    g.json.scenes.push({ nodes: [g.node({ name: 'plain', mesh }), g.node({ name: 'mirrored', mesh, scale: [-1, 1, 1] })] });
    const scene = await importGltf(g.glb(), 'mirror.glb', { upAxis: 'z' });
    const p = scene.positions, ix = scene.indices;
    for (let t = 0; t < 2; t++) {
      const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
      const nz = (p[b]! - p[a]!) * (p[c + 1]! - p[a + 1]!) - (p[b + 1]! - p[a + 1]!) * (p[c]! - p[a]!);
      expect(nz).toBeGreaterThan(0); // mirrored in x, the face still points +z
    }
  });

  it('names surfaces node name → mesh name → mesh<i>, unique with #n', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    const named = g.mesh([{ attributes: { POSITION: pos } }], 'wall');
    const unnamed = g.mesh([{ attributes: { POSITION: pos } }]);
    const nodes = [g.node({ mesh: named }), g.node({ mesh: named }), g.node({ mesh: unnamed }), g.node({ name: 'wall', mesh: unnamed })];
    g.json.scenes.push({ nodes });
    const scene = await importGltf(g.glb(), 'names.glb');
    expect(scene.surfaceNames).toEqual(['wall', 'wall#2', 'mesh1', 'wall#3']);
  });

  it('uses the default scene and only its nodes', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    const mesh = g.mesh([{ attributes: { POSITION: pos } }]);
    const a = g.node({ name: 'a', mesh });
    const b = g.node({ name: 'b', mesh });
    g.json.scenes.push({ nodes: [a] }, { nodes: [b] });
    g.json['scene'] = 1;
    const scene = await importGltf(g.glb(), 'scenes.glb');
    expect(scene.surfaceNames).toEqual(['b']);
  });

  it('reads triangle strips and fans with u8/u16 indices and the right winding', async () => {
    const g = new RawGltf();
    // A 2×1 quad strip in the glTF x–y plane (facing +z_gltf = engine −y).
    const pos = g.positions([0, 0, 0, 0, 1, 0, 1, 0, 0, 1, 1, 0, 2, 0, 0, 2, 1, 0]);
    const strip = g.indices([1, 0, 3, 2, 5, 4], 5121); // 4 triangles, all counter-clockwise in glTF x–y
    const fan = g.indices([0, 2, 3, 1], 5123);
    const mesh = g.mesh([
      { attributes: { POSITION: pos }, indices: strip, mode: 5 },
      { attributes: { POSITION: pos }, indices: fan, mode: 6 },
    ]);
    g.json.scenes.push({ nodes: [g.node({ name: 'm', mesh })] });
    const scene = await importGltf(g.glb(), 'strip.glb');
    expect(scene.indices.length / 3).toBe(4 + 2);
    expect(surfaceAreas(scene)['m']).toBeCloseTo(2 + 1, 6);
    // Every triangle faces glTF +z → engine −y.
    const p = scene.positions, ix = scene.indices;
    for (let t = 0; t < ix.length / 3; t++) {
      const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
      const e1 = [p[b]! - p[a]!, p[b + 2]! - p[a + 2]!];
      const e2 = [p[c]! - p[a]!, p[c + 2]! - p[a + 2]!];
      // n_y = e1z·e2x − e1x·e2z
      expect(e1[1]! * e2[0]! - e1[0]! * e2[1]!).toBeLessThan(0);
    }
  });

  it('reads interleaved (byteStride) normalized int16 positions and a sparse accessor', async () => {
    const g = new RawGltf();
    // Interleaved: int16 xyz + int16 pad (8 bytes per vertex), normalized: 32767 → 1.
    const raw = new Int16Array([0, 0, 0, 99, 32767, 0, 0, 99, 0, 32767, 0, 99]);
    const bv = g.view(new Uint8Array(raw.buffer), 8);
    const pos = g.accessor({ bufferView: bv, componentType: 5122, normalized: true, type: 'VEC3', count: 3 });
    // Sparse: replace vertex 2 by (0, 0.5, 0)... as float32 override of a float accessor with no bufferView.
    const sIdx = g.view(new Uint8Array(new Uint16Array([0, 1, 2]).buffer));
    const sVal = g.view(new Uint8Array(new Float32Array([0, 0, 0, 3, 0, 0, 0, 3, 0]).buffer));
    const sparsePos = g.accessor({
      componentType: 5126, type: 'VEC3', count: 3,
      sparse: { count: 3, indices: { bufferView: sIdx, componentType: 5123 }, values: { bufferView: sVal } },
    });
    const mesh = g.mesh([{ attributes: { POSITION: pos } }, { attributes: { POSITION: sparsePos } }]);
    g.json.scenes.push({ nodes: [g.node({ name: 'm', mesh })] });
    const scene = await importGltf(g.glb(), 'packed.glb', { upAxis: 'z' });
    const areas = surfaceAreas(scene);
    expect(areas['m']).toBeCloseTo(0.5 + 4.5, 6); // unit triangle + 3×3 triangle
  });

  it('reads a .gltf with a data: URI buffer (no reader needed)', async () => {
    const scene = await importGltf(oneTriangle().gltfDataUri(), 'tri.gltf');
    expect(scene.indices.length).toBe(3);
    expect(scene.surfaceNames).toEqual(['tri']);
  });

  it('drops and counts zero-area and degenerate triangles', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0, 2, 0, 0]);
    // ok, repeated index, collinear (0,1,3), ok again
    const idx = g.indices([0, 1, 2, 0, 0, 1, 0, 1, 3, 1, 2, 0]);
    const mesh = g.mesh([{ attributes: { POSITION: pos }, indices: idx }]);
    g.json.scenes.push({ nodes: [g.node({ name: 'm', mesh })] });
    const scene = await importGltf(g.glb(), 'degen.glb');
    expect(scene.indices.length / 3).toBe(2);
    expect(scene.droppedTriangleCount).toBe(2);
    expect(scene.warnings.join('\n')).toMatch(/degen\.glb: dropped 2 zero-area or degenerate triangle/);
  });

  it('takes material names from glTF materials', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    g.json.materials.push({ name: 'glass' }, {});
    const mesh = g.mesh([
      { attributes: { POSITION: pos }, material: 0 },
      { attributes: { POSITION: pos }, material: 1 },
      { attributes: { POSITION: pos } },
    ]);
    g.json.scenes.push({ nodes: [g.node({ name: 'm', mesh })] });
    const scene = await importGltf(g.glb(), 'mat.glb');
    expect(scene.materialNames).toEqual(['glass', 'material1', '']);
    expect(Array.from(scene.materialIds)).toEqual([0, 1, 2]);
  });
});

describe('importGltf: bad files give an InputError naming the file and the place', () => {
  it('empty file', async () => {
    const e = await inputError(importGltf(new Uint8Array(0), 'empty.glb'));
    expect(e.file).toBe('empty.glb');
    expect(e.message).toMatch(/empty\.glb: whole file: empty file/);
  });

  it('not glTF magic', async () => {
    const e = await inputError(importGltf(new TextEncoder().encode('PK\u0003\u0004 not a model'), 'zip.glb'));
    expect(e.place).toBe('first bytes');
    expect(e.message).toMatch(/zip\.glb/);
  });

  it('wrong GLB version', async () => {
    const glb = oneTriangle().glb();
    new DataView(glb.buffer).setUint32(4, 1, true);
    const e = await inputError(importGltf(glb, 'v1.glb'));
    expect(e.place).toBe('GLB header, version');
  });

  it('asset.version 1.0 in a .gltf', async () => {
    const e = await inputError(importGltf(oneTriangle().gltfDataUri((j) => { j['asset'] = { version: '1.0' }; }), 'old.gltf'));
    expect(e.place).toBe('asset.version');
  });

  it('truncated file (GLB length larger than the bytes)', async () => {
    const glb = oneTriangle().glb();
    const e = await inputError(importGltf(glb.subarray(0, glb.length - 8), 'cut.glb'));
    expect(e.message).toMatch(/cut\.glb: GLB header, length: truncated file/);
  });

  it('truncated buffer: bufferView past the end of the buffer', async () => {
    const glb = oneTriangle().glb((j) => { ((j['bufferViews'] as Record<string, number>[])[0]!)['byteLength'] = 400; });
    const e = await inputError(importGltf(glb, 'view.glb'));
    expect(e.place).toBe('bufferViews[0]');
    expect(e.message).toMatch(/view\.glb: bufferViews\[0\]: bufferView runs past the end/);
  });

  it('truncated buffer: accessor past the end of its bufferView', async () => {
    const glb = oneTriangle().glb((j) => { ((j['accessors'] as Record<string, number>[])[0]!)['count'] = 4; });
    const e = await inputError(importGltf(glb, 'acc.glb'));
    expect(e.place).toBe('accessors[0]');
  });

  it('buffer byteLength larger than the data', async () => {
    const glb = oneTriangle().glb((j) => { ((j['buffers'] as Record<string, number>[])[0]!)['byteLength'] = 4000; });
    const e = await inputError(importGltf(glb, 'buf.glb'));
    expect(e.place).toBe('buffers[0]');
    expect(e.problem).toBe('truncated buffer');
  });

  it('index out of range', async () => {
    const g = new RawGltf();
    const pos = g.positions([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    const idx = g.indices([0, 1, 7], 5123);
    g.json.scenes.push({ nodes: [g.node({ mesh: g.mesh([{ attributes: { POSITION: pos }, indices: idx }]) })] });
    const e = await inputError(importGltf(g.glb(), 'idx.glb'));
    expect(e.place).toBe('meshes[0].primitives[0].indices (accessors[1]), element 2');
    expect(e.message).toMatch(/idx\.glb/);
  });

  it('NaN and Infinity coordinates', async () => {
    for (const bad of [NaN, Infinity]) {
      const g = new RawGltf();
      const pos = g.positions([0, 0, 0, 1, bad, 0, 0, 1, 0]);
      g.json.scenes.push({ nodes: [g.node({ mesh: g.mesh([{ attributes: { POSITION: pos } }]) })] });
      const e = await inputError(importGltf(g.glb(), 'nan.glb'));
      expect(e.place).toBe('meshes[0].primitives[0].attributes.POSITION (accessors[0]), vertex 1, component 1');
    }
  });

  it('buffer URIs outside the folder or on the network are refused', async () => {
    const cases = ['../secret.bin', '..%2Fsecret.bin', 'sub/../../x.bin', '/etc/passwd', '\\\\server\\share.bin', 'C:/data/x.bin',
      'http://example.com/x.bin', 'https://example.com/x.bin', '//example.com/x.bin', 'file:///tmp/x.bin'];
    for (const uri of cases) {
      const reader = memoryReader({});
      const e = await inputError(importGltf(oneTriangle().gltfExternal(uri), 'scene.gltf', { readExternal: reader.read }));
      expect(e.place).toBe('buffers[0].uri');
      expect(e.message).toMatch(/scene\.gltf: buffers\[0\]\.uri: .*refused/);
      expect(reader.asked).toEqual([]); // never asked to read it
    }
  });

  it('an external buffer without readExternal, and a reader that fails', async () => {
    const e1 = await inputError(importGltf(oneTriangle().gltfExternal('tri.bin'), 'tri.gltf'));
    expect(e1.place).toBe('buffers[0].uri');
    const e2 = await inputError(importGltf(oneTriangle().gltfExternal('tri.bin'), 'tri.gltf', { readExternal: memoryReader({}).read }));
    expect(e2.message).toMatch(/cannot read the external buffer/);
  });

  it('invalid JSON and a node cycle', async () => {
    const e1 = await inputError(importGltf(new TextEncoder().encode('{"asset": '), 'broken.gltf'));
    expect(e1.place).toBe('JSON');
    const g = oneTriangle();
    g.json.nodes.push({ children: [2] }, { children: [1] });
    g.json.scenes[0] = { nodes: [0, 1] };
    const e2 = await inputError(importGltf(g.glb(), 'cycle.glb'));
    expect(e2.problem).toBe('node hierarchy has a cycle');
  });

  it('a GLB without meshes: no triangles', async () => {
    const glb = assembleGlb({ asset: { version: '2.0' } }, undefined);
    const e = await inputError(importGltf(glb, 'nothing.glb'));
    expect(e.message).toMatch(/nothing\.glb: whole file: no triangles/);
  });

  it('an unknown sparse index type is a clear error', async () => {
    const g = oneTriangle();
    const sIdx = g.view(new Uint8Array(4));
    const sVal = g.view(new Uint8Array(12));
    g.json.accessors[0]!['sparse'] = { count: 1, indices: { bufferView: sIdx, componentType: 5126 }, values: { bufferView: sVal } };
    const e = await inputError(importGltf(g.glb(), 'sparse.glb'));
    expect(e.place).toBe('accessors[0].sparse.indices.componentType');
  });
});

describe('helpers of the glTF importer', () => {
  it('checkExternalUri accepts plain relative paths and decodes them', () => {
    expect(checkExternalUri('data/box%20a.bin', 'f.gltf', 'p')).toBe('data/box a.bin');
    expect(checkExternalUri('./box.bin', 'f.gltf', 'p')).toBe('./box.bin');
  });

  it('decodeBase64 matches the platform atob', () => {
    const bytes = Uint8Array.from({ length: 50 }, (_, i) => (i * 37) & 0xff);
    let s = '';
    for (const b of bytes) s += String.fromCharCode(b);
    expect(Array.from(decodeBase64(btoa(s))!)).toEqual(Array.from(bytes));
    expect(decodeBase64('ab$c')).toBeNull();
  });
});
