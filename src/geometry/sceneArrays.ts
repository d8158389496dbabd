/**
 * The Scene: a triangle soup in flat typed arrays, in engine coordinates (metres, x east, y north,
 * z up; DESIGN §3). Produced by the importers (glTF, OBJ) and by the device generators; consumed by
 * the discretiser and the tracer. No objects per triangle.
 */
export interface SceneArrays {
  /** xyz per vertex [m], world (engine) frame. */
  positions: Float32Array;
  /** Three vertex indices per triangle. */
  indices: Uint32Array;
  /** Per triangle: index into `surfaceNames` (a node/mesh of the source model). */
  surfaceIds: Uint32Array;
  /** Per triangle: index into `materialNames` (the source model's material names). */
  materialIds: Uint32Array;
  /** Surface names from node/mesh names (unique; made unique with a "#n" suffix where needed). */
  surfaceNames: string[];
  /** Material names as in the source model ("" for none). */
  materialNames: string[];
  /** What the importer dropped or fixed, for the results' warnings list. */
  warnings: string[];
}

export function triangleCount(scene: SceneArrays): number {
  return scene.indices.length / 3;
}
