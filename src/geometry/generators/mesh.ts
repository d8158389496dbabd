/**
 * Shared back end of the device generators: an accumulator of engine-frame triangles (x east,
 * y north, z up [m]) that records, per triangle, its surface, material, solar transmittance and
 * device, plus the closed solids every device is made of (thin boxes, prisms between two rings).
 *
 * Every solid is closed and its triangles wind counter-clockwise seen from outside (normals out of
 * the solid, DESIGN §3), so ray parity works and both faces of a thin element are real surfaces.
 * Unlike the importers' SceneBuilder nothing is dropped: generators are given validated, positive
 * dimensions, and per-triangle attributes must stay aligned with the triangles.
 */

/** Plan frame of a wall segment: start point, unit tangent (from → to), unit outward normal, length. */
export interface WallFrame {
  ax: number;
  ay: number;
  tx: number;
  ty: number;
  nx: number;
  ny: number;
  lengthM: number;
}

/**
 * The frame of the wall segment from → to, with the outward side given as "left"/"right" of the
 * direction from → to seen from above, or as a plan vector whose side is taken (it need not be
 * exactly perpendicular).
 */
export function wallFrame(from: readonly number[], to: readonly number[], outside: 'left' | 'right' | readonly number[]): WallFrame {
  const ax = from[0]!, ay = from[1]!;
  const ex = to[0]! - ax, ey = to[1]! - ay;
  const lengthM = Math.hypot(ex, ey);
  const tx = ex / lengthM, ty = ey / lengthM;
  // left of the direction from → to, seen from above (z up): rotate the tangent +90°
  let nx = -ty, ny = tx;
  if (outside === 'right') { nx = ty; ny = -tx; }
  else if (typeof outside !== 'string') {
    if (outside[0]! * nx + outside[1]! * ny < 0) { nx = -nx; ny = -ny; }
  }
  return { ax, ay, tx, ty, nx, ny, lengthM };
}

/** Positions of `count` evenly spaced elements centred in a run of `lengthM` [m]; count = floor(L/s) + 1. */
export function centredPositions(lengthM: number, spacingM: number): number[] {
  const count = Math.floor(lengthM / spacingM + 1e-9) + 1;
  const first = (lengthM - (count - 1) * spacingM) / 2;
  const out: number[] = [];
  for (let j = 0; j < count; j++) out.push(first + j * spacingM);
  return out;
}

/**
 * Positions of elements each centred in its own band of width `spacingM` across a run of `lengthM`
 * [m]: count = max(1, floor(L/s)), so no element sits on the run's ends (slats, pergola blades).
 */
export function bandPositions(lengthM: number, spacingM: number): number[] {
  const count = Math.max(1, Math.floor(lengthM / spacingM + 1e-9));
  const first = (lengthM - (count - 1) * spacingM) / 2;
  const out: number[] = [];
  for (let j = 0; j < count; j++) out.push(first + j * spacingM);
  return out;
}

export class DeviceMesh {
  readonly positions: number[] = [];
  readonly indices: number[] = [];
  readonly triSurface: number[] = [];
  readonly triMaterial: number[] = [];
  readonly triTransmittance: number[] = [];
  readonly triDevice: number[] = [];
  readonly surfaceNames: string[] = [];
  readonly surfaceTransmittance: number[] = [];
  readonly surfaceDevice: number[] = [];
  readonly materialNames: string[] = [];
  private readonly materialIndex = new Map<string, number>();
  private surface = -1;
  private material = -1;
  private transmittance = 0;
  private device = -1;

  /** Starts a new surface: later triangles get this name, material and transmittance [-]. */
  begin(surfaceName: string, materialName: string, transmittance: number, deviceIndex: number): void {
    this.surfaceNames.push(surfaceName);
    this.surfaceTransmittance.push(transmittance);
    this.surfaceDevice.push(deviceIndex);
    this.surface = this.surfaceNames.length - 1;
    let m = this.materialIndex.get(materialName);
    if (m === undefined) {
      this.materialNames.push(materialName);
      m = this.materialNames.length - 1;
      this.materialIndex.set(materialName, m);
    }
    this.material = m;
    this.transmittance = transmittance;
    this.device = deviceIndex;
  }

