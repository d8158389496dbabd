/** Designs: the baseline and its options; run them all; add and edit the devices of the chosen design. */
import { useState } from 'react';
import { useViewer } from '../state/store.ts';
import { addOption, baselineName, deviceNumbers, designNames, MAIN_SIZES, moveDevice, ownDevices, setDeviceNumber, setOwnDevices, WALL_TYPES, DEVICE_TYPES, type OptionDoc } from '../state/designDoc.ts';
import { showDesign, startDesignsRun } from '../compute/session.ts';
import { checkDoc } from '../state/projectDoc.ts';
import { NumberField } from './NumberField.tsx';
import { buildDeviceView } from '../compute/deviceView.ts';
import type { DeviceType } from '../../geometry/devices.ts';

const TYPE_LABEL: Record<DeviceType, string> = {
  tree: 'tree', umbrella: 'umbrella', canopy: 'canopy (flat roof on posts)', overhang: 'overhang on a wall', fins: 'vertical fins on a wall', slats: 'slatted screen on a wall',
};

function DeviceEditor({ design }: { design: string }) {
  const doc = useViewer((s) => s.doc)!;
  const selected = useViewer((s) => s.selectedDevice);
  const setDoc = useViewer((s) => s.setDoc);
  const set = useViewer((s) => s.set);
  const own = ownDevices(doc, design);
  const dev = selected !== null ? own[selected] : undefined;
  if (!dev) return null;
  const write = (next: typeof dev) => setDoc(setOwnDevices(doc, design, own.map((d, i) => (i === selected ? next : d))));
  const check = buildDeviceView([dev], doc.site.latitudeDeg, `${design}: ${dev.name ?? dev.type}`);
  const step = 0.5;
  return (
    <fieldset className="zone" data-testid="device-editor">
      <legend>{dev.name ?? dev.type} <span className="muted small">({dev.type})</span></legend>
      <div className="row" role="group" aria-label="Move the device">
        <span className="small muted">Move {step} m:</span>
        <button type="button" onClick={() => write(moveDevice(dev, -step, 0))} aria-label="Move west">W</button>
        <button type="button" onClick={() => write(moveDevice(dev, step, 0))} aria-label="Move east">E</button>
        <button type="button" onClick={() => write(moveDevice(dev, 0, step))} aria-label="Move north">N</button>
        <button type="button" onClick={() => write(moveDevice(dev, 0, -step))} aria-label="Move south">S</button>
      </div>
      <div className="row">
        {deviceNumbers(dev).map((f) => (
          <NumberField key={f.path.join('.')} label={f.label} unit={/Deg$/.test(String(f.path[0])) ? '°' : f.path[0] === 'outwardNormal' || /transmittance/i.test(String(f.path[0])) || f.path[0] === 'segments' ? '' : 'm'} value={f.value} onCommit={(v) => write(setDeviceNumber(dev, f.path, v))} />
        ))}
      </div>
      {!check.ok && <p className="field-error" role="alert">{check.message}</p>}
      <div className="row">
        <button type="button" onClick={() => { setDoc(setOwnDevices(doc, design, own.filter((_, i) => i !== selected))); set({ selectedDevice: null }); }}>Remove device</button>
        <button type="button" onClick={() => set({ selectedDevice: null })}>Done</button>
      </div>
    </fieldset>
  );
}

function AddDevice({ design }: { design: string }) {
  const tool = useViewer((s) => s.tool);
  const set = useViewer((s) => s.set);
  const [type, setType] = useState<DeviceType>('tree');
  const [sizes, setSizes] = useState<Record<string, number>>({});
  const placing = tool === 'placeDevice';
  return (
    <div className="add-device">
      <div className="field">
        <label htmlFor="device-type">Add to “{design}”</label>
        <select id="device-type" value={type} onChange={(e) => setType(e.target.value as DeviceType)}>
          {DEVICE_TYPES.map((t) => <option key={t} value={t}>{TYPE_LABEL[t]}</option>)}
        </select>
      </div>
      <div className="row">
        {MAIN_SIZES[type].map((f) => (
          <NumberField key={`${type}.${f.key}`} label={f.label} unit="m" min={0.01} value={sizes[`${type}.${f.key}`] ?? f.def} onCommit={(v) => setSizes({ ...sizes, [`${type}.${f.key}`]: v })} />
        ))}
      </div>
      <button
        type="button"
        aria-pressed={placing}
        onClick={() => {
          const own: Record<string, number> = {};
          for (const f of MAIN_SIZES[type]) own[f.key] = sizes[`${type}.${f.key}`] ?? f.def;
          set(placing ? { tool: 'look', placeDevice: null } : { tool: 'placeDevice', placeDevice: { type, sizes: own }, viewMode: 'model' });
        }}
      >
        {placing ? 'Cancel placing' : WALL_TYPES.includes(type) ? 'Place: click a wall' : 'Place: click the ground or a floor'}
      </button>
    </div>
  );
}

