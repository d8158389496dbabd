/**
 * The importer fixes the fuzz campaign led to (each has its input under regressions/ too):
 * a coordinate that overflows float32 (or lies absurdly far) is refused instead of stored as
 * Infinity, and a glTF accessor whose count the file cannot back is refused before any allocation.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { importModel } from '../../src/geometry/import/index.ts';
import { InputError } from '../../src/physics/errors.ts';

const fixture = (f: string) => readFileSync(fileURLToPath(new URL(`../fixtures/models/${f}`, import.meta.url)));

async function error(p: Promise<unknown>): Promise<InputError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

describe('importer fixes found by fuzzing', () => {
  it('OBJ: a coordinate beyond float32 (1e39) is refused with the line, not stored as Infinity', async () => {
    const text = fixture('box.obj').toString('utf8').replace('v 2 3 4', 'v 2 3 1e39');
    const e = await error(importModel(new TextEncoder().encode(text), 'big.obj'));
    expect(e.message).toMatch(/^big\.obj: line 11: vertex coordinate out of range/);
    expect(e.message).toMatch(/unitsPerMeter/);
  });

  it('OBJ: a large but sane coordinate (UTM northing, 5 000 km) still imports', async () => {
    const text = fixture('box.obj').toString('utf8').replace(/^v (\S+) (\S+) (\S+)$/gm, (_m, x: string, y: string, z: string) => `v ${x} ${Number(y) + 5e6} ${z}`);
    const scene = await importModel(new TextEncoder().encode(text), 'utm.obj');
    expect(scene.indices.length).toBe(36);
  });

  it('glTF: an accessor count of 2^32 with a small bufferView is refused, no allocation', async () => {
    const j = JSON.parse(fixture('box.gltf').toString('utf8')) as { accessors: { count: number }[] };
    j.accessors[0]!.count = 2 ** 32;
    const e = await error(importModel(new TextEncoder().encode(JSON.stringify(j)), 'huge.gltf', { readExternal: async () => new Uint8Array(fixture('box.bin')) }));
    expect(e.message).toMatch(/^huge\.gltf: accessors\[0\]: accessor runs past the end of its bufferView/);
  });

  it('glTF: a sparse-only accessor (no bufferView) of 10^9 elements is refused as too large', async () => {
    const j = JSON.parse(fixture('box.gltf').toString('utf8')) as { accessors: Record<string, unknown>[] };
    delete j.accessors[0]!.bufferView;
    j.accessors[0]!.count = 1e9;
    const e = await error(importModel(new TextEncoder().encode(JSON.stringify(j)), 'sparse.gltf', { readExternal: async () => new Uint8Array(fixture('box.bin')) }));
    expect(e.message).toMatch(/^sparse\.gltf: accessors\[0\]\.count: accessor too large/);
  });
});
