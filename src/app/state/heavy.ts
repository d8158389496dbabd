/**
 * Big data kept outside React state (STYLE §11): the model's typed arrays, the last results and
 * the patch triangles. Components read it while building geometry or colouring, keyed by the
 * version numbers in the store.
 */
import type { ModelView, PatchView, SunPath } from '../compute/auditApi.ts';
import type { ResultsView } from '../compute/resultColumns.ts';
import type { Comparison } from '../../audit/options.ts';
import type { DesignOutcome } from '../compute/auditApi.ts';

export interface HeavyData {
  /** The model file's bytes (for the audit, Save and autosave). */
  modelBytes: Uint8Array | null;
  model: ModelView | null;
  /** The shown results as columns (the full Results stay in the audit worker). */
  results: ResultsView | null;
  patches: PatchView | null;
  sunPath: SunPath | null;
  /** The hourly weather file the project refers to (weather.source "file"). */
  weatherFile: { name: string; bytes: Uint8Array } | null;
  /** The last run of every design, and each option against the baseline. */
  designs: { runs: DesignOutcome[]; comparison: Comparison; baselineName: string } | null;
  /** The comparison of the picked pair (store: compareOption against compareReference). */
  pair: Comparison | null;
}

export const heavy: HeavyData = { modelBytes: null, model: null, results: null, patches: null, sunPath: null, weatherFile: null, designs: null, pair: null };
