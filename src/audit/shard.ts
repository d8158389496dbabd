/**
 * Scale-out: a shard traces a slice of the receivers (patches and sensors, not time — the
 * conduction needs time in order) and writes its geometry partial; `mergeGeometry` joins the
 * partials of all N shards back into the geometry of the whole model, and the merge step then runs
 * the (cheap) time stepping once, so the merged result equals the single run exactly.
 *
 * Partial file format (ours): "SFGP" magic, u32 version 1, u32 header length, a UTF-8 JSON header
 * (meta + a table of arrays: name, type, byte offset, length), then the arrays' bytes, each at an
 * 8-byte-aligned offset.
 */
import type { GeometryData } from './stages/geometryPass.ts';
import type { SurfaceViewsResult } from '../trace/queries/surfaceViews.ts';
import { InputError } from '../physics/errors.ts';

export interface PartialMeta {
  /** Identifies the project: hash of the project text and of the model bytes. */
  projectHash: string;
  shard: { index: number; count: number };
  patchCount: number;
  sensorCount: number;
  stepCount: number;
}

type Typed = Float32Array | Uint8Array | Uint32Array | Int32Array;
const CTORS = { Float32Array, Uint8Array, Uint32Array, Int32Array } as const;
type CtorName = keyof typeof CTORS;

function viewsArrays(prefix: string, v: SurfaceViewsResult): [string, Typed][] {
  return [
    [`${prefix}.rowStart`, v.rowStart], [`${prefix}.patchIndex`, v.patchIndex], [`${prefix}.fraction`, v.fraction],
    [`${prefix}.skyFraction`, v.skyFraction], [`${prefix}.groundFraction`, v.groundFraction], [`${prefix}.otherFraction`, v.otherFraction],
  ];
}

export function encodeGeometryPartial(geo: GeometryData, meta: PartialMeta): Uint8Array {
  const arrays: [string, Typed][] = [
    ['sunIndexOfStep', geo.sunIndexOfStep], ['patchSun', geo.patchSun], ['sensorSun', geo.sensorSun],
    ['patchSkyBand', geo.patchSkyBand], ['sensorSkyBand', geo.sensorSkyBand], ['sensorSkyViewFactor', geo.sensorSkyViewFactor],
    ...viewsArrays('patchViews', geo.patchViews), ...viewsArrays('sensorViews', geo.sensorViews),
    ...(geo.patchSunTransmittance ? [['patchSunTransmittance', geo.patchSunTransmittance] as [string, Typed]] : []),
    ...(geo.sensorSunTransmittance ? [['sensorSunTransmittance', geo.sensorSunTransmittance] as [string, Typed]] : []),
  ];
  let offset = 0;
  const table = arrays.map(([name, a]) => {
    offset = Math.ceil(offset / 8) * 8;
    const entry = { name, type: a.constructor.name as CtorName, offset, length: a.length };
    offset += a.byteLength;
    return entry;
  });
  const header = new TextEncoder().encode(JSON.stringify({
    meta, sunCount: geo.sunCount, bandCount: geo.bandCount, slice: geo.slice,
    directions: [geo.patchViews.directionsPerReceiver, geo.sensorViews.directionsPerReceiver], table,
  }));
  const start = Math.ceil((12 + header.length) / 8) * 8;
  const out = new Uint8Array(start + offset);
  const dv = new DataView(out.buffer);
  out.set([0x53, 0x46, 0x47, 0x50]); // "SFGP"
  dv.setUint32(4, 1, true);
  dv.setUint32(8, header.length, true);
  out.set(header, 12);
  arrays.forEach(([, a], i) => out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), start + table[i]!.offset));
  return out;
}

export function decodeGeometryPartial(bytes: Uint8Array, file: string): { geo: GeometryData; meta: PartialMeta } {
  const fail = (problem: string): never => {
    throw new InputError({ file, problem, expected: 'a geometry partial written by `sunfacet audit --shard K/N`' });
  };
  if (bytes.length < 12 || bytes[0] !== 0x53 || bytes[1] !== 0x46 || bytes[2] !== 0x47 || bytes[3] !== 0x50) fail('not a Sunfacet geometry partial');
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (dv.getUint32(4, true) !== 1) fail(`unsupported partial version ${dv.getUint32(4, true)}`);
  const hl = dv.getUint32(8, true);
  if (12 + hl > bytes.length) fail('truncated header');
  let h: { meta: PartialMeta; sunCount: number; bandCount: number; slice: GeometryData['slice']; directions: [number, number]; table: { name: string; type: CtorName; offset: number; length: number }[] };
  try {
    h = JSON.parse(new TextDecoder().decode(bytes.subarray(12, 12 + hl)));
  } catch {
    return fail('unreadable header');
  }
  const start = Math.ceil((12 + hl) / 8) * 8;
  const get = new Map<string, Typed>();
  for (const e of h.table) {
    const C = CTORS[e.type];
    if (!C) fail(`unknown array type ${e.type}`);
    const byteStart = start + e.offset;
    const byteLen = e.length * C.BYTES_PER_ELEMENT;
    if (byteStart + byteLen > bytes.length) fail(`truncated array ${e.name}`);
    const copy = bytes.slice(byteStart, byteStart + byteLen);
    get.set(e.name, new C(copy.buffer, 0, e.length));
  }
  const need = <T extends Typed>(name: string): T => (get.get(name) as T | undefined) ?? fail(`missing array ${name}`);
  const views = (prefix: string, d: number): SurfaceViewsResult => ({
    directionsPerReceiver: d,
    rowStart: need(`${prefix}.rowStart`), patchIndex: need(`${prefix}.patchIndex`), fraction: need(`${prefix}.fraction`),
    skyFraction: need(`${prefix}.skyFraction`), groundFraction: need(`${prefix}.groundFraction`), otherFraction: need(`${prefix}.otherFraction`),
  });
  return {
    meta: h.meta,
    geo: {
      sunIndexOfStep: need('sunIndexOfStep'), sunCount: h.sunCount, patchSun: need('patchSun'), sensorSun: need('sensorSun'),
      bandCount: h.bandCount, patchSkyBand: need('patchSkyBand'), sensorSkyBand: need('sensorSkyBand'), sensorSkyViewFactor: need('sensorSkyViewFactor'),
      patchViews: views('patchViews', h.directions[0]), sensorViews: views('sensorViews', h.directions[1]), slice: h.slice, timings: {},
      ...(get.has('patchSunTransmittance') ? { patchSunTransmittance: need<Float32Array>('patchSunTransmittance') } : {}),
      ...(get.has('sensorSunTransmittance') ? { sensorSunTransmittance: need<Float32Array>('sensorSunTransmittance') } : {}),
    },
  };
}

