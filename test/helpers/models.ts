/**
 * Small invented models for the geometry tests: boxes as OBJ text, as glTF written by
 * @gltf-transform/core (an independent writer), and a raw glTF/GLB assembler for hand-made and
 * deliberately broken files.
 */
import { Document, WebIO } from '@gltf-transform/core';

/** Corners of the box [x0,x1]×[y0,y1]×[z0,z1] (z up) and its 6 faces as outward CCW quads. */
export function boxCornersZUp(x0: number, y0: number, z0: number, x1: number, y1: number, z1: number): { v: number[][]; quads: number[][] } {
  const v = [
    [x0, y0, z0], [x1, y0, z0], [x1, y1, z0], [x0, y1, z0],
    [x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1],
  ];
  const quads = [
    [0, 3, 2, 1], // bottom (−z)
    [4, 5, 6, 7], // top (+z)
    [0, 1, 5, 4], // south (−y)
    [1, 2, 6, 5], // east (+x)
    [2, 3, 7, 6], // north (+y)
    [3, 0, 4, 7], // west (−x)
  ];
  return { v, quads };
}

/** An OBJ (z up) of a box, quads, object name `box`, material `concrete`. */
export function boxObj(size: [number, number, number], origin: [number, number, number] = [0, 0, 0], name = 'box'): string {
  const [x0, y0, z0] = origin;
  const { v, quads } = boxCornersZUp(x0, y0, z0, x0 + size[0], y0 + size[1], z0 + size[2]);
  const lines = ['# invented test box', 'mtllib box.mtl', `o ${name}`, 'usemtl concrete'];
  for (const p of v) lines.push(`v ${p[0]} ${p[1]} ${p[2]}`);
  lines.push('vn 0 0 1', 'vt 0 0');
  for (const q of quads) lines.push(`f ${q.map((i) => `${i + 1}/1/1`).join(' ')}`);
  return lines.join('\n') + '\n';
}

/**
 * The same box as a glTF document (Y up): engine (x, y, z) = glTF (x, −z, y), so glTF positions
 * are (x, z, −y). Triangles, indexed, node `box`, material `concrete`.
 */
export function boxGltfDocument(size: [number, number, number], origin: [number, number, number] = [0, 0, 0]): Document {
  const [x0, y0, z0] = origin;
  const { v, quads } = boxCornersZUp(x0, y0, z0, x0 + size[0], y0 + size[1], z0 + size[2]);
  const doc = new Document();
  const buf = doc.createBuffer('data');
  const pos = new Float32Array(v.flatMap((p) => [p[0]!, p[2]!, -p[1]!]));
  const idx = new Uint16Array(quads.flatMap((q) => [q[0]!, q[1]!, q[2]!, q[0]!, q[2]!, q[3]!]));
  const prim = doc
    .createPrimitive()
    .setAttribute('POSITION', doc.createAccessor().setType('VEC3').setArray(pos).setBuffer(buf))
    .setIndices(doc.createAccessor().setType('SCALAR').setArray(idx).setBuffer(buf))
    .setMaterial(doc.createMaterial('concrete'));
  const mesh = doc.createMesh('boxMesh').addPrimitive(prim);
  doc.createScene('scene').addChild(doc.createNode('box').setMesh(mesh));
  return doc;
}

export async function writeGlb(doc: Document): Promise<Uint8Array> {
  return new WebIO().writeBinary(doc);
}

/** .gltf JSON bytes plus its external resources (uri → bytes). */
export async function writeGltfJson(doc: Document): Promise<{ gltf: Uint8Array; resources: Record<string, Uint8Array> }> {
  const { json, resources } = await new WebIO().writeJSON(doc);
  return { gltf: new TextEncoder().encode(JSON.stringify(json)), resources };
}

/** A readExternal over an in-memory folder; records the URIs asked for. */
export function memoryReader(files: Record<string, Uint8Array>): { read: (uri: string) => Promise<Uint8Array>; asked: string[] } {
  const asked: string[] = [];
  return {
    asked,
    read: async (uri: string) => {
      asked.push(uri);
      const f = files[uri];
      if (!f) throw new Error(`no such file: ${uri}`);
      return f;
    },
  };
}

type Json = Record<string, unknown>;

/**
 * Hand assembly of glTF files: append typed arrays to one binary buffer (4-byte aligned), add
 * bufferViews and accessors, then emit GLB or .gltf (with a data: URI or an external .bin).
 */
export class RawGltf {
  bin: number[] = [];
  json: Json & { bufferViews: Json[]; accessors: Json[]; meshes: Json[]; nodes: Json[]; scenes: Json[]; materials: Json[] } = {
    asset: { version: '2.0', generator: 'sunfacet tests' },
    bufferViews: [],
    accessors: [],
    meshes: [],
    nodes: [],
    scenes: [],
    materials: [],
  };

  /** Adds bytes as a bufferView; returns its index. */
  view(bytes: Uint8Array, byteStride?: number): number {
    while (this.bin.length % 4 !== 0) this.bin.push(0);
    const byteOffset = this.bin.length;
    for (const b of bytes) this.bin.push(b);
    const v: Json = { buffer: 0, byteOffset, byteLength: bytes.length };
    if (byteStride !== undefined) v['byteStride'] = byteStride;
    this.json.bufferViews.push(v);
    return this.json.bufferViews.length - 1;
  }

  accessor(a: Json): number {
    this.json.accessors.push(a);
    return this.json.accessors.length - 1;
  }

