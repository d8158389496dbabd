import { describe, it, expect, beforeEach, afterEach } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync, readFileSync, readdirSync, mkdirSync, chmodSync, statSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { writeOutputsAtomically, writeFileAtomically } from '../../src/cli/output.ts';

let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'sunfacet-output-'));
});
afterEach(() => {
  rmSync(dir, { recursive: true, force: true });
});

const read = (name: string): string => readFileSync(join(dir, name), 'utf8');
const listing = (d = dir): string[] => readdirSync(d).sort();

describe('writeOutputsAtomically', () => {
  it('writes all files from sync and async chunk sources, strings and bytes, creating the directory', async () => {
    const out = join(dir, 'a', 'b');
    async function* slow(): AsyncGenerator<string> {
      for (let i = 0; i < 5; i++) {
        await new Promise((r) => setTimeout(r, 1));
        yield `line ${i}\n`;
      }
    }
    await writeOutputsAtomically(out, [
      { name: 'results.json', chunks: ['{"a":', '1}'] },
      { name: 'bytes.bin', chunks: [new Uint8Array([1, 2, 3]), 'é', new Uint8Array([255])] },
      { name: 'slow.txt', chunks: slow() },
    ]);
    expect(listing(out)).toEqual(['bytes.bin', 'results.json', 'slow.txt']);
    expect(readFileSync(join(out, 'results.json'), 'utf8')).toBe('{"a":1}');
    expect([...readFileSync(join(out, 'bytes.bin'))]).toEqual([1, 2, 3, 0xc3, 0xa9, 255]);
    expect(readFileSync(join(out, 'slow.txt'), 'utf8')).toBe('line 0\nline 1\nline 2\nline 3\nline 4\n');
  });

  it('keeps a surrogate pair whole when it is split across chunks at a flush boundary', async () => {
    const big = 'a'.repeat(300_000);
    await writeOutputsAtomically(dir, [{ name: 'emoji.txt', chunks: [big + '\ud83d', '\ude00 ok'] }]);
    expect(read('emoji.txt')).toBe(big + '😀 ok');
  });

  it('replaces previous files only when every new file is complete', async () => {
    writeFileSync(join(dir, 'results.json'), 'old results');
    writeFileSync(join(dir, 'summary.json'), 'old summary');
    await writeOutputsAtomically(dir, [
      { name: 'results.json', chunks: ['new results'] },
      { name: 'summary.json', chunks: ['new summary'] },
    ]);
    expect(read('results.json')).toBe('new results');
    expect(read('summary.json')).toBe('new summary');
    expect(listing()).toEqual(['results.json', 'summary.json']); // no temporaries, no backups
  });

  it('on an abort midway leaves the old files intact and no temporaries', async () => {
    writeFileSync(join(dir, 'results.json'), 'old results');
    writeFileSync(join(dir, 'sensors.csv'), 'old sensors');
    const ac = new AbortController();
    let produced = 0;
    function* chunks(): Generator<string> {
      for (let i = 0; i < 1000; i++) {
        produced++;
        if (i === 50) ac.abort();
        yield 'x'.repeat(100_000);
      }
    }
    const p = writeOutputsAtomically(dir, [
      { name: 'results.json', chunks: ['complete new results'] },
      { name: 'sensors.csv', chunks: chunks() },
      { name: 'surfaces.csv', chunks: ['never written'] },
    ], { signal: ac.signal });
    await expect(p).rejects.toMatchObject({ name: 'AbortError' });
    expect(produced).toBeLessThan(60); // it stopped pulling chunks
    expect(read('results.json')).toBe('old results');
    expect(read('sensors.csv')).toBe('old sensors');
    expect(listing()).toEqual(['results.json', 'sensors.csv']);
  });

  it('on an error from a chunk source leaves the old files intact and no temporaries', async () => {
    writeFileSync(join(dir, 'results.json'), 'old');
    async function* failing(): AsyncGenerator<string> {
      yield 'partial';
      throw new Error('stage blew up');
    }
    await expect(writeOutputsAtomically(dir, [
      { name: 'summary.json', chunks: ['{}'] },
      { name: 'results.json', chunks: failing() },
    ])).rejects.toThrow('stage blew up');
    expect(listing()).toEqual(['results.json']);
    expect(read('results.json')).toBe('old');
  });

  it('does nothing for an already-aborted signal, and refuses bad names and a directory in the way', async () => {
    writeFileSync(join(dir, 'keep.txt'), 'kept');
    await expect(writeOutputsAtomically(dir, [{ name: 'keep.txt', chunks: ['no'] }], { signal: AbortSignal.abort() })).rejects.toMatchObject({ name: 'AbortError' });
    await expect(writeOutputsAtomically(dir, [{ name: '../x', chunks: [''] }])).rejects.toThrow(/plain file name/);
    await expect(writeOutputsAtomically(dir, [{ name: 'a', chunks: [''] }, { name: 'a', chunks: [''] }])).rejects.toThrow(/twice/);
    mkdirSync(join(dir, 'results.json'));
    await expect(writeOutputsAtomically(dir, [
      { name: 'keep.txt', chunks: ['replaced?'] },
      { name: 'results.json', chunks: ['{}'] },
    ])).rejects.toThrow(/directory/);
    expect(read('keep.txt')).toBe('kept'); // nothing was renamed
    expect(listing()).toEqual(['keep.txt', 'results.json']);
  });

  it.skipIf(process.platform === 'win32')('keeps the permissions of the file it replaces', async () => {
    const p = join(dir, 'project.json');
    writeFileSync(p, '{}');
    chmodSync(p, 0o640);
    await writeFileAtomically(p, '{"name":"x"}');
    expect(statSync(p).mode & 0o777).toBe(0o640);
    expect(readFileSync(p, 'utf8')).toBe('{"name":"x"}');
  });
});

