/** Checks shared by the generator tests: closedness, outward winding, areas, sun directions. */
import type { SceneArrays } from '../../../src/geometry/sceneArrays.ts';

/** Every directed edge a→b of the triangles in [t0, t1) is matched by exactly one b→a. */
export function isClosed(scene: SceneArrays, t0 = 0, t1 = scene.indices.length / 3): boolean {
  const p = scene.positions;
  const key = (v: number) => `${p[v * 3]},${p[v * 3 + 1]},${p[v * 3 + 2]}`;
  const edges = new Map<string, number>();
  for (let t = t0; t < t1; t++) {
    for (let e = 0; e < 3; e++) {
      const a = key(scene.indices[t * 3 + e]!), b = key(scene.indices[t * 3 + ((e + 1) % 3)]!);
      edges.set(`${a}|${b}`, (edges.get(`${a}|${b}`) ?? 0) + 1);
    }
  }
  for (const [k, n] of edges) {
    const [a, b] = k.split('|');
    if (edges.get(`${b}|${a}`) !== n || n !== 1) return false;
  }
  return true;
}

/** Signed volume (divergence theorem) of triangles [t0, t1): > 0 when the normals point out [m³]. */
export function signedVolumeM3(scene: SceneArrays, t0 = 0, t1 = scene.indices.length / 3): number {
  let v = 0;
  const p = scene.positions;
  for (let t = t0; t < t1; t++) {
    const a = scene.indices[t * 3]! * 3, b = scene.indices[t * 3 + 1]! * 3, c = scene.indices[t * 3 + 2]! * 3;
    const ax = p[a]!, ay = p[a + 1]!, az = p[a + 2]!, bx = p[b]!, by = p[b + 1]!, bz = p[b + 2]!, cx = p[c]!, cy = p[c + 1]!, cz = p[c + 2]!;
    v += (ax * (by * cz - bz * cy) - ay * (bx * cz - bz * cx) + az * (bx * cy - by * cx)) / 6;
  }
  return v;
}

/** Total area of triangles [t0, t1) [m²]. */
export function areaM2(scene: SceneArrays, t0 = 0, t1 = scene.indices.length / 3): number {
  let s = 0;
  const p = scene.positions;
  for (let t = t0; t < t1; t++) {
    const a = scene.indices[t * 3]! * 3, b = scene.indices[t * 3 + 1]! * 3, c = scene.indices[t * 3 + 2]! * 3;
    const ex = p[b]! - p[a]!, ey = p[b + 1]! - p[a + 1]!, ez = p[b + 2]! - p[a + 2]!;
    const fx = p[c]! - p[a]!, fy = p[c + 1]! - p[a + 1]!, fz = p[c + 2]! - p[a + 2]!;
    s += Math.hypot(ey * fz - ez * fy, ez * fx - ex * fz, ex * fy - ey * fx) / 2;
  }
  return s;
}

/** Unit vector toward the sun: azimuth clockwise from north, altitude above the horizon [deg]. */
export function sunDirection(altitudeDeg: number, azimuthDeg: number): [number, number, number] {
  const a = altitudeDeg * Math.PI / 180, z = azimuthDeg * Math.PI / 180;
  return [Math.sin(z) * Math.cos(a), Math.cos(z) * Math.cos(a), Math.sin(a)];
}

export const DEG = Math.PI / 180;