  /** Float32 VEC3 positions in their own view. */
  positions(xyz: number[]): number {
    const bv = this.view(new Uint8Array(new Float32Array(xyz).buffer));
    return this.accessor({ bufferView: bv, componentType: 5126, type: 'VEC3', count: xyz.length / 3 });
  }

  indices(list: number[], componentType: 5121 | 5123 | 5125 = 5125): number {
    const arr = componentType === 5121 ? new Uint8Array(list) : componentType === 5123 ? new Uint16Array(list) : new Uint32Array(list);
    const bv = this.view(new Uint8Array(arr.buffer, arr.byteOffset, arr.byteLength));
    return this.accessor({ bufferView: bv, componentType, type: 'SCALAR', count: list.length });
  }

  mesh(primitives: Json[], name?: string): number {
    this.json.meshes.push(name === undefined ? { primitives } : { name, primitives });
    return this.json.meshes.length - 1;
  }

  node(n: Json): number {
    this.json.nodes.push(n);
    return this.json.nodes.length - 1;
  }

  binBytes(): Uint8Array {
    const b = Uint8Array.from(this.bin);
    return b;
  }

  private withBuffer(uri?: string): Json {
    const j = structuredClone(this.json) as Json;
    for (const k of ['bufferViews', 'accessors', 'meshes', 'nodes', 'scenes', 'materials']) {
      if ((j[k] as unknown[]).length === 0) delete j[k];
    }
    if (this.bin.length > 0) j['buffers'] = [uri === undefined ? { byteLength: this.bin.length } : { uri, byteLength: this.bin.length }];
    return j;
  }

  glb(mutate?: (json: Json) => void): Uint8Array {
    const j = this.withBuffer();
    mutate?.(j);
    return assembleGlb(j, this.binBytes());
  }

  gltfDataUri(mutate?: (json: Json) => void): Uint8Array {
    let b64 = '';
    const bytes = this.binBytes();
    let s = '';
    for (const x of bytes) s += String.fromCharCode(x);
    b64 = btoa(s);
    const j = this.withBuffer(`data:application/octet-stream;base64,${b64}`);
    mutate?.(j);
    return new TextEncoder().encode(JSON.stringify(j));
  }

  gltfExternal(uri: string, mutate?: (json: Json) => void): Uint8Array {
    const j = this.withBuffer(uri);
    mutate?.(j);
    return new TextEncoder().encode(JSON.stringify(j));
  }
}

/** GLB container: 12-byte header, JSON chunk (space padded), BIN chunk (zero padded). */
export function assembleGlb(json: Json, bin: Uint8Array | undefined): Uint8Array {
  let jsonText = JSON.stringify(json);
  while (new TextEncoder().encode(jsonText).length % 4 !== 0) jsonText += ' ';
  const jb = new TextEncoder().encode(jsonText);
  const binPadded = bin === undefined ? undefined : new Uint8Array(Math.ceil(bin.length / 4) * 4);
  if (bin && binPadded) binPadded.set(bin);
  const total = 12 + 8 + jb.length + (binPadded ? 8 + binPadded.length : 0);
  const out = new Uint8Array(total);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, 0x46546c67, true);
  dv.setUint32(4, 2, true);
  dv.setUint32(8, total, true);
  dv.setUint32(12, jb.length, true);
  dv.setUint32(16, 0x4e4f534a, true);
  out.set(jb, 20);
  if (binPadded) {
    const o = 20 + jb.length;
    dv.setUint32(o, binPadded.length, true);
    dv.setUint32(o + 4, 0x004e4942, true);
    out.set(binPadded, o + 8);
  }
  return out;
}

/** Triangle corners of a scene as sorted strings (for order-independent comparison), rounded. */
export function triangleSet(positions: Float32Array, indices: Uint32Array, decimals = 5): string[] {
  const out: string[] = [];
  for (let t = 0; t < indices.length / 3; t++) {
    const corners: string[] = [];
    for (let k = 0; k < 3; k++) {
      const v = indices[t * 3 + k]!;
      corners.push([0, 1, 2].map((c) => (positions[v * 3 + c]! + 0).toFixed(decimals)).join(','));
    }
    // Keep winding: rotate so the smallest corner comes first.
    let best = 0;
    for (let k = 1; k < 3; k++) if (corners[k]! < corners[best]!) best = k;
    out.push([corners[best], corners[(best + 1) % 3], corners[(best + 2) % 3]].join(' | '));
  }
  return out.sort();
}

/** Total triangle area per surface name [m²]. */
export function surfaceAreas(scene: { positions: Float32Array; indices: Uint32Array; surfaceIds: Uint32Array; surfaceNames: string[] }): Record<string, number> {
  const out: Record<string, number> = {};
  const p = scene.positions;
  for (let t = 0; t < scene.indices.length / 3; t++) {
    const a = scene.indices[t * 3]! * 3, b = scene.indices[t * 3 + 1]! * 3, c = scene.indices[t * 3 + 2]! * 3;
    const e1 = [p[b]! - p[a]!, p[b + 1]! - p[a + 1]!, p[b + 2]! - p[a + 2]!];
    const e2 = [p[c]! - p[a]!, p[c + 1]! - p[a + 1]!, p[c + 2]! - p[a + 2]!];
    const cr = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
    const name = scene.surfaceNames[scene.surfaceIds[t]!]!;
    out[name] = (out[name] ?? 0) + Math.hypot(cr[0]!, cr[1]!, cr[2]!) / 2;
  }
  return out;
}
