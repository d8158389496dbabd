/**
 * `npm run fuzz [-- --count N] [--seed S] [--no-audit]`: the long fuzz campaign (default 10 000
 * inputs). Inputs run in a worker thread; the main thread is the watchdog: an input still running
 * after the budget (5 s) is a hang, a worker that dies is a crash; either way the input is written
 * to test/fuzz/regressions/ and a fresh worker carries on with the next input. Failures that end
 * normally (wrong exception type, message without the file, broken result) are saved too.
 * Prints the counts; exits 1 when there was any crash or hang.
 */
import { Worker } from 'node:worker_threads';
import { BUDGET_MS, inputFor, saveRegression, Tally, type Judged } from './campaign.ts';
import type { FuzzInput, TargetName } from './targets.ts';

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const count = Number(arg('--count') ?? 10000);
const seed = Number(arg('--seed') ?? 20260721);
const audits = !process.argv.includes('--no-audit');
if (!Number.isInteger(count) || count < 1 || !Number.isInteger(seed)) {
  process.stderr.write('usage: npm run fuzz -- [--count N] [--seed S] [--no-audit]\n');
  process.exit(2);
}

function startWorker(from: number): Worker {
  const tsx = import.meta.resolve('tsx/esm/api');
  const entry = new URL('./fuzzWorker.ts', import.meta.url).href;
  const code = `import(${JSON.stringify(tsx)}).then((m) => { (m.register ?? m.default.register)(); return import(${JSON.stringify(entry)}); });`;
  return new Worker(code, { eval: true, workerData: { seed, from, to: count, auditEvery: audits }, resourceLimits: { maxOldGenerationSizeMb: 2048 } });
}

const tally = new Tally();
const t0 = performance.now();

async function runFrom(from: number): Promise<number | null> {
  return new Promise((resolve) => {
    const w = startWorker(from);
    let current = -1;
    let startedAt = 0;
    let finished = false;
    const end = (next: number | null) => {
      if (finished) return;
      finished = true;
      clearInterval(timer);
      void w.terminate();
      resolve(next);
    };
    const fail = (index: number, why: string, detail: string) => {
      const input = inputFor(seed, index, audits);
      const file = saveRegression(input);
      tally.add(input.target, index, { kind: 'failure', why, detail, ms: performance.now() - startedAt }, file, input.depth);
      process.stderr.write(`[fuzz] #${index} ${input.target}: ${why} -> regressions/${file}\n`);
    };
    const timer = setInterval(() => {
      if (current >= 0 && performance.now() - startedAt > BUDGET_MS) {
        fail(current, 'hang', `still running after ${BUDGET_MS} ms`);
        end(current + 1);
      }
    }, 250);
    w.on('message', (m: { type: string; index: number; target: TargetName; depth: FuzzInput['depth']; judged: Judged }) => {
      if (m.type === 'start') {
        current = m.index;
        startedAt = performance.now();
      } else if (m.type === 'done') {
        current = -1;
        let saved: string | undefined;
        if (m.judged.kind === 'failure') saved = saveRegression(inputFor(seed, m.index, audits));
        tally.add(m.target, m.index, m.judged, saved, m.depth);
        if (m.judged.kind === 'failure') process.stderr.write(`[fuzz] #${m.index} ${m.target}: ${m.judged.why} -> regressions/${saved}\n`);
        if (tally.tried % 1000 === 0) process.stderr.write(`[fuzz] ${tally.tried}/${count} (${((performance.now() - t0) / 1000).toFixed(0)} s)\n`);
      } else if (m.type === 'end') end(null);
    });
    w.on('error', (err) => {
      if (current >= 0) {
        fail(current, 'crash (worker died)', String(err));
        end(current + 1);
      } else {
        process.stderr.write(`[fuzz] worker failed outside an input: ${String(err)}\n`);
        process.exitCode = 1;
        end(null);
      }
    });
    w.on('exit', (code) => {
      if (finished) return;
      if (current >= 0) {
        fail(current, 'crash (worker exited)', `exit code ${code}`);
        end(current + 1);
      } else end(null);
    });
  });
}

let next: number | null = 0;
while (next !== null && next < count) next = await runFrom(next);
process.stdout.write(`fuzz campaign: seed ${seed}, ${((performance.now() - t0) / 1000).toFixed(1)} s\n${tally.report()}\n`);
process.exitCode = tally.crashes + tally.hangs > 0 ? 1 : 0;
