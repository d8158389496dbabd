/** Comparing designs: pick an option and a reference, the difference map's legend, and the zones × options table. */
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { comparePair } from '../compute/session.ts';
import { designTable, hasStepDifferences, pathsAtStep } from '../compute/designView.ts';
import { coolWarmGradientCss } from '../colour/diverging.ts';
import { niceTicks } from '../colour/legend.ts';
import { scaleGradientCss } from '../colour/scales.ts';
import { zoneExtraColours } from '../scene/zoneExtra.ts';

const signed = (v: number, d = 1) => (Number.isFinite(v) ? `${v > 0 ? '+' : v < 0 ? '−' : '±'}${Math.abs(v).toFixed(d)}` : '–');

/** The diverging legend: blue "cooler" on the left, red "hotter" on the right, zero in the middle [K]. */
export function DifferenceLegend({ halfRangeK, title, note }: { halfRangeK: number; title: string; note: string }) {
  const ticks = niceTicks(-halfRangeK, halfRangeK, 4);
  return (
    <figure className="legend" data-testid="legend-difference" aria-label={`${title} legend, −${halfRangeK} to +${halfRangeK} K; blue cooler, red hotter`}>
      <figcaption>{title} <span className="unit">[K]</span> <span className="muted small">({note})</span></figcaption>
      <div className="legend-bar" style={{ background: coolWarmGradientCss() }} />
      <div className="legend-ticks" aria-hidden="true">
        {ticks.map((t) => <span key={t} style={{ left: `${((t + halfRangeK) / (2 * halfRangeK)) * 100}%` }}>{signed(t, Number.isInteger(t) ? 0 : 1)}</span>)}
      </div>
      <div className="legend-ends small"><span>◀ cooler</span><span>no change</span><span>hotter ▶</span></div>
    </figure>
  );
}

