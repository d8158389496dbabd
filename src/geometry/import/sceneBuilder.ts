/**
 * Shared back end of the importers: collects engine-frame vertices and triangles, gives surfaces
 * unique names and materials ids, drops zero-area and degenerate triangles (counting them), and
 * packs the result into SceneArrays.
 */
import { InputError } from '../../physics/errors.ts';
import type { SceneArrays } from '../sceneArrays.ts';

/** What an importer returns: the Scene plus the counts behind its warnings. */
export interface ImportedScene extends SceneArrays {
  /** Triangles dropped because they had zero area or were degenerate (repeated or collinear vertices). */
  droppedTriangleCount: number;
}

/** Largest accepted engine-frame coordinate [m] (100 000 km: any site fits, float32 does not overflow). */
export const MAX_COORDINATE_M = 1e8;
/** Twice the area below this [m²] counts as zero area. */
const MIN_DOUBLE_AREA_M2 = 2e-10;
/** Triangles whose height is below this fraction of their longest edge are degenerate slivers. */
const MIN_HEIGHT_PER_LENGTH = 1e-8;

export class SceneBuilder {
  private readonly positions: number[] = [];
  private readonly indices: number[] = [];
  private readonly surfaceIds: number[] = [];
  private readonly materialIds: number[] = [];
  private readonly surfaceNames: string[] = [];
  private readonly usedSurfaceNames = new Set<string>();
  private readonly materialNames: string[] = [];
  private readonly materialIndex = new Map<string, number>();
  private readonly droppedPerSurface = new Map<number, number>();
  readonly warnings: string[] = [];

  constructor(readonly file: string) {}

  /** A new surface; the name is made unique with a "#n" suffix (n = 2, 3, ...). */
  addSurface(name: string): number {
    let unique = name;
    for (let n = 2; this.usedSurfaceNames.has(unique); n++) unique = `${name}#${n}`;
    this.usedSurfaceNames.add(unique);
    this.surfaceNames.push(unique);
    return this.surfaceNames.length - 1;
  }

  surfaceName(id: number): string {
    return this.surfaceNames[id] ?? '';
  }

  /** The id of a material name (created on first use; "" for none). Same name, same id. */
  material(name: string): number {
    const found = this.materialIndex.get(name);
    if (found !== undefined) return found;
    this.materialNames.push(name);
    this.materialIndex.set(name, this.materialNames.length - 1);
    return this.materialNames.length - 1;
  }

  get vertexCount(): number {
    return this.positions.length / 3;
  }

  /**
   * Adds an engine-frame vertex [m] (rounded to float32 as it will be stored); returns its index.
   * Refuses coordinates beyond ±MAX_COORDINATE_M (they would overflow float32 or ruin the ray maths).
   */
  addVertex(x: number, y: number, z: number, place?: string): number {
    if (!(Math.abs(x) <= MAX_COORDINATE_M && Math.abs(y) <= MAX_COORDINATE_M && Math.abs(z) <= MAX_COORDINATE_M)) {
      throw new InputError({
        problem: 'vertex coordinate out of range',
        file: this.file,
        place: place ?? `vertex ${this.vertexCount}`,
        value: [x, y, z],
        expected: `coordinates within ±${MAX_COORDINATE_M} m of the origin after the unit and node transforms (check model.unitsPerMeter)`,
      });
    }
    this.positions.push(Math.fround(x), Math.fround(y), Math.fround(z));
    return this.positions.length / 3 - 1;
  }

  /**
   * Adds a triangle by vertex indices (winding a→b→c, counter-clockwise seen from outside).
   * Zero-area and degenerate triangles are dropped and counted; returns whether it was kept.
   */
  addTriangle(a: number, b: number, c: number, surfaceId: number, materialId: number): boolean {
    if (isDegenerate(this.positions, a, b, c)) {
      this.droppedPerSurface.set(surfaceId, (this.droppedPerSurface.get(surfaceId) ?? 0) + 1);
      return false;
    }
    this.indices.push(a, b, c);
    this.surfaceIds.push(surfaceId);
    this.materialIds.push(materialId);
    return true;
  }

