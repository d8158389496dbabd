/** Time-left estimate of the running stage from its own rate so far. Pure. */
export function timeLeftS(run: { status: string; done: number; total: number; stageStartedMs: number }, nowMs: number): number | null {
  if (run.status !== 'running' || run.total <= 1 || run.done <= 0 || run.done >= run.total) return null;
  const elapsed = (nowMs - run.stageStartedMs) / 1000;
  if (elapsed < 0.5) return null;
  return Math.max(1, Math.round((elapsed / run.done) * (run.total - run.done)));
}
