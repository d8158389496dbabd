import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from '../command.ts';
import { InputError } from '../../physics/errors.ts';
import { runAuditFromPartials } from '../../audit/pipeline.ts';
import { loadFromCli, withRunContext, writeResults } from './audit.ts';

export const mergeCommand: Command = {
  name: 'merge',
  summary: 'Joins the partials of `sunfacet audit --shard K/N` runs into the full results',
  usage: 'sunfacet merge <dir1> <dir2> … --out <dir> [--project <project.json>] [--json]',
  options: {
    out: { type: 'string', required: true, value: '<dir>', help: 'output folder for the joined results' },
    project: { type: 'string', value: '<file>', help: 'the project file (default: the one the shards recorded)' },
    json: { type: 'boolean', help: 'print summary.json to stdout as well' },
  },
  details: 'Each shard traced a slice of the patches and sensors; merge joins the slices and runs the hour-by-hour\nheat balance once, so the result equals a single run of the whole project exactly.',
  async run({ positional, options }, io) {
    const t0 = Date.now();
    if (positional.length === 0) throw new InputError({ place: 'sunfacet merge', problem: 'no shard folders given', expected: 'the --out folders of all shards' });
    const partials: { bytes: Uint8Array; file: string }[] = [];
    let projectFromShard: string | undefined;
    for (const dir of positional) {
      const abs = path.resolve(io.cwd, dir);
      let names: string[];
      try {
        names = await readdir(abs);
      } catch {
        throw new InputError({ file: dir, problem: 'not a readable folder', expected: 'the --out folder of a `sunfacet audit --shard K/N` run' });
      }
      const found = names.filter((n) => /^geometry-\d+-of-\d+\.sfgp$/.test(n));
      if (found.length === 0) throw new InputError({ file: dir, problem: 'no geometry partial (geometry-K-of-N.sfgp) in this folder', expected: 'the --out folder of a shard run' });
      for (const n of found) {
        partials.push({ bytes: new Uint8Array(await readFile(path.join(abs, n))), file: path.join(dir, n) });
        const manifest = path.join(abs, n.replace(/^geometry-/, 'shard-').replace(/\.sfgp$/, '.json'));
        try {
          projectFromShard ??= (JSON.parse(await readFile(manifest, 'utf8')) as { project?: string }).project;
        } catch {
          /* the manifest is optional when --project is given */
        }
      }
    }
    const projectFile = (options.project as string | undefined) ?? projectFromShard;
    if (!projectFile) throw new InputError({ place: '--project', problem: 'the project file is not known', expected: 'the project .json the shards ran (--project)' });
    const loaded = await loadFromCli(projectFile, io);
    const r = await withRunContext(io, 0, (o) => runAuditFromPartials(loaded, partials, o));
    if (!r) return 130;
    await writeResults(r.results, r.record, String(options.out), io, Boolean(options.json), t0);
    return 0;
  },
};
