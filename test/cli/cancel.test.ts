import { describe, it, expect } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

describe('Ctrl-C during an audit', () => {
  it('stops the workers and writes nothing', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunfacet-cancel-'));
    const out = path.join(dir, 'out');
    const child = spawn(process.execPath, ['src/cli/sunfacet.mjs', 'demo', '--out', out, '--workers', '2'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    const t0 = Date.now();
    let sentAt = 0;
    child.stderr.on('data', (d: Buffer) => {
      stderr += d.toString();
      if (!sentAt && /sky seen by surfaces/.test(stderr)) {
        sentAt = Date.now();
        child.kill('SIGINT');
      }
    });
    const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    expect(sentAt, stderr).toBeGreaterThan(t0);
    expect(code, stderr).toBe(130);
    expect(stderr).toMatch(/nothing written/);
    expect(existsSync(out)).toBe(false);
    // the process (and its worker threads) ended promptly after the signal
    expect(Date.now() - sentAt).toBeLessThan(5000);
  }, 60000);
});
