/**
 * Geometry pathologies on tiny hand-made meshes: open and non-manifold edges, duplicated faces,
 * flipped normals by ray parity (and their fix), zones off the model, the triangle limit.
 * Expected counts are worked out by hand from the meshes (no published source needed: geometry).
 */
import { describe, it, expect } from 'vitest';
import type { SceneArrays } from '../../src/geometry/sceneArrays.ts';
import { checkModelSize, DEFAULT_TRIANGLE_LIMIT, findPathologies, fixFlippedNormals, weldVertices } from '../../src/audit/pathologies.ts';
import { InputError } from '../../src/physics/errors.ts';

/** Builds a scene; each quad gets its own 4 vertices (split seams, as exporters write them). */
class Mesh {
  p: number[] = [];
  ix: number[] = [];
  sid: number[] = [];
  names: string[] = [];
  surface(name: string): number {
    this.names.push(name);
    return this.names.length - 1;
  }
  tri(a: number[], b: number[], c: number[], s: number): void {
    const v = this.p.length / 3;
    this.p.push(...a, ...b, ...c);
    this.ix.push(v, v + 1, v + 2);
    this.sid.push(s);
  }
  /** Quad a b c d, counter-clockwise seen from the side its normal points to. */
  quad(a: number[], b: number[], c: number[], d: number[], s: number): void {
    this.tri(a, b, c, s);
    this.tri(a, c, d, s);
  }
  /** Axis-aligned box with outward normals; `flipFace` turns face k (0 bottom, 1 top, 2 south, 3 north, 4 west, 5 east). */
  box(x0: number, y0: number, z0: number, x1: number, y1: number, z1: number, s: number, flipFace = -1, skipFace = -1): void {
    const faces = [
      [[x0, y0, z0], [x0, y1, z0], [x1, y1, z0], [x1, y0, z0]],
      [[x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1]],
      [[x0, y0, z0], [x1, y0, z0], [x1, y0, z1], [x0, y0, z1]],
      [[x1, y1, z0], [x0, y1, z0], [x0, y1, z1], [x1, y1, z1]],
      [[x0, y1, z0], [x0, y0, z0], [x0, y0, z1], [x0, y1, z1]],
      [[x1, y0, z0], [x1, y1, z0], [x1, y1, z1], [x1, y0, z1]],
    ];
    faces.forEach((f, k) => {
      if (k === skipFace) return;
      const q = k === flipFace ? [f[0]!, f[3]!, f[2]!, f[1]!] : f;
      this.quad(q[0]!, q[1]!, q[2]!, q[3]!, s);
    });
  }
  scene(): SceneArrays {
    const nt = this.ix.length / 3;
    return {
      positions: Float32Array.from(this.p), indices: Uint32Array.from(this.ix), surfaceIds: Uint32Array.from(this.sid),
      materialIds: new Uint32Array(nt), surfaceNames: this.names.slice(), materialNames: [''], warnings: [],
    };
  }
}

