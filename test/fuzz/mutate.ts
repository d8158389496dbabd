/**
 * Seeded mutators for the fuzz campaign: bytes (flips, truncation, splices), text lines
 * (duplicate, drop, swap, number replacement, field removal), JSON values (key deletion, type
 * swaps, number replacement, unknown keys) and GLB containers (mutate the JSON chunk as JSON and
 * re-pack it, or poke the binary chunk with bad floats and huge indices).
 *
 * Every mutator takes a `Rand` (a mulberry32 stream) and is deterministic from it.
 */

/** A uniform generator in [0, 1). */
export type Rand = () => number;

/** mulberry32 (a small 32-bit generator). */
export function makeRand(state: number): Rand {
  let a = state >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The stream for input `index` of a campaign with `campaignSeed` (each input replayable alone). */
export function randFor(campaignSeed: number, index: number): Rand {
  let h = (campaignSeed ^ 0x9e3779b9) >>> 0;
  h = Math.imul(h ^ index, 0x85ebca6b) >>> 0;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) >>> 0;
  return makeRand(h ^ (h >>> 16));
}

export const int = (r: Rand, n: number): number => Math.floor(r() * n);
export function pick<T>(r: Rand, xs: readonly T[]): T {
  return xs[int(r, xs.length)]!;
}

/** Numbers that break parsers: not finite, huge, negative zero, huge indices, off-by-one. */
export const NASTY_NUMBER_TEXT = [
  'NaN', 'nan', 'Infinity', '-Infinity', 'inf', '1e308', '-1e308', '1e309', '-0', '0', '-1', '1',
  '4294967295', '4294967296', '2147483648', '9007199254740993', '1e-320', '0x10', '1.5', '', '999999999', '3.4e38',
];
export const NASTY_NUMBERS: unknown[] = [NaN, Infinity, -Infinity, 1e308, -1e308, -0, 0, -1, 1, 0.5, 4294967295, 2 ** 31, 2 ** 53 + 2, 1e-320, 1e9, 65535, 65536, 255, 256];

// ---- bytes ---------------------------------------------------------------------------------

export function mutateBytes(r: Rand, input: Uint8Array): Uint8Array {
  const b = new Uint8Array(input);
  const n = r() < 0.5 ? 1 : 1 + int(r, 4);
  let out: Uint8Array = b;
  for (let k = 0; k < n; k++) out = mutateBytesOnce(r, out);
  return out;
}

function mutateBytesOnce(r: Rand, b: Uint8Array): Uint8Array {
  if (b.length === 0) return new Uint8Array([int(r, 256)]);
  switch (int(r, 8)) {
    case 0: { // flip bits
      const c = new Uint8Array(b);
      for (let i = 1 + int(r, 8); i > 0; i--) c[int(r, c.length)]! ^= 1 << int(r, 8);
      return c;
    }
    case 1: // truncate
      return b.slice(0, int(r, b.length));
    case 2: { // random byte values
      const c = new Uint8Array(b);
      for (let i = 1 + int(r, 4); i > 0; i--) c[int(r, c.length)] = pick(r, [0, 0xff, 0x7f, 0x80, int(r, 256)]);
      return c;
    }
    case 3: { // duplicate a slice
      const s = int(r, b.length), e = Math.min(b.length, s + 1 + int(r, 64));
      return concat(b.subarray(0, e), b.subarray(s, e), b.subarray(e));
    }
    case 4: { // remove a slice
      const s = int(r, b.length), e = Math.min(b.length, s + 1 + int(r, 64));
      return concat(b.subarray(0, s), b.subarray(e));
    }
    case 5: { // a 32-bit word set to a nasty value (lengths, offsets, counts, indices, floats)
      if (b.length < 4) return b.slice(0, 0);
      const c = new Uint8Array(b);
      const dv = new DataView(c.buffer);
      const at = int(r, c.length - 3) & ~(r() < 0.7 ? 3 : 0);
      if (r() < 0.5) dv.setUint32(at, pick(r, [0, 1, 0xffffffff, 0x7fffffff, 0x80000000, 1e6, 12345678]), true);
      else dv.setFloat32(at, pick(r, [NaN, Infinity, -Infinity, 3.4e38, -0, 1e30]), true);
      return c;
    }
    case 6: // append junk
      return concat(b, Uint8Array.from({ length: 1 + int(r, 32) }, () => int(r, 256)));
    default: { // insert junk
      const at = int(r, b.length);
      return concat(b.subarray(0, at), Uint8Array.from({ length: 1 + int(r, 8) }, () => int(r, 256)), b.subarray(at));
    }
  }
}

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

// ---- text lines ----------------------------------------------------------------------------

