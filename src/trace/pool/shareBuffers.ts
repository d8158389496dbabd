/**
 * Moves a plain object's typed arrays onto SharedArrayBuffer, once, so every worker reads the same
 * memory (structured clone shares a SharedArrayBuffer instead of copying it). Views that share one
 * buffer (the BVH's `nodes` and `nodeInts`) keep sharing one new buffer.
 */

/** True when SharedArrayBuffer can be used here (Node; browsers only when cross-origin isolated). */
export function canShareMemory(): boolean {
  return typeof SharedArrayBuffer === 'function';
}

type TypedArray =
  | Int8Array | Uint8Array | Uint8ClampedArray | Int16Array | Uint16Array | Int32Array | Uint32Array
  | Float32Array | Float64Array | BigInt64Array | BigUint64Array;

function isTypedArray(v: unknown): v is TypedArray {
  return ArrayBuffer.isView(v) && !(v instanceof DataView);
}

/**
 * A copy of `obj` whose typed-array fields live on SharedArrayBuffer (fields already shared are
 * kept as they are; other fields are copied by reference). Returns `obj` itself when shared memory
 * is unavailable or nothing needs moving.
 */
export function withSharedBuffers<T extends object>(obj: T): T {
  if (!canShareMemory()) return obj;
  const moved = new Map<ArrayBufferLike, SharedArrayBuffer>();
  let changed = false;
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(obj)) {
    if (isTypedArray(value) && !(value.buffer instanceof SharedArrayBuffer)) {
      let sab = moved.get(value.buffer);
      if (sab === undefined) {
        sab = new SharedArrayBuffer(value.buffer.byteLength);
        new Uint8Array(sab).set(new Uint8Array(value.buffer));
        moved.set(value.buffer, sab);
      }
      const Ctor = value.constructor as new (b: ArrayBufferLike, offset: number, length: number) => TypedArray;
      out[key] = new Ctor(sab, value.byteOffset, value.length);
      changed = true;
    } else {
      out[key] = value;
    }
  }
  return changed ? (out as T) : obj;
}
