import { describe, it, expect } from 'vitest';
import { createProgressReporter, formatDuration, TTY_REDRAW_MS, PLAIN_LINE_MS } from '../../src/cli/progress.ts';

/** A fake stderr and clock. */
function rig(errIsTty: boolean) {
  const writes: string[] = [];
  const clock = { ms: 1000 };
  const p = createProgressReporter({ err: (s) => writes.push(s), errIsTty }, { now: () => clock.ms });
  return { p, writes, clock };
}

describe('createProgressReporter on a terminal', () => {
  it('redraws one line with bar, percent, counts and time left from the rate so far', () => {
    const { p, writes, clock } = rig(true);
    p.stage('sky visibility', 30);
    expect(writes).toEqual(['\rsky visibility [--------------------] 0% 0/30\x1b[K']);
    clock.ms += 9000;
    p.update(12); // 12 in 9 s → 18 left at 0.75 s each = 13.5 s → rounded up
    expect(writes[1]).toBe('\rsky visibility [########------------] 40% 12/30 · 14 s left\x1b[K');
    expect(writes[1]!.includes('\n')).toBe(false);
  });

  it('throttles redraws to one per 100 ms, but always draws the end and keeps it on its own line', () => {
    const { p, writes, clock } = rig(true);
    p.stage('sun', 1000);
    for (let i = 1; i < 1000; i++) {
      clock.ms += 1; // 1 ms per unit: ~1 s in all
      p.update(i);
    }
    const redraws = writes.length - 1;
    expect(redraws).toBeGreaterThanOrEqual(8);
    expect(redraws).toBeLessThanOrEqual(Math.ceil(1000 / TTY_REDRAW_MS));
    clock.ms += 1;
    p.update(1000);
    expect(writes.at(-1)).toBe('\rsun [####################] 100% 1000/1000 · 1.0 s\x1b[K\n');
    const before = writes.length;
    p.finish(); // already ended: nothing more
    expect(writes.length).toBe(before);
  });

  it('ends an unfinished stage when the next one starts, and finish() ends the last', () => {
    const { p, writes, clock } = rig(true);
    p.stage('a', 10);
    clock.ms += 500;
    p.update(5);
    p.stage('b', 4);
    expect(writes.slice(-2)).toEqual(['\ra [##########----------] 50% 5/10 · 0.5 s\x1b[K\n', '\rb [--------------------] 0% 0/4\x1b[K']);
    clock.ms += 2000;
    p.finish();
    expect(writes.at(-1)).toBe('\rb [--------------------] 0% 0/4 · 2.0 s\x1b[K\n');
    p.update(3); // after finish: ignored
    expect(writes.at(-1)).toBe('\rb [--------------------] 0% 0/4 · 2.0 s\x1b[K\n');
  });
});

describe('createProgressReporter into a pipe', () => {
  it('prints plain lines at start, at most every 2 s, and at the end', () => {
    const { p, writes, clock } = rig(false);
    p.stage('sky visibility', 2400);
    expect(writes).toEqual(['[sunfacet] sky visibility 0% (0/2400)\n']);
    for (let done = 100; done < 2400; done += 100) {
      clock.ms += 250; // 100 units per 0.25 s
      p.update(done);
    }
    // 23 updates over 5.75 s → lines at 2 s and 4 s (after the start line)
    expect(writes).toHaveLength(3);
    expect(writes[1]).toBe('[sunfacet] sky visibility 33% (800/2400), about 4 s left\n');
    expect(writes[2]).toBe('[sunfacet] sky visibility 66% (1600/2400), about 2 s left\n');
    clock.ms += 250;
    p.update(2400);
    expect(writes[3]).toBe('[sunfacet] sky visibility done (2400/2400) in 6.0 s\n');
    expect(writes.every((w) => !w.includes('\r') && !w.includes('\x1b') && w.endsWith('\n'))).toBe(true);
    expect(PLAIN_LINE_MS).toBe(2000);
  });

  it('writes the example line of the design: half done after 3 s', () => {
    const { p, writes, clock } = rig(false);
    p.stage('sky visibility', 2400);
    clock.ms += 3000;
    p.update(1200);
    expect(writes[1]).toBe('[sunfacet] sky visibility 50% (1200/2400), about 3 s left\n');
  });

  it('copes with an empty stage and out-of-range counts', () => {
    const { p, writes, clock } = rig(false);
    p.stage('nothing to do', 0);
    expect(writes).toEqual(['[sunfacet] nothing to do 100% (0/0)\n', '[sunfacet] nothing to do done (0/0) in 0.0 s\n']);
    p.stage('x', 10);
    clock.ms += 5000;
    p.update(-3);
    expect(writes.at(-1)).toBe('[sunfacet] x 0% (0/10)\n'); // no time left without progress
    clock.ms += 5000;
    p.update(99);
    expect(writes.at(-1)).toBe('[sunfacet] x done (10/10) in 10 s\n');
  });
});

describe('formatDuration', () => {
  it('formats elapsed and remaining times for people', () => {
    expect(formatDuration(400)).toBe('0.4 s');
    expect(formatDuration(12_400)).toBe('12 s');
    expect(formatDuration(185_000)).toBe('3 min 5 s');
    expect(formatDuration(120_000)).toBe('2 min');
    expect(formatDuration(4_830_000)).toBe('1 h 20 min');
    expect(formatDuration(10, true)).toBe('1 s'); // time left never shows 0 s
    expect(formatDuration(2100, true)).toBe('3 s');
    expect(formatDuration(NaN)).toBe('0.0 s');
  });
});
