/**
 * `npm run bench`: runs every `bench/*.bench.ts` in turn (or those whose name contains argv[2]).
 * Each bench module exports `run(): Promise<void>` and prints its own figures. Benchmarks are never
 * asserted in unit tests (style.md habit 16); figures go to the README and the issue notes.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const filter = process.argv[2] ?? '';
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts') && f.includes(filter))
  .sort();
for (const f of files) {
  console.log(`\n== ${f} ==`);
  const mod = (await import(pathToFileURL(join(here, f)).href)) as { run: () => Promise<void> };
  await mod.run();
}
if (files.length === 0) console.log('no benchmarks matched');
