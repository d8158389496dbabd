/** Values of the picked sensor or surface patch at the current step, and its day as a chart. */
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { formatQuantity, fromSI, unitLabel } from '../colour/units.ts';
import { stepHoursOf } from '../colour/layers.ts';
import { NO_CODE, UTCI_CATEGORY_IDS, patchSeries, sensorSeries } from '../compute/resultColumns.ts';
import { UTCI_CATEGORIES } from '../../physics/utci.ts';
import { MATERIAL_PRESETS } from '../../physics/materials.ts';
import { DayChart } from './DayChart.tsx';
import { daySplit } from './timeSteps.ts';

export function Inspector() {
  const picked = useViewer((s) => s.picked);
  const t = useViewer((s) => s.timeIndex);
  const units = useViewer((s) => s.units);
  const category = useViewer((s) => s.category);
  useViewer((s) => s.resultsVersion);
  const r = heavy.results;
  if (!r) return null;
  if (!picked) return <p className="small muted">Click a zone tile or a surface in the view to see its values through the day.</p>;
  const T = (v: number | undefined) => formatQuantity('temperature', v ?? NaN, units);
  // The chart shows the day of the step shown (a period of many days would be unreadable).
  const split = daySplit(r.times);
  const d0 = Math.floor(t / split.perDay) * split.perDay;
  const d1 = Math.min(r.times.length, d0 + split.perDay);
  const times = r.times.slice(d0, d1);
  const cur = t - d0;
  const tempSeries = (vals: ArrayLike<number>) => Array.from(vals).slice(d0, d1).map((v) => fromSI('temperature', v, units));
  const categoryLabel = UTCI_CATEGORIES.find((c) => c.id === category)?.label ?? category;
  const stepH = stepHoursOf(r);
  const steps = r.steps;
  const code = UTCI_CATEGORY_IDS.indexOf(category);
  const hoursIn = (codes: Uint8Array, sensor: number) => {
    let n = 0;
    for (let i = sensor * steps, e = i + steps; i < e; i++) if (codes[i] === code) n++;
    return Number((n * stepH).toFixed(1));
  };
  if (picked.kind === 'sensor') {
    const z = r.zones[picked.zone];
    const i = picked.sensor;
    if (!z || i < 0 || i >= z.sensorCount) return null;
    const at = i * steps + t;
    const c = t < steps ? z.category[at]! : NO_CODE;
    const cat = c !== NO_CODE ? UTCI_CATEGORIES.find((x) => x.id === UTCI_CATEGORY_IDS[c]) : undefined;
    const mrt = sensorSeries(z, 'mrtC', i, steps), utci = sensorSeries(z, 'utciC', i, steps);
    return (
      <div className="inspector" data-testid="inspector">
        <h3>{z.name}, sensor {picked.sensor + 1}</h3>
        <dl>
          <dt>Position</dt>
          <dd>{Array.from(z.positions.subarray(i * 3, i * 3 + 3), (v) => fromSI('length', v, units).toFixed(1)).join(', ')} {unitLabel('length', units)}</dd>
          <dt>Sky view factor</dt>
          <dd>{z.skyViewFactor[i]!.toFixed(2)}</dd>
          <dt>In sun</dt>
          <dd>{z.sunlit[at] ? 'yes' : 'no'}</dd>
          <dt>Air temperature</dt>
          <dd>{T(r.weather.airTempC[t])}</dd>
          <dt>MRT</dt>
          <dd data-testid="inspector-mrt">{T(mrt[t])}</dd>
          <dt>UTCI</dt>
          <dd data-testid="inspector-utci">{T(utci[t])}{cat ? ` · ${cat.label}` : ''}</dd>
          <dt>Hours in “{categoryLabel}”</dt>
          <dd data-testid="inspector-hours">{hoursIn(z.category, i)} h over the period</dd>
        </dl>
        <DayChart
          title="MRT, UTCI and air temperature"
          unit={unitLabel('temperature', units)}
          times={times}
          current={cur}
          series={[
            { label: 'MRT', values: tempSeries(mrt), colour: '#b5361d' },
            { label: 'UTCI', values: tempSeries(utci), colour: '#1f5fa8' },
            { label: 'air', values: tempSeries(r.weather.airTempC), colour: '#6b6b6b' },
          ]}
        />
      </div>
    );
  }
  const S = r.surfaces;
  const pi = picked.patch;
  if (pi < 0 || pi >= S.count) return null;
  const sw = patchSeries(S, 'shortwave', pi, steps), st = patchSeries(S, 'surfaceTemp', pi, steps), lw = patchSeries(S, 'longwave', pi, steps);
  const p = { id: S.ids[pi]!, material: S.material[pi]!, areaM2: S.areaM2[pi]! };
  const irr = (vals: ArrayLike<number>) => Array.from(vals).slice(d0, d1).map((v) => fromSI('irradiance', v, units));
  return (
    <div className="inspector" data-testid="inspector">
      <h3>{p.id}</h3>
      <dl>
        <dt>Material</dt>
        <dd>{MATERIAL_PRESETS[p.material]?.name ?? p.material}</dd>
        <dt>Area</dt>
        <dd>{p.areaM2.toFixed(2)} m²</dd>
        <dt>Incident shortwave</dt>
        <dd>{formatQuantity('irradiance', sw[t] ?? NaN, units)}</dd>
        <dt>Surface temperature</dt>
        <dd>{T(st[t])}</dd>
        <dt>Longwave emission</dt>
        <dd>{formatQuantity('irradiance', lw[t] ?? NaN, units)}</dd>
      </dl>
      <DayChart
        title="Surface and air temperature"
        unit={unitLabel('temperature', units)}
        times={times}
        current={cur}
        series={[
          { label: 'surface', values: tempSeries(st), colour: '#b5361d' },
          { label: 'air', values: tempSeries(r.weather.airTempC), colour: '#6b6b6b' },
        ]}
      />
      <DayChart title="Incident shortwave" unit={unitLabel('irradiance', units)} times={times} current={cur} series={[{ label: 'shortwave', values: irr(sw), colour: '#c98a00' }]} />
    </div>
  );
}
