/** Zones: draw a polygon on a floor or roof in the view, then set sensor height, spacing and posture. */
import { useViewer } from '../state/store.ts';
import { addZone, moveZoneCorner, nextZoneName, removeZone, removeZoneCorner, updateZone, type Posture } from '../state/projectDoc.ts';
import { heavy } from '../state/heavy.ts';
import { NumberField } from './NumberField.tsx';
import { fromSI, toSI, unitLabel } from '../colour/units.ts';

/** Turns the drawn corners into a zone (at least three), floor at their mean height. */
export function finishDraftZone(): void {
  const s = useViewer.getState();
  if (!s.doc || s.draftZone.length < 3) return;
  const floorZ = Math.round((s.draftZone.reduce((a, p) => a + p[2], 0) / s.draftZone.length) * 100) / 100;
  const doc = addZone(s.doc, {
    name: nextZoneName(s.doc),
    polygon: s.draftZone.map(([x, y]) => [x, y]),
    floorZ,
    sensorHeightM: 1.1,
    spacingM: 1,
    posture: 'standing',
  });
  s.set({ draftZone: [], tool: 'look' });
  s.setDoc(doc);
}

export function ZonesPanel() {
  const doc = useViewer((s) => s.doc);
  const tool = useViewer((s) => s.tool);
  const draft = useViewer((s) => s.draftZone);
  const units = useViewer((s) => s.units);
  const set = useViewer((s) => s.set);
  const setDoc = useViewer((s) => s.setDoc);
  const editCorner = useViewer((s) => (s.tool === 'editZone' ? s.editCorner : null));
  useViewer((s) => s.modelVersion);
  if (!doc) return null;
  const surfaceNames = heavy.model?.surfaceNames ?? [];
  const addMeshZone = (mesh: string) => {
    const d = addZone(doc, { name: nextZoneName(doc, mesh), mesh, sensorHeightM: 1.1, spacingM: 1, posture: 'standing' });
    setDoc(d);
  };
  const zones = doc.zones ?? [];
  const L = unitLabel('length', units);
  const len = (v: number) => fromSI('length', v, units);
  const back = (v: number) => toSI('length', v, units);
  return (
    <section className="panel" aria-labelledby="h-zones">
      <h2 id="h-zones">Zones</h2>
      {tool === 'drawZone' ? (
        <div className="drawing" role="status">
          <p className="small">Click the corners on a floor or roof ({draft.length} so far). Enter or “Finish” closes the outline; Backspace removes the last corner; Esc cancels.</p>
          <div className="row">
            <button type="button" onClick={finishDraftZone} disabled={draft.length < 3}>Finish zone</button>
            <button type="button" onClick={() => set({ tool: 'look', draftZone: [] })}>Cancel</button>
          </div>
        </div>
      ) : (
        <button type="button" onClick={() => set({ tool: 'drawZone', draftZone: [], viewMode: useViewer.getState().viewMode === 'results' ? 'results' : 'model' })}>
          Draw a zone
        </button>
      )}
      <div className="field">
        <label htmlFor="zone-on-surface">Or make a zone on a surface (sensors over its upward faces)</label>
        <select id="zone-on-surface" value="" onChange={(e) => e.target.value && addMeshZone(e.target.value)}>
          <option value="">— choose a surface —</option>
          {surfaceNames.map((n) => (
            <option key={n} value={n}>{n}</option>
          ))}
        </select>
      </div>
      {zones.length === 0 && <p className="small muted">No zones yet: a zone is where people sit or stand; sensors are laid on a grid inside it.</p>}
      {zones.map((z, i) => (
        <fieldset key={`${z.name}-${i}`} className="zone">
          <legend>
            <label className="visually-hidden" htmlFor={`zone-name-${i}`}>Zone name</label>
            <input id={`zone-name-${i}`} value={z.name} onChange={(e) => setDoc(updateZone(doc, i, { name: e.target.value }))} />
          </legend>
          <p className="small muted">
            {z.polygon ? `${z.polygon.length} corners` : `on the surface “${z.mesh}”`}
            {z.polygon && (
              <button
                type="button"
                className="link"
                aria-pressed={editCorner?.zone === i}
                onClick={() => set(editCorner?.zone === i ? { tool: 'look', editCorner: null } : { tool: 'editZone', editCorner: { zone: i, corner: -1 }, draftZone: [] })}
              >
                {editCorner?.zone === i ? 'Done editing' : 'Edit corners'}
              </button>
            )}
          </p>
          {editCorner?.zone === i && z.polygon && (
            <div className="corners" data-testid={`corners-${i}`}>
              <p className="small">Click a corner’s handle in the view, then click where it should go; or type the coordinates (east, north).</p>
              {z.polygon.map(([x, y], c) => (
                <div className={`row corner${editCorner.corner === c ? ' picked' : ''}`} key={c}>
                  <NumberField label={`Corner ${c + 1} east`} unit={L} value={len(x)} digits={2} onCommit={(v) => setDoc(moveZoneCorner(doc, i, c, back(v), y))} />
                  <NumberField label="north" unit={L} value={len(y)} digits={2} onCommit={(v) => setDoc(moveZoneCorner(doc, i, c, x, back(v)))} />
                  <button type="button" className="link" disabled={z.polygon!.length <= 3} onClick={() => setDoc(removeZoneCorner(doc, i, c))} aria-label={`Remove corner ${c + 1}`}>✕</button>
                </div>
              ))}
            </div>
          )}
          <div className="row">
            <NumberField label="Floor level" unit={L} value={len(z.floorZ ?? doc.ground?.z ?? 0)} digits={2} onCommit={(v) => setDoc(updateZone(doc, i, { floorZ: back(v) }))} />
            <div className="field">
              <label htmlFor={`posture-${i}`}>Posture</label>
              <select
                id={`posture-${i}`}
                value={z.posture ?? 'standing'}
                onChange={(e) => {
                  const p = e.target.value as Posture;
                  setDoc(updateZone(doc, i, { posture: p, sensorHeightM: p === 'seated' ? 0.6 : 1.1 }));
                }}
              >
                <option value="standing">standing</option>
                <option value="seated">seated</option>
              </select>
            </div>
          </div>
          <div className="row">
            <NumberField label="Sensor height" unit={L} value={len(z.sensorHeightM ?? (z.posture === 'seated' ? 0.6 : 1.1))} min={len(0.05)} max={len(3)} digits={2} onCommit={(v) => setDoc(updateZone(doc, i, { sensorHeightM: back(v) }))} />
            <NumberField label="Spacing" unit={L} value={len(z.spacingM ?? 1)} min={len(0.1)} max={len(50)} digits={2} onCommit={(v) => setDoc(updateZone(doc, i, { spacingM: back(v) }))} />
          </div>
          <button type="button" className="link" onClick={() => setDoc(removeZone(doc, i))} aria-label={`Remove zone ${z.name}`}>Remove</button>
        </fieldset>
      ))}
    </section>
  );
}
