// Browser Web Worker entry for the viewer: exposes the audit API (src/app/compute/auditApi.ts).
import { expose } from 'comlink';
import { auditApi } from '../src/app/compute/auditApi.ts';

expose(auditApi);
