/** Values of the picked sensor or surface patch at the current step, and its day as a chart. */
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { formatQuantity, fromSI, unitLabel } from '../colour/units.ts';
import { stepHoursOf } from '../colour/layers.ts';
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
  const tempSeries = (vals: readonly number[]) => vals.slice(d0, d1).map((v) => fromSI('temperature', v, units));
  const categoryLabel = UTCI_CATEGORIES.find((c) => c.id === category)?.label ?? category;
  const stepH = stepHoursOf(r);
  const hoursIn = (cats: readonly string[]) => {
    let n = 0;
    for (const c of cats) if (c === category) n++;
    return Number((n * stepH).toFixed(1));
  };
  if (picked.kind === 'sensor') {
    const z = r.zones[picked.zone];
    const s = z?.sensors[picked.sensor];
    if (!z || !s) return null;
    const cat = UTCI_CATEGORIES.find((c) => c.id === s.category[t]);
    return (
      <div className="inspector" data-testid="inspector">
        <h3>{z.name}, sensor {picked.sensor + 1}</h3>
        <dl>
          <dt>Position</dt>
          <dd>{s.position.map((v) => fromSI('length', v, units).toFixed(1)).join(', ')} {unitLabel('length', units)}</dd>
          <dt>Sky view factor</dt>
          <dd>{s.skyViewFactor.toFixed(2)}</dd>
          <dt>In sun</dt>
          <dd>{s.sunlit[t] ? 'yes' : 'no'}</dd>
          <dt>Air temperature</dt>
          <dd>{T(r.weather.airTempC[t])}</dd>
          <dt>MRT</dt>
          <dd data-testid="inspector-mrt">{T(s.mrtC[t])}</dd>
          <dt>UTCI</dt>
          <dd data-testid="inspector-utci">{T(s.utciC[t])}{cat ? ` · ${cat.label}` : ''}</dd>
          <dt>Hours in “{categoryLabel}”</dt>
          <dd data-testid="inspector-hours">{hoursIn(s.category)} h over the period</dd>
        </dl>
        <DayChart
          title="MRT, UTCI and air temperature"
          unit={unitLabel('temperature', units)}
          times={times}
          current={cur}
          series={[
            { label: 'MRT', values: tempSeries(s.mrtC), colour: '#b5361d' },
            { label: 'UTCI', values: tempSeries(s.utciC), colour: '#1f5fa8' },
            { label: 'air', values: tempSeries(r.weather.airTempC), colour: '#6b6b6b' },
          ]}
        />
      </div>
    );
  }
  const p = r.surfaces[picked.patch];
  if (!p) return null;
  const irr = (vals: readonly number[]) => vals.slice(d0, d1).map((v) => fromSI('irradiance', v, units));
  return (
    <div className="inspector" data-testid="inspector">
      <h3>{p.id}</h3>
      <dl>
        <dt>Material</dt>
        <dd>{MATERIAL_PRESETS[p.material]?.name ?? p.material}</dd>
        <dt>Area</dt>
        <dd>{p.areaM2.toFixed(2)} m²</dd>
        <dt>Incident shortwave</dt>
        <dd>{formatQuantity('irradiance', p.incidentShortwaveWm2[t] ?? NaN, units)}</dd>
        <dt>Surface temperature</dt>
        <dd>{T(p.surfaceTempC[t])}</dd>
        <dt>Longwave emission</dt>
        <dd>{formatQuantity('irradiance', p.longwaveEmissionWm2[t] ?? NaN, units)}</dd>
      </dl>
      <DayChart
        title="Surface and air temperature"
        unit={unitLabel('temperature', units)}
        times={times}
        current={cur}
        series={[
          { label: 'surface', values: tempSeries(p.surfaceTempC), colour: '#b5361d' },
          { label: 'air', values: tempSeries(r.weather.airTempC), colour: '#6b6b6b' },
        ]}
      />
      <DayChart title="Incident shortwave" unit={unitLabel('irradiance', units)} times={times} current={cur} series={[{ label: 'shortwave', values: irr(p.incidentShortwaveWm2), colour: '#c98a00' }]} />
    </div>
  );
}
