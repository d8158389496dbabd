/**
 * Atomic output files (DESIGN §4: "a failed run leaves no half-written results").
 *
 * Every file is streamed to a temporary file in the target directory (same file system, so the
 * final rename is atomic on POSIX), fsynced, and only when all files are complete are they renamed
 * into place. On an error or an abort the temporaries are removed and the previous files are left
 * as they were. A process killed outright (SIGKILL, power loss) cannot clean up: its temporary
 * (`.<name>.<pid>.<random>.tmp`) stays behind, the previous file is intact, and the next write of
 * the same name removes temporaries whose process is gone.
 *
 * Each rename is atomic; the set of renames is not. To keep a failure during the renames from
 * leaving a mix of old and new files, each previous file is first hard-linked to a backup name and
 * restored from it if a later rename fails. (Where hard links are not supported the file has no
 * backup and such a rare failure can leave that one file new.) A crash in the middle of the
 * renames — microseconds — can still leave a mix.
 *
 * This module is the only place (with the app) that writes files; `src/audit` produces chunks.
 */
import { open, mkdir, rename, unlink, link, readdir, lstat } from 'node:fs/promises';
import type { FileHandle } from 'node:fs/promises';
import { join, dirname, basename } from 'node:path';
import { randomBytes } from 'node:crypto';
import { Buffer } from 'node:buffer';

export type OutputChunk = string | Uint8Array;

export interface OutputFile {
  /** File name inside the output directory (no directory part). */
  name: string;
  /** The content, in order; strings are written as UTF-8. */
  chunks: Iterable<OutputChunk> | AsyncIterable<OutputChunk>;
}

/** Strings are gathered to about this many characters before a write (fewer, larger writes). */
const COALESCE_CHARS = 256 * 1024;

/**
 * Writes all `files` into `dir` so that either all of them are replaced or none is.
 *
 * @param dir Output directory; created (with parents) if missing.
 * @param files Files to write; names must be plain file names and distinct.
 * @param opts.signal Abort signal, checked before every chunk and before the renames; an abort
 *   rejects with `signal.reason` and leaves the previous files untouched. (A chunk source that
 *   blocks inside its own `next()` is not interrupted; the abort takes effect at its next chunk.)
 * @returns Resolves once every file is in place.
 * @example await writeOutputsAtomically('out', [{ name: 'results.json', chunks: resultsJsonChunks(r) }])
 */
export async function writeOutputsAtomically(
  dir: string,
  files: readonly OutputFile[],
  opts: { signal?: AbortSignal } = {},
): Promise<void> {
  const { signal } = opts;
  checkNames(files.map((f) => f.name));
  signal?.throwIfAborted();
  await mkdir(dir, { recursive: true });
  await removeStaleTemporaries(dir, files.map((f) => f.name));

  const temps: string[] = [];
  const backups: (string | null)[] = [];
  let handle: FileHandle | null = null;
  try {
    for (const file of files) {
      const tmp = join(dir, scratchName(file.name, 'tmp'));
      temps.push(tmp);
      handle = await open(tmp, 'wx', 0o666);
      await copyModeOfExisting(join(dir, file.name), handle);
      await writeChunks(handle, file.chunks, signal);
      await handle.sync();
      const h = handle;
      handle = null;
      await h.close();
    }
    signal?.throwIfAborted();

    // Commit. Refuse before renaming anything if a target is a directory (rename would fail midway).
    for (const file of files) {
      const st = await lstat(join(dir, file.name)).catch(() => null);
      if (st?.isDirectory()) throw new Error(`cannot write ${join(dir, file.name)}: a directory of that name exists`);
    }
    for (const file of files) {
      const final = join(dir, file.name);
      const bak = join(dir, scratchName(file.name, 'bak'));
      backups.push(await link(final, bak).then(() => bak, () => null));
    }
    let renamed = 0;
    try {
      for (; renamed < files.length; renamed++) {
        await rename(temps[renamed] as string, join(dir, (files[renamed] as OutputFile).name));
      }
    } catch (e) {
      // Put back what was replaced (backups) and remove what was new.
      for (let i = renamed - 1; i >= 0; i--) {
        const final = join(dir, (files[i] as OutputFile).name);
        const bak = backups[i];
        if (bak) await rename(bak, final).catch(() => undefined);
        else await unlink(final).catch(() => undefined);
        backups[i] = null;
      }
      throw e;
    }
    temps.length = 0;
    await syncDirectory(dir);
  } catch (e) {
    if (handle) await handle.close().catch(() => undefined);
    for (const tmp of temps) await unlink(tmp).catch(() => undefined);
    throw e;
  } finally {
    for (const bak of backups) if (bak) await unlink(bak).catch(() => undefined);
  }
}

