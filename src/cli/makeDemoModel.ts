/** Writes public/demo/demo-terrace.glb from the invented demo massing (src/geometry/demoModel.ts). */
import { writeFileSync, renameSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { demoMeshes } from '../geometry/demoModel.ts';
import { writeGlb } from '../report/gltfWriter.ts';

const target = fileURLToPath(new URL('../../public/demo/demo-terrace.glb', import.meta.url));
const bytes = writeGlb(demoMeshes(), { generator: 'Sunfacet demo model' });
writeFileSync(target + '.tmp', bytes);
renameSync(target + '.tmp', target);
process.stderr.write(`wrote ${target} (${bytes.length} bytes)\n`);
