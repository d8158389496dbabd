/**
 * The campaign's pieces shared by `npm run fuzz` (fuzz.ts) and the fixed-seed test
 * (fuzz.test.ts): input number `index` of campaign `seed` (replayable alone), running it with a
 * time budget, the tally, and the regression files under test/fuzz/regressions/.
 */
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { randFor } from './mutate.ts';
import { generate, runInput, TARGET_EXT, TARGETS, type FuzzInput, type Outcome, type TargetName } from './targets.ts';

/** Longest accepted run of one input [ms]. */
export const BUDGET_MS = 5000;

export const REGRESSION_DIR = fileURLToPath(new URL('./regressions/', import.meta.url));

/** Input `index` of the campaign `seed`: targets in turn, the mutation from the input's own stream. */
export function inputFor(seed: number, index: number, allowAudit: boolean): FuzzInput {
  const target = TARGETS[index % TARGETS.length]!;
  return generate(randFor(seed, index), target, allowAudit);
}

export type Judged = Outcome & { ms: number };

/** Runs one input and measures it; over `BUDGET_MS` counts as a hang even if it finished. */
export async function judge(input: FuzzInput): Promise<Judged> {
  const t0 = performance.now();
  const out = await runInput(input);
  const ms = performance.now() - t0;
  if (ms > BUDGET_MS && out.kind !== 'failure') return { kind: 'failure', why: 'hang', detail: `took ${ms.toFixed(0)} ms (budget ${BUDGET_MS} ms)`, ms };
  return { ...out, ms };
}

export class Tally {
  tried = 0;
  ok = 0;
  inputErrors = 0;
  crashes = 0;
  hangs = 0;
  byTarget = new Map<string, { ok: number; errors: number; failures: number }>();
  byProblem = new Map<string, number>();
  failures: { target: string; index: number; why: string; detail: string; file?: string }[] = [];
  slowestMs = 0;
  /** Project inputs that went through the model stage / a full audit. */
  depth = { model: 0, audit: 0 };

  add(target: TargetName, index: number, o: Judged, savedAs?: string, depth: FuzzInput['depth'] = 'load'): void {
    this.tried++;
    if (depth !== 'load') this.depth[depth]++;
    this.slowestMs = Math.max(this.slowestMs, o.ms);
    const t = this.byTarget.get(target) ?? { ok: 0, errors: 0, failures: 0 };
    this.byTarget.set(target, t);
    if (o.kind === 'ok') {
      this.ok++;
      t.ok++;
    } else if (o.kind === 'input-error') {
      this.inputErrors++;
      t.errors++;
      const key = `${target}: ${o.problem.replace(/\d+/g, 'N').slice(0, 70)}`;
      this.byProblem.set(key, (this.byProblem.get(key) ?? 0) + 1);
    } else {
      t.failures++;
      if (o.why === 'hang') this.hangs++;
      else this.crashes++;
      this.failures.push({ target, index, why: o.why, detail: o.detail.slice(0, 600), ...(savedAs ? { file: savedAs } : {}) });
    }
  }

  report(): string {
    const lines = [
      `inputs tried: ${this.tried}`,
      `results ok: ${this.ok}`,
      `input errors (InputError naming the file): ${this.inputErrors}`,
      `crashes: ${this.crashes}`,
      `hangs: ${this.hangs}`,
      `slowest input: ${this.slowestMs.toFixed(0)} ms`,
      `project inputs run through the model stage: ${this.depth.model}, through a full audit: ${this.depth.audit}`,
      'by target (ok / input errors / failures):',
      ...[...this.byTarget].map(([k, v]) => `  ${k.padEnd(9)} ${v.ok} / ${v.errors} / ${v.failures}`),
      'errors by kind (most common 40):',
      ...[...this.byProblem].sort((a, b) => b[1] - a[1]).slice(0, 40).map(([k, v]) => `  ${String(v).padStart(6)}  ${k}`),
    ];
    for (const f of this.failures.slice(0, 20)) lines.push(`FAILURE #${f.index} ${f.target}: ${f.why}${f.file ? ` (saved ${f.file})` : ''}\n    ${f.detail.split('\n').slice(0, 4).join('\n    ')}`);
    return lines.join('\n');
  }
}

function fnv(bytes: Uint8Array): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < bytes.length; i++) h = Math.imul(h ^ bytes[i]!, 0x01000193) >>> 0;
  return h.toString(16).padStart(8, '0');
}

/** Writes a failing input as regressions/<target>[.<depth>]-<hash>.<ext>; returns the file name. */
export function saveRegression(input: FuzzInput): string {
  mkdirSync(REGRESSION_DIR, { recursive: true });
  const depth = input.target === 'project' && input.depth !== 'load' ? `.${input.depth}` : '';
  const name = `${input.target}${depth}-${fnv(input.bytes)}.${TARGET_EXT[input.target]}`;
  writeFileSync(path.join(REGRESSION_DIR, name), input.bytes);
  return name;
}

const REGRESSION_NAME = /^([a-z-]+?)(?:\.(load|model|audit))?-[0-9a-f]{8}\.[a-z]+$/;

/** Every saved regression input (file name and input). */
export function regressionInputs(): { name: string; input: FuzzInput }[] {
  let names: string[];
  try {
    names = readdirSync(REGRESSION_DIR);
  } catch {
    return [];
  }
  const out: { name: string; input: FuzzInput }[] = [];
  for (const name of names.sort()) {
    const m = REGRESSION_NAME.exec(name);
    if (!m || !(TARGETS as readonly string[]).includes(m[1]!)) continue;
    out.push({ name, input: { target: m[1] as TargetName, depth: (m[2] as FuzzInput['depth'] | undefined) ?? 'load', bytes: new Uint8Array(readFileSync(path.join(REGRESSION_DIR, name))) } });
  }
  return out;
}