describe('writeFileAtomically', () => {
  it('writes a string, bytes or chunks (not iterating a string or bytes element-wise)', async () => {
    await writeFileAtomically(join(dir, 's.txt'), 'hello');
    await writeFileAtomically(join(dir, 'b.bin'), new Uint8Array([104, 105]));
    await writeFileAtomically(join(dir, 'c.txt'), ['a', 'b', 'c']);
    expect(read('s.txt')).toBe('hello');
    expect(read('b.bin')).toBe('hi');
    expect(read('c.txt')).toBe('abc');
    expect(listing()).toEqual(['b.bin', 'c.txt', 's.txt']);
  });

  it('survives a kill -9 of the writing process: the previous file is intact, and the next write cleans up', async () => {
    const target = join(dir, 'project.json');
    const old = JSON.stringify({ name: 'previous version', padding: 'p'.repeat(10_000) });
    writeFileSync(target, old);
    const moduleUrl = pathToFileURL(fileURLToPath(new URL('../../src/cli/output.ts', import.meta.url))).href;
    // The child writes ~1 GB slowly through writeFileAtomically and says when it is mid-write.
    const code = `
      const { writeFileAtomically } = await import(${JSON.stringify(moduleUrl)});
      async function* chunks() {
        for (let i = 0; i < 16000; i++) {
          if (i === 40) process.stdout.write('mid-write\\n');
          if (i > 40) await new Promise((r) => setTimeout(r, 2));
          yield 'y'.repeat(65536);
        }
      }
      await writeFileAtomically(${JSON.stringify(target)}, chunks());
      process.stdout.write('finished\\n');
    `;
    const cwd = fileURLToPath(new URL('../..', import.meta.url));
    const child = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', code], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
    const exited = new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_c, sig) => resolve(sig)));
    const temp = (): string | undefined => readdirSync(dir).find((f) => f.endsWith('.tmp'));
    try {
      await new Promise<void>((resolve, reject) => {
        let out = '';
        child.stdout.on('data', (d: Buffer) => {
          out += d.toString();
          if (out.includes('finished')) reject(new Error('child finished before it was killed'));
          if (out.includes('mid-write')) resolve();
        });
        child.on('exit', () => reject(new Error(`child exited early: ${stderr}`)));
      });
      // Wait until the temporary has real content, so the kill lands in the middle of the write.
      for (let i = 0; i < 200 && !(temp() && statSync(join(dir, temp()!)).size > 1_000_000); i++) await new Promise((r) => setTimeout(r, 10));
      expect(temp()).toBeDefined();
      expect(statSync(join(dir, temp()!)).size).toBeGreaterThan(1_000_000);
      child.kill('SIGKILL');
      expect(await exited).toBe('SIGKILL');
    } finally {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    }

    expect(readFileSync(target, 'utf8')).toBe(old);
    expect(temp()).toBeDefined(); // a killed process cannot clean up...
    await writeFileAtomically(target, 'next');
    expect(readFileSync(target, 'utf8')).toBe('next');
    expect(temp()).toBeUndefined(); // ...the next write of the same name removes its leftover
    expect(existsSync(target)).toBe(true);
    expect(listing()).toEqual(['project.json']);
  }, 30_000);
});