describe('geometry pathologies', () => {
  it('a closed outward box is clean', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 2, 3, 4, m.surface('block'));
    const r = findPathologies(m.scene());
    expect(r.openEdges).toBe(0);
    expect(r.nonManifoldEdges).toBe(0);
    expect(r.duplicateTriangles.length).toBe(0);
    expect(r.flippedTriangles.length).toBe(0);
    expect(r.flipCheckedTriangles).toBe(12);
    expect(r.warnings).toEqual([]);
  });

  it('welds split seam vertices: a box of 6 separate quads has 8 corners', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 1, 1, 1, m.surface('b'));
    const w = weldVertices(m.scene().positions, 1e-4);
    expect(m.scene().positions.length / 3).toBe(36);
    expect(w.count).toBe(8);
  });

  it('a box without its top is open: the 4 rim edges belong to one triangle', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 2, 2, 2, m.surface('tub'), -1, 1);
    const r = findPathologies(m.scene(), { skipFlipCheck: true });
    expect(r.openEdges).toBe(4);
    expect(r.nonManifoldEdges).toBe(0);
    expect(r.warnings.join('\n')).toMatch(/open: 4 edge/);
  });

  it('a fin standing on a box top edge makes that edge non-manifold (3 triangles on it)', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 2, 2, 2, m.surface('block'));
    // A vertical fin along the top edge y = 0, x 0..2, z 2..3 (two triangles, one sharing the edge).
    m.quad([0, 0, 2], [2, 0, 2], [2, 0, 3], [0, 0, 3], m.surface('fin'));
    const r = findPathologies(m.scene(), { skipFlipCheck: true });
    // The box edge (0,0,2)-(2,0,2) is used by the top, the south face and the fin.
    expect(r.nonManifoldEdges).toBe(1);
    // The fin's other three edges are open; its diagonal is shared by its two triangles.
    expect(r.openEdges).toBe(3);
  });

  it('finds a duplicated face (same corners, either winding)', () => {
    const m = new Mesh();
    const s = m.surface('slab');
    m.quad([0, 0, 0], [4, 0, 0], [4, 4, 0], [0, 4, 0], s);
    m.tri([4, 4, 0], [4, 0, 0], [0, 0, 0], m.surface('copy')); // the first triangle again, reversed
    const r = findPathologies(m.scene(), { skipFlipCheck: true });
    expect(Array.from(r.duplicateTriangles)).toEqual([2]);
    expect(r.warnings.join('\n')).toMatch(/1 duplicated face.*triangle 2 of surface "copy"/);
  });

  it('finds the flipped face of a box by ray parity, names its surface, and the fix turns it round', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 2, 3, 4, m.surface('good'));
    m.box(6, 0, 0, 9, 2, 5, m.surface('bad'), 5); // east face wound inward
    const sc = m.scene();
    const r = findPathologies(sc);
    // Box 2's east face = its triangles 10, 11 = scene triangles 12 + 10, 12 + 11.
    expect(Array.from(r.flippedTriangles)).toEqual([22, 23]);
    expect(r.flippedBySurface).toEqual([{ surface: 'bad', flipped: 2, triangles: 12 }]);
    expect(r.warnings.join('\n')).toMatch(/2 triangle\(s\) face into their solid.*"bad" 2 of 12/);
    const fixed = fixFlippedNormals(sc, r.flippedTriangles);
    expect(findPathologies(fixed).flippedTriangles.length).toBe(0);
    expect(fixed.warnings.at(-1)).toMatch(/2 triangle\(s\) with flipped normals were turned round/);
    expect(sc.indices[3 * 22 + 1]).not.toBe(fixed.indices[3 * 22 + 1]); // the input is left as it was
  });

  it('a box wound inside out has every triangle flipped; an open ground slab facing down is not', () => {
    const m = new Mesh();
    const s = m.surface('inverted');
    m.box(0, 0, 0, 2, 2, 2, s);
    for (let t = 0; t < 12; t++) {
      const b = m.ix[3 * t + 1]!;
      m.ix[3 * t + 1] = m.ix[3 * t + 2]!;
      m.ix[3 * t + 2] = b;
    }
    m.quad([5, 5, 0], [5, 8, 0], [8, 8, 0], [8, 5, 0], m.surface('slab-down'));
    const r = findPathologies(m.scene());
    expect(Array.from(r.flippedTriangles)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
  });

  it('the parity vote is not fooled by a neighbour: a face looking at another box is not flipped', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 2, 2, 2, m.surface('a'));
    m.box(3, 0, 0, 5, 2, 2, m.surface('b')); // a's east face looks at b's west face (2 crossings)
    expect(findPathologies(m.scene()).flippedTriangles.length).toBe(0);
  });

  it('flags a zone wholly outside the model and keeps one over it', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 10, 10, 5, m.surface('block'));
    const r = findPathologies(m.scene(), {
      skipFlipCheck: true,
      zones: [
        { name: 'terrace', polygon: [[12, 0], [18, 0], [18, 4], [12, 4]] },
        { name: 'typo', polygon: [[5000, 5000], [5010, 5000], [5010, 5010]] },
        { name: 'mesh zone' },
      ],
    });
    expect(r.zonesOffModel).toEqual(['typo']);
    expect(r.warnings.join('\n')).toMatch(/zone "typo".*wholly outside the model.*20 m margin/);
  });

  it('checkModelSize refuses a model over the limit with the numbers and the way out', () => {
    const m = new Mesh();
    m.box(0, 0, 0, 1, 1, 1, m.surface('b'));
    const sc = m.scene();
    expect(() => checkModelSize(sc, 12)).not.toThrow();
    expect(DEFAULT_TRIANGLE_LIMIT).toBe(3_000_000);
    let err: unknown;
    try {
      checkModelSize(sc, 10, 'city.glb');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    const msg = (err as Error).message;
    expect(msg).toMatch(/^city\.glb: whole model: the model has 12 triangles, over the limit of 10/);
    expect(msg).toMatch(/raise the limit/);
    expect(() => checkModelSize(sc, 0)).toThrow(InputError);
  });
});