export function DesignsPanel() {
  const doc = useViewer((s) => s.doc);
  const active = useViewer((s) => s.activeDesign);
  const designsVersion = useViewer((s) => s.designsVersion);
  const run = useViewer((s) => s.run);
  const selected = useViewer((s) => s.selectedDevice);
  const set = useViewer((s) => s.set);
  const setDoc = useViewer((s) => s.setDoc);
  const comparing = useViewer((s) => s.zoneExtra === 'mrtChange' && s.pairVersion > 0);
  const compareOption = useViewer((s) => s.compareOption);
  const compareReference = useViewer((s) => s.compareReference);
  if (!doc) return null;
  const names = designNames(doc);
  const base = baselineName(doc);
  const current = names.includes(active) ? active : base;
  const options = ((doc as { options?: OptionDoc[] }).options ?? []);
  const notes = options.find((o) => o.name === current)?.notes;
  const own = ownDevices(doc, current);
  const running = run.status === 'running' && run.kind === 'designs';
  const ok = checkDoc(doc).ok;
  return (
    <section className="panel" aria-labelledby="h-designs">
      <h2 id="h-designs">Designs</h2>
      <ul className="designs" role="radiogroup" aria-label="Design shown">
        {names.map((n) => (
          <li key={n}>
            <label>
              <input type="radio" name="design" checked={n === current} onChange={() => showDesign(n)} /> {n}
              {n === base && <span className="muted small"> (baseline)</span>}
            </label>
          </li>
        ))}
      </ul>
      {notes && <p className="small muted">{notes}</p>}
      {comparing && (
        <p className="small" data-testid="compare-note">
          Difference map: <strong>{compareOption}</strong> − <strong>{compareReference}</strong>. Tiles sit on the sensors of “{compareReference}”; the devices drawn are those of “{compareOption}”.
        </p>
      )}
      <div className="row">
        <button type="button" className="primary" onClick={startDesignsRun} disabled={run.status === 'running' || !ok} data-testid="run-designs">
          Audit all {names.length} designs
        </button>
        <button type="button" onClick={() => { const r = addOption(doc); setDoc(r.doc); showDesign(r.name); }}>Add option</button>
      </div>
      {running && (
        <div className="progress" data-testid="designs-progress">
          <p className="small"><strong>Design {Math.min((run.design ?? 0) + 1, run.designs ?? 1)} of {run.designs}</strong> · {run.stage}</p>
          <progress value={((run.design ?? 0) + (run.total > 0 ? run.done / run.total : 0)) / Math.max(1, run.designs ?? 1)} max={1} aria-label="Progress over all designs" />
        </div>
      )}
      {run.status === 'done' && run.kind === 'designs' && designsVersion > 0 && (
        <p className="small" data-testid="designs-done">All {run.designs} designs run in {run.elapsedS.toFixed(0)} s. Compare them under Results.</p>
      )}
      <h3>Devices of “{current}”</h3>
      {current !== base && (doc as { devices?: unknown[] }).devices?.length ? <p className="small muted">Plus the baseline's {(doc as { devices?: unknown[] }).devices!.length} device(s).</p> : null}
      {own.length === 0 ? <p className="small muted">None yet.</p> : (
        <ul className="device-list">
          {own.map((d, i) => (
            <li key={`${d.name ?? d.type}-${i}`}>
              <button type="button" aria-pressed={selected === i} onClick={() => set({ selectedDevice: selected === i ? null : i })}>{d.name ?? d.type}</button> <span className="small muted">{d.type}</span>
            </li>
          ))}
        </ul>
      )}
      <DeviceEditor design={current} />
      <AddDevice design={current} />
    </section>
  );
}
