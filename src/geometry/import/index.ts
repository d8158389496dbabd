/** Model import: `importModel` picks the importer by file extension. */
import { InputError } from '../../physics/errors.ts';
import { importGltf } from './gltf.ts';
import type { GltfImportOptions } from './gltf.ts';
import { importObj } from './obj.ts';
import type { ImportedScene } from './sceneBuilder.ts';

export { importGltf, checkExternalUri, decodeBase64 } from './gltf.ts';
export type { GltfImportOptions } from './gltf.ts';
export { importObj } from './obj.ts';
export { SceneBuilder, fileStem } from './sceneBuilder.ts';
export type { ImportedScene } from './sceneBuilder.ts';
export { triangulatePolygon } from './polygon.ts';
export type { PolygonTriangulation } from './polygon.ts';

/** File extensions `importModel` understands. */
export const MODEL_EXTENSIONS = ['.glb', '.gltf', '.obj'] as const;

/**
 * Imports a model by the extension of `fileName`: `.glb` / `.gltf` → importGltf (default up 'y'),
 * `.obj` → importObj (default up 'z', bytes decoded as UTF-8). Works in the browser and in Node:
 * the caller reads the file and supplies `readExternal` for files it refers to.
 */
export async function importModel(bytes: Uint8Array, fileName: string, opts: GltfImportOptions = {}): Promise<ImportedScene> {
  const ext = /\.[^./\\]+$/.exec(fileName)?.[0]?.toLowerCase() ?? '';
  if (ext === '.glb' || ext === '.gltf') return importGltf(bytes, fileName, opts);
  if (ext === '.obj') {
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      throw new InputError({ problem: 'not UTF-8 text', file: fileName, place: 'whole file', expected: 'an OBJ text file' });
    }
    return importObj(text, fileName, opts);
  }
  throw new InputError({
    problem: 'unknown model file type',
    file: fileName,
    place: 'file extension',
    value: ext === '' ? '(none)' : ext,
    expected: MODEL_EXTENSIONS.join(', '),
  });
}
