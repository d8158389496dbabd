/**
 * glTF 2.0 importer (`.glb`, and `.gltf` JSON with external `.bin` files or data: URIs): bytes in,
 * SceneArrays out. Our own parser, written against the Khronos glTF 2.0 specification
 * (https://registry.khronos.org/glTF/specs/2.0/glTF-2.0.html): GLB header and chunks (§4.4),
 * buffers / bufferViews / accessors with byteStride, componentType 5120–5126 and `normalized`
 * (§3.6.2), sparse accessors (§3.6.2.3), primitives of mode 4 (triangles), 5 (strip) and 6 (fan)
 * (§3.7.2.1), the node hierarchy with `matrix` or TRS (§3.5.2), and scenes.
 *
 * No file access: external files are read through `opts.readExternal(uri)`, which the CLI or the
 * app supplies. A buffer URI that leaves the model's folder (`../`, an absolute path, a drive
 * letter) or names the network or another scheme (`http:`, `https:`, `//host`, `file:`) is refused.
 *
 * Engine frame: the default up axis 'y' maps glTF (x, y, z) to engine (x, −z, y) (see
 * transform.ts): glTF −Z ("back") becomes north (+y).
 */
import { InputError } from '../../physics/errors.ts';
import {
  engineFromModel,
  mat4Determinant3,
  mat4FromTrs,
  mat4Identity,
  mat4Multiply,
  resolveImportOptions,
  transformPoint,
} from '../transform.ts';
import type { ImportOptions, Mat4 } from '../transform.ts';
import { SceneBuilder } from './sceneBuilder.ts';
import type { ImportedScene } from './sceneBuilder.ts';

/** Options of the glTF importer. */
export interface GltfImportOptions extends ImportOptions {
  /**
   * Reads a file named by a buffer URI, relative to the model's folder (already checked to stay
   * inside it, percent-decoded). Needed only for `.gltf` files with external buffers.
   */
  readExternal?: (uri: string) => Promise<Uint8Array>;
}

const GLB_MAGIC = 0x46546c67; // "glTF"
const CHUNK_JSON = 0x4e4f534a; // "JSON"
const CHUNK_BIN = 0x004e4942; // "BIN\0"

const COMPONENT_SIZE: Record<number, number> = { 5120: 1, 5121: 1, 5122: 2, 5123: 2, 5125: 4, 5126: 4 };
const TYPE_COMPONENTS: Record<string, number> = { SCALAR: 1, VEC2: 2, VEC3: 3, VEC4: 4, MAT2: 4, MAT3: 9, MAT4: 16 };
/** Geometry compression we cannot decode. */
const UNSUPPORTED_REQUIRED = new Set(['KHR_draco_mesh_compression', 'EXT_meshopt_compression', 'KHR_meshopt_compression']);

type Json = Record<string, unknown>;

/** Largest accessor without a bufferView (all zeros plus sparse values) we allocate [components]. */
const MAX_UNBACKED_ACCESSOR_ELEMENTS = 2 ** 26;

/**
 * Parses a glTF 2.0 model (binary `.glb` or JSON `.gltf`) into the engine frame.
 * @param bytes the file's content
 * @param fileName used in error messages (and to tell .glb from .gltf when the content is unclear)
 * @param opts up axis (default 'y'), model units per metre, north rotation [deg], external reader
 */
export async function importGltf(bytes: Uint8Array, fileName: string, opts: GltfImportOptions = {}): Promise<ImportedScene> {
  const file = fileName;
  const resolved = resolveImportOptions(opts, 'y', file);
  if (bytes.byteLength === 0) {
    throw new InputError({ problem: 'empty file', file, place: 'whole file', expected: 'a glTF 2.0 model' });
  }
  const { json, bin } = splitContainer(bytes, file);
  const doc = new GltfDocument(json, bin, file, opts.readExternal);
  return doc.toScene(engineFromModel(resolved));
}

