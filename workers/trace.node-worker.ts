// Node worker thread entry: exposes the trace API (src/trace/api.ts) through comlink's Node adapter.
import { parentPort } from 'node:worker_threads';
import { expose } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import { traceApi } from '../src/trace/api.ts';

expose(traceApi, nodeEndpoint(parentPort!));
