/** Options shared by the sampled (hemisphere) queries: skyVisibility and surfaceViews. */
import type { CrownSet } from '../../geometry/generators/tree.ts';
import type { GroundPlaneInput } from './groundPlane.ts';

export interface SampledQueryOptions {
  ground?: GroundPlaneInput | null | undefined;
  /** Generator seed (default random.ts DEFAULT_SEED). */
  seed?: number | undefined;
  /** Origin offset along the normal [m] (default 1e-3; receivers with normals only). */
  normalOffsetM?: number | undefined;
  /** Nearest accepted hit [m] (default 1e-4). */
  tMinM?: number | undefined;
  /** Optional random stream per receiver (default: the receiver's index). */
  streamIndex?: Uint32Array | undefined;
  /** Optional tree crowns: semi-transparent volumes along the rays (with `crownExtinctionPerM`). */
  crowns?: CrownSet | undefined;
  /** Extinction per crown [1/m] (crowns.count values). */
  crownExtinctionPerM?: Float64Array | undefined;
  /** Trace with the batch kernel (float32 rays; may differ slightly from the per-ray path). */
  batchRays?: boolean | undefined;
}