/** GLB → (JSON, BIN chunk); .gltf text → (JSON, no BIN). */
function splitContainer(bytes: Uint8Array, file: string): { json: Json; bin: Uint8Array | undefined } {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const isGlb = bytes.byteLength >= 4 && dv.getUint32(0, true) === GLB_MAGIC;
  let jsonBytes: Uint8Array;
  let bin: Uint8Array | undefined;
  if (isGlb) {
    if (bytes.byteLength < 12) {
      throw new InputError({ problem: 'truncated GLB header', file, place: 'GLB header', value: `${bytes.byteLength} bytes`, expected: '12 bytes' });
    }
    const version = dv.getUint32(4, true);
    if (version !== 2) {
      throw new InputError({ problem: 'unsupported GLB container version', file, place: 'GLB header, version', value: version, expected: '2 (glTF 2.0)' });
    }
    const length = dv.getUint32(8, true);
    if (length > bytes.byteLength) {
      throw new InputError({
        problem: 'truncated file',
        file,
        place: 'GLB header, length',
        value: `header says ${length} bytes, file has ${bytes.byteLength}`,
        expected: 'the whole file',
      });
    }
    let offset = 12;
    let chunk = 0;
    let jsonChunk: Uint8Array | undefined;
    while (offset + 8 <= length) {
      const chunkLength = dv.getUint32(offset, true);
      const chunkType = dv.getUint32(offset + 4, true);
      const start = offset + 8;
      if (start + chunkLength > length) {
        throw new InputError({
          problem: 'chunk runs past the end of the file',
          file,
          place: `GLB chunk ${chunk} (at byte ${offset})`,
          value: `${chunkLength} bytes from byte ${start}, file ends at ${length}`,
          expected: 'a complete chunk',
        });
      }
      const data = bytes.subarray(start, start + chunkLength);
      if (chunk === 0) {
        if (chunkType !== CHUNK_JSON) {
          throw new InputError({ problem: 'first chunk is not JSON', file, place: 'GLB chunk 0', value: `0x${chunkType.toString(16)}`, expected: 'chunk type 0x4E4F534A (JSON)' });
        }
        jsonChunk = data;
      } else if (chunkType === CHUNK_BIN && bin === undefined) {
        bin = data;
      }
      offset = start + ((chunkLength + 3) & ~3);
      chunk++;
    }
    if (jsonChunk === undefined) {
      throw new InputError({ problem: 'no JSON chunk', file, place: 'GLB chunk 0', expected: 'a JSON chunk after the 12-byte header' });
    }
    jsonBytes = jsonChunk;
  } else {
    let i = 0;
    if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) i = 3; // UTF-8 BOM
    while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x0a || bytes[i] === 0x0d || bytes[i] === 0x09)) i++;
    if (bytes[i] !== 0x7b /* { */ || /\.glb$/i.test(file)) {
      throw new InputError({
        problem: 'not a glTF file',
        file,
        place: 'first bytes',
        value: hexPreview(bytes),
        expected: 'the GLB magic "glTF" (binary .glb) or a JSON object (.gltf)',
      });
    }
    jsonBytes = bytes.subarray(i);
  }
  let json: unknown;
  try {
    json = JSON.parse(new TextDecoder('utf-8').decode(jsonBytes));
  } catch (e) {
    throw new InputError({ problem: `invalid JSON (${(e as Error).message})`, file, place: isGlb ? 'GLB JSON chunk' : 'JSON', expected: 'a glTF 2.0 JSON object' });
  }
  if (typeof json !== 'object' || json === null || Array.isArray(json)) {
    throw new InputError({ problem: 'JSON is not an object', file, place: 'JSON root', expected: 'a glTF 2.0 JSON object' });
  }
  const asset = (json as Json)['asset'];
  const version = typeof asset === 'object' && asset !== null ? (asset as Json)['version'] : undefined;
  if (typeof version !== 'string' || !/^2\.\d+$/.test(version)) {
    throw new InputError({ problem: 'not glTF 2.0', file, place: 'asset.version', value: version, expected: '"2.0"' });
  }
  return { json: json as Json, bin };
}

function hexPreview(bytes: Uint8Array): string {
  return Array.from(bytes.subarray(0, 4), (b) => b.toString(16).padStart(2, '0')).join(' ');
}

/**
 * Checks a buffer URI and returns it percent-decoded. Refuses URIs that leave the model's folder
 * or reach the network: any scheme other than data: (http:, https:, file:, a drive letter C:),
 * a leading / or \ (absolute or //host network path), and any ".." segment.
 */
