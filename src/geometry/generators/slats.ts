/**
 * Horizontal slats / louvres: thin blades with their long axis horizontal, either
 * - "screen": stacked vertically in front of a wall segment (a louvred screen), or
 * - "pergola": side by side at one height over a terrace polygon (a slatted roof), each blade
 *   clipped to the polygon.
 * Tilt turns a blade about its long axis. Blades are laid out one per band of `spacingM`, centred
 * in the range (count = floor(range / spacing), at least 1), so none sits on the range's edge.
 */
import { DeviceMesh, bandPositions, wallFrame } from './mesh.ts';

interface SlatsCommon {
  type: 'slats';
  name: string;
  material: string;
  /** Blade width across its long axis [m]. */
  depthM: number;
  /** Centre-to-centre distance between blades [m]. */
  spacingM: number;
  /** Blade thickness [m]. */
  thicknessM: number;
  /**
   * Blade tilt about its long axis [deg]. Screen: positive lowers the outer edge. Pergola: positive
   * lowers the blade edge facing azimuth slatAzimuthDeg + 90° (e.g. the south edge of east–west
   * blades, slatAzimuthDeg 90).
   */
  tiltDeg: number;
}

export interface SlatScreenSpec extends SlatsCommon {
  layout: 'screen';
  from: [number, number];
  to: [number, number];
  outside: 'left' | 'right' | [number, number];
  /** z range the blades are spread over [m]. */
  bottomM: number;
  topM: number;
  /** Distance from the wall plane to the blades' inner edge (untilted) [m]. */
  standoffM: number;
}

export interface SlatPergolaSpec extends SlatsCommon {
  layout: 'pergola';
  /** Plan polygon x, y [m] (simple, either winding). */
  polygon: [number, number][];
  /** z of the blades' centre line [m]. */
  heightM: number;
  /** Azimuth of the blades' long axis, clockwise from north [deg]. */
  slatAzimuthDeg: number;
}

export type SlatsSpec = SlatScreenSpec | SlatPergolaSpec;

/** z of each blade's centre for a screen [m]. */
export function screenSlatHeightsM(spec: Pick<SlatScreenSpec, 'bottomM' | 'topM' | 'spacingM'>): number[] {
  return bandPositions(spec.topM - spec.bottomM, spec.spacingM).map((s) => spec.bottomM + s);
}

/**
 * Blade intervals of a pergola: for each blade line (offset c across, along unit d), the [t0, t1]
 * pieces inside the polygon. Returns [c, t0, t1] triples with points = c·p + t·d.
 */
export function pergolaSlatPieces(spec: Pick<SlatPergolaSpec, 'polygon' | 'slatAzimuthDeg' | 'spacingM'>): [number, number, number][] {
  const az = spec.slatAzimuthDeg * Math.PI / 180;
  const dx = Math.sin(az), dy = Math.cos(az); // long axis
  const px = dy, py = -dx; // across (long axis turned 90° clockwise)
  const poly = spec.polygon;
  let cmin = Infinity, cmax = -Infinity;
  for (const [x, y] of poly) {
    const c = x * px + y * py;
    if (c < cmin) cmin = c;
    if (c > cmax) cmax = c;
  }
  const out: [number, number, number][] = [];
  for (const s of bandPositions(cmax - cmin, spec.spacingM)) {
    const c = cmin + s;
    const ts: number[] = [];
    for (let i = 0; i < poly.length; i++) {
      const [x0, y0] = poly[i]!, [x1, y1] = poly[(i + 1) % poly.length]!;
      const c0 = x0 * px + y0 * py - c, c1 = x1 * px + y1 * py - c;
      // half-open rule so a line through a vertex counts it once
      if ((c0 < 0) !== (c1 < 0)) {
        const u = c0 / (c0 - c1);
        const x = x0 + (x1 - x0) * u, y = y0 + (y1 - y0) * u;
        ts.push(x * dx + y * dy);
      }
    }
    ts.sort((p, q) => p - q);
    for (let k = 0; k + 1 < ts.length; k += 2) {
      if (ts[k + 1]! - ts[k]! > 1e-6) out.push([c, ts[k]!, ts[k + 1]!]);
    }
  }
  return out;
}

/** Adds the blades (12 triangles each) to `mesh` as one surface named after the device. */
export function generateSlats(spec: SlatsSpec, mesh: DeviceMesh, deviceIndex: number): void {
  const tilt = spec.tiltDeg * Math.PI / 180;
  const ct = Math.cos(tilt), st = Math.sin(tilt);
  mesh.begin(spec.name, spec.material, 0, deviceIndex);
  if (spec.layout === 'screen') {
    const f = wallFrame(spec.from, spec.to, spec.outside);
    // blade width axis: outward, tilted so positive tilt lowers the outer edge; thickness axis ⟂
    const wx = f.nx * ct, wy = f.ny * ct, wz = -st;
    const ux = f.nx * st, uy = f.ny * st, uz = ct;
    const out = spec.standoffM + spec.depthM / 2;
    const mx = f.ax + f.tx * f.lengthM / 2 + f.nx * out, my = f.ay + f.ty * f.lengthM / 2 + f.ny * out;
    for (const z of screenSlatHeightsM(spec)) {
      mesh.box(mx, my, z, f.tx, f.ty, 0, f.lengthM / 2, wx, wy, wz, spec.depthM / 2, ux, uy, uz, spec.thicknessM / 2);
    }
    return;
  }
  const az = spec.slatAzimuthDeg * Math.PI / 180;
  const dx = Math.sin(az), dy = Math.cos(az);
  const px = dy, py = -dx;
  // positive tilt lowers the +p edge
  const wx = px * ct, wy = py * ct, wz = -st;
  const ux = px * st, uy = py * st, uz = ct;
  for (const [c, t0, t1] of pergolaSlatPieces(spec)) {
    const tm = (t0 + t1) / 2;
    mesh.box(c * px + tm * dx, c * py + tm * dy, spec.heightM, dx, dy, 0, (t1 - t0) / 2, wx, wy, wz, spec.depthM / 2, ux, uy, uz, spec.thicknessM / 2);
  }
}
