import { describe, it, expect } from 'vitest';
import { fluidProperties } from '../../layers/physics/fluids';
import { pileResistance, type UTubeInput } from '../../layers/physics/pile-resistance';
import { tubeConvection } from '../../layers/physics/convection';
import { finiteLineSourceG, pileFieldGFunction } from '../../layers/physics/finite-line-source';
import { infiniteLineSource } from '../../layers/physics/infinite-line-source';
import { sizePileField, type PileFieldSizingInput } from '../../layers/site/pile-sizing';

const fluid = fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.3, temperature_C: 0 });
const uTube: UTubeInput = {
  loop: 'uTube',
  casing: { outerRadius_m: 0.162, innerRadius_m: 0.1525, conductivity_W_mK: 45 },
  fluid,
  flowRate_m3_s: 0.4e-3,
  length_m: 12,
  pipeOuterRadius_m: 0.016,
  pipeInnerRadius_m: 0.0131,
  pipeConductivity_W_mK: 0.4,
  shankHalfSpacing_m: 0.09,
  fillConductivity_W_mK: 0.45,
};
const sizing: PileFieldSizingInput = {
  peakHeatingLoad_W: 10_000,
  annualHeating_kWh: 25_000,
  pile: { length_m: 12, radius_m: 0.081, buriedDepth_m: 1, Rb_mK_W: 0.1 },
  layout: { spacing_m: 3 },
  ground: { conductivity_W_mK: 1.8, diffusivity_m2_s: 8e-7, undisturbedTemperature_C: -1 },
  fluid: { fluid: 'propyleneGlycol', massFraction: 0.4 },
  includeLifeSeries: false,
};

describe('bad input is refused with the parameter, its allowed range and the value received', () => {
  it('zero or negative flow', () => {
    expect(() => pileResistance({ ...uTube, flowRate_m3_s: 0 })).toThrow(
      /flowRate_m3_s must be > 0 m3\/s; received 0/,
    );
    expect(() => tubeConvection({ fluid, flowRate_m3_s: -1e-4, innerRadius_m: 0.01 })).toThrow(
      /flowRate_m3_s must be > 0.*received -0.0001/,
    );
  });
  it('U-tube pipe larger than the casing allows', () => {
    expect(() => pileResistance({ ...uTube, pipeOuterRadius_m: 0.2 })).toThrow(RangeError);
    expect(() => pileResistance({ ...uTube, pipeOuterRadius_m: 0.2 })).toThrow(
      /pipeOuterRadius_m must be in \[0.0001, 0.07625\]/,
    );
  });
  it('coaxial centre pipe larger than the casing', () => {
    expect(() =>
      pileResistance({
        loop: 'coaxial',
        casing: uTube.casing,
        fluid,
        flowRate_m3_s: 1e-3,
        length_m: 12,
        centreOuterRadius_m: 0.16,
        centreInnerRadius_m: 0.15,
        centreConductivity_W_mK: 0.1,
        downFlow: 'annulus',
      }),
    ).toThrow(/centreOuterRadius_m must be in \[0.0001, 0.14945\].*received 0.16/);
  });
  it('casing inner radius not below its outer radius', () => {
    expect(() => pileResistance({ ...uTube, casing: { ...uTube.casing, innerRadius_m: 0.17 } })).toThrow(
      /casing.innerRadius_m must be in/,
    );
  });
  it('spacing smaller than the pile diameter (sizing and group)', () => {
    expect(() => sizePileField({ ...sizing, layout: { spacing_m: 0.1 } })).toThrow(
      /layout.spacing_m must be in \[0.162, 1000\] m \(at least the pile diameter\); received 0.1/,
    );
    expect(() =>
      pileFieldGFunction({
        positions: [
          { x_m: 0, y_m: 0 },
          { x_m: 0.1, y_m: 0 },
        ],
        pileRadius_m: 0.081,
        length_m: 12,
        buriedDepth_m: 1,
        diffusivity_m2_s: 1e-6,
        times_s: [1e7],
      }),
    ).toThrow(/must be >= pile diameter 0.162 m; received 0.1 m/);
  });
  it('unknown fluid', () => {
    expect(() =>
      fluidProperties({ fluid: 'glycerol' as 'water', massFraction: 0.2, temperature_C: 0 }),
    ).toThrow(/fluid must be one of water, propyleneGlycol, ethanol; received "glycerol"/);
  });
  it('non-finite values', () => {
    expect(() =>
      finiteLineSourceG({
        radius_m: NaN,
        length_m: 10,
        buriedDepth_m: 1,
        diffusivity_m2_s: 1e-6,
        time_s: 1e6,
      }),
    ).toThrow(/radius_m must be a finite number; received NaN/);
    expect(() =>
      infiniteLineSource({
        heatRate_W_m: Infinity,
        conductivity_W_mK: 2,
        diffusivity_m2_s: 1e-6,
        radius_m: 0.1,
        time_s: 1e6,
      }),
    ).toThrow(TypeError);
    expect(() => sizePileField({ ...sizing, annualHeating_kWh: NaN })).toThrow(
      /annualHeating_kWh must be a finite number/,
    );
  });
  it('mass fraction above the tables and water with antifreeze share', () => {
    expect(() => fluidProperties({ fluid: 'ethanol', massFraction: 0.6, temperature_C: 0 })).toThrow(
      /massFraction must be in \[0, 0.4\] kg\/kg; received 0.6/,
    );
    expect(() => fluidProperties({ fluid: 'water', massFraction: 0.1, temperature_C: 5 })).toThrow(
      /massFraction must be in \[0, 0\]/,
    );
  });
  it('sizing: exactly one peak load, and a minimum EFT below the ground temperature', () => {
    expect(() => sizePileField({ ...sizing, peakHeatingLoad_tons: 3 })).toThrow(
      /exactly one of peakHeatingLoad_W and peakHeatingLoad_tons/,
    );
    expect(() => sizePileField({ ...sizing, minEnteringFluid_C: 0 })).toThrow(
      /minEnteringFluid_C must be below/,
    );
  });
});
