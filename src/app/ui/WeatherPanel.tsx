/**
 * The period and its weather: one design day, a range of days, or the whole year of a weather
 * file; clear sky with a design-day air temperature curve, or an hourly weather file (.epw, .csv).
 */
import { useViewer } from '../state/store.ts';
import {
  airTempRangeOf, dateRangeOf, designDayOf, periodKindOf, setClearSkyWeather, setDateRange, setDesignDay, setWholeYear, weatherFileOf, type PeriodKind, type ProjectDoc,
} from '../state/projectDoc.ts';
import { NumberField } from './NumberField.tsx';
import { fromSI, toSI, unitLabel } from '../colour/units.ts';
import { openWeatherFile } from '../compute/session.ts';
import { heavy } from '../state/heavy.ts';

export function WeatherPanel() {
  const doc = useViewer((s) => s.doc);
  const units = useViewer((s) => s.units);
  const setDoc = useViewer((s) => s.setDoc);
  const set = useViewer((s) => s.set);
  if (!doc) return null;
  const kind = periodKindOf(doc);
  const day = designDayOf(doc);
  const { startDate, endDate } = dateRangeOf(doc);
  const { minC, maxC } = airTempRangeOf(doc);
  const w = doc.weather.source === 'clear-sky' ? doc.weather : null;
  const file = weatherFileOf(doc);
  const fileReady = file !== null && heavy.weatherFile?.name === file;
  const T = unitLabel('temperature', units);
  const V = unitLabel('speed', units);
  const tryDoc = (f: () => ProjectDoc) => {
    try {
      setDoc(f());
    } catch (err) {
      set({ notice: { kind: 'error', text: err instanceof Error ? err.message : String(err) } });
    }
  };
  const setKind = (k: PeriodKind) => {
    if (k === 'year') tryDoc(() => setWholeYear(doc));
    else if (k === 'day') tryDoc(() => setDesignDay(doc, day || `${new Date().getFullYear()}-07-21`));
    else {
      const s0 = day || `${new Date().getFullYear()}-07-21`;
      const e0 = new Date(Date.parse(`${s0}T12:00:00Z`) + 6 * 86_400_000).toISOString().slice(0, 10);
      tryDoc(() => setDateRange(doc, s0, e0));
    }
  };
  return (
    <section className="panel" aria-labelledby="h-weather">
      <h2 id="h-weather">Period and weather</h2>
      <div className="field">
        <label htmlFor="period-kind">Period</label>
        <select id="period-kind" data-testid="period-kind" value={kind} onChange={(e) => setKind(e.target.value as PeriodKind)}>
          <option value="day">one design day</option>
          <option value="range">a range of days</option>
          <option value="year" disabled={file === null}>the whole year (weather file)</option>
        </select>
      </div>
      {kind === 'day' && (
        <div className="field">
          <label htmlFor="design-day">Design day</label>
          <input id="design-day" type="date" value={day} onChange={(e) => e.target.value && tryDoc(() => setDesignDay(doc, e.target.value))} />
        </div>
      )}
      {kind === 'range' && (
        <div className="row">
          <div className="field">
            <label htmlFor="first-day">First day</label>
            <input id="first-day" data-testid="first-day" type="date" value={startDate} onChange={(e) => e.target.value && tryDoc(() => setDateRange(doc, e.target.value, endDate < e.target.value ? e.target.value : endDate))} />
          </div>
          <div className="field">
            <label htmlFor="last-day">Last day</label>
            <input id="last-day" data-testid="last-day" type="date" value={endDate} min={startDate} onChange={(e) => e.target.value && tryDoc(() => setDateRange(doc, startDate, e.target.value))} />
          </div>
        </div>
      )}
      <div className="weather-source" role="radiogroup" aria-label="Weather">
        <label>
          <input type="radio" name="weather-source" checked={w !== null} onChange={() => tryDoc(() => setClearSkyWeather(doc, {}))} /> clear sky
        </label>
        <label>
          <input type="radio" name="weather-source" checked={file !== null} disabled={!heavy.weatherFile} onChange={() => heavy.weatherFile && tryDoc(() => ({ ...doc, weather: { source: 'file', file: heavy.weatherFile!.name } }))} />
          weather file
        </label>
      </div>
      <div className="field">
        <label htmlFor="weather-file" className="button">{heavy.weatherFile ? 'Another weather file…' : 'Open a weather file…'}</label>
        <input
          id="weather-file"
          data-testid="weather-file"
          className="visually-hidden"
          type="file"
          accept=".epw,.csv"
          aria-label="Open an hourly weather file (.epw or .csv)"
          onChange={(e) => {
            const f = e.target.files?.[0];
            e.target.value = '';
            if (f) void openWeatherFile(f);
          }}
        />
      </div>
      {file !== null && (
        <p className="small" data-testid="weather-file-name">
          Hourly weather from {file}
          {fileReady ? '' : ' (not opened in this session: open it again to run)'}. Air temperature, humidity, wind and sunlight come from the file.
        </p>
      )}
      {w && (
        <>
          <div className="row">
            <NumberField label="Air temperature, lowest" unit={T} value={fromSI('temperature', minC, units)} digits={1} testId="air-min" onCommit={(v) => setDoc(setClearSkyWeather(doc, { minC: toSI('temperature', v, units) }))} />
            <NumberField label="Air temperature, highest" unit={T} value={fromSI('temperature', maxC, units)} digits={1} testId="air-max" onCommit={(v) => setDoc(setClearSkyWeather(doc, { maxC: toSI('temperature', v, units) }))} />
          </div>
          <div className="row">
            <NumberField label="Relative humidity" unit="%" value={w.relativeHumidityPct ?? 50} min={1} max={100} digits={0} onCommit={(v) => setDoc(setClearSkyWeather(doc, { relativeHumidityPct: v }))} />
            <NumberField label="Wind at 10 m" unit={V} value={fromSI('speed', w.windMs ?? 2, units)} min={0} max={fromSI('speed', 40, units)} digits={1} onCommit={(v) => setDoc(setClearSkyWeather(doc, { windMs: toSI('speed', v, units) }))} />
          </div>
          <p className="small muted">Clear sky every day; the air temperature follows a daily curve between the two values.</p>
        </>
      )}
    </section>
  );
}
