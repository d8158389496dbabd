/**
 * Overhangs and awnings: a plate attached along a wall segment, projecting outward, optionally
 * tilted (outer edge down), opaque or a fabric with a solar transmittance. Fabric is a thin closed
 * sheet whose triangles carry the transmittance (the tracer attenuates instead of blocking).
 */
import { DeviceMesh, wallFrame } from './mesh.ts';

export interface OverhangSpec {
  type: 'overhang';
  name: string;
  material: string;
  from: [number, number];
  to: [number, number];
  outside: 'left' | 'right' | [number, number];
  /** z of the plate's underside along the wall [m]. */
  heightM: number;
  /** Horizontal projection from the wall plane to the outer edge [m]. */
  projectionM: number;
  /** Tilt down of the outer edge from horizontal [deg]. */
  tiltDeg: number;
  /** Plate thickness [m]. */
  thicknessM: number;
  /** Solar transmittance of the plate: 0 opaque, (0, 1) fabric [-]. */
  transmittance: number;
}

/** Adds the plate (12 triangles) to `mesh` as one surface named after the device. */
export function generateOverhang(spec: OverhangSpec, mesh: DeviceMesh, deviceIndex: number): void {
  const f = wallFrame(spec.from, spec.to, spec.outside);
  const tilt = spec.tiltDeg * Math.PI / 180;
  const ct = Math.cos(tilt), st = Math.sin(tilt);
  const slantM = spec.projectionM / ct;
  // width axis outward and down; thickness axis perpendicular, upward
  const wx = f.nx * ct, wy = f.ny * ct, wz = -st;
  const ux = f.nx * st, uy = f.ny * st, uz = ct;
  const h = spec.thicknessM / 2;
  const mx = f.ax + f.tx * f.lengthM / 2, my = f.ay + f.ty * f.lengthM / 2;
  // the underside's inner edge runs along the wall at heightM
  const cx = mx + wx * slantM / 2 + ux * h, cy = my + wy * slantM / 2 + uy * h, cz = spec.heightM + wz * slantM / 2 + uz * h;
  mesh.begin(spec.name, spec.material, spec.transmittance, deviceIndex);
  mesh.box(cx, cy, cz, f.tx, f.ty, 0, f.lengthM / 2, wx, wy, wz, slantM / 2, ux, uy, uz, h);
}
