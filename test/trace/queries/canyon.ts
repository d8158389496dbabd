/** Closed-form test scenes for the queries. */
import { buildBvh, type BvhData } from '../../../src/trace/bvh/build.ts';
import { MeshBuilder } from '../../helpers/bruteTracer.ts';

/**
 * A long street canyon along y: walls at x = ±W/2 from z = 0 to H, length L = lengthRatio·W,
 * centred on the origin (two vertical quads, patches 0 = west wall, 1 = east wall).
 */
export function canyon(hOverW: number, widthM = 10, lengthRatio = 40): { bvh: BvhData; mesh: MeshBuilder; W: number; H: number } {
  const W = widthM, H = hOverW * widthM, L = lengthRatio * widthM;
  const m = new MeshBuilder();
  m.quad([-W / 2, -L / 2, 0], [-W / 2, L / 2, 0], [-W / 2, L / 2, H], [-W / 2, -L / 2, H], 0);
  m.quad([W / 2, -L / 2, 0], [W / 2, L / 2, 0], [W / 2, L / 2, H], [W / 2, -L / 2, H], 1);
  return { bvh: buildBvh(m.positions(), m.indices()), mesh: m, W, H };
}
