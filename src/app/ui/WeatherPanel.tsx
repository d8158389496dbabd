/** The design day and its clear-sky weather: date, air temperature range, humidity, wind. */
import { useViewer } from '../state/store.ts';
import { airTempRangeOf, designDayOf, setClearSkyWeather, setDesignDay } from '../state/projectDoc.ts';
import { NumberField } from './NumberField.tsx';
import { fromSI, toSI, unitLabel } from '../colour/units.ts';

export function WeatherPanel() {
  const doc = useViewer((s) => s.doc);
  const units = useViewer((s) => s.units);
  const setDoc = useViewer((s) => s.setDoc);
  const set = useViewer((s) => s.set);
  if (!doc) return null;
  const day = designDayOf(doc);
  const { minC, maxC } = airTempRangeOf(doc);
  const w = doc.weather.source === 'clear-sky' ? doc.weather : null;
  const T = unitLabel('temperature', units);
  const V = unitLabel('speed', units);
  return (
    <section className="panel" aria-labelledby="h-weather">
      <h2 id="h-weather">Day and weather</h2>
      {doc.weather.source === 'file' && <p className="small">Weather from the file {doc.weather.file}. Changing a value below switches to a clear-sky design day.</p>}
      <div className="field">
        <label htmlFor="design-day">Design day</label>
        <input
          id="design-day"
          type="date"
          value={day}
          onChange={(e) => {
            try {
              if (e.target.value) setDoc(setDesignDay(doc, e.target.value));
            } catch (err) {
              set({ notice: { kind: 'error', text: err instanceof Error ? err.message : String(err) } });
            }
          }}
        />
      </div>
      <div className="row">
        <NumberField label="Air temperature, lowest" unit={T} value={fromSI('temperature', minC, units)} digits={1} testId="air-min" onCommit={(v) => setDoc(setClearSkyWeather(doc, { minC: toSI('temperature', v, units) }))} />
        <NumberField label="Air temperature, highest" unit={T} value={fromSI('temperature', maxC, units)} digits={1} testId="air-max" onCommit={(v) => setDoc(setClearSkyWeather(doc, { maxC: toSI('temperature', v, units) }))} />
      </div>
      <div className="row">
        <NumberField label="Relative humidity" unit="%" value={w?.relativeHumidityPct ?? 50} min={1} max={100} digits={0} onCommit={(v) => setDoc(setClearSkyWeather(doc, { relativeHumidityPct: v }))} />
        <NumberField label="Wind at 10 m" unit={V} value={fromSI('speed', w?.windMs ?? 2, units)} min={0} max={fromSI('speed', 40, units)} digits={1} onCommit={(v) => setDoc(setClearSkyWeather(doc, { windMs: toSI('speed', v, units) }))} />
      </div>
      <p className="small muted">Clear sky all day; the air temperature follows a design-day curve between the two values.</p>
    </section>
  );
}
