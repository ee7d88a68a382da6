#!/usr/bin/env node
// Launcher for the `haloweave` command: runs the TypeScript CLI directly through tsx,
// so `npx haloweave ...` works right after `npm ci` with no build step.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
