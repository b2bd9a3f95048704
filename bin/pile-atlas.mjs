#!/usr/bin/env node
// Entry point of the `pile-atlas` command line: runs the TypeScript CLI through tsx.
import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const require = createRequire(import.meta.url);
const tsxCli = require.resolve('tsx/cli');
const result = spawnSync(
  process.execPath,
  [tsxCli, join(here, '..', 'data-pipeline', 'cli.ts'), ...process.argv.slice(2)],
  {
    stdio: 'inherit',
  },
);
process.exit(result.status ?? 1);
