/**
 * The project as the user edits it: the JSON document of DESIGN §4 (what Save writes and Open
 * reads), changed only through the pure reducers below. It is validated with the audit's own
 * `validateProject` before a run, so the viewer and the command line accept the same files.
 */
import { validateProject, type Project } from '../../audit/project.ts';
import { InputError } from '../../physics/errors.ts';
import { zoneOffsetMinutes } from '../../physics/time.ts';

export type Posture = 'standing' | 'seated';

export interface ZoneDoc {
  name: string;
  polygon?: [number, number][];
  mesh?: string;
  floorZ?: number;
  sensorHeightM?: number;
  spacingM?: number;
  posture?: Posture;
}

export interface ClearSkyWeatherDoc {
  source: 'clear-sky';
  airTempC: number | { min: number; max: number } | number[];
  relativeHumidityPct?: number;
  windMs?: number;
  linkeTurbidity?: number;
}

export interface ProjectDoc {
  sunfacet: 1;
  name?: string;
  notes?: string;
  site: { latitudeDeg: number; longitudeDeg: number; elevationM?: number; timeZone: string; northDeg?: number };
  model: { file: string; upAxis?: 'y' | 'z'; unitsPerMeter?: number };
  materials?: Record<string, unknown>;
  defaultMaterial?: unknown;
  ground?: { material?: unknown; z?: number };
  zones?: ZoneDoc[];
  period: { start: string; end: string; stepMinutes?: number } | 'year';
  weather: ClearSkyWeatherDoc | { source: 'file'; file: string };
  sampling?: Record<string, number>;
}

/** Result of checking a document: the validated project, or the readable message. */
export type DocCheck = { ok: true; project: Project } | { ok: false; message: string };

/** Parses project JSON text into a document; the InputError names the file and the key. */
export function parseProjectDoc(text: string, file: string): ProjectDoc {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new InputError({ file, place: 'JSON', problem: `not valid JSON (${e instanceof Error ? e.message : String(e)})`, expected: 'a Sunfacet project file' });
  }
  validateProject(raw, file); // throws with the key path on a bad file
  return raw as ProjectDoc;
}

export function checkDoc(doc: ProjectDoc, file = 'project.json'): DocCheck {
  try {
    return { ok: true, project: validateProject(structuredClone(doc), file) };
  } catch (e) {
    return { ok: false, message: e instanceof Error ? e.message : String(e) };
  }
}

export function setName(doc: ProjectDoc, name: string): ProjectDoc {
  return { ...doc, name };
}

export function setSite(doc: ProjectDoc, patch: Partial<ProjectDoc['site']>): ProjectDoc {
  return { ...doc, site: { ...doc.site, ...patch } };
}

export function setModel(doc: ProjectDoc, patch: Partial<ProjectDoc['model']>): ProjectDoc {
  return { ...doc, model: { ...doc.model, ...patch } };
}

/**
 * The preset assigned to a surface: its own name's entry first, then its model material's entry,
 * then the default. `explicit` tells whether an entry of `materials` decided it.
 */
export function assignedPreset(doc: ProjectDoc, surfaceName: string, materialName: string): { preset: string; key: string | null } {
  const m = doc.materials ?? {};
  const presetOf = (v: unknown): string | null =>
    typeof v === 'string' ? v : v !== null && typeof v === 'object' && typeof (v as { preset?: unknown }).preset === 'string' ? (v as { preset: string }).preset : v !== undefined ? 'custom' : null;
  const own = presetOf(m[surfaceName]);
  if (own !== null) return { preset: own, key: surfaceName };
  if (materialName !== '') {
    const byMat = presetOf(m[materialName]);
    if (byMat !== null) return { preset: byMat, key: materialName };
  }
  return { preset: presetOf(doc.defaultMaterial) ?? 'concrete-light', key: null };
}

/** Assigns `presetId` to a surface or material name (null removes the entry). */
export function setMaterial(doc: ProjectDoc, key: string, presetId: string | null): ProjectDoc {
  const materials = { ...(doc.materials ?? {}) };
  if (presetId === null) delete materials[key];
  else materials[key] = presetId;
  return { ...doc, materials };
}

/** Material properties a project may override on a preset (DESIGN §4), all fractions [-]. */
export const OVERRIDE_FIELDS = ['reflectanceVisible', 'reflectanceNir', 'emissivity'] as const;
export type OverrideField = (typeof OVERRIDE_FIELDS)[number];
export type MaterialOverrides = Partial<Record<OverrideField, number>>;

/** The entry of `materials[key]` as preset + overrides, or null when the key has no entry. */
export function materialEntryOf(doc: ProjectDoc, key: string): { preset: string; overrides: MaterialOverrides } | null {
  const v = doc.materials?.[key];
  if (v === undefined) return null;
  if (typeof v === 'string') return { preset: v, overrides: {} };
  if (v === null || typeof v !== 'object') return null;
  const o = v as Record<string, unknown>;
  const overrides: MaterialOverrides = {};
  for (const f of OVERRIDE_FIELDS) if (typeof o[f] === 'number') overrides[f] = o[f] as number;
  return { preset: typeof o.preset === 'string' ? o.preset : 'concrete-light', overrides };
}

