/**
 * `npm run bench -- <suite> [flags]`: a small dispatcher. Each suite is its own file
 * test/bench/<suite>.ts exporting `run(args: string[]): Promise<void>`; results go to stdout as one
 * JSON line per measurement, logs to stderr.
 */
const SUITE_NAME = /^[a-z][a-z0-9-]*$/;

async function main(): Promise<void> {
  const [suite, ...rest] = process.argv.slice(2);
  if (suite === undefined || suite === '--help' || !SUITE_NAME.test(suite)) {
    process.stderr.write('usage: npm run bench -- <suite> [flags]   (suites: trace, audit, ...; each is test/bench/<suite>.ts)\n');
    process.exitCode = 2;
    return;
  }
  let mod: { run?: (args: string[]) => Promise<void> };
  try {
    mod = (await import(new URL(`./${suite}.ts`, import.meta.url).href)) as typeof mod;
  } catch (err) {
    process.stderr.write(`bench: no suite "${suite}" (expected test/bench/${suite}.ts exporting run(args)): ${String(err)}\n`);
    process.exitCode = 2;
    return;
  }
  if (typeof mod.run !== 'function') {
    process.stderr.write(`bench: test/bench/${suite}.ts does not export run(args)\n`);
    process.exitCode = 2;
    return;
  }
  await mod.run(rest);
}

await main();
