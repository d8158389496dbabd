import { describe, it, expect } from 'vitest';
import { mkdtempSync, writeFileSync, existsSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { main } from '../../src/cli/main.ts';
import type { CliIo } from '../../src/cli/command.ts';

function capture(cwd = process.cwd()): CliIo & { stdout: string; stderr: string } {
  const io = {
    stdout: '',
    stderr: '',
    cwd,
    errIsTty: false,
    out: (t: string) => { io.stdout += t; },
    err: (t: string) => { io.stderr += t; },
  };
  return io;
}

describe('sunfacet command line', () => {
  it('prints help with every command and the cautions', async () => {
    const io = capture();
    expect(await main(['--help'], io)).toBe(0);
    for (const c of ['audit', 'merge', 'demo', 'day', 'sun', 'comfort']) expect(io.stdout).toContain(c);
    expect(io.stdout).toMatch(/does not certify/);
    const io2 = capture();
    expect(await main(['sun', '--help'], io2)).toBe(0);
    expect(io2.stdout).toMatch(/--lat/);
  });

  it('sun: the NREL SPA worked example', async () => {
    // source: Reda & Andreas 2004, Table A4.1 example: topocentric zenith 50.11162°, azimuth 194.34024°
    const io = capture();
    const code = await main(['sun', '--lat', '39.742476', '--lon', '-105.1786', '--time', '2003-10-17T12:30:30-07:00', '--json'], io);
    expect(code).toBe(0);
    const r = JSON.parse(io.stdout) as { altitudeDeg: number; azimuthDeg: number; zenithDeg: number };
    expect(Math.abs(r.zenithDeg - 50.11162)).toBeLessThan(0.02);
    expect(Math.abs(r.azimuthDeg - 194.34024)).toBeLessThan(0.02);
    expect(r.altitudeDeg + r.zenithDeg).toBeCloseTo(90, 3);
  });

  it('comfort: UTCI and category', async () => {
    // source: validation table ts_utci.json (REFERENCE-VALUES §2.1): Ta 30, Tmrt 27, RH 50, v10 1 → 29.6, moderate heat stress (±0.15, §2.4 caveat)
    const io = capture();
    expect(await main(['comfort', '--ta', '30', '--tmrt', '27', '--wind', '1', '--rh', '50', '--json'], io)).toBe(0);
    const r = JSON.parse(io.stdout) as { utciC: number; category: string };
    expect(Math.abs(r.utciC - 29.6)).toBeLessThan(0.15);
    expect(r.category).toBe('moderate-heat');
    const text = capture();
    expect(await main(['comfort', '--ta', '30', '--tmrt', '55', '--wind', '1.5', '--rh', '40'], text)).toBe(0);
    expect(text.stdout).toMatch(/UTCI \d+\.\d °C — .*heat stress/);
  });

  it('bad arguments exit 2 naming the argument and the range', async () => {
    const cases: [string[], RegExp][] = [
      [['sun', '--lat', '95', '--lon', '0', '--time', '2026-07-01T12:00:00Z'], /--lat.*\[-90, 90\]/],
      [['sun', '--lat', 'north', '--lon', '0', '--time', '2026-07-01T12:00:00Z'], /--lat.*not a number/],
      [['sun', '--lat', '45', '--lon', '0', '--time', '2026-07-01T12:00:00'], /--time.*offset/],
      [['sun', '--lat', '45', '--lon', '0'], /--time.*required/],
      [['comfort', '--ta', '30', '--tmrt', '55', '--wind', '0.2', '--rh', '40'], /--wind.*\[0\.5, 17\]/],
      [['comfort', '--ta', '30', '--tmrt', '120', '--wind', '1', '--rh', '40'], /--tmrt.*Tmrt − Ta in \(−30, 70\)/],
      [['comfort', '--ta', '30', '--tmrt', '40', '--wind', '1', '--rh', '140'], /--rh.*\[0, 100\]/],
      [['comfort', '--ta', '30', '--tmrt', '40', '--wind', '1', '--rh', '40', '--speed', '3'], /unknown option/],
    ];
    for (const [argv, msg] of cases) {
      const io = capture();
      expect(await main(argv, io), argv.join(' ')).toBe(2);
      expect(io.stderr, argv.join(' ')).toMatch(msg);
    }
    const io = capture();
    expect(await main(['fly'], io)).toBe(2);
    expect(io.stderr).toMatch(/unknown command/);
  });

  it('audit: a bad project key exits 2 with file and key path, and writes nothing', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunfacet-cli-'));
    const project = JSON.parse(readFileSync('public/demo/project.json', 'utf8')) as Record<string, unknown> & { zones: { spacingM: number }[] };
    project.zones[0]!.spacingM = -1;
    writeFileSync(path.join(dir, 'p.json'), JSON.stringify(project));
    const io = capture(dir);
    expect(await main(['audit', 'p.json', '--out', 'out'], io)).toBe(2);
    expect(io.stderr).toMatch(/p\.json: zones\[0\]\.spacingM: outside the valid range \(got -1\); expected a number in \[0\.1, 50\] m/);
    expect(existsSync(path.join(dir, 'out'))).toBe(false);
    const io2 = capture(dir);
    expect(await main(['audit', 'missing.json', '--out', 'out'], io2)).toBe(2);
    expect(io2.stderr).toMatch(/missing\.json: project file not found/);
  });

  it('day: the design-day table of the demo site', async () => {
    const io = capture();
    expect(await main(['day', 'public/demo/project.json', '--json'], io)).toBe(0);
    const r = JSON.parse(io.stdout) as { rows: { sunAltitudeDeg: number; wallSolAirC: number; airTempC: number; sunlitUtciC: number; shadedUtciC: number }[] };
    expect(r.rows).toHaveLength(24);
    for (const row of r.rows) {
      // common practice: in the sun a person is never cooler than in the shade, and a sunlit wall's sol-air exceeds the air
      expect(row.sunlitUtciC).toBeGreaterThanOrEqual(row.shadedUtciC - 1e-9);
      if (row.sunAltitudeDeg > 10) expect(row.wallSolAirC).toBeGreaterThan(row.airTempC);
    }
  });
});
