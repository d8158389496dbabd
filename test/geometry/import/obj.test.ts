import { describe, it, expect } from 'vitest';
import { importObj } from '../../../src/geometry/import/obj.ts';
import { InputError } from '../../../src/physics/errors.ts';
import { boxObj, surfaceAreas } from '../../helpers/models.ts';

function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError, got success');
}

describe('importObj', () => {
  it('reads a quad box: 12 triangles, names from o / usemtl, vt/vn ignored', () => {
    const scene = importObj(boxObj([2, 3, 4]), 'box.obj');
    expect(scene.indices.length / 3).toBe(12);
    expect(scene.surfaceNames).toEqual(['box']);
    expect(scene.materialNames).toEqual(['concrete']);
    expect(surfaceAreas(scene)['box']).toBeCloseTo(52, 9);
  });

  it('groups and objects become surfaces; a group used again adds to the same surface', () => {
    const text = [
      'v 0 0 0', 'v 1 0 0', 'v 0 1 0', 'v 1 1 0',
      'f 1 2 3',
      'g wall', 'usemtl brick', 'f 2 4 3',
      'o roof', 'usemtl tile', 'f 1 2 4',
      'g wall', 'f 1 2 3',
    ].join('\n');
    const scene = importObj(text, 'dir/site.obj');
    expect(scene.surfaceNames).toEqual(['site', 'wall', 'roof']);
    expect(Array.from(scene.surfaceIds)).toEqual([0, 1, 2, 1]);
    expect(scene.materialNames).toEqual(['', 'brick', 'tile']);
    expect(Array.from(scene.materialIds)).toEqual([0, 1, 2, 2]);
  });

  it('negative indices, v with w, v with colours, CRLF and continuation lines', () => {
    const text = 'v 0 0 0 1.0\r\nv 2 0 0 0.5\r\nv 0 2 0 0.1 0.2 0.3\r\nf -3 \\\r\n -2 -1\r\n';
    const scene = importObj(text, 'neg.obj');
    expect(Array.from(scene.indices)).toEqual([0, 1, 2]);
    expect(Array.from(scene.positions)).toEqual([0, 0, 0, 2, 0, 0, 0, 2, 0]);
  });

  it('triangulates a concave polygon (an L) by ear clipping: area and winding kept', () => {
    // L-shape, 6 corners, area 3×1 + 1×2 = 5... (0,0)-(3,0)-(3,1)-(1,1)-(1,3)-(0,3): 3 + 2 = 5 m².
    const text = ['v 0 0 0', 'v 3 0 0', 'v 3 1 0', 'v 1 1 0', 'v 1 3 0', 'v 0 3 0', 'f 1 2 3 4 5 6'].join('\n');
    const scene = importObj(text, 'l.obj');
    expect(scene.indices.length / 3).toBe(4);
    expect(surfaceAreas(scene)['l']).toBeCloseTo(5, 12);
    // A fan from corner 1 would cover (3,1)-(1,1)-(1,3)'s outside: sum of |areas| would exceed 5; all upward:
    const p = scene.positions, ix = scene.indices;
    for (let t = 0; t < 4; t++) {
      const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
      const nz = (p[b]! - p[a]!) * (p[c + 1]! - p[a + 1]!) - (p[b + 1]! - p[a + 1]!) * (p[c]! - p[a]!);
      expect(nz).toBeGreaterThan(0);
    }
  });

  it('triangulates a concave polygon in a vertical plane with clockwise winding', () => {
    // The same L in the x–z plane, listed counter-clockwise seen from −y: normal −y (south facing).
    const text = ['v 0 0 0', 'v 0 0 3', 'v 1 0 3', 'v 1 0 1', 'v 3 0 1', 'v 3 0 0', 'f 6 5 4 3 2 1'].join('\n');
    const scene = importObj(text, 'l.obj');
    expect(surfaceAreas(scene)['l']).toBeCloseTo(5, 12);
    const p = scene.positions, ix = scene.indices;
    for (let t = 0; t < ix.length / 3; t++) {
      const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
      const ny = (p[b + 2]! - p[a + 2]!) * (p[c]! - p[a]!) - (p[b]! - p[a]!) * (p[c + 2]! - p[a + 2]!);
      expect(ny).toBeLessThan(0);
    }
  });

  it('drops and counts zero-area and degenerate faces', () => {
    const text = ['v 0 0 0', 'v 1 0 0', 'v 2 0 0', 'v 0 1 0', 'f 1 2 4', 'f 1 2 3', 'f 1 1 4'].join('\n');
    const scene = importObj(text, 'd.obj');
    expect(scene.indices.length / 3).toBe(1);
    expect(scene.droppedTriangleCount).toBe(2);
    expect(scene.warnings[0]).toMatch(/d\.obj: dropped 2 zero-area or degenerate/);
  });

  it('bad numbers are reported with line and field', () => {
    const e = inputError(() => importObj('v 0 0 0\nv 1 0 0\nv 0 1.2.3 0\nf 1 2 3\n', 'bad.obj'));
    expect(e.place).toBe('line 3, field 3');
    expect(e.message).toMatch(/^bad\.obj: line 3, field 3: not a number/);
    const e2 = inputError(() => importObj('v 0 0 0\nv nan 0 0\n', 'nan.obj'));
    expect(e2.place).toBe('line 2, field 2');
    expect(e2.problem).toBe('not a finite number');
    const e3 = inputError(() => importObj('v 0 0 0\nv 1e999 0 0\n', 'inf.obj'));
    expect(e3.problem).toBe('not a finite number');
    const e4 = inputError(() => importObj('v 0 0\n', 'short.obj'));
    expect(e4.place).toBe('line 1');
  });

  it('indices out of range (positive, negative, zero, not an integer) name the line', () => {
    const base = 'v 0 0 0\nv 1 0 0\nv 0 1 0\n';
    expect(inputError(() => importObj(base + 'f 1 2 4\n', 'r.obj')).place).toBe('line 4, field 4');
    expect(inputError(() => importObj(base + 'f -4 2 3\n', 'r.obj')).place).toBe('line 4, field 2');
    expect(inputError(() => importObj(base + 'f 0 2 3\n', 'r.obj')).place).toBe('line 4, field 2');
    expect(inputError(() => importObj(base + 'f 1 2.5 3\n', 'r.obj')).place).toBe('line 4, field 3');
    // A face may only use vertices defined before it.
    expect(inputError(() => importObj('v 0 0 0\nv 1 0 0\nf 1 2 3\nv 0 1 0\n', 'r.obj')).place).toBe('line 3, field 4');
  });

  it('empty file and a file without faces', () => {
    expect(inputError(() => importObj('', 'e.obj')).message).toMatch(/e\.obj: whole file: empty file/);
    expect(inputError(() => importObj('# only a comment\nv 0 0 0\n', 'nf.obj')).problem).toBe('no faces');
  });
});