  get triangleCount(): number {
    return this.indices.length / 3;
  }

  vertex(x: number, y: number, z: number): number {
    this.positions.push(x, y, z);
    return this.positions.length / 3 - 1;
  }

  /** Triangle a → b → c, counter-clockwise seen from outside. */
  triangle(a: number, b: number, c: number): void {
    if (this.surface < 0) throw new Error('DeviceMesh: begin() a surface first');
    this.indices.push(a, b, c);
    this.triSurface.push(this.surface);
    this.triMaterial.push(this.material);
    this.triTransmittance.push(this.transmittance);
    this.triDevice.push(this.device);
  }

  /** Quad a b c d (counter-clockwise seen from outside) as triangles abc, acd. */
  quad(a: number, b: number, c: number, d: number): void {
    this.triangle(a, b, c);
    this.triangle(a, c, d);
  }

  /**
   * A closed box (12 triangles): centre [m], three mutually perpendicular unit axes, half extents
   * along each [m]. The handedness of the axes does not matter.
   */
  box(
    cx: number, cy: number, cz: number,
    ux: number, uy: number, uz: number, hu: number,
    vx: number, vy: number, vz: number, hv: number,
    wx: number, wy: number, wz: number, hw: number,
  ): void {
    // make (u, v, w) right-handed so the face windings below point outward
    const det = (uy * vz - uz * vy) * wx + (uz * vx - ux * vz) * wy + (ux * vy - uy * vx) * wz;
    if (det < 0) { wx = -wx; wy = -wy; wz = -wz; }
    const p = (i: number, j: number, k: number) => {
      const su = i ? hu : -hu, sv = j ? hv : -hv, sw = k ? hw : -hw;
      return this.vertex(cx + su * ux + sv * vx + sw * wx, cy + su * uy + sv * vy + sw * wy, cz + su * uz + sv * vz + sw * wz);
    };
    const v000 = p(0, 0, 0), v100 = p(1, 0, 0), v010 = p(0, 1, 0), v110 = p(1, 1, 0);
    const v001 = p(0, 0, 1), v101 = p(1, 0, 1), v011 = p(0, 1, 1), v111 = p(1, 1, 1);
    this.quad(v001, v101, v111, v011); // +w
    this.quad(v000, v010, v110, v100); // −w
    this.quad(v100, v110, v111, v101); // +u
    this.quad(v000, v001, v011, v010); // −u
    this.quad(v010, v011, v111, v110); // +v
    this.quad(v000, v100, v101, v001); // −v
  }

  /**
   * A closed solid between a lower and an upper surface, each a fan around an apex over a ring:
   * `lowerRing`/`upperRing` are n points (xyz flat) counter-clockwise seen from above, `lowerApex`/
   * `upperApex` one point each (the fan centres). Gives 4n triangles. A flat disc has its apexes at
   * the rings' centres; a shallow cone lifts them.
   */
  fanSolid(lowerRing: readonly number[], lowerApex: readonly number[], upperRing: readonly number[], upperApex: readonly number[]): void {
    const n = lowerRing.length / 3;
    const lo: number[] = [], up: number[] = [];
    for (let i = 0; i < n; i++) {
      lo.push(this.vertex(lowerRing[i * 3]!, lowerRing[i * 3 + 1]!, lowerRing[i * 3 + 2]!));
      up.push(this.vertex(upperRing[i * 3]!, upperRing[i * 3 + 1]!, upperRing[i * 3 + 2]!));
    }
    const la = this.vertex(lowerApex[0]!, lowerApex[1]!, lowerApex[2]!);
    const ua = this.vertex(upperApex[0]!, upperApex[1]!, upperApex[2]!);
    for (let i = 0; i < n; i++) {
      const j = (i + 1) % n;
      this.triangle(ua, up[i]!, up[j]!); // top, seen from above: CCW
      this.triangle(la, lo[j]!, lo[i]!); // bottom, seen from below: CCW
      this.quad(lo[i]!, lo[j]!, up[j]!, up[i]!); // rim, outward
    }
  }
}
