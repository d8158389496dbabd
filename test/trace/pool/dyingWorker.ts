// Test-only Node worker entry: the trace API, except that the first worker to be asked for the
// chunk starting at receiver SUNFACET_TEST_DIE_AT exits the thread mid-run (process.exit in a
// worker ends only that thread). A marker file (SUNFACET_TEST_DIE_MARKER) makes it die only once,
// so the replacement worker runs the chunk normally.
import { parentPort } from 'node:worker_threads';
import { existsSync, writeFileSync } from 'node:fs';
import { expose } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import { traceApi } from '../../../src/trace/api.ts';

const dieAt = Number(process.env.SUNFACET_TEST_DIE_AT ?? -1);
const marker = process.env.SUNFACET_TEST_DIE_MARKER ?? '';
const api = {
  ...traceApi,
  runChunk(taskId: number, start: number, end: number) {
    if (start === dieAt && marker !== '' && !existsSync(marker)) {
      writeFileSync(marker, 'died');
      process.exit(3);
    }
    return traceApi.runChunk(taskId, start, end);
  },
};
expose(api, nodeEndpoint(parentPort!));
