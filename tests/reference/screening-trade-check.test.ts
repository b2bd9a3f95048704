import { describe, it, expect } from 'vitest';
import { buildCellConstants } from '../../layers/screening/cell-constants';
import { createKernelScratch, evaluateCellMetrics } from '../../layers/screening/cell-kernel';
import { METRIC, METRIC_COUNT } from '../../layers/screening/cell-layers';
import { parseScenario } from '../../layers/screening/scenario';
import { cylinderSourceG } from '../../layers/physics/infinite-cylinder-source';
import { soilThermalProperties } from '../../layers/physics/soil-catalogue';
import type { CellInputs } from '../../layers/screening/screening-model';

/*
 * Fact of the trade (common practice, no published source; issue 11 item 9): field-scale modelling of
 * one helical steel pile exchanger in warming permafrost, ground near −3 to −4 °C at depth and a −5 °C
 * fluid limit, reports on the order of 8 piles per ton of peak heating in ice-rich soil and 21 in dry
 * soil. The criterion set for the per-cell model: with a comparable pile, ground and fluid limit, its
 * count within a factor of two of that range.
 *
 * Comparable case here: one pile alone (foundation of 1, and 50 m between the piles the count adds, so
 * they do not interact: the trade's figure is one pile's modelling repeated), the standard pile (10 m, 168.3 mm, R_b 0.15;
 * a coaxial steel pile with laminar annulus flow computes to about 0.12 m·K/W with
 * layers/physics/pile-resistance.ts), ground −3.5 °C at the pile's depth (the ground-temperature grid
 * input), a −5 °C limit read as the heat pump's entering fluid (read as the fluid entering the pile,
 * the mean fluid would sit at the ground temperature with the default 3 K loop ΔT and the pile would
 * yield nothing), ice-rich = saturated silt (0.47), dry = sand at 0.05.
 *
 * Measured: ice-rich silt 51 piles per ton, dry sand 90 (ground −3 °C: 39 and 74; −4 °C: 79 and 113).
 * As a real field at the 3 m foundation spacing the piles cool each other: 125 and 289 piles per ton. The lower side of the band (no fewer than half the trade's count: the model is not
 * optimistic) and the trade's ordering and ratio hold and are checked below. The upper side (no more
 * than twice the trade's count) does NOT hold: the model needs 4-6 times the trade's piles. The
 * conduction-only three-pulse method (the sizing module gives the same count within 2 %) has about
 * 3 W per metre of peak at a 3 K driving difference; 8 piles per ton of 10 m would need about 30 W/m.
 * Reported to the lead (issue 11 note) rather than tuned away here.
 */
const TRADE = { iceRich: 8, dry: 21 };

const cell: CellInputs = {
  meanAirTemp_C: -4,
  airAmplitude_C: 18,
  warming_C_per_yr: 0.05,
  textureClass: 3,
  waterContent_m3m3: 0.47,
  bedrockDepth_m: 40,
  groundTemp_C: -3.5,
  geothermalFlux_W_m2: NaN,
  nFreeze: NaN,
  latitude_deg: 65,
};

function pilesPerTon(c: Partial<CellInputs>): number {
  const s = parseScenario({
    building: { foundationPiles: 1, pileSpacing_m: 50 },
    heatPump: { minEnteringFluid_C: -5 },
  });
  const m = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics({ ...cell, ...c }, buildCellConstants(s), createKernelScratch(), m);
  return m[METRIC.pilesPerTon];
}

describe('trade check: one helical steel pile in warming permafrost (common practice, no published source)', () => {
  const iceRich = pilesPerTon({ textureClass: 3, waterContent_m3m3: 0.47 });
  const dry = pilesPerTon({ textureClass: 2, waterContent_m3m3: 0.05 });
  it('ice-rich soil needs fewer piles than dry soil (trade: 8 < 21)', () => {
    expect(iceRich).toBeLessThan(dry);
  });
  it('the dry/ice-rich ratio is within a factor of two of the trade’s 21/8 = 2.6', () => {
    const ratio = dry / iceRich;
    expect(ratio).toBeGreaterThan(TRADE.dry / TRADE.iceRich / 2);
    expect(ratio).toBeLessThan((TRADE.dry / TRADE.iceRich) * 2);
  });
  it('the count is no less than half the trade’s (the lower side of the factor-of-two band)', () => {
    expect(iceRich).toBeGreaterThan(TRADE.iceRich / 2);
    expect(dry).toBeGreaterThan(TRADE.dry / 2);
  });
});

/*
 * Where the gap comes from. The most a conduction design can give the same 10 m × 168.3 mm pile at the
 * 3 K driving difference (ground −3.5 °C, mean fluid −6.5 °C) is with no pile resistance and no load
 * history: the 6-hour peak pulse alone against the infinite cylinder source at the pile wall
 * (Carslaw & Jaeger 1959 §13.7; the peak-pulse term of the three-pulse method, Kavanaugh & Rafferty
 * 1997), q' = ΔT·k/G(Fo). Measured: 9.2 piles per ton in ice-rich silt and 26 in dry sand, inside the
 * trade's factor-of-two band. Adding the standard pile's resistance (0.15 m·K/W) alone gives about 27
 * and 44; the monthly and 30-year pulses of the heating-dominated load then give the model's 51 and 90.
 * So the trade's figures are reachable only by a pile of near-zero resistance sized on its peak with the
 * ground's history left out; the model counts the history, as the sizing module and the simulator do.
 */
describe('trade check: the ideal pile on its peak pulse alone bounds the count from below', () => {
  const PEAK_S = 6 * 3600;
  const RADIUS_M = 0.1683 / 2;
  const LENGTH_M = 10;
  const DRIVE_K = 3;
  const TON_W = 3516.85;
  function idealPilesPerTon(texture: 'silt' | 'sand', water: number, pileResistance_mK_W: number): number {
    const p = soilThermalProperties({ texture, waterContent_m3m3: water, frozenTemperature_C: -3.5 });
    const fourier = ((p.kFrozen_W_mK / p.cFrozen_J_m3K) * PEAK_S) / RADIUS_M ** 2;
    const perMetre_W = DRIVE_K / (cylinderSourceG(fourier) / p.kFrozen_W_mK + pileResistance_mK_W);
    return TON_W / (perMetre_W * LENGTH_M);
  }
  const idealIce = idealPilesPerTon('silt', 0.47, 0);
  const idealDry = idealPilesPerTon('sand', 0.05, 0);
  it('the ideal bound lies within the trade’s factor-of-two band (the trade’s count is physically reachable)', () => {
    expect(idealIce).toBeGreaterThan(TRADE.iceRich / 2);
    expect(idealIce).toBeLessThan(TRADE.iceRich * 2);
    expect(idealDry).toBeGreaterThan(TRADE.dry / 2);
    expect(idealDry).toBeLessThan(TRADE.dry * 2);
  });
  it('the model never counts fewer piles than the ideal bound, nor than the bound with the pile resistance', () => {
    const iceRich = pilesPerTon({ textureClass: 3, waterContent_m3m3: 0.47 });
    const dry = pilesPerTon({ textureClass: 2, waterContent_m3m3: 0.05 });
    expect(iceRich).toBeGreaterThan(idealPilesPerTon('silt', 0.47, 0.15));
    expect(dry).toBeGreaterThan(idealPilesPerTon('sand', 0.05, 0.15));
    expect(idealPilesPerTon('silt', 0.47, 0.15)).toBeGreaterThan(idealIce);
  });
});