export function checkExternalUri(uri: string, file: string, place: string): string {
  let decoded: string;
  try {
    decoded = decodeURIComponent(uri);
  } catch {
    throw new InputError({ problem: 'malformed URI', file, place, value: uri, expected: 'a relative file path' });
  }
  const refuse = (problem: string): never => {
    throw new InputError({ problem, file, place, value: uri, expected: 'a relative path inside the model\'s folder (or a data: URI)' });
  };
  if (/^\s*\/\//.test(uri) || /^\s*[\\/]{2}/.test(decoded)) refuse('network path refused');
  if (/^[a-z][a-z0-9+.-]*:/i.test(uri) || /^[a-z][a-z0-9+.-]*:/i.test(decoded)) {
    refuse(/^\s*(https?|ftp|wss?):/i.test(decoded) ? 'network URI refused' : 'URI scheme or drive letter refused');
  }
  if (/^\s*[\\/]/.test(decoded)) refuse('absolute path refused');
  if (decoded.split(/[\\/]/).some((seg) => seg === '..')) refuse('path outside the model\'s folder refused');
  if (decoded.trim() === '') refuse('empty URI');
  return decoded;
}

const B64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const B64_LOOKUP = (() => {
  const t = new Int16Array(128).fill(-1);
  for (let i = 0; i < 64; i++) t[B64.charCodeAt(i)] = i;
  t['-'.charCodeAt(0)] = 62; // base64url
  t['_'.charCodeAt(0)] = 63;
  return t;
})();

/** Decodes base64 (standard or URL alphabet, padding optional); null if a character is invalid. */
export function decodeBase64(text: string): Uint8Array | null {
  const s = text.replace(/[\s=]+$/g, '').replace(/\s+/g, '');
  const out = new Uint8Array(Math.floor((s.length * 3) / 4));
  let acc = 0, bits = 0, o = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    const v = c < 128 ? B64_LOOKUP[c]! : -1;
    if (v < 0) return null;
    acc = (acc << 6) | v;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[o++] = (acc >> bits) & 0xff;
    }
  }
  return out.subarray(0, o);
}

interface PrimitiveJob {
  meshIndex: number;
  primIndex: number;
  world: Mat4;
  surfaceId: number;
}

/** The parsed JSON plus buffers, with checked access to each part. */
class GltfDocument {
  private readonly buffers = new Map<number, Uint8Array>();
  private readonly positionCache = new Map<number, Float64Array>();
  private readonly builder: SceneBuilder;

  constructor(
    private readonly json: Json,
    private readonly bin: Uint8Array | undefined,
    private readonly file: string,
    private readonly readExternal: ((uri: string) => Promise<Uint8Array>) | undefined,
  ) {
    this.builder = new SceneBuilder(file);
  }

  private fail(problem: string, place: string, value?: unknown, expected?: string): never {
    throw new InputError({ problem, file: this.file, place, value, expected });
  }

  private array(key: string): unknown[] {
    const v = this.json[key];
    if (v === undefined) return [];
    if (!Array.isArray(v)) this.fail('not an array', key, v, 'an array');
    return v;
  }

  private item(key: string, index: number, place: string): Json {
    const list = this.array(key);
    if (!Number.isInteger(index) || index < 0 || index >= list.length) {
      this.fail(`refers to a missing ${key} entry`, place, index, `an index in 0..${list.length - 1}`);
    }
    const v = list[index];
    if (typeof v !== 'object' || v === null || Array.isArray(v)) this.fail('not an object', `${key}[${index}]`, v, 'an object');
    return v as Json;
  }

  private int(obj: Json, key: string, place: string, dflt?: number, min = 0): number {
    const v = obj[key];
    if (v === undefined) {
      if (dflt === undefined) this.fail('missing', `${place}.${key}`, undefined, 'an integer');
      return dflt;
    }
    if (typeof v !== 'number' || !Number.isInteger(v) || v < min) this.fail('not a valid integer', `${place}.${key}`, v, `an integer >= ${min}`);
    return v;
  }

  private optIndex(obj: Json, key: string, place: string): number | undefined {
    return obj[key] === undefined ? undefined : this.int(obj, key, place);
  }