const NUMBER_TOKEN = /[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?/g;

/** Line-level and token-level mutations of a text file; `sep` splits fields (',' or whitespace). */
export function mutateText(r: Rand, text: string, sep: RegExp = /,/): string {
  let lines = text.split('\n');
  const n = r() < 0.5 ? 1 : 1 + int(r, 4);
  for (let k = 0; k < n; k++) lines = mutateLinesOnce(r, lines, sep);
  let out = lines.join('\n');
  if (r() < 0.1) out = out.replace(/\n/g, pick(r, ['\r\n', '\r']));
  if (r() < 0.05) out = '\ufeff' + out;
  return out;
}

function mutateLinesOnce(r: Rand, lines: string[], sep: RegExp): string[] {
  const L = lines.length;
  if (L === 0) return ['1,2,3'];
  const i = int(r, L);
  const out = lines.slice();
  switch (int(r, 10)) {
    case 0: out.splice(i, 0, lines[i]!); return out; // duplicate a line
    case 1: out.splice(i, 1 + int(r, 3)); return out; // remove lines
    case 2: { const j = int(r, L); out[i] = lines[j]!; out[j] = lines[i]!; return out; } // swap
    case 3: return out.slice(0, i + 1); // truncate after a line
    case 4: out[i] = lines[i]!.slice(0, int(r, lines[i]!.length + 1)); return out; // cut a line
    case 5: case 6: case 7: { // replace a number token
      const line = lines[i]!;
      const matches = [...line.matchAll(NUMBER_TOKEN)];
      if (matches.length === 0) { out[i] = line + pick(r, NASTY_NUMBER_TEXT); return out; }
      const m = pick(r, matches);
      out[i] = line.slice(0, m.index) + pick(r, NASTY_NUMBER_TEXT) + line.slice(m.index! + m[0].length);
      return out;
    }
    case 8: { // drop or duplicate a field
      const fields = lines[i]!.split(sep);
      const sepText = sep.source === ',' ? ',' : ' ';
      const f = int(r, fields.length);
      if (r() < 0.5) fields.splice(f, 1);
      else fields.splice(f, 0, fields[f]!);
      out[i] = fields.join(sepText);
      return out;
    }
    default: { // a stray character or an empty / blank line
      const line = lines[i]!;
      const at = int(r, line.length + 1);
      out[i] = line.slice(0, at) + pick(r, ['"', ',', '#', '\\', '\t', ' ', '\u0000', '\u00e9', '/', '-', 'e', '\ud800']) + line.slice(at);
      return out;
    }
  }
}

// ---- JSON ----------------------------------------------------------------------------------

type JsonValue = null | boolean | number | string | JsonValue[] | { [k: string]: JsonValue };

/** All container paths (objects and arrays) and leaf paths in a JSON value. */
function allPaths(v: unknown, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(path);
  if (Array.isArray(v)) v.forEach((x, i) => allPaths(x, [...path, i], out));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) allPaths(x, [...path, k], out);
  return out;
}

function getAt(root: unknown, path: (string | number)[]): unknown {
  let v = root;
  for (const k of path) v = (v as Record<string | number, unknown>)[k];
  return v;
}

const SWAPS: unknown[] = [null, true, false, 0, -1, '', 'x', '2.0', [], {}, [0, 0], { a: 1 }, 'NaN', '1e308', 1e308, -0, 2 ** 32, '../../etc/passwd', 'http://example.invalid/x.bin'];

/** Structural mutations of a parsed JSON value; returns the new JSON text (sometimes broken text). */
export function mutateJson(r: Rand, text: string): string {
  let root: unknown = JSON.parse(text);
  const n = r() < 0.6 ? 1 : 1 + int(r, 3);
  for (let k = 0; k < n; k++) root = mutateJsonOnce(r, root);
  const out = JSON.stringify(root, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? `__NUM${String(v)}__` : v));
  // Non-finite numbers as raw tokens (invalid JSON on purpose) or 1e999-style overflows.
  let s = out.replace(/"__NUM(NaN|Infinity|-Infinity)__"/g, (_m, x: string) => (r() < 0.5 ? x : x === 'NaN' ? '0' : x === 'Infinity' ? '1e999' : '-1e999'));
  if (r() < 0.15) s = mutateText(r, s, /,/);
  return s;
}

