/** Model placement and site: up axis, units, latitude, longitude, time zone, north. */
import { useId, useState, useEffect } from 'react';
import { useViewer } from '../state/store.ts';
import { setModel, setSite } from '../state/projectDoc.ts';
import { NumberField } from './NumberField.tsx';
import { reimportModel } from '../compute/session.ts';
import { heavy } from '../state/heavy.ts';
import { zoneOffsetMinutes } from '../../physics/time.ts';

const UNIT_CHOICES: { label: string; perMeter: number }[] = [
  { label: 'metres', perMeter: 1 },
  { label: 'centimetres', perMeter: 100 },
  { label: 'millimetres', perMeter: 1000 },
  { label: 'feet', perMeter: 1 / 0.3048 },
  { label: 'inches', perMeter: 1 / 0.0254 },
];

function TimeZoneField({ value, onCommit }: { value: string; onCommit: (v: string) => void }) {
  const id = useId();
  const [text, setText] = useState(value);
  const [bad, setBad] = useState('');
  useEffect(() => setText(value), [value]);
  const commit = () => {
    try {
      zoneOffsetMinutes(text.trim(), Date.now(), 'time zone');
      setBad('');
      if (text.trim() !== value) onCommit(text.trim());
    } catch (e) {
      setBad(e instanceof Error ? e.message : String(e));
    }
  };
  return (
    <div className="field">
      <label htmlFor={id}>Time zone</label>
      <input id={id} value={text} aria-invalid={bad !== ''} onChange={(e) => setText(e.target.value)} onBlur={commit} onKeyDown={(e) => e.key === 'Enter' && commit()} placeholder="+02:00 or Europe/Berlin" />
      {bad && <span className="field-error" role="alert">{bad}</span>}
    </div>
  );
}

export function SitePanel() {
  const doc = useViewer((s) => s.doc);
  const setDoc = useViewer((s) => s.setDoc);
  const fileName = useViewer((s) => s.modelFileName);
  useViewer((s) => s.modelVersion);
  if (!doc) return null;
  const m = heavy.model;
  const upId = 'up-axis';
  const unitsId = 'model-units';
  const perMeter = doc.model.unitsPerMeter ?? 1;
  const unitChoice = UNIT_CHOICES.find((u) => Math.abs(u.perMeter - perMeter) / u.perMeter < 1e-6);
  return (
    <>
      <section className="panel" aria-labelledby="h-model">
        <h2 id="h-model">Model</h2>
        <p className="muted small">
          {fileName || 'no model'}
          {m ? ` · ${m.indices.length / 3} triangles · ${m.surfaceNames.length} surfaces · ${(m.bounds[3] - m.bounds[0]).toFixed(1)} × ${(m.bounds[4] - m.bounds[1]).toFixed(1)} × ${(m.bounds[5] - m.bounds[2]).toFixed(1)} m` : ''}
        </p>
        <div className="row">
          <div className="field">
            <label htmlFor={upId}>Up axis</label>
            <select id={upId} value={doc.model.upAxis ?? (/\.obj$/i.test(doc.model.file) ? 'z' : 'y')} onChange={(e) => void reimportModel(setModel(doc, { upAxis: e.target.value as 'y' | 'z' }))}>
              <option value="y">y up (glTF)</option>
              <option value="z">z up</option>
            </select>
          </div>
          <div className="field">
            <label htmlFor={unitsId}>Model units</label>
            <select id={unitsId} value={unitChoice ? String(unitChoice.perMeter) : 'custom'} onChange={(e) => void reimportModel(setModel(doc, { unitsPerMeter: Number(e.target.value) }))}>
              {UNIT_CHOICES.map((u) => (
                <option key={u.label} value={String(u.perMeter)}>{u.label}</option>
              ))}
              {!unitChoice && <option value="custom">{perMeter} per metre</option>}
            </select>
          </div>
        </div>
      </section>
      <section className="panel" aria-labelledby="h-site">
        <h2 id="h-site">Site</h2>
        <div className="row">
          <NumberField label="Latitude" unit="° N" value={doc.site.latitudeDeg} min={-90} max={90} digits={4} testId="latitude" onCommit={(v) => setDoc(setSite(doc, { latitudeDeg: v }))} />
          <NumberField label="Longitude" unit="° E" value={doc.site.longitudeDeg} min={-180} max={180} digits={4} testId="longitude" onCommit={(v) => setDoc(setSite(doc, { longitudeDeg: v }))} />
        </div>
        <div className="row">
          <TimeZoneField value={doc.site.timeZone} onCommit={(v) => setDoc(setSite(doc, { timeZone: v }))} />
          <NumberField label="North (model +y points to)" unit="°" value={doc.site.northDeg ?? 0} min={-360} max={360} digits={1} testId="north" onCommit={(v) => setDoc(setSite(doc, { northDeg: v }))} />
        </div>
      </section>
    </>
  );
}
