/** What the colours show: layer for surfaces and for zones, scales, range, legends, and the picked item. */
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { SENSOR_LAYERS, SURFACE_LAYERS, sensorLayerRange, sensorValues, stepRange, surfaceLayerRange, surfaceValues, type SensorLayerId, type SurfaceLayerId } from '../colour/layers.ts';
import { SCALE_IDS, type ScaleId } from '../colour/scales.ts';
import { fromSI, toSI, unitLabel } from '../colour/units.ts';
import { UTCI_CATEGORIES, type UtciCategoryId } from '../../physics/utci.ts';
import { Legend } from './Legend.tsx';
import { effectiveRange, sensorRangeKey } from './ranges.ts';
import { NumberField } from './NumberField.tsx';
import { Inspector } from './Inspector.tsx';
import { DesignCompare, GlareLegend } from './DesignCompare.tsx';
import type { ZoneExtra } from '../state/store.ts';

export function ResultsPanel() {
  const resultsVersion = useViewer((s) => s.resultsVersion);
  const viewMode = useViewer((s) => s.viewMode);
  const surfaceLayer = useViewer((s) => s.surfaceLayer);
  const sensorLayer = useViewer((s) => s.sensorLayer);
  const category = useViewer((s) => s.category);
  const scale = useViewer((s) => s.scale);
  const sensorScale = useViewer((s) => s.sensorScale);
  const rangeMode = useViewer((s) => s.rangeMode);
  const fixedRanges = useViewer((s) => s.fixedRanges);
  const units = useViewer((s) => s.units);
  const set = useViewer((s) => s.set);
  const zoneExtra = useViewer((s) => s.zoneExtra);
  const pairVersion = useViewer((s) => s.pairVersion);
  // Only the step's own range needs a re-render per step.
  const stepIndex = useViewer((s) => (s.rangeMode === 'step' ? s.timeIndex : -1));
  const r = heavy.results;
  if (resultsVersion === 0 || !r) {
    return (
      <section className="panel" aria-labelledby="h-results">
        <h2 id="h-results">Results</h2>
        <p className="small muted">Run the audit to colour the surfaces and zones.</p>
      </section>
    );
  }
  const sInfo = SURFACE_LAYERS.find((l) => l.id === surfaceLayer);
  const zInfo = SENSOR_LAYERS.find((l) => l.id === sensorLayer);
  const sAuto = surfaceLayer !== 'none' ? surfaceLayerRange(r, surfaceLayer) : null;
  const zAuto = sensorLayer !== 'none' ? sensorLayerRange(r, sensorLayer, category) : null;
  const sKey = surfaceLayer;
  const zKey = sensorLayer !== 'none' ? sensorRangeKey(sensorLayer, category) : 'none';
  const sStep = stepIndex >= 0 && surfaceLayer !== 'none' ? stepRange(surfaceValues(r, surfaceLayer, stepIndex)) : null;
  const zStep = stepIndex >= 0 && sensorLayer !== 'none' && sensorLayer !== 'categoryHours' ? stepRange(sensorValues(r, sensorLayer, stepIndex, category)) : null;
  const sRange = effectiveRange(rangeMode, fixedRanges[sKey], sAuto, sStep);
  const zRange = effectiveRange(rangeMode, fixedRanges[zKey], zAuto, zStep);
  const zMode = rangeMode === 'step' && !zStep ? 'auto' : rangeMode;
  const catLabel = UTCI_CATEGORIES.find((c) => c.id === category)?.label ?? category;
  const setFixed = (key: string, q: import('../colour/units.ts').Quantity, cur: { min: number; max: number }, which: 'min' | 'max', shown: number) => {
    const v = toSI(q, shown, units);
    set({ rangeMode: 'fixed', fixedRanges: { ...fixedRanges, [key]: { ...cur, [which]: v } } });
  };
  return (
    <>
    <section className="panel" aria-labelledby="h-results">
      <h2 id="h-results">Results</h2>
      <div className="row">
        <button type="button" aria-pressed={viewMode === 'results'} onClick={() => set({ viewMode: viewMode === 'results' ? 'model' : 'results' })}>
          {viewMode === 'results' ? 'Showing results' : 'Show results'}
        </button>
      </div>
      <div className="field">
        <label htmlFor="surface-layer">Surfaces show</label>
        <select id="surface-layer" value={surfaceLayer} onChange={(e) => set({ surfaceLayer: e.target.value as SurfaceLayerId | 'none', viewMode: 'results' })}>
          <option value="none">plain model</option>
          {SURFACE_LAYERS.map((l) => (
            <option key={l.id} value={l.id}>{l.label}</option>
          ))}
        </select>
      </div>
      <div className="field">
        <label htmlFor="sensor-layer">Zones show</label>
        <select
          id="sensor-layer"
          value={zoneExtra !== 'none' ? zoneExtra : sensorLayer}
          onChange={(e) => {
            const v = e.target.value;
            if (v === 'mrtChange' || v === 'glareHours') set({ zoneExtra: v as ZoneExtra, viewMode: 'results', ...(v === 'glareHours' ? { showPaths: true } : {}) });
            else set({ sensorLayer: v as SensorLayerId | 'none', zoneExtra: 'none', viewMode: 'results' });
          }}
        >
          <option value="none">nothing</option>
          {SENSOR_LAYERS.map((l) => (
            <option key={l.id} value={l.id}>{l.label}</option>
          ))}
          {r.glare && <option value="glareHours">Glare hours (after-image or worse)</option>}
          {pairVersion > 0 && <option value="mrtChange">MRT difference between designs</option>}
        </select>
      </div>
      {sensorLayer === 'categoryHours' && zoneExtra === 'none' && (
        <div className="field">
          <label htmlFor="utci-category">UTCI category</label>
          <select id="utci-category" value={category} onChange={(e) => set({ category: e.target.value as UtciCategoryId })}>
            {UTCI_CATEGORIES.map((c) => (
              <option key={c.id} value={c.id}>{c.label} ({Number.isFinite(c.lowerC) ? c.lowerC : '−∞'} to {Number.isFinite(c.upperC) ? c.upperC : '+∞'} °C)</option>
            ))}
          </select>
        </div>
      )}
      <div className="row">
        <div className="field">
          <label htmlFor="scale-surfaces">Surface colours</label>
          <select id="scale-surfaces" value={scale} onChange={(e) => set({ scale: e.target.value as ScaleId })}>
            {SCALE_IDS.map((s) => <option key={s} value={s}>{s}</option>)}
          </select>
        </div>
        <div className="field">
          <label htmlFor="scale-zones">Zone colours</label>
          <select id="scale-zones" value={sensorScale} onChange={(e) => set({ sensorScale: e.target.value as ScaleId })}>
            {SCALE_IDS.map((s) => <option key={s} value={s}>{s}</option>)}
          </select>
        </div>
      </div>
      <div className="segmented" role="group" aria-label="Colour range">
        <button type="button" aria-pressed={rangeMode === 'auto'} onClick={() => set({ rangeMode: 'auto' })} title="One range over the whole period, so colours compare across time">Whole period</button>
        <button type="button" aria-pressed={rangeMode === 'step'} onClick={() => set({ rangeMode: 'step' })} title="The range of the values at the time shown: more contrast, but colours do not compare across time">This time step</button>
        <button type="button" aria-pressed={rangeMode === 'fixed'} onClick={() => set({ rangeMode: 'fixed', fixedRanges: { ...fixedRanges, ...(fixedRanges[sKey] || !sAuto ? {} : { [sKey]: sAuto }), ...(fixedRanges[zKey] || !zAuto ? {} : { [zKey]: zAuto }) } })}>Fixed</button>
      </div>
      {viewMode === 'results' && sInfo && (
        <>
          <Legend title={`Surfaces: ${sInfo.label.toLowerCase()}`} quantity={sInfo.quantity} range={sRange} scale={scale} units={units} rangeMode={rangeMode} testId="legend-surfaces" />
          {rangeMode === 'fixed' && (
            <div className="row">
              <NumberField label="from" unit={unitLabel(sInfo.quantity, units)} value={fromSI(sInfo.quantity, sRange.min, units)} digits={1} onCommit={(v) => setFixed(sKey, sInfo.quantity, sRange, 'min', v)} />
              <NumberField label="to" unit={unitLabel(sInfo.quantity, units)} value={fromSI(sInfo.quantity, sRange.max, units)} digits={1} onCommit={(v) => setFixed(sKey, sInfo.quantity, sRange, 'max', v)} />
            </div>
          )}
        </>
      )}
      {viewMode === 'results' && zInfo && zoneExtra === 'none' && (
        <>
          <Legend title={zInfo.id === 'categoryHours' ? `Zones: hours of ${catLabel}` : `Zones: ${zInfo.label}`} quantity={zInfo.quantity} range={zRange} scale={sensorScale} units={units} rangeMode={zMode} testId="legend-zones" />
          {rangeMode === 'fixed' && (
            <div className="row">
              <NumberField label="from" unit={unitLabel(zInfo.quantity, units)} value={fromSI(zInfo.quantity, zRange.min, units)} digits={1} onCommit={(v) => setFixed(zKey, zInfo.quantity, zRange, 'min', v)} />
              <NumberField label="to" unit={unitLabel(zInfo.quantity, units)} value={fromSI(zInfo.quantity, zRange.max, units)} digits={1} onCommit={(v) => setFixed(zKey, zInfo.quantity, zRange, 'max', v)} />
            </div>
          )}
        </>
      )}
      {viewMode === 'results' && <GlareLegend />}
      <Inspector />
    </section>
    <DesignCompare />
    </>
  );
}
