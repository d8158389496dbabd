/** Node file access for the CLI: a project's relative-path reader confined to the project's folder. */
import { readFile, realpath } from 'node:fs/promises';
import path from 'node:path';
import { InputError } from '../physics/errors.ts';
import type { ReadRelative } from '../audit/load.ts';

export async function readProjectFile(projectPath: string, cwd: string): Promise<{ text: string; abs: string; readRelative: ReadRelative }> {
  const abs = path.resolve(cwd, projectPath);
  let text: string;
  try {
    text = await readFile(abs, 'utf8');
  } catch (e) {
    const code = (e as { code?: string }).code;
    throw new InputError({ file: projectPath, problem: code === 'ENOENT' ? 'project file not found' : `cannot read the project file (${String(e)})`, expected: 'a readable project .json file' });
  }
  const dir = path.dirname(abs);
  const readRelative: ReadRelative = async (rel) => {
    const target = path.resolve(dir, rel);
    // Refuse anything that resolves (also through symlinks) outside the project's folder.
    const realDir = await realpath(dir);
    const realTarget = await realpath(target).catch(() => target);
    if (!(realTarget + path.sep).startsWith(realDir + path.sep)) {
      throw new InputError({ file: projectPath, place: rel, problem: 'the path leaves the project folder', expected: "a file inside the project file's folder" });
    }
    return new Uint8Array(await readFile(target));
  };
  return { text, abs, readRelative };
}
