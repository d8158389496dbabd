/**
 * Inputs outside the physics' validity are refused with the range, or clamped with a flag in the
 * output — never passed through silently (issue 9): negative albedo and emissivity > 1 in material
 * overrides, zero wind (clamped for UTCI, warned in the results), the sun below the horizon (no
 * beam on anything), UTCI inputs beyond the polynomial's range (clamped and flagged).
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { resolveMaterial } from '../../src/physics/materials.ts';
import { utciClampedC } from '../../src/physics/utci.ts';
import { InputError } from '../../src/physics/errors.ts';
import { parseProjectText } from '../../src/audit/project.ts';
import { loadProject } from '../../src/audit/load.ts';
import { runAudit } from '../../src/audit/pipeline.ts';

const boxObj = readFileSync(fileURLToPath(new URL('../fixtures/models/box.obj', import.meta.url)));

function project(over: { windMs?: number; start?: string; end?: string; materials?: unknown; groundZ?: number } = {}): Record<string, unknown> {
  return {
    sunfacet: 1,
    site: { latitudeDeg: 45, longitudeDeg: 8, timeZone: '+02:00' },
    model: { file: 'box.obj' },
    ...(over.materials !== undefined ? { materials: over.materials } : {}),
    ground: { z: over.groundZ ?? 0 },
    zones: [{ name: 'side', polygon: [[-3, -3], [5, -3], [5, -0.5], [-3, -0.5]], spacingM: 2 }],
    period: { start: over.start ?? '2026-07-21T12:00:00+02:00', end: over.end ?? '2026-07-21T13:00:00+02:00', stepMinutes: 60 },
    weather: { source: 'clear-sky', airTempC: 28, relativeHumidityPct: 40, windMs: over.windMs ?? 2 },
    sampling: { skyRaysPerPatch: 1, viewRays: 4 },
  };
}

function thrown(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

async function audit(p: Record<string, unknown>) {
  const loaded = await loadProject(JSON.stringify(p), 'limits.json', async () => new Uint8Array(boxObj));
  return runAudit(loaded);
}

describe('physics validity: refused with the range', () => {
  it('a negative albedo override is refused with the range [0, 1]', () => {
    const e = thrown(() => resolveMaterial({ preset: 'concrete-light', albedo: -0.1 }, 'materials.wall', 'p.json'));
    expect(e.message).toMatch(/^p\.json: materials\.wall\.albedo: .*-0\.1.*\[0, 1\]/);
  });

  it('an emissivity above 1 is refused, in the material call and through the project validator', () => {
    const e = thrown(() => resolveMaterial({ preset: 'concrete-light', emissivity: 1.2 }, 'materials.wall'));
    expect(e.message).toMatch(/materials\.wall\.emissivity/);
    expect(e.message).toMatch(/1\.2/);
    const p = thrown(() => parseProjectText(JSON.stringify(project({ materials: { box: { preset: 'concrete-light', emissivity: 1.5 } } })), 'limits.json'));
    expect(p.message).toMatch(/^limits\.json: materials\["box"\]\.emissivity/);
    // An emissivity of 0 cannot radiate: refused too (no surface is a perfect mirror in the infrared).
    thrown(() => resolveMaterial({ preset: 'concrete-light', emissivity: 0 }, 'm'));
  });

  it('a ground plane kilometres from the model is refused (it would size the ground apron)', () => {
    const e = thrown(() => parseProjectText(JSON.stringify(project({ groundZ: -1e308 })), 'limits.json'));
    expect(e.message).toMatch(/^limits\.json: ground\.z: outside the valid range .*\[-1000, 1000\] m/);
  });

  it('a negative wind speed is refused by the project validator', () => {
    const e = thrown(() => parseProjectText(JSON.stringify(project({ windMs: -1 })), 'limits.json'));
    expect(e.message).toMatch(/weather\.windMs/);
  });
});

describe('physics validity: clamped with a flag', () => {
  it('UTCI clamps wind below 0.5 m/s and air temperature above 50 °C, and says which', () => {
    // source: Bröde et al. 2012, Int J Biometeorol 56:481–494 — the polynomial's validity: v10 0.5–17 m/s, Ta −50..+50 °C
    const r = utciClampedC({ airTempC: 55, mrtC: 60, wind10mMs: 0, relativeHumidityPct: 30 });
    expect(r.clamped).toBe(true);
    expect(r.clampedInputs).toContain('wind10mMs');
    expect(r.clampedInputs).toContain('airTempC');
    const inRange = utciClampedC({ airTempC: 25, mrtC: 30, wind10mMs: 2, relativeHumidityPct: 50 });
    expect(inRange.clamped).toBe(false);
  });

  it('zero wind runs, and the results warn that UTCI was clamped (wind), with a finite UTCI', async () => {
    const res = await audit(project({ windMs: 0 }));
    const w = res.warnings.join('\n');
    expect(w).toMatch(/UTCI inputs outside the polynomial's validity were clamped in \d+ sensor-steps \(.*wind10mMs/);
    for (const z of res.zones) for (const s of z.sensors) for (const u of s.utciC) expect(Number.isFinite(u)).toBe(true);
    // With 2 m/s the same project has no clamping warning: the flag is not always on.
    const calm = await audit(project({ windMs: 2 }));
    expect(calm.warnings.join('\n')).not.toMatch(/wind10mMs/);
  }, 30_000);

  it('with the sun below the horizon there is no beam: nothing sunlit, DNI 0', async () => {
    // 45° N, 8° E on 21 July at 02:00 and 03:00 (+02:00): the sun is well below the horizon.
    const res = await audit(project({ start: '2026-07-21T02:00:00+02:00', end: '2026-07-21T03:00:00+02:00' }));
    for (const s of res.sun) expect(s.altitudeDeg).toBeLessThan(-10); // geometry: at solar midnight the altitude is −(90° − φ − δ) ≈ −24.6° (φ 45°, δ ≈ +20.4° on 21 July, from memory)
    expect(res.weather.dniWm2).toEqual([0, 0]);
    for (const z of res.zones) for (const s of z.sensors) expect(s.sunlit).toEqual([false, false]);
    for (const sf of res.surfaces) for (const q of sf.incidentShortwaveWm2) expect(q).toBe(0);
  }, 30_000);
});
