/** `pile-atlas site`: JSON in (file or stdin), JSON out; bad input exits 2 with the field path. */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
const example = JSON.parse(readFileSync(new URL('../../examples/site-demo.json', import.meta.url), 'utf8'));

function cli(args: string[], stdin?: string) {
  return spawnSync(process.execPath, ['--import', 'tsx', 'data-pipeline/cli.ts', 'site', ...args], {
    cwd: root,
    input: stdin,
    encoding: 'utf8',
    timeout: 120_000,
  });
}

describe('pile-atlas site', () => {
  it('reads stdin and prints the result JSON', () => {
    const short = { ...example, years: 2, numerics: { fidelity: 'coarse' } };
    const r = cli(['-', '--compact'], JSON.stringify(short));
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.noPile.time_yr.length).toBe(out.noPile.thawDepth_m.length);
    expect(out.withPile.probes.length).toBe(example.probes.length);
    expect(out.energyBalance.relativeError).toBeLessThan(0.005);
  });

  it('exits 2 with a one-line error naming the field', () => {
    const bad = structuredClone(example);
    bad.probes[0].z_m = 80;
    const r = cli(['-'], JSON.stringify(bad));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/probes\.0\.z_m/);
    expect(r.stdout).toBe('');
  });
});
