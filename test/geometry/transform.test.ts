import { describe, it, expect } from 'vitest';
import {
  engineFromModel,
  mat4Determinant3,
  mat4FromTrs,
  mat4Multiply,
  resolveImportOptions,
  transformPoint,
} from '../../src/geometry/transform.ts';
import { InputError } from '../../src/physics/errors.ts';

function apply(m: Float64Array, p: [number, number, number]): number[] {
  const out = [0, 0, 0];
  transformPoint(m, p[0], p[1], p[2], out);
  return out.map((v) => v + 0);
}

describe('engineFromModel', () => {
  it('glTF y-up: (x, y, z) → (x, −z, y); glTF −Z becomes north (+y), +Y becomes up', () => {
    const m = engineFromModel(resolveImportOptions({}, 'y'));
    expect(apply(m, [1, 0, 0])).toEqual([1, 0, 0]);
    expect(apply(m, [0, 1, 0])).toEqual([0, 0, 1]);
    expect(apply(m, [0, 0, -1])).toEqual([0, 1, 0]);
    expect(mat4Determinant3(m)).toBeCloseTo(1, 15); // a rotation: winding kept
  });

  it('z-up keeps axes; unitsPerMeter divides', () => {
    const m = engineFromModel(resolveImportOptions({ unitsPerMeter: 1000 }, 'z'));
    expect(apply(m, [1000, 2000, 3000])).toEqual([1, 2, 3]);
  });

  it('northDeg is clockwise seen from above: 90 takes +y to +x, 180 takes +y to −y, 30 takes +y to azimuth 30°', () => {
    const r90 = engineFromModel(resolveImportOptions({ northDeg: 90 }, 'z'));
    expect(apply(r90, [0, 1, 0])).toEqual([1, 0, 0]);
    expect(apply(r90, [1, 0, 0])).toEqual([0, -1, 0]);
    const r180 = engineFromModel(resolveImportOptions({ northDeg: 180 }, 'z'));
    expect(apply(r180, [0, 1, 0])).toEqual([0, -1, 0]);
    const r30 = engineFromModel(resolveImportOptions({ northDeg: 30 }, 'z'));
    const p = apply(r30, [0, 1, 0]);
    // Azimuth clockwise from north: atan2(x, y).
    expect((Math.atan2(p[0]!, p[1]!) * 180) / Math.PI).toBeCloseTo(30, 12);
    const rm90 = engineFromModel(resolveImportOptions({ northDeg: -90 }, 'z'));
    expect(apply(rm90, [0, 1, 0])).toEqual([-1, 0, 0]);
  });

  it('north rotation comes after the up-axis conversion (glTF −Z is model north)', () => {
    const m = engineFromModel(resolveImportOptions({ northDeg: 90 }, 'y'));
    expect(apply(m, [0, 0, -1])).toEqual([1, 0, 0]);
    expect(apply(m, [0, 1, 0])).toEqual([0, 0, 1]);
  });

  it('rejects bad options with the option name', () => {
    expect(() => resolveImportOptions({ unitsPerMeter: 0 }, 'y', 'a.glb')).toThrow(InputError);
    expect(() => resolveImportOptions({ unitsPerMeter: 0 }, 'y', 'a.glb')).toThrow(/a\.glb: unitsPerMeter/);
    expect(() => resolveImportOptions({ upAxis: 'x' as 'y' }, 'y')).toThrow(/upAxis/);
    expect(() => resolveImportOptions({ northDeg: NaN }, 'y')).toThrow(/northDeg/);
  });
});

describe('mat4 helpers', () => {
  it('TRS: a quarter turn about z then translate', () => {
    const s = Math.SQRT1_2;
    const m = mat4FromTrs([1, 2, 3], [0, 0, s, s], [2, 2, 2]);
    const p = apply(m, [1, 0, 0]);
    [1, 4, 3].forEach((v, i) => expect(p[i]).toBeCloseTo(v, 12));
  });

  it('multiply applies the right factor first', () => {
    const t = mat4FromTrs([5, 0, 0], [0, 0, 0, 1], [1, 1, 1]);
    const sc = mat4FromTrs([0, 0, 0], [0, 0, 0, 1], [3, 3, 3]);
    expect(apply(mat4Multiply(t, sc), [1, 0, 0])).toEqual([8, 0, 0]);
    expect(apply(mat4Multiply(sc, t), [1, 0, 0])).toEqual([18, 0, 0]);
    expect(mat4Determinant3(mat4FromTrs([0, 0, 0], [0, 0, 0, 1], [-1, 1, 1]))).toBe(-1);
  });
});
