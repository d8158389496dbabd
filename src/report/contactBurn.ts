/**
 * Screening flags for hot surfaces people may touch: patch surface temperatures compared with
 * contact-burn thresholds of the kind EN ISO 13732-1 ("Ergonomics of the thermal environment —
 * Methods for the assessment of human responses to contact with surfaces — Part 1: Hot surfaces")
 * tabulates per material group and contact time.
 *
 * The threshold values below are `from memory`: they were recalled, not checked against the
 * standard's tables, and are rounded. They are a screening aid that picks out surfaces to look at,
 * not a finding of compliance or of risk; check the standard itself before relying on a number.
 */
import type { Results } from '../audit/results.ts';

export type ContactGroup = 'metal' | 'glass-mineral' | 'wood' | 'not-touched';

export interface ContactThreshold {
  group: ContactGroup;
  /** Plain name of the group. */
  label: string;
  /** Threshold for a brief touch of a few seconds [°C]; null for surfaces not assessed. */
  briefTouchC: number | null;
}

/**
 * Brief-touch (about 4 s) thresholds per group, `from memory` (EN ISO 13732-1 burn-threshold
 * curves, rounded): bare or painted metal ~60 °C, glass / stone / concrete ~70 °C, wood ~90 °C.
 */
export const BRIEF_TOUCH_THRESHOLDS: Record<ContactGroup, ContactThreshold> = {
  metal: { group: 'metal', label: 'metal', briefTouchC: 60 },
  'glass-mineral': { group: 'glass-mineral', label: 'glass, stone, concrete, brick', briefTouchC: 70 },
  wood: { group: 'wood', label: 'wood', briefTouchC: 90 },
  'not-touched': { group: 'not-touched', label: 'vegetation / water (not assessed)', briefTouchC: null },
};

/**
 * Long contact (10 minutes or more: sitting, leaning, bare feet) threshold for all material
 * groups [°C], `from memory` (EN ISO 13732-1, about 48 °C for contact of 10 min and longer).
 */
export const LONG_CONTACT_THRESHOLD_C = 48;

/** The contact group of a material preset id (by the words in it); unknown ids count as metal, the strictest group. */
export function contactGroupOf(materialId: string): ContactGroup {
  const id = materialId.toLowerCase();
  if (/grass|water|turf-natural|lawn|tree|foliage/.test(id)) return 'not-touched';
  if (/timber|wood/.test(id)) return 'wood';
  if (/glass|concrete|stone|brick|paving|render|tile|gravel|asphalt|ceramic/.test(id)) return 'glass-mineral';
  return 'metal';
}

export interface MaterialContactFlags {
  material: string;
  group: ContactGroup;
  briefTouchC: number | null;
  /** Patches whose temperature exceeds the brief-touch threshold at some step. */
  briefTouchPatches: number;
  /** Patch-hours above the brief-touch threshold [h]. */
  briefTouchHours: number;
  /** Patches above LONG_CONTACT_THRESHOLD_C at some step (null when the group is not assessed). */
  longContactPatches: number | null;
  /** Up to five patch ids above a threshold, hottest first. */
  examples: string[];
}

/**
 * Counts, per material, the patches and patch-hours above the contact thresholds.
 * @param stepHours Length of one step [h].
 */
export function contactFlags(results: Results, stepHours: number): MaterialContactFlags[] {
  const by = new Map<string, number[]>();
  results.surfaces.forEach((s, i) => {
    const l = by.get(s.material);
    if (l) l.push(i);
    else by.set(s.material, [i]);
  });
  const ids = [...by.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return ids.map((material) => {
    const group = contactGroupOf(material);
    const briefTouchC = BRIEF_TOUCH_THRESHOLDS[group].briefTouchC;
    let briefPatches = 0, briefSteps = 0, longPatches = 0;
    const hot: { id: string; peakC: number }[] = [];
    for (const i of by.get(material)!) {
      const s = results.surfaces[i]!;
      let peak = -Infinity, above = 0;
      for (const v of s.surfaceTempC) {
        if (!Number.isFinite(v)) continue;
        if (v > peak) peak = v;
        if (briefTouchC !== null && v > briefTouchC) above++;
      }
      if (above > 0) briefPatches++;
      briefSteps += above;
      if (briefTouchC !== null && peak > LONG_CONTACT_THRESHOLD_C) {
        longPatches++;
        hot.push({ id: s.id, peakC: peak });
      }
    }
    hot.sort((a, b) => b.peakC - a.peakC);
    return {
      material,
      group,
      briefTouchC,
      briefTouchPatches: briefPatches,
      briefTouchHours: Math.round(briefSteps * stepHours * 10) / 10,
      longContactPatches: briefTouchC === null ? null : longPatches,
      examples: hot.slice(0, 5).map((h) => h.id),
    };
  });
}
