// Browser Web Worker entry for the viewer: exposes the audit API (src/app/compute/auditApi.ts).
import { expose } from 'comlink';
import { auditApi } from '../src/app/compute/auditApi.ts';

// A page served without cross-origin isolation (COOP/COEP headers) has no SharedArrayBuffer, but
// the audit's BVH build asks for shared memory (src/audit/stages/model.ts, `shared: true`). This
// worker traces in-process, so plain ArrayBuffers serve the same purpose; with an alias,
// `instanceof SharedArrayBuffer` is true for them and the pool's sharing step leaves them alone.
// Remove once the build asks for shared memory only where it exists.
if (typeof (globalThis as { SharedArrayBuffer?: unknown }).SharedArrayBuffer === 'undefined') {
  (globalThis as { SharedArrayBuffer?: unknown }).SharedArrayBuffer = ArrayBuffer;
}

expose(auditApi);
