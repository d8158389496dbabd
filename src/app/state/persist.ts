/**
 * Autosave: the project document (and a user-imported model's bytes when small enough) in
 * localStorage, so a reload restores the work. The demo's model is not stored: it is fetched.
 */
import type { ProjectDoc } from './projectDoc.ts';

export const AUTOSAVE_KEY = 'sunfacet.autosave.v1';
/** Largest model stored in localStorage (base64 grows it by a third; storage is about 5 MB). */
export const MAX_STORED_MODEL_BYTES = 2_500_000;

export interface SavedState {
  version: 1;
  doc: ProjectDoc;
  /** Where the model comes from: the demo folder, or bytes kept here. */
  model: { kind: 'demo' } | { kind: 'stored'; fileName: string; base64: string } | { kind: 'missing'; fileName: string };
  /** The hourly weather file, when the project uses one and it is small enough. */
  weather?: { fileName: string; base64: string };
  savedAt: string;
}

export interface KeyValueStore {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

export function bytesToBase64(bytes: Uint8Array): string {
  let s = '';
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) s += String.fromCharCode(...bytes.subarray(i, i + chunk));
  return btoa(s);
}

export function base64ToBytes(b64: string): Uint8Array {
  const s = atob(b64);
  const out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i);
  return out;
}

/** Builds what is saved; a model too big to keep is marked missing (the user re-opens it). */
export function makeSavedState(
  doc: ProjectDoc,
  model: { demo: true } | { demo: false; fileName: string; bytes: Uint8Array | null },
  now = new Date(),
  weather: { name: string; bytes: Uint8Array } | null = null,
): SavedState {
  let m: SavedState['model'];
  if (model.demo) m = { kind: 'demo' };
  else if (model.bytes && model.bytes.byteLength <= MAX_STORED_MODEL_BYTES) m = { kind: 'stored', fileName: model.fileName, base64: bytesToBase64(model.bytes) };
  else m = { kind: 'missing', fileName: model.fileName };
  const modelBytes = m.kind === 'stored' ? m.base64.length : 0;
  const w = weather && (weather.bytes.byteLength * 4) / 3 + modelBytes <= (MAX_STORED_MODEL_BYTES * 4) / 3 ? { fileName: weather.name, base64: bytesToBase64(weather.bytes) } : undefined;
  return { version: 1, doc, model: m, ...(w ? { weather: w } : {}), savedAt: now.toISOString() };
}

export function writeAutosave(store: KeyValueStore, state: SavedState): boolean {
  try {
    store.setItem(AUTOSAVE_KEY, JSON.stringify(state));
    return true;
  } catch {
    // Quota exceeded: keep the document at least.
    try {
      const { weather: _dropped, ...rest } = state;
      void _dropped;
      store.setItem(AUTOSAVE_KEY, JSON.stringify({ ...rest, model: state.model.kind === 'stored' ? { kind: 'missing', fileName: state.model.fileName } : state.model }));
      return true;
    } catch {
      return false;
    }
  }
}

/** The saved state, or null if none or unreadable (an unreadable entry is removed). */
export function readAutosave(store: KeyValueStore): SavedState | null {
  const text = store.getItem(AUTOSAVE_KEY);
  if (text === null) return null;
  try {
    const s = JSON.parse(text) as SavedState;
    if (s.version !== 1 || typeof s.doc !== 'object' || s.doc === null || typeof s.model !== 'object') throw new Error('bad');
    return s;
  } catch {
    store.removeItem(AUTOSAVE_KEY);
    return null;
  }
}
