import { describe, it, expect } from 'vitest';
import { loadProject } from '../../src/audit/load.ts';
import { runAudit, runAuditShard, runAuditFromPartials } from '../../src/audit/pipeline.ts';
import { decodeGeometryPartial } from '../../src/audit/shard.ts';
import { InputError } from '../../src/physics/errors.ts';
import { ObjScene, sceneProject, inMemoryReader, comparableJson } from '../helpers/auditScenes.ts';

// A small court: two blocks with a gap, a zone between them (invented test scene).
const obj = new ObjScene()
  .box('west-block', 'render', [-8, -10, 0], [-3, 10, 9])
  .box('east-block', 'steel', [3, -10, 0], [8, 10, 6])
  .text();
const project = sceneProject({
  date: '2026-07-01',
  firstHour: 10,
  lastHour: 15,
  materials: { render: 'concrete-light', steel: 'steel-dark-painted' },
  zones: [{ name: 'court', polygon: [[-2.5, -3], [2.5, -3], [2.5, 3], [-2.5, 3]], sensorHeightM: 1.1, spacingM: 1.5 }],
  sampling: { skyRaysPerPatch: 4, viewRays: 64 },
});

describe('shards and merge', () => {
  it('three shards merged give byte-identical results to the single run (DESIGN §3 determinism)', async () => {
    const load = () => loadProject(JSON.stringify(project), 'court.json', inMemoryReader(obj));
    const single = await runAudit(await load());
    const partials = [];
    for (const index of [3, 1, 2]) {
      const { partial, meta } = await runAuditShard(await load(), { index, count: 3 });
      expect(meta.shard).toEqual({ index, count: 3 });
      partials.push({ bytes: partial, file: `part-${index}.sfgp` });
    }
    const merged = await runAuditFromPartials(await load(), partials);
    expect(JSON.stringify(merged.results)).toBe(JSON.stringify(single));
    expect(comparableJson(merged.results)).toBe(comparableJson(single));
  }, 60000);

  it('refuses a missing shard, a foreign partial and a damaged file', async () => {
    const load = () => loadProject(JSON.stringify(project), 'court.json', inMemoryReader(obj));
    const a = await runAuditShard(await load(), { index: 1, count: 2 });
    await expect(runAuditFromPartials(await load(), [{ bytes: a.partial, file: 'p1.sfgp' }])).rejects.toThrow(/each of shards 1\.\.2/);
    const other = JSON.parse(JSON.stringify(project)) as { zones: { spacingM: number }[] };
    other.zones[0]!.spacingM = 1;
    const b = await runAuditShard(await loadProject(JSON.stringify(other), 'court.json', inMemoryReader(obj)), { index: 2, count: 2 });
    await expect(runAuditFromPartials(await load(), [{ bytes: a.partial, file: 'p1.sfgp' }, { bytes: b.partial, file: 'p2.sfgp' }])).rejects.toThrow(/p2\.sfgp.*another version of the project/);
    expect(() => decodeGeometryPartial(a.partial.slice(0, 40), 'cut.sfgp')).toThrow(InputError);
    expect(() => decodeGeometryPartial(new Uint8Array([1, 2, 3]), 'junk.sfgp')).toThrow(/junk\.sfgp: not a Sunfacet geometry partial/);
  }, 60000);
});