  async toScene(engineFromModelM: Mat4): Promise<ImportedScene> {
    for (const ext of this.array('extensionsRequired')) {
      if (typeof ext === 'string' && UNSUPPORTED_REQUIRED.has(ext)) {
        this.fail('compressed geometry is not supported', 'extensionsRequired', ext, 'an uncompressed model (export without Draco/meshopt)');
      }
    }
    const jobs = this.collectPrimitives(engineFromModelM);
    // Load the buffers the needed accessors use (the only asynchronous step).
    const needed = new Set<number>();
    for (const job of jobs) {
      const prim = this.primitive(job.meshIndex, job.primIndex);
      if (typeof prim !== 'object' || prim === null) continue; // reported by addPrimitive
      const attrs = prim['attributes'];
      const pos = typeof attrs === 'object' && attrs !== null ? (attrs as Json)['POSITION'] : undefined;
      if (typeof pos === 'number') this.accessorBuffers(pos, needed);
      if (typeof prim['indices'] === 'number') this.accessorBuffers(prim['indices'], needed);
    }
    for (const b of [...needed].sort((p, q) => p - q)) await this.loadBuffer(b);
    let skippedModes = 0;
    for (const job of jobs) skippedModes += this.addPrimitive(job) ? 0 : 1;
    if (skippedModes > 0) {
      this.builder.warnings.push(`${this.file}: skipped ${skippedModes} primitive(s) of points or lines (no area)`);
    }
    return this.builder.build();
  }

  private primitive(meshIndex: number, primIndex: number): Json {
    const mesh = this.item('meshes', meshIndex, `meshes[${meshIndex}]`);
    return (mesh['primitives'] as Json[])[primIndex]!;
  }

  /** Walks the scene's node tree; one surface per node with a mesh, one job per primitive. */
  private collectPrimitives(root: Mat4): PrimitiveJob[] {
    const nodes = this.array('nodes');
    const scenes = this.array('scenes');
    let roots: number[];
    if (scenes.length > 0) {
      const si = this.json['scene'] === undefined ? 0 : this.int(this.json, 'scene', 'root');
      const scene = this.item('scenes', si, 'scene');
      const list = scene['nodes'] ?? [];
      if (!Array.isArray(list)) this.fail('not an array', `scenes[${si}].nodes`, list, 'an array of node indices');
      roots = list.map((n, k) => {
        if (typeof n !== 'number' || !Number.isInteger(n) || n < 0 || n >= nodes.length) {
          this.fail('refers to a missing node', `scenes[${si}].nodes[${k}]`, n, `an index in 0..${nodes.length - 1}`);
        }
        return n;
      });
    } else {
      // No scenes: every node that is nobody's child is a root.
      const isChild = new Uint8Array(nodes.length);
      nodes.forEach((n) => {
        const ch = (n as Json)?.['children'];
        if (Array.isArray(ch)) for (const c of ch) if (typeof c === 'number' && c >= 0 && c < nodes.length) isChild[c] = 1;
      });
      roots = [];
      for (let i = 0; i < nodes.length; i++) if (!isChild[i]) roots.push(i);
    }
    const jobs: PrimitiveJob[] = [];
    const onPath = new Uint8Array(nodes.length);
    const visit = (ni: number, parent: Mat4, place: string): void => {
      if (onPath[ni]) this.fail('node hierarchy has a cycle', place, ni, 'a tree of nodes');
      onPath[ni] = 1;
      const node = this.item('nodes', ni, place);
      const world = mat4Multiply(parent, this.localMatrix(node, ni));
      const mi = this.optIndex(node, 'mesh', `nodes[${ni}]`);
      if (mi !== undefined) {
        const mesh = this.item('meshes', mi, `nodes[${ni}].mesh`);
        const prims = mesh['primitives'];
        if (!Array.isArray(prims) || prims.length === 0) this.fail('mesh has no primitives', `meshes[${mi}].primitives`, prims, 'a non-empty array');
        const name =
          typeof node['name'] === 'string' && node['name'] !== ''
            ? node['name']
            : typeof mesh['name'] === 'string' && mesh['name'] !== ''
              ? mesh['name']
              : `mesh${mi}`;
        const surfaceId = this.builder.addSurface(name);
        for (let p = 0; p < prims.length; p++) jobs.push({ meshIndex: mi, primIndex: p, world, surfaceId });
      }
      const children = node['children'];
      if (children !== undefined) {
        if (!Array.isArray(children)) this.fail('not an array', `nodes[${ni}].children`, children, 'an array of node indices');
        children.forEach((c, k) => {
          if (typeof c !== 'number' || !Number.isInteger(c) || c < 0 || c >= nodes.length) {
            this.fail('refers to a missing node', `nodes[${ni}].children[${k}]`, c, `an index in 0..${nodes.length - 1}`);
          }
          visit(c, world, `nodes[${ni}].children[${k}]`);
        });
      }
      onPath[ni] = 0;
    };
    for (const r of roots) visit(r, root, `nodes[${r}]`);
    return jobs;
  }

