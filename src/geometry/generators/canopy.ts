/**
 * Free-standing canopies: a rectangular plate at a height over a point, turned to an azimuth and
 * optionally tilted, opaque or fabric with a solar transmittance (as overhang.ts). No posts are
 * generated (add them as the model's own geometry if they matter).
 */
import type { DeviceMesh } from './mesh.ts';

export interface CanopySpec {
  type: 'canopy';
  name: string;
  material: string;
  /** Plan centre x, y [m]. */
  center: [number, number];
  /** z of the plate's underside at its centre [m]. */
  heightM: number;
  /** Size along the width axis [m]. */
  widthM: number;
  /** Size across it (horizontal, before tilt) [m]. */
  depthM: number;
  /** Azimuth of the width axis, clockwise from north [deg]. */
  azimuthDeg: number;
  /** Tilt about the width axis [deg]; positive lowers the edge facing azimuthDeg + 90°. */
  tiltDeg: number;
  thicknessM: number;
  /** 0 opaque, (0, 1) fabric [-]. */
  transmittance: number;
}

/** Adds the plate (12 triangles) to `mesh` as one surface named after the device. */
export function generateCanopy(spec: CanopySpec, mesh: DeviceMesh, deviceIndex: number): void {
  const az = spec.azimuthDeg * Math.PI / 180;
  const ax = Math.sin(az), ay = Math.cos(az);
  const px = ay, py = -ax; // azimuth + 90°
  const tilt = spec.tiltDeg * Math.PI / 180;
  const ct = Math.cos(tilt), st = Math.sin(tilt);
  const slantM = spec.depthM / ct;
  const wx = px * ct, wy = py * ct, wz = -st;
  const ux = px * st, uy = py * st, uz = ct;
  const h = spec.thicknessM / 2;
  mesh.begin(spec.name, spec.material, spec.transmittance, deviceIndex);
  mesh.box(spec.center[0] + ux * h, spec.center[1] + uy * h, spec.heightM + uz * h,
    ax, ay, 0, spec.widthM / 2, wx, wy, wz, slantM / 2, ux, uy, uz, h);
}