/**
 * Writes `materials[key]` as `{ preset, ...overrides }` (or the plain preset id when nothing is
 * overridden). Other keys of an existing object entry are dropped only if they are overrides.
 */
export function setMaterialOverrides(doc: ProjectDoc, key: string, preset: string, overrides: MaterialOverrides): ProjectDoc {
  const clean: MaterialOverrides = {};
  for (const f of OVERRIDE_FIELDS) {
    const x = overrides[f];
    if (x === undefined) continue;
    if (!(x >= 0 && x <= 1)) throw new InputError({ problem: 'out of range', place: `materials[${JSON.stringify(key)}].${f}`, value: x, expected: 'a fraction from 0 to 1' });
    clean[f] = x;
  }
  const materials = { ...(doc.materials ?? {}) };
  materials[key] = Object.keys(clean).length === 0 ? preset : { preset, ...clean };
  return { ...doc, materials };
}

export function setDefaultMaterial(doc: ProjectDoc, presetId: string): ProjectDoc {
  return { ...doc, defaultMaterial: presetId };
}

/** A zone name not yet used: "zone 1", "zone 2", ... */
export function nextZoneName(doc: ProjectDoc, stem = 'zone'): string {
  const used = new Set((doc.zones ?? []).map((z) => z.name));
  for (let i = 1; ; i++) if (!used.has(`${stem} ${i}`)) return `${stem} ${i}`;
}

export function addZone(doc: ProjectDoc, zone: ZoneDoc): ProjectDoc {
  const zones = [...(doc.zones ?? [])];
  const name = zones.some((z) => z.name === zone.name) ? nextZoneName(doc, zone.name.replace(/\s+\d+$/, '') || 'zone') : zone.name;
  zones.push({ ...zone, name });
  return { ...doc, zones };
}

export function updateZone(doc: ProjectDoc, index: number, patch: Partial<ZoneDoc>): ProjectDoc {
  const zones = (doc.zones ?? []).map((z, i) => (i === index ? { ...z, ...patch } : z));
  return { ...doc, zones };
}

/** Moves corner `corner` of polygon zone `index` to (x, y) [m, engine frame]. */
export function moveZoneCorner(doc: ProjectDoc, index: number, corner: number, xM: number, yM: number): ProjectDoc {
  const z = doc.zones?.[index];
  if (!z?.polygon || corner < 0 || corner >= z.polygon.length) return doc;
  const polygon = z.polygon.map((p, i) => (i === corner ? ([xM, yM] as [number, number]) : p));
  return updateZone(doc, index, { polygon });
}

/** Removes a corner of a polygon zone (a zone keeps at least three). */
export function removeZoneCorner(doc: ProjectDoc, index: number, corner: number): ProjectDoc {
  const z = doc.zones?.[index];
  if (!z?.polygon || z.polygon.length <= 3) return doc;
  return updateZone(doc, index, { polygon: z.polygon.filter((_, i) => i !== corner) });
}

export function removeZone(doc: ProjectDoc, index: number): ProjectDoc {
  return { ...doc, zones: (doc.zones ?? []).filter((_, i) => i !== index) };
}