  private localMatrix(node: Json, ni: number): Mat4 {
    const num = (v: unknown, n: number, key: string): number[] => {
      if (!Array.isArray(v) || v.length !== n || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) {
        this.fail('not a list of finite numbers', `nodes[${ni}].${key}`, v, `${n} finite numbers`);
      }
      return v as number[];
    };
    if (node['matrix'] !== undefined) return Float64Array.from(num(node['matrix'], 16, 'matrix'));
    if (node['translation'] === undefined && node['rotation'] === undefined && node['scale'] === undefined) return mat4Identity();
    const t = node['translation'] === undefined ? [0, 0, 0] : num(node['translation'], 3, 'translation');
    const q = node['rotation'] === undefined ? [0, 0, 0, 1] : num(node['rotation'], 4, 'rotation');
    const s = node['scale'] === undefined ? [1, 1, 1] : num(node['scale'], 3, 'scale');
    const len = Math.hypot(q[0]!, q[1]!, q[2]!, q[3]!);
    if (!(len > 0)) this.fail('zero rotation quaternion', `nodes[${ni}].rotation`, q, 'a unit quaternion (x, y, z, w)');
    return mat4FromTrs(t, [q[0]! / len, q[1]! / len, q[2]! / len, q[3]! / len], s);
  }

  private accessorBuffers(ai: number, out: Set<number>): void {
    const acc = this.item('accessors', ai, `accessors[${ai}]`);
    const views: number[] = [];
    const bv = this.optIndex(acc, 'bufferView', `accessors[${ai}]`);
    if (bv !== undefined) views.push(bv);
    const sparse = acc['sparse'] as Json | undefined;
    if (sparse !== undefined) {
      const si = sparse['indices'] as Json | undefined;
      const sv = sparse['values'] as Json | undefined;
      if (si && typeof si['bufferView'] === 'number') views.push(si['bufferView']);
      if (sv && typeof sv['bufferView'] === 'number') views.push(sv['bufferView']);
    }
    for (const v of views) {
      const view = this.item('bufferViews', v, `accessors[${ai}].bufferView`);
      out.add(this.int(view, 'buffer', `bufferViews[${v}]`));
    }
  }

  private async loadBuffer(bi: number): Promise<void> {
    const place = `buffers[${bi}]`;
    const buf = this.item('buffers', bi, place);
    const byteLength = this.int(buf, 'byteLength', place, undefined, 1);
    const uri = buf['uri'];
    let data: Uint8Array;
    if (uri === undefined) {
      if (bi !== 0 || this.bin === undefined) this.fail('buffer has no uri and there is no GLB BIN chunk', place, undefined, 'a uri, or buffer 0 of a .glb');
      data = this.bin;
    } else if (typeof uri !== 'string') {
      this.fail('uri is not a string', `${place}.uri`, uri, 'a string');
    } else if (/^data:/i.test(uri)) {
      const comma = uri.indexOf(',');
      const header = comma < 0 ? uri : uri.slice(0, comma);
      if (comma < 0 || !/;base64$/i.test(header)) this.fail('data URI is not base64', `${place}.uri`, uri, 'data:application/octet-stream;base64,...');
      const decoded = decodeBase64(uri.slice(comma + 1));
      if (decoded === null) this.fail('invalid base64 in data URI', `${place}.uri`, header + ',...', 'base64 text');
      data = decoded;
    } else {
      const path = checkExternalUri(uri, this.file, `${place}.uri`);
      if (this.readExternal === undefined) {
        this.fail('external buffer, but no way to read files was given', `${place}.uri`, uri, 'a .glb, data: URIs, or a readExternal function');
      }
      try {
        data = await this.readExternal(path);
      } catch (e) {
        if (e instanceof InputError) throw e;
        this.fail(`cannot read the external buffer (${(e as Error)?.message ?? String(e)})`, `${place}.uri`, uri, 'a readable file beside the model');
      }
    }
    if (data.byteLength < byteLength) {
      this.fail('truncated buffer', place, `byteLength says ${byteLength} bytes, data has ${data.byteLength}`, 'the whole buffer');
    }
    this.buffers.set(bi, data.subarray(0, byteLength));
  }

