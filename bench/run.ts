/**
 * `npm run bench`: runs every bench/*.bench.ts (each exports a default async function that prints
 * its own table through the harness). `npm run bench -- NAME` runs only benches whose file name contains NAME.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { referenceMs } from './harness';

const here = dirname(fileURLToPath(import.meta.url));
const filter = process.argv[2];
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => !filter || f.includes(filter))
  .sort();

console.log(`# Haloweave benchmarks (${new Date().toISOString()}, node ${process.version})`);
console.log(`reference workload: ${(await referenceMs()).toFixed(1)} ms`);
for (const f of files) {
  const mod = await import(pathToFileURL(join(here, f)).href);
  await mod.default();
}
