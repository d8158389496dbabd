/**
 * The small invented scene of test/audit/timeStepSpeed.test.ts: a street canyon of a dark steel
 * shed, a glazed block and an anodised-aluminium block on stone paving, with a seated terrace
 * between them, one clear-sky summer day. It mixes thin sheets (sub-stepped) with masonry, and the
 * blocks see each other, so the longwave iteration and the reflection bounces both matter.
 */
import { loadProject } from '../../src/audit/load.ts';
import { runAuditWithState, type AuditState } from '../../src/audit/pipeline.ts';
import { ObjScene, sceneProject, inMemoryReader } from '../helpers/auditScenes.ts';

export async function timeStepScene(): Promise<AuditState> {
  const obj = new ObjScene()
    .box('shed', 'shed-finish', [0, 0, 0], [6, 20, 5])
    .box('office', 'office-finish', [14, 0, 0], [22, 8, 14])
    .box('hall', 'hall-finish', [14, 10, 0], [22, 20, 9])
    .text();
  const project = sceneProject({
    materials: { 'shed-finish': 'steel-dark-painted', 'office-finish': 'glass-clear', 'hall-finish': 'aluminium-anodised' },
    defaultMaterial: 'concrete-light',
    ground: { material: 'stone-paving' },
    zones: [{ name: 'terrace', polygon: [[7, 2], [13, 2], [13, 18], [7, 18]], spacingM: 3, posture: 'seated' }],
    sampling: { skyRaysPerPatch: 4, viewRays: 36 },
  });
  const loaded = await loadProject(JSON.stringify(project), 'test.json', inMemoryReader(obj));
  return (await runAuditWithState(loaded, { now: () => new Date(0) })).state;
}
