/** Materials: pick a surface (click or list), choose its preset; the view shows assignments by colour. */
import { useMemo } from 'react';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { assignedPreset, materialEntryOf, setDefaultMaterial, setMaterial, setMaterialOverrides } from '../state/projectDoc.ts';
import { MATERIAL_PRESETS, materialPresetIds } from '../../physics/materials.ts';
import { presetPerSurface, presetsInUse } from '../scene/surfaceTones.ts';
import { categoryColour, rgbCss } from '../colour/scales.ts';
import { MaterialEditor } from './MaterialEditor.tsx';

const PRESET_IDS = materialPresetIds();

/** A preset id the lists know ('custom' entries without a preset fall back to the default). */
function presetIdOf(id: string): string {
  return MATERIAL_PRESETS[id] ? id : 'concrete-light';
}

function presetLabel(id: string): string {
  return MATERIAL_PRESETS[id]?.name ?? id;
}

export function SurfacesPanel() {
  const doc = useViewer((s) => s.doc);
  const modelVersion = useViewer((s) => s.modelVersion);
  const selected = useViewer((s) => s.selectedSurface);
  const viewMode = useViewer((s) => s.viewMode);
  const tool = useViewer((s) => s.tool);
  const set = useViewer((s) => s.set);
  const setDoc = useViewer((s) => s.setDoc);
  const m = heavy.model;
  const per = useMemo(() => (doc && m ? presetPerSurface(doc, m) : []), [doc, m, modelVersion]);
  if (!doc || !m) return null;
  const used = presetsInUse(per);
  const firstMat = (s: number): string => {
    const t = m.surfaceIds.indexOf(s);
    return t >= 0 ? m.materialNames[m.materialIds[t]!] ?? '' : '';
  };
  const sel = selected !== null && selected < m.surfaceNames.length ? selected : null;
  const selName = sel !== null ? m.surfaceNames[sel]! : '';
  const selMat = sel !== null ? firstMat(sel) : '';
  const a = sel !== null ? assignedPreset(doc, selName, selMat) : null;
  const defaultPreset = typeof doc.defaultMaterial === 'string' ? doc.defaultMaterial : 'concrete-light';
  return (
    <section className="panel" aria-labelledby="h-surfaces">
      <h2 id="h-surfaces">Surfaces and materials</h2>
      <div className="row">
        <button type="button" aria-pressed={tool === 'pickSurface'} onClick={() => set({ tool: tool === 'pickSurface' ? 'look' : 'pickSurface', viewMode: viewMode === 'results' ? 'materials' : viewMode })}>
          {tool === 'pickSurface' ? 'Picking… (Esc)' : 'Pick in view'}
        </button>
        <button type="button" aria-pressed={viewMode === 'materials'} onClick={() => set({ viewMode: viewMode === 'materials' ? 'model' : 'materials' })}>
          Colour by material
        </button>
      </div>
      <div className="field">
        <label htmlFor="surface-list">Surface</label>
        <select id="surface-list" value={sel === null ? '' : String(sel)} onChange={(e) => set({ selectedSurface: e.target.value === '' ? null : Number(e.target.value) })}>
          <option value="">— choose a surface —</option>
          {m.surfaceNames.map((n, i) => (
            <option key={n} value={i}>{n}</option>
          ))}
        </select>
      </div>
      {sel !== null && a && (
        <div className="assign">
          <p className="small muted">
            Model material: {selMat || '(none)'} · set {a.key === null ? 'by the default' : a.key === selName ? 'for this surface' : `for material “${a.key}”`}
          </p>
          <div className="field">
            <label htmlFor="preset-surface">Preset for this surface</label>
            <select id="preset-surface" value={a.key === selName ? presetIdOf(a.preset) : ''} onChange={(e) => setDoc(e.target.value === '' ? setMaterial(doc, selName, null) : setMaterialOverrides(doc, selName, e.target.value, materialEntryOf(doc, selName)?.overrides ?? {}))}>
              <option value="">(follow its material)</option>
              {PRESET_IDS.map((id) => (
                <option key={id} value={id}>{presetLabel(id)}</option>
              ))}
            </select>
          </div>
          <MaterialEditor
            doc={doc}
            entryKey={a.key ?? selName}
            fallbackPreset={presetIdOf(a.preset)}
            what={a.key === null || a.key === selName ? 'this surface' : `every “${a.key}” surface`}
          />
          {selMat && (
            <div className="field">
              <label htmlFor="preset-material">Preset for every “{selMat}” surface</label>
              <select id="preset-material" value={materialEntryOf(doc, selMat)?.preset ?? ''} onChange={(e) => setDoc(e.target.value === '' ? setMaterial(doc, selMat, null) : setMaterialOverrides(doc, selMat, e.target.value, materialEntryOf(doc, selMat)?.overrides ?? {}))}>
                <option value="">(use the default)</option>
                {PRESET_IDS.map((id) => (
                  <option key={id} value={id}>{presetLabel(id)}</option>
                ))}
              </select>
            </div>
          )}
        </div>
      )}
      <div className="field">
        <label htmlFor="preset-default">Default for everything else</label>
        <select id="preset-default" value={defaultPreset} onChange={(e) => setDoc(setDefaultMaterial(doc, e.target.value))}>
          {PRESET_IDS.map((id) => (
            <option key={id} value={id}>{presetLabel(id)}</option>
          ))}
        </select>
      </div>
      {viewMode === 'materials' && (
        <ul className="swatches" aria-label="Material colours in the view">
          {used.map((p, i) => (
            <li key={p}>
              <span className="swatch" style={{ background: rgbCss(categoryColour(i)) }} aria-hidden="true" />
              {presetLabel(p)}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
