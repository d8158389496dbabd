/**
 * Promises kept when the view has shown a frame of a given model. The page starts the first
 * audit of a session only after the model is on screen: the audit's trace workers take every core,
 * and a software renderer drawing its first frame of a new model next to them holds the page far
 * longer than on an idle machine.
 */

interface Waiter {
  modelVersion: number;
  resolve: () => void;
}

let waiters: Waiter[] = [];
let shownModelVersion = -1;

/** Called by the view after it drew a frame on the canvas that shows model `modelVersion`. */
export function frameShown(modelVersion: number): void {
  shownModelVersion = Math.max(shownModelVersion, modelVersion);
  if (waiters.length === 0) return;
  const ready = waiters.filter((w) => w.modelVersion <= shownModelVersion);
  if (ready.length === 0) return;
  waiters = waiters.filter((w) => w.modelVersion > shownModelVersion);
  // After the task that drew (and presented) the frame.
  setTimeout(() => {
    for (const w of ready) w.resolve();
  }, 0);
}

/** Resolves once a frame of model `modelVersion` (or a later one) was shown, or after `timeoutMs` [ms]. */
export function whenModelShown(modelVersion: number, timeoutMs: number): Promise<void> {
  if (shownModelVersion >= modelVersion) return Promise.resolve();
  return new Promise((ok) => {
    const w: Waiter = { modelVersion, resolve: ok };
    waiters.push(w);
    setTimeout(() => {
      waiters = waiters.filter((x) => x !== w);
      ok();
    }, timeoutMs);
  });
}