  /** Packs the scene; vertices no kept triangle uses are removed. Throws if nothing is left. */
  build(): ImportedScene {
    let dropped = 0;
    const parts: string[] = [];
    for (const [sid, n] of [...this.droppedPerSurface].sort((p, q) => p[0] - q[0])) {
      dropped += n;
      parts.push(`"${this.surfaceNames[sid]}": ${n}`);
    }
    const warnings = [...this.warnings];
    if (dropped > 0) {
      warnings.push(`${this.file}: dropped ${dropped} zero-area or degenerate triangle(s) (${parts.join(', ')})`);
    }
    const triCount = this.indices.length / 3;
    if (triCount === 0) {
      throw new InputError({
        problem: dropped > 0 ? `no usable triangles (all ${dropped} were zero-area or degenerate)` : 'no triangles',
        file: this.file,
        place: 'whole file',
        expected: 'a model with at least one triangle face',
      });
    }
    // Compact: renumber the vertices in order of first use.
    const remap = new Int32Array(this.vertexCount).fill(-1);
    const indices = new Uint32Array(this.indices.length);
    let used = 0;
    for (let i = 0; i < this.indices.length; i++) {
      const v = this.indices[i]!;
      if (remap[v] === -1) remap[v] = used++;
      indices[i] = remap[v]!;
    }
    const positions = new Float32Array(used * 3);
    for (let v = 0; v < remap.length; v++) {
      const r = remap[v]!;
      if (r < 0) continue;
      positions[r * 3] = this.positions[v * 3]!;
      positions[r * 3 + 1] = this.positions[v * 3 + 1]!;
      positions[r * 3 + 2] = this.positions[v * 3 + 2]!;
    }
    return {
      positions,
      indices,
      surfaceIds: Uint32Array.from(this.surfaceIds),
      materialIds: Uint32Array.from(this.materialIds),
      surfaceNames: [...this.surfaceNames],
      materialNames: [...this.materialNames],
      warnings,
      droppedTriangleCount: dropped,
    };
  }
}

/** Repeated vertex, zero area, or a sliver whose height is negligible against its longest edge. */
function isDegenerate(p: readonly number[], a: number, b: number, c: number): boolean {
  if (a === b || b === c || a === c) return true;
  const ax = p[a * 3]!, ay = p[a * 3 + 1]!, az = p[a * 3 + 2]!;
  const e1x = p[b * 3]! - ax, e1y = p[b * 3 + 1]! - ay, e1z = p[b * 3 + 2]! - az;
  const e2x = p[c * 3]! - ax, e2y = p[c * 3 + 1]! - ay, e2z = p[c * 3 + 2]! - az;
  const cx = e1y * e2z - e1z * e2y;
  const cy = e1z * e2x - e1x * e2z;
  const cz = e1x * e2y - e1y * e2x;
  const doubleArea = Math.sqrt(cx * cx + cy * cy + cz * cz);
  if (!(doubleArea > MIN_DOUBLE_AREA_M2)) return true;
  const l1 = e1x * e1x + e1y * e1y + e1z * e1z;
  const l2 = e2x * e2x + e2y * e2y + e2z * e2z;
  const e3x = e2x - e1x, e3y = e2y - e1y, e3z = e2z - e1z;
  const l3 = e3x * e3x + e3y * e3y + e3z * e3z;
  const longest2 = Math.max(l1, l2, l3);
  // doubleArea = longest · height, so height / longest = doubleArea / longest².
  return doubleArea / longest2 < MIN_HEIGHT_PER_LENGTH;
}

/** "dir/name.glb" → "name". */
export function fileStem(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  const dot = base.lastIndexOf('.');
  return dot > 0 ? base.slice(0, dot) : base;
}
