/**
 * `results.json` as a stream of chunks. A year of results is hundreds of MB of JSON, and V8 caps a
 * string near 512 MB, so `JSON.stringify(results)` can fail outright; this writes the same text a
 * piece at a time.
 *
 * The output is exactly `JSON.stringify(value)` (no indentation): numbers as `String(n)`, NaN and
 * ±Infinity as null, `toJSON` honoured (Dates), boxed primitives unwrapped, undefined/function/
 * symbol members left out of objects and written as null inside arrays, the same key order
 * (`Object.keys`), strings escaped by `JSON.stringify` itself. A cycle or a BigInt throws a
 * TypeError like `JSON.stringify` does. No rounding is added: numbers carry whatever rounding the
 * Results already have.
 */
import type { Results } from './results.ts';

/** Characters per yielded chunk, roughly (a chunk may run past this by one primitive value). */
export const JSON_CHUNK_CHARS = 256 * 1024;

/** Elements of an array serialised natively at a time (bounds one piece to some tens of kB). */
const PRIMITIVE_BLOCK = 2048;

/**
 * The audit results as JSON text in chunks; `chunks.join('')` equals `JSON.stringify(results)`.
 *
 * @param results The audit's results.
 * @returns Chunks of JSON text to be written in order.
 * @example JSON.parse([...resultsJsonChunks(r)].join('')) // deep-equals JSON.parse(JSON.stringify(r))
 */
export function resultsJsonChunks(results: Results): Generator<string, void, undefined> {
  return jsonChunks(results);
}

/**
 * Any JSON-serialisable value as JSON text in chunks of about `chunkChars` characters; the
 * concatenation equals `JSON.stringify(value)` (a top-level value JSON.stringify maps to
 * undefined yields nothing).
 *
 * @param value The value to serialise.
 * @param chunkChars Target chunk size [characters], ≥ 1.
 */
export function* jsonChunks(value: unknown, chunkChars: number = JSON_CHUNK_CHARS): Generator<string, void, undefined> {
  const w: Writer = { buf: '', chunkChars: Math.max(1, chunkChars), stack: [] };
  const v = resolve('', value);
  const token = primitiveToken(v);
  if (token === null) yield* emitObject(v as object, w);
  else if (token !== undefined) w.buf += token;
  if (w.buf.length > 0) yield w.buf;
}

interface Writer {
  buf: string;
  chunkChars: number;
  /** Objects being written, for the cycle check. */
  stack: object[];
}

/** Applies toJSON and unwraps boxed primitives, as JSON.stringify's SerializeJSONProperty does. */
function resolve(key: string, value: unknown): unknown {
  if ((typeof value === 'object' && value !== null) || typeof value === 'bigint') {
    const toJSON = (value as { toJSON?: unknown }).toJSON;
    if (typeof toJSON === 'function') value = (toJSON as (k: string) => unknown).call(value, key);
  }
  if (typeof value === 'object' && value !== null) {
    if (value instanceof Number) return Number(value);
    if (value instanceof String) return String(value);
    if (value instanceof Boolean) return value.valueOf();
  }
  return value;
}

/**
 * The text of a primitive, undefined for what JSON leaves out (undefined, functions, symbols), or
 * null meaning "an object or array: recurse".
 */
function primitiveToken(value: unknown): string | undefined | null {
  switch (typeof value) {
    case 'number':
      return Number.isFinite(value) ? String(value) : 'null';
    case 'string':
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object':
      return value === null ? 'null' : null;
    case 'bigint':
      throw new TypeError('Do not know how to serialize a BigInt');
    default:
      return undefined;
  }
}

function* emitObject(obj: object, w: Writer): Generator<string, void, undefined> {
  if (w.stack.includes(obj)) throw new TypeError('Converting circular structure to JSON');
  w.stack.push(obj);
  if (Array.isArray(obj)) {
    w.buf += '[';
    const n = obj.length;
    for (let i = 0; i < n; ) {
      if (i > 0) w.buf += ',';
      // Fast path for the columnar arrays: a run of non-object elements goes through the native
      // JSON.stringify, which gives the same text (numbers as String(n), NaN → null, holes and
      // undefined → null) several times faster than a loop here.
      let j = i;
      const stop = Math.min(n, i + PRIMITIVE_BLOCK);
      while (j < stop) {
        const e: unknown = obj[j];
        if (typeof e === 'object' && e !== null) break;
        j++;
      }
      if (j > i) {
        const text = JSON.stringify(obj.slice(i, j));
        w.buf += text.slice(1, -1);
        i = j;
      } else {
        const v = resolve(String(i), obj[i]);
        const token = primitiveToken(v);
        if (token === null) yield* emitObject(v as object, w);
        else w.buf += token === undefined ? 'null' : token;
        i++;
      }
      if (w.buf.length >= w.chunkChars) {
        yield w.buf;
        w.buf = '';
      }
    }
    w.buf += ']';
  } else {
    w.buf += '{';
    let first = true;
    for (const key of Object.keys(obj)) {
      const v = resolve(key, (obj as Record<string, unknown>)[key]);
      const token = primitiveToken(v);
      if (token === undefined) continue;
      w.buf += (first ? '' : ',') + JSON.stringify(key) + ':';
      first = false;
      if (token === null) yield* emitObject(v as object, w);
      else w.buf += token;
      if (w.buf.length >= w.chunkChars) {
        yield w.buf;
        w.buf = '';
      }
    }
    w.buf += '}';
  }
  w.stack.pop();
}
