/**
 * The demo massing model (an invented scenario): a café terrace at the foot of a six-storey block
 * in "Harrowmere", an invented temperate northern city. The block's two-storey podium faces south
 * with dark painted steel cladding panels behind the tables; its setback roof carries a second
 * terrace; across a lane to the east a glazed office façade faces west; a lawn strip edges the
 * paving. Engine coordinates (x east, y north, z up) [m]. Every face is its own named quad so the
 * project file can assign materials by node name or material name.
 *
 * Regenerate public/demo/demo-terrace.glb with `npx tsx src/cli/makeDemoModel.ts`.
 */

export interface DemoQuad {
  name: string;
  materialName: string;
  /** Four corners, counter-clockwise seen from outside (so the normal points out of the solid). */
  corners: [number, number, number][];
  baseColor: [number, number, number, number];
}

const COLORS: Record<string, [number, number, number, number]> = {
  'cladding-dark-steel': [0.08, 0.09, 0.1, 1],
  'render-light': [0.82, 0.8, 0.76, 1],
  glazing: [0.35, 0.5, 0.6, 1],
  'neighbour-frame': [0.6, 0.62, 0.65, 1],
  lawn: [0.25, 0.5, 0.2, 1],
  'roof-deck': [0.55, 0.4, 0.28, 1],
  roof: [0.3, 0.3, 0.3, 1],
};

type Face = 'south' | 'north' | 'east' | 'west' | 'top' | 'bottom';

/** Quads of an axis-aligned box, for the faces listed, each with its own material. */
function boxFaces(name: string, min: [number, number, number], max: [number, number, number], faces: Partial<Record<Face, string>>): DemoQuad[] {
  const [x0, y0, z0] = min;
  const [x1, y1, z1] = max;
  const corners: Record<Face, [number, number, number][]> = {
    south: [[x0, y0, z0], [x1, y0, z0], [x1, y0, z1], [x0, y0, z1]],
    north: [[x1, y1, z0], [x0, y1, z0], [x0, y1, z1], [x1, y1, z1]],
    east: [[x1, y0, z0], [x1, y1, z0], [x1, y1, z1], [x1, y0, z1]],
    west: [[x0, y1, z0], [x0, y0, z0], [x0, y0, z1], [x0, y1, z1]],
    top: [[x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1]],
    bottom: [[x0, y1, z0], [x1, y1, z0], [x1, y0, z0], [x0, y0, z0]],
  };
  return (Object.keys(faces) as Face[]).map((f) => ({
    name: `${name}-${f}`,
    materialName: faces[f]!,
    corners: corners[f],
    baseColor: COLORS[faces[f]!] ?? [0.8, 0.8, 0.8, 1],
  }));
}

export function demoQuads(): DemoQuad[] {
  return [
    // Podium: x 0–24, y 10–16, 9 m high; its south face is the dark steel cladding behind the tables.
    ...boxFaces('podium', [0, 10, 0], [24, 16, 9], {
      south: 'cladding-dark-steel', east: 'render-light', west: 'render-light', top: 'roof-deck',
    }),
    // Tower: x 0–24, y 16–26, 21 m high (six storeys); its south face rises above the podium roof.
    ...boxFaces('tower', [0, 16, 9], [24, 26, 21], { south: 'render-light', top: 'roof' }),
    ...boxFaces('tower-base', [0, 16, 0], [24, 26, 9], { north: 'render-light', east: 'render-light', west: 'render-light' }),
    ...boxFaces('tower-upper', [0, 16, 9], [24, 26, 21], { north: 'render-light', east: 'render-light', west: 'render-light' }),
    // Neighbour across a 5 m lane to the east: a glazed west façade, 15 m high.
    ...boxFaces('neighbour', [29, -4, 0], [45, 22, 15], {
      west: 'glazing', south: 'neighbour-frame', north: 'neighbour-frame', east: 'neighbour-frame', top: 'roof',
    }),
    // Lawn strip along the south edge of the terrace, a hand's breadth above the paving.
    ...boxFaces('lawn-strip', [3, 0.5, 0], [21, 2.5, 0.05], { top: 'lawn', south: 'lawn', north: 'lawn', east: 'lawn', west: 'lawn' }),
  ];
}

/** The quads as indexed triangle meshes (two triangles per quad), for the glTF writer. */
export function demoMeshes(): { name: string; materialName: string; positions: Float32Array; indices: Uint32Array; baseColor: [number, number, number, number] }[] {
  return demoQuads().map((q) => ({
    name: q.name,
    materialName: q.materialName,
    positions: new Float32Array(q.corners.flat()),
    indices: new Uint32Array([0, 1, 2, 0, 2, 3]),
    baseColor: q.baseColor,
  }));
}