function mutateJsonOnce(r: Rand, root: unknown): unknown {
  const paths = allPaths(root);
  const path = pick(r, paths);
  const value = getAt(root, path);
  const parentPath = path.slice(0, -1);
  const key = path[path.length - 1];
  const parent = path.length > 0 ? getAt(root, parentPath) : undefined;
  const set = (v: unknown) => {
    if (path.length === 0) return v;
    (parent as Record<string | number, unknown>)[key!] = v;
    return root;
  };
  switch (int(r, 8)) {
    case 0: // delete the key / element
      if (path.length === 0) return root;
      if (Array.isArray(parent)) parent.splice(key as number, 1);
      else delete (parent as Record<string, unknown>)[key as string];
      return root;
    case 1: case 2: // a nasty number
      return set(pick(r, NASTY_NUMBERS));
    case 3: // swap the type
      return set(structuredClone(pick(r, SWAPS)));
    case 4: // numeric tweak of a number leaf
      if (typeof value === 'number') return set(pick(r, [value * 1000, -value, value + 1, value - 1, Math.floor(value * 1e6), value * 1e-6]));
      return set(pick(r, NASTY_NUMBERS));
    case 5: // duplicate an array element / copy another part of the document here
      if (Array.isArray(value) && value.length > 0) {
        value.push(structuredClone(value[int(r, value.length)]));
        return root;
      }
      return set(structuredClone(getAt(root, pick(r, paths)) as JsonValue));
    case 6: // an unknown key
      if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
        (value as Record<string, unknown>)[pick(r, ['extra', 'Name', 'polygn', '__proto__', 'constructor', 'uri'])] = pick(r, SWAPS);
        return root;
      }
      return set(structuredClone(pick(r, SWAPS)));
    default: // string tweaks
      if (typeof value === 'string') return set(pick(r, ['', ' ', value + value, value.toUpperCase(), value.slice(0, 1), '\u0000', 'ünïcode', value.replace(/\d/g, '9')]));
      return set(structuredClone(pick(r, SWAPS)));
  }
}

// ---- GLB -----------------------------------------------------------------------------------

/** Splits a well-formed GLB into its JSON text and BIN chunk (for the seeds only). */
export function splitGlb(glb: Uint8Array): { json: string; bin: Uint8Array } {
  const dv = new DataView(glb.buffer, glb.byteOffset, glb.byteLength);
  const jsonLen = dv.getUint32(12, true);
  const json = new TextDecoder().decode(glb.subarray(20, 20 + jsonLen)).replace(/\s+$/, '');
  const binStart = 20 + jsonLen;
  const binLen = binStart + 8 <= glb.length ? dv.getUint32(binStart, true) : 0;
  return { json, bin: glb.slice(binStart + 8, binStart + 8 + binLen) };
}

/** Packs JSON text and a BIN chunk into a GLB with correct lengths and padding. */
export function packGlb(json: string, bin: Uint8Array): Uint8Array {
  const jb = new TextEncoder().encode(json);
  const jl = (jb.length + 3) & ~3, bl = (bin.length + 3) & ~3;
  const total = 12 + 8 + jl + (bin.length > 0 ? 8 + bl : 0);
  const out = new Uint8Array(total);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, 0x46546c67, true);
  dv.setUint32(4, 2, true);
  dv.setUint32(8, total, true);
  dv.setUint32(12, jl, true);
  dv.setUint32(16, 0x4e4f534a, true);
  out.set(jb, 20);
  out.fill(0x20, 20 + jb.length, 20 + jl);
  if (bin.length > 0) {
    dv.setUint32(20 + jl, bl, true);
    dv.setUint32(24 + jl, 0x004e4942, true);
    out.set(bin, 28 + jl);
  }
  return out;
}

/** Typed-aware poke of a binary buffer: floats to NaN/huge, u16/u32 indices to huge values. */
export function mutateBinValues(r: Rand, bin: Uint8Array): Uint8Array {
  const c = new Uint8Array(bin);
  if (c.length < 4) return c;
  const dv = new DataView(c.buffer);
  for (let k = 1 + int(r, 3); k > 0; k--) {
    const at = int(r, c.length >> 1) * 2;
    const kind = int(r, 3);
    if (kind === 0 && at + 4 <= c.length) dv.setFloat32(at & ~3, pick(r, [NaN, Infinity, -Infinity, 3.4e38, -3.4e38, -0, 1e-45]), true);
    else if (kind === 1 && at + 2 <= c.length) dv.setUint16(at, pick(r, [0xffff, 0xfffe, 8, 9, 255]), true);
    else if (at + 4 <= c.length) dv.setUint32(at & ~3, pick(r, [0xffffffff, 0x80000000, 1e8]), true);
  }
  return c;
}

/** One GLB mutation: structural (JSON chunk as JSON), binary values, or raw container bytes. */
export function mutateGlb(r: Rand, glb: Uint8Array): Uint8Array {
  const { json, bin } = splitGlb(glb);
  const mode = int(r, 10);
  if (mode < 4) return packGlb(mutateJson(r, json), bin);
  if (mode < 6) return packGlb(json, mutateBinValues(r, bin));
  if (mode < 7) return packGlb(mutateJson(r, json), mutateBinValues(r, bin));
  return mutateBytes(r, glb);
}
