/** The time of day: a slider (arrow keys step it), play / pause, the time and the sun's position. */
import { useEffect } from 'react';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { useSunAtStep } from '../scene/SunLight.tsx';

/** Delay between steps while playing [ms]. */
const PLAY_STEP_MS = 600;

export function stepCount(): number {
  const r = heavy.results;
  const s = useViewer.getState();
  if (r && !s.resultsStale) return r.times.length;
  return heavy.sunPath?.times.length ?? r?.times.length ?? 0;
}

export function TimeBar() {
  const timeIndex = useViewer((s) => s.timeIndex);
  const playing = useViewer((s) => s.playing);
  useViewer((s) => s.resultsVersion);
  useViewer((s) => s.sunPathVersion);
  const set = useViewer((s) => s.set);
  const sun = useSunAtStep();
  const n = stepCount();

  useEffect(() => {
    if (!playing || n < 2) return;
    const t = setInterval(() => {
      const s = useViewer.getState();
      s.set({ timeIndex: (s.timeIndex + 1) % n });
    }, PLAY_STEP_MS);
    return () => clearInterval(t);
  }, [playing, n]);

  if (n === 0) return <footer className="timebar" />;
  const label = sun?.time ? sun.time.replace('T', ' ').slice(0, 16) : '';
  const offset = sun?.time ? sun.time.slice(19) : '';
  return (
    <footer className="timebar">
      <button type="button" onClick={() => set({ playing: !playing })} aria-pressed={playing} aria-label={playing ? 'Pause' : 'Play the day'}>
        {playing ? '❚❚' : '▶'}
      </button>
      <label htmlFor="time-slider" className="visually-hidden">Time step</label>
      <input
        id="time-slider"
        data-testid="time-slider"
        type="range"
        min={0}
        max={n - 1}
        step={1}
        value={Math.min(timeIndex, n - 1)}
        aria-valuetext={label}
        onChange={(e) => set({ timeIndex: Number(e.target.value) })}
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