export function DesignCompare() {
  const designsVersion = useViewer((s) => s.designsVersion);
  const option = useViewer((s) => s.compareOption);
  const reference = useViewer((s) => s.compareReference);
  const pairVersion = useViewer((s) => s.pairVersion);
  const extra = useViewer((s) => s.zoneExtra);
  const diffMode = useViewer((s) => s.diffMode);
  const timeIndex = useViewer((s) => s.timeIndex);
  const viewMode = useViewer((s) => s.viewMode);
  const set = useViewer((s) => s.set);
  const d = heavy.designs;
  if (designsVersion === 0 || !d) return null;
  const names = d.runs.map((r) => r.name);
  const rows = designTable(d.comparison);
  const r = heavy.results;
  const ex = r && extra === 'mrtChange' && pairVersion > 0 ? zoneExtraColours(r, extra, timeIndex, diffMode, 'viridis') : null;
  const time = r?.times[timeIndex]?.slice(11, 16) ?? '';
  return (
    <section className="panel" aria-labelledby="h-compare">
      <h2 id="h-compare">Compare designs</h2>
      <div className="row">
        <div className="field">
          <label htmlFor="cmp-option">Show</label>
          <select id="cmp-option" value={option} onChange={(e) => void comparePair(e.target.value, reference)}>
            {names.map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </div>
        <div className="field">
          <label htmlFor="cmp-reference">against</label>
          <select id="cmp-reference" value={reference} onChange={(e) => void comparePair(option, e.target.value)}>
            {names.map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </div>
      </div>
      <div className="row">
        <button type="button" aria-pressed={extra === 'mrtChange'} onClick={() => (extra === 'mrtChange' ? set({ zoneExtra: 'none' }) : void comparePair(option, reference))}>
          {extra === 'mrtChange' ? 'Showing the MRT difference' : 'Show the MRT difference'}
        </button>
      </div>
      {heavy.pair && extra === 'mrtChange' && (
        <div className="segmented" role="group" aria-label="Difference shown">
          <button type="button" aria-pressed={diffMode === 'step'} disabled={!hasStepDifferences(heavy.pair)} onClick={() => set({ diffMode: 'step' })}>At the time shown</button>
          <button type="button" aria-pressed={diffMode === 'daylightMean'} onClick={() => set({ diffMode: 'daylightMean' })}>Daylight mean</button>
        </div>
      )}
      {ex && ex.kind === 'difference' && viewMode === 'results' && (
        <DifferenceLegend halfRangeK={ex.halfRangeK} title={`Zones: MRT, ${option} − ${reference}`} note={ex.mode === 'step' ? `at ${time}` : 'mean over daylight hours'} />
      )}
      <table className="design-table small" data-testid="design-table">
        <caption className="muted">Each option − {d.baselineName}, per zone (a sensor's hours are averaged over the zone)</caption>
        <thead>
          <tr><th>zone</th><th>option</th><th>mean MRT [K]</th><th>peak MRT [K]</th><th title="UTCI strong heat stress or worse">hours ≥ strong heat [h]</th></tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={`${row.zone}|${row.option}`}>
              <td>{row.zone}</td>
              <td>{row.option}</td>
              <td className={row.meanMrtChangeK < 0 ? 'cooler' : row.meanMrtChangeK > 0 ? 'hotter' : ''}>{signed(row.meanMrtChangeK)}</td>
              <td className={row.peakMrtChangeK < 0 ? 'cooler' : row.peakMrtChangeK > 0 ? 'hotter' : ''}>{signed(row.peakMrtChangeK)}</td>
              <td className={row.strongHeatHoursChange < 0 ? 'cooler' : row.strongHeatHoursChange > 0 ? 'hotter' : ''}>{signed(row.strongHeatHoursChange)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {rows.some((x) => x.unmatchedSensors > 0) && <p className="small muted">Sensors that exist in only one design (e.g. inside a new trunk) are left out of the changes.</p>}
    </section>
  );
}

/** Per zone: the most glare hours of any sensor, and how many sensors have any. */
function zoneGlareHours(r: NonNullable<typeof heavy.results>, values: Float32Array): { name: string; maxH: number; sensorsWith: number; sensors: number }[] {
  let k = 0;
  return r.zones.map((z) => {
    let maxH = 0, withAny = 0;
    for (let i = 0; i < z.sensorCount; i++, k++) {
      const v = values[k]!;
      if (v > 0) withAny++;
      if (v > maxH) maxH = v;
    }
    return { name: z.name, maxH: Math.round(maxH * 10) / 10, sensorsWith: withAny, sensors: z.sensorCount };
  });
}

/** The glare layer's legend with the caution, and what the paths at the shown step reach. */
export function GlareLegend() {
  const extra = useViewer((s) => s.zoneExtra);
  const timeIndex = useViewer((s) => s.timeIndex);
  const sensorScale = useViewer((s) => s.sensorScale);
  const showPaths = useViewer((s) => s.showPaths);
  const set = useViewer((s) => s.set);
  useViewer((s) => s.resultsVersion);
  const r = heavy.results;
  if (!r || !r.glare) return null;
  const p = pathsAtStep(r, timeIndex);
  const time = r.times[timeIndex]?.slice(11, 16) ?? '';
  const ex = extra === 'glareHours' ? zoneExtraColours(r, extra, timeIndex, 'step', sensorScale) : null;
  const from = r.glare.categories.find((c) => c.id === r.glare!.glareHoursFrom)?.label ?? r.glare.glareHoursFrom;
  return (
    <div className="glare">
      {ex && ex.kind === 'hours' && (
        <figure className="legend" data-testid="legend-glare">
          <figcaption>Zones: glare hours ({from} or worse) <span className="unit">[h]</span></figcaption>
          <div className="legend-bar" style={{ background: scaleGradientCss(sensorScale) }} />
          <div className="legend-ticks" aria-hidden="true">
            {niceTicks(ex.range.min, ex.range.max, 4).map((t) => <span key={t} style={{ left: `${((t - ex.range.min) / (ex.range.max - ex.range.min)) * 100}%` }}>{t}</span>)}
          </div>
        </figure>
      )}
      {ex && ex.kind === 'hours' && (
        <ul className="small glare-zones" data-testid="glare-zones">
          {zoneGlareHours(r, ex.values).map((z) => <li key={z.name}>{z.name}: up to {z.maxH} h at a sensor, {z.sensorsWith} of {z.sensors} sensors with any</li>)}
        </ul>
      )}
      <label className="small"><input type="checkbox" checked={showPaths} onChange={(e) => set({ showPaths: e.target.checked })} /> Reflections reaching sensors at the time shown</label>
      <p className="small" data-testid="paths-summary">
        {p.toViewpoint.length === 0 ? `No reflected sun reaches a sensor or viewpoint at ${time}.` : `At ${time}: ${p.toViewpoint.length} path(s) to ${p.sensorsReached} sensor(s) and ${p.viewpointsReached} viewpoint(s).`}
      </p>
      {(ex || p.toViewpoint.length > 0) && <p className="small caution" role="note">{r.glare.caution}</p>}
    </div>
  );
}