/** Joins partials (any order) that together cover every patch and sensor exactly once. */
export function mergeGeometry(parts: { geo: GeometryData; meta: PartialMeta; file: string }[]): GeometryData {
  if (parts.length === 0) throw new InputError({ problem: 'no partials to merge', expected: 'the output folders of all N shards' });
  const m0 = parts[0]!.meta;
  for (const p of parts) {
    if (p.meta.projectHash !== m0.projectHash) throw new InputError({ file: p.file, problem: 'partial of a different project or model', expected: `partials of one project (${m0.projectHash})`, value: p.meta.projectHash });
    if (p.meta.shard.count !== m0.shard.count) throw new InputError({ file: p.file, problem: 'partial of a different shard count', expected: `shards of ${m0.shard.count}`, value: p.meta.shard.count });
  }
  const sorted = [...parts].sort((a, b) => a.meta.shard.index - b.meta.shard.index);
  const idx = sorted.map((p) => p.meta.shard.index);
  const want = Array.from({ length: m0.shard.count }, (_, i) => i + 1);
  if (idx.join(',') !== want.join(',')) {
    throw new InputError({ problem: `shards present: ${idx.join(', ')}`, place: 'merge', expected: `each of shards 1..${m0.shard.count} exactly once` });
  }
  const geos = sorted.map((p) => p.geo);
  const g0 = geos[0]!;
  const cat = <T extends Typed>(pick: (g: GeometryData) => T): T => {
    const arrays = geos.map(pick);
    const n = arrays.reduce((a, x) => a + x.length, 0);
    const C = arrays[0]!.constructor as new (n: number) => T;
    const out = new C(n);
    let o = 0;
    for (const a of arrays) {
      (out as unknown as { set(a: ArrayLike<number>, o: number): void }).set(a, o);
      o += a.length;
    }
    return out;
  };
  const catViews = (pick: (g: GeometryData) => SurfaceViewsResult): SurfaceViewsResult => {
    const vs = geos.map(pick);
    const rows = vs.reduce((a, v) => a + v.rowStart.length - 1, 0);
    const rowStart = new Uint32Array(rows + 1);
    let r = 0, at = 0;
    for (const v of vs) {
      const n = v.rowStart.length - 1;
      for (let i = 0; i < n; i++) rowStart[r + i] = v.rowStart[i]! + at;
      r += n;
      at += v.patchIndex.length;
    }
    rowStart[rows] = at;
    return {
      directionsPerReceiver: vs[0]!.directionsPerReceiver, rowStart,
      patchIndex: cat((g) => pick(g).patchIndex), fraction: cat((g) => pick(g).fraction),
      skyFraction: cat((g) => pick(g).skyFraction), groundFraction: cat((g) => pick(g).groundFraction), otherFraction: cat((g) => pick(g).otherFraction),
    };
  };
  return {
    sunIndexOfStep: g0.sunIndexOfStep, sunCount: g0.sunCount, bandCount: g0.bandCount,
    patchSun: cat((g) => g.patchSun), sensorSun: cat((g) => g.sensorSun),
    patchSkyBand: cat((g) => g.patchSkyBand), sensorSkyBand: cat((g) => g.sensorSkyBand), sensorSkyViewFactor: cat((g) => g.sensorSkyViewFactor),
    patchViews: catViews((g) => g.patchViews), sensorViews: catViews((g) => g.sensorViews),
    ...(g0.patchSunTransmittance ? { patchSunTransmittance: cat((g) => g.patchSunTransmittance!) } : {}),
    ...(g0.sensorSunTransmittance ? { sensorSunTransmittance: cat((g) => g.sensorSunTransmittance!) } : {}),
    slice: { patches: [0, m0.patchCount], sensors: [0, m0.sensorCount] },
    timings: {},
  };
}
