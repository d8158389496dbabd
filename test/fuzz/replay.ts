/** `npx tsx test/fuzz/replay.ts [name...]`: runs the saved regression inputs and prints each outcome. */
import { judge, regressionInputs } from './campaign.ts';

const only = process.argv.slice(2);
for (const { name, input } of regressionInputs()) {
  if (only.length > 0 && !only.includes(name)) continue;
  const o = await judge(input);
  process.stdout.write(`${name}: ${o.kind}${o.kind === 'failure' ? ` ${o.why}: ${o.detail.split('\n').slice(0, 8).join('\n   ')}` : o.kind === 'input-error' ? ` (${o.problem})` : ''} ${o.ms.toFixed(0)} ms\n`);
}