  /** The bytes of a bufferView (bounds checked) and its stride (undefined if tightly packed). */
  private view(vi: number, place: string): { bytes: Uint8Array; stride: number | undefined } {
    const vplace = `bufferViews[${vi}]`;
    const view = this.item('bufferViews', vi, place);
    const bi = this.int(view, 'buffer', vplace);
    const offset = this.int(view, 'byteOffset', vplace, 0);
    const length = this.int(view, 'byteLength', vplace, undefined, 1);
    const stride = view['byteStride'] === undefined ? undefined : this.int(view, 'byteStride', vplace, undefined, 4);
    if (stride !== undefined && stride > 252) this.fail('byteStride out of range', `${vplace}.byteStride`, stride, '4..252');
    const buf = this.buffers.get(bi);
    if (buf === undefined) this.fail('buffer was not loaded', `${vplace}.buffer`, bi);
    if (offset + length > buf.byteLength) {
      this.fail(
        'bufferView runs past the end of its buffer (truncated buffer?)',
        vplace,
        `bytes ${offset}..${offset + length} of buffers[${bi}], which has ${buf.byteLength}`,
        'byteOffset + byteLength <= the buffer\'s byteLength',
      );
    }
    return { bytes: buf.subarray(offset, offset + length), stride };
  }

  /** Reads an accessor into a Float64Array (count × components), applying `normalized` and sparse. */
  private readAccessor(ai: number, place: string): { data: Float64Array; components: number; componentType: number; count: number } {
    const aplace = `accessors[${ai}]`;
    const acc = this.item('accessors', ai, place);
    const componentType = this.int(acc, 'componentType', aplace);
    const csize = COMPONENT_SIZE[componentType];
    if (csize === undefined) this.fail('unknown componentType', `${aplace}.componentType`, componentType, 'one of 5120, 5121, 5122, 5123, 5125, 5126');
    const type = acc['type'];
    const components = typeof type === 'string' ? TYPE_COMPONENTS[type] : undefined;
    if (components === undefined) this.fail('unknown type', `${aplace}.type`, type, 'SCALAR, VEC2, VEC3, VEC4, MAT2, MAT3 or MAT4');
    const count = this.int(acc, 'count', aplace, undefined, 1);
    const normalized = acc['normalized'] === true;
    const bv = this.optIndex(acc, 'bufferView', aplace);
    // Allocate only what the file can back: a bufferView's bytes bound it (checked below, before
    // the allocation); an accessor without one (zeros + sparse) is capped.
    if (bv === undefined && count * components > MAX_UNBACKED_ACCESSOR_ELEMENTS) {
      this.fail('accessor too large', `${aplace}.count`, count, `at most ${MAX_UNBACKED_ACCESSOR_ELEMENTS / components} elements for an accessor without a bufferView`);
    }
    let data = new Float64Array(0);
    if (bv === undefined) data = new Float64Array(count * components);
    if (bv !== undefined) {
      const { bytes, stride } = this.view(bv, `${aplace}.bufferView`);
      const byteOffset = this.int(acc, 'byteOffset', aplace, 0);
      const elem = csize * components;
      const step = stride ?? elem;
      const end = byteOffset + step * (count - 1) + elem;
      if (end > bytes.byteLength) {
        this.fail(
          'accessor runs past the end of its bufferView (truncated?)',
          aplace,
          `needs ${end} bytes of bufferViews[${bv}], which has ${bytes.byteLength}`,
          'byteOffset + byteStride × (count − 1) + element size <= the bufferView\'s byteLength',
        );
      }
      data = new Float64Array(count * components);
      const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      for (let i = 0; i < count; i++) {
        const base = byteOffset + i * step;
        for (let c = 0; c < components; c++) data[i * components + c] = readComponent(dv, base + c * csize, componentType, normalized);
      }
    }
    const sparse = acc['sparse'];
    if (sparse !== undefined) this.applySparse(sparse as Json, ai, data, count, components, componentType, normalized);
    return { data, components, componentType, count };
  }

