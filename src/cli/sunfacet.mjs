#!/usr/bin/env node
// Entry point of the `sunfacet` command. TypeScript runs through tsx's loader, so there is no build
// step for the user: `npx sunfacet --help` works right after `npm ci`.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('./main.ts');
process.exitCode = await main(process.argv.slice(2));
