/**
 * Vertical fins on a façade region: thin vertical boxes standing out from a wall segment, evenly
 * spaced along it and centred in it (count = floor(length / spacing) + 1, so a segment whose length
 * is a multiple of the spacing gets a fin at each end), each turned in plan by an angle from the
 * wall's outward normal about its root line.
 */
import { DeviceMesh, centredPositions, wallFrame } from './mesh.ts';

export interface FinsSpec {
  type: 'fins';
  name: string;
  material: string;
  /** Wall segment start and end, plan x, y [m]. */
  from: [number, number];
  to: [number, number];
  /** Outward side: "left"/"right" of from → to seen from above, or an outward plan vector. */
  outside: 'left' | 'right' | [number, number];
  /** z of the fins' bottom and top [m]. */
  bottomM: number;
  topM: number;
  /** How far each fin stands out from its root line [m]. */
  depthM: number;
  /** Centre-to-centre distance along the wall [m]. */
  spacingM: number;
  /** Fin thickness [m]. */
  thicknessM: number;
  /** Plan angle of the fins from the outward normal; positive turns the outer edge toward `to` [deg]. */
  angleDeg: number;
  /** Gap between the wall plane and the fins' root line [m]. */
  offsetM: number;
}

/** Fin positions along the wall (distance from `from` [m]). */
export function finPositionsM(spec: Pick<FinsSpec, 'from' | 'to' | 'spacingM'>): number[] {
  const L = Math.hypot(spec.to[0] - spec.from[0], spec.to[1] - spec.from[1]);
  return centredPositions(L, spec.spacingM);
}

/** Adds the fins (12 triangles each) to `mesh` as one surface named after the device. */
export function generateFins(spec: FinsSpec, mesh: DeviceMesh, deviceIndex: number): void {
  const f = wallFrame(spec.from, spec.to, spec.outside);
  const a = spec.angleDeg * Math.PI / 180;
  const ca = Math.cos(a), sa = Math.sin(a);
  // depth axis: the outward normal turned toward the tangent; thickness axis perpendicular in plan
  const wx = f.nx * ca + f.tx * sa, wy = f.ny * ca + f.ty * sa;
  const ux = f.tx * ca - f.nx * sa, uy = f.ty * ca - f.ny * sa;
  const zc = (spec.bottomM + spec.topM) / 2, hz = (spec.topM - spec.bottomM) / 2;
  mesh.begin(spec.name, spec.material, 0, deviceIndex);
  for (const s of finPositionsM(spec)) {
    const rx = f.ax + f.tx * s + f.nx * spec.offsetM, ry = f.ay + f.ty * s + f.ny * spec.offsetM;
    const cx = rx + wx * spec.depthM / 2, cy = ry + wy * spec.depthM / 2;
    mesh.box(cx, cy, zc, ux, uy, 0, spec.thicknessM / 2, wx, wy, 0, spec.depthM / 2, 0, 0, 1, hz);
  }
}