  private applySparse(
    sparse: Json,
    ai: number,
    data: Float64Array,
    count: number,
    components: number,
    componentType: number,
    normalized: boolean,
  ): void {
    const place = `accessors[${ai}].sparse`;
    const n = this.int(sparse, 'count', place, undefined, 1);
    const si = sparse['indices'] as Json | undefined;
    const sv = sparse['values'] as Json | undefined;
    if (typeof si !== 'object' || si === null || typeof sv !== 'object' || sv === null) {
      this.fail('sparse accessor without indices or values', place, undefined, 'sparse.indices and sparse.values objects');
    }
    const itype = this.int(si, 'componentType', `${place}.indices`);
    const isize = itype === 5121 ? 1 : itype === 5123 ? 2 : itype === 5125 ? 4 : 0;
    if (isize === 0) this.fail('sparse index type not supported', `${place}.indices.componentType`, itype, '5121, 5123 or 5125');
    const iv = this.view(this.int(si, 'bufferView', `${place}.indices`), `${place}.indices.bufferView`);
    const ioff = this.int(si, 'byteOffset', `${place}.indices`, 0);
    const vv = this.view(this.int(sv, 'bufferView', `${place}.values`), `${place}.values.bufferView`);
    const voff = this.int(sv, 'byteOffset', `${place}.values`, 0);
    const csize = COMPONENT_SIZE[componentType]!;
    if (ioff + n * isize > iv.bytes.byteLength) this.fail('sparse indices run past their bufferView', `${place}.indices`, n, 'a complete index list');
    if (voff + n * csize * components > vv.bytes.byteLength) this.fail('sparse values run past their bufferView', `${place}.values`, n, 'a complete value list');
    const idv = new DataView(iv.bytes.buffer, iv.bytes.byteOffset, iv.bytes.byteLength);
    const vdv = new DataView(vv.bytes.buffer, vv.bytes.byteOffset, vv.bytes.byteLength);
    for (let k = 0; k < n; k++) {
      const target = readComponent(idv, ioff + k * isize, itype, false);
      if (target >= count) this.fail('sparse index out of range', `${place}.indices, element ${k}`, target, `an index in 0..${count - 1}`);
      for (let c = 0; c < components; c++) {
        data[target * components + c] = readComponent(vdv, voff + (k * components + c) * csize, componentType, normalized);
      }
    }
  }

