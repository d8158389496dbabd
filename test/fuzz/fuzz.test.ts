/**
 * The fixed-seed fuzz set (issue 9): 504 mutated models, weather files and project files from the
 * fixtures, each of which must end in a valid result or an InputError naming the file, within the
 * 5 s budget; and every input ever saved under regressions/ replayed the same way. The long
 * campaign is `npm run fuzz`.
 */
import { describe, it, expect } from 'vitest';
import { BUDGET_MS, inputFor, judge, regressionInputs, Tally } from './campaign.ts';
import { TARGETS } from './targets.ts';
import { makeRand, mutateJson, mutateText, packGlb, splitGlb } from './mutate.ts';
import { loadSeeds } from './targets.ts';

const FIXED_SEED = 424242;
const COUNT = 72 * TARGETS.length; // 504

describe('fuzz: fixed-seed set', () => {
  it(`${COUNT} mutated inputs end in a result or an InputError naming the file`, async () => {
    const tally = new Tally();
    for (let i = 0; i < COUNT; i++) {
      const input = inputFor(FIXED_SEED, i, false);
      tally.add(input.target, i, await judge(input), undefined, input.depth);
    }
    if (tally.failures.length > 0) console.error(tally.report());
    expect(tally.failures).toEqual([]);
    expect(tally.tried).toBe(COUNT);
    // The mutations must not be so wild that nothing parses, nor so mild that nothing fails.
    for (const [target, t] of tally.byTarget) {
      expect(t.ok, `${target}: some valid results`).toBeGreaterThan(0);
      expect(t.errors, `${target}: some input errors`).toBeGreaterThan(0);
    }
    expect(tally.depth.model).toBeGreaterThan(5);
    expect(tally.slowestMs).toBeLessThan(BUDGET_MS);
  }, 60_000);

  it('every saved regression input ends in a result or an InputError', async () => {
    const saved = regressionInputs();
    expect(saved.length).toBeGreaterThan(0);
    for (const { name, input } of saved) {
      const o = await judge(input);
      expect(o.kind === 'failure' ? `${name}: ${o.why}: ${o.detail}` : 'passed').toBe('passed');
    }
  }, 60_000);
});

describe('fuzz: the generators', () => {
  it('are deterministic per (seed, index)', () => {
    for (let i = 0; i < 14; i++) expect(inputFor(7, i, false).bytes).toEqual(inputFor(7, i, false).bytes);
    expect(inputFor(7, 0, false).bytes).not.toEqual(inputFor(8, 0, false).bytes);
  });

  it('GLB split / pack round-trips the fixture', () => {
    const glb = loadSeeds().glb[0]!;
    const { json, bin } = splitGlb(glb);
    const again = splitGlb(packGlb(json, bin));
    expect(again.json).toBe(json);
    expect(again.bin).toEqual(bin);
  });

  it('text and JSON mutators change their input', () => {
    const r = makeRand(5);
    const text = 'a,1,2\nb,3,4\nc,5,6\n';
    let changed = 0;
    for (let k = 0; k < 50; k++) if (mutateText(r, text) !== text) changed++;
    expect(changed).toBeGreaterThan(40);
    const json = JSON.stringify({ a: 1, b: [1, 2, { c: 'x' }] });
    changed = 0;
    for (let k = 0; k < 50; k++) if (mutateJson(r, json) !== json) changed++;
    expect(changed).toBeGreaterThan(40);
  });
});