/**
 * Writes one file atomically (a project save): the previous file stays whole until the new one is
 * complete and fsynced, then the new one replaces it by a rename.
 *
 * @param path File path (its directory is created if missing).
 * @param data The content: a string (UTF-8), bytes, or chunks of either.
 * @param opts.signal Abort signal, as for writeOutputsAtomically.
 * @example await writeFileAtomically('project.json', JSON.stringify(project, null, 2) + '\n')
 */
export async function writeFileAtomically(
  path: string,
  data: OutputChunk | Iterable<OutputChunk> | AsyncIterable<OutputChunk>,
  opts: { signal?: AbortSignal } = {},
): Promise<void> {
  // A string and a Uint8Array are iterable themselves (characters, bytes): wrap them whole.
  const chunks = typeof data === 'string' || data instanceof Uint8Array ? [data] : data;
  await writeOutputsAtomically(dirname(path), [{ name: basename(path), chunks }], opts);
}

function checkNames(names: string[]): void {
  const seen = new Set<string>();
  for (const name of names) {
    if (name === '' || name === '.' || name === '..' || /[/\\\0]/.test(name)) {
      throw new Error(`output file name ${JSON.stringify(name)} is not a plain file name`);
    }
    if (seen.has(name)) throw new Error(`output file name ${JSON.stringify(name)} is given twice`);
    seen.add(name);
  }
}

function scratchName(name: string, kind: 'tmp' | 'bak'): string {
  return `.${name}.${process.pid}.${randomBytes(6).toString('hex')}.${kind}`;
}

const escapeRegExp = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** Removes `.<name>.<pid>.<hex>.tmp|bak` left by a process that no longer exists. */
async function removeStaleTemporaries(dir: string, names: string[]): Promise<void> {
  let entries: string[];
  try {
    entries = await readdir(dir);
  } catch {
    return;
  }
  const patterns = names.map((n) => new RegExp(`^\\.${escapeRegExp(n)}\\.(\\d+)\\.[0-9a-f]{12}\\.(?:tmp|bak)$`));
  for (const entry of entries) {
    for (const re of patterns) {
      const m = re.exec(entry);
      if (m && !processAlive(Number(m[1]))) {
        await unlink(join(dir, entry)).catch(() => undefined);
        break;
      }
    }
  }
}

function processAlive(pid: number): boolean {
  if (pid === process.pid) return true; // another write in this process may be using it
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM'; // exists, owned by someone else
  }
}

/** Keeps the permissions of the file being replaced (a project file made read-only for others, say). */
async function copyModeOfExisting(finalPath: string, handle: FileHandle): Promise<void> {
  const st = await lstat(finalPath).catch(() => null);
  if (st?.isFile()) await handle.chmod(st.mode & 0o7777).catch(() => undefined);
}

async function writeChunks(handle: FileHandle, chunks: Iterable<OutputChunk> | AsyncIterable<OutputChunk>, signal: AbortSignal | undefined): Promise<void> {
  let pending = '';
  const flush = async (all: boolean): Promise<void> => {
    let text = pending;
    pending = '';
    // Never encode half of a surrogate pair split across chunks: keep a trailing high surrogate.
    const last = text.charCodeAt(text.length - 1);
    if (!all && last >= 0xd800 && last <= 0xdbff) {
      pending = text.slice(-1);
      text = text.slice(0, -1);
    }
    if (text.length > 0) await writeAll(handle, Buffer.from(text, 'utf8'));
  };
  // for await accepts sync iterables too; each write is awaited, which is the backpressure.
  for await (const chunk of chunks) {
    signal?.throwIfAborted();
    if (typeof chunk === 'string') {
      pending += chunk;
      if (pending.length >= COALESCE_CHARS) await flush(false);
    } else if (chunk instanceof Uint8Array) {
      await flush(true);
      await writeAll(handle, chunk);
    } else {
      throw new TypeError(`output chunk is a ${typeof chunk}; expected a string or a Uint8Array`);
    }
  }
  signal?.throwIfAborted();
  await flush(true);
}

async function writeAll(handle: FileHandle, bytes: Uint8Array): Promise<void> {
  let offset = 0;
  while (offset < bytes.byteLength) {
    const { bytesWritten } = await handle.write(bytes, offset, bytes.byteLength - offset, null);
    offset += bytesWritten;
  }
}

/** Makes the renames durable (POSIX); directories cannot be opened this way on Windows — ignored. */
async function syncDirectory(dir: string): Promise<void> {
  let h: FileHandle | null = null;
  try {
    h = await open(dir, 'r');
    await h.sync();
  } catch {
    // best effort
  } finally {
    await h?.close().catch(() => undefined);
  }
}