  /** Adds one primitive's triangles; returns false for non-triangle modes (points, lines). */
  private addPrimitive(job: PrimitiveJob): boolean {
    const pplace = `meshes[${job.meshIndex}].primitives[${job.primIndex}]`;
    const prim = this.primitive(job.meshIndex, job.primIndex);
    if (typeof prim !== 'object' || prim === null) this.fail('not an object', pplace, prim, 'a primitive object');
    const mode = this.int(prim, 'mode', pplace, 4);
    if (mode > 6) this.fail('unknown primitive mode', `${pplace}.mode`, mode, '0..6');
    if (mode < 4) return false;
    const attrs = prim['attributes'];
    if (typeof attrs !== 'object' || attrs === null) this.fail('no attributes', `${pplace}.attributes`, attrs, 'an object with POSITION');
    const posIndex = this.optIndex(attrs as Json, 'POSITION', `${pplace}.attributes`);
    if (posIndex === undefined) this.fail('no POSITION attribute', `${pplace}.attributes`, undefined, 'attributes.POSITION');
    const positions = this.positions(posIndex, `${pplace}.attributes.POSITION`);
    const vertexCount = positions.length / 3;

    // Material.
    const matIndex = this.optIndex(prim, 'material', pplace);
    let matName = '';
    if (matIndex !== undefined) {
      const mat = this.item('materials', matIndex, `${pplace}.material`);
      matName = typeof mat['name'] === 'string' && mat['name'] !== '' ? mat['name'] : `material${matIndex}`;
    }
    const materialId = this.builder.material(matName);

    // Indices (or 0..n-1).
    let indices: Float64Array;
    let iplace = `${pplace} (non-indexed)`;
    const idxAcc = this.optIndex(prim, 'indices', pplace);
    if (idxAcc !== undefined) {
      iplace = `${pplace}.indices (accessors[${idxAcc}])`;
      const r = this.readAccessor(idxAcc, `${pplace}.indices`);
      if (r.components !== 1 || (r.componentType !== 5121 && r.componentType !== 5123 && r.componentType !== 5125)) {
        this.fail('indices must be unsigned integer scalars', iplace, `componentType ${r.componentType}`, 'SCALAR of 5121, 5123 or 5125');
      }
      indices = r.data;
      for (let k = 0; k < indices.length; k++) {
        if (indices[k]! >= vertexCount) this.fail('index out of range', `${iplace}, element ${k}`, indices[k], `an index in 0..${vertexCount - 1}`);
      }
    } else {
      indices = new Float64Array(vertexCount);
      for (let k = 0; k < vertexCount; k++) indices[k] = k;
    }

    // Vertices into the engine frame.
    const base = this.builder.vertexCount;
    const p = new Float64Array(3);
    for (let v = 0; v < vertexCount; v++) {
      transformPoint(job.world, positions[v * 3]!, positions[v * 3 + 1]!, positions[v * 3 + 2]!, p);
      if (!Number.isFinite(p[0]!) || !Number.isFinite(p[1]!) || !Number.isFinite(p[2]!)) {
        this.fail('vertex outside the float range after the node transform', `${pplace}.attributes.POSITION, vertex ${v}`, Array.from(p), 'finite coordinates');
      }
      this.builder.addVertex(p[0]!, p[1]!, p[2]!, `${pplace}.attributes.POSITION, vertex ${v}`);
    }
    // A mirroring transform reverses the winding (glTF 2.0 §3.7.4).
    const flip = mat4Determinant3(job.world) < 0;
    const add = (a: number, b: number, c: number): void => {
      if (flip) this.builder.addTriangle(base + a, base + c, base + b, job.surfaceId, materialId);
      else this.builder.addTriangle(base + a, base + b, base + c, job.surfaceId, materialId);
    };
    const n = indices.length;
    if (mode === 4) {
      for (let k = 0; k + 2 < n; k += 3) add(indices[k]!, indices[k + 1]!, indices[k + 2]!);
    } else if (mode === 5) {
      // Strip: triangle i = (v_i, v_{i+1+i%2}, v_{i+2−i%2}).
      for (let k = 0; k + 2 < n; k++) {
        if (k % 2 === 0) add(indices[k]!, indices[k + 1]!, indices[k + 2]!);
        else add(indices[k]!, indices[k + 2]!, indices[k + 1]!);
      }
    } else {
      // Fan: triangle i = (v_{i+1}, v_{i+2}, v_0).
      for (let k = 1; k + 1 < n; k++) add(indices[k]!, indices[k + 1]!, indices[0]!);
    }
    return true;
  }

  /** POSITION accessor values, checked finite (cached: meshes may be reused by several nodes). */
  private positions(ai: number, place: string): Float64Array {
    const cached = this.positionCache.get(ai);
    if (cached) return cached;
    const r = this.readAccessor(ai, place);
    if (r.components !== 3) this.fail('POSITION must be VEC3', `accessors[${ai}].type`, this.item('accessors', ai, place)['type'], 'VEC3');
    for (let k = 0; k < r.data.length; k++) {
      if (!Number.isFinite(r.data[k]!)) {
        this.fail('coordinate is not a finite number', `${place} (accessors[${ai}]), vertex ${Math.floor(k / 3)}, component ${k % 3}`, r.data[k], 'finite coordinates');
      }
    }
    this.positionCache.set(ai, r.data);
    return r.data;
  }
}

function readComponent(dv: DataView, at: number, componentType: number, normalized: boolean): number {
  switch (componentType) {
    case 5120: {
      const v = dv.getInt8(at);
      return normalized ? Math.max(v / 127, -1) : v;
    }
    case 5121: {
      const v = dv.getUint8(at);
      return normalized ? v / 255 : v;
    }
    case 5122: {
      const v = dv.getInt16(at, true);
      return normalized ? Math.max(v / 32767, -1) : v;
    }
    case 5123: {
      const v = dv.getUint16(at, true);
      return normalized ? v / 65535 : v;
    }
    case 5125:
      return dv.getUint32(at, true);
    default:
      return dv.getFloat32(at, true);
  }
}
