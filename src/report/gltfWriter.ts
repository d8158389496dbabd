/**
 * A small glTF 2.0 binary (.glb) writer for triangle meshes given in engine coordinates
 * (metres, x east, y north, z up). glTF is Y-up (glTF 2.0 spec §3.4), so positions and normals are
 * written as gltf = (x, z, −y): engine north (+y) becomes glTF −Z, the inverse of the importer.
 *
 * Used for the demo model and, later, for exporting results as vertex colours (COLOR_0) with the
 * values in `extras`. Pure: returns bytes.
 */

export interface GltfMeshInput {
  /** Node name (becomes the surface name on import). */
  name: string;
  /** Material name (assigned to a preset in the project file). */
  materialName: string;
  /** xyz per vertex, engine frame [m]. */
  positions: Float32Array;
  indices: Uint32Array;
  /** Optional linear RGBA per vertex in [0, 1] (COLOR_0). */
  colors?: Float32Array;
  /** Optional base colour of the material (linear RGBA). */
  baseColor?: [number, number, number, number];
  extras?: Record<string, unknown>;
}

export interface GltfDocumentOptions {
  generator?: string;
  extras?: Record<string, unknown>;
}

const FLOAT = 5126;
const UINT32 = 5125;
const ARRAY_BUFFER = 34962;
const ELEMENT_ARRAY_BUFFER = 34963;

export function writeGlb(meshes: GltfMeshInput[], opts: GltfDocumentOptions = {}): Uint8Array {
  const chunks: Uint8Array[] = [];
  let byteLength = 0;
  const bufferViews: object[] = [];
  const accessors: object[] = [];
  const push = (data: ArrayBufferView, target: number): number => {
    const bytes = new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
    const pad = (4 - (byteLength % 4)) % 4;
    if (pad) {
      chunks.push(new Uint8Array(pad));
      byteLength += pad;
    }
    bufferViews.push({ buffer: 0, byteOffset: byteLength, byteLength: bytes.byteLength, target });
    chunks.push(bytes);
    byteLength += bytes.byteLength;
    return bufferViews.length - 1;
  };
  const materialIndex = new Map<string, number>();
  const materials: object[] = [];
  const nodes: object[] = [];
  const gltfMeshes: object[] = [];
  for (const m of meshes) {
    const n = m.positions.length / 3;
    const pos = new Float32Array(n * 3);
    const min = [Infinity, Infinity, Infinity];
    const max = [-Infinity, -Infinity, -Infinity];
    for (let i = 0; i < n; i++) {
      const x = m.positions[3 * i]!, y = m.positions[3 * i + 1]!, z = m.positions[3 * i + 2]!;
      const g = [x, z, -y];
      for (let k = 0; k < 3; k++) {
        pos[3 * i + k] = g[k]!;
        // min/max must bound the stored (float32) values
        const v = pos[3 * i + k]!;
        if (v < min[k]!) min[k] = v;
        if (v > max[k]!) max[k] = v;
      }
    }
    const attributes: Record<string, number> = {};
    accessors.push({ bufferView: push(pos, ARRAY_BUFFER), componentType: FLOAT, count: n, type: 'VEC3', min, max });
    attributes.POSITION = accessors.length - 1;
    if (m.colors) {
      accessors.push({ bufferView: push(m.colors, ARRAY_BUFFER), componentType: FLOAT, count: n, type: 'VEC4' });
      attributes.COLOR_0 = accessors.length - 1;
    }
    accessors.push({ bufferView: push(m.indices, ELEMENT_ARRAY_BUFFER), componentType: UINT32, count: m.indices.length, type: 'SCALAR' });
    const indicesAccessor = accessors.length - 1;
    let mat = materialIndex.get(m.materialName);
    if (mat === undefined) {
      mat = materials.length;
      materialIndex.set(m.materialName, mat);
      materials.push({
        name: m.materialName,
        pbrMetallicRoughness: { baseColorFactor: m.baseColor ?? [0.8, 0.8, 0.8, 1], metallicFactor: 0, roughnessFactor: 0.9 },
        doubleSided: true,
      });
    }
    gltfMeshes.push({ name: m.name, primitives: [{ attributes, indices: indicesAccessor, material: mat, mode: 4 }] });
    nodes.push({ name: m.name, mesh: gltfMeshes.length - 1, ...(m.extras ? { extras: m.extras } : {}) });
  }
  const json = {
    asset: { version: '2.0', generator: opts.generator ?? 'Sunfacet' },
    scene: 0,
    scenes: [{ nodes: nodes.map((_, i) => i) }],
    nodes,
    meshes: gltfMeshes,
    materials,
    accessors,
    bufferViews,
    buffers: [{ byteLength }],
    ...(opts.extras ? { extras: opts.extras } : {}),
  };
  const jsonBytes = new TextEncoder().encode(JSON.stringify(json));
  const jsonPadded = padTo4(jsonBytes, 0x20);
  const binPadded = padTo4(concat(chunks, byteLength), 0);
  const total = 12 + 8 + jsonPadded.length + 8 + binPadded.length;
  const out = new Uint8Array(total);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, 0x46546c67, true); // 'glTF'
  dv.setUint32(4, 2, true);
  dv.setUint32(8, total, true);
  dv.setUint32(12, jsonPadded.length, true);
  dv.setUint32(16, 0x4e4f534a, true); // 'JSON'
  out.set(jsonPadded, 20);
  const o = 20 + jsonPadded.length;
  dv.setUint32(o, binPadded.length, true);
  dv.setUint32(o + 4, 0x004e4942, true); // 'BIN\0'
  out.set(binPadded, o + 8);
  return out;
}

function concat(chunks: Uint8Array[], length: number): Uint8Array {
  const out = new Uint8Array(length);
  let o = 0;
  for (const c of chunks) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}

function padTo4(bytes: Uint8Array, fill: number): Uint8Array {
  const pad = (4 - (bytes.length % 4)) % 4;
  if (!pad) return bytes;
  const out = new Uint8Array(bytes.length + pad).fill(fill);
  out.set(bytes);
  return out;
}
