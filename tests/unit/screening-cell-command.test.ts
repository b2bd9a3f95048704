import { describe, it, expect, vi, afterEach } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../data-pipeline/cli';
import { screenCell } from '../../layers/screening/cell-screening-model';

const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-cell-'));
const demo = join(import.meta.dirname, '..', '..', 'examples', 'cell-demo.json');

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => ((out += String(s)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => ((err += String(s)), true));
  try {
    const code = await main(argv);
    return { code, out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

afterEach(() => vi.restoreAllMocks());

describe('pile-atlas cell', () => {
  it('prints the same metrics, flags and criteria as screenCell, with the cautions, exit 0', async () => {
    const r = await run(['cell', demo]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.out);
    const direct = screenCell(JSON.parse((await import('node:fs')).readFileSync(demo, 'utf8')));
    expect(json.metrics.pilesPerTon.value).toBeCloseTo(direct.metrics.pilesPerTon.value as number, 9);
    expect(json.metrics.thawDelay.unit).toBe('yr');
    expect(json.caution).toMatch(/not a design/);
    expect(json.criteria.length).toBeGreaterThan(5);
    expect(typeof json.flags.fuelIncrease).toBe('boolean');
  });
  it('takes a scenario file and a wrapped {cell, scenario} input', async () => {
    const scen = join(dir, 'scenario.json');
    writeFileSync(scen, JSON.stringify({ designLife_yr: 50 }));
    const a = JSON.parse((await run(['cell', demo, '--scenario', scen, '--compact'])).out);
    const wrapped = join(dir, 'wrapped.json');
    const cell = JSON.parse((await import('node:fs')).readFileSync(demo, 'utf8'));
    writeFileSync(wrapped, JSON.stringify({ cell, scenario: { designLife_yr: 50 } }));
    const b = JSON.parse((await run(['cell', wrapped])).out);
    expect(a.metrics.frozenMargin.value).toBeCloseTo(b.metrics.frozenMargin.value, 9);
    // frozen margin = thaw year with piles − (start year + design life)
    expect(a.metrics.frozenMargin.value).toBeCloseTo(a.metrics.thawYearPiles.value - 2025 - 50, 6);
    const c = JSON.parse((await run(['cell', demo])).out);
    expect(c.metrics.frozenMargin.value).toBeCloseTo(c.metrics.thawYearPiles.value - 2025 - 30, 6);
  });
  it('bad input: one line naming the file and field, exit 2', async () => {
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ meanAirTemp_C: -5, airAmplitude_C: 'big' }));
    const r = await run(['cell', bad]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/bad\.json: .*airAmplitude_C/);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    const scen = join(dir, 'bad-scenario.json');
    writeFileSync(scen, JSON.stringify({ heatPump: { minEnteringFluid_C: -50 } }));
    const s = await run(['cell', demo, '--scenario', scen]);
    expect(s.code).toBe(2);
    expect(s.err).toMatch(/heatPump\.minEnteringFluid_C/);
  });
});
