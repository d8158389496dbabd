/**
 * Wavefront OBJ importer: text in, SceneArrays out (no file access; the caller reads the file).
 *
 * Read: `v x y z [w]` (w, the rational weight, is ignored; `v x y z r g b` vertex colours too),
 * `f` with `v`, `v/vt`, `v//vn`, `v/vt/vn` references, negative (relative) indices, polygons of any
 * size (fan for convex, ear clipping for concave), `o` / `g` (each name is a surface; the latest
 * `o` or `g` wins, a name used again later adds to the same surface), `usemtl` (material names).
 * Ignored: `vt`, `vn`, `vp`, `s`, `l`, `p`, `mtllib` (material names come from `usemtl`; the .mtl
 * file is optional and not needed), curves and surfaces.
 * Default up axis 'z' (DESIGN §3; the project file may say 'y').
 */
import { InputError } from '../../physics/errors.ts';
import { engineFromModel, resolveImportOptions, transformPoint } from '../transform.ts';
import type { ImportOptions } from '../transform.ts';
import { triangulatePolygon } from './polygon.ts';
import { SceneBuilder, fileStem } from './sceneBuilder.ts';
import type { ImportedScene } from './sceneBuilder.ts';

const FLOAT_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const INT_RE = /^[+-]?\d+$/;

/**
 * Parses OBJ text into the engine frame.
 * @param text the file's content
 * @param fileName used in error messages and as the default surface name
 * @param opts up axis (default 'z'), model units per metre, north rotation [deg]
 */
export function importObj(text: string, fileName: string, opts: ImportOptions = {}): ImportedScene {
  const resolved = resolveImportOptions(opts, 'z', fileName);
  const m = engineFromModel(resolved);
  const builder = new SceneBuilder(fileName);
  if (text.trim() === '') {
    throw new InputError({ problem: 'empty file', file: fileName, place: 'whole file', expected: 'OBJ text with v and f lines' });
  }
  const model: number[] = []; // model-frame xyz per vertex (for triangulation)
  const engine = new Float64Array(3);
  const defaultName = fileStem(fileName) || 'obj';
  let surfaceName = defaultName;
  let materialName = '';
  const surfaceIdByName = new Map<string, number>();
  let fellBackCount = 0;
  let fellBackFirstLine = 0;
  let faceLineCount = 0;

  const lines = text.split(/\r\n|\n|\r/);
  for (let li = 0; li < lines.length; li++) {
    const lineNo = li + 1;
    let line = lines[li]!;
    // Continuation lines ("\" at the end).
    while (line.endsWith('\\') && li + 1 < lines.length) {
      line = line.slice(0, -1) + ' ' + lines[++li]!;
    }
    const hash = line.indexOf('#');
    if (hash >= 0) line = line.slice(0, hash);
    line = line.trim();
    if (line === '') continue;
    const tokens = line.split(/\s+/);
    const kw = tokens[0]!;
    const place = (field?: number): string => (field === undefined ? `line ${lineNo}` : `line ${lineNo}, field ${field}`);
    switch (kw) {
      case 'v': {
        if (tokens.length < 4) {
          throw new InputError({ problem: 'vertex with fewer than 3 coordinates', file: fileName, place: place(), value: line, expected: 'v x y z [w]' });
        }
        const xyz = [0, 0, 0];
        for (let k = 1; k < tokens.length && k <= 4; k++) {
          const tok = tokens[k]!;
          if (!FLOAT_RE.test(tok)) {
            throw new InputError({
              problem: /^[+-]?(inf|infinity|nan)$/i.test(tok) ? 'not a finite number' : 'not a number',
              file: fileName,
              place: place(k + 1),
              value: tok,
              expected: 'a finite decimal number',
            });
          }
          const x = Number(tok);
          if (!Number.isFinite(x)) {
            throw new InputError({ problem: 'not a finite number', file: fileName, place: place(k + 1), value: tok, expected: 'a finite decimal number' });
          }
          if (k <= 3) xyz[k - 1] = x;
        }
        model.push(xyz[0]!, xyz[1]!, xyz[2]!);
        transformPoint(m, xyz[0]!, xyz[1]!, xyz[2]!, engine);
        builder.addVertex(engine[0]!, engine[1]!, engine[2]!, place());
        break;
      }
      case 'f': {
        faceLineCount++;
        const n = tokens.length - 1;
        if (n < 3) {
          throw new InputError({ problem: 'face with fewer than 3 corners', file: fileName, place: place(), value: line, expected: 'f a b c ...' });
        }
        const vertexCount = model.length / 3;
        const idx: number[] = [];
        for (let k = 1; k <= n; k++) {
          const ref = tokens[k]!;
          const first = ref.split('/')[0]!;
          if (!INT_RE.test(first)) {
            throw new InputError({ problem: 'vertex reference is not an integer', file: fileName, place: place(k + 1), value: ref, expected: 'v, v/vt, v//vn or v/vt/vn with integer v' });
          }
          const raw = Number(first);
          const i = raw > 0 ? raw - 1 : vertexCount + raw;
          if (raw === 0 || i < 0 || i >= vertexCount) {
            throw new InputError({
              problem: 'vertex index out of range',
              file: fileName,
              place: place(k + 1),
              value: ref,
              expected: `an index in 1..${vertexCount} or -${vertexCount}..-1 (vertices defined so far)`,
            });
          }
          idx.push(i);
        }
        let sid = surfaceIdByName.get(surfaceName);
        if (sid === undefined) {
          sid = builder.addSurface(surfaceName);
          surfaceIdByName.set(surfaceName, sid);
        }
        const mid = builder.material(materialName);
        if (n === 3) {
          builder.addTriangle(idx[0]!, idx[1]!, idx[2]!, sid, mid);
        } else {
          const pts = new Float64Array(n * 3);
          for (let k = 0; k < n; k++) {
            const i = idx[k]!;
            pts[k * 3] = model[i * 3]!;
            pts[k * 3 + 1] = model[i * 3 + 1]!;
            pts[k * 3 + 2] = model[i * 3 + 2]!;
          }
          const tri = triangulatePolygon(pts, n);
          if (tri.fellBack) {
            if (fellBackCount === 0) fellBackFirstLine = lineNo;
            fellBackCount++;
          }
          for (let t = 0; t < tri.triangles.length; t += 3) {
            builder.addTriangle(idx[tri.triangles[t]!]!, idx[tri.triangles[t + 1]!]!, idx[tri.triangles[t + 2]!]!, sid, mid);
          }
        }
        break;
      }
      case 'o':
      case 'g': {
        const name = tokens.slice(1).join(' ');
        surfaceName = name === '' ? defaultName : name;
        break;
      }
      case 'usemtl':
        materialName = tokens.slice(1).join(' ');
        break;
      default:
        // vt, vn, vp, s, l, p, mtllib, curves: not needed for a triangle scene.
        break;
    }
  }
  if (faceLineCount === 0) {
    throw new InputError({ problem: 'no faces', file: fileName, place: 'whole file', expected: 'at least one f line' });
  }
  if (fellBackCount > 0) {
    builder.warnings.push(
      `${fileName}: ${fellBackCount} self-intersecting or non-planar polygon(s) triangulated as a fan (first at line ${fellBackFirstLine})`,
    );
  }
  return builder.build();
}
