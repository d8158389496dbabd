/**
 * Writes the small invented model fixtures under test/fixtures/models/ (run: npx tsx
 * test/helpers/writeModelFixtures.ts). The tests also build the same models in memory and check
 * that the files on disk match them, so a stale fixture fails a test.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { boxGltfDocument, boxObj, writeGlb, writeGltfJson } from './models.ts';

export const FIXTURE_BOX_SIZE: [number, number, number] = [2, 3, 4];
export const FIXTURE_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'models');

export async function writeModelFixtures(dir = FIXTURE_DIR): Promise<void> {
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'box.obj'), boxObj(FIXTURE_BOX_SIZE));
  const doc = boxGltfDocument(FIXTURE_BOX_SIZE);
  writeFileSync(join(dir, 'box.glb'), await writeGlb(doc));
  doc.getRoot().listBuffers()[0]!.setURI('box.bin');
  const { gltf, resources } = await writeGltfJson(doc);
  writeFileSync(join(dir, 'box.gltf'), gltf);
  for (const [uri, bytes] of Object.entries(resources)) writeFileSync(join(dir, uri), bytes);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await writeModelFixtures();
  console.log(`wrote fixtures to ${FIXTURE_DIR}`);
}
