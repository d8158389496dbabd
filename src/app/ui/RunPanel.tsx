/** Run and cancel the audit; progress with stage names and an estimate of the time left. */
import { useEffect, useState } from 'react';
import { useViewer } from '../state/store.ts';
import { cancelRun, startRun } from '../compute/session.ts';
import { checkDoc } from '../state/projectDoc.ts';
import { timeLeftS } from './progress.ts';

export function RunPanel() {
  const run = useViewer((s) => s.run);
  const doc = useViewer((s) => s.doc);
  const stale = useViewer((s) => s.resultsStale);
  const [now, setNow] = useState(Date.now());
  useEffect(() => {
    if (run.status !== 'running') return;
    const t = setInterval(() => setNow(Date.now()), 500);
    return () => clearInterval(t);
  }, [run.status]);
  const check = doc ? checkDoc(doc) : null;
  const frac = run.total > 0 ? run.done / run.total : 0;
  const left = timeLeftS(run, now);
  return (
    <section className="panel" aria-labelledby="h-run">
      <h2 id="h-run">Run the audit</h2>
      {check && !check.ok && <p className="field-error" role="alert">{check.message}</p>}
      <div className="row">
        <button type="button" className="primary" onClick={startRun} disabled={run.status === 'running' || !check?.ok}>
          {run.status === 'done' ? 'Run again' : 'Run'}
        </button>
        <button type="button" onClick={cancelRun} disabled={run.status !== 'running'}>Cancel (Esc)</button>
      </div>
      {run.status === 'running' && (
        <div className="progress" data-testid="progress">
          <p className="small">
            <strong>{run.stage}</strong> {run.total > 1 ? `· ${run.done} of ${run.total}` : ''}
          </p>
          <progress value={frac} max={1} aria-label={`Progress of “${run.stage}”`} />
          <p className="small muted">
            {Math.round((now - run.startedMs) / 1000)} s so far{left !== null ? ` · about ${left} s left in this stage` : ''}
          </p>
          {run.stagesDone.length > 0 && <p className="small muted">Done: {run.stagesDone.join(' · ')}</p>}
        </div>
      )}
      {run.status === 'done' && (
        <p className="small" data-testid="run-done">
          Finished in {run.elapsedS.toFixed(run.elapsedS < 10 ? 1 : 0)} s
          {run.reused !== 'none' ? ' (reused the geometry pass)' : run.traceWorkers > 0 ? ` (traced on ${run.traceWorkers} workers)` : ''}.{stale ? ' The project has changed since: run again to update the colours.' : ''}
        </p>
      )}
      {run.status === 'cancelled' && <p className="small">Cancelled.</p>}
      {run.status === 'failed' && <p className="field-error" role="alert">{run.message}</p>}
    </section>
  );
}
