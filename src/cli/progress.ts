/**
 * Progress on stderr for long CLI runs (DESIGN §4: progress to stderr, results to files/stdout).
 *
 * On a terminal: one line redrawn in place (carriage return, then erase to end of line),
 *   `sky visibility [########------------] 42% 12/30 · 3 s left`
 * at most every 100 ms, and always at stage start and end; the finished line is kept (newline).
 * Through a pipe or into a log: plain lines, at stage start, then at most every 2 s, then at end:
 *   `[sunfacet] sky visibility 50% (1200/2400), about 3 s left`
 *
 * The time left is the remaining work at the rate so far in this stage (elapsed / done), shown once
 * there is some done work to estimate from. The clock is injectable for tests.
 */

export interface ProgressIo {
  err: (text: string) => void;
  errIsTty: boolean;
}

export interface ProgressReporter {
  /** Starts a stage of `total` work units (ends the previous stage if one is open). */
  stage(name: string, total: number): void;
  /** Reports `done` of the current stage's `total` units (absolute, not an increment). */
  update(done: number): void;
  /** Ends the current stage (if any) and leaves the cursor on a fresh line. */
  finish(): void;
}

/** Minimum time between terminal redraws [ms]. */
export const TTY_REDRAW_MS = 100;
/** Minimum time between plain progress lines [ms]. */
export const PLAIN_LINE_MS = 2000;
const BAR_WIDTH = 20;

/**
 * Creates a progress reporter writing to `io.err`.
 *
 * @param io Where to write, and whether it is a terminal.
 * @param opts.now Clock [ms]; default `performance.now()`.
 * @example const p = createProgressReporter(io); p.stage('sky visibility', 2400); p.update(1200); p.finish();
 */
export function createProgressReporter(io: ProgressIo, opts: { now?: () => number } = {}): ProgressReporter {
  const now = opts.now ?? (() => performance.now());
  let name = '';
  let total = 0;
  let done = 0;
  let startMs = 0;
  let lastDrawMs = -Infinity;
  let open = false;
  let ended = false; // the end of this stage has been shown

  const draw = (t: number, final: boolean): void => {
    lastDrawMs = t;
    const elapsedMs = t - startMs;
    if (io.errIsTty) {
      const tail = final ? ` · ${formatDuration(elapsedMs)}` : etaText(elapsedMs, ' · ', ' left');
      io.err(`\r${name} [${bar(done, total)}] ${percent(done, total)}% ${done}/${total}${tail}\x1b[K${final ? '\n' : ''}`);
    } else if (final) {
      io.err(`[sunfacet] ${name} done (${done}/${total}) in ${formatDuration(elapsedMs)}\n`);
    } else {
      io.err(`[sunfacet] ${name} ${percent(done, total)}% (${done}/${total})${etaText(elapsedMs, ', about ', ' left')}\n`);
    }
  };

  const etaText = (elapsedMs: number, before: string, after: string): string => {
    if (done <= 0 || done >= total || elapsedMs <= 0) return '';
    const leftMs = ((total - done) * elapsedMs) / done;
    return `${before}${formatDuration(leftMs, true)}${after}`;
  };

  const end = (): void => {
    if (open && !ended) draw(now(), true);
    ended = true;
    open = false;
  };

  return {
    stage(stageName: string, stageTotal: number): void {
      end();
      name = stageName;
      total = Number.isFinite(stageTotal) && stageTotal > 0 ? Math.floor(stageTotal) : 0;
      done = 0;
      startMs = now();
      open = true;
      ended = false;
      draw(startMs, false);
      if (total === 0) end();
    },
    update(doneNow: number): void {
      if (!open) return;
      done = Math.max(0, Math.min(total, Math.floor(Number.isFinite(doneNow) ? doneNow : 0)));
      if (done >= total) {
        end();
        return;
      }
      const t = now();
      if (t - lastDrawMs >= (io.errIsTty ? TTY_REDRAW_MS : PLAIN_LINE_MS)) draw(t, false);
    },
    finish(): void {
      end();
    },
  };
}

function percent(done: number, total: number): number {
  return total <= 0 ? 100 : Math.floor((100 * done) / total);
}

function bar(done: number, total: number): string {
  const filled = total <= 0 ? BAR_WIDTH : Math.floor((BAR_WIDTH * done) / total);
  return '#'.repeat(filled) + '-'.repeat(BAR_WIDTH - filled);
}

/**
 * A duration for people: "0.4 s", "12 s", "3 min 5 s", "1 h 20 min". With `roundUp` (time left)
 * whole seconds are rounded up, so a stage still running never shows "0 s left".
 *
 * @param ms Duration [ms].
 * @param roundUp Round up to whole seconds (for time left) rather than to nearest.
 */
export function formatDuration(ms: number, roundUp = false): string {
  if (!Number.isFinite(ms) || ms < 0) ms = 0;
  if (!roundUp && ms < 10_000) return `${(Math.round(ms / 100) / 10).toFixed(1)} s`;
  const s = roundUp ? Math.max(1, Math.ceil(ms / 1000)) : Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  if (s < 3600) {
    const m = Math.floor(s / 60), r = s % 60;
    return r === 0 ? `${m} min` : `${m} min ${r} s`;
  }
  const h = Math.floor(s / 3600), m = Math.floor((s % 3600) / 60);
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}
