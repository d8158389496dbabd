/**
 * Properties of one material entry: the preset's values, any of which the user may override
 * (visible and near-infrared reflectance, emissivity); written as `{ preset, ...overrides }`.
 */
import { useViewer } from '../state/store.ts';
import { materialEntryOf, setMaterialOverrides, OVERRIDE_FIELDS, type OverrideField, type ProjectDoc } from '../state/projectDoc.ts';
import { MATERIAL_PRESETS } from '../../physics/materials.ts';
import { NumberField } from './NumberField.tsx';

const FIELD_LABEL: Record<OverrideField, string> = {
  reflectanceVisible: 'Reflectance, visible',
  reflectanceNir: 'Reflectance, near-infrared',
  emissivity: 'Emissivity (longwave)',
};

export function MaterialEditor({ doc, entryKey, fallbackPreset, what }: { doc: ProjectDoc; entryKey: string; fallbackPreset: string; what: string }) {
  const setDoc = useViewer((s) => s.setDoc);
  const set = useViewer((s) => s.set);
  const entry = materialEntryOf(doc, entryKey) ?? { preset: fallbackPreset, overrides: {} };
  const base = MATERIAL_PRESETS[entry.preset];
  if (!base) return null;
  const overridden = Object.keys(entry.overrides).length > 0;
  const write = (f: OverrideField, v: number | undefined) => {
    const next = { ...entry.overrides };
    if (v === undefined || Math.abs(v - base[f]) < 1e-9) delete next[f];
    else next[f] = v;
    try {
      setDoc(setMaterialOverrides(doc, entryKey, entry.preset, next));
    } catch (e) {
      set({ notice: { kind: 'error', text: e instanceof Error ? e.message : String(e) } });
    }
  };
  return (
    <details className="material-editor" open={overridden}>
      <summary>Properties of {what}{overridden ? ' (edited)' : ''}</summary>
      {OVERRIDE_FIELDS.map((f) => (
        <div className="row" key={f}>
          <NumberField
            label={FIELD_LABEL[f]}
            value={entry.overrides[f] ?? base[f]}
            min={0}
            max={1}
            step={0.01}
            digits={2}
            testId={`override-${f}`}
            onCommit={(v) => write(f, v)}
          />
          <span className="small muted override-note">{entry.overrides[f] !== undefined ? `preset ${base[f].toFixed(2)}` : 'from the preset'}</span>
        </div>
      ))}
      {overridden && (
        <button type="button" className="link" onClick={() => setDoc(setMaterialOverrides(doc, entryKey, entry.preset, {}))}>
          Back to the preset’s values
        </button>
      )}
    </details>
  );
}
