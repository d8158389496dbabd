// Browser Web Worker entry: exposes the trace API (src/trace/api.ts) through comlink.
import { expose } from 'comlink';
import { traceApi } from '../src/trace/api.ts';

expose(traceApi);