/** "+02:00" for an offset in minutes east of UTC. */
export function formatOffset(offsetMinutes: number): string {
  const sign = offsetMinutes < 0 ? '-' : '+';
  const a = Math.abs(offsetMinutes);
  return `${sign}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
}

/** The design day (YYYY-MM-DD) of a document's period, or '' for a whole-year run. */
export function designDayOf(doc: ProjectDoc): string {
  if (doc.period === 'year') return '';
  return doc.period.start.slice(0, 10);
}

/**
 * Makes the period one design day, 00:00 to the last step before midnight at the site's UTC offset
 * on that day, keeping the step length.
 */
export function setDesignDay(doc: ProjectDoc, dateIso: string): ProjectDoc {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(dateIso) || Number.isNaN(Date.parse(`${dateIso}T12:00:00Z`))) {
    throw new InputError({ problem: 'not a date', place: 'design day', value: dateIso, expected: 'a date YYYY-MM-DD' });
  }
  const step = doc.period === 'year' ? 60 : doc.period.stepMinutes ?? 60;
  const offset = formatOffset(zoneOffsetMinutes(doc.site.timeZone, Date.parse(`${dateIso}T12:00:00Z`), 'site.timeZone'));
  const lastMin = 24 * 60 - step;
  const hh = String(Math.floor(lastMin / 60)).padStart(2, '0');
  const mm = String(lastMin % 60).padStart(2, '0');
  return { ...doc, period: { start: `${dateIso}T00:00:00${offset}`, end: `${dateIso}T${hh}:${mm}:00${offset}`, stepMinutes: step } };
}

/** The kind of period a document has: one design day, a range of days, or the weather file's year. */
export type PeriodKind = 'day' | 'range' | 'year';

export function periodKindOf(doc: ProjectDoc): PeriodKind {
  if (doc.period === 'year') return 'year';
  return doc.period.start.slice(0, 10) === doc.period.end.slice(0, 10) ? 'day' : 'range';
}

/** First and last dates (YYYY-MM-DD) of a date-range period ('' for the year). */
export function dateRangeOf(doc: ProjectDoc): { startDate: string; endDate: string } {
  if (doc.period === 'year') return { startDate: '', endDate: '' };
  return { startDate: doc.period.start.slice(0, 10), endDate: doc.period.end.slice(0, 10) };
}

function checkDate(dateIso: string, place: string): void {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(dateIso) || Number.isNaN(Date.parse(`${dateIso}T12:00:00Z`))) {
    throw new InputError({ problem: 'not a date', place, value: dateIso, expected: 'a date YYYY-MM-DD' });
  }
}

/**
 * Makes the period whole days from `startDate` 00:00 to the last step of `endDate` (site's UTC
 * offset on each day), keeping the step length.
 */
export function setDateRange(doc: ProjectDoc, startDate: string, endDate: string): ProjectDoc {
  checkDate(startDate, 'first day');
  checkDate(endDate, 'last day');
  if (endDate < startDate) throw new InputError({ problem: 'before the first day', place: 'last day', value: endDate, expected: `a date on or after ${startDate}` });
  const days = (Date.parse(`${endDate}T00:00:00Z`) - Date.parse(`${startDate}T00:00:00Z`)) / 86_400_000;
  if (days > 365) throw new InputError({ problem: 'longer than a year', place: 'last day', value: endDate, expected: 'at most 366 days; use the whole year of a weather file instead' });
  const step = doc.period === 'year' ? 60 : doc.period.stepMinutes ?? 60;
  const off = (d: string) => formatOffset(zoneOffsetMinutes(doc.site.timeZone, Date.parse(`${d}T12:00:00Z`), 'site.timeZone'));
  const lastMin = 24 * 60 - step;
  const hh = String(Math.floor(lastMin / 60)).padStart(2, '0');
  const mm = String(lastMin % 60).padStart(2, '0');
  return { ...doc, period: { start: `${startDate}T00:00:00${off(startDate)}`, end: `${endDate}T${hh}:${mm}:00${off(endDate)}`, stepMinutes: step } };
}

/** The whole year of the weather file (the document must use a weather file). */
export function setWholeYear(doc: ProjectDoc): ProjectDoc {
  if (doc.weather.source !== 'file') throw new InputError({ problem: 'a whole year needs an hourly weather file', place: 'period', expected: 'open an .epw or .csv weather file first' });
  return { ...doc, period: 'year' };
}

/** Weather from a file (path relative to the project file); the period is kept. */
export function setWeatherFile(doc: ProjectDoc, fileName: string): ProjectDoc {
  return { ...doc, weather: { source: 'file', file: fileName } };
}

/** The name of the document's weather file, or null for clear sky. */
export function weatherFileOf(doc: ProjectDoc): string | null {
  return doc.weather.source === 'file' ? doc.weather.file : null;
}

/** Clear-sky weather fields; a file-based weather entry is replaced by clear-sky values. */
export function setClearSkyWeather(doc: ProjectDoc, patch: { minC?: number; maxC?: number; relativeHumidityPct?: number; windMs?: number }): ProjectDoc {
  const w: ClearSkyWeatherDoc = doc.weather.source === 'clear-sky' ? { ...doc.weather } : { source: 'clear-sky', airTempC: { min: 18, max: 28 } };
  const cur = typeof w.airTempC === 'object' && !Array.isArray(w.airTempC) ? w.airTempC : { min: clearSkyMin(w), max: clearSkyMax(w) };
  if (patch.minC !== undefined || patch.maxC !== undefined) w.airTempC = { min: patch.minC ?? cur.min, max: patch.maxC ?? cur.max };
  if (patch.relativeHumidityPct !== undefined) w.relativeHumidityPct = patch.relativeHumidityPct;
  if (patch.windMs !== undefined) w.windMs = patch.windMs;
  let out: ProjectDoc = { ...doc, weather: w };
  if (doc.period === 'year') out = setDesignDay(out, `${new Date().getUTCFullYear()}-07-21`);
  return out;
}

function clearSkyMin(w: ClearSkyWeatherDoc): number {
  const t = w.airTempC;
  return typeof t === 'number' ? t : Array.isArray(t) ? Math.min(...t) : t.min;
}
function clearSkyMax(w: ClearSkyWeatherDoc): number {
  const t = w.airTempC;
  return typeof t === 'number' ? t : Array.isArray(t) ? Math.max(...t) : t.max;
}

/** Min/max air temperature [°C] of a clear-sky document (NaN for a weather file). */
export function airTempRangeOf(doc: ProjectDoc): { minC: number; maxC: number } {
  if (doc.weather.source !== 'clear-sky') return { minC: NaN, maxC: NaN };
  return { minC: clearSkyMin(doc.weather), maxC: clearSkyMax(doc.weather) };
}

/** The azimuth the model's +y axis points to [deg] (0 when unset). */
export function northDegOf(doc: ProjectDoc): number {
  return doc.site.northDeg ?? 0;
}
