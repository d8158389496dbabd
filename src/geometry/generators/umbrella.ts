/**
 * Umbrellas / parasols at points: a flat or shallow-cone disc of fabric (a thin closed solid whose
 * triangles carry the fabric's solar transmittance) on an opaque square pole.
 *
 * The disc is a regular polygon of `segments` sides whose area equals the circle's, π r²
 * (circumradius r·√(2π / (n·sin(2π/n)))), so the shade it casts has the stated size on average.
 */
import type { DeviceMesh } from './mesh.ts';

export interface UmbrellaSpec {
  type: 'umbrella';
  name: string;
  /** Fabric material name. */
  material: string;
  poleMaterial: string;
  /** Pole foot positions x, y [m], with an optional z (default 0) [m]. */
  points: [number, number, number][];
  /** Disc radius (plan) [m]. */
  radiusM: number;
  /** Height of the disc's rim (underside) above the foot [m]. */
  heightM: number;
  /** Rise of the cone's apex above the rim [m]; 0 for a flat disc. */
  riseM: number;
  /** Fabric thickness [m]. */
  thicknessM: number;
  /** Solar transmittance of the fabric, 0 opaque [-]. */
  transmittance: number;
  /** Pole width (square section) [m]. */
  poleWidthM: number;
  /** Polygon sides of the disc. */
  segments: number;
}

/** Circumradius of the regular n-gon with the area of a circle of radius r [m]. */
export function equalAreaCircumradiusM(radiusM: number, segments: number): number {
  return radiusM * Math.sqrt((2 * Math.PI) / (segments * Math.sin((2 * Math.PI) / segments)));
}

/** Adds each umbrella's disc (4·segments triangles) and pole (12 triangles) to `mesh`. */
export function generateUmbrellas(spec: UmbrellaSpec, mesh: DeviceMesh, deviceIndex: number): void {
  const n = spec.segments;
  const R = equalAreaCircumradiusM(spec.radiusM, n);
  const t = spec.thicknessM;
  mesh.begin(spec.name, spec.material, spec.transmittance, deviceIndex);
  for (const [x, y, z0] of spec.points) {
    const rimZ = z0 + spec.heightM;
    const lower: number[] = [], upper: number[] = [];
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * i) / n;
      const px = x + R * Math.cos(a), py = y + R * Math.sin(a);
      lower.push(px, py, rimZ);
      upper.push(px, py, rimZ + t);
    }
    mesh.fanSolid(lower, [x, y, rimZ + spec.riseM], upper, [x, y, rimZ + spec.riseM + t]);
  }
  mesh.begin(`${spec.name}-pole`, spec.poleMaterial, 0, deviceIndex);
  const hw = spec.poleWidthM / 2;
  for (const [x, y, z0] of spec.points) {
    // stop where the cone's underside is above the pole's corner (no overlap with the disc)
    const top = z0 + spec.heightM + spec.riseM * (1 - (hw * Math.SQRT2) / R);
    mesh.box(x, y, (z0 + top) / 2, 1, 0, 0, hw, 0, 1, 0, hw, 0, 0, 1, (top - z0) / 2);
  }
}
