/**
 * The time shown: a time-of-day slider (arrow keys step it), and for periods longer than two days
 * a day slider too; play / pause, the time and the sun's position.
 */
import { useEffect } from 'react';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { useSunAtStep } from '../scene/SunLight.tsx';
import { daySplit, stepIndexOf } from './timeSteps.ts';

/** Delay between steps while playing [ms]. */
const PLAY_STEP_MS = 600;

/** The time stamps the slider moves over: the results', unless the project changed since. */
export function currentTimes(): readonly string[] {
  const r = heavy.results;
  const s = useViewer.getState();
  if (r && !s.resultsStale) return r.times;
  return heavy.sunPath?.times ?? r?.times ?? [];
}

export function stepCount(): number {
  return currentTimes().length;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

function dayLabel(time: string): string {
  const m = /^(\d{4})-(\d\d)-(\d\d)/.exec(time);
  return m ? `${Number(m[3])} ${MONTHS[Number(m[2]) - 1]}` : '';
}

export function TimeBar() {
  const timeIndex = useViewer((s) => s.timeIndex);
  const playing = useViewer((s) => s.playing);
  useViewer((s) => s.resultsVersion);
  useViewer((s) => s.resultsStale);
  useViewer((s) => s.sunPathVersion);
  const set = useViewer((s) => s.set);
  const sun = useSunAtStep();
  const times = currentTimes();
  const n = times.length;

  useEffect(() => {
    if (!playing || n < 2) return;
    const t = setInterval(() => {
      const s = useViewer.getState();
      s.set({ timeIndex: (s.timeIndex + 1) % n });
    }, PLAY_STEP_MS);
    return () => clearInterval(t);
  }, [playing, n]);

  if (n === 0) return <footer className="timebar" />;
  const split = daySplit(times);
  const t = Math.min(timeIndex, n - 1);
  const day = Math.floor(t / split.perDay);
  const k = t - day * split.perDay;
  const label = sun?.time ? sun.time.replace('T', ' ').slice(0, 16) : '';
  const offset = sun?.time ? sun.time.slice(19) : '';
  return (
    <footer className="timebar">
      <button type="button" onClick={() => set({ playing: !playing })} aria-pressed={playing} aria-label={playing ? 'Pause' : 'Play the time steps'}>
        {playing ? '❚❚' : '▶'}
      </button>
      {split.days > 1 && (
        <>
          <label htmlFor="day-slider" className="picker-label">Day</label>
          <input
            id="day-slider"
            className="day-slider"
            data-testid="day-slider"
            type="range"
            min={0}
            max={split.days - 1}
            step={1}
            value={day}
            aria-valuetext={dayLabel(times[stepIndexOf(split, day, 0, n)] ?? '')}
            onChange={(e) => set({ timeIndex: stepIndexOf(split, Number(e.target.value), k, n) })}
          />
        </>
      )}
      <label htmlFor="time-slider" className={split.days > 1 ? 'picker-label' : 'visually-hidden'}>{split.days > 1 ? 'Time' : 'Time step'}</label>
      <input
        id="time-slider"
        className={split.days > 1 ? 'hour-slider' : ''}
        data-testid="time-slider"
        type="range"
        min={0}
        max={Math.min(split.perDay, n - day * split.perDay) - 1}
        step={1}
        value={k}
        aria-valuetext={label}
        onChange={(e) => set({ timeIndex: stepIndexOf(split, day, Number(e.target.value), n) })}
      />
      <span className="time-label" data-testid="time-label">
        <strong>{label.slice(11)}</strong> {label.slice(0, 10)} <span className="muted">(UTC{offset})</span>
      </span>
      {sun && (
        <span className="sun-label muted">
          sun {sun.altitudeDeg > 0 ? `${sun.altitudeDeg.toFixed(0)}° up, from ${sun.azimuthDeg.toFixed(0)}°` : 'below the horizon'}
        </span>
      )}
    </footer>
  );
}
