// comlink 4.4.2 has no `exports` map: the Node adapter is a deep import whose `.d.ts` TypeScript does
// not find for the `.mjs` path (TOOLCHAIN.md §2), so its types are declared here.
declare module 'comlink/dist/esm/node-adapter.mjs' {
  import type { Endpoint } from 'comlink';
  export interface NodeEndpoint {
    postMessage(message: any, transfer?: any[]): void;
    on(type: string, listener: (...args: any[]) => void, options?: {}): void;
    off(type: string, listener: (...args: any[]) => void, options?: {}): void;
    start?: () => void;
  }
  export type { Endpoint };
  export default function nodeEndpoint(nep: NodeEndpoint): Endpoint;
}
