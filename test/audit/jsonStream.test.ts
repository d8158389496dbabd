import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { resultsJsonChunks, jsonChunks, JSON_CHUNK_CHARS } from '../../src/audit/jsonStream.ts';
import type { Results } from '../../src/audit/results.ts';

// Invented data: these tests check serialisation, not physics.

function example(steps: number, patches: number): Results {
  const times = Array.from({ length: steps }, (_, t) => `2026-07-21T${String(t % 24).padStart(2, '0')}:00:00+02:00`);
  return {
    sunfacet: 1,
    project: 'Café "Zon", terrace — ☀ 😀',
    timeConvention: 'interval midpoint',
    times,
    sun: times.map((_, t) => ({ altitudeDeg: -12.3 + t * 0.1, azimuthDeg: 1.2 + t })),
    weather: {
      airTempC: times.map((_, t) => 18 + t / 3), relativeHumidityPct: times.map(() => 50), windMs: times.map(() => 2),
      dniWm2: times.map(() => 0), dhiWm2: times.map(() => -0), ghiWm2: times.map(() => NaN), skyLongwaveWm2: times.map(() => 1e-7),
    },
    zones: [{
      name: 'patio\n"a"', posture: 'standing', sensorHeightM: 1.1, droppedSensors: 1,
      sensors: [{ position: [1, 2, 1.1], skyViewFactor: 0.83, sunlit: times.map((_, t) => t % 3 === 0), mrtC: times.map((_, t) => 20 + Math.sin(t)), utciC: times.map(() => Infinity), category: times.map(() => 'no-stress' as const) }],
    }],
    surfaces: Array.from({ length: patches }, (_, i) => ({
      id: `wall-${i}`, surface: 'wall', material: 'concrete', centroid: [i, 0.1, 3] as [number, number, number], normal: [0, -1, 0] as [number, number, number], areaM2: 0.9,
      incidentShortwaveWm2: times.map((_, t) => (t * 37.1 + i) % 900), surfaceTempC: times.map((_, t) => 25 + t / 7 + i / 1000), longwaveEmissionWm2: times.map(() => 1.23e21),
    })),
    warnings: ['sensor 3 of "patio" inside geometry; dropped'],
    run: { version: '0.1.0', when: new Date(Date.UTC(2026, 6, 21)), missing: undefined, rayCount: 42 },
  };
}

describe('resultsJsonChunks', () => {
  it('writes exactly JSON.stringify(results), NaN/Infinity as null, -0 as 0', () => {
    const r = example(30, 5);
    const text = [...resultsJsonChunks(r)].join('');
    expect(text).toBe(JSON.stringify(r));
    const back = JSON.parse(text) as Results;
    expect(back.weather.ghiWm2[0]).toBeNull();
    expect(back.zones[0]!.sensors[0]!.utciC[0]).toBeNull();
    expect(text).toContain('"dhiWm2":[0,0');
    expect(back).toEqual(JSON.parse(JSON.stringify(r)));
  });

  it('yields bounded chunks for a large result and still equals JSON.stringify', () => {
    const r = example(8760, 30); // a year of hours on 30 patches: about 8 MB
    const chunks = [...resultsJsonChunks(r)];
    expect(chunks.length).toBeGreaterThan(10);
    // a chunk may run past the target by one block of 2048 numbers (~40 kB)
    for (const c of chunks) expect(c.length).toBeLessThan(JSON_CHUNK_CHARS + 64 * 1024);
    expect(chunks.join('')).toBe(JSON.stringify(r));
  });
});

describe('jsonChunks', () => {
  it('matches JSON.stringify on the awkward cases', () => {
    const cases: unknown[] = [
      null, 0, -0, 1.5e-300, 'x', true, [], {}, [undefined, () => 1, Symbol('s')],
      { a: undefined, b: () => 1, c: 1 }, { toJSON: (k: string) => `key=${k}` }, [{ toJSON: (k: string) => `key=${k}` }],
      new Date(0), Object(3), Object('s'), Object(false), { '"quoted" key\n': 1 }, '\ud800 lone surrogate', new Float32Array([1.5, 2]),
      new Map([[1, 2]]), { nested: { deeper: [[[1]], { x: [NaN, -Infinity] }] } },
    ];
    for (const v of cases) expect([...jsonChunks(v, 3)].join('')).toBe(JSON.stringify(v) ?? '');
  });

  it('throws like JSON.stringify on a cycle and a BigInt', () => {
    const a: Record<string, unknown> = {};
    a.self = a;
    expect(() => [...jsonChunks(a)]).toThrow(TypeError);
    expect(() => [...jsonChunks({ n: 1n })]).toThrow(TypeError);
    // The same object twice (not a cycle) is fine.
    const shared = { v: 1 };
    expect([...jsonChunks([shared, shared])].join('')).toBe('[{"v":1},{"v":1}]');
  });

  it('equals JSON.stringify for arbitrary values and chunk sizes (property)', () => {
    fc.assert(
      fc.property(fc.anything({ withBoxedValues: true, withDate: true, withNullPrototype: true, withSparseArray: true, withTypedArray: true }), fc.integer({ min: 1, max: 64 }), (v, n) => {
        expect([...jsonChunks(v, n)].join('')).toBe(JSON.stringify(v) ?? '');
      }),
      { numRuns: 500 },
    );
  });
});
